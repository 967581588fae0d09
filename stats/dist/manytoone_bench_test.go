package dist

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// rcbdCorr returns the correlation matrix of the t−1 least-squares
// differences τ_i − τ_0 (i = 1..t−1) in a randomised complete block design
// with t treatments in b blocks when the plots listed in missing
// ({treatment, block} pairs) are absent, from (X'X)⁻¹ of the additive model
// block + treatment (common practice: the covariance of least-squares
// estimates is σ²(X'X)⁻¹).
func rcbdCorr(t, b int, missing [][2]int) []float64 {
	gone := map[[2]int]bool{}
	for _, m := range missing {
		gone[m] = true
	}
	p := b + t - 1 // block columns, then treatments 1..t−1 (0 the baseline)
	xtx := mat.NewSymDense(p, nil)
	for i := 0; i < t; i++ {
		for j := 0; j < b; j++ {
			if gone[[2]int{i, j}] {
				continue
			}
			x := make([]float64, p)
			x[j] = 1
			if i > 0 {
				x[b+i-1] = 1
			}
			xtx.SymRankOne(xtx, 1, mat.NewVecDense(p, x))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(xtx) {
		panic("rcbdCorr: singular design")
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		panic(err)
	}
	k := t - 1
	r := make([]float64, k*k)
	for i := 0; i < k; i++ {
		for j := 0; j < k; j++ {
			r[i*k+j] = inv.At(b+i, b+j) / math.Sqrt(inv.At(b+i, b+i)*inv.At(b+j, b+j))
		}
	}
	return r
}

// benchmarkVsCheck does what one trait's comparisons with the check cost:
// the distribution, the two-sided critical value and a two-sided and a
// one-sided p for each of the k comparisons.
func benchmarkVsCheck(b *testing.B, corr []float64, k int, nu float64, want ManyToOneMethod) {
	for b.Loop() {
		d, err := NewManyToOne(corr, k, nu, 0)
		if err != nil {
			b.Fatal(err)
		}
		if d.Method() != want {
			b.Fatalf("method %s, want %s", d.Method(), want)
		}
		benchSink += d.Quantile(0.05, true)
		for i := 0; i < k; i++ {
			c := 0.4 * float64(i)
			benchSink += d.Survival(c, true) + d.Survival(c-1.5, false)
		}
	}
}

// BenchmarkVsCheckDemoProduct is the demo trial's case: 10 entries in 4
// blocks, one plot missing (a product structure).
func BenchmarkVsCheckDemoProduct(b *testing.B) {
	benchmarkVsCheck(b, rcbdCorr(10, 4, [][2]int{{7, 2}}), 9, 26, ProductMethod)
}

// BenchmarkVsCheckDemoGeneral is the demo trial's general case: 10 entries
// in 4 blocks, two plots missing (no product structure).
func BenchmarkVsCheckDemoGeneral(b *testing.B) {
	benchmarkVsCheck(b, rcbdCorr(10, 4, [][2]int{{1, 0}, {7, 2}}), 9, 25, LatticeMethod)
}

// missingPlots returns every {treatment, block} of a t × b RCBD whose
// seeded uniform draw falls below share (never treatment 0, the check, so
// the comparisons keep a full check).
func missingPlots(t, b int, share float64) [][2]int {
	rng := rand.New(rand.NewPCG(7, 11))
	var m [][2]int
	for i := 1; i < t; i++ {
		for j := 0; j < b; j++ {
			if rng.Float64() < share {
				m = append(m, [2]int{i, j})
			}
		}
	}
	return m
}

// BenchmarkVsCheckFactor300 is the speed case inside stats/dist:
// 300 entries in 4 blocks with 2% of plots missing (the factor
// approximation), a two-sided and a one-sided p for each comparison.
func BenchmarkVsCheckFactor300(b *testing.B) {
	benchmarkVsCheck(b, rcbdCorr(300, 4, missingPlots(300, 4, 0.02)), 299, 897-24, FactorMethod)
}
