package ui

import (
	"context"
	"fmt"
	"io"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/export"
	"furlong/export/chart"
	"furlong/export/xlsx"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// reportStep chooses what goes into the season report and writes it, the
// field book, the map and the charts.
type reportStep struct {
	u    *App
	root fyne.CanvasObject

	traits   *widget.CheckGroup
	charts   *widget.Check
	method   *widget.RadioGroup
	alpha    *widget.Select
	paperSel *widget.RadioGroup
	state    *widget.Label

	keys    []string        // trait key of each option of traits
	off     map[string]bool // traits left out of the report, by key
	loading bool
}

var paperLabels = []string{"A4", "US Letter"}

func newReportStep(u *App) *reportStep {
	r := &reportStep{u: u, off: map[string]bool{}}
	r.traits = widget.NewCheckGroup(nil, r.traitsChanged)
	r.charts = widget.NewCheck("A chart of the means on each trait sheet", nil)
	r.charts.SetChecked(true)
	// The trial's one method, shared with Compare (u.chooseMethod).
	r.method = widget.NewRadioGroup([]string{methodLabel(meansep.LSD), methodLabel(meansep.Tukey)}, func(s string) {
		m := meansep.LSD
		if s == methodLabel(meansep.Tukey) {
			m = meansep.Tukey
		}
		u.chooseMethod(m)
	})
	r.method.SetSelected(methodLabel(u.trialMethod()))
	r.method.Horizontal = true
	r.alpha = widget.NewSelect(alphaChoices, nil)
	r.alpha.SetSelected(strconv.FormatFloat(u.prefs.alpha, 'g', -1, 64))
	r.paperSel = widget.NewRadioGroup(paperLabels, nil)
	r.paperSel.Horizontal = true
	if u.prefs.units == unitsImperial {
		r.paperSel.SetSelected(paperLabels[1])
	} else {
		r.paperSel.SetSelected(paperLabels[0])
	}
	r.state = widget.NewLabel("")
	r.state.Wrapping = fyne.TextWrapWord

	form := widget.NewForm(
		widget.NewFormItem("Traits", r.traits),
		widget.NewFormItem("Contents", r.charts),
		widget.NewFormItem("Mean separation", r.method),
		widget.NewFormItem("Significance level", r.alpha),
		widget.NewFormItem("Paper", r.paperSel),
	)
	workbook := widget.NewButtonWithIcon("Season report (xlsx)…", theme.DocumentSaveIcon(), r.exportReport)
	workbook.Importance = widget.HighImportance
	printable := widget.NewButtonWithIcon("Season report (PDF)…", theme.DocumentPrintIcon(), r.exportReportPDF)
	bookCSV := widget.NewButtonWithIcon("Field book (CSV)…", theme.DocumentSaveIcon(), u.exportFieldBookCSV)
	bookXLSX := widget.NewButtonWithIcon("Field book (xlsx)…", theme.DocumentSaveIcon(), u.exportFieldBookXLSX)
	fmap := widget.NewButtonWithIcon("Field map (PDF/PNG)…", theme.DocumentSaveIcon(), u.exportMapDialog)
	chartBtn := widget.NewButtonWithIcon("Chart of the Compare trait (PNG/SVG/PDF)…", theme.DocumentSaveIcon(), r.exportChart)
	labels := widget.NewButtonWithIcon("Plot labels with barcodes (PDF)…", theme.DocumentPrintIcon(), r.exportLabels)
	caution := widget.NewLabel(export.CautionShort)
	caution.Importance = widget.WarningImportance
	caution.Wrapping = fyne.TextWrapWord
	body := container.NewVBox(heading("Season report"), form, container.NewGridWithColumns(2, workbook, printable), r.state,
		widget.NewSeparator(), heading("Other exports"), bookCSV, bookXLSX, fmap, labels, chartBtn,
		widget.NewSeparator(), caution)
	r.root = container.NewVScroll(container.NewPadded(body))
	r.refresh(changeAll)
	return r
}

func (r *reportStep) object() fyne.CanvasObject { return r.root }

func (r *reportStep) refresh(c change) {
	if m := methodLabel(r.u.trialMethod()); r.method.Selected != m {
		r.method.SetSelected(m)
	}
	if c&changeStructure == 0 {
		return
	}
	t := r.u.doc.t
	var opts, sel []string
	r.keys = r.keys[:0]
	for _, tr := range t.Traits {
		l := traitLabel(&tr)
		opts = append(opts, l)
		r.keys = append(r.keys, tr.Key)
		if !r.off[tr.Key] {
			sel = append(sel, l)
		}
	}
	r.loading = true
	r.traits.Options = opts
	r.traits.SetSelected(sel)
	r.traits.Refresh()
	r.loading = false
}

// traitsChanged remembers the traits left out by key, so that renaming a
// trait in Setup keeps its choice.
func (r *reportStep) traitsChanged(sel []string) {
	if r.loading {
		return
	}
	for i, l := range r.traits.Options {
		if i < len(r.keys) {
			r.off[r.keys[i]] = !contains(sel, l)
		}
	}
}

func contains(list []string, s string) bool {
	for _, v := range list {
		if v == s {
			return true
		}
	}
	return false
}

// paper is the paper size chosen in the Report step (A4 before it exists,
// US Letter for imperial units).
func (u *App) paper() xlsx.Paper {
	if r, ok := u.steps[stepReport].(*reportStep); ok && r != nil {
		if r.paperSel.Selected == paperLabels[1] {
			return xlsx.Letter
		}
		return xlsx.A4
	}
	if u.prefs.units == unitsImperial {
		return xlsx.Letter
	}
	return xlsx.A4
}

// reportOptions reads the controls.
func (r *reportStep) reportOptions() (xlsx.ReportOptions, []string) {
	t := r.u.doc.t
	var keys []string
	for _, tr := range t.Traits {
		if contains(r.traits.Selected, traitLabel(&tr)) {
			keys = append(keys, tr.Key)
		}
	}
	m := r.u.trialMethod()
	a, err := strconv.ParseFloat(r.alpha.Selected, 64)
	if err != nil {
		a = 0.05
	}
	return xlsx.ReportOptions{Method: m, Alpha: a, Traits: keys, Version: r.u.opts.Version,
		Charts: r.charts.Checked, Paper: r.u.paper()}, keys
}

func (r *reportStep) exportReport() {
	opts, keys := r.reportOptions()
	if len(keys) == 0 {
		r.state.SetText("Choose at least one trait for the report.")
		return
	}
	snap := cloneTrial(r.u.doc.t)
	name := safeFileName(snap.Title) + " report.xlsx"
	r.u.exportDialog("season report", name, []string{".xlsx"}, true, func(ctx context.Context, w io.Writer, _ string, progress func(int, int)) error {
		return writeReport(ctx, w, snap, keys, opts, progress)
	})
}

// writeReport analyses the chosen traits of a snapshot and writes the
// season report workbook; it is the work behind the report's save dialog.
func writeReport(ctx context.Context, w io.Writer, t *trial.Trial, keys []string, opts xlsx.ReportOptions, progress func(int, int)) error {
	results, err := analyseForReport(ctx, t, keys, opts)
	if err != nil {
		return err
	}
	steps := len(keys)
	if progress != nil {
		progress(steps, 2*steps)
	}
	opts.Progress = func(done, total int) {
		if progress != nil && total > 0 {
			progress(steps+done*steps/total, 2*steps)
		}
	}
	return xlsx.WriteReport(ctx, w, t, results, opts)
}

// analyseForReport is the analysis behind both season reports (workbook and
// PDF): the one analyse loop (each trait on its own scale, the report's
// method), then each entry against the trial's check and the trial's saved
// contrasts (analysis.AddExtras), as 'furlong report' does.
func analyseForReport(ctx context.Context, t *trial.Trial, keys []string, opts xlsx.ReportOptions) ([]analysis.Outcome, error) {
	results, err := analysis.AnalyzeAll(ctx, t, keys, analysis.Options{Alpha: opts.Alpha, Method: opts.Method})
	if err != nil {
		return nil, err
	}
	if err := analysis.AddExtras(results, t.Analysis.Contrasts, analysis.Extras{VsCheck: true, Adjust: analysis.SavedAdjustment(t)}); err != nil {
		return nil, err
	}
	return results, ctx.Err()
}

// exportChart writes the means chart of the trait shown in Compare.
func (r *reportStep) exportChart() {
	snap := cloneTrial(r.u.doc.t)
	key := r.u.compute.focusKey()
	if snap.Trait(key) == nil && len(snap.Traits) > 0 {
		key = snap.Traits[0].Key
	}
	if key == "" {
		r.state.SetText("The trial has no traits to chart.")
		return
	}
	opts, _ := r.reportOptions()
	order := chartOrder(r.u.prefs.meansOrder)
	name := fmt.Sprintf("%s %s means.png", safeFileName(snap.Title), key)
	r.u.exportDialog("chart", name, []string{".png", ".svg", ".pdf"}, false, func(ctx context.Context, w io.Writer, ext string, _ func(int, int)) error {
		tr := analyzeTrait(snap, key, analysis.Options{Alpha: opts.Alpha})
		if tr.err != nil {
			return tr.err
		}
		// The order of means preference, as on screen.
		p, err := chart.Means(snap, tr.res, chart.MeansOptions{Letters: opts.Method, Order: order})
		if err != nil {
			return err
		}
		format := strings.TrimPrefix(ext, ".")
		if format != "svg" && format != "pdf" {
			format = "png"
		}
		return chart.SaveA4(p, w, format)
	})
}
