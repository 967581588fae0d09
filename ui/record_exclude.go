package ui

import (
	"fmt"
	"slices"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

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
	cmd := &setExclusions{plot: row, number: p.Number, old: slices.Clone(p.Exclusions), oldNote: p.Note}
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
