package ui

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/layout"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/export"
	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// compareStep shows the analysis of one trait (ANOVA, means with letters,
// statistics, warnings, charts) and a summary of every trait.
type compareStep struct {
	u *App

	traitKey string
	method   meansep.Method
	alpha    float64

	traitSel  *widget.Select
	methodSel *widget.RadioGroup
	alphaSel  *widget.Select
	state     *widget.Label // "computing…", timings

	anova    *fyne.Container
	statsBox *fyne.Container
	warnings *widget.Label
	means    *widget.Table
	meanRows []analysis.Mean
	// treatWidth is the width of the means table's treatment column.
	treatWidth float32
	meansPane  *fyne.Container
	detail     *container.Split
	charts     *container.AppTabs

	summary     *widget.Table
	summaryHead []string
	summaryRows [][]string

	shown         *resultSet
	shownDecimals int
	// limits: the means table shows the back-transformed confidence
	// limits of each mean instead of its SE (a transformed trait), in a
	// column limitsWidth wide; limitsLevel is their level (1 − alpha).
	limits      bool
	limitsWidth float32
	limitsLevel float64
	// eff is the percent efficacy of the trait shown against the
	// untreated check, a sixth column of the means table (nil: none).
	eff *analysis.Efficacy
	// views are the further views beside "This trait" (compare_views.go),
	// in tabs.
	views []compareView
	tabs  *container.AppTabs
	root  fyne.CanvasObject
}

func newCompareStep(u *App) *compareStep {
	c := &compareStep{u: u, method: u.prefs.method, alpha: u.prefs.alpha}
	c.traitSel = widget.NewSelect(nil, func(s string) {
		key := c.keyForLabel(s)
		if key == c.traitKey {
			return
		}
		c.traitKey = key
		c.show(c.shown)
		u.compute.settingsChanged()
	})
	c.methodSel = widget.NewRadioGroup([]string{methodLabel(meansep.LSD), methodLabel(meansep.Tukey)}, func(s string) {
		m := meansep.LSD
		if s == methodLabel(meansep.Tukey) {
			m = meansep.Tukey
		}
		if m == c.method {
			return
		}
		c.method = m
		u.chooseMethod(m) // remembered in the trial: the report uses it too
		c.show(c.shown)
		u.compute.settingsChanged() // the chart letters follow the method
	})
	c.methodSel.Horizontal = true
	c.methodSel.SetSelected(methodLabel(c.method))
	c.alphaSel = widget.NewSelect(alphaChoices, func(s string) {
		a, err := strconv.ParseFloat(s, 64)
		if err != nil || a == c.alpha {
			return
		}
		c.alpha = a
		u.compute.settingsChanged()
	})
	c.alphaSel.SetSelected(strconv.FormatFloat(c.alpha, 'g', -1, 64))
	c.state = widget.NewLabel("")
	c.state.Importance = widget.LowImportance

	c.anova = container.New(columnsLayout{cols: 6})
	c.statsBox = container.New(columnsLayout{cols: 2})
	c.warnings = widget.NewLabel("")
	c.warnings.Wrapping = fyne.TextWrapWord
	c.means = widget.NewTableWithHeaders(
		func() (int, int) { return len(c.meanRows), c.meanCols() },
		func() fyne.CanvasObject { return compactCell("", false) },
		c.updateMean)
	c.means.ShowHeaderColumn = false
	// The table's rows are as tall as its header cells: both compact.
	c.means.CreateHeader = func() fyne.CanvasObject { return compactCell("", true) }
	c.means.UpdateHeader = func(id widget.TableCellID, o fyne.CanvasObject) {
		setCompact(o, c.meansHeader(id.Col))
	}
	for i, w := range meansColumns {
		c.means.SetColumnWidth(i, w)
	}
	c.charts = container.NewAppTabs()

	c.summary = widget.NewTableWithHeaders(
		func() (int, int) { return len(c.summaryRows), len(c.summaryHead) },
		func() fyne.CanvasObject { return compactCell("", false) },
		func(id widget.TableCellID, o fyne.CanvasObject) {
			text := ""
			if row := c.summaryRows[id.Row]; id.Col < len(row) {
				text = row[id.Col]
			}
			setCompact(o, text)
		})
	c.summary.ShowHeaderColumn = false
	c.summary.CreateHeader = func() fyne.CanvasObject { return compactCell("", true) }
	c.summary.UpdateHeader = func(id widget.TableCellID, o fyne.CanvasObject) {
		if id.Col < len(c.summaryHead) {
			setCompact(o, c.summaryHead[id.Col])
		}
	}

	controls := container.NewHBox(widget.NewLabel("Trait"), container.NewGridWrap(fyne.NewSize(300, c.traitSel.MinSize().Height), c.traitSel), widget.NewSeparator(), c.methodSel,
		widget.NewSeparator(), widget.NewLabel("Significance level"), c.alphaSel, c.state)
	caution := widget.NewLabel(export.CautionShort)
	caution.Importance = widget.WarningImportance
	caution.Truncation = fyne.TextTruncateEllipsis

	// Scrolls both ways, so that a long line in the statistics never
	// widens the pane (and squeezes the charts).
	upper := container.NewScroll(container.NewVBox(heading("Analysis of variance"), c.anova, heading("Statistics"), c.statsBox, c.warnings))
	// The means pane is as wide as the table's columns, so that the
	// letters never hide behind a horizontal scroll; the split gives the
	// charts the rest (at least chartMinSize).
	c.meansPane = container.New(&widthFloor{width: c.meansWidth}, container.NewBorder(heading("Means"), nil, nil, nil, c.means))
	left := container.NewVSplit(upper, c.meansPane)
	left.Offset = 0.6
	detail := container.NewHSplit(left, c.charts)
	detail.Offset = 0.42
	c.detail = detail
	tabs := container.NewAppTabs(
		container.NewTabItem("This trait", detail),
		container.NewTabItem("All traits", c.summary),
	)
	c.views = c.newViews()
	for _, v := range c.views {
		tabs.Append(v.tab())
	}
	// A view that is costly to fill (every pair of 300 entries) fills
	// itself only while its tab is shown.
	c.tabs = tabs
	tabs.OnSelected = func(it *container.TabItem) {
		for _, v := range c.views {
			if l, ok := v.(interface{ shown() }); ok && v.tab() == it {
				l.shown()
			}
		}
	}
	c.root = container.NewBorder(controls, caution, nil, nil, tabs)
	u.compute.onResults = append(u.compute.onResults, c.show)
	u.compute.onChecks = append(u.compute.onChecks, c.showSummary)
	c.refresh(changeAll)
	return c
}

// summaryWidths fits the summary columns to their headings.
func (c *compareStep) summaryWidths() {
	for i, h := range c.summaryHead {
		w := fyne.MeasureText(h, theme.TextSize(), fyne.TextStyle{Bold: true}).Width + 4*theme.Padding()
		w = min(max(w, 110), 260)
		if i == 0 {
			w = 290
		}
		c.summary.SetColumnWidth(i, w)
	}
}

// compactCell is one cell of the ANOVA and statistics grids: plain text
// with little padding, so that both fit above the means on a 768-pixel
// screen (a label's padding doubles the row height).
func compactCell(s string, bold bool) fyne.CanvasObject {
	t := canvas.NewText(s, theme.Color(theme.ColorNameForeground))
	t.TextStyle = fyne.TextStyle{Bold: bold}
	p := theme.Padding()
	return container.New(layout.NewCustomPaddedLayout(p/2, p/2, p, p*2), t)
}

// setCompact sets the text of a compactCell in the current theme colour.
func setCompact(o fyne.CanvasObject, s string) {
	t := o.(*fyne.Container).Objects[0].(*canvas.Text)
	t.Text = s
	t.Color = theme.Color(theme.ColorNameForeground)
	t.Refresh()
}

func heading(s string) *widget.Label {
	return widget.NewLabelWithStyle(s, fyne.TextAlignLeading, fyne.TextStyle{Bold: true})
}

func (c *compareStep) object() fyne.CanvasObject { return c.root }

func (c *compareStep) keyForLabel(s string) string {
	for _, tr := range c.u.doc.t.Traits {
		if traitLabel(&tr) == s {
			return tr.Key
		}
	}
	return ""
}

// refresh follows trait changes; the analyser recomputes on data changes.
func (c *compareStep) refresh(ch change) {
	t := c.u.doc.t
	for _, v := range c.views {
		if r, ok := v.(interface{ refresh(change) }); ok {
			r.refresh(ch)
		}
	}
	if m := c.u.trialMethod(); m != c.method {
		c.method = m // the trial's remembered method (opened, or undone)
		c.methodSel.SetSelected(methodLabel(m))
	}
	if ch&changeStructure == 0 && len(c.traitSel.Options) == len(t.Traits) {
		if ch&changeValues != 0 {
			c.state.SetText("updating…")
		}
		return
	}
	var opts []string
	sel := ""
	for _, tr := range t.Traits {
		opts = append(opts, traitLabel(&tr))
		if tr.Key == c.traitKey {
			sel = traitLabel(&tr)
		}
	}
	c.traitSel.SetOptions(opts)
	if sel == "" && len(t.Traits) > 0 {
		c.traitKey = analysableDefault(t.Traits)
		for _, tr := range t.Traits {
			if tr.Key == c.traitKey {
				sel = traitLabel(&tr)
			}
		}
	}
	c.traitSel.SetSelected(sel)
}

// show displays a round of results.
func (c *compareStep) show(s *resultSet) {
	c.shown = s
	if s == nil {
		return
	}
	c.state.SetText(fmt.Sprintf("up to date (%d ms)", s.took.Milliseconds()))
	tr := s.result(c.traitKey)
	c.anova.Objects = nil
	c.statsBox.Objects = nil
	c.meanRows = nil
	c.eff = nil
	c.limits = false
	if msg := resultProblem(s, tr); msg != "" {
		c.warnings.SetText(msg)
	} else {
		c.showResult(tr.res)
	}
	c.anova.Refresh()
	c.statsBox.Refresh()
	c.fitTreatmentColumn()
	c.means.Refresh()
	if c.meansPane.MinSize().Width > c.meansPane.Size().Width {
		// The columns grew: lay the split out again around the new width.
		c.detail.Refresh()
	}
	if s.focus == c.traitKey && s.charts != nil {
		c.showCharts(s.charts)
	}
	if s.complete {
		c.showSummary(s)
	}
	for _, v := range c.views {
		v.show(s, tr)
	}
}

// resultProblem says, in words for the screen, why round s has no result
// to show for tr ("" when tr holds one).
func resultProblem(s *resultSet, tr *traitResult) string {
	switch {
	case len(s.snap.Traits) == 0:
		return "The trial has no traits yet. Add them in Setup and record data in Record; the analysis appears here."
	case len(s.snap.Plots) == 0:
		return "The trial is not laid out yet. Randomise it in Field and record data; the analysis appears here."
	case tr == nil:
		return "Computing…"
	case tr.err != nil:
		m := explain("This trait cannot be analysed yet", tr.err)
		return m.What + " " + m.Do
	case tr.res == nil:
		return "Computing…"
	}
	return ""
}

func (c *compareStep) showResult(r *analysis.Result) {
	cell := compactCell
	for _, h := range []string{"Source", "df", "SS", "MS", "F", "P"} {
		c.anova.Add(cell(h, true))
	}
	if r.IsFactorial() {
		c.showFactorialANOVA(r) // compare_effects.go
	}
	if r.ANOVA != nil {
		for _, src := range r.ANOVA.Sources {
			if r.IsFactorial() {
				break
			}
			c.anova.Add(cell(export.SourceName(src), false))
			c.anova.Add(cell(strconv.Itoa(src.DF), false))
			c.anova.Add(cell(num(src.SS, 5), false))
			ms, f, p := "", "", ""
			if src.Role != stats.RoleTotal {
				ms = num(src.MS, 5)
			}
			if src.HasTest {
				f, p = fixed(src.F, 2), stats.FormatP(src.P)
			}
			c.anova.Add(cell(ms, false))
			c.anova.Add(cell(f, false))
			c.anova.Add(cell(p, false))
		}
		a := r.ANOVA
		add := func(k, v string) { c.statsBox.Add(cell(k, false)); c.statsBox.Add(cell(v, true)) }
		// The grand mean and the LSD are on the scale analysed.
		dec, unit := analysis.MeanDecimals(r.Decimals), r.Unit
		if r.Transform != stats.NoTransform {
			dec, unit = analysis.TransformedDecimals, "("+r.Transform.Scale()+" scale)"
		}
		add("Grand mean", fixed(a.GrandMean, dec)+" "+unit)
		add("CV %", fixed(a.CVPercent, 1))
		v := r.LSD
		if c.method == meansep.Tukey {
			v = r.HSD
		}
		level := export.MSDLabel(c.method, r.Alpha) // the report's words too
		rng := r.LSDRange
		if c.method == meansep.Tukey {
			rng = r.HSDRange
		}
		msd := export.MSDText(v, rng, dec)
		if r.Transform != stats.NoTransform {
			msd += " " + unit
		}
		add(level, msd)
		add("R²", fixed(a.RSquared, 3))
		if a.RelativeEfficiency != nil {
			re := fixed(*a.RelativeEfficiency, 2)
			if !a.Balanced {
				re += " (approximate: missing plots)"
			}
			add("Relative efficiency of blocking", re)
		}
		add("Plots analysed", fmt.Sprintf("%d (missing %d, excluded %d)", r.N, r.Missing, len(r.Excluded)))
		c.showChecks(r)
	}
	warn := slices.Clone(r.Warnings)
	if e := r.Efficacy; e != nil {
		w := "% efficacy against the untreated check " + e.Untreated + ": Abbott, (untreated − treatment)/untreated × 100 on the means"
		if e.PreCount != "" {
			w += "; H–T: Henderson–Tilton with the counts before (trait " + e.PreCount + ") and after"
		}
		warn = append(warn, w+". Caution: "+export.ProtectionCautionText())
	}
	c.warnings.SetText(strings.Join(warn, "\n"))
	rows := slices.Clone(r.Means)
	if c.u.prefs.meansOrder == orderBestFirst {
		slices.SortStableFunc(rows, func(a, b analysis.Mean) int {
			if r.HigherBetter {
				a, b = b, a
			}
			switch {
			case a.BackMean < b.BackMean:
				return -1
			case a.BackMean > b.BackMean:
				return 1
			}
			return 0
		})
	}
	c.meanRows = rows
	c.eff = r.Efficacy
	c.shownDecimals = r.Decimals
	c.limits = r.Transform != stats.NoTransform
	c.limitsLevel = 1 - r.Alpha
}

// Widths of the means table's treatment column: at least the heading's
// room, at most what leaves the numbers and the charts in view at 1366
// pixels (longer names are shortened with an ellipsis).
const (
	treatColMin = 150
	treatColMax = 200
)

// meansColumns are the starting widths of the means table's columns:
// treatment, plots, mean, SE, letters.
var meansColumns = []float32{treatColMin, 50, 80, 75, 80}

// meansWidth is the width the means table needs to show every column:
// its columns, the gaps between them and room for the vertical scroll bar.
// At the window's default 1280 pixels this leaves the charts their
// chartMinSize.
func (c *compareStep) meansWidth() float32 {
	w := c.treatWidth
	if w == 0 {
		w = treatColMin
	}
	for i, cw := range meansColumns[1:] {
		if i+1 == 3 && c.limits {
			cw = max(cw, c.limitsWidth)
		}
		w += cw
	}
	cols := len(meansColumns)
	if c.eff != nil {
		w += c.effWidth()
		cols++
	}
	return w + float32(cols)*theme.Padding() + theme.ScrollBarSize()
}

// widthFloor lays out one object filling the container, with a minimum
// width of width() (and the object's own minimum height).
type widthFloor struct{ width func() float32 }

func (l *widthFloor) MinSize(objs []fyne.CanvasObject) fyne.Size {
	s := fyne.NewSize(l.width(), 0)
	for _, o := range objs {
		m := o.MinSize()
		s = s.Max(fyne.NewSize(0, m.Height))
	}
	return s
}

func (l *widthFloor) Layout(objs []fyne.CanvasObject, size fyne.Size) {
	for _, o := range objs {
		o.Move(fyne.NewPos(0, 0))
		o.Resize(size)
	}
}

// fitTreatmentColumn widens the treatment column to its longest name (up
// to treatColMax); cell text never runs into the next column, since
// updateMean shortens what still does not fit (fitText).
func (c *compareStep) fitTreatmentColumn() {
	w := float32(treatColMin)
	for i := range c.meanRows {
		w = max(w, cellTextWidth(c.meanText(i, 0)))
	}
	c.treatWidth = min(w, treatColMax)
	c.means.SetColumnWidth(0, c.treatWidth)
	if c.eff != nil {
		c.means.SetColumnWidth(5, c.effWidth())
	}
	c.fitLimitsColumn()
}

// cellTextWidth is the width a compactCell needs for s.
func cellTextWidth(s string) float32 {
	return fyne.MeasureText(s, theme.TextSize(), fyne.TextStyle{}).Width + 3*theme.Padding()
}

func (c *compareStep) updateMean(id widget.TableCellID, o fyne.CanvasObject) {
	if id.Col == 0 {
		// A compactCell pads by three paddings, fitText allows for two.
		setCompact(o, fitText(c.meanText(id.Row, 0), treatColMax-theme.Padding(), theme.TextSize()))
		return
	}
	setCompact(o, c.meanText(id.Row, id.Col))
}

// meanText is the text of one cell of the means table.
func (c *compareStep) meanText(row, col int) string {
	if row >= len(c.meanRows) {
		return ""
	}
	m := c.meanRows[row]
	switch col {
	case 0:
		s := m.Treatment
		if m.Name != "" && m.Name != m.Treatment {
			s += "  " + m.Name
		}
		if m.Check {
			s += " (check)"
		}
		return s
	case 1:
		return strconv.Itoa(m.N)
	case 2:
		return fixed(m.BackMean, analysis.MeanDecimals(c.shownDecimals))
	case 3:
		if c.limits {
			return limitsText(m, analysis.MeanDecimals(c.shownDecimals))
		}
		return fixed(m.SE, analysis.MeanDecimals(c.shownDecimals))
	case 4:
		if c.method == meansep.Tukey {
			return m.LettersTukey
		}
		return m.LettersLSD
	case 5:
		return c.efficacyText(m.Treatment)
	}
	return ""
}

func (c *compareStep) showCharts(cs []chartImage) {
	sel := 0
	if it := c.charts.Selected(); it != nil {
		sel = slices.Index(c.charts.Items, it)
	}
	var items []*container.TabItem
	for _, ch := range cs {
		var obj fyne.CanvasObject
		if ch.err != nil {
			m := explain("The chart could not be drawn", ch.err)
			l := widget.NewLabel(m.What)
			l.Wrapping = fyne.TextWrapWord
			obj = l
		} else {
			obj = newChartView(ch.plot)
		}
		items = append(items, container.NewTabItem(ch.title, obj))
	}
	c.charts.SetItems(items)
	if sel >= 0 && sel < len(items) {
		c.charts.SelectIndex(sel)
	}
}

// showSummary fills the table of all traits from a complete round.
func (c *compareStep) showSummary(s *resultSet) {
	c.summaryHead, c.summaryRows = summaryTable(s, c.method)
	c.summaryWidths()
	c.summary.Refresh()
}

// summaryTable is the all-traits table of the season report's summary
// sheet (export.NewSummary): one row per treatment with each trait's mean
// and letters and the percentage of the check, then the lines of
// statistics.
func summaryTable(s *resultSet, method meansep.Method) (head []string, rows [][]string) {
	outs := make([]analysis.Outcome, 0, len(s.traits))
	keys := make([]string, 0, len(s.traits))
	for _, tr := range s.traits {
		r := tr.res
		if vc := s.vsChecks[tr.key]; vc != nil && r != nil {
			cp := *r // the round's result is shared: a copy carries the comparison
			cp.VsCheck = vc
			r = &cp
		}
		outs = append(outs, analysis.Outcome{Key: tr.key, Result: r, Err: tr.err})
		keys = append(keys, tr.key)
	}
	sum := export.NewSummary(s.snap, outs, keys, method, s.alpha)
	head = []string{"Treatment"}
	for _, st := range sum.Traits {
		h := st.Name
		if st.Unit != "" {
			h += " (" + st.Unit + ")"
		}
		head = append(head, h)
		if st.CheckMean != nil {
			head = append(head, st.Name+" % of check")
		}
		if st.VsCheck != nil {
			head = append(head, st.Name+" vs check")
		}
	}
	for _, r := range sum.Rows {
		row := []string{r.Treatment + "  " + r.Name}
		if r.Check {
			row[0] += " (check)"
		}
		for i, c := range r.Cells {
			st := sum.Traits[i]
			switch {
			case !c.OK:
				row = append(row, "–")
			default:
				row = append(row, strings.TrimSpace(fixed(c.Mean, st.MeanDecimals)+" "+c.Letters))
			}
			if st.CheckMean != nil {
				if c.PercentOfCheck != nil {
					row = append(row, fixed(*c.PercentOfCheck, 0))
				} else {
					row = append(row, "–")
				}
			}
			if st.VsCheck != nil {
				row = append(row, c.VsCheck)
			}
		}
		rows = append(rows, row)
	}
	line := func(name string, f func(st export.SummaryTrait) string) {
		row := []string{name}
		for _, st := range sum.Traits {
			if st.Result == nil {
				row = append(row, "")
			} else {
				row = append(row, f(st))
			}
			if st.CheckMean != nil {
				row = append(row, "")
			}
			if st.VsCheck != nil {
				row = append(row, "")
			}
		}
		rows = append(rows, row)
	}
	line("Mean", func(st export.SummaryTrait) string { return fixed(st.GrandMean, st.MeanDecimals) })
	line("CV %", func(st export.SummaryTrait) string { return fixed(st.CVPercent, 1) })
	line(export.MSDLabel(method, s.alpha), func(st export.SummaryTrait) string {
		return export.MSDText(st.MSD, st.MSDRange, st.MeanDecimals)
	})
	line("P (treatments)", func(st export.SummaryTrait) string {
		if !st.HasP {
			return "–"
		}
		return stats.FormatP(st.P)
	})
	for _, st := range sum.Traits {
		if st.Result == nil && st.Reason != "" {
			rows = append(rows, []string{st.Name + ": " + st.Reason})
		}
	}
	if note := sum.VsCheckNote(); note != "" {
		rows = append(rows, []string{note})
	}
	return head, rows
}

// analysableDefault picks the trait Compare opens with: the first derived
// trait (usually adjusted yield), else the first.
func analysableDefault(ts []trial.Trait) string {
	for _, t := range ts {
		if t.Derived != nil {
			return t.Key
		}
	}
	return ts[0].Key
}
