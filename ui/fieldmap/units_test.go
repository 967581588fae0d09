package fieldmap

import (
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/test"
)

// TestMainPlotOutlines: each main plot (and subplot) gets one outline
// covering exactly its plots' cells, as a hand-drawn split-plot map
// outlines them (common practice); plots without a main plot get none.
func TestMainPlotOutlines(t *testing.T) {
	test.NewTempApp(t)
	m := New()
	// One block in one field row: main plots of two subplots of two plots.
	var ps []Plot
	for c := 1; c <= 8; c++ {
		ps = append(ps, Plot{Row: 1, Column: c, Number: 100 + c, Block: 1, Unit: (c-1)/4 + 1, Sub: (c-1)%4/2 + 1})
	}
	m.SetPlots(ps)
	w := test.NewTempWindow(t, m)
	w.Resize(fyne.NewSize(800, 200))
	m.Resize(fyne.NewSize(800, 200))
	r := test.WidgetRenderer(m).(*renderer)
	r.Layout(m.Size())
	if len(r.units) != 2 || len(r.subs) != 4 {
		t.Fatalf("%d main-plot and %d subplot outlines, want 2 and 4", len(r.units), len(r.subs))
	}
	cw, ch, o := m.geometry(m.Size())
	for i, u := range r.units {
		wantX := o.X + float32(i*4)*cw
		if u.Position().X != wantX || u.Size().Width != 4*cw || u.Size().Height != ch {
			t.Errorf("main plot %d outline at %v size %v, want x %v width %v", i+1, u.Position(), u.Size(), wantX, 4*cw)
		}
	}
	for i, u := range r.subs {
		if wantX := o.X + float32(i*2)*cw; u.Position().X != wantX || u.Size().Width != 2*cw {
			t.Errorf("subplot %d outline at %v size %v", i+1, u.Position(), u.Size())
		}
	}
	for i := range ps {
		ps[i].Unit, ps[i].Sub = 0, 0
	}
	m.SetPlots(ps)
	r.Refresh()
	if len(r.units) != 0 || len(r.subs) != 0 {
		t.Errorf("plots without main plots got %d and %d outlines", len(r.units), len(r.subs))
	}
}
