package analysis

import (
	"context"
	"math/rand/v2"
	"strconv"
	"testing"

	"furlong/trial"
)

// variety builds an RCBD variety trial with k entries in b blocks, nTraits
// traits, and the given share of plots missing, filled from a seeded
// generator (invented data: these are speed tests).
func variety(tb testing.TB, k, b, nTraits int, missing float64) *trial.Trial {
	tb.Helper()
	trts := make([]trial.Treatment, k)
	for i := range trts {
		trts[i] = trial.Treatment{Code: "E" + strconv.Itoa(i+1), Name: "Entry " + strconv.Itoa(i+1), Role: trial.RoleEntry}
	}
	trts[0].Role = trial.RoleCheck
	var traits []trial.Trait
	for j := 0; j < nTraits; j++ {
		traits = append(traits, trial.Trait{Key: "t" + strconv.Itoa(j), Name: "Trait " + strconv.Itoa(j), Kind: trial.Continuous, Decimals: 2, HigherBetter: true})
	}
	t, err := trial.New(trial.NewOptions{
		Title: "speed", Treatments: trts, Design: trial.Design{Kind: trial.RCBD, Reps: b},
		Traits: traits, Seed: 1,
	})
	if err != nil {
		tb.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(7, 11))
	effect := make([]float64, k)
	for i := range effect {
		effect[i] = rng.NormFloat64() * 0.6
	}
	for j := range traits {
		for i, p := range t.Plots {
			v := 6 + effect[t.TreatmentIndex(p.Treatment)] + 0.2*float64(p.Block) + 0.4*rng.NormFloat64()
			if rng.Float64() < missing {
				v = trial.Missing
			}
			t.Traits[j].Values[i] = v
		}
	}
	return t
}

// BenchmarkAnalyze300 is the target case: 300 entries × 4 blocks,
// 2% of plots missing, one trait: ANOVA, least-squares means, all 44,850
// pairs with Tukey-adjusted p, and letters (target under 50 ms).
func BenchmarkAnalyze300(b *testing.B) {
	t := variety(b, 300, 4, 1, 0.02)
	b.ResetTimer()
	for b.Loop() {
		if _, err := Analyze(t, "t0", Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAnalyze1000: 1,000 entries × 4 blocks, 2% missing (target under 1 s).
func BenchmarkAnalyze1000(b *testing.B) {
	t := variety(b, 1000, 4, 1, 0.02)
	b.ResetTimer()
	for b.Loop() {
		if _, err := Analyze(t, "t0", Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAnalyzeAll300x10: ten traits of the 300-entry trial (target under 0.5 s).
func BenchmarkAnalyzeAll300x10(b *testing.B) {
	t := variety(b, 300, 4, 10, 0.02)
	b.ResetTimer()
	for b.Loop() {
		out, err := AnalyzeAll(context.Background(), t, nil, Options{})
		if err != nil {
			b.Fatal(err)
		}
		for _, o := range out {
			if o.Err != nil {
				b.Fatal(o.Err)
			}
		}
	}
}

// BenchmarkAnalyze300Cold is BenchmarkAnalyze300 without the studentised
// range table cache: it cycles through more trials with distinct error df
// than the cache holds, so every analysis builds its table (the cost of the
// first analysis of a trait).
func BenchmarkAnalyze300Cold(b *testing.B) {
	var ts []*trial.Trial
	for i := 0; i < 20; i++ {
		t := variety(b, 300, 4, 1, 0.02)
		// Drop i more plots so that each trial has its own error df.
		for j := 0; j < i; j++ {
			t.Traits[0].Values[j*7+3] = trial.Missing
		}
		ts = append(ts, t)
	}
	b.ResetTimer()
	i := 0
	for b.Loop() {
		if _, err := Analyze(ts[i%len(ts)], "t0", Options{}); err != nil {
			b.Fatal(err)
		}
		i++
	}
}
