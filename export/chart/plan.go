package chart

import (
	"fmt"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial/analysis"
)

// Detectable draws the detectable difference (percent of the mean) against
// the number of replicates (analysis.PlanCurve), with the plan's own
// number of replicates marked; title is the chart's first line (may be
// empty).
func Detectable(points []analysis.PlanPoint, reps int, title string) (*plot.Plot, error) {
	if len(points) == 0 {
		return nil, ErrNoData
	}
	p := newPlot(chartTitle(title, "Detectable difference by replicates"))
	p.X.Label.Text = "Replicates"
	p.Y.Label.Text = "Detectable difference (% of the mean)"
	xys := make(plotter.XYs, len(points))
	hi := 0.0
	var mark plotter.XYs
	for i, pt := range points {
		xys[i] = plotter.XY{X: float64(pt.Reps), Y: pt.Detectable}
		hi = math.Max(hi, pt.Detectable)
		if pt.Reps == reps {
			mark = append(mark, xys[i])
		}
	}
	line, pts, err := plotter.NewLinePoints(xys)
	if err != nil {
		return nil, err
	}
	line.LineStyle = draw.LineStyle{Color: entryColor, Width: vg.Points(1.5)}
	pts.GlyphStyle = draw.GlyphStyle{Color: entryColor, Radius: vg.Points(3), Shape: draw.CircleGlyph{}}
	p.Add(line, pts)
	if len(mark) > 0 {
		m, err := plotter.NewScatter(mark)
		if err != nil {
			return nil, err
		}
		m.GlyphStyle = draw.GlyphStyle{Color: markColor, Radius: vg.Points(5), Shape: draw.PyramidGlyph{}}
		p.Add(m)
		p.Legend.Add(fmt.Sprintf("%d replicates: %.1f %%", reps, mark[0].Y), m)
		p.Legend.Top = true
	}
	p.Y.Min, p.Y.Max = 0, hi*1.1
	first, last := points[0].Reps, points[len(points)-1].Reps
	p.X.Min, p.X.Max = float64(first)-0.5, float64(last)+0.5
	var ticks plot.ConstantTicks
	for r := first; r <= last; r++ {
		ticks = append(ticks, plot.Tick{Value: float64(r), Label: itoa(r)})
	}
	p.X.Tick.Marker = ticks
	return p, nil
}
