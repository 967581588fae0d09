package chart

import (
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial"
)

// pattern is a line pattern drawn over a fill, so that fills stay apart
// without colour (grey-scale prints, colour-blind readers).
type pattern int

const (
	patternNone         pattern = iota
	patternDiagonal             // "/"
	patternBackDiagonal         // "\"
	patternCross                // "x"
	patternHorizontal           // "-"
	patternVertical             // "|"
	nPatterns
)

// Face is the font of every chart: Liberation Sans, the sans-serif face of
// the Liberation family that gonum/plot ships in its font cache. The window
// (ui) embeds the same TrueType files, so screen, charts and exports share
// one family; FontFamily is its name for documents that refer to fonts by
// name (SVG, the workbook).
var Face = font.Font{Typeface: "Liberation", Variant: "Sans"}

// FontFamily is the name of Face as documents and office programs know it.
// Liberation Sans has the metrics of Arial, so a machine without it lays
// text out the same.
const FontFamily = "Liberation Sans"

// textStyle returns a plain text style of Face at size points.
func textStyle(size vg.Length, clr color.Color) text.Style {
	return text.Style{
		Color:   clr,
		Font:    font.From(Face, size),
		Handler: plot.DefaultTextHandler,
	}
}

// rectPath is the closed outline of r.
func rectPath(r vg.Rectangle) vg.Path {
	var p vg.Path
	p.Move(r.Min)
	p.Line(vg.Point{X: r.Max.X, Y: r.Min.Y})
	p.Line(r.Max)
	p.Line(vg.Point{X: r.Min.X, Y: r.Max.Y})
	p.Close()
	return p
}

// fillRect fills r with clr.
func fillRect(c vg.Canvas, r vg.Rectangle, clr color.Color) {
	c.SetColor(clr)
	c.Fill(rectPath(r))
}

// strokeRect outlines r.
func strokeRect(c vg.Canvas, r vg.Rectangle, ls draw.LineStyle) {
	if ls.Width <= 0 {
		return
	}
	c.SetColor(ls.Color)
	c.SetLineWidth(ls.Width)
	c.SetLineDash(ls.Dashes, ls.DashOffs)
	c.Stroke(rectPath(r))
}

// strokeSegments strokes each pair of points as one line segment, in one
// path.
func strokeSegments(c vg.Canvas, ls draw.LineStyle, segs [][2]vg.Point) {
	if len(segs) == 0 || ls.Width <= 0 {
		return
	}
	var p vg.Path
	for _, s := range segs {
		p.Move(s[0])
		p.Line(s[1])
	}
	c.SetColor(ls.Color)
	c.SetLineWidth(ls.Width)
	c.SetLineDash(ls.Dashes, ls.DashOffs)
	c.Stroke(p)
}

// clipSegment clips the segment a–b to r (Liang–Barsky); ok is false when
// nothing is left.
func clipSegment(a, b vg.Point, r vg.Rectangle) (vg.Point, vg.Point, bool) {
	x0, y0 := float64(a.X), float64(a.Y)
	dx, dy := float64(b.X-a.X), float64(b.Y-a.Y)
	t0, t1 := 0.0, 1.0
	edges := [4][2]float64{
		{-dx, x0 - float64(r.Min.X)},
		{dx, float64(r.Max.X) - x0},
		{-dy, y0 - float64(r.Min.Y)},
		{dy, float64(r.Max.Y) - y0},
	}
	for _, e := range edges {
		p, q := e[0], e[1]
		if p == 0 {
			if q < 0 {
				return a, b, false
			}
			continue
		}
		t := q / p
		if p < 0 {
			t0 = math.Max(t0, t)
		} else {
			t1 = math.Min(t1, t)
		}
		if t0 > t1 {
			return a, b, false
		}
	}
	at := func(t float64) vg.Point {
		return vg.Point{X: vg.Length(x0 + t*dx), Y: vg.Length(y0 + t*dy)}
	}
	return at(t0), at(t1), true
}

// patternSegments returns the lines of pat inside r, spacing apart.
func patternSegments(pat pattern, r vg.Rectangle, spacing vg.Length) [][2]vg.Point {
	if pat == patternNone || spacing <= 0 {
		return nil
	}
	w, h := r.Max.X-r.Min.X, r.Max.Y-r.Min.Y
	var segs [][2]vg.Point
	add := func(a, b vg.Point) {
		if a, b, ok := clipSegment(a, b, r); ok {
			segs = append(segs, [2]vg.Point{a, b})
		}
	}
	diag := func(sign vg.Length) {
		// Lines y − y0 = sign·(x − k) for k spaced along an extended base.
		for k := r.Min.X - h; k <= r.Max.X+h; k += spacing {
			a := vg.Point{X: k, Y: r.Min.Y}
			b := vg.Point{X: k + sign*(h+w), Y: r.Min.Y + h + w}
			add(a, b)
		}
	}
	switch pat {
	case patternDiagonal:
		diag(1)
	case patternBackDiagonal:
		diag(-1)
	case patternCross:
		diag(1)
		diag(-1)
	case patternHorizontal:
		for y := r.Min.Y + spacing/2; y < r.Max.Y; y += spacing {
			add(vg.Point{X: r.Min.X, Y: y}, vg.Point{X: r.Max.X, Y: y})
		}
	case patternVertical:
		for x := r.Min.X + spacing/2; x < r.Max.X; x += spacing {
			add(vg.Point{X: x, Y: r.Min.Y}, vg.Point{X: x, Y: r.Max.Y})
		}
	}
	return segs
}

// swatch is how one kind of mark looks, drawn in cells, bars and legends.
type swatch struct {
	Fill    color.Color // nil: no fill
	Pattern pattern
	Ink     color.Color // pattern colour; nil: black
	Outline draw.LineStyle
	Cross   bool // a diagonal cross over the area (excluded plot)
	Glyph   *draw.GlyphStyle
	Line    *draw.LineStyle // a horizontal line (reference lines)
	ErrBar  bool            // an error bar with caps
	North   trial.Edge      // an arrow pointing to this edge of the map (north arrow)
}

// draw draws the swatch filling r.
func (s swatch) draw(c vg.Canvas, r vg.Rectangle, spacing vg.Length) {
	if s.Fill != nil {
		fillRect(c, r, s.Fill)
	}
	ink := s.Ink
	if ink == nil {
		ink = color.Black
	}
	if s.Pattern != patternNone {
		strokeSegments(c, draw.LineStyle{Color: ink, Width: vg.Points(0.5)}, patternSegments(s.Pattern, r, spacing))
	}
	if s.Cross {
		ls := draw.LineStyle{Color: ink, Width: vg.Points(1)}
		strokeSegments(c, ls, [][2]vg.Point{
			{r.Min, r.Max},
			{{X: r.Min.X, Y: r.Max.Y}, {X: r.Max.X, Y: r.Min.Y}},
		})
	}
	strokeRect(c, r, s.Outline)
	mid := vg.Point{X: (r.Min.X + r.Max.X) / 2, Y: (r.Min.Y + r.Max.Y) / 2}
	if s.Line != nil {
		strokeSegments(c, *s.Line, [][2]vg.Point{{{X: r.Min.X, Y: mid.Y}, {X: r.Max.X, Y: mid.Y}}})
	}
	if s.ErrBar {
		ls := draw.LineStyle{Color: color.Black, Width: vg.Points(1)}
		cw := (r.Max.X - r.Min.X) / 4
		strokeSegments(c, ls, [][2]vg.Point{
			{{X: mid.X, Y: r.Min.Y}, {X: mid.X, Y: r.Max.Y}},
			{{X: mid.X - cw, Y: r.Min.Y}, {X: mid.X + cw, Y: r.Min.Y}},
			{{X: mid.X - cw, Y: r.Max.Y}, {X: mid.X + cw, Y: r.Max.Y}},
		})
	}
	if s.North.Valid() {
		drawArrow(c, r, s.North)
	}
	if s.Glyph != nil {
		dc := draw.NewCanvas(c, 0, 0)
		dc.Rectangle = r
		dc.DrawGlyphNoClip(*s.Glyph, mid)
	}
}

// drawArrow draws a filled arrow inside r pointing to the given edge.
func drawArrow(c vg.Canvas, r vg.Rectangle, to trial.Edge) {
	mid := vg.Point{X: (r.Min.X + r.Max.X) / 2, Y: (r.Min.Y + r.Max.Y) / 2}
	half := min(r.Max.X-r.Min.X, r.Max.Y-r.Min.Y) / 2
	// Unit vector along the arrow and across it.
	var ux, uy float64
	switch to {
	case trial.EdgeTop:
		uy = 1
	case trial.EdgeBottom:
		uy = -1
	case trial.EdgeRight:
		ux = 1
	case trial.EdgeLeft:
		ux = -1
	}
	at := func(along, across vg.Length) vg.Point {
		return vg.Point{
			X: mid.X + along*vg.Length(ux) - across*vg.Length(uy),
			Y: mid.Y + along*vg.Length(uy) + across*vg.Length(ux),
		}
	}
	tip, head := at(half, 0), at(half*0.1, 0)
	strokeSegments(c, draw.LineStyle{Color: color.Black, Width: max(vg.Points(1.2), half/5)}, [][2]vg.Point{{at(-half, 0), head}})
	var p vg.Path
	p.Move(tip)
	p.Line(at(0, half*0.55))
	p.Line(at(0, -half*0.55))
	p.Close()
	c.SetColor(color.Black)
	c.Fill(p)
}

// orientationEntries are the key lines that tie the map to the ground:
// the north arrow and the landmark along row 1, or a note that neither
// was recorded.
func orientationEntries(t *trial.Trial) []panelEntry {
	o := t.Layout.Orientation
	var out []panelEntry
	if o.North.Valid() {
		out = append(out, panelEntry{swatch: &swatch{North: o.North}, text: "North"})
	}
	if lm := strings.TrimSpace(o.Landmark); lm != "" {
		out = append(out, panelEntry{text: "Along row 1 (bottom edge):\n" + lm})
	}
	if len(out) == 0 {
		out = append(out, panelEntry{text: "North not recorded"})
	}
	return out
}

// panelEntry is one line of a side panel: an optional swatch and its text
// (which may hold several lines).
type panelEntry struct {
	swatch *swatch
	text   string
}

// colourScale is the colour bar of a heat map.
type colourScale struct {
	min, max float64
	title    string // for example "Yield (t/ha)"
	format   func(float64) string
	ramp     func(float64) color.NRGBA // nil: Viridis
}

// sidePanel is a plotter that draws a key to the right of the data area. It
// reserves its width through a glyph box, so the data area shrinks to make
// room and nothing overlaps the data.
type sidePanel struct {
	entries []panelEntry
	scale   *colourScale
	size    vg.Length // font size
	columns int       // entries are laid out in this many columns (≥ 1)
}

const (
	panelGap    = 10 // points between the data area and the panel
	panelMargin = 4  // points between the panel and the right edge
)

func (sp *sidePanel) style() text.Style { return textStyle(sp.size, color.Black) }

func (sp *sidePanel) thumb() vg.Length { return 1.6 * sp.size }

func (sp *sidePanel) cols() int { return max(1, sp.columns) }

// columnWidth is the width of one column of entries.
func (sp *sidePanel) columnWidth() vg.Length {
	var w vg.Length
	for _, e := range sp.entries {
		tw := sp.style().Width(e.text)
		if e.swatch != nil {
			tw += sp.thumb() + sp.size/2
		}
		w = max(w, tw)
	}
	return w
}

func (sp *sidePanel) scaleWidth() vg.Length {
	if sp.scale == nil {
		return 0
	}
	st := sp.style()
	w := sp.size*1.5 + sp.size/2 + max(st.Width(sp.scale.format(sp.scale.max)), st.Width(sp.scale.format(sp.scale.min)))
	return max(w, st.Width(sp.scale.title))
}

func (sp *sidePanel) width() vg.Length {
	cw := sp.columnWidth()
	n := vg.Length(sp.cols())
	return max(sp.scaleWidth(), n*cw+(n-1)*sp.size)
}

// GlyphBoxes reserves the panel's width at the right edge of the data area.
func (sp *sidePanel) GlyphBoxes(*plot.Plot) []plot.GlyphBox {
	return []plot.GlyphBox{{
		X: 1, Y: 1,
		Rectangle: vg.Rectangle{Min: vg.Point{X: 0}, Max: vg.Point{X: panelGap + sp.width() + panelMargin}},
	}}
}

// Plot draws the panel beside the data canvas c.
func (sp *sidePanel) Plot(c draw.Canvas, _ *plot.Plot) {
	x0 := c.Max.X + panelGap
	y := c.Max.Y
	if sp.scale != nil {
		y = sp.drawScale(c, x0, y)
		y -= sp.size
	}
	perCol := (len(sp.entries) + sp.cols() - 1) / sp.cols()
	cw := sp.columnWidth()
	top := y
	for i, e := range sp.entries {
		col := 0
		if perCol > 0 {
			col = i / perCol
		}
		if perCol > 0 && i%perCol == 0 {
			y = top
		}
		x := x0 + vg.Length(col)*(cw+sp.size)
		st := sp.style()
		h := st.Height(e.text)
		lineH := sp.size * 1.25
		h = max(h, lineH)
		tx := x
		if e.swatch != nil {
			r := vg.Rectangle{
				Min: vg.Point{X: x, Y: y - lineH + sp.size*0.1},
				Max: vg.Point{X: x + sp.thumb(), Y: y - sp.size*0.1},
			}
			e.swatch.draw(c, r, sp.size/2.5)
			tx += sp.thumb() + sp.size/2
		}
		st.YAlign = draw.YTop
		c.FillText(st, vg.Point{X: tx, Y: y}, e.text)
		y -= h + sp.size*0.3
	}
}

// drawScale draws the colour bar with its title and min/max labels, from
// the top at y; it returns the y below it.
func (sp *sidePanel) drawScale(c draw.Canvas, x0, y vg.Length) vg.Length {
	s := sp.scale
	st := sp.style()
	st.YAlign = draw.YTop
	c.FillText(st, vg.Point{X: x0, Y: y}, s.title)
	y -= st.Height(s.title) + sp.size/2
	barH := min(vg.Points(160), (c.Max.Y-c.Min.Y)*0.45)
	barW := sp.size * 1.5
	const steps = 64
	for i := 0; i < steps; i++ {
		r := vg.Rectangle{
			Min: vg.Point{X: x0, Y: y - barH + barH*vg.Length(i)/steps},
			Max: vg.Point{X: x0 + barW, Y: min(y, y-barH+barH*vg.Length(i+1)/steps+vg.Points(0.6))},
		}
		ramp := s.ramp
		if ramp == nil {
			ramp = Viridis
		}
		fillRect(c, r, ramp((float64(i)+0.5)/steps))
	}
	strokeRect(c, vg.Rectangle{Min: vg.Point{X: x0, Y: y - barH}, Max: vg.Point{X: x0 + barW, Y: y}},
		draw.LineStyle{Color: color.Black, Width: vg.Points(0.5)})
	lx := x0 + barW + sp.size/2
	st.YAlign = draw.YCenter
	c.FillText(st, vg.Point{X: lx, Y: y}, s.format(s.max))
	if s.max != s.min {
		c.FillText(st, vg.Point{X: lx, Y: y - barH}, s.format(s.min))
		mid := (s.min + s.max) / 2
		c.FillText(st, vg.Point{X: lx, Y: y - barH/2}, s.format(mid))
	}
	return y - barH - sp.size/2
}
