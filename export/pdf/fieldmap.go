package pdf

import (
	"bytes"
	"fmt"
	"io"
	"strings"

	"gonum.org/v1/plot/vg"

	"furlong/export/chart"
	"furlong/trial"
)

// MapOptions control WriteMap.
type MapOptions struct {
	Paper Paper
	// ColourBy colours a factorial trial's plots by their level of this
	// factor (chart.FieldMapOptions).
	ColourBy string
}

// WriteMap writes the printable field map of t as a one-page PDF (landscape):
// the map with plot numbers, treatments, blocks and the orientation marker,
// and under it the dimensions on the ground (plot, harvested part, alleys,
// the whole field).
func WriteMap(w io.Writer, t *trial.Trial, opts MapOptions) error {
	d := newDoc(opts.Paper, trialTitle(t)+" · field map · Furlong")
	d.SetTitle(trialTitle(t)+": field map", true)
	if err := writeMapPage(d, t, opts); err != nil {
		return err
	}
	return d.finish(w)
}

// Dimensions are the sizes of a trial on the ground, in metres.
type Dimensions struct {
	PlotLength, PlotWidth       float64
	HarvestLength, HarvestWidth float64
	Alley                       float64
	Rows, Columns               int // field rows (ranges) and plot columns
	// BlockGaps is the number of alleys across the field between blocks
	// that lie side by side.
	BlockGaps int
	// Length and Width are the field's extent: Rows plots of PlotLength
	// with an alley between field rows, and Columns plots of PlotWidth with
	// an alley between blocks side by side.
	Length, Width float64
}

// FieldDimensions works out the trial's dimensions from its layout. Plots
// lie side by side (their widths) along a field row; field rows follow one
// another with an alley between them, and blocks set side by side are
// separated by an alley too.
func FieldDimensions(t *trial.Trial) Dimensions {
	l := t.Layout
	dm := Dimensions{PlotLength: l.PlotLength, PlotWidth: l.PlotWidth,
		HarvestLength: l.HarvestLength, HarvestWidth: l.HarvestWidth, Alley: l.Alley}
	if dm.HarvestLength <= 0 || dm.HarvestWidth <= 0 {
		dm.HarvestLength, dm.HarvestWidth = l.PlotLength, l.PlotWidth
	}
	blockAt := map[[2]int]int{}
	for _, p := range t.Plots {
		dm.Rows = max(dm.Rows, p.Row)
		dm.Columns = max(dm.Columns, p.Column)
		blockAt[[2]int{p.Row, p.Column}] = p.Block
	}
	// Alleys across: where the block changes between neighbouring columns
	// in any field row.
	for c := 1; c < dm.Columns; c++ {
		for r := 1; r <= dm.Rows; r++ {
			a, okA := blockAt[[2]int{r, c}]
			b, okB := blockAt[[2]int{r, c + 1}]
			if okA && okB && a != b {
				dm.BlockGaps++
				break
			}
		}
	}
	if dm.Rows > 0 {
		dm.Length = float64(dm.Rows)*dm.PlotLength + float64(dm.Rows-1)*dm.Alley
		dm.Width = float64(dm.Columns)*dm.PlotWidth + float64(dm.BlockGaps)*dm.Alley
	}
	return dm
}

func writeMapPage(d *doc, t *trial.Trial, opts MapOptions) error {
	pw, ph := d.paper.size()
	d.AddPageFormat("L", fpdfSize(pw, ph))
	p, err := chart.FieldMap(t, chart.FieldMapOptions{ColourBy: opts.ColourBy})
	if err != nil {
		d.heading("Field map", 15)
		d.para("No field map: "+err.Error(), true, 10)
		return nil
	}
	cw := d.contentWidth()
	diagramH := 40.0
	h := d.bottom() - margin - diagramH - 4
	var buf bytes.Buffer
	if err := chart.SavePNG(p, &buf, vg.Length(cw)*vg.Millimeter, vg.Length(h)*vg.Millimeter, chartDPI); err != nil {
		return err
	}
	if err := d.png(buf.Bytes(), margin, margin, cw, h); err != nil {
		return err
	}
	y := margin + h + 3
	dm := FieldDimensions(t)
	// Left: the dimensions in words; right: one plot with its alley, drawn.
	d.SetXY(margin, y)
	d.font(true, 10)
	d.CellFormat(0, 5, "Dimensions on the ground", "", 1, "L", false, 0, "")
	lines := [][2]string{}
	if dm.PlotLength > 0 && dm.PlotWidth > 0 {
		lines = append(lines,
			[2]string{"Plot", fmt.Sprintf("%s long × %s wide (%s m²)", metres(dm.PlotLength), metres(dm.PlotWidth), num(dm.PlotLength*dm.PlotWidth, 2))},
			[2]string{"Harvested part", fmt.Sprintf("%s × %s (%s m²)", metres(dm.HarvestLength), metres(dm.HarvestWidth), num(dm.HarvestLength*dm.HarvestWidth, 2))})
	} else {
		lines = append(lines, [2]string{"Plot", "size not set in the trial's layout"})
	}
	lines = append(lines, [2]string{"Alleys", metres(dm.Alley) + " between field rows" + map[bool]string{true: " and between blocks side by side", false: ""}[dm.BlockGaps > 0]})
	if dm.Rows > 0 && dm.PlotLength > 0 && dm.PlotWidth > 0 {
		lines = append(lines, [2]string{"Whole trial", fmt.Sprintf("%d field rows × %d plots: %s along the plots × %s across (%s m²)",
			dm.Rows, dm.Columns, metres(round2(dm.Length)), metres(round2(dm.Width)), num(dm.Length*dm.Width, 1))})
	}
	lines = append(lines, [2]string{"Guard plots", "none in this layout; border rows, if sown, lie outside these dimensions"})
	o := t.Layout.Orientation
	north := "not recorded"
	if o.North.Valid() {
		north = "towards the " + string(o.North) + " edge of the map"
	}
	if lm := strings.TrimSpace(o.Landmark); lm != "" {
		north += "; along row 1 (bottom edge): " + lm
	}
	lines = append(lines, [2]string{"North", north})
	textW := cw - 95
	d.font(false, 8.5)
	for _, l := range lines {
		d.SetX(margin)
		d.font(true, 8.5)
		d.CellFormat(28, 4.2, l[0], "", 0, "L", false, 0, "")
		d.font(false, 8.5)
		d.MultiCell(textW-28, 4.2, l[1], "", "L", false)
	}
	if dm.PlotLength > 0 && dm.PlotWidth > 0 {
		drawPlotDiagram(d, margin+cw-90, y+2, 90, diagramH-2, dm)
	}
	return nil
}

func round2(v float64) float64 {
	return float64(int64(v*100+0.5)) / 100
}

// drawPlotDiagram draws, not to scale, two neighbouring plots of one field
// row, the alley and the start of the next field row, with the plot length,
// width, harvested part and alley marked.
func drawPlotDiagram(d *doc, x, y, w, h float64, dm Dimensions) {
	pw := 14.0
	pl := h - 14
	al := 0.0
	if dm.Alley > 0 {
		al = 5
	}
	x0, y0 := x+24, y+1
	d.SetLineWidth(0.3)
	d.SetFillColor(230, 240, 220)
	for c := 0; c < 2; c++ {
		d.Rect(x0+float64(c)*pw, y0, pw, pl, "FD")
		// The next field row, cut off.
		d.Rect(x0+float64(c)*pw, y0+pl+al, pw, 4, "F")
		d.Line(x0+float64(c)*pw, y0+pl+al, x0+float64(c)*pw, y0+pl+al+4)
		d.Line(x0+float64(c)*pw, y0+pl+al, x0+float64(c+1)*pw, y0+pl+al)
	}
	d.Line(x0+2*pw, y0+pl+al, x0+2*pw, y0+pl+al+4)
	d.font(false, 7)
	if dm.HarvestLength < dm.PlotLength || dm.HarvestWidth < dm.PlotWidth {
		hw := pw * dm.HarvestWidth / dm.PlotWidth
		hl := pl * dm.HarvestLength / dm.PlotLength
		d.SetDashPattern([]float64{1, 0.8}, 0)
		d.Rect(x0+(pw-hw)/2+0.4, y0+(pl-hl)/2, hw-0.8, hl, "D")
		d.SetDashPattern(nil, 0)
		lab := "harvested"
		d.Text(x0+2*pw+2, y0+pl/2, lab+" (dashed)")
		d.Text(x0+2*pw+2, y0+pl/2+3, metres(dm.HarvestLength)+" × "+metres(dm.HarvestWidth))
	}
	d.SetLineWidth(0.2)
	// Plot length and alley at the left, plot width under the row.
	d.Line(x0-2, y0, x0-2, y0+pl)
	lab := metres(dm.PlotLength)
	d.Text(x0-3-d.GetStringWidth(lab), y0+pl/2+1, lab)
	if al > 0 {
		d.Line(x0-2, y0+pl+0.5, x0-2, y0+pl+al-0.5)
		lab = "alley " + metres(dm.Alley)
		d.Text(x0-3-d.GetStringWidth(lab), y0+pl+al/2+1, lab)
	}
	lab = metres(dm.PlotWidth)
	d.Line(x0, y0+pl+al+6, x0+pw, y0+pl+al+6)
	d.Text(x0+pw/2-d.GetStringWidth(lab)/2, y0+pl+al+9, lab)
	d.Text(x0+2*pw+2, y0+3, "field row")
	d.Text(x0+2*pw+2, y0+pl+al+3, "next field row")
	d.SetTextColor(90, 90, 90)
	d.Text(x0+2*pw+2, y0+pl+al+9, "(not to scale)")
	d.SetTextColor(0, 0, 0)
}
