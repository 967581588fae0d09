package xlsx

import (
	"fmt"
	"strconv"

	"github.com/xuri/excelize/v2"
	"gonum.org/v1/plot"

	"furlong/export"
	"furlong/export/chart"
	"furlong/stats"
	"furlong/stats/dist"
	"furlong/trial"
	"furlong/trial/analysis"
)

// The comparisons beyond the letters on a trait sheet: each entry against
// the check (Dunnett, analysis.CheckComparison) with its chart, and the
// user's contrasts (analysis.ContrastSet). Each is written only when the
// analysis carries it (analysis.CompareAllWithCheck, EstimateAllContrasts).

// vsCheckChartRows is the number of rows of 15 points kept free under the
// table of the comparisons with the check for its chart (chartHeightPt).
const vsCheckChartRows = 20

// writeVsCheck writes the table of every entry against the check at row and
// returns the next free row; with charts, the chart of the intervals goes
// under it. dec is the decimals of the differences.
func (s *sheet) writeVsCheck(f *excelize.File, t *trial.Trial, a *analysis.Result, row, dec int, charts bool) int {
	vc := a.VsCheck
	if vc == nil || len(vc.Rows) == 0 {
		return row
	}
	s.textNoWidth(1, row, "Each entry against the check "+vc.Check+" (Dunnett)", sectionStyle)
	row++
	level := strconv.FormatFloat(100*(1-vc.Alpha), 'f', -1, 64) + "%"
	better := "higher"
	if !vc.HigherBetter {
		better = "lower"
	}
	scale := ""
	if a.Transform != stats.NoTransform {
		scale = " on the " + a.Transform.Scale() + " scale the trait is analysed on"
	}
	s.textNoWidth(1, row, fmt.Sprintf("Entry minus check%s, with its simultaneous %s confidence interval (all entries together); %s values are better.", scale, level, better), noteStyle)
	row++
	s.textNoWidth(1, row, "p-values are adjusted for the number of entries compared with the check (single step); "+vsCheckMethodNote(vc)+".", noteStyle)
	row++
	for i, h := range []string{"Treatment", "Name", "Difference", "SE", "Lower " + level, "Upper " + level, "p (two-sided)", "p (" + better + " is better)", "Reading"} {
		k := headNumStyle
		switch {
		case i < 2:
			k = headStyle
		case i == 8:
			k = headStyle
			k.halign = "center"
		}
		s.text(1+i, row, h, k)
	}
	row++
	names := map[string]string{}
	for _, m := range a.Means {
		names[m.Treatment] = m.Name
	}
	for _, r := range vc.Rows {
		s.text(1, row, r.Treatment, styleKey{})
		s.text(2, row, names[r.Treatment], styleKey{})
		s.numOrDash(3, row, r.Diff, numStyle(dec))
		s.numOrDash(4, row, r.SE, numStyle(dec))
		s.numOrDash(5, row, r.Lower, numStyle(dec))
		s.numOrDash(6, row, r.Upper, numStyle(dec))
		s.numOrDash(7, row, r.PTwoSided, pStyle)
		s.numOrDash(8, row, r.PBetter, pStyle)
		s.text(9, row, r.Verdict, styleKey{halign: "center", bold: r.Verdict != "not different"})
		row++
	}
	s.textNoWidth(1, row, fmt.Sprintf("Critical value of the intervals: %s on %d error df.", strconv.FormatFloat(vc.Critical, 'f', 4, 64), a.ANOVA.DFError), noteStyle)
	row += 2
	if !charts || s.err != nil {
		return row
	}
	return s.chartBelow(f, row, "chart against the check", "Chart of each entry against the check "+vc.Check+" for "+a.TraitName,
		widthFor(len(vc.Rows)), func() (*plot.Plot, error) { return chart.VsCheck(t, a, vc) })
}

// vsCheckMethodNote says how the multivariate t probabilities were worked
// out and how exact they are.
func vsCheckMethodNote(vc *analysis.CheckComparison) string {
	switch vc.Method {
	case dist.ProductMethod:
		return "probabilities exact to numerical precision (the correlations have product form)"
	case dist.LatticeMethod:
		return "probabilities to within " + strconv.FormatFloat(vc.Error, 'g', 2, 64) + " (deterministic lattice integration)"
	}
	return "probabilities approximate (nearest one-factor correlation structure)"
}

// writeContrasts writes the table of the user's contrasts at row and returns
// the next free row. dec is the decimals of the estimates.
func (s *sheet) writeContrasts(a *analysis.Result, row, dec int) int {
	set := a.Contrasts
	if set == nil || len(set.Rows) == 0 {
		return row
	}
	s.textNoWidth(1, row, "Contrasts", sectionStyle)
	row++
	scale := ""
	if a.Transform != stats.NoTransform {
		scale = " on the " + a.Transform.Scale() + " scale the trait is analysed on"
	}
	s.textNoWidth(1, row, "Planned comparisons of the treatment means"+scale+": each estimate with its standard error from the model and a t test on the error df; "+export.AdjustmentText(set.Adjust)+".", noteStyle)
	row++
	for i, h := range []string{"Contrast", "Definition", "Estimate", "SE", "df", "t", "p", "p adjusted"} {
		k := headNumStyle
		if i < 2 {
			k = headStyle
		}
		s.text(1+i, row, h, k)
	}
	row++
	for _, c := range set.Rows {
		s.text(1, row, c.Name, styleKey{})
		s.textNoWidth(2, row, c.Definition, styleKey{})
		s.numOrDash(3, row, c.Estimate, numStyle(dec))
		s.numOrDash(4, row, c.SE, numStyle(dec))
		s.integer(5, row, c.DF, styleKey{})
		s.numOrDash(6, row, c.T, numStyle(3))
		s.numOrDash(7, row, c.P, pStyle)
		s.numOrDash(8, row, c.PAdjusted, pStyle)
		row++
	}
	return row + 1
}

// writeProgress puts the chart of the trait's assessment series over the
// season at row (export.ProgressSheetSeries: once per series) and returns
// the next free row.
func (s *sheet) writeProgress(f *excelize.File, r *report, key string, row int) int {
	if !r.opts.Charts || s.err != nil {
		return row
	}
	keys := make([]string, len(r.traits))
	for i, tr := range r.traits {
		keys[i] = tr.Key
	}
	series := export.ProgressSheetSeries(r.t, key, keys)
	if series == "" {
		return row
	}
	s.textNoWidth(1, row, "Series "+series+" over the season", sectionStyle)
	row++
	s.textNoWidth(1, row, "Each treatment's mean at each assessment (the plots assessed; excluded plots left out).", noteStyle)
	row++
	return s.chartBelow(f, row, "chart over the season", "Chart of series "+series+" over the season", chartWidthPt,
		func() (*plot.Plot, error) {
			pr, err := analysis.ProgressOf(r.t, series)
			if err != nil {
				return nil, err
			}
			return chart.Progress(r.t, pr)
		})
}
