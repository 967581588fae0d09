package ui

import (
	"strconv"
	"strings"

	"fyne.io/fyne/v2/widget"
)

// goToPlot selects the plot whose number is typed or scanned (a barcode
// scanner types the number of a plot label and Enter) in the Record grid:
// the same trait column as before, else the first trait; the value entry
// then takes the keyboard, so the next thing typed is that plot's value.
// It returns whether the plot was found; a message says why not.
func (r *recordStep) goToPlot(text string) bool {
	t := r.trial()
	s := strings.TrimSpace(text)
	if s == "" {
		return false
	}
	n, err := strconv.Atoi(s)
	if err != nil {
		r.setMsg("“"+s+"” is not a plot number: type or scan the number on the plot's label.", widget.DangerImportance)
		return false
	}
	row := -1
	for i, p := range t.Plots {
		if p.Number == n {
			row = i
			break
		}
	}
	if row < 0 {
		r.setMsg("The trial has no plot "+strconv.Itoa(n)+".", widget.DangerImportance)
		return false
	}
	if len(t.Traits) == 0 {
		r.setMsg("The trial has no traits to record yet: add them in Setup.", widget.WarningImportance)
		return false
	}
	col := r.nfixed
	if r.hasSel && r.sel.Col >= r.nfixed {
		col = r.sel.Col
	}
	id := widget.TableCellID{Row: row, Col: col}
	r.table.Select(id)
	r.table.ScrollTo(id)
	r.focusEntry()
	return true
}
