package chart

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/stats"
	"furlong/trial/analysis"
)

// ErrNoInteraction is returned for a result without a two-factor
// interaction to draw.
var ErrNoInteraction = errors.New("the trait has no interaction of two factors to draw")

// InteractionOptions control an interaction chart.
type InteractionOptions struct {
	// Effect is the interaction ("N:V"); "" takes the first two-factor
	// interaction of the result.
	Effect string
	// Swap puts the effect's first factor on the X axis (by default the
	// second factor is on the X axis and the first gives the lines).
	Swap bool
	// Title replaces the trait's name on the first line.
	Title string
}

// Interaction draws the means of a two-factor interaction: one line per
// level of one factor across the levels of the other, and a bar one
// standard error of a difference long (the SED of two means of the
// interaction; the largest when pairs differ) beside them, so the reader
// can judge which gaps are larger than chance.
func Interaction(r *analysis.Result, o InteractionOptions) (*plot.Plot, error) {
	if !r.IsFactorial() {
		return nil, ErrNoInteraction
	}
	fr := r.Factorial
	var e *analysis.Effect
	for i := range fr.Effects {
		ei := &fr.Effects[i]
		if len(ei.Factors) == 2 && (o.Effect == "" || ei.Name == o.Effect) {
			e = ei
			break
		}
	}
	if e == nil {
		return nil, ErrNoInteraction
	}
	lineF, axisF := fr.Factor(e.Factors[0]), fr.Factor(e.Factors[1])
	if lineF == nil || axisF == nil {
		return nil, ErrNoInteraction
	}
	nc := len(axisF.Levels)
	at := func(li, ai int) analysis.EffectMean { return e.Means[li*nc+ai] }
	if o.Swap {
		lineF, axisF = axisF, lineF
		at = func(li, ai int) analysis.EffectMean { return e.Means[ai*nc+li] }
	}
	title := o.Title
	if title == "" {
		title = r.TraitName
		if title == "" {
			title = r.TraitKey
		}
		if r.Unit != "" {
			title += " (" + r.Unit + ")"
		}
	}
	p := newPlot(chartTitle(title, "Means of "+strings.ReplaceAll(e.Name, ":", " × ")))
	p.X.Label.Text = axisF.Label()
	p.Y.Label.Text = "Mean"
	if r.Transform != "" {
		p.Y.Label.Text = "Mean (" + r.Transform.Scale() + " scale)"
	}
	nominalAxis(p, axisF.LevelNames)
	p.Legend.Top = true
	p.Legend.Left = false
	any := false
	for li := range lineF.Levels {
		var pts plotter.XYs
		for ai := range axisF.Levels {
			m := at(li, ai)
			if m.Mean == nil {
				continue
			}
			pts = append(pts, plotter.XY{X: float64(ai), Y: *m.Mean})
		}
		if len(pts) == 0 {
			continue
		}
		any = true
		l, s, err := plotter.NewLinePoints(pts)
		if err != nil {
			return nil, err
		}
		clr := OkabeIto[(li+1)%len(OkabeIto)]
		l.Color = clr
		l.Width = vg.Points(1.5)
		l.Dashes = dashesFor(li)
		s.Color = clr
		s.Shape = shapeFor(li)
		s.Radius = vg.Points(3)
		p.Add(l, s)
		p.Legend.Add(lineF.Label()+" "+lineF.LevelNames[li], l, s)
	}
	if !any {
		return nil, ErrNoData
	}
	// Room above the data for the legend (top right), a row per line, so
	// that it never covers the means (measured on the window's chart: the
	// top-right mean sat under the legend).
	if span := p.Y.Max - p.Y.Min; span > 0 {
		p.Y.Max += span * (0.07*float64(len(lineF.Levels)) + 0.04)
	}
	sed := 0.0
	switch {
	case e.SED != nil:
		sed = *e.SED
	case e.SEDRange != nil:
		sed = e.SEDRange.Max
	}
	if sed > 0 {
		// The SED bar stands right of the last level, centred on the
		// grand mean.
		x := float64(len(axisF.Levels)) - 0.5
		g := r.ANOVA.GrandMean
		bar, err := plotter.NewLine(plotter.XYs{{X: x, Y: g - sed/2}, {X: x, Y: g + sed/2}})
		if err != nil {
			return nil, err
		}
		bar.Width = vg.Points(2)
		bar.Color = OkabeIto[0]
		p.Add(bar)
		lbl, err := plotter.NewLabels(plotter.XYLabels{XYs: []plotter.XY{{X: x, Y: g + sed/2}}, Labels: []string{"SED " + strconv.FormatFloat(sed, 'g', 3, 64)}})
		if err == nil {
			lbl.TextStyle[0].Font = font.From(Face, keySize)
			lbl.TextStyle[0].XAlign = draw.XCenter
			lbl.TextStyle[0].YAlign = draw.YBottom
			p.Add(lbl)
		}
		p.X.Max = float64(len(axisF.Levels)) - 0.1
	}
	if e.P != nil {
		p.X.Label.Text += fmt.Sprintf("   (interaction p %s)", stats.FormatP(*e.P))
	}
	return p, nil
}

// dashesFor gives line i its own dash pattern, so the lines stay apart in
// grey print.
func dashesFor(i int) []vg.Length {
	switch i % 4 {
	case 1:
		return []vg.Length{vg.Points(6), vg.Points(3)}
	case 2:
		return []vg.Length{vg.Points(2), vg.Points(2)}
	case 3:
		return []vg.Length{vg.Points(8), vg.Points(2), vg.Points(2), vg.Points(2)}
	}
	return nil
}

// shapeFor gives line i its own point shape.
func shapeFor(i int) draw.GlyphDrawer {
	switch i % 4 {
	case 1:
		return draw.BoxGlyph{}
	case 2:
		return draw.TriangleGlyph{}
	case 3:
		return draw.RingGlyph{}
	}
	return draw.CircleGlyph{}
}
