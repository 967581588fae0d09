package ui

import (
	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/driver/desktop"
	"fyne.io/fyne/v2/widget"
)

// cellEntry is the value entry: Enter commits (OnSubmitted), ↑ and ↓
// commit and move, Esc restores the stored value.
type cellEntry struct {
	widget.Entry
	onMove   func(delta int)
	onEscape func()
}

func newCellEntry() *cellEntry {
	e := &cellEntry{}
	e.ExtendBaseWidget(e)
	return e
}

// TypedKey handles the grid keys and leaves the rest to the entry.
func (e *cellEntry) TypedKey(k *fyne.KeyEvent) {
	switch k.Name {
	case fyne.KeyUp:
		if e.onMove != nil {
			e.onMove(-1)
		}
	case fyne.KeyDown:
		if e.onMove != nil {
			e.onMove(1)
		}
	case fyne.KeyEscape:
		if e.onEscape != nil {
			e.onEscape()
		}
	default:
		e.Entry.TypedKey(k)
	}
}

// replace sets the entry's text with the cursor at its end and, with
// selectAll, all of it selected, so that the next key typed replaces it.
//
// widget.Entry keeps its selection across SetText: a selection made on
// one cell's value (select-all when the cell was chosen) survives loading
// an empty cell, and then covers the first character typed, so that the
// second key replaced the first ("78" became "8"). replace ends any
// selection before it sets a new one, which the entry's public keys can
// do: the shift key released, then End.
func (e *cellEntry) replace(text string, selectAll bool) {
	e.SetText(text)
	if e.Disabled() {
		return
	}
	e.Entry.KeyUp(&fyne.KeyEvent{Name: desktop.KeyShiftLeft})
	e.Entry.KeyUp(&fyne.KeyEvent{Name: desktop.KeyShiftRight})
	e.Entry.TypedKey(&fyne.KeyEvent{Name: fyne.KeyEnd})
	if selectAll && text != "" {
		e.Entry.TypedShortcut(&fyne.ShortcutSelectAll{})
	}
}

// gridTable is the data grid. A click on a cell hands the keyboard to the
// value entry (onTapped); typing while the grid itself has the keyboard
// focus (after Tab) goes to the entry too, the first character replacing
// the cell's text, and the arrow keys move the selected cell.
type gridTable struct {
	widget.Table
	onRune   func(r rune)
	onTapped func()
	onArrow  func(dRow, dCol int)
}

func newGridTable(length func() (int, int), create func() fyne.CanvasObject, update func(widget.TableCellID, fyne.CanvasObject)) *gridTable {
	t := &gridTable{}
	t.Length, t.CreateCell, t.UpdateCell = length, create, update
	t.ShowHeaderRow = true
	t.ExtendBaseWidget(t)
	return t
}

// Tapped selects the cell under the pointer, as the table does; the table
// then takes the keyboard focus itself, so onTapped gives it back to the
// entry of the selected cell.
func (t *gridTable) Tapped(e *fyne.PointEvent) {
	t.Table.Tapped(e)
	if t.onTapped != nil {
		t.onTapped()
	}
}

// TypedRune starts an entry in the selected cell.
func (t *gridTable) TypedRune(r rune) {
	if t.onRune != nil {
		t.onRune(r)
	}
}

// TypedKey sends Enter to the entry, moves the selection with the arrow
// keys and leaves the rest to the table.
func (t *gridTable) TypedKey(k *fyne.KeyEvent) {
	switch k.Name {
	case fyne.KeyReturn, fyne.KeyEnter:
		if t.onRune != nil {
			t.onRune(0)
			return
		}
	case fyne.KeyUp, fyne.KeyDown, fyne.KeyLeft, fyne.KeyRight:
		if t.onArrow != nil {
			d := map[fyne.KeyName][2]int{fyne.KeyUp: {-1, 0}, fyne.KeyDown: {1, 0}, fyne.KeyLeft: {0, -1}, fyne.KeyRight: {0, 1}}[k.Name]
			t.onArrow(d[0], d[1])
			return
		}
	}
	t.Table.TypedKey(k)
}
