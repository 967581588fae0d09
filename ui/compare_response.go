package ui

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"
	"gonum.org/v1/plot"

	"furlong/export"
	"furlong/export/chart"
	"furlong/trial"
	"furlong/trial/analysis"
)

// responseView is Compare's "Response" tab for a rate trial (treatments
// with rates, analysis.RatesOf): the trait's means at their rates with the
// fitted curves (chart.RateResponse), the trends of the treatment sum of
// squares on the rates, the four response models and, with a price ratio,
// the economic optimum and how it moves with the ratio
// (analysis.ResponseOf, the rule 'furlong response' and the season report
// use). Which treatments stay out of the trend and the price ratio are
// saved with the trial (undoable). The analysis runs off the UI goroutine
// and comes back through the analyser's post (fyne.Do).
type responseView struct {
	c     *compareStep
	item  *container.TabItem
	leave *widget.CheckGroup
	ratio *widget.Entry
	apply *widget.Button
	msg   *widget.Label // what the last change of settings said
	note  *widget.Label
	trend *textTable
	model *textTable
	sens  *textTable
	chart *fyne.Container
	// tables holds the three tables, each as tall as its rows.
	tables *fyne.Container
	body   *container.Split

	res *analysis.Result
	gen uint64
	// resp is the analysis shown (nil when none).
	resp *analysis.Response
	// syncing is set while the controls are filled from the trial, so that
	// their callbacks do not edit it; syncedFor is the trial they show.
	syncing   bool
	syncedFor *trial.Trial
	// done, when set, is called after an analysis was shown (tests).
	done func()
}

func newResponseView(c *compareStep) *responseView {
	v := &responseView{c: c, msg: widget.NewLabel(""), note: widget.NewLabel(""),
		trend: newTextTable(), model: newTextTable(), sens: newTextTable(), chart: container.NewStack()}
	v.msg.Wrapping = fyne.TextWrapWord
	v.note.Wrapping = fyne.TextWrapWord
	v.leave = widget.NewCheckGroup(nil, func([]string) { v.saveSettings() })
	v.leave.Horizontal = true
	v.ratio = widget.NewEntry()
	v.ratio.SetPlaceHolder("e.g. 0.006")
	v.ratio.OnSubmitted = func(string) { v.saveSettings() }
	v.apply = widget.NewButton("Use price ratio", v.saveSettings)
	h := v.ratio.MinSize().Height
	help := widget.NewLabel("Price ratio: the price of one unit of input in units of produce, in the trait's unit per rate unit " +
		"(yields in t/ha, rates in kg N/ha: 0.006 means 6 kg of grain pay for 1 kg of N). Prices are yours; empty for no economics. " +
		"Saved with the trial; the season report and 'furlong response' use it.")
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	ratioRow := container.NewHBox(widget.NewLabel("Price ratio"), container.NewGridWrap(fyne.NewSize(140, h), v.ratio), v.apply)
	leaveRow := container.NewBorder(nil, nil, widget.NewLabel("Left out of the trend"), nil, container.NewHScroll(v.leave))
	top := container.NewVBox(leaveRow, ratioRow, v.msg, v.note)
	v.msg.Hide()
	v.tables = container.NewVBox(
		heading("Trends on the rates"), allRows(v.trend),
		heading("Response models (y = a + b·x + c·x²)"), allRows(v.model),
		heading("Economic optimum rate at other price ratios"), allRows(v.sens))
	v.body = container.NewHSplit(container.NewScroll(v.tables), v.chart)
	v.body.Offset = 0.5
	v.item = container.NewTabItem("Response", container.NewBorder(top, help, nil, nil, v.body))
	v.syncSettings()
	return v
}

func (v *responseView) tab() *container.TabItem { return v.item }

// trial is the open trial (nil when none).
func (v *responseView) trial() *trial.Trial {
	if v.c.u.doc == nil {
		return nil
	}
	return v.c.u.doc.t
}

// say shows what the last change did; no room taken when empty.
func (v *responseView) say(s string) { sayIn(v.msg, s) }

// syncSettings fills the controls from the trial's saved settings.
func (v *responseView) syncSettings() {
	v.syncing = true
	defer func() { v.syncing = false }()
	t := v.trial()
	if t == nil {
		v.leave.Options, v.leave.Selected = nil, nil
		v.leave.Refresh()
		v.ratio.SetText("")
		return
	}
	// Only a rate trial offers its treatments (a long list of check boxes
	// costs the window time on every round for nothing otherwise), and the
	// boxes are redrawn only when they change.
	var opts, sel []string
	if hasRates(t) {
		opts, sel = t.TreatmentCodes(), leftOutChoices(t)
	}
	if !slices.Equal(opts, v.leave.Options) || !slices.Equal(sel, v.leave.Selected) {
		v.leave.Options, v.leave.Selected = opts, sel
		v.leave.Refresh()
	}
	txt := ""
	if r := t.Analysis.Response.PriceRatio; r > 0 {
		txt = strconv.FormatFloat(r, 'g', -1, 64)
	}
	if v.ratio.Text != txt {
		v.ratio.SetText(txt)
	}
	v.syncedFor = t
}

// hasRates reports whether any treatment of t has a rate.
func hasRates(t *trial.Trial) bool {
	for _, tr := range t.Treatments {
		if tr.Rate != nil {
			return true
		}
	}
	return false
}

// leftOutChoices are the treatments ticked as left out of the trend: the
// saved ones and every treatment without a rate (which cannot be in it).
func leftOutChoices(t *trial.Trial) []string {
	var out []string
	for _, tr := range t.Treatments {
		if tr.Rate == nil || slices.Contains(t.Analysis.Response.LeaveOut, tr.Code) {
			out = append(out, tr.Code)
		}
	}
	return out
}

// saveSettings saves the controls' settings with the trial, as an edit.
func (v *responseView) saveSettings() {
	t := v.trial()
	if t == nil || v.syncing {
		return
	}
	s := trial.ResponseSettings{}
	for _, c := range v.leave.Selected {
		if tr := t.Treatment(c); tr != nil && tr.Rate != nil {
			s.LeaveOut = append(s.LeaveOut, c) // those without a rate are out anyway
		}
	}
	if txt := strings.TrimSpace(v.ratio.Text); txt != "" {
		r, err := trial.ParseNumber(txt, trial.PointOrComma)
		if err != nil || !(r > 0) {
			v.say("The price ratio must be a positive number, such as 0.006; leave it empty for no economics.")
			return
		}
		s.PriceRatio = r
	}
	if msg := t.ResponseProblem(s); msg != "" {
		v.say("Not saved: " + msg + ".")
		return
	}
	old := t.Analysis.Response
	if old.PriceRatio == s.PriceRatio && slices.Equal(old.LeaveOut, s.LeaveOut) {
		return
	}
	v.c.u.doc.apply(&setResponse{before: cloneResponse(old), after: s, what: "response settings"})
	switch {
	case s.PriceRatio != old.PriceRatio && s.PriceRatio > 0:
		v.say(fmt.Sprintf("Saved the price ratio %g with the trial.", s.PriceRatio))
	case s.PriceRatio != old.PriceRatio:
		v.say("Removed the price ratio: no economic optimum.")
	default:
		v.say("Saved which treatments are left out of the trend.")
	}
}

// refresh follows an edit that may have changed the settings or the rates
// (undo, redo, the Treatments tab, another trial).
func (v *responseView) refresh(ch change) {
	if ch&(changeDetails|changeStructure) == 0 {
		return
	}
	v.syncSettings()
	v.analyse()
}

func (v *responseView) show(s *resultSet, tr *traitResult) {
	if v.trial() != v.syncedFor {
		v.syncSettings() // another trial; edits of this one come through refresh
	}
	if s == nil {
		return
	}
	if msg := resultProblem(s, tr); msg != "" {
		v.res = nil
		v.clear(msg)
		return
	}
	v.res = tr.res
	v.analyse()
}

// analyse runs the response analysis of the result shown.
func (v *responseView) analyse() {
	t, r := v.trial(), v.res
	if t == nil || r == nil {
		return
	}
	rates, err := analysis.RatesOf(t, t.Analysis.Response.LeaveOut)
	if err != nil {
		v.clear("The response view is for rate trials, where each treatment is a rate of one input (kg N/ha, seeds/m², …): " + err.Error() + ".")
		return
	}
	v.gen++
	gen, ratio, snap := v.gen, t.Analysis.Response.PriceRatio, t.Clone()
	v.note.SetText("Fitting the response curves…")
	go func() {
		resp, p, err := responseOf(snap, r, rates, ratio)
		v.c.u.compute.post(func() {
			if gen != v.gen {
				return
			}
			v.display(r, resp, p, err)
		})
	}()
}

// responseOf is analysis.ResponseOf and its chart, with a panic turned into
// an error (off the UI goroutine).
func responseOf(t *trial.Trial, r *analysis.Result, rates analysis.Rates, ratio float64) (resp *analysis.Response, p chartImage, err error) {
	defer func() {
		if e := recover(); e != nil {
			resp, err = nil, errAnalysisFailed
		}
	}()
	resp, err = analysis.ResponseOf(r, rates, ratio)
	if resp != nil {
		pl, perr := safePlot(func() (*plot.Plot, error) { return chart.RateResponse(t, resp) })
		p = chartImage{title: "Response", plot: pl, err: perr}
	}
	return resp, p, err
}

// clear shows msg and no analysis (no empty tables).
func (v *responseView) clear(msg string) {
	v.gen++
	v.resp = nil
	v.body.Hide()
	v.note.SetText(msg)
	v.trend.set(nil, nil)
	v.model.set(nil, nil)
	v.sens.set(nil, nil)
	v.tables.Refresh()
	v.chart.Objects = nil
	v.chart.Refresh()
}

// display shows a finished analysis (UI goroutine).
func (v *responseView) display(r *analysis.Result, resp *analysis.Response, p chartImage, err error) {
	defer func() {
		if v.done != nil {
			v.done()
		}
	}()
	if resp == nil {
		v.clear(strings.TrimSpace(explain("The response cannot be analysed for this trait", err).What))
		return
	}
	v.resp = resp
	v.body.Show()
	var note []string
	note = append(note, r.TraitName+": "+export.ResponseNote(resp, r.ANOVA.DFError))
	if err != nil {
		note = append(note, "The curves cannot be fitted: "+err.Error())
	}
	note = append(note, resp.Notes...)
	if resp.PriceRatio > 0 {
		note = append(note, export.EconomicCautionText())
	}
	trend, model, sens := export.ResponseTables(resp, analysis.MeanDecimals(r.Decimals))
	if model.Foot != "" {
		note = append(note, model.Foot)
	}
	v.note.SetText(strings.Join(note, " "))
	v.trend.set(trend.Head, trend.Rows)
	v.model.set(model.Head, model.Rows)
	v.sens.set(sens.Head, sens.Rows)
	v.tables.Refresh()
	v.chart.Objects = nil
	switch {
	case p.err != nil:
		l := widget.NewLabel(explain("The chart could not be drawn", p.err).What)
		l.Wrapping = fyne.TextWrapWord
		v.chart.Objects = []fyne.CanvasObject{l}
	case p.plot != nil:
		v.chart.Objects = []fyne.CanvasObject{newChartView(p.plot)}
	}
	v.chart.Refresh()
}

// setResponse replaces the trial's response settings (undoable).
type setResponse struct {
	before, after trial.ResponseSettings
	what          string
}

func cloneResponse(s trial.ResponseSettings) trial.ResponseSettings {
	s.LeaveOut = slices.Clone(s.LeaveOut)
	return s
}

func (c *setResponse) do(t *trial.Trial)   { t.Analysis.Response = cloneResponse(c.after) }
func (c *setResponse) undo(t *trial.Trial) { t.Analysis.Response = cloneResponse(c.before) }
func (c *setResponse) kind() change        { return changeDetails }
func (c *setResponse) label() string       { return c.what }

// allRows shows t at the height of all its rows and the width of all its
// columns, for a few short tables one below the other in a scroll.
func allRows(t *textTable) fyne.CanvasObject {
	return container.New(&allRowsLayout{t: t}, t)
}

type allRowsLayout struct{ t *textTable }

func (l *allRowsLayout) MinSize([]fyne.CanvasObject) fyne.Size {
	if len(l.t.head) == 0 {
		return fyne.NewSize(0, 0)
	}
	// A table row is its cell and the separator, with a little room that
	// Fyne's table adds; measured on screen, a row short otherwise.
	row := compactCell("", true).MinSize().Height + theme.SeparatorThicknessSize() + 2
	return fyne.NewSize(l.t.width(), float32(len(l.t.rows)+1)*row+2*theme.Padding())
}

func (l *allRowsLayout) Layout(objs []fyne.CanvasObject, size fyne.Size) {
	for _, o := range objs {
		o.Move(fyne.NewPos(0, 0))
		o.Resize(size)
	}
}
