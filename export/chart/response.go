package chart

import (
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"furlong/trial"
	"furlong/trial/analysis"
)

// curveSteps is the number of segments each fitted curve is drawn with:
// enough for a smooth quadratic and a sharp join at any width.
const curveSteps = 200

// modelLabels are the legend names of the response models.
var modelLabels = map[string]string{
	"linear":            "Linear",
	"quadratic":         "Quadratic",
	"linear-plateau":    "Linear-plateau",
	"quadratic-plateau": "Quadratic-plateau",
}

// modelColours give each model the same Okabe–Ito colour on every chart;
// orange is kept for the economic optimum and black for the means.
var modelColours = map[string]color.NRGBA{
	"linear":            OkabeIto[1],
	"quadratic":         OkabeIto[2],
	"linear-plateau":    OkabeIto[4],
	"quadratic-plateau": OkabeIto[5],
}

// RateResponse draws a rate trial's response (analysis.ResponseOf): each
// treatment mean at its rate with ± 1 SE bars, the four fitted models over
// the tested rates (the one with the lowest AIC thickest) and, with a price
// ratio, the economic optimum of that model as a dashed vertical line. t
// supplies the trial title and may be nil.
func RateResponse(t *trial.Trial, r *analysis.Response) (*plot.Plot, error) {
	if r == nil || len(r.Points) == 0 {
		return nil, ErrNoData
	}
	first := ""
	if t != nil {
		first = t.Title
	}
	p := newPlot(chartTitle(first, "Response of "+r.Trait+" to rate: treatment means (± 1 SE) and fitted curves"))
	xl := "Rate"
	if r.RateUnit != "" {
		xl += " (" + r.RateUnit + ")"
	}
	p.X.Label.Text = xl
	p.Y.Label.Text = traitTitle("Mean", r.Unit, "")
	p.Legend.Top = false
	p.Legend.Left = false
	p.Legend.XOffs = -vg.Points(4)
	p.Legend.YOffs = vg.Points(4)

	k := 1
	for _, m := range r.Models {
		if len(m.Coef) == 0 || !(m.High > m.Low) {
			continue
		}
		var pts plotter.XYs
		for i := 0; i <= curveSteps; i++ {
			x := m.Low + (m.High-m.Low)*float64(i)/curveSteps
			pts = append(pts, plotter.XY{X: x, Y: m.Predict(x)})
		}
		l, err := plotter.NewLine(pts)
		if err != nil {
			return nil, err
		}
		l.Color = OkabeIto[6]
		if c, ok := modelColours[m.Model]; ok {
			l.Color = c
		}
		l.Width = vg.Points(1.2)
		l.Dashes = dashesFor(k - 1)
		label := modelLabels[m.Model]
		if label == "" {
			label = m.Model
		}
		label += " (R² " + strconv.FormatFloat(m.RSquared, 'f', 3, 64) + ")"
		if m.Model == r.Best {
			l.Width = vg.Points(2.5)
			l.Dashes = nil
			label += ", lowest AIC"
		}
		k++
		p.Add(l)
		p.Legend.Add(label, l)
	}

	var means plotter.XYs
	var errs plotter.YErrors
	for _, pt := range r.Points {
		means = append(means, plotter.XY{X: pt.Rate, Y: pt.Mean})
		se := pt.SE
		if math.IsNaN(se) || se < 0 {
			se = 0
		}
		errs = append(errs, struct{ Low, High float64 }{se, se})
	}
	bars, err := plotter.NewYErrorBars(struct {
		plotter.XYs
		plotter.YErrors
	}{means, errs})
	if err != nil {
		return nil, err
	}
	bars.Color = color.Black
	bars.Width = vg.Points(1)
	sc, err := plotter.NewScatter(means)
	if err != nil {
		return nil, err
	}
	sc.Color = color.Black
	sc.Shape = shapeFor(0)
	sc.Radius = vg.Points(3.5)
	p.Add(bars, sc)
	p.Legend.Add("Treatment mean ± 1 SE", sc)

	if b := r.BestFit(); b != nil && b.Econ != nil {
		lo, hi := yRange(r)
		l, err := plotter.NewLine(plotter.XYs{{X: *b.Econ, Y: lo}, {X: *b.Econ, Y: hi}})
		if err != nil {
			return nil, err
		}
		l.Color = OkabeIto[0]
		l.Width = vg.Points(1.5)
		l.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
		opt, err := plotter.NewScatter(plotter.XYs{{X: *b.Econ, Y: *b.EconYield}})
		if err != nil {
			return nil, err
		}
		opt.Color = OkabeIto[0]
		opt.Shape = shapeFor(3)
		opt.Radius = vg.Points(5)
		p.Add(l, opt)
		p.Legend.Add("Economic optimum "+strconv.FormatFloat(*b.Econ, 'f', 0, 64)+" at price ratio "+strconv.FormatFloat(r.PriceRatio, 'g', 4, 64), l, opt)
	}
	// The rates themselves as ticks, so the tested rates read off the axis.
	var ticks []plot.Tick
	for i, pt := range r.Points {
		if i > 0 && pt.Rate == r.Points[i-1].Rate {
			continue
		}
		ticks = append(ticks, plot.Tick{Value: pt.Rate, Label: strconv.FormatFloat(pt.Rate, 'f', -1, 64)})
	}
	p.X.Tick.Marker = plot.ConstantTicks(ticks)
	lo, hi := r.Points[0].Rate, r.Points[len(r.Points)-1].Rate
	span := hi - lo
	if span <= 0 {
		span = 1
	}
	p.X.Min, p.X.Max = lo-0.05*span, hi+0.05*span
	return p, nil
}

// yRange is the range of the means ± SE and the fitted curves: where the
// optimum's line is drawn from and to.
func yRange(r *analysis.Response) (lo, hi float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, pt := range r.Points {
		se := pt.SE
		if math.IsNaN(se) {
			se = 0
		}
		lo, hi = math.Min(lo, pt.Mean-se), math.Max(hi, pt.Mean+se)
	}
	return lo, hi
}
