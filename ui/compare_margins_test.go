package ui

import (
	"math"
	"strings"
	"testing"
)

func marginsViewOf(t *testing.T, c *compareStep) *marginsView {
	t.Helper()
	for _, v := range c.views {
		if mv, ok := v.(*marginsView); ok {
			return mv
		}
	}
	t.Fatal("Compare has no margins view")
	return nil
}

// The Margins tab asks for a price first; prices typed in are saved with
// the trial (undoable) and give margin = price × mean − costs (by hand,
// from the means Compare shows), a rate treatment without a product cost
// costed from the price ratio; a bad amount is refused in words.
func TestMarginsView(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := nitrogenTrial(t)
	tr.Analysis.Response.PriceRatio = 0.008
	u.OpenTrial(tr, "")
	s := pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	v := marginsViewOf(t, u.steps[stepCompare].(*compareStep))
	if v.shown != nil || !strings.Contains(v.note.Text, "price of the produce") {
		t.Fatalf("before a price: %q", v.note.Text)
	}
	v.price.SetText("two hundred")
	v.savePrices()
	if u.doc.t.Economics.ProducePrice != 0 || !strings.Contains(v.msg.Text, "not a positive number") {
		t.Fatalf("bad price: %+v, %q", u.doc.t.Economics, v.msg.Text)
	}
	v.price.SetText("200")
	v.currency.SetText("EUR")
	v.product["N50"].SetText("30")
	v.applic["N50"].SetText("12")
	v.savePrices()
	if e := u.doc.t.Economics; e.ProducePrice != 200 || e.Currency != "EUR" || len(e.Costs) != 1 || *e.Costs[0].Product != 30 {
		t.Fatalf("saved %+v", e)
	}
	pumpUntil(t, u, "the margins shown", func() bool { return v.shown != nil })
	mean := map[string]float64{}
	for _, tr := range s.traits {
		if tr.res != nil {
			for _, m := range tr.res.Means {
				mean[m.Treatment] = m.Mean
			}
		}
	}
	for _, row := range v.shown.Rows {
		cost := 0.0
		switch {
		case row.Treatment == "N50":
			cost = 42
		case row.Treatment != "UTC":
			rate := map[string]float64{"N0": 0, "N100": 100, "N150": 150, "N200": 200}[row.Treatment]
			cost = rate * 0.008 * 200
		}
		if math.Abs(row.Margin-(200*mean[row.Treatment]-cost)) > 1e-9 {
			t.Errorf("%s: margin %g, by hand %g", row.Treatment, row.Margin, 200*mean[row.Treatment]-cost)
		}
	}
	if len(v.table.rows) != 6 || !strings.Contains(v.notes.Text, "not a recommendation") {
		t.Errorf("table %d rows, notes %q", len(v.table.rows), v.notes.Text)
	}
	u.undo()
	if u.doc.t.Economics.ProducePrice != 0 || v.price.Text != "" {
		t.Errorf("after undo: %+v, entry %q", u.doc.t.Economics, v.price.Text)
	}
}
