package chart

import (
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"furlong/trial"
	"furlong/trial/analysis"
)

// Progress draws an assessment series over the season (analysis.
// ProgressOf): one line per treatment through its mean at each assessment,
// the untreated check drawn thickest in the check colour so that the programmes read
// against it. Colours and shapes follow the Okabe–Ito palette and come
// round after eight treatments, with the line dashes telling them apart.
// t supplies the trial title and may be nil.
func Progress(t *trial.Trial, pr *analysis.Progress) (*plot.Plot, error) {
	if pr == nil || len(pr.Points) == 0 || len(pr.Rows) == 0 {
		return nil, ErrNoData
	}
	first := ""
	if t != nil {
		first = t.Title
	}
	p := newPlot(chartTitle(first, "Series "+pr.Series+" over the season: each treatment's mean"))
	p.X.Label.Text = "Time (" + pr.Axis + ")"
	p.Y.Label.Text = traitTitle("Mean", pr.Unit, "")
	p.Legend.Top = true
	p.Legend.Left = true
	any := false
	k := 0
	for _, row := range pr.Rows {
		var pts plotter.XYs
		for j, pt := range pr.Points {
			if v := row.Means[j]; !math.IsNaN(v) {
				pts = append(pts, plotter.XY{X: pt.Time, Y: v})
			}
		}
		if len(pts) == 0 {
			continue
		}
		any = true
		l, s, err := plotter.NewLinePoints(pts)
		if err != nil {
			return nil, err
		}
		label := row.Treatment
		if row.Treatment == pr.Untreated {
			l.Color, s.Color = OkabeIto[0], OkabeIto[0]
			l.Width = vg.Points(2.5)
			s.Shape = shapeFor(0)
			label += " (untreated)"
		} else {
			clr := OkabeIto[(k%(len(OkabeIto)-1))+1]
			l.Color, s.Color = clr, clr
			l.Width = vg.Points(1.5)
			l.Dashes = dashesFor(k / (len(OkabeIto) - 1))
			s.Shape = shapeFor(k + 1)
			k++
		}
		s.Radius = vg.Points(3)
		p.Add(l, s)
		p.Legend.Add(label, l, s)
	}
	if !any {
		return nil, ErrNoData
	}
	p.Y.Min = math.Min(p.Y.Min, 0)
	// A tick at each assessment, labelled with its day.
	var ticks []plot.Tick
	for _, pt := range pr.Points {
		ticks = append(ticks, plot.Tick{Value: pt.Time, Label: strconv.FormatFloat(pt.Time, 'f', -1, 64)})
	}
	p.X.Tick.Marker = plot.ConstantTicks(ticks)
	span := pr.Points[len(pr.Points)-1].Time - pr.Points[0].Time
	p.X.Min, p.X.Max = pr.Points[0].Time-0.04*span, pr.Points[len(pr.Points)-1].Time+0.04*span
	return p, nil
}
