package analysis

import (
	"math/rand/v2"
	"strconv"
	"testing"

	"furlong/trial"
)

// factorialTrial builds a trial of crossed factors with the given numbers
// of levels in b blocks, one trait, and `missing` plots without a value
// (chosen by a seeded generator; invented data: these are speed tests).
func factorialTrial(tb testing.TB, kind trial.DesignKind, levels []int, b, missing int) *trial.Trial {
	tb.Helper()
	var fs []trial.Factor
	for f, n := range levels {
		key := string(rune('A' + f))
		fac := trial.Factor{Key: key}
		for l := range n {
			fac.Levels = append(fac.Levels, trial.Level{Code: key + strconv.Itoa(l+1)})
		}
		fs = append(fs, fac)
	}
	t, err := trial.New(trial.NewOptions{
		Title: "speed", Factors: fs, Design: trial.Design{Kind: kind, Reps: b},
		Traits: []trial.Trait{{Key: "y", Kind: trial.Continuous, Decimals: 2, HigherBetter: true}}, Seed: 3,
	})
	if err != nil {
		tb.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(5, 9))
	main := map[[2]int]float64{}
	for i, p := range t.Plots {
		k := [2]int{p.Block, p.MainPlot}
		if _, ok := main[k]; !ok {
			main[k] = rng.NormFloat64()
		}
		v := 10 + 0.3*float64(p.Block) + main[k] + 0.5*rng.NormFloat64()
		for f := range fs {
			v += 0.2 * float64(t.PlotLevels(f)[i])
		}
		t.Traits[0].Values[i] = v
	}
	for _, i := range rng.Perm(len(t.Plots))[:missing] {
		t.Traits[0].Values[i] = trial.Missing
	}
	return t
}

// BenchmarkFactorial3x4x5 is the case: a 3 × 4 × 5 factorial in 4
// blocks (240 plots) with 5% (12) missing: type II ANOVA, the means and
// comparisons of all 7 effects, and slices (target under 20 ms).
func BenchmarkFactorial3x4x5(b *testing.B) {
	t := factorialTrial(b, trial.RCBD, []int{3, 4, 5}, 4, 12)
	b.ResetTimer()
	for b.Loop() {
		if _, err := Analyze(t, "y", Options{}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkSplitPlotREML is the case: a split plot with 6
// main-plot and 10 subplot levels in 4 blocks and 3 subplots missing,
// fitted by REML (target under 100 ms).
func BenchmarkSplitPlotREML(b *testing.B) {
	t := factorialTrial(b, trial.SplitPlot, []int{6, 10}, 4, 3)
	r, err := Analyze(t, "y", Options{})
	if err != nil {
		b.Fatal(err)
	}
	if r.Factorial.Method != "REML" {
		b.Fatalf("fitted by %s", r.Factorial.Method)
	}
	b.ResetTimer()
	for b.Loop() {
		if _, err := Analyze(t, "y", Options{}); err != nil {
			b.Fatal(err)
		}
	}
}
