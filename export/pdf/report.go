package pdf

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"furlong/export"
	"furlong/export/chart"
	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// ReportOptions control WriteReport.
type ReportOptions struct {
	// Method is the mean separation shown; "" for the trial's remembered
	// method.
	Method meansep.Method
	Alpha  float64 // significance level of letters and LSD/HSD, default 0.05
	// Traits lists the keys of the traits to report, in order; empty for
	// every trait.
	Traits  []string
	Version string    // software version printed on the cover
	Now     time.Time // date of the report; zero for the current time
	Charts  bool      // a chart of the means on each trait's page
	Paper   Paper
	// Progress, when not nil, is called after each part with the parts
	// done and the total.
	Progress func(done, total int)
}

const dash = "–"

// chartDPI is the resolution of the charts placed in a PDF: sharp on paper
// without making the file large.
const chartDPI = 200

// WriteReport writes the season report of trial t as a PDF document to w:
// a cover with the trial's details and the cautions, the summary of all
// traits, a page per trait (ANOVA, means with letters, statistics, the
// comparison with the check when there is one, model checks and a chart of
// the means), the plot data, and the field map with its dimensions. A
// trait without an analysis gets a page saying why. It stops between
// parts when ctx is done.
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
	title := trialTitle(t)
	d := newDoc(opts.Paper, title+" · season report · Furlong")
	d.SetTitle(title+": season report", true)
	traits := export.ReportTraits(t, opts.Traits)
	sum := export.NewSummary(t, results, opts.Traits, opts.Method, opts.Alpha)
	total := 4 + len(traits)
	if len(t.Operations) > 0 {
		total++
	}
	done := 0
	step := func() error {
		done++
		if opts.Progress != nil {
			opts.Progress(done, total)
		}
		return ctx.Err()
	}
	writeCover(d, t, sum, opts)
	if err := step(); err != nil {
		return err
	}
	writeSummary(d, t, sum, opts)
	if err := step(); err != nil {
		return err
	}
	for _, tr := range traits {
		if err := writeTrait(d, t, tr, results, opts); err != nil {
			return err
		}
		if err := step(); err != nil {
			return err
		}
	}
	writeData(d, t)
	if err := step(); err != nil {
		return err
	}
	if err := writeMapPage(d, t, MapOptions{Paper: opts.Paper}); err != nil {
		return err
	}
	if err := step(); err != nil {
		return err
	}
	if len(t.Operations) > 0 {
		writeOperations(d, t)
		if err := step(); err != nil {
			return err
		}
	}
	return d.finish(w)
}

func trialTitle(t *trial.Trial) string {
	if s := strings.TrimSpace(t.Title); s != "" {
		return s
	}
	return "Untitled trial"
}

func orDash(s string) string {
	if strings.TrimSpace(s) == "" {
		return dash
	}
	return s
}

func metres(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) + " m" }

func num(v float64, dec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return dash
	}
	return strconv.FormatFloat(v, 'f', dec, 64)
}

func numPtr(v *float64, dec int) string {
	if v == nil {
		return dash
	}
	return num(*v, dec)
}

func traitLabel(name, unit string) string {
	if unit == "" {
		return name
	}
	return name + " (" + unit + ")"
}

// kv writes label: value lines in two columns.
func (d *doc) kv(rows [][2]string) {
	lw := 0.0
	d.font(true, bodyPt)
	for _, r := range rows {
		lw = math.Max(lw, d.GetStringWidth(r[0]))
	}
	lw += 4
	for _, r := range rows {
		d.font(true, bodyPt)
		x := d.GetX()
		y := d.GetY()
		d.CellFormat(lw, lineMM, r[0], "", 0, "L", false, 0, "")
		d.font(false, bodyPt)
		d.SetXY(x+lw, y)
		d.MultiCell(d.contentWidth()-lw, lineMM, r[1], "", "L", false)
	}
}

func writeCover(d *doc, t *trial.Trial, sum *export.Summary, opts ReportOptions) {
	d.AddPage()
	d.heading(trialTitle(t), 20)
	d.para("Season report", false, 13)
	d.Ln(4)
	site := t.Site.Name
	if t.Site.Latitude != nil && t.Site.Longitude != nil {
		site = strings.TrimSpace(fmt.Sprintf("%s (%.5f° lat, %.5f° lon)", site, *t.Site.Latitude, *t.Site.Longitude))
	}
	rows := [][2]string{
		{"Crop", orDash(t.Crop)}, {"Season", orDash(t.Season)}, {"Site", orDash(site)},
		{"Soil", orDash(t.Site.Soil)}, {"Previous crop", orDash(t.Site.PreviousCrop)},
		{"Investigator", orDash(t.Investigator)}, {"Objective", orDash(t.Objective)},
		{"Design", t.Design.Kind.Title()}, {"Replicates", strconv.Itoa(t.Design.Reps)},
		{"Treatments", strconv.Itoa(len(t.Treatments))}, {"Plots", strconv.Itoa(len(t.Plots))},
	}
	if l := t.Layout; l.PlotLength > 0 && l.PlotWidth > 0 {
		hl, hw := l.HarvestLength, l.HarvestWidth
		if hl <= 0 || hw <= 0 {
			hl, hw = l.PlotLength, l.PlotWidth
		}
		rows = append(rows,
			[2]string{"Plot size", fmt.Sprintf("%s × %s (%s m²)", metres(l.PlotLength), metres(l.PlotWidth), num(l.PlotLength*l.PlotWidth, 2))},
			[2]string{"Harvested part", fmt.Sprintf("%s × %s (%s m²)", metres(hl), metres(hw), num(l.HarvestedArea(), 2))})
	}
	var excluded []string
	for _, p := range t.Plots {
		if reason := export.PlotExclusions(p); reason != "" {
			excluded = append(excluded, fmt.Sprintf("plot %d (%s)", p.Number, reason))
		}
	}
	if len(excluded) == 0 {
		rows = append(rows, [2]string{"Excluded plots", "none"})
	} else {
		rows = append(rows, [2]string{"Excluded plots", fmt.Sprintf("%d: %s", len(excluded), strings.Join(excluded, ", "))})
	}
	if n := len(t.Operations); n > 0 {
		rows = append(rows, [2]string{"Log of operations", fmt.Sprintf("%d entries, from %s to %s (last page)", n,
			t.Operations[0].Date.Format("2 January 2006"), t.Operations[n-1].Date.Format("2 January 2006"))})
	}
	if t.Random.Done.IsZero() {
		rows = append(rows, [2]string{"Randomisation", "not randomised"})
	} else {
		rows = append(rows, [2]string{"Randomisation", fmt.Sprintf("seed %d, %s, on %s",
			t.Random.Seed, t.Random.Method, t.Random.Done.Format("2 January 2006"))})
	}
	rows = append(rows,
		[2]string{"Report date", opts.Now.Format("2 January 2006")},
		[2]string{"Software", strings.TrimSpace("Furlong " + opts.Version)})
	d.kv(rows)

	d.section("Plots used in each analysis", 20)
	tb := table{heads: []string{"Trait", "Analysed", "Missing", "Excluded", "Reasons for exclusion"},
		right: []bool{false, true, true, true, false}, maxCol: 90}
	for _, st := range sum.Traits {
		label := traitLabel(st.Name, st.Unit)
		if res := st.Result; res != nil {
			var reasons []string
			for _, e := range res.Excluded {
				reasons = append(reasons, fmt.Sprintf("plot %d: %s", e.Plot, e.Reason))
			}
			tb.rows = append(tb.rows, []string{label, strconv.Itoa(res.N), strconv.Itoa(res.Missing),
				strconv.Itoa(len(res.Excluded)), strings.Join(reasons, "; ")})
		} else {
			tb.rows = append(tb.rows, []string{label, dash, dash, dash, "not analysed: " + st.Reason})
		}
	}
	d.table(tb)

	d.section("Cautions", 25)
	d.SetDrawColor(180, 120, 0)
	d.SetLineWidth(0.4)
	y0 := d.GetY()
	d.SetX(margin + 3)
	for _, c := range export.Cautions {
		d.SetX(margin + 3)
		d.MultiCell(d.contentWidth()-6, lineMM, "• "+c, "", "L", false)
	}
	d.Line(margin, y0, margin, d.GetY())
	d.SetLineWidth(0.2)
	d.SetDrawColor(0, 0, 0)
}

func methodNote(m meansep.Method, alpha float64) string {
	a := strconv.FormatFloat(alpha, 'f', -1, 64)
	if m == meansep.Tukey {
		return "Means followed by the same letter do not differ by Tukey's HSD at " + a + "."
	}
	return "Means followed by the same letter do not differ by the protected LSD at " + a + " (letters are withheld when the treatment F test is not significant)."
}

func writeSummary(d *doc, t *trial.Trial, sum *export.Summary, opts ReportOptions) {
	d.AddPage()
	d.heading("Summary of all traits", 15)
	d.note(methodNote(opts.Method, opts.Alpha))
	d.Ln(2)
	// Up to five traits side by side; more go in further tables.
	const per = 5
	unequal := false
	for start := 0; start < len(sum.Traits) || start == 0; start += per {
		end := min(start+per, len(sum.Traits))
		tb := table{heads: []string{"Treatment", "Name"}, right: []bool{false, false}, maxCol: 55}
		for _, st := range sum.Traits[start:end] {
			tb.heads = append(tb.heads, traitLabel(st.Name, st.Unit))
			tb.right = append(tb.right, true)
			if st.CheckMean != nil {
				tb.heads = append(tb.heads, "% of check")
				tb.right = append(tb.right, true)
			}
			if st.VsCheck != nil {
				tb.heads = append(tb.heads, "vs check")
				tb.right = append(tb.right, false)
			}
		}
		for _, r := range sum.Rows {
			name := r.Name
			if r.Check {
				name = strings.TrimSpace(name + " (check)")
			}
			row := []string{r.Treatment, name}
			for j := start; j < end; j++ {
				st, c := sum.Traits[j], r.Cells[j]
				if c.OK {
					row = append(row, strings.TrimSpace(num(c.Mean, st.MeanDecimals)+" "+c.Letters))
				} else {
					row = append(row, dash)
				}
				if st.CheckMean != nil {
					row = append(row, numPtr(c.PercentOfCheck, 0))
				}
				if st.VsCheck != nil {
					row = append(row, orDash(c.VsCheck))
				}
			}
			tb.rows = append(tb.rows, row)
			tb.bold = append(tb.bold, r.Check)
		}
		stat := func(label string, f func(st export.SummaryTrait) string) {
			row := []string{label, ""}
			for _, st := range sum.Traits[start:end] {
				row = append(row, f(st))
				if st.CheckMean != nil {
					row = append(row, "")
				}
				if st.VsCheck != nil {
					row = append(row, "")
				}
			}
			tb.rows = append(tb.rows, row)
			tb.bold = append(tb.bold, true)
		}
		stat("Grand mean", func(st export.SummaryTrait) string {
			if st.Result == nil {
				return dash
			}
			return num(st.GrandMean, st.MeanDecimals)
		})
		stat("CV%", func(st export.SummaryTrait) string {
			if st.Result == nil {
				return dash
			}
			return num(st.CVPercent, 1)
		})
		stat(export.MSDLabel(opts.Method, opts.Alpha), func(st export.SummaryTrait) string {
			if st.Result == nil {
				return dash
			}
			if st.MSD == nil && st.MSDRange != nil {
				unequal = true
				return export.MSDText(nil, st.MSDRange, st.MeanDecimals) + "*"
			}
			return export.MSDText(st.MSD, st.MSDRange, st.MeanDecimals)
		})
		stat("p, treatments", func(st export.SummaryTrait) string {
			if !st.HasP {
				return dash
			}
			return stats.FormatP(st.P)
		})
		d.table(tb)
		if end >= len(sum.Traits) {
			break
		}
	}
	for _, st := range sum.Traits {
		if st.Result == nil {
			d.note(traitLabel(st.Name, st.Unit) + ": not analysed: " + st.Reason + ".")
		}
	}
	if unequal {
		d.note("* Unequal replication: each pair of means has its own " + export.MSDLabel(opts.Method, opts.Alpha) + "; the smallest and the largest are shown.")
	}
	if sum.HasPercentOfCheck() {
		d.note("% of check: each mean as a percentage of the mean of the check entries.")
	}
	if note := sum.VsCheckNote(); note != "" {
		d.note(note)
	}
}

func writeTrait(d *doc, t *trial.Trial, tr trial.Trait, results []analysis.Outcome, opts ReportOptions) error {
	d.AddPage()
	name := tr.Name
	if strings.TrimSpace(name) == "" {
		name = tr.Key
	}
	d.heading(traitLabel(name, tr.Unit), 15)
	res, ok := export.LookupOutcome(results, tr.Key)
	reason := export.Reason(res)
	if !ok {
		reason = "this trait was not analysed"
	}
	if reason != "" {
		d.para("No analysis: "+reason+".", true, 10)
		d.note("Check this trait's values in the field book or the data grid, then write the report again.")
		return nil
	}
	a := res.Result
	d.note(fmt.Sprintf("%s; key %q; %d plots analysed, %d missing, %d excluded.",
		a.Design.Title(), tr.Key, a.N, a.Missing, len(a.Excluded)))
	transformed := a.Transform != stats.NoTransform
	if transformed {
		d.note("Analysed on the " + a.Transform.Scale() + " scale; means are shown back on the original scale.")
	}

	d.section("Analysis of variance", 25)
	if a.IsFactorial() {
		reml := a.Factorial.Method == "REML"
		tb := table{heads: []string{"Source", "df", "SS", "MS", "F", "p", "Tested against"},
			right: []bool{false, true, true, true, true, true, false}}
		if reml {
			tb = table{heads: []string{"Source", "df", "df (denominator)", "F", "p"}, right: []bool{false, true, true, true, true}}
		}
		for _, l := range a.Factorial.Lines {
			src := lineName(l)
			p := func(v *float64, dec int) string { return numPtr(v, dec) }
			pv := dash
			if l.P != nil {
				pv = stats.FormatP(*l.P)
			}
			if reml {
				tb.rows = append(tb.rows, []string{src, strconv.Itoa(l.DF), p(l.DFDen, 1), p(l.F, 2), pv})
			} else {
				tb.rows = append(tb.rows, []string{src, strconv.Itoa(l.DF), p(l.SS, 3), p(l.MS, 3), p(l.F, 2), pv, errorLabel(l.ErrorTerm)})
			}
			tb.bold = append(tb.bold, l.Role == stats.RoleError || l.Role == stats.RoleErrorStratum)
		}
		d.table(tb)
	} else if a.ANOVA != nil {
		tb := table{heads: []string{"Source", "df", "SS", "MS", "F", "p"}, right: []bool{false, true, true, true, true, true}}
		for _, src := range a.ANOVA.Sources {
			row := []string{export.SourceName(src), strconv.Itoa(src.DF), num(src.SS, 3), "", "", ""}
			if src.Role != stats.RoleTotal {
				row[3] = num(src.MS, 3)
			}
			if src.HasTest {
				row[4], row[5] = num(src.F, 2), stats.FormatP(src.P)
			}
			tb.rows = append(tb.rows, row)
		}
		d.table(tb)
		if a.ANOVA.Adjusted {
			d.note("Unbalanced data: each sum of squares is adjusted for the other terms, so they do not add up to the total.")
		}
	}

	meanDec := analysis.MeanDecimals(tr.Decimals)
	scaleDec := meanDec
	if transformed {
		scaleDec = analysis.TransformedDecimals
	}
	level := strconv.FormatFloat(100*(1-a.Alpha), 'f', -1, 64) + "%"
	d.section("Treatment means", 30)
	d.note(methodNote(opts.Method, opts.Alpha))
	heads := []string{"Treatment", "Name", "n", "Mean", "Lower " + level, "Upper " + level, "Letters"}
	right := []bool{false, false, true, true, true, true, false}
	if !transformed {
		heads = append(heads, "SE")
		right = append(right, true)
	}
	if a.CheckMean != nil {
		heads = append(heads, "% of check")
		right = append(right, true)
	}
	eff := a.Efficacy
	if eff != nil {
		heads = append(heads, "% efficacy (Abbott)")
		right = append(right, true)
		if eff.PreCount != "" {
			heads = append(heads, "% efficacy (H–T)")
			right = append(right, true)
		}
	}
	tb := table{heads: heads, right: right, maxCol: 80}
	for _, m := range a.Means {
		label := m.Name
		if m.Check {
			label = strings.TrimSpace(label + " (check)")
		}
		row := []string{m.Treatment, label, strconv.Itoa(m.N), num(m.BackMean, meanDec),
			numPtr(m.Lower, meanDec), numPtr(m.Upper, meanDec), export.Letters(m, opts.Method)}
		if !transformed {
			row = append(row, num(m.SE, meanDec))
		}
		if a.CheckMean != nil {
			row = append(row, numPtr(m.PercentOfCheck, 0))
		}
		if eff != nil {
			if er := eff.Row(m.Treatment); er != nil {
				row = append(row, numPtr(er.Abbott, 1))
				if eff.PreCount != "" {
					row = append(row, numPtr(er.HendersonTilton, 1))
				}
			} else {
				row = append(row, "untreated")
				if eff.PreCount != "" {
					row = append(row, "")
				}
			}
		}
		tb.rows = append(tb.rows, row)
		tb.bold = append(tb.bold, m.Check)
	}
	d.table(tb)
	if eff != nil {
		note := fmt.Sprintf("%% efficacy against the untreated check %s (mean %s): Abbott, (untreated − treatment)/untreated × 100 on the means.",
			eff.Untreated, num(eff.UntreatedMean, meanDec))
		if eff.PreCount != "" {
			note += " Henderson–Tilton (H–T): (1 − Ta·Cb/(Tb·Ca)) × 100 with the counts before (trait " + eff.PreCount + ") and after."
		}
		d.note(note)
		d.note("Caution: " + export.ProtectionCautionText())
	}

	if opts.Charts {
		if err := meansChart(d, t, a, opts); err != nil {
			return err
		}
	}
	if a.IsFactorial() {
		if err := writeFactorial(d, a, scaleDec, opts.Method, opts.Charts); err != nil {
			return err
		}
	}

	d.section("Statistics", 20)
	var st [][2]string
	if an := a.ANOVA; an != nil {
		st = append(st,
			[2]string{"Grand mean", num(an.GrandMean, scaleDec)},
			[2]string{"CV%", num(an.CVPercent, 1)},
			[2]string{"R²", num(an.RSquared, 3)})
		if an.SEMean != nil {
			st = append(st, [2]string{"SE of a mean", num(*an.SEMean, scaleDec)})
		}
		if an.SED != nil {
			st = append(st, [2]string{"SED", num(*an.SED, scaleDec)})
		}
	}
	st = append(st, [2]string{export.MSDLabel(opts.Method, opts.Alpha),
		export.MSDText(export.MSD(a, opts.Method), export.MSDRange(a, opts.Method), scaleDec)})
	if a.ANOVA != nil && a.ANOVA.RelativeEfficiency != nil {
		st = append(st, [2]string{"Relative efficiency of blocking", num(*a.ANOVA.RelativeEfficiency, 2)})
	}
	d.kv(st)

	// The comparison with the check, when the analysis carries one
	// (analysis.CompareWithCheck; 'furlong report --vs-check').
	if vc := a.VsCheck; vc != nil && len(vc.Rows) > 0 {
		d.section("Each entry against the check ("+vc.Check+", Dunnett)", 25)
		better := "higher"
		if !vc.HigherBetter {
			better = "lower"
		}
		d.note(fmt.Sprintf("Difference from the check with its simultaneous %s interval; %s values are better.", level, better))
		tb := table{heads: []string{"Treatment", "Difference", "SE", "Lower", "Upper", "p (two-sided)", "p (better)", "Reading"},
			right: []bool{false, true, true, true, true, true, true, false}}
		for _, r := range vc.Rows {
			tb.rows = append(tb.rows, []string{r.Treatment, num(r.Diff, scaleDec), num(r.SE, scaleDec),
				num(r.Lower, scaleDec), num(r.Upper, scaleDec), stats.FormatP(r.PTwoSided), stats.FormatP(r.PBetter), r.Verdict})
		}
		d.table(tb)
	}

	// The user's contrasts, when the analysis carries them
	// (analysis.EstimateAllContrasts).
	if set := a.Contrasts; set != nil && len(set.Rows) > 0 {
		d.section("Contrasts", 25)
		scale := ""
		if transformed {
			scale = " on the " + a.Transform.Scale() + " scale the trait is analysed on"
		}
		d.note("Planned comparisons of the treatment means" + scale + ": each estimate with its standard error from the model and a t test on the error df; " + export.AdjustmentText(set.Adjust) + ".")
		tb := table{heads: []string{"Contrast", "Definition", "Estimate", "SE", "df", "t", "p", "p adjusted"},
			right: []bool{false, false, true, true, true, true, true, true}, maxCol: 60}
		for _, c := range set.Rows {
			tb.rows = append(tb.rows, []string{c.Name, c.Definition, num(c.Estimate, scaleDec), num(c.SE, scaleDec),
				strconv.Itoa(c.DF), num(c.T, 3), stats.FormatP(c.P), stats.FormatP(c.PAdjusted)})
		}
		d.table(tb)
	}

	// The assessment series over the season, once per series.
	if opts.Charts {
		var keys []string
		for _, rt := range export.ReportTraits(t, opts.Traits) {
			keys = append(keys, rt.Key)
		}
		if series := export.ProgressSheetSeries(t, tr.Key, keys); series != "" {
			d.section("Series "+series+" over the season", 25)
			d.note("Each treatment's mean at each assessment (the plots assessed; excluded plots left out).")
			pr, err := analysis.ProgressOf(t, series)
			var p *plot.Plot
			if err == nil {
				p, err = chart.Progress(t, pr)
			}
			if err != nil {
				d.note("The chart over the season could not be drawn: " + err.Error())
			} else if err := placeChart(d, p); err != nil {
				return err
			}
		}
	}

	// A rate trial's response (export.ResponseFor: the window's Response
	// view and 'furlong response' give the same).
	if resp, err := export.ResponseFor(t, a); resp != nil {
		if err := writeResponse(d, t, a, resp, err, meanDec, opts.Charts); err != nil {
			return err
		}
	}

	// The margins over input cost, on the trait they are worked out from.
	if m, err := export.MarginsFor(t, a); m != nil || err != nil {
		d.section("Margin over input cost", 25)
		if err != nil {
			d.note("The margins cannot be worked out: " + err.Error())
		} else {
			d.note(export.MarginsNote(m))
			tt := export.MarginsTable(m, meanDec)
			tb := table{heads: tt.Head, rows: tt.Rows, right: []bool{false, true, true, true, true, true, true, false, false}}
			d.table(tb)
			for _, n := range m.Notes {
				d.note(n)
			}
			d.note("Caution: " + export.EconomicCautionText())
		}
	}

	if len(a.Notes) > 0 || len(a.Diagnostics.Readings) > 0 {
		d.section("Notes and model checks", 15)
		for _, n := range a.Notes {
			d.para(n, false, bodyPt)
		}
		for _, rd := range a.Diagnostics.Readings {
			d.para(rd.Text, rd.Flagged, bodyPt)
		}
	}

	return nil
}

// lineName names a line of a factorial ANOVA.
func lineName(l analysis.Line) string {
	switch l.Role {
	case stats.RoleBlock:
		return "Blocks"
	case stats.RoleTotal:
		return "Total"
	case stats.RoleError, stats.RoleErrorStratum:
		return errorLabel(l.Source)
	}
	return strings.ReplaceAll(l.Source, ":", " × ")
}

// errorLabel is "Error", "Error (a)", ... for "error", "error_a", ...
func errorLabel(src string) string {
	if src == "" {
		return ""
	}
	if s, ok := strings.CutPrefix(src, "error_"); ok {
		return "Error (" + s + ")"
	}
	if src == "error" {
		return "Error"
	}
	return src
}

func writeData(d *doc, t *trial.Trial) {
	d.AddPage()
	d.heading("Plot data", 15)
	d.note("Every plot in walking order, with the values as recorded (derived traits computed).")
	values := make([][]float64, len(t.Traits))
	for j, tr := range t.Traits {
		if v, err := t.TraitValues(tr.Key); err == nil {
			values[j] = v
		}
	}
	names := make(map[string]string, len(t.Treatments))
	for _, tm := range t.Treatments {
		names[tm.Code] = tm.Name
	}
	// Up to seven traits per table; more traits continue in further tables.
	const per = 7
	for start := 0; start < len(t.Traits) || start == 0; start += per {
		end := min(start+per, len(t.Traits))
		tb := table{heads: []string{"Plot", "Block", "Row", "Col", "Treatment"}, right: []bool{true, true, true, true, false}, size: 8, maxCol: 45}
		if start == 0 {
			tb.heads = append(tb.heads, "Name")
			tb.right = append(tb.right, false)
		}
		for _, tr := range t.Traits[start:end] {
			tb.heads = append(tb.heads, traitLabel(tr.Key, tr.Unit))
			tb.right = append(tb.right, true)
		}
		last := end >= len(t.Traits)
		if last {
			tb.heads = append(tb.heads, "Excluded / note")
			tb.right = append(tb.right, false)
		}
		for i, p := range t.Plots {
			row := []string{strconv.Itoa(p.Number), strconv.Itoa(p.Block), strconv.Itoa(p.Row), strconv.Itoa(p.Column), p.Treatment}
			if start == 0 {
				row = append(row, names[p.Treatment])
			}
			for j := start; j < end; j++ {
				v := math.NaN()
				if i < len(values[j]) {
					v = values[j][i]
				}
				if math.IsNaN(v) || math.IsInf(v, 0) {
					row = append(row, "")
				} else {
					row = append(row, num(v, t.Traits[j].Decimals))
				}
			}
			if last {
				row = append(row, strings.Trim(export.PlotExclusions(p)+"; "+p.Note, "; "))
			}
			tb.rows = append(tb.rows, row)
		}
		d.table(tb)
		if last {
			break
		}
	}
}

// meansChart places the chart of the means of a across the page.
func meansChart(d *doc, t *trial.Trial, a *analysis.Result, opts ReportOptions) error {
	p, err := chart.Means(t, a, chart.MeansOptions{ErrorBars: chart.StandardError, Letters: opts.Method})
	if err != nil {
		d.note("The chart of the means could not be drawn: " + err.Error())
		return nil
	}
	return placeChart(d, p)
}

// placeChart draws p across the page width (half as high), on a new page
// when it does not fit.
func placeChart(d *doc, p *plot.Plot) error {
	w := d.contentWidth()
	h := w * 0.5
	if d.GetY()+h+4 > d.bottom() {
		d.AddPage()
	}
	var buf bytes.Buffer
	if err := chart.SavePNG(p, &buf, vg.Length(w)*vg.Millimeter, vg.Length(h)*vg.Millimeter, chartDPI); err != nil {
		return err
	}
	d.Ln(2)
	if err := d.png(buf.Bytes(), margin, d.GetY(), w, h); err != nil {
		return err
	}
	d.SetY(d.GetY() + h + 2)
	return nil
}

// writeOperations prints the trial's log of operations, in date order, with
// the crop-protection cautions when it records an application.
func writeOperations(d *doc, t *trial.Trial) {
	d.AddPage()
	d.heading("Log of operations", 15)
	d.note("What was done on the trial, day by day, as recorded: products and rates as typed from their labels, water volume, equipment, the weather at application (air temperature, wind speed and direction, relative humidity), the growth stage and who applied or assessed.")
	if export.HasApplication(t.Operations) {
		d.note("Caution: " + export.ProtectionCautionText())
	}
	d.Ln(2)
	tb := table{heads: []string{"Date", "Operation", "Treatments", "Details"}, right: []bool{false, false, false, false}, maxCol: 110}
	for _, o := range t.Operations {
		// One line per part of the details (product and rate; equipment;
		// weather; stage; ...), so that nothing is cut off.
		parts := strings.Split(orDash(export.OperationDetails(o)), "; ")
		for k, part := range parts {
			row := []string{"", "", "", part}
			if k == 0 {
				row = []string{o.Date.Format("2006-01-02"), o.Kind.Title(), o.TreatmentsText(), part}
			}
			tb.rows = append(tb.rows, row)
			tb.bold = append(tb.bold, false)
		}
	}
	d.table(tb)
}

// writeResponse writes a rate trial's response section: the trends on the
// rates, the four models, the economic optimum and its sensitivity with the
// economic cautions, and the chart. fitErr is the models' failure, if any.
func writeResponse(d *doc, t *trial.Trial, a *analysis.Result, resp *analysis.Response, fitErr error, dec int, charts bool) error {
	title := "Response to rate"
	if resp.RateUnit != "" {
		title += " (" + resp.RateUnit + ")"
	}
	d.section(title, 25)
	d.note(export.ResponseNote(resp, a.ANOVA.DFError))
	for _, n := range resp.Notes {
		d.note(n)
	}
	if fitErr != nil {
		d.note("The curves cannot be fitted: " + fitErr.Error())
	}
	trend, model, sens := export.ResponseTables(resp, dec)
	for _, tt := range []export.TextTable{trend, model} {
		if len(tt.Head) == 0 {
			continue
		}
		// 7.5 pt: the models table has twelve columns.
		tb := table{heads: tt.Head, rows: tt.Rows, right: make([]bool, len(tt.Head)), size: 7.5}
		for i := 1; i < len(tb.right); i++ {
			tb.right[i] = true
		}
		d.table(tb)
		if tt.Foot != "" {
			d.note(tt.Foot)
		}
		d.Ln(2)
	}
	if len(sens.Head) > 0 {
		d.note("Economic optimum rate of each model at price ratios around " + strconv.FormatFloat(resp.PriceRatio, 'g', -1, 64) + " (price of a unit of input in units of produce):")
		tb := table{heads: sens.Head, rows: sens.Rows, right: make([]bool, len(sens.Head))}
		for i := 1; i < len(tb.right); i++ {
			tb.right[i] = true
		}
		d.table(tb)
		d.note("Caution: " + export.EconomicCautionText())
	}
	if !charts {
		return nil
	}
	p, err := chart.RateResponse(t, resp)
	if err != nil {
		d.note("The response chart could not be drawn: " + err.Error())
		return nil
	}
	return placeChart(d, p)
}
