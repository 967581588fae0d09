package chart

import (
	"os"
	"testing"

	"gonum.org/v1/plot"

	"furlong/stats/meansep"
)

// TestDebugRender writes sample charts for a person to look at when
// CHART_OUT names a directory; it checks nothing else.
func TestDebugRender(t *testing.T) {
	dir := os.Getenv("CHART_OUT")
	if dir == "" {
		t.Skip("set CHART_OUT to write sample charts")
	}
	tr, r := fixtureTrial(), fixtureResult()
	mk := map[string]func() (*plot.Plot, error){
		"means": func() (*plot.Plot, error) { return Means(tr, r, MeansOptions{Letters: meansep.Tukey}) },
		"meansci": func() (*plot.Plot, error) {
			return Means(tr, r, MeansOptions{Letters: meansep.LSD, ErrorBars: ConfidenceInterval, Points: true})
		},
		"dots":     func() (*plot.Plot, error) { return Spread(tr, "yield", SpreadOptions{ShowExcluded: true, Seed: 7}) },
		"box":      func() (*plot.Plot, error) { return Spread(tr, "yield", SpreadOptions{Kind: BoxPlot}) },
		"heat":     func() (*plot.Plot, error) { return HeatMap(tr, "yield", HeatMapOptions{PlotNumbers: true}) },
		"fieldmap": func() (*plot.Plot, error) { return FieldMap(tr, FieldMapOptions{}) },
		"resid":    func() (*plot.Plot, error) { return Residuals(tr, r) },
		"qq":       func() (*plot.Plot, error) { return QQ(tr, r) },
		"big": func() (*plot.Plot, error) {
			bt, br := bigFixture(60, 3)
			return Means(bt, br, MeansOptions{Letters: meansep.Tukey})
		},
		"bigmap": func() (*plot.Plot, error) { bt, _ := bigFixture(60, 3); return FieldMap(bt, FieldMapOptions{}) },
		"bigheat": func() (*plot.Plot, error) {
			bt, _ := bigFixture(60, 3)
			return HeatMap(bt, "yield", HeatMapOptions{PlotNumbers: true})
		},
	}
	for name, f := range mk {
		p, err := f()
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		for _, ext := range []string{"png", "svg", "pdf"} {
			if err := os.WriteFile(dir+"/"+name+"."+ext, render(t, p, ext), 0o644); err != nil {
				t.Fatal(err)
			}
		}
	}
}
