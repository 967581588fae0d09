// Package xlsx writes Furlong's spreadsheet workbooks: the season report of
// a trial (cover, summary of means, one sheet per trait with its analysis of
// variance and chart, the plot data and the field map) and the field book a
// crew fills in, and reads a filled-in field book back as a table.
package xlsx

import (
	"context"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"

	"furlong/export"
	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// ReportOptions control WriteReport.
type ReportOptions struct {
	// Method is the mean separation shown; "" for the trial's remembered
	// method (trial.Trial.MeanSeparation), the one Compare shows.
	Method meansep.Method
	Alpha  float64 // significance level of the letters and LSD/HSD, default 0.05
	// Traits lists the keys of the traits to report, in order; empty for
	// every trait of the trial.
	Traits  []string
	Version string    // software version printed on the cover
	Now     time.Time // date of the report; zero for the current time
	Charts  bool      // embed a chart of the means on each trait sheet
	Paper   Paper     // A4 (default) or Letter
	// Progress, when not nil, is called after each sheet with the sheets
	// done and the total.
	Progress func(done, total int)
}

// Sheet names of the report, before any trait sheet.
const (
	CoverSheet    = "Cover"
	SummarySheet  = "Summary"
	DataSheet     = "Data"
	FieldMapSheet = "Field map"
	// OperationsSheet is the trial's log of operations, after the field
	// map, when the log has entries.
	OperationsSheet = "Operations"
)

type report struct {
	f      *excelize.File
	st     *styles
	t      *trial.Trial
	opts   ReportOptions
	res    []analysis.Outcome
	traits []trial.Trait
	sum    *export.Summary
	names  *sheetNamer
	values map[string][]float64 // per trait key, aligned with t.Plots
	charts map[string]chan chartPNG
}

// WriteReport writes the season report of trial t as an xlsx workbook to w.
// results holds the analysis of each reported trait; a trait whose result is
// missing or carries an error gets a sheet saying why instead of failing the
// report. It stops between sheets when ctx is done and returns ctx's error.
func WriteReport(ctx context.Context, w io.Writer, t *trial.Trial, results []analysis.Outcome, opts ReportOptions) error {
	if opts.Method == "" {
		opts.Method = meansep.Method(t.MeanSeparation())
	}
	if opts.Alpha <= 0 || opts.Alpha >= 1 {
		opts.Alpha = 0.05
	}
	if opts.Now.IsZero() {
		opts.Now = time.Now()
	}
	if ctx == nil {
		ctx = context.Background()
	}

	f := excelize.NewFile()
	defer f.Close()
	r := &report{
		f: f, st: &styles{f: f, cache: make(map[styleKey]int)}, t: t, opts: opts, res: results,
		traits: export.ReportTraits(t, opts.Traits), names: newSheetNamer(),
		values: make(map[string][]float64),
	}
	r.sum = export.NewSummary(t, results, opts.Traits, opts.Method, opts.Alpha)
	if opts.Charts {
		// Charts take most of a report's time: draw them in the background,
		// on as many cores as there are, while the sheets are written.
		cctx, cancel := context.WithCancel(ctx)
		defer cancel()
		r.startCharts(cctx)
	}

	type step struct {
		name  string
		write func(string) error
	}
	var steps []step
	add := func(want, fallback string, fn func(string) error) {
		steps = append(steps, step{r.names.name(want, fallback), fn})
	}
	add(CoverSheet, "", r.writeCover)
	add(SummarySheet, "", r.writeSummary)
	// The fixed sheets are named before the traits so that a trait called
	// "Data" does not take their place.
	r.names.name(DataSheet, "")
	r.names.name(FieldMapSheet, "")
	if len(t.Operations) > 0 {
		r.names.name(OperationsSheet, "")
	}
	for i := range r.traits {
		tr := r.traits[i]
		add(tr.Name, tr.Key, func(name string) error { return r.writeTrait(name, tr) })
	}
	steps = append(steps, step{DataSheet, r.writeData}, step{FieldMapSheet, r.writeFieldMap})
	if len(t.Operations) > 0 {
		steps = append(steps, step{OperationsSheet, r.writeOperations})
	}

	for i, s := range steps {
		if err := ctx.Err(); err != nil {
			return err
		}
		if i == 0 {
			if err := f.SetSheetName("Sheet1", s.name); err != nil {
				return err
			}
		} else if _, err := f.NewSheet(s.name); err != nil {
			return err
		}
		if err := s.write(s.name); err != nil {
			return err
		}
		if opts.Progress != nil {
			opts.Progress(i+1, len(steps))
		}
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	f.SetActiveSheet(1)
	if err := f.SetDocProps(&excelize.DocProperties{
		Title: t.Title, Creator: "Furlong " + opts.Version, Created: opts.Now.UTC().Format(time.RFC3339),
	}); err != nil {
		return err
	}
	return f.Write(w)
}

// valuesOf returns the values of trait tr for every plot, derived traits
// computed, cached per trait.
func (r *report) valuesOf(tr trial.Trait) []float64 {
	if v, ok := r.values[tr.Key]; ok {
		return v
	}
	v := traitValues(r.t, tr)
	r.values[tr.Key] = v
	return v
}

var (
	titleStyle   = styleKey{bold: true, size: 14}
	sectionStyle = styleKey{bold: true, size: 12}
	headStyle    = styleKey{bold: true, wrap: true, valign: "center", border: [4]int{0, 0, 0, 1}}
	headNumStyle = styleKey{bold: true, wrap: true, valign: "center", halign: "right", border: [4]int{0, 0, 0, 1}}
	labelStyle   = styleKey{bold: true}
	noteStyle    = styleKey{italic: true}
	proseStyle   = styleKey{}
	dashStyle    = styleKey{halign: "center"}
	dateStyle    = styleKey{numFmt: "yyyy-mm-dd", halign: "left"}
)

func numStyle(decimals int) styleKey { return styleKey{numFmt: DecimalsFormat(decimals)} }

var pStyle = styleKey{numFmt: PFormat}

// dash is shown where a value does not exist.
const dash = "—"

func metres(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) + " m" }

func (r *report) writeCover(name string) error {
	t := r.t
	s := newSheet(r.f, r.st, name)
	row := 1
	title := t.Title
	if strings.TrimSpace(title) == "" {
		title = "Untitled trial"
	}
	s.textNoWidth(1, row, title, titleStyle)
	row += 2
	line := func(label string, v any) {
		s.text(1, row, label, labelStyle)
		switch v := v.(type) {
		case string:
			if v == "" {
				v = dash
			}
			s.textNoWidth(2, row, v, proseStyle)
		case int:
			s.integer(2, row, v, styleKey{halign: "left"})
		case float64:
			s.num(2, row, v, styleKey{numFmt: "0.00", halign: "left"})
		case time.Time:
			if v.IsZero() {
				s.textNoWidth(2, row, dash, proseStyle)
			} else {
				c := cellName(2, row)
				s.fail(r.f.SetCellValue(name, c, v))
				s.setStyle(2, row, dateStyle)
			}
		}
		row++
	}
	line("Crop", t.Crop)
	line("Season", t.Season)
	line("Site", t.Site.Name)
	if t.Site.Latitude != nil && t.Site.Longitude != nil {
		s.text(1, row, "Coordinates", labelStyle)
		s.num(2, row, *t.Site.Latitude, styleKey{numFmt: `0.00000"° lat"`, halign: "left"})
		s.num(3, row, *t.Site.Longitude, styleKey{numFmt: `0.00000"° lon"`, halign: "left"})
		row++
	} else {
		line("Coordinates", "")
	}
	line("Soil", t.Site.Soil)
	line("Previous crop", t.Site.PreviousCrop)
	line("Investigator", t.Investigator)
	line("Objective", t.Objective)
	row++
	line("Design", t.Design.Kind.Title())
	line("Replicates", t.Design.Reps)
	line("Treatments", len(t.Treatments))
	l := t.Layout
	if l.PlotLength > 0 && l.PlotWidth > 0 {
		line("Plot size", metres(l.PlotLength)+" × "+metres(l.PlotWidth))
		s.text(1, row, "Plot area (m²)", labelStyle)
		s.num(2, row, l.PlotLength*l.PlotWidth, styleKey{numFmt: "0.00", halign: "left"})
		row++
		hl, hw := l.HarvestLength, l.HarvestWidth
		if hl <= 0 || hw <= 0 {
			hl, hw = l.PlotLength, l.PlotWidth
		}
		line("Harvested part", metres(hl)+" × "+metres(hw))
		s.text(1, row, "Harvested area (m²)", labelStyle)
		s.num(2, row, l.HarvestedArea(), styleKey{numFmt: "0.00", halign: "left"})
		row++
	} else {
		line("Plot size", "")
	}
	line("Plots", len(t.Plots))
	var excluded []string
	for _, p := range t.Plots {
		if reason := export.PlotExclusions(p); reason != "" {
			excluded = append(excluded, fmt.Sprintf("plot %d (%s)", p.Number, reason))
		}
	}
	if len(excluded) == 0 {
		line("Excluded plots", "none")
	} else {
		line("Excluded plots", fmt.Sprintf("%d: %s", len(excluded), strings.Join(excluded, ", ")))
	}
	if n := len(t.Operations); n > 0 {
		line("Log of operations", fmt.Sprintf("%d entries, from %s to %s: see the %s sheet", n,
			t.Operations[0].Date.Format("2 January 2006"), t.Operations[n-1].Date.Format("2 January 2006"), OperationsSheet))
	}
	row++
	switch {
	case t.Random.Done.IsZero():
		line("Randomisation", "not randomised")
	default:
		if t.Random.Seed < 1<<53 {
			line("Randomisation seed", int(t.Random.Seed))
		} else {
			line("Randomisation seed", strconv.FormatUint(t.Random.Seed, 10))
		}
		line("Randomisation method", t.Random.Method)
		line("Randomised on", t.Random.Done)
	}
	line("Report date", r.opts.Now)
	line("Software", strings.TrimSpace("Furlong "+r.opts.Version))
	row++

	// Plots used per trait.
	s.textNoWidth(1, row, "Plots used in each analysis", sectionStyle)
	row++
	for i, h := range []string{"Trait", "Analysed", "Missing", "Excluded", "Reasons for exclusion"} {
		k := headStyle
		if i >= 1 && i <= 3 {
			k = headNumStyle // over the right-aligned counts
		}
		s.text(1+i, row, h, k)
	}
	row++
	for j, st := range r.sum.Traits {
		s.text(1, row, traitLabel(st.Name, st.Unit), proseStyle)
		if res := st.Result; res != nil {
			s.integer(2, row, res.N, styleKey{})
			s.integer(3, row, res.Missing, styleKey{})
			s.integer(4, row, len(res.Excluded), styleKey{})
			var reasons []string
			for _, e := range res.Excluded {
				reasons = append(reasons, fmt.Sprintf("plot %d: %s", e.Plot, e.Reason))
			}
			s.textNoWidth(5, row, strings.Join(reasons, "; "), proseStyle)
		} else {
			s.textNoWidth(2, row, r.sum.Traits[j].Reason, noteStyle)
		}
		row++
	}
	row++
	s.textNoWidth(1, row, "Cautions", sectionStyle)
	row++
	for _, c := range export.Cautions {
		s.textNoWidth(1, row, c, proseStyle)
		row++
	}
	s.widths[2] = math.Max(s.widths[2], 14)
	s.fitColumns(8, 40)
	s.printSetup(r.opts.Paper, false, title)
	return s.err
}

func traitLabel(name, unit string) string {
	if unit == "" {
		return name
	}
	return name + " (" + unit + ")"
}

func (r *report) methodNote() string {
	level := strconv.FormatFloat(100*r.opts.Alpha, 'f', -1, 64) + "%"
	if r.opts.Method == meansep.Tukey {
		return "Means followed by the same letter do not differ at the " + level + " level (Tukey's HSD)."
	}
	return "Means followed by the same letter do not differ at the " + level + " level (Fisher's protected LSD)."
}

// Colours of the summary sheet: a pale band behind each trait's group of
// columns, a deeper one for its header.
const (
	bandFill = "EEF3F8"
	headFill = "D5E1EE"
)

// writeSummary writes the all-traits sheet: one row per treatment; per trait
// a group of columns (mean, the letters in a column of their own headed
// "group", and the percentage of the check when the trait shows it), then a
// statistics block with one row per trait (grand mean, CV%, LSD or HSD or
// its range, p of the treatment F test and its reading).
func (r *report) writeSummary(name string) error {
	sum := r.sum
	s := newSheet(r.f, r.st, name)
	s.textNoWidth(1, 1, "All traits: treatment means", titleStyle)
	s.textNoWidth(1, 2, r.methodNote()+" Letters are in the group column beside each mean.", noteStyle)
	const top, sub = 4, 5 // trait names, then the column heads under them
	headLeft := styleKey{bold: true, wrap: true, valign: "center", fill: headFill}
	headRight := headLeft
	headRight.halign = "right"
	headCentre := headLeft
	headCentre.halign = "center"
	for c, h := range []string{"Treatment", "Name", "Role"} {
		s.text(1+c, sub, h, withBottom(headLeft))
		s.setStyle(1+c, top, headLeft)
	}
	type group struct{ mean, letters, pct, vs int }
	groups := make([]group, len(sum.Traits))
	col := 4
	lines := 1.0
	for j, st := range sum.Traits {
		g := group{mean: col, letters: col + 1}
		last := col + 1
		if st.CheckMean != nil {
			g.pct = last + 1
			last++
		}
		if st.VsCheck != nil {
			g.vs = last + 1
			last++
		}
		groups[j] = g
		label := traitLabel(st.Name, st.Unit)
		s.textNoWidth(col, top, label, headCentre)
		for c := col + 1; c <= last; c++ {
			s.setStyle(c, top, headCentre)
		}
		if s.err == nil && last > col {
			s.fail(r.f.MergeCell(name, cellName(col, top), cellName(last, top)))
		}
		s.text(g.mean, sub, "mean", withBottom(headRight))
		s.text(g.letters, sub, "group", withBottom(headCentre))
		if g.pct > 0 {
			s.text(g.pct, sub, "% check", withBottom(headRight))
		}
		if g.vs > 0 {
			s.text(g.vs, sub, "vs check", withBottom(headCentre))
		}
		lines = math.Max(lines, math.Ceil(displayWidth(label)*1.1/float64(8*(last-col+1))))
		col = last + 1
	}
	if s.err == nil {
		s.fail(r.f.SetRowHeight(name, top, 15*math.Min(lines, 6)))
	}
	s.widths[1] = math.Max(s.widths[1], 9)
	row := sub + 1
	for i, tr := range sum.Rows {
		band := styleKey{}
		if i%2 == 1 {
			band.fill = bandFill // every other row shaded, to follow a row across many traits
		}
		s.text(1, row, tr.Treatment, band)
		s.text(2, row, tr.Name, withBold(band, tr.Check))
		role := "entry"
		if tr.Check {
			role = "check"
		}
		s.text(3, row, role, withBold(band, tr.Check))
		for j, st := range sum.Traits {
			c, g := tr.Cells[j], groups[j]
			if !c.OK {
				s.text(g.mean, row, dash, withFill(dashStyle, band.fill))
				s.setStyle(g.letters, row, band)
				if g.pct > 0 {
					s.setStyle(g.pct, row, band)
				}
				if g.vs > 0 {
					s.setStyle(g.vs, row, band)
				}
				continue
			}
			s.num(g.mean, row, c.Mean, withFill(numStyle(st.MeanDecimals), band.fill))
			s.text(g.letters, row, c.Letters, styleKey{halign: "center", italic: true, fill: band.fill})
			if g.pct > 0 {
				if c.PercentOfCheck != nil {
					s.num(g.pct, row, *c.PercentOfCheck, withFill(styleKey{numFmt: percentFormat}, band.fill))
				} else {
					s.text(g.pct, row, dash, withFill(dashStyle, band.fill))
				}
			}
			if g.vs > 0 {
				k := styleKey{halign: "center", fill: band.fill}
				switch c.VsCheck {
				case export.VsBetter, export.VsWorse:
					k.bold = true
				case export.VsIsCheck:
					k.italic = true
				}
				s.text(g.vs, row, c.VsCheck, k)
			}
		}
		row++
	}
	row++

	// The statistics block: one row per trait.
	s.textNoWidth(1, row, "Statistics of each trait", sectionStyle)
	row++
	msdHead := export.MSDLabel(sum.Method, sum.Alpha)
	// Columns: trait (A–C), grand mean (D), CV% (E), LSD or HSD (F–H
	// merged: a range needs the room), p (I), reading (J on).
	const msdFrom, msdTo, pCol, readCol = 6, 8, 9, 10
	for c, h := range map[int]string{1: "Trait", 4: "Grand mean", 5: "CV%", msdFrom: msdHead, pCol: "p", readCol: "F test of the treatments"} {
		k := withBottom(headLeft)
		if c >= 4 && c <= pCol {
			k = withBottom(headRight)
		}
		s.textNoWidth(c, row, h, k)
	}
	for _, c := range []int{2, 3, 7, 8} {
		s.setStyle(c, row, withBottom(headLeft))
	}
	merge := func(from, to, row int) {
		if s.err == nil {
			s.fail(r.f.MergeCell(name, cellName(from, row), cellName(to, row)))
		}
	}
	merge(1, 3, row)
	merge(msdFrom, msdTo, row)
	if s.err == nil {
		s.fail(r.f.SetRowHeight(name, row, 30))
	}
	row++
	level := strconv.FormatFloat(sum.Alpha, 'f', -1, 64)
	var transformed []string // traits whose LSD is on a transformed scale
	for _, st := range sum.Traits {
		s.textNoWidth(1, row, traitLabel(st.Name, st.Unit), labelStyle)
		if st.Result == nil {
			s.textNoWidth(4, row, "no analysis: "+st.Reason+".", noteStyle)
			row++
			continue
		}
		dec := st.MeanDecimals
		s.numOrDash(4, row, st.GrandMean, numStyle(dec))
		s.numOrDash(5, row, st.CVPercent, numStyle(1))
		switch {
		case st.Result.Transform != stats.NoTransform:
			// On the analysis scale: the difference of two back-transformed
			// means has no single yardstick.
			s.textNoWidth(msdFrom, row, export.MSDText(st.MSD, st.MSDRange, analysis.TransformedDecimals)+" *", styleKey{halign: "right"})
			transformed = append(transformed, traitLabel(st.Name, st.Unit)+": "+st.Result.Transform.Scale())
		case st.MSD != nil && finiteF(*st.MSD):
			s.num(msdFrom, row, *st.MSD, numStyle(dec))
		default:
			s.textNoWidth(msdFrom, row, export.MSDText(st.MSD, st.MSDRange, dec), styleKey{halign: "right"})
		}
		merge(msdFrom, msdTo, row)
		if st.HasP {
			s.num(pCol, row, st.P, pStyle)
			verdict := "not significant at " + level
			if st.P < sum.Alpha {
				verdict = "significant at " + level
			}
			s.textNoWidth(readCol, row, verdict, noteStyle)
		} else {
			s.text(pCol, row, dash, dashStyle)
		}
		row++
	}
	row++
	if len(transformed) > 0 {
		s.textNoWidth(1, row, "* On the scale the trait is analysed on ("+strings.Join(transformed, "; ")+"): a difference of back-transformed means has no single yardstick.", noteStyle)
		row++
	}
	for _, st := range sum.Traits {
		if st.CheckMean != nil {
			s.textNoWidth(1, row, "% check: each entry's mean as a percentage of the mean of the check entries, for the traits chosen in the trial's analysis settings.", noteStyle)
			row++
			break
		}
	}
	if note := sum.VsCheckNote(); note != "" {
		s.textNoWidth(1, row, note, noteStyle)
		row++
	}
	for _, st := range sum.Traits {
		if st.Result != nil && st.MSD == nil && st.MSDRange != nil {
			s.textNoWidth(1, row, "Unequal n: some plots are missing, so each pair of means has its own "+msdHead[:3]+"; the smallest and largest are given (each pair's value is on the trait's sheet).", noteStyle)
			row++
			break
		}
	}
	s.freeze(sub, 2)
	s.fitColumns(4, 40)
	s.printSetup(r.opts.Paper, true, r.t.Title)
	s.printTitles(sub)
	return s.err
}

func withBottom(k styleKey) styleKey {
	k.border[3] = 1
	return k
}

func withBold(k styleKey, b bool) styleKey {
	k.bold = k.bold || b
	return k
}

func withFill(k styleKey, fill string) styleKey {
	k.fill = fill
	return k
}

func withTop(k styleKey, top bool) styleKey {
	if top {
		k.border[1] = 1
	}
	return k
}

func finiteF(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// numOrDash writes v, or a dash when v is not a finite number.
func (s *sheet) numOrDash(col, row int, v float64, k styleKey) {
	if !finiteF(v) {
		k.numFmt, k.halign = "", "center"
		s.text(col, row, dash, k)
		return
	}
	s.num(col, row, v, k)
}
