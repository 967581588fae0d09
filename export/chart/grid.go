package chart

import (
	"image/color"
	"math"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial"
)

// gridCell is one plot of a field chart.
type gridCell struct {
	row, col int
	block    int
	unit     int // main plot within the block (split plots), 0 for none
	sub      int // subplot within the main plot (split-split plots), 0 for none
	sw       swatch
	lines    []string // text written in the cell when it fits
}

// fieldGrid draws the field: a cell per plot at (column, row), row 1 and
// column 1 at the lower left, with block outlines.
type fieldGrid struct {
	cells      []gridCell
	rows, cols int
	maxFont    vg.Length
	// textAlways draws the text at any size down to minFont (field maps);
	// otherwise text is dropped when it does not fit (heat maps).
	minFont vg.Length
}

// newFieldGrid sizes a grid for the plots; ErrNoLayout when a plot has no
// field position.
func newFieldGrid(plots []trial.Plot) (*fieldGrid, error) {
	g := &fieldGrid{maxFont: vg.Points(9), minFont: vg.Points(4)}
	if len(plots) == 0 {
		return nil, ErrNoLayout
	}
	for _, pl := range plots {
		if pl.Row < 1 || pl.Column < 1 {
			return nil, ErrNoLayout
		}
		g.rows, g.cols = max(g.rows, pl.Row), max(g.cols, pl.Column)
	}
	return g, nil
}

// setAxes sets the plot's axes to the field grid.
func (g *fieldGrid) setAxes(p *plot.Plot) {
	p.X.Min, p.X.Max = 0.5, float64(g.cols)+0.5
	p.Y.Min, p.Y.Max = 0.5, float64(g.rows)+0.5
	p.X.Tick.Marker = integerTicks(g.cols)
	p.Y.Tick.Marker = integerTicks(g.rows)
	p.X.Label.Text = "Field column"
	p.Y.Label.Text = "Field row"
	p.X.Padding, p.Y.Padding = 0, 0
}

// cellRect is the canvas rectangle of the cell at (col, row).
func cellRect(trX, trY func(float64) vg.Length, col, row int) vg.Rectangle {
	return vg.Rectangle{
		Min: vg.Point{X: trX(float64(col) - 0.5), Y: trY(float64(row) - 0.5)},
		Max: vg.Point{X: trX(float64(col) + 0.5), Y: trY(float64(row) + 0.5)},
	}
}

// Plot draws the cells, their text, and the block outlines.
func (g *fieldGrid) Plot(c draw.Canvas, p *plot.Plot) {
	trX, trY := p.Transforms(&c)
	cw := trX(1.5) - trX(0.5)
	ch := trY(1.5) - trY(0.5)
	spacing := max(vg.Points(2), min(cw, ch)/5)
	thin := draw.LineStyle{Color: gridGrey, Width: vg.Points(0.3)}
	for _, cell := range g.cells {
		r := cellRect(trX, trY, cell.col, cell.row)
		cell.sw.draw(c, r, spacing)
		strokeRect(c, r, thin)
	}

	// Text: one font size for the whole grid, the largest that fits every
	// cell's lines (text width grows in proportion to the font size).
	const ref = 10
	refSty := textStyle(vg.Points(ref), color.Black)
	size := g.maxFont
	for _, cell := range g.cells {
		if len(cell.lines) == 0 {
			continue
		}
		size = min(size, ch*0.9/(vg.Length(len(cell.lines))*1.15))
		for _, l := range cell.lines {
			if w := refSty.Width(l); w > 0 {
				size = min(size, cw*0.9*ref/w)
			}
		}
	}
	var sty text.Style
	if size >= g.minFont {
		sty = textStyle(size, color.Black)
		sty.XAlign, sty.YAlign = draw.XCenter, draw.YCenter
		for _, cell := range g.cells {
			if len(cell.lines) == 0 {
				continue
			}
			s := sty
			s.Color = color.Black
			if cell.sw.Fill != nil {
				s.Color = inkOn(cell.sw.Fill)
			}
			mid := vg.Point{X: trX(float64(cell.col)), Y: trY(float64(cell.row))}
			txt := strings.Join(cell.lines, "\n")
			if cell.sw.Pattern != patternNone && cell.sw.Fill != nil {
				// A plate of the plain fill keeps the text clear of the
				// pattern lines.
				w := s.Width(txt)/2 + size/3
				h := s.Height(txt)/2 + size/6
				fillRect(c, vg.Rectangle{
					Min: vg.Point{X: mid.X - w, Y: mid.Y - h},
					Max: vg.Point{X: mid.X + w, Y: mid.Y + h},
				}, cell.sw.Fill)
			}
			c.FillText(s, mid, txt)
		}
	}

	// Block outlines: every cell side whose neighbour is in another block
	// or outside the field.
	type pos struct{ r, c int }
	block := make(map[pos]int, len(g.cells))
	for _, cell := range g.cells {
		block[pos{cell.row, cell.col}] = cell.block
	}
	var segs [][2]vg.Point
	for _, cell := range g.cells {
		r := cellRect(trX, trY, cell.col, cell.row)
		side := func(dr, dc int, a, b vg.Point) {
			nb, ok := block[pos{cell.row + dr, cell.col + dc}]
			if !ok || nb != cell.block {
				segs = append(segs, [2]vg.Point{a, b})
			}
		}
		side(-1, 0, r.Min, vg.Point{X: r.Max.X, Y: r.Min.Y})
		side(1, 0, vg.Point{X: r.Min.X, Y: r.Max.Y}, r.Max)
		side(0, -1, r.Min, vg.Point{X: r.Min.X, Y: r.Max.Y})
		side(0, 1, vg.Point{X: r.Max.X, Y: r.Min.Y}, r.Max)
	}
	strokeSegments(c, draw.LineStyle{Color: color.Black, Width: vg.Points(2)}, segs)
	g.plotUnits(c, trX, trY)
}

// DataRange is the whole grid.
func (g *fieldGrid) DataRange() (xmin, xmax, ymin, ymax float64) {
	return 0.5, float64(g.cols) + 0.5, 0.5, float64(g.rows) + 0.5
}

// blockCount is the number of distinct blocks among the cells.
func (g *fieldGrid) blockCount() int {
	seen := map[int]bool{}
	for _, c := range g.cells {
		seen[c.block] = true
	}
	return len(seen)
}

// finiteRange returns the smallest and largest finite values, ok false when
// there are none.
func finiteRange(vs []float64) (lo, hi float64, ok bool) {
	lo, hi = math.Inf(1), math.Inf(-1)
	for _, v := range vs {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			lo, hi, ok = math.Min(lo, v), math.Max(hi, v), true
		}
	}
	return lo, hi, ok
}
