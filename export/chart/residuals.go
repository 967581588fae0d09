package chart

import (
	"errors"
	"image/color"
	"math"
	"sort"
	"strconv"

	"gonum.org/v1/gonum/stat/distuv"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial"
	"furlong/trial/analysis"
)

// ErrTooFewResiduals is returned for residual charts of an analysis with
// fewer than three residuals.
var ErrTooFewResiduals = errors.New("there are too few observations to draw residual plots")

// outlierLimit is the |standardised residual| beyond which an observation is
// labelled, the limit the analysis uses for its outlier list.
const outlierLimit = 3

// residualData is the standardised residual of each observation, with its
// fitted value and label.
type residualData struct {
	fitted, std []float64
	labels      []string // plot number, or observation number without a trial
}

// residualsOf collects standardised residuals from r: the analysis's own
// when present, otherwise r_i / √(MSE·(1−h_i)) from the fitted model.
func residualsOf(t *trial.Trial, r *analysis.Result) (residualData, error) {
	if r == nil {
		panic("chart: residual chart of a nil result")
	}
	a := r.ANOVA
	if a == nil || len(a.Residuals) < 3 || len(a.Fitted) != len(a.Residuals) {
		return residualData{}, ErrTooFewResiduals
	}
	n := len(a.Residuals)
	d := residualData{fitted: a.Fitted, std: make([]float64, n), labels: make([]string, n)}
	own := r.Diagnostics.StandardizedResiduals
	root := a.RootMSE // √MSE with full digits (MSE of tiny data underflows)
	if root == 0 && a.MSE > 0 {
		root = math.Sqrt(a.MSE)
	}
	for i := range d.std {
		switch {
		case len(own) == n:
			d.std[i] = own[i]
		case len(a.Leverage) == n && root > 0 && a.Leverage[i] < 1:
			d.std[i] = a.Residuals[i] / (root * math.Sqrt(1-a.Leverage[i]))
		case root > 0:
			d.std[i] = a.Residuals[i] / root
		default:
			d.std[i] = 0
		}
		if math.IsNaN(d.std[i]) || math.IsInf(d.std[i], 0) {
			d.std[i] = 0
		}
		d.labels[i] = "obs " + strconv.Itoa(i+1)
		if t != nil && i < len(r.PlotIndex) && r.PlotIndex[i] >= 0 && r.PlotIndex[i] < len(t.Plots) {
			d.labels[i] = "plot " + strconv.Itoa(t.Plots[r.PlotIndex[i]].Number)
		}
	}
	return d, nil
}

// Residuals draws standardised residuals against fitted values, with a line
// at zero, dashed guides at ±3 and the observations beyond them labelled
// with their plot numbers. t supplies plot numbers and the title and may be
// nil.
func Residuals(t *trial.Trial, r *analysis.Result) (*plot.Plot, error) {
	d, err := residualsOf(t, r)
	if err != nil {
		return nil, err
	}
	p := newPlot(chartTitle(titleOf(t), r.TraitName+": residuals against fitted values"))
	p.X.Label.Text = "Fitted value" + unitSuffix(r.Unit)
	p.Y.Label.Text = "Standardised residual"
	xys := make(plotter.XYs, len(d.std))
	for i := range xys {
		xys[i] = plotter.XY{X: d.fitted[i], Y: d.std[i]}
	}
	xlo, xhi := xys[0].X, xys[0].X
	for _, xy := range xys {
		xlo, xhi = math.Min(xlo, xy.X), math.Max(xhi, xy.X)
	}
	pad := 0.05 * (xhi - xlo)
	if pad == 0 {
		pad = 0.5
	}
	xlo, xhi = xlo-pad, xhi+pad
	if err := addResidualLayers(p, xys, d, xlo, xhi); err != nil {
		return nil, err
	}
	p.X.Min, p.X.Max = xlo, xhi
	return p, nil
}

// QQ draws a normal quantile-quantile plot of the standardised residuals:
// theoretical normal quantiles at Blom's plotting positions
// (i − 3/8)/(n + 1/4) against the ordered residuals, with a reference line
// through the first and third quartiles. Points beyond ±3 are labelled.
func QQ(t *trial.Trial, r *analysis.Result) (*plot.Plot, error) {
	d, err := residualsOf(t, r)
	if err != nil {
		return nil, err
	}
	theo, idx := blomQuantiles(d.std)
	sorted := make([]float64, len(idx))
	xys := make(plotter.XYs, len(idx))
	labels := make([]string, len(idx))
	for k, i := range idx {
		sorted[k] = d.std[i]
		xys[k] = plotter.XY{X: theo[k], Y: d.std[i]}
		labels[k] = d.labels[i]
	}
	p := newPlot(chartTitle(titleOf(t), r.TraitName+": normal Q-Q plot of residuals"))
	p.X.Label.Text = "Theoretical normal quantile"
	p.Y.Label.Text = "Standardised residual (ordered)"
	intercept, slope := quartileLine(sorted)
	xlo, xhi := theo[0]-0.2, theo[len(theo)-1]+0.2
	// The axes hold the points with a margin; the reference line is cut
	// at the data area's edges, so it never runs over the axes or the key.
	ylo, yhi := sorted[0], sorted[len(sorted)-1]
	ypad := 0.06 * (yhi - ylo)
	if ypad == 0 {
		ypad = 0.5
	}
	ylo, yhi = ylo-ypad, yhi+ypad
	a, b, ok := clipLine(intercept, slope, xlo, xhi, ylo, yhi)
	if !ok {
		// A line that misses the data area entirely (all residuals tied
		// but one, say): draw it across at the median.
		m := sorted[len(sorted)/2]
		a, b = plotter.XY{X: xlo, Y: m}, plotter.XY{X: xhi, Y: m}
	}
	ref, err := plotter.NewLine(plotter.XYs{a, b})
	if err != nil {
		return nil, err
	}
	ref.LineStyle = draw.LineStyle{Color: markColor, Width: vg.Points(1)}
	p.Add(ref)
	pts, err := plotter.NewScatter(xys)
	if err != nil {
		return nil, err
	}
	pts.GlyphStyle = draw.GlyphStyle{Color: entryColor, Radius: vg.Points(2.5), Shape: draw.CircleGlyph{}}
	p.Add(pts)
	if err := addOutlierLabels(p, xys, labels); err != nil {
		return nil, err
	}
	rl := ref.LineStyle
	g := pts.GlyphStyle
	p.Add(&sidePanel{size: keySize, entries: []panelEntry{
		{swatch: &swatch{Glyph: &g}, text: "Residual"},
		{swatch: &swatch{Line: &rl}, text: "Line through\nthe quartiles"},
		{text: "Points near the line:\nresiduals close to normal"},
	}})
	p.X.Min, p.X.Max = xlo, xhi
	p.Y.Min, p.Y.Max = ylo, yhi
	return p, nil
}

// clipLine is the part of y = intercept + slope·x inside the rectangle
// [xlo, xhi] × [ylo, yhi]; ok is false when the line misses it.
func clipLine(intercept, slope, xlo, xhi, ylo, yhi float64) (a, b plotter.XY, ok bool) {
	if math.IsNaN(slope) || math.IsInf(slope, 0) || math.IsNaN(intercept) || math.IsInf(intercept, 0) {
		return a, b, false
	}
	y := func(x float64) float64 { return intercept + slope*x }
	x0, x1 := xlo, xhi
	if slope != 0 {
		// The x where the line crosses ylo and yhi, in increasing order.
		xa, xb := (ylo-intercept)/slope, (yhi-intercept)/slope
		if xa > xb {
			xa, xb = xb, xa
		}
		x0, x1 = math.Max(x0, xa), math.Min(x1, xb)
	} else if intercept < ylo || intercept > yhi {
		return a, b, false
	}
	if x0 >= x1 {
		return a, b, false
	}
	clampY := func(v float64) float64 { return math.Min(yhi, math.Max(ylo, v)) }
	return plotter.XY{X: x0, Y: clampY(y(x0))}, plotter.XY{X: x1, Y: clampY(y(x1))}, true
}

// addResidualLayers adds the zero line, the ±3 guides, the points and the
// outlier labels.
func addResidualLayers(p *plot.Plot, xys plotter.XYs, d residualData, xlo, xhi float64) error {
	zero, err := plotter.NewLine(plotter.XYs{{X: xlo, Y: 0}, {X: xhi, Y: 0}})
	if err != nil {
		return err
	}
	zero.LineStyle = draw.LineStyle{Color: color.Black, Width: vg.Points(0.8)}
	p.Add(zero)
	guide := draw.LineStyle{Color: markColor, Width: vg.Points(0.8), Dashes: []vg.Length{vg.Points(4), vg.Points(3)}}
	for _, y := range []float64{-outlierLimit, outlierLimit} {
		l, err := plotter.NewLine(plotter.XYs{{X: xlo, Y: y}, {X: xhi, Y: y}})
		if err != nil {
			return err
		}
		l.LineStyle = guide
		p.Add(l)
	}
	pts, err := plotter.NewScatter(xys)
	if err != nil {
		return err
	}
	pts.GlyphStyle = draw.GlyphStyle{Color: entryColor, Radius: vg.Points(2.5), Shape: draw.CircleGlyph{}}
	p.Add(pts)
	if err := addOutlierLabels(p, xys, d.labels); err != nil {
		return err
	}
	ymax := outlierLimit + 0.5
	for _, xy := range xys {
		ymax = math.Max(ymax, math.Abs(xy.Y)+0.3)
	}
	p.Y.Min, p.Y.Max = -ymax, ymax
	p.Y.Tick.Marker = plot.TickerFunc(func(lo, hi float64) []plot.Tick {
		var ts []plot.Tick
		step := math.Max(1, math.Ceil((hi-lo)/12))
		for v := math.Ceil(lo/step) * step; v <= hi; v += step {
			ts = append(ts, plot.Tick{Value: v, Label: strconv.FormatFloat(v, 'f', 0, 64)})
		}
		return ts
	})
	g := pts.GlyphStyle
	p.Add(&sidePanel{size: keySize, entries: []panelEntry{
		{swatch: &swatch{Glyph: &g}, text: "Observation"},
		{swatch: &swatch{Line: &guide}, text: "±3 standardised\nresiduals"},
		{text: "Labelled: beyond ±3"},
	}})
	return nil
}

// addOutlierLabels labels the points with |y| > outlierLimit.
func addOutlierLabels(p *plot.Plot, xys plotter.XYs, labels []string) error {
	var lab plotter.XYLabels
	for i, xy := range xys {
		if math.Abs(xy.Y) > outlierLimit {
			lab.XYs = append(lab.XYs, xy)
			lab.Labels = append(lab.Labels, labels[i])
		}
	}
	if len(lab.XYs) == 0 {
		return nil
	}
	// Labels of points in the right half go to their left, so that no
	// label runs past the data area into the key.
	lo, hi := xys[0].X, xys[0].X
	for _, xy := range xys {
		lo, hi = math.Min(lo, xy.X), math.Max(hi, xy.X)
	}
	mid := (lo + hi) / 2
	var right, left plotter.XYLabels
	for i, xy := range lab.XYs {
		if xy.X > mid {
			left.XYs, left.Labels = append(left.XYs, xy), append(left.Labels, lab.Labels[i])
		} else {
			right.XYs, right.Labels = append(right.XYs, xy), append(right.Labels, lab.Labels[i])
		}
	}
	for _, set := range []struct {
		lab   plotter.XYLabels
		align text.XAlignment
		dx    vg.Length
	}{{right, draw.XLeft, vg.Points(5)}, {left, draw.XRight, -vg.Points(5)}} {
		if len(set.lab.XYs) == 0 {
			continue
		}
		l, err := plotter.NewLabels(set.lab)
		if err != nil {
			return err
		}
		for i := range l.TextStyle {
			st := textStyle(keySize, color.Black)
			st.XAlign, st.YAlign = set.align, draw.YCenter
			l.TextStyle[i] = st
		}
		l.Offset = vg.Point{X: set.dx}
		p.Add(l)
	}
	return nil
}

// blomQuantiles returns the standard normal quantiles at Blom's plotting
// positions (i − 3/8)/(n + 1/4), i = 1..n, and the indices that sort x
// ascending (ties in input order).
func blomQuantiles(x []float64) (q []float64, order []int) {
	n := len(x)
	order = make([]int, n)
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return x[order[a]] < x[order[b]] })
	q = make([]float64, n)
	for i := range q {
		q[i] = distuv.UnitNormal.Quantile((float64(i+1) - 0.375) / (float64(n) + 0.25))
	}
	return q, order
}

// quartileLine is the line through (Φ⁻¹(¼), Q1) and (Φ⁻¹(¾), Q3), with the
// sample quartiles of sorted data by linear interpolation between order
// statistics (Hyndman and Fan 1996, definition 7).
func quartileLine(sorted []float64) (intercept, slope float64) {
	q1, q3 := quantile7(sorted, 0.25), quantile7(sorted, 0.75)
	z1, z3 := distuv.UnitNormal.Quantile(0.25), distuv.UnitNormal.Quantile(0.75)
	slope = (q3 - q1) / (z3 - z1)
	return q1 - slope*z1, slope
}

// quantile7 is the p-quantile of sorted data, Hyndman and Fan definition 7:
// h = (n−1)p, x[⌊h⌋] + (h−⌊h⌋)(x[⌊h⌋+1] − x[⌊h⌋]).
func quantile7(sorted []float64, p float64) float64 {
	h := float64(len(sorted)-1) * p
	lo := int(math.Floor(h))
	if lo+1 >= len(sorted) {
		return sorted[len(sorted)-1]
	}
	return sorted[lo] + (h-float64(lo))*(sorted[lo+1]-sorted[lo])
}

func titleOf(t *trial.Trial) string {
	if t == nil {
		return ""
	}
	return t.Title
}

func unitSuffix(u string) string {
	if u == "" {
		return ""
	}
	return " (" + u + ")"
}
