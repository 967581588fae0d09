package ui

import (
	"fmt"
	"testing"
	"time"

	"furlong/sampledata"
	"furlong/trial"
	"furlong/trial/analysis"
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
		drawCharts(t, tr, analysis.LSD)
	}
}

func BenchmarkChartsDemo(b *testing.B) {
	t, err := sampledata.Trial()
	if err != nil {
		b.Fatal(err)
	}
	tr := analyzeTrait(t, "yield", analysis.Options{Alpha: 0.05})
	for b.Loop() {
		drawCharts(t, tr, analysis.LSD)
	}
}

var _ = time.Now
