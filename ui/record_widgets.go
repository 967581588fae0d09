package ui

import (
	"fyne.io/fyne/v2"
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

// gridTable is the data grid. Typing while the grid has the keyboard
// focus goes to the value entry, as in a spreadsheet: the first character
// replaces the cell's text.
type gridTable struct {
	widget.Table
	onRune func(r rune)
}

func newGridTable(length func() (int, int), create func() fyne.CanvasObject, update func(widget.TableCellID, fyne.CanvasObject)) *gridTable {
	t := &gridTable{}
	t.Length, t.CreateCell, t.UpdateCell = length, create, update
	t.ShowHeaderRow = true
	t.ExtendBaseWidget(t)
	return t
}

// TypedRune starts an entry in the selected cell.
func (t *gridTable) TypedRune(r rune) {
	if t.onRune != nil {
		t.onRune(r)
	}
}

// TypedKey sends Enter to the entry and the rest to the table.
func (t *gridTable) TypedKey(k *fyne.KeyEvent) {
	if (k.Name == fyne.KeyReturn || k.Name == fyne.KeyEnter) && t.onRune != nil {
		t.onRune(0)
		return
	}
	t.Table.TypedKey(k)
}
