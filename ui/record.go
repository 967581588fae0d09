package ui

import (
	"errors"
	"fmt"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// Fixed columns of the data grid; trait j is column fixedCols+j, and the
// last column lists exclusions and notes.
const (
	colPlot = iota
	colBlock
	colTreatment
	fixedCols
)

// recordStep is the data grid: one row per plot in walking order, one
// column per trait, and an entry bound to the selected cell.
type recordStep struct {
	u *App

	table   *gridTable
	where   *widget.Label // what the selected cell is
	entry   *cellEntry
	msg     *widget.Label
	exclude *widget.Button
	// goTo takes a plot number typed or scanned from a plot label.
	goTo *widget.Entry
	// undoBtn and redoBtn are on only while there is something to undo
	// or redo (updateUndo).
	undoBtn, redoBtn *widget.Button
	root             fyne.CanvasObject

	empty   *widget.Label // shown while the trial has no plots
	sel     widget.TableCellID
	hasSel  bool
	derived map[int][]float64 // trait index → computed values, for derived traits
	widths  []float32         // of each column, as setWidths set them
	nfixed  int               // plot, block (not for CRD), treatment and design columns
	nbase   int               // plot, block (not for CRD) and treatment columns
	loaded  string            // the text loadEntry put in the entry
	// returning is set while the grid goes back to a cell whose typed
	// text could not be stored.
	returning bool
}

func newRecordStep(u *App) *recordStep {
	r := &recordStep{u: u, derived: map[int][]float64{}}
	r.where = widget.NewLabelWithStyle("Select a cell to enter a value.", fyne.TextAlignLeading, fyne.TextStyle{Bold: true})
	r.entry = newCellEntry()
	r.entry.SetPlaceHolder("value, empty for missing")
	r.entry.OnSubmitted = func(s string) { r.commit(s, 1) }
	r.entry.onMove = func(delta int) { r.commit(r.entry.Text, delta) }
	r.entry.onEscape = func() { r.loadEntry() }
	r.msg = widget.NewLabel("")
	r.msg.Wrapping = fyne.TextWrapWord

	r.table = newGridTable(r.length, newGridCell, r.updateCell)
	r.table.onRune = r.typeInto
	r.table.ShowHeaderColumn = false
	r.table.CreateHeader = func() fyne.CanvasObject {
		l := widget.NewLabel("")
		l.TextStyle = fyne.TextStyle{Bold: true}
		l.Truncation = fyne.TextTruncateEllipsis
		return l
	}
	r.table.UpdateHeader = r.updateHeader
	r.table.OnSelected = r.onSelected
	r.table.onTapped = r.focusEntry
	r.table.onArrow = r.moveBy
	r.setWidths()

	r.goTo = widget.NewEntry()
	r.goTo.SetPlaceHolder("go to plot / scan")
	r.goTo.OnSubmitted = func(s string) {
		if r.goToPlot(s) {
			r.goTo.SetText("")
		}
	}
	r.exclude = widget.NewButtonWithIcon("Exclude plot…", theme.VisibilityOffIcon(), r.excludeDialog)
	importBtn := widget.NewButtonWithIcon("Import field book…", theme.DownloadIcon(), u.importFieldBookDialog)
	undo := widget.NewButtonWithIcon("", theme.ContentUndoIcon(), u.undo)
	redo := widget.NewButtonWithIcon("", theme.ContentRedoIcon(), u.redo)
	r.undoBtn, r.redoBtn = undo, redo
	r.updateUndo()
	entryBox := container.NewGridWrap(fyne.NewSize(220, r.entry.MinSize().Height), r.entry)
	r.where.Truncation = fyne.TextTruncateEllipsis
	goBox := container.NewGridWrap(fyne.NewSize(170, r.entry.MinSize().Height), r.goTo)
	bar := container.NewBorder(nil, nil, entryBox,
		container.NewHBox(goBox, r.exclude, importBtn, undo, redo), r.where)
	help := widget.NewLabel("Type a value and press Enter to move to the next plot in walking order. ↑/↓ move without leaving the entry; Esc restores the stored value. " +
		"To jump to a plot, type or scan its label's number in \"go to plot\" and press Enter.")
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	top := container.NewVBox(bar, r.msg)
	r.empty = widget.NewLabel("No plots yet. Add treatments and traits in Setup, then lay the trial out in Field.")
	r.empty.Alignment = fyne.TextAlignCenter
	r.root = container.NewBorder(top, help, nil, nil, container.NewStack(r.table, container.NewCenter(r.empty)))
	r.refresh(changeAll)
	return r
}

func (r *recordStep) object() fyne.CanvasObject { return r.root }

// updateUndo enables the toolbar's undo and redo buttons only when the
// history holds something to undo or redo.
func (r *recordStep) updateUndo() {
	d := r.u.doc
	set := func(b *widget.Button, on bool) {
		if on {
			b.Enable()
		} else {
			b.Disable()
		}
	}
	set(r.undoBtn, d != nil && d.hist.canUndo())
	set(r.redoBtn, d != nil && d.hist.canRedo())
}

func (r *recordStep) trial() *trial.Trial { return r.u.doc.t }

// refresh recomputes derived traits and redraws the grid.
func (r *recordStep) refresh(c change) {
	t := r.trial()
	if row := r.u.doc.row; c == changeValues && row >= 0 && row < len(t.Plots) {
		// One plot changed: recompute its derived values, redraw its row.
		for j := range r.derived {
			if v, err := t.TraitValues(t.Traits[j].Key); err == nil {
				r.derived[j] = v
			}
		}
		_, cols := r.length()
		for col := range cols {
			r.table.RefreshItem(widget.TableCellID{Row: row, Col: col})
		}
		if r.hasSel {
			r.loadEntry()
		}
		return
	}
	if c&(changeValues|changeStructure) != 0 {
		clear(r.derived)
		for j := range t.Traits {
			if t.Traits[j].Derived != nil {
				if v, err := t.TraitValues(t.Traits[j].Key); err == nil {
					r.derived[j] = v
				}
			}
		}
	}
	if c&changeStructure != 0 {
		before := r.nfixed
		r.setWidths()
		if r.hasSel {
			rows, cols := r.length()
			if r.sel.Row >= rows || r.sel.Col >= cols || r.nfixed != before {
				r.hasSel = false
				r.table.UnselectAll()
			}
		}
	}
	r.table.Refresh()
	r.empty.Hidden = len(t.Plots) > 0
	r.empty.Refresh()
	if r.hasSel {
		r.loadEntry()
	}
}

func (r *recordStep) onSelected(id widget.TableCellID) {
	t := r.trial()
	if id.Col < r.nfixed && len(t.Traits) > 0 {
		// Plot, block and treatment are fixed: go to the first trait.
		id.Col = r.nfixed
		r.table.Select(id)
		return
	}
	if r.returning {
		return // back on a cell whose typed text was refused: keep it
	}
	if r.hasSel && id == r.sel {
		r.focusEntry()
		return
	}
	// Text typed in the cell being left is stored, as Enter would; text
	// that cannot be stored keeps that cell selected with the text in the
	// entry, so that nothing typed is dropped without a word.
	if r.hasSel && r.pending() {
		ok, note := r.store(r.entry.Text)
		if !ok {
			msg, imp := r.msg.Text, r.msg.Importance
			r.returning = true
			r.table.Select(r.sel)
			r.returning = false
			r.setMsg(msg, imp)
			r.focusEntry()
			return
		}
		defer func() {
			if note != "" {
				r.setMsg(note, widget.WarningImportance)
			}
		}()
	}
	prev, had := r.sel, r.hasSel
	r.sel, r.hasSel = id, true
	if had {
		r.table.RefreshItem(prev) // its selection frame goes
	}
	r.table.RefreshItem(id)
	r.loadEntry()
	r.focusEntry()
}

// focusEntry gives the keyboard to the value entry of the selected cell.
func (r *recordStep) focusEntry() {
	if r.hasSel && !r.entry.Disabled() {
		r.u.win.Canvas().Focus(r.entry)
	}
}

// pending reports whether the entry holds text typed since the selected
// cell's value was loaded into it.
func (r *recordStep) pending() bool {
	return !r.entry.Disabled() && r.entry.Text != r.loaded
}

// moveBy selects the cell dRow rows and dCol columns from the selected one
// (arrow keys on the grid), within the grid.
func (r *recordStep) moveBy(dRow, dCol int) {
	if !r.hasSel {
		return
	}
	rows, cols := r.length()
	next := widget.TableCellID{Row: min(max(r.sel.Row+dRow, 0), rows-1), Col: min(max(r.sel.Col+dCol, r.nfixed), cols-1)}
	r.table.Select(next)
}

// selTrait returns the selected trait index, or -1.
func (r *recordStep) selTrait() int {
	if !r.hasSel {
		return -1
	}
	j := r.sel.Col - r.nfixed
	if j < 0 || j >= len(r.trial().Traits) {
		return -1
	}
	return j
}

// loadEntry puts the selected cell's stored value into the entry.
func (r *recordStep) loadEntry() {
	t := r.trial()
	if !r.hasSel || r.sel.Row >= len(t.Plots) {
		return
	}
	p := &t.Plots[r.sel.Row]
	j := r.selTrait()
	name := ""
	if tr := t.Treatment(p.Treatment); tr != nil {
		name = tr.Name
	}
	where := fmt.Sprintf("Plot %d · %s %d%s · %s %s", p.Number, blockWord(t), p.Block, mainPlotWords(t, p), p.Treatment, name)
	if t.Design.Kind == trial.CRD {
		where = fmt.Sprintf("Plot %d · %s %s", p.Number, p.Treatment, name)
	}
	if j < 0 {
		r.where.SetText(where)
		r.entry.replace("", false)
		r.loaded = ""
		r.entry.Disable()
		return
	}
	tr := &t.Traits[j]
	r.where.SetText(where + " — " + traitLabel(tr))
	if tr.Derived != nil {
		r.entry.Enable()
		r.entry.replace(formatValue(r.value(r.sel.Row, j), tr.Decimals), false)
		r.loaded = r.entry.Text
		r.entry.Disable()
		r.setMsg("This value is computed from "+tr.Derived.WeightTrait+" and "+tr.Derived.MoistureTrait+"; enter those instead.", widget.LowImportance)
		return
	}
	r.entry.Enable()
	// Typing replaces the value, as in a spreadsheet.
	r.entry.replace(editText(r.value(r.sel.Row, j)), true)
	r.loaded = r.entry.Text
	if note := tr.RangeNote(r.value(r.sel.Row, j)); note != "" {
		r.setMsg(upperFirst(note)+". The value is kept.", widget.WarningImportance)
	} else if ex, why := t.Excluded(r.sel.Row, tr.Key); ex {
		r.setMsg("This plot is left out of the analysis of "+tr.Name+": "+why+".", widget.LowImportance)
	} else {
		r.setMsg("", widget.MediumImportance)
	}
}

func (r *recordStep) setMsg(s string, imp widget.Importance) {
	r.msg.Importance = imp
	r.msg.SetText(s)
}

// commit stores the typed text in the selected cell and moves delta rows
// (in walking order). Refused text keeps the selection and says why.
func (r *recordStep) commit(text string, delta int) bool {
	t := r.trial()
	if r.selTrait() < 0 {
		return false
	}
	ok, note := r.store(text)
	if !ok {
		return false
	}
	row := r.sel.Row
	next := row + delta
	if next < 0 || next >= len(t.Plots) {
		next = row
	}
	if next == row {
		r.loadEntry()
	} else {
		r.table.Select(widget.TableCellID{Row: next, Col: r.sel.Col})
	}
	if note != "" {
		// Keep the warning in view after moving on.
		r.setMsg(note, widget.WarningImportance)
	}
	return true
}

// store keeps text as the selected cell's value, as one undoable edit.
// It reports whether the text was stored (a refusal is shown under the
// entry) and, for a value outside the trait's valid range, the warning.
func (r *recordStep) store(text string) (ok bool, note string) {
	t := r.trial()
	j := r.selTrait()
	if j < 0 {
		return false, ""
	}
	tr := &t.Traits[j]
	row := r.sel.Row
	if tr.Derived != nil {
		return true, ""
	}
	v, err := parseValue(text)
	if err != nil {
		r.setMsg(fmt.Sprintf("Plot %d: %s.", t.Plots[row].Number, err.Error()), widget.DangerImportance)
		return false, ""
	}
	old := tr.Values[row]
	if !(trial.IsMissing(old) && trial.IsMissing(v)) && old != v {
		// The trial decides what a value may be: it refuses impossible
		// values and keeps implausible ones (flagged).
		if err := t.SetValue(row, tr.Key, v); err != nil {
			r.setMsg(refusalText(err), widget.DangerImportance)
			return false, ""
		}
		r.u.doc.record(&setValue{trait: j, plot: row, old: old, new: tr.Values[row],
			what: fmt.Sprintf("plot %d, %s", t.Plots[row].Number, tr.Name)})
	}
	r.loaded = r.entry.Text
	if n := tr.RangeNote(v); n != "" {
		note = fmt.Sprintf("Plot %d: %s. The value is kept.", t.Plots[row].Number, n)
	}
	return true, note
}

// refusalText is the message for a value trial.SetValue refused, as a
// sentence ("Plot 101: Heads is a count, so 2.5 is not possible; …").
func refusalText(err error) string {
	var verr *trial.ValidationError
	if errors.As(err, &verr) {
		return upperFirst(verr.Msg) + "."
	}
	return explain("The value was not stored", err).What
}

// typeInto moves the keyboard to the entry; a rune replaces its text.
func (r *recordStep) typeInto(c rune) {
	if !r.hasSel || r.entry.Disabled() {
		return
	}
	r.u.win.Canvas().Focus(r.entry)
	if c != 0 {
		r.entry.replace("", false)
		r.entry.TypedRune(c)
	}
}
