package fieldmap

import (
	"image/color"
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/driver/desktop"
	"fyne.io/fyne/v2/test"

	"furlong/export/chart"
)

// The palette is Okabe & Ito (2008), "Color Universal Design", whose hex
// codes are E69F00, 56B4E9, 009E73, F0E442, 0072B2, D55E00, CC79A7 (and
// black, left out here); it must also agree with the chart package's copy.
func TestOkabeIto(t *testing.T) {
	t.Parallel()
	want := []uint32{0xE69F00, 0x56B4E9, 0x009E73, 0xF0E442, 0x0072B2, 0xD55E00, 0xCC79A7}
	for i, w := range want {
		c := OkabeIto[i]
		if uint32(c.R)<<16|uint32(c.G)<<8|uint32(c.B) != w {
			t.Errorf("colour %d = %v, want %06X", i, c, w)
		}
		if chart.OkabeIto[i] != c {
			t.Errorf("colour %d differs from export/chart: %v %v", i, c, chart.OkabeIto[i])
		}
	}
	// WCAG 2.1 relative luminance: yellow carries black text, blue white.
	if textOn(OkabeIto[3], color.White) != color.Black || textOn(OkabeIto[4], color.Black) != color.White {
		t.Error("text colour on fills")
	}
}

func TestHoverAndTap(t *testing.T) {
	test.NewTempApp(t)
	m := New()
	// Two blocks side by side, two plots each, in one field row.
	m.SetPlots([]Plot{
		{Row: 1, Column: 1, Number: 101, Code: "A", Block: 1},
		{Row: 1, Column: 2, Number: 102, Code: "B", Block: 1, Group: 1},
		{Row: 1, Column: 3, Number: 201, Code: "B", Block: 2, Group: 1},
		{Row: 1, Column: 4, Number: 202, Code: "A", Block: 2, Excluded: true},
	})
	w := test.NewTempWindow(t, m)
	w.Resize(fyne.NewSize(400, 200))
	m.Resize(fyne.NewSize(400, 200))
	var hovered, tapped []int
	m.OnHover = func(i int) { hovered = append(hovered, i) }
	m.OnTapped = func(i int) { tapped = append(tapped, i) }
	cw, ch, o := m.geometry(m.Size())
	centre := func(col int) fyne.Position {
		return fyne.NewPos(o.X+cw*(float32(col)-0.5), o.Y+ch/2)
	}
	m.MouseMoved(&desktop.MouseEvent{PointEvent: fyne.PointEvent{Position: centre(3)}})
	m.MouseMoved(&desktop.MouseEvent{PointEvent: fyne.PointEvent{Position: centre(3)}}) // no repeat
	m.MouseOut()
	m.Tapped(&fyne.PointEvent{Position: centre(4)})
	if len(hovered) != 2 || hovered[0] != 2 || hovered[1] != -1 {
		t.Errorf("hover reports %v, want [2 -1]", hovered)
	}
	if len(tapped) != 1 || tapped[0] != 3 || m.Selected() != 3 {
		t.Errorf("tap reports %v, selected %d", tapped, m.Selected())
	}
	if m.PlotAt(fyne.NewPos(-5, -5)) != -1 {
		t.Error("a point outside the plots hit a plot")
	}
	r := test.WidgetRenderer(m).(*renderer)
	if len(r.blocks) != 2 || r.blocks[0].Size().Width != 2*cw {
		t.Errorf("block outlines: %d, first %v wide (cell %v)", len(r.blocks), r.blocks[0].Size().Width, cw)
	}
	if r.cells[3].FillColor == fillColor(Plot{Group: 0}) {
		t.Error("the excluded plot is not drawn grey")
	}
}

// Row 1 is drawn at the bottom, as on paper (the printed map, the heat
// maps, the workbook and `furlong show`): the plot in row 1 sits below the
// plot in row 2, and a tap on the lower cell finds it.
func TestRowOneAtBottom(t *testing.T) {
	test.NewTempApp(t)
	m := New()
	m.SetPlots([]Plot{
		{Row: 1, Column: 1, Number: 101, Code: "A", Block: 1},
		{Row: 2, Column: 1, Number: 201, Code: "B", Block: 2, Group: 1},
		{Row: 3, Column: 1, Number: 301, Code: "A", Block: 3},
	})
	w := test.NewTempWindow(t, m)
	w.Resize(fyne.NewSize(300, 300))
	m.Resize(fyne.NewSize(300, 300))
	r := test.WidgetRenderer(m).(*renderer)
	if y1, y2, y3 := r.cells[0].Position().Y, r.cells[1].Position().Y, r.cells[2].Position().Y; !(y1 > y2 && y2 > y3) {
		t.Errorf("rows 1, 2, 3 at y = %v, %v, %v: row 1 is not at the bottom", y1, y2, y3)
	}
	_, ch, o := m.geometry(m.Size())
	lowest := fyne.NewPos(m.Size().Width/2, o.Y+2.5*ch)
	if got := m.PlotAt(lowest); got != 0 {
		t.Errorf("the lowest cell holds plot index %d, want 0 (row 1)", got)
	}
	if got := m.PlotAt(fyne.NewPos(m.Size().Width/2, o.Y+0.5*ch)); got != 2 {
		t.Errorf("the top cell holds plot index %d, want 2 (row 3)", got)
	}
	// Block outlines follow their plots.
	if r.blocks[0].Position().Y != r.cells[0].Position().Y {
		t.Errorf("block 1 outline at y=%v, its plot at %v", r.blocks[0].Position().Y, r.cells[0].Position().Y)
	}
}

// The north arrow points to the edge that faces north and the landmark is
// written under the grid; without them neither is drawn, and the grid
// makes room for them when they are.
func TestOrientationMarker(t *testing.T) {
	test.NewTempApp(t)
	m := New()
	m.SetPlots([]Plot{{Row: 1, Column: 1, Number: 101}, {Row: 1, Column: 2, Number: 102}})
	w := test.NewTempWindow(t, m)
	w.Resize(fyne.NewSize(400, 200))
	m.Resize(fyne.NewSize(400, 200))
	r := test.WidgetRenderer(m).(*renderer)
	if !r.arrow[0].Hidden || !r.lm.Hidden {
		t.Error("an orientation marker is drawn although none was given")
	}
	wide, _, _ := m.geometry(m.Size())
	for _, c := range []struct {
		north  string
		dx, dy float32 // the sign of the arrow's direction on screen
	}{{"top", 0, -1}, {"bottom", 0, 1}, {"right", 1, 0}, {"left", -1, 0}} {
		m.SetOrientation(c.north, "farm track")
		shaft := r.arrow[0]
		if shaft.Hidden || r.arrowN.Hidden {
			t.Fatalf("%s: no arrow", c.north)
		}
		d := shaft.Position2.Subtract(shaft.Position1)
		sign := func(v float32) float32 {
			switch {
			case v > 0.5:
				return 1
			case v < -0.5:
				return -1
			}
			return 0
		}
		if sign(d.X) != c.dx || sign(d.Y) != c.dy {
			t.Errorf("north %s: arrow runs %v", c.north, d)
		}
	}
	if r.lm.Hidden || r.lm.Text != "Row 1 edge: farm track" {
		t.Errorf("landmark %q hidden %v", r.lm.Text, r.lm.Hidden)
	}
	cw, _, o := m.geometry(m.Size())
	if cw >= wide || o.X+2*cw > m.Size().Width-arrowRoom+0.5 {
		t.Errorf("the grid (cells %v wide, from %v) does not leave room for the arrow", cw, o.X)
	}
	m.SetOrientation("up", "")
	if !r.arrow[0].Hidden || !r.lm.Hidden {
		t.Error("an unknown edge or empty landmark still draws a marker")
	}
}
