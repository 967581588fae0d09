package chart

import (
	"image/color"
	"math"
	"math/rand/v2"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial"
)

// SpreadKind is the kind of spread plot.
type SpreadKind int

const (
	// DotPlot draws every plot value as a point, jittered sideways, with a
	// line at the treatment mean.
	DotPlot SpreadKind = iota
	// BoxPlot draws a box plot per treatment (median, quartiles, whiskers
	// to the furthest value within 1.5 interquartile ranges, values beyond
	// as points).
	BoxPlot
)

// SpreadOptions control a spread plot.
type SpreadOptions struct {
	Kind SpreadKind
	// Order of the treatments; ByMean uses the plain means of the values
	// shown.
	Order Order
	// ShowExcluded draws excluded plots as hollow points with their own key
	// entry (dot plots only); otherwise they are left out.
	ShowExcluded bool
	// Seed of the sideways jitter of a dot plot; the same seed gives the
	// same picture.
	Seed uint64
	// Title replaces the trial title on the first line.
	Title string
}

// Spread draws the plot values of a trait per treatment. Missing values are
// left out; so are excluded plots unless opt.ShowExcluded is set.
func Spread(t *trial.Trial, traitKey string, opt SpreadOptions) (*plot.Plot, error) {
	if t == nil {
		panic("chart: Spread of a nil trial")
	}
	tr, err := traitOf(t, traitKey)
	if err != nil {
		return nil, err
	}
	vals, err := t.TraitValues(traitKey)
	if err != nil {
		return nil, err
	}
	n := len(t.Treatments)
	codes := make([]string, n)
	check := make([]bool, n)
	index := make(map[string]int, n)
	for i, trt := range t.Treatments {
		codes[i] = trt.Code
		check[i] = trt.Role == trial.RoleCheck
		index[trt.Code] = i
	}
	kept := make([][]float64, n)
	dropped := make([][]float64, n)
	any := false
	for i, v := range vals {
		if trial.IsMissing(v) || math.IsInf(v, 0) || i >= len(t.Plots) {
			continue
		}
		k, ok := index[t.Plots[i].Treatment]
		if !ok {
			continue
		}
		if excludedFor(t, i, traitKey) {
			dropped[k] = append(dropped[k], v)
			continue
		}
		kept[k] = append(kept[k], v)
		any = true
	}
	if !any {
		return nil, ErrNoData
	}
	means := make([]float64, n)
	for k := range means {
		means[k] = math.NaN()
		if len(kept[k]) > 0 {
			s := 0.0
			for _, v := range kept[k] {
				s += v
			}
			means[k] = s / float64(len(kept[k]))
		}
	}
	order := orderIndices(opt.Order, codes, means, tr.HigherBetter)
	names := make([]string, n)
	for i, k := range order {
		names[i] = codes[k]
	}

	title := opt.Title
	if title == "" {
		title = t.Title
	}
	kind := "plot values"
	if opt.Kind == BoxPlot {
		kind = "box plots of plot values"
	}
	p := newPlot(chartTitle(title, tr.Name+": "+kind))
	p.Y.Label.Text = traitTitle(tr.Name, tr.Unit, tr.Key)
	p.X.Label.Text = "Treatment (" + orderNote(opt.Order, tr.HigherBetter) + ")"
	nominalAxis(p, names)

	panel := &sidePanel{size: keySize}
	radius := vg.Points(2.5)
	if n > 40 {
		radius = vg.Points(1.5)
	}
	entryG := draw.GlyphStyle{Color: entryColor, Radius: radius, Shape: draw.CircleGlyph{}}
	checkG := draw.GlyphStyle{Color: checkColor, Radius: radius * 1.2, Shape: draw.TriangleGlyph{}}
	hollowG := draw.GlyphStyle{Color: markColor, Radius: radius, Shape: draw.RingGlyph{}}
	hasCheck, hasDropped := false, false

	switch opt.Kind {
	case DotPlot:
		rng := rand.New(rand.NewPCG(opt.Seed, 0x5eed))
		var entries, checks, hollow, meanMarks plotter.XYs
		for i, k := range order {
			for _, v := range kept[k] {
				xy := plotter.XY{X: float64(i) + 0.3*(rng.Float64()-0.5), Y: v}
				if check[k] {
					checks = append(checks, xy)
				} else {
					entries = append(entries, xy)
				}
			}
			if opt.ShowExcluded {
				for _, v := range dropped[k] {
					hollow = append(hollow, plotter.XY{X: float64(i) + 0.3*(rng.Float64()-0.5), Y: v})
				}
			}
			if !math.IsNaN(means[k]) {
				meanMarks = append(meanMarks, plotter.XY{X: float64(i), Y: means[k]})
			}
		}
		for _, set := range []struct {
			xys plotter.XYs
			g   draw.GlyphStyle
		}{{entries, entryG}, {checks, checkG}, {hollow, hollowG}} {
			if len(set.xys) == 0 {
				continue
			}
			s, err := plotter.NewScatter(set.xys)
			if err != nil {
				return nil, err
			}
			s.GlyphStyle = set.g
			p.Add(s)
		}
		p.Add(&meanTicks{xys: meanMarks, halfWidth: 0.3})
		hasCheck, hasDropped = len(checks) > 0, len(hollow) > 0
		eg, cg, hg := entryG, checkG, hollowG
		eg.Radius, cg.Radius, hg.Radius = vg.Points(2.5), vg.Points(3), vg.Points(2.5)
		panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Glyph: &eg}, text: "Entry plot"})
		if hasCheck {
			panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Glyph: &cg}, text: "Check plot"})
		}
		if hasDropped {
			panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Glyph: &hg}, text: "Excluded plot\n(not analysed)"})
		}
		ml := draw.LineStyle{Color: color.Black, Width: vg.Points(1.5)}
		panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Line: &ml}, text: "Treatment mean"})
	case BoxPlot:
		w := vg.Points(min(20, 400/float64(n)))
		for i, k := range order {
			if len(kept[k]) == 0 {
				continue
			}
			b, err := plotter.NewBoxPlot(w, float64(i), plotter.Values(kept[k]))
			if err != nil {
				return nil, err
			}
			b.FillColor = entryColor
			if check[k] {
				b.FillColor = checkColor
				hasCheck = true
			}
			b.MedianStyle.Width = vg.Points(1.5)
			b.GlyphStyle.Radius = radius
			p.Add(b)
		}
		panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Fill: entryColor, Outline: draw.LineStyle{Color: color.Black, Width: vg.Points(0.5)}}, text: "Entry"})
		if hasCheck {
			panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Fill: checkColor, Outline: draw.LineStyle{Color: color.Black, Width: vg.Points(0.5)}}, text: "Check"})
		}
		panel.entries = append(panel.entries, panelEntry{text: "Box: quartiles and median.\nWhiskers: values within\n1.5 × IQR; points beyond."})
	default:
		panic("chart: unknown SpreadKind")
	}
	nExcl := 0
	for _, d := range dropped {
		nExcl += len(d)
	}
	if nExcl > 0 && !hasDropped {
		panel.entries = append(panel.entries, panelEntry{text: plural(nExcl, "excluded plot", "excluded plots") + " not shown"})
	}
	p.Add(panel)
	p.X.Min, p.X.Max = -0.6, float64(n)-0.4
	return p, nil
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return itoa(n) + " " + many
}

// meanTicks draws a short horizontal line at each treatment mean.
type meanTicks struct {
	xys       plotter.XYs
	halfWidth float64
}

func (m *meanTicks) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	var segs [][2]vg.Point
	for _, xy := range m.xys {
		y := trY(xy.Y)
		segs = append(segs, [2]vg.Point{{X: trX(xy.X - m.halfWidth), Y: y}, {X: trX(xy.X + m.halfWidth), Y: y}})
	}
	strokeSegments(c, draw.LineStyle{Color: color.Black, Width: vg.Points(1.5)}, segs)
}
