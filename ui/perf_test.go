package ui

import (
	"fmt"
	"furlong/export/chart"
	"path/filepath"
	"testing"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/test"

	"furlong/sampledata"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// bigTrial is an invented RCBD of n plots (n/4 entries in 4 blocks) with
// plot weight, moisture, derived yield and height filled from a fixed
// pattern.
func bigTrial(tb testing.TB, n int) *trial.Trial {
	tb.Helper()
	nt := n / 4
	trs := make([]trial.Treatment, nt)
	for i := range trs {
		trs[i] = trial.Treatment{Code: fmt.Sprintf("E%04d", i+1), Name: fmt.Sprintf("Entry %d", i+1), Role: trial.RoleEntry}
	}
	trs[0].Role = trial.RoleCheck
	ty := trial.AdjustedYieldTrait("yield", "wt", "moist", "wheat", trial.UnitTHa)
	t, err := trial.New(trial.NewOptions{
		Title: "Large entry trial", Crop: "wheat", Season: "2026",
		Treatments: trs,
		Design:     trial.Design{Kind: trial.RCBD, Reps: 4},
		Layout:     trial.Layout{PlotLength: 6, PlotWidth: 1.5, HarvestLength: 5, HarvestWidth: 1.5, PlotsPerRow: 50},
		Traits: []trial.Trait{
			{Key: "wt", Name: "Plot weight", Unit: "kg", Kind: trial.Continuous, Decimals: 2},
			{Key: "moist", Name: "Moisture", Unit: "%", Kind: trial.Percent, Decimals: 1},
			ty,
			{Key: "ht", Name: "Height", Unit: "cm", Kind: trial.Continuous},
		},
		Seed: 7,
	})
	if err != nil {
		tb.Fatal(err)
	}
	for i := range t.Plots {
		e := t.TreatmentIndex(t.Plots[i].Treatment)
		t.Traits[0].Values[i] = 5 + float64(e%17)*0.1 + float64((i*7)%11)*0.05
		t.Traits[1].Values[i] = 14 + float64((i*3)%9)*0.2
		t.Traits[3].Values[i] = 80 + float64(e%13) + float64((i*5)%7)
	}
	return t
}

func BenchmarkEncode1200(b *testing.B) {
	t := bigTrial(b, 1200)
	for b.Loop() {
		if err := encodeTo(t); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkClone1200(b *testing.B) {
	t := bigTrial(b, 1200)
	for b.Loop() {
		cloneTrial(t)
	}
}

func BenchmarkAnalyze1200(b *testing.B) {
	t := bigTrial(b, 1200)
	for b.Loop() {
		if _, err := analysis.Analyze(t, "yield", analysis.Options{Alpha: 0.05}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkCharts1200(b *testing.B) {
	t := bigTrial(b, 1200)
	tr := analyzeTrait(t, "yield", analysis.Options{Alpha: 0.05})
	for b.Loop() {
		drawCharts(t, tr, meansep.LSD, chart.ByMean)
	}
}

func BenchmarkChartsDemo(b *testing.B) {
	t, err := sampledata.Trial()
	if err != nil {
		b.Fatal(err)
	}
	tr := analyzeTrait(t, "yield", analysis.Options{Alpha: 0.05})
	for b.Loop() {
		drawCharts(t, tr, meansep.LSD, chart.ByMean)
	}
}

// openAndShowRecord opens the trial file at path and lays out the Record
// grid in a 1366×768 window.
func openAndShowRecord(tb testing.TB, u *App, path string) {
	tb.Helper()
	if err := u.OpenFile(path); err != nil {
		tb.Fatal(err)
	}
	u.showStep(stepRecord)
	u.win.Resize(fyne.NewSize(1366, 768))
	r := u.steps[stepRecord].(*recordStep)
	test.WidgetRenderer(r.table).Layout(fyne.NewSize(1100, 600))
}

func savedBigTrial(tb testing.TB, n int) string {
	tb.Helper()
	path := filepath.Join(tb.TempDir(), fmt.Sprintf("big%d.furlong", n))
	if err := trialfile.Save(path, bigTrial(tb, n)); err != nil {
		tb.Fatal(err)
	}
	return path
}

func benchOpen(b *testing.B, n int) {
	path := savedBigTrial(b, n)
	u, _ := newTestApp(b, 0)
	for b.Loop() {
		openAndShowRecord(b, u, path)
	}
}

func BenchmarkOpenRecord1200(b *testing.B)  { benchOpen(b, 1200) }
func BenchmarkOpenRecord24000(b *testing.B) { benchOpen(b, 24000) }

// editToCompare types one value in Record and waits until Compare shows
// the new analysis of that trait.
func editToCompare(tb testing.TB, u *App, v float64) time.Duration {
	tb.Helper()
	start := time.Now()
	var seen time.Duration
	u.compute.delivered = func(s *resultSet) {
		if seen == 0 && s.result("yield") != nil {
			seen = time.Since(start)
		}
	}
	pumpAnalysis(tb, u, func() {
		u.doc.apply(&setValue{trait: 0, plot: 5, old: u.doc.t.Traits[0].Values[5], new: v})
	})
	u.compute.delivered = nil
	return seen
}

// BenchmarkEditToCompare1200: one value typed in Record until Compare shows
// the new analysis of that trait, for 1,200 plots (target 200 ms; the open
// targets are BenchmarkOpenRecord1200 and 24000: 1 s and 3 s).
func BenchmarkEditToCompare1200(b *testing.B) {
	u, _ := newTestApp(b, 0)
	u.OpenTrial(bigTrial(b, 1200), "")
	waitAnalysis(b, u, func() { u.showStep(stepCompare) })
	i := 0
	var toCompare time.Duration
	for b.Loop() {
		toCompare += editToCompare(b, u, 6+float64(i%10)/10)
		i++
	}
	// ns/op is the whole round (every trait, charts, the summary); this is
	// what the user waits for: the edited trait's tables in Compare.
	b.ReportMetric(float64(toCompare.Milliseconds())/float64(i), "ms-to-compare/op")
}
