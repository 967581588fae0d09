package ui

import (
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
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
	// undoBtn and redoBtn are on only while there is something to undo
	// or redo (updateUndo).
	undoBtn, redoBtn *widget.Button
	root             fyne.CanvasObject

	empty   *widget.Label // shown while the trial has no plots
	sel     widget.TableCellID
	hasSel  bool
	derived map[int][]float64 // trait index → computed values, for derived traits
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
	r.table.StickyColumnCount = fixedCols
	r.table.CreateHeader = func() fyne.CanvasObject {
		l := widget.NewLabel("")
		l.TextStyle = fyne.TextStyle{Bold: true}
		l.Truncation = fyne.TextTruncateEllipsis
		return l
	}
	r.table.UpdateHeader = r.updateHeader
	r.table.OnSelected = r.onSelected
	r.setWidths()

	r.exclude = widget.NewButtonWithIcon("Exclude plot…", theme.VisibilityOffIcon(), r.excludeDialog)
	importBtn := widget.NewButtonWithIcon("Import field book…", theme.DownloadIcon(), u.importFieldBookDialog)
	undo := widget.NewButtonWithIcon("", theme.ContentUndoIcon(), u.undo)
	redo := widget.NewButtonWithIcon("", theme.ContentRedoIcon(), u.redo)
	r.undoBtn, r.redoBtn = undo, redo
	r.updateUndo()
	entryBox := container.NewGridWrap(fyne.NewSize(220, r.entry.MinSize().Height), r.entry)
	r.where.Truncation = fyne.TextTruncateEllipsis
	bar := container.NewBorder(nil, nil, entryBox,
		container.NewHBox(r.exclude, importBtn, undo, redo), r.where)
	help := widget.NewLabel("Type a value and press Enter to move to the next plot in walking order. ↑/↓ move without leaving the entry; Esc restores the stored value.")
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

func (r *recordStep) length() (int, int) {
	t := r.trial()
	return len(t.Plots), fixedCols + len(t.Traits) + 1
}

func (r *recordStep) setWidths() {
	t := r.trial()
	r.table.SetColumnWidth(colPlot, 70)
	r.table.SetColumnWidth(colBlock, 60)
	r.table.SetColumnWidth(colTreatment, r.colWidth(colTreatment))
	pad := 4 * theme.Padding()
	for j := range t.Traits {
		head := traitLabel(&t.Traits[j]) + " ="
		w := fyne.MeasureText(head, theme.TextSize(), fyne.TextStyle{Bold: true}).Width + pad
		r.table.SetColumnWidth(fixedCols+j, min(max(w, 90), 240))
	}
	r.table.SetColumnWidth(fixedCols+len(t.Traits), r.colWidth(fixedCols+len(t.Traits)))
}

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
		r.setWidths()
		if r.hasSel {
			rows, cols := r.length()
			if r.sel.Row >= rows || r.sel.Col >= cols {
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

// value returns the value shown for plot i and trait j.
func (r *recordStep) value(i, j int) float64 {
	t := r.trial()
	tr := &t.Traits[j]
	if tr.Derived != nil {
		if v := r.derived[j]; i < len(v) {
			return v[i]
		}
		return trial.Missing
	}
	if i < len(tr.Values) {
		return tr.Values[i]
	}
	return trial.Missing
}

func (r *recordStep) updateHeader(id widget.TableCellID, o fyne.CanvasObject) {
	l := o.(*widget.Label)
	t := r.trial()
	switch {
	case id.Col == colPlot:
		l.SetText("Plot")
	case id.Col == colBlock:
		l.SetText(blockWord(t))
	case id.Col == colTreatment:
		l.SetText("Treatment")
	case id.Col-fixedCols < len(t.Traits):
		tr := &t.Traits[id.Col-fixedCols]
		s := traitLabel(tr)
		if tr.Derived != nil {
			s += " ="
		}
		l.SetText(s)
	default:
		l.SetText("Excluded / note")
	}
}

func blockWord(t *trial.Trial) string {
	switch t.Design.Kind {
	case trial.CRD:
		return "Rep"
	case trial.Latin:
		return "Row"
	}
	return "Block"
}

// newGridCell is a table cell: a background (flag, exclusion) under a
// text. canvas.Text is used rather than a label: the grid redraws many
// cells on every entry and a label's text shaping costs far more.
func newGridCell() fyne.CanvasObject {
	bg := canvas.NewRectangle(nil)
	txt := canvas.NewText("", theme.Color(theme.ColorNameForeground))
	return container.NewStack(bg, container.NewPadded(txt))
}

func (r *recordStep) updateCell(id widget.TableCellID, o fyne.CanvasObject) {
	c := o.(*fyne.Container)
	bg := c.Objects[0].(*canvas.Rectangle)
	l := c.Objects[1].(*fyne.Container).Objects[0].(*canvas.Text)
	t := r.trial()
	if id.Row >= len(t.Plots) {
		return
	}
	p := &t.Plots[id.Row]
	var fill fyne.ThemeColorName
	text := ""
	align := fyne.TextAlignLeading
	italic := false
	switch {
	case id.Col == colPlot:
		text = strconv.Itoa(p.Number)
	case id.Col == colBlock:
		text = strconv.Itoa(p.Block)
	case id.Col == colTreatment:
		text = p.Treatment
		if tr := t.Treatment(p.Treatment); tr != nil && tr.Name != "" && tr.Name != tr.Code {
			text += "  " + tr.Name
		}
	case id.Col-fixedCols < len(t.Traits):
		j := id.Col - fixedCols
		tr := &t.Traits[j]
		v := r.value(id.Row, j)
		text = formatValue(v, tr.Decimals)
		align = fyne.TextAlignTrailing
		italic = tr.Derived != nil
		if ex, _ := t.Excluded(id.Row, tr.Key); ex {
			fill = colorNameExcluded
		} else if tr.RangeNote(v) != "" {
			fill = colorNameFlag
		}
	default:
		text = exclusionText(t, p)
	}
	if len(p.Exclusions) > 0 && id.Col < fixedCols {
		for _, e := range p.Exclusions {
			if e.Trait == "" {
				fill = colorNameExcluded
			}
		}
	}
	if fill == "" {
		bg.FillColor = nil
	} else {
		bg.FillColor = theme.Color(fill)
	}
	bg.Refresh()
	if id.Col == colTreatment || id.Col >= fixedCols+len(t.Traits) {
		text = fitText(text, r.colWidth(id.Col), theme.TextSize())
	}
	l.Alignment = align
	l.TextStyle = fyne.TextStyle{Italic: italic}
	l.Color = theme.Color(theme.ColorNameForeground)
	l.Text = text
	l.Refresh()
}

// colWidth is the width given to a column.
func (r *recordStep) colWidth(col int) float32 {
	switch col {
	case colTreatment:
		return 210
	}
	return 260
}

// fitText shortens s with an ellipsis to fit width at text size ts.
func fitText(s string, width, ts float32) string {
	width -= 2 * theme.Padding()
	if fyne.MeasureText(s, ts, fyne.TextStyle{}).Width <= width {
		return s
	}
	rs := []rune(s)
	for n := len(rs) - 1; n > 0; n-- {
		t := string(rs[:n]) + "…"
		if fyne.MeasureText(t, ts, fyne.TextStyle{}).Width <= width {
			return t
		}
	}
	return "…"
}

// exclusionText lists a plot's exclusions and note.
func exclusionText(t *trial.Trial, p *trial.Plot) string {
	s := ""
	for _, e := range p.Exclusions {
		if s != "" {
			s += "; "
		}
		what := "all traits"
		if e.Trait != "" {
			what = e.Trait
			if tr := t.Trait(e.Trait); tr != nil {
				what = tr.Name
			}
		}
		s += what + ": " + e.Reason
	}
	if p.Note != "" {
		if s != "" {
			s += " — "
		}
		s += p.Note
	}
	return s
}

func (r *recordStep) onSelected(id widget.TableCellID) {
	t := r.trial()
	if id.Col < fixedCols && len(t.Traits) > 0 {
		// Plot, block and treatment are fixed: go to the first trait.
		id.Col = fixedCols
		r.table.Select(id)
		return
	}
	r.sel, r.hasSel = id, true
	r.loadEntry()
	r.u.win.Canvas().Focus(r.entry)
	// Typing replaces the value, as in a spreadsheet.
	r.entry.TypedShortcut(&fyne.ShortcutSelectAll{})
}

// selTrait returns the selected trait index, or -1.
func (r *recordStep) selTrait() int {
	if !r.hasSel {
		return -1
	}
	j := r.sel.Col - fixedCols
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
	where := fmt.Sprintf("Plot %d · %s %d · %s %s", p.Number, blockWord(t), p.Block, p.Treatment, name)
	if j < 0 {
		r.where.SetText(where)
		r.entry.SetText("")
		r.entry.Disable()
		return
	}
	tr := &t.Traits[j]
	r.where.SetText(where + " — " + traitLabel(tr))
	if tr.Derived != nil {
		r.entry.SetText(formatValue(r.value(r.sel.Row, j), tr.Decimals))
		r.entry.Disable()
		r.setMsg("This value is computed from "+tr.Derived.WeightTrait+" and "+tr.Derived.MoistureTrait+"; enter those instead.", widget.LowImportance)
		return
	}
	r.entry.Enable()
	r.entry.SetText(editText(r.value(r.sel.Row, j)))
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
	j := r.selTrait()
	if j < 0 {
		return false
	}
	tr := &t.Traits[j]
	row := r.sel.Row
	if tr.Derived == nil {
		v, err := parseValue(text)
		if err != nil {
			r.setMsg(err.Error()+".", widget.DangerImportance)
			return false
		}
		old := tr.Values[row]
		if !(trial.IsMissing(old) && trial.IsMissing(v)) && old != v {
			// The trial decides what a value may be: it refuses impossible
			// values and keeps implausible ones (flagged below).
			if err := t.SetValue(row, tr.Key, v); err != nil {
				r.setMsg(refusalText(err), widget.DangerImportance)
				return false
			}
			r.u.doc.record(&setValue{trait: j, plot: row, old: old, new: tr.Values[row]})
		}
		if note := tr.RangeNote(v); note != "" {
			// Keep the warning in view after moving on.
			defer r.setMsg(fmt.Sprintf("Plot %d: %s. The value is kept.", t.Plots[row].Number, note), widget.WarningImportance)
		}
	}
	next := row + delta
	if next < 0 || next >= len(t.Plots) {
		next = row
	}
	r.table.Select(widget.TableCellID{Row: next, Col: r.sel.Col})
	return true
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

// excludeDialog leaves the selected plot out of the analysis, for one
// trait or for all, with a reason and a note.
func (r *recordStep) excludeDialog() {
	t := r.trial()
	if !r.hasSel {
		dialog.ShowInformation("Exclude a plot", "Select a cell of the plot first.", r.u.win)
		return
	}
	row := r.sel.Row
	p := &t.Plots[row]
	opts := []string{"every trait"}
	keys := []string{""}
	for _, tr := range t.Traits {
		opts = append(opts, tr.Name)
		keys = append(keys, tr.Key)
	}
	which := widget.NewSelect(opts, nil)
	which.SetSelectedIndex(0)
	if j := r.selTrait(); j >= 0 {
		which.SetSelectedIndex(j + 1)
	}
	reason := widget.NewSelectEntry([]string{"hail", "flooding", "planter skip", "animal damage", "wheel track", "spray drift", "harvest error"})
	reason.SetPlaceHolder("why, for example hail")
	note := widget.NewEntry()
	note.SetText(p.Note)
	note.SetPlaceHolder("optional note on the plot")
	current := widget.NewLabel(exclusionText(t, p))
	current.Wrapping = fyne.TextWrapWord
	items := []*widget.FormItem{
		widget.NewFormItem("Leave out of", which),
		widget.NewFormItem("Reason", reason),
		widget.NewFormItem("Note", note),
	}
	if len(p.Exclusions) > 0 {
		items = append(items, widget.NewFormItem("Now excluded", current))
	}
	problem := widget.NewLabel("")
	problem.Wrapping = fyne.TextWrapWord
	problem.Importance = widget.DangerImportance
	problem.Hide()
	var d dialog.Dialog
	apply := func(include bool) {
		key := keys[max(which.SelectedIndex(), 0)]
		if err := r.setExclusion(row, key, reason.Text, note.Text, include); err != nil {
			showError(r.u.win, "Could not change the exclusion", "The exclusion could not be changed", err)
			return
		}
		d.Hide()
	}
	excludeBtn := widget.NewButtonWithIcon("Exclude", theme.VisibilityOffIcon(), func() {
		if strings.TrimSpace(reason.Text) == "" {
			problem.SetText("Give a reason, so that the report can say why the plot was left out.")
			problem.Show()
			return
		}
		apply(false)
	})
	excludeBtn.Importance = widget.HighImportance
	includeBtn := widget.NewButtonWithIcon("Take back", theme.VisibilityIcon(), func() { apply(true) })
	if len(p.Exclusions) == 0 {
		includeBtn.Disable()
	}
	cancel := widget.NewButton("Cancel", func() { d.Hide() })
	form := widget.NewForm(items...)
	d = dialog.NewCustomWithoutButtons(fmt.Sprintf("Plot %d", p.Number),
		container.NewVBox(form, problem, container.NewHBox(cancel, includeBtn, excludeBtn)), r.u.win)
	d.Resize(fyne.NewSize(480, 320))
	d.Show()
	closeOnEscape(r.u.win, d)
}

// setExclusion excludes (or includes) plot row for the trait key ("" for
// every trait) and sets its note, as one undoable edit.
func (r *recordStep) setExclusion(row int, key, reason, note string, include bool) error {
	t := r.trial()
	p := &t.Plots[row]
	cmd := &setExclusions{plot: row, old: slices.Clone(p.Exclusions), oldNote: p.Note}
	var err error
	if include {
		err = t.Include(row, key)
	} else {
		err = t.Exclude(row, key, reason)
	}
	if err == nil {
		err = t.SetNote(row, note)
	}
	if err != nil {
		cmd.undo(t)
		return err
	}
	cmd.new, cmd.newNote = slices.Clone(p.Exclusions), p.Note
	r.u.doc.record(cmd)
	return nil
}

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

// typeInto moves the keyboard to the entry; a rune replaces its text.
func (r *recordStep) typeInto(c rune) {
	if !r.hasSel || r.entry.Disabled() {
		return
	}
	r.u.win.Canvas().Focus(r.entry)
	if c != 0 {
		r.entry.SetText(string(c))
		r.entry.CursorColumn = len(r.entry.Text)
		r.entry.Refresh()
	}
}
