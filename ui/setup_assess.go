package ui

import (
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// assessDialog adds an assessment series: a trait assessed on several dates
// (or day counts after treatment or sowing), one trait per assessment, and
// the series' area under the progress curve and its standardised form,
// computed per plot (trial.AssessmentSeries, the rule of 'furlong new
// --assess'). The series then gets percent efficacy against the untreated
// check in Compare and the report, and its chart over the season.
func (s *traitsTab) assessDialog() {
	key := widget.NewEntry()
	key.SetPlaceHolder("series key, e.g. sev")
	unit := widget.NewEntry()
	unit.SetPlaceHolder("unit, e.g. % (percent of leaf area)")
	whens := widget.NewEntry()
	whens.SetPlaceHolder("2026-06-01, 2026-06-15, 2026-06-29   or   7DAT, 14DAT, 21DAT")
	items := []*widget.FormItem{
		widget.NewFormItem("Series key", key),
		widget.NewFormItem("Unit", unit),
		widget.NewFormItem("Assessed on", whens),
	}
	help := widget.NewLabel("One trait per assessment (key_1, key_2, …) and two computed traits: the area under the progress curve (key_audpc, trapezoidal rule) and its standardised form (key_saudpc, divided by the duration). Dates as 2026-06-01, or days after treatment (7DAT) or sowing (35DAS); \"2026-06-08/7DAT\" gives both.")
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	items = append(items, widget.NewFormItem("", help))
	d := dialog.NewForm("Add an assessment series", "Add", "Cancel", items, func(ok bool) {
		if !ok {
			return
		}
		s.addAssessmentSeries(key.Text, unit.Text, whens.Text)
	}, s.u.win)
	d.Resize(fyne.NewSize(640, d.MinSize().Height))
	d.Show()
}

// addAssessmentSeries adds the traits of a series as one edit (undoable);
// a problem is shown under the form in plain words.
func (s *traitsTab) addAssessmentSeries(key, unit, whens string) bool {
	ts, err := trial.AssessmentSeries(strings.TrimSpace(key), strings.TrimSpace(unit), whens)
	if err != nil {
		s.traitProblem("The series was not added", err)
		return false
	}
	ok := s.structural("The series was not added", func(t *trial.Trial) error {
		for _, tr := range ts {
			if err := t.AddTrait(tr); err != nil {
				return err
			}
		}
		return nil
	})
	if ok {
		s.tf.msg.Importance = widget.SuccessImportance
		s.tf.msg.SetText("Added the series " + strings.TrimSpace(key) + ": " + plural(len(ts)-2, "assessment", "assessments") + " and its AUDPC. Undo (Ctrl+Z) takes it back.")
	}
	return ok
}
