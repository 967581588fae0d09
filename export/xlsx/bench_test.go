package xlsx

import (
	"context"
	"fmt"
	"io"
	"math/rand/v2"
	"runtime"
	"testing"
	"time"

	"furlong/trial"
	"furlong/trial/analysis"
)

// bigTrial is an invented RCBD trial of nt entries in reps blocks with ten
// traits of random values (seeded, so every run is the same).
func bigTrial(tb testing.TB, nt, reps int) *trial.Trial {
	tb.Helper()
	var tms []trial.Treatment
	for i := 0; i < nt; i++ {
		role := trial.RoleEntry
		if i == 0 {
			role = trial.RoleCheck
		}
		tms = append(tms, trial.Treatment{Code: fmt.Sprintf("E%04d", i+1), Name: fmt.Sprintf("Line %d", i+1), Role: role})
	}
	var traits []trial.Trait
	for j := 0; j < 10; j++ {
		key := fmt.Sprintf("t%d", j)
		if j == 0 {
			key = "yield"
		}
		traits = append(traits, trial.Trait{Key: key, Name: "Trait " + key, Unit: "u", Kind: trial.Continuous, Decimals: 2, Min: fptr(0), Max: fptr(1000)})
	}
	t, err := trial.New(trial.NewOptions{
		Title: "Benchmark trial", Crop: "wheat", Season: "2026",
		Treatments: tms, Design: trial.Design{Kind: trial.RCBD, Reps: reps},
		Layout: trial.Layout{PlotLength: 10, PlotWidth: 1.5, PlotsPerRow: 20},
		Traits: traits, Seed: 7, Now: time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC),
	})
	if err != nil {
		tb.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(1, 2))
	for j := range t.Traits {
		for i := range t.Plots {
			t.Traits[j].Values[i] = 100 + 10*float64(j) + 5*rng.NormFloat64()
		}
	}
	return t
}

func benchReport(b *testing.B, nt, reps int) {
	t := bigTrial(b, nt, reps)
	start := time.Now()
	res, err := analysis.AnalyzeAll(context.Background(), t, nil, analysis.Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.Logf("%d plots: analysis of 10 traits took %v (not counted)", len(t.Plots), time.Since(start))
	b.ReportAllocs()
	b.ResetTimer()
	var peak uint64
	for i := 0; i < b.N; i++ {
		if err := WriteReport(context.Background(), io.Discard, t, res, ReportOptions{Charts: true, Version: "bench"}); err != nil {
			b.Fatal(err)
		}
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		peak = max(peak, ms.HeapSys)
	}
	b.ReportMetric(float64(peak)/(1<<20), "MiB-heap-sys")
}

// BenchmarkReport1200 is the full report, charts included, of 1,200 plots
// (100 entries × 12 blocks) with 10 traits. Target: under 2 s.
func BenchmarkReport1200(b *testing.B) { benchReport(b, 100, 12) }

// BenchmarkReport24000 is the full report of 24,000 plots (600 entries × 40
// blocks) with 10 traits. Target: under 20 s and 1 GiB.
func BenchmarkReport24000(b *testing.B) { benchReport(b, 600, 40) }

// BenchmarkFieldBook24000 writes the field book of 24,000 plots × 10 traits.
func BenchmarkFieldBook24000(b *testing.B) {
	t := bigTrial(b, 600, 40)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := WriteFieldBook(io.Discard, t, FieldBookOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}
