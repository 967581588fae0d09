package chart

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// VsCheck draws each entry's difference from the check (entry minus check)
// with its simultaneous confidence interval (analysis.CompareWithCheck), a
// line at zero for the check, and the verdict shown by shape and colour:
// better (filled triangle, bluish green), worse (filled square, vermillion), not
// different (circle, blue). The entries are ordered by difference, the
// best first in the trait's better direction. t supplies the trial title
// and may be nil.
func VsCheck(t *trial.Trial, r *analysis.Result, vc *analysis.CheckComparison) (*plot.Plot, error) {
	if r == nil || vc == nil {
		return nil, errors.New("there is no comparison with the check to chart")
	}
	if len(vc.Rows) == 0 {
		return nil, ErrNoData
	}
	rows := append([]analysis.CheckRow(nil), vc.Rows...)
	sort.SliceStable(rows, func(i, j int) bool {
		if vc.HigherBetter {
			return rows[i].Diff > rows[j].Diff
		}
		return rows[i].Diff < rows[j].Diff
	})
	first := ""
	if t != nil {
		first = t.Title
	}
	scale := ""
	if r.Transform != stats.NoTransform {
		scale = "Differences on the " + r.Transform.Scale() + " scale the trait is analysed on"
	}
	p := newPlot(chartTitle(first, fmt.Sprintf("%s: each entry minus the check %s", r.TraitName, vc.Check), scale))
	unit := r.Unit
	if r.Transform != stats.NoTransform {
		unit = r.Transform.Scale() + " scale"
	}
	p.Y.Label.Text = traitTitle("Difference from the check", unit, "")
	better := "higher is better"
	if !vc.HigherBetter {
		better = "lower is better"
	}
	p.X.Label.Text = fmt.Sprintf("Entry (best first; %s), %s simultaneous intervals", better, formatPercent(1-vc.Alpha))
	codes := make([]string, len(rows))
	for i, row := range rows {
		codes[i] = row.Treatment
	}
	nominalAxis(p, codes)

	zero, err := plotter.NewLine(plotter.XYs{{X: p.X.Min, Y: 0}, {X: p.X.Max, Y: 0}})
	if err != nil {
		return nil, err
	}
	zero.LineStyle = draw.LineStyle{Color: checkColor, Width: vg.Points(1.2), Dashes: []vg.Length{vg.Points(4), vg.Points(3)}}
	p.Add(zero)
	p.Legend.Add("the check "+vc.Check, zero)

	radius := vg.Points(3.5)
	if len(rows) > 60 {
		radius = vg.Points(1.8)
	}
	kinds := []struct {
		verdict string
		glyph   draw.GlyphStyle
	}{
		{"better", draw.GlyphStyle{Color: OkabeIto[2], Radius: radius, Shape: draw.PyramidGlyph{}}},
		{"not different", draw.GlyphStyle{Color: entryColor, Radius: radius, Shape: draw.CircleGlyph{}}},
		{"worse", draw.GlyphStyle{Color: markColor, Radius: radius, Shape: draw.SquareGlyph{}}},
	}
	lo, hi := 0.0, 0.0
	for _, k := range kinds {
		var set errorSet
		for i, row := range rows {
			if row.Verdict != k.verdict || !finite(row.Diff) || !finite(row.Lower) || !finite(row.Upper) {
				continue
			}
			set.xys = append(set.xys, plotter.XY{X: float64(i), Y: row.Diff})
			set.errs = append(set.errs, struct{ Low, High float64 }{row.Diff - row.Lower, row.Upper - row.Diff})
			lo, hi = math.Min(lo, row.Lower), math.Max(hi, row.Upper)
		}
		if len(set.xys) == 0 {
			continue
		}
		bars, err := plotter.NewYErrorBars(set)
		if err != nil {
			return nil, err
		}
		bars.LineStyle = draw.LineStyle{Color: k.glyph.Color, Width: vg.Points(1.2)}
		bars.CapWidth = vg.Points(5)
		pts, err := plotter.NewScatter(set.xys)
		if err != nil {
			return nil, err
		}
		pts.GlyphStyle = k.glyph
		p.Add(bars, pts)
		p.Legend.Add(k.verdict, pts)
	}
	pad := 0.08 * math.Max(hi-lo, 1e-12)
	p.Y.Min, p.Y.Max = lo-pad, hi+pad
	p.Legend.Top = true
	return p, nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
