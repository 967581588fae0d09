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
	Method meansep.Method // mean separation shown: meansep.LSD (default) or meansep.Tukey
	Alpha  float64        // significance level of the letters and LSD/HSD, default 0.05
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
	// Ctx, when not nil, cancels the report between sheets.
	Ctx context.Context
}

// Sheet names of the report, before any trait sheet.
const (
	CoverSheet    = "Cover"
	SummarySheet  = "Summary"
	DataSheet     = "Data"
	FieldMapSheet = "Field map"
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
// report. It returns the context's error when cancelled.
func WriteReport(w io.Writer, t *trial.Trial, results []analysis.Outcome, opts ReportOptions) error {
	if opts.Method == "" {
		opts.Method = meansep.LSD
	}
	if opts.Alpha <= 0 || opts.Alpha >= 1 {
		opts.Alpha = 0.05
	}
	if opts.Now.IsZero() {
		opts.Now = time.Now()
	}
	ctx := opts.Ctx
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
	for i := range r.traits {
		tr := r.traits[i]
		add(tr.Name, tr.Key, func(name string) error { return r.writeTrait(name, tr) })
	}
	steps = append(steps, step{DataSheet, r.writeData}, step{FieldMapSheet, r.writeFieldMap})

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
		s.text(1+i, row, h, headStyle)
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

func (r *report) writeSummary(name string) error {
	sum := r.sum
	s := newSheet(r.f, r.st, name)
	s.textNoWidth(1, 1, "Summary of treatment means", titleStyle)
	s.textNoWidth(1, 2, r.methodNote(), noteStyle)
	const head = 4
	s.text(1, head, "Treatment", headStyle)
	s.text(2, head, "Name", headStyle)
	s.text(3, head, "Role", headStyle)
	col := 4
	traitCol := make([]int, len(sum.Traits))
	// A trait's header spans its mean and letters columns and wraps; the
	// header row is made tall enough for the longest.
	lines := 1.0
	for j, st := range sum.Traits {
		traitCol[j] = col
		label := traitLabel(st.Name, st.Unit)
		s.textNoWidth(col, head, label, headStyle)
		s.textNoWidth(col+1, head, "", headStyle)
		if s.err == nil {
			s.fail(r.f.MergeCell(name, cellName(col, head), cellName(col+1, head)))
		}
		s.track(col, 8)
		s.track(col+1, 4)
		lines = math.Max(lines, math.Ceil(displayWidth(label)*1.1/(8+4+4)))
		col += 2
	}
	pctCol := 0
	if sum.Yield >= 0 && sum.HasCheck {
		pctCol = col
		label := sum.Traits[sum.Yield].Name + " % of check"
		s.textNoWidth(pctCol, head, label, headStyle)
		s.track(pctCol, 10)
		lines = math.Max(lines, math.Ceil(displayWidth(label)*1.1/12))
	}
	if s.err == nil {
		s.fail(r.f.SetRowHeight(name, head, 15*math.Min(lines, 6)))
	}
	s.widths[1] = math.Max(s.widths[1], 9)
	row := head + 1
	for _, tr := range sum.Rows {
		s.text(1, row, tr.Treatment, styleKey{})
		s.text(2, row, tr.Name, styleKey{})
		if tr.Check {
			s.text(3, row, "check", styleKey{bold: true})
		} else {
			s.text(3, row, "entry", styleKey{})
		}
		for j, st := range sum.Traits {
			c := tr.Cells[j]
			if !c.OK {
				s.text(traitCol[j], row, dash, dashStyle)
				continue
			}
			s.num(traitCol[j], row, c.Mean, numStyle(st.Decimals))
			s.text(traitCol[j]+1, row, c.Letters, styleKey{})
		}
		if pctCol > 0 {
			if tr.PercentOfCheck != nil {
				s.num(pctCol, row, *tr.PercentOfCheck, styleKey{numFmt: percentFormat})
			} else {
				s.text(pctCol, row, dash, dashStyle)
			}
		}
		row++
	}
	top := styleKey{bold: true, border: [4]int{0, 1, 0, 0}}
	statRows := []string{"Grand mean", "CV%", export.MSDLabel(r.opts.Method, r.opts.Alpha), "p (treatments)"}
	for i, label := range statRows {
		k := labelStyle
		if i == 0 {
			k = top
			for c := 2; c < col || (pctCol > 0 && c <= pctCol); c++ {
				s.setStyle(c, row, styleKey{border: [4]int{0, 1, 0, 0}})
			}
		}
		s.text(1, row+i, label, k)
	}
	for j, st := range sum.Traits {
		c := traitCol[j]
		if st.Result == nil {
			for i := range statRows {
				s.text(c, row+i, dash, withTop(dashStyle, i == 0))
			}
			continue
		}
		s.numOrDash(c, row, st.GrandMean, withTop(numStyle(st.Decimals), true))
		s.numOrDash(c, row+1, st.CVPercent, numStyle(1))
		switch {
		case st.MSD != nil && finiteF(*st.MSD):
			s.num(c, row+2, *st.MSD, numStyle(st.Decimals+1))
			if st.Result.Transform != stats.NoTransform {
				s.textNoWidth(c+1, row+2, string(st.Result.Transform)+" scale", noteStyle)
			}
		default:
			s.text(c, row+2, "unequal n", noteStyle)
		}
		if st.HasP {
			s.num(c, row+3, st.P, pStyle)
			if st.P >= r.opts.Alpha {
				s.text(c+1, row+3, "ns", noteStyle)
			}
		} else {
			s.text(c, row+3, dash, dashStyle)
		}
	}
	row += len(statRows) + 1
	for _, st := range sum.Traits {
		if st.Result == nil {
			s.textNoWidth(1, row, st.Name+": "+st.Reason+".", noteStyle)
			row++
		}
	}
	if pctCol > 0 {
		s.textNoWidth(1, row, fmt.Sprintf("%% of check: each entry's %s as a percentage of the mean of the check entries.", sum.Traits[sum.Yield].Name), noteStyle)
		row++
	}
	s.freeze(head, 2)
	s.fitColumns(4, 40)
	s.printSetup(r.opts.Paper, true, r.t.Title)
	s.printTitles(head)
	return s.err
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
