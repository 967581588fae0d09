package stats

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

// benchRCBD is a t-entry × r-block RCBD with frac of the plots missing at
// random (fixed seed).
func benchRCBD(t, r int, frac float64) Model {
	rng := rand.New(rand.NewPCG(5, 6))
	var miss []string
	for b := 0; b < r; b++ {
		for i := 0; i < t; i++ {
			if rng.Float64() < frac {
				miss = append(miss, fmt.Sprint(i, ",", b))
			}
		}
	}
	return rcbd(t, r, func(i, b int) float64 { return 3 + 0.01*float64(i%17) + 0.2*float64(b) + 0.3*rng.NormFloat64() }, miss...)
}

func benchFit(b *testing.B, m Model) {
	if _, err := Fit(m); err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	for b.Loop() {
		Fit(m)
	}
}

func BenchmarkFitRCBD300x4Missing2pct(b *testing.B)  { benchFit(b, benchRCBD(300, 4, 0.02)) }
func BenchmarkFitRCBD1000x4Missing2pct(b *testing.B) { benchFit(b, benchRCBD(1000, 4, 0.02)) }
func BenchmarkFitRCBD300x4Balanced(b *testing.B)     { benchFit(b, benchRCBD(300, 4, 0)) }

// BenchmarkPairSEAll300 computes the standard error of all 44,850 pairwise
// differences of a 300-entry RCBD with missing plots.
func BenchmarkPairSEAll300(b *testing.B) {
	a, err := Fit(benchRCBD(300, 4, 0.02))
	if err != nil {
		b.Fatal(err)
	}
	k := len(a.Means)
	var s float64
	for b.Loop() {
		for i := 0; i < k; i++ {
			for j := i + 1; j < k; j++ {
				s += a.PairSE(i, j)
			}
		}
	}
	_ = s
}
