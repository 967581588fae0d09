package chart

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// ErrorBars says what the error bars of a means chart show.
type ErrorBars int

const (
	// StandardError draws each mean ± 1 standard error.
	StandardError ErrorBars = iota
	// ConfidenceInterval draws the 1−α confidence interval of each mean,
	// mean ± t(1−α/2, error df)·SE, with α the analysis level.
	ConfidenceInterval
	// NoErrorBars draws none.
	NoErrorBars
)

// MeansOptions control a means chart. The zero value gives bars with ± 1 SE
// error bars, ordered by mean, without letters.
type MeansOptions struct {
	ErrorBars ErrorBars
	// Letters is the mean separation whose letters are written above each
	// mean: meansep.LSD, meansep.Tukey, or "" for none.
	Letters meansep.Method
	Order   Order
	// Points draws a point per mean instead of a bar.
	Points bool
	// Title replaces the trial title on the first line.
	Title string
}

// ErrNoDF is returned for a confidence interval when the analysis has no
// error degrees of freedom.
var ErrNoDF = errors.New("a confidence interval needs error degrees of freedom, and this analysis has none; show standard errors instead")

// meanBar is one treatment's entry in a means chart.
type meanBar struct {
	code     string
	check    bool
	y        float64 // on the original scale
	low, top float64 // error bar ends; NaN when there is none
	letters  string
}

// Means draws the treatment means of r as bars (or points) with error bars
// and, optionally, mean separation letters. t supplies the trial title and
// may be nil.
//
// When the analysis used a transformation the back-transformed means are
// drawn and the error bar ends are back-transformed from the analysis
// scale, so the bars are not symmetric.
func Means(t *trial.Trial, r *analysis.Result, opt MeansOptions) (*plot.Plot, error) {
	if r == nil {
		panic("chart: Means of a nil result")
	}
	bars, notes, alpha, err := meanBars(r, opt)
	if err != nil {
		return nil, err
	}
	first := opt.Title
	if first == "" && t != nil {
		first = t.Title
	}
	name := traitTitle(r.TraitName, r.Unit, r.TraitKey)
	p := newPlot(chartTitle(append([]string{first, r.TraitName + ": treatment means"}, notes...)...))
	p.Y.Label.Text = name
	p.X.Label.Text = "Treatment (" + orderNote(opt.Order, r.HigherBetter) + ")"
	if err := drawMeanBars(p, bars, opt, alpha, errorBarNote(opt.ErrorBars, alpha)); err != nil {
		return nil, err
	}
	return p, nil
}

// drawMeanBars adds the bars (or points), error bars, letters and key of a
// means chart to p, whose title and axis labels are set; barNote says what
// the error bars show.
func drawMeanBars(p *plot.Plot, bars []meanBar, opt MeansOptions, alpha float64, barNote string) error {
	codes := make([]string, len(bars))
	lettersShown := false
	for i, b := range bars {
		codes[i] = b.code
		lettersShown = lettersShown || b.letters != ""
	}
	pct := formatPercent(alpha)
	nominalAxis(p, codes)

	n := len(bars)
	hatchSpacing := vg.Points(3)
	if n > 60 {
		hatchSpacing = vg.Points(1.5)
	}
	entrySw := swatch{Fill: entryColor, Outline: draw.LineStyle{Color: color.Black, Width: vg.Points(0.5)}}
	checkSw := swatch{Fill: checkColor, Pattern: patternDiagonal, Outline: draw.LineStyle{Color: color.Black, Width: vg.Points(0.5)}}
	if n > 100 {
		entrySw.Outline.Width, checkSw.Outline.Width = 0, 0
	}
	entryGlyph := draw.GlyphStyle{Color: entryColor, Radius: vg.Points(3), Shape: draw.CircleGlyph{}}
	checkGlyph := draw.GlyphStyle{Color: checkColor, Radius: vg.Points(3.5), Shape: draw.TriangleGlyph{}}
	if n > 60 {
		entryGlyph.Radius, checkGlyph.Radius = vg.Points(1.5), vg.Points(2)
	}

	lo, hi := math.Inf(1), math.Inf(-1)
	for _, b := range bars {
		for _, v := range []float64{b.y, b.low, b.top} {
			if !math.IsNaN(v) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if opt.Points {
		var entries, checks plotter.XYs
		for i, b := range bars {
			if b.check {
				checks = append(checks, plotter.XY{X: float64(i), Y: b.y})
			} else {
				entries = append(entries, plotter.XY{X: float64(i), Y: b.y})
			}
		}
		for _, set := range []struct {
			xys plotter.XYs
			g   draw.GlyphStyle
		}{{entries, entryGlyph}, {checks, checkGlyph}} {
			if len(set.xys) == 0 {
				continue
			}
			s, err := plotter.NewScatter(set.xys)
			if err != nil {
				return err
			}
			s.GlyphStyle = set.g
			p.Add(s)
		}
	} else {
		bp := &barPlotter{width: 0.7, spacing: hatchSpacing}
		for i, b := range bars {
			sw := entrySw
			if b.check {
				sw = checkSw
			}
			bp.bars = append(bp.bars, barRect{x: float64(i), y: b.y, sw: sw})
		}
		p.Add(bp)
		lo, hi = math.Min(lo, 0), math.Max(hi, 0)
	}

	// Error bars.
	var eb errorSet
	for i, b := range bars {
		if !math.IsNaN(b.low) {
			eb.xys = append(eb.xys, plotter.XY{X: float64(i), Y: b.y})
			eb.errs = append(eb.errs, struct{ Low, High float64 }{b.y - b.low, b.top - b.y})
		}
	}
	if len(eb.xys) > 0 {
		e, err := plotter.NewYErrorBars(eb)
		if err != nil {
			return err
		}
		e.LineStyle.Width = vg.Points(0.8)
		e.CapWidth = vg.Points(min(5, 300/float64(n)))
		p.Add(e)
	}

	// Letters above the error bar (or the mean).
	span := hi - lo
	if span <= 0 {
		span = math.Max(1, math.Abs(hi))
	}
	if lettersShown {
		var lab plotter.XYLabels
		for i, b := range bars {
			top := b.y
			if !math.IsNaN(b.top) {
				top = math.Max(top, b.top)
			}
			if !opt.Points {
				top = math.Max(top, 0)
			}
			lab.XYs = append(lab.XYs, plotter.XY{X: float64(i), Y: top})
			lab.Labels = append(lab.Labels, b.letters)
		}
		l, err := plotter.NewLabels(lab)
		if err != nil {
			return err
		}
		size := p.X.Tick.Label.Font.Size + 1
		for i := range l.TextStyle {
			st := textStyle(size, color.Black)
			st.XAlign, st.YAlign = draw.XCenter, draw.YBottom
			if n > 30 {
				st.Rotation = math.Pi / 2
				st.XAlign, st.YAlign = draw.XLeft, draw.YCenter
			}
			l.TextStyle[i] = st
		}
		l.Offset = vg.Point{Y: vg.Points(2)}
		if n > 30 {
			l.Offset = vg.Point{Y: vg.Points(2)}
		}
		p.Add(l)
		longest := 0
		for _, s := range lab.Labels {
			longest = max(longest, len(s))
		}
		// Leave headroom for the letters; rotated letters need more.
		room := 0.08
		if n > 30 {
			room = 0.04 + 0.025*float64(longest)
		}
		hi += room * span
	}
	p.Y.Min, p.Y.Max = lo-0.02*span, hi+0.05*span
	if !opt.Points && lo >= 0 {
		p.Y.Min = 0
	}
	p.X.Min, p.X.Max = -0.6, float64(n)-0.4

	// Key.
	panel := &sidePanel{size: keySize}
	hasCheck := false
	for _, b := range bars {
		hasCheck = hasCheck || b.check
	}
	if opt.Points {
		eg, cg := entryGlyph, checkGlyph
		eg.Radius, cg.Radius = vg.Points(3), vg.Points(3.5)
		panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Glyph: &eg}, text: "Entry"})
		if hasCheck {
			panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Glyph: &cg}, text: "Check"})
		}
	} else {
		es, cs := entrySw, checkSw
		es.Outline.Width, cs.Outline.Width = vg.Points(0.5), vg.Points(0.5)
		panel.entries = append(panel.entries, panelEntry{swatch: &es, text: "Entry"})
		if hasCheck {
			panel.entries = append(panel.entries, panelEntry{swatch: &cs, text: "Check"})
		}
	}
	if len(eb.xys) > 0 {
		panel.entries = append(panel.entries, panelEntry{swatch: &swatch{ErrBar: true}, text: barNote})
	}
	if lettersShown {
		method := "LSD"
		if opt.Letters == meansep.Tukey {
			method = "Tukey HSD"
		}
		panel.entries = append(panel.entries, panelEntry{
			text: fmt.Sprintf("Letters: %s, α = %s.\nMeans sharing a letter\ndo not differ significantly.", method, pct),
		})
	}
	p.Add(panel)
	return nil
}

// meanBars computes the bars of a means chart in display order, with the
// notes for the title and the significance level used.
func meanBars(r *analysis.Result, opt MeansOptions) (bars []meanBar, notes []string, alpha float64, err error) {
	k := 0.0
	alpha = r.Alpha
	if alpha <= 0 || alpha >= 1 {
		alpha = 0.05
	}
	switch opt.ErrorBars {
	case StandardError:
		k = 1
	case ConfidenceInterval:
		if r.ANOVA == nil || r.ANOVA.DFError < 1 {
			return nil, nil, 0, ErrNoDF
		}
		k = distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(r.ANOVA.DFError)}.Quantile(1 - alpha/2)
	case NoErrorBars:
	default:
		panic(fmt.Sprintf("chart: unknown ErrorBars %d", opt.ErrorBars))
	}
	back := backTransformer(r)

	var noData []string
	for _, m := range r.Means {
		y := m.Mean
		if r.Transform != stats.NoTransform {
			y = m.BackMean
		}
		if m.N == 0 || math.IsNaN(y) || math.IsInf(y, 0) {
			noData = append(noData, m.Treatment)
			continue
		}
		b := meanBar{code: m.Treatment, check: m.Check, y: y, low: math.NaN(), top: math.NaN()}
		if k > 0 && m.SE > 0 && !math.IsInf(m.SE, 0) {
			b.low, b.top = back(m.Mean-k*m.SE), back(m.Mean+k*m.SE)
		}
		switch opt.Letters {
		case meansep.LSD:
			b.letters = m.LettersLSD
		case meansep.Tukey:
			b.letters = m.LettersTukey
		case "":
		default:
			panic(fmt.Sprintf("chart: unknown letters method %q", opt.Letters))
		}
		bars = append(bars, b)
	}
	if len(bars) == 0 {
		return nil, nil, 0, ErrNoData
	}
	codes := make([]string, len(bars))
	ys := make([]float64, len(bars))
	for i, b := range bars {
		codes[i], ys[i] = b.code, b.y
	}
	order := orderIndices(opt.Order, codes, ys, r.HigherBetter)
	sorted := make([]meanBar, len(bars))
	for i, j := range order {
		sorted[i] = bars[j]
	}
	bars = sorted

	// Notes for the title: what is not shown, and why.
	lettersShown := false
	for _, b := range bars {
		if b.letters != "" {
			lettersShown = true
			break
		}
	}
	pct := formatPercent(alpha)
	switch {
	case opt.Letters == meansep.LSD && !r.LSDLettersGiven:
		notes = append(notes, fmt.Sprintf("LSD letters withheld: the treatment F test is not significant at α = %s", pct))
	case opt.Letters != "" && !lettersShown:
		notes = append(notes, "No mean separation letters are available for this analysis")
	}
	if r.Transform != stats.NoTransform {
		notes = append(notes, fmt.Sprintf("Analysed on the %s scale; means and error bars back-transformed", r.Transform.Scale()))
	}
	if len(noData) > 0 {
		notes = append(notes, "Not shown (no data): "+strings.Join(noData, ", "))
	}

	return bars, notes, alpha, nil
}

// errorBarNote says what the error bars show.
func errorBarNote(e ErrorBars, alpha float64) string {
	if e == ConfidenceInterval {
		return "Error bars: " + formatPercent(1-alpha) + " confidence interval"
	}
	return "Error bars: ± 1 SE"
}

// formatPercent prints a fraction as a percentage: 0.05 → "5%".
func formatPercent(f float64) string {
	return strings.TrimSuffix(strings.TrimRight(fmt.Sprintf("%.2f", 100*f), "0"), ".") + "%"
}

// backTransformer returns the map from the analysis scale of r to the
// original scale. The offset added before a log or square-root
// transformation is not kept in the result; it is the candidate that
// reproduces the back-transformed means.
func backTransformer(r *analysis.Result) func(float64) float64 {
	if r.Transform == stats.NoTransform {
		return func(v float64) float64 { return v }
	}
	offsets := []float64{0}
	switch r.Transform {
	case stats.Log:
		offsets = []float64{0, 1}
	case stats.Sqrt:
		offsets = []float64{0, 0.5}
	}
	best, bestErr := 0.0, math.Inf(1)
	for _, off := range offsets {
		e := 0.0
		for _, m := range r.Means {
			if m.N > 0 && !math.IsNaN(m.Mean) && !math.IsNaN(m.BackMean) {
				e += math.Abs(stats.BackTransform(r.Transform, m.Mean, off) - m.BackMean)
			}
		}
		if e < bestErr {
			best, bestErr = off, e
		}
	}
	tr := r.Transform
	return func(v float64) float64 {
		// Keep the interval on the branch where the inverse is monotone.
		switch tr {
		case stats.Sqrt:
			v = math.Max(v, 0)
		case stats.ArcsineSqrt:
			v = math.Max(0, math.Min(90, v))
		}
		return stats.BackTransform(tr, v, best)
	}
}

// errorSet feeds plotter.NewYErrorBars.
type errorSet struct {
	xys  plotter.XYs
	errs plotter.YErrors
}

func (e errorSet) Len() int                        { return len(e.xys) }
func (e errorSet) XY(i int) (float64, float64)     { return e.xys[i].X, e.xys[i].Y }
func (e errorSet) YError(i int) (float64, float64) { return e.errs[i].Low, e.errs[i].High }

// barRect is one bar.
type barRect struct {
	x, y float64
	sw   swatch
}

// barPlotter draws bars from zero, each with its own swatch.
type barPlotter struct {
	bars    []barRect
	width   float64 // in X data units
	spacing vg.Length
}

// Plot draws the bars.
func (b *barPlotter) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	base := math.Max(p.Y.Min, math.Min(0, p.Y.Max))
	for _, bar := range b.bars {
		x0, x1 := trX(bar.x-b.width/2), trX(bar.x+b.width/2)
		y0, y1 := trY(base), trY(bar.y)
		if y1 < y0 {
			y0, y1 = y1, y0
		}
		bar.sw.draw(c, vg.Rectangle{Min: vg.Point{X: x0, Y: y0}, Max: vg.Point{X: x1, Y: y1}}, b.spacing)
	}
}

// DataRange covers the bars and zero.
func (b *barPlotter) DataRange() (xmin, xmax, ymin, ymax float64) {
	xmin, xmax, ymin, ymax = math.Inf(1), math.Inf(-1), 0, 0
	for _, bar := range b.bars {
		xmin, xmax = math.Min(xmin, bar.x-0.5), math.Max(xmax, bar.x+0.5)
		ymin, ymax = math.Min(ymin, bar.y), math.Max(ymax, bar.y)
	}
	return
}
