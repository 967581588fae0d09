package glm

import (
	"math"
	"math/rand/v2"
	"testing"
)

// simulated builds a trial with the given factor sizes in blocks: every
// block × combination once, responses from a seeded generator with block,
// factor and unit effects, and the listed plots missing.
func simulated(seed uint64, sizes []int, blocks int, s Structure, missing int) Model {
	rng := rand.New(rand.NewPCG(seed, 1))
	var m Model
	m.Structure = s
	names := []string{"A", "B", "C"}
	for f, k := range sizes {
		fa := Factor{Name: names[f]}
		for l := range k {
			fa.Levels = append(fa.Levels, names[f]+string(rune('1'+l%9))+string(rune('a'+l/9)))
		}
		m.Factors = append(m.Factors, fa)
	}
	blk := Factor{Name: "block"}
	for b := range blocks {
		blk.Levels = append(blk.Levels, string(rune('I'+b)))
	}
	eff := make([][]float64, len(sizes))
	for f, k := range sizes {
		for range k {
			eff[f] = append(eff[f], 3*rng.NormFloat64())
		}
	}
	units := map[[3]int]float64{}
	unit := func(k [3]int, sd float64) float64 {
		v, ok := units[k]
		if !ok {
			v = sd * rng.NormFloat64()
			units[k] = v
		}
		return v
	}
	nc := 1
	for _, k := range sizes {
		nc *= k
	}
	for b := range blocks {
		for c := range nc {
			lv := make([]int, len(sizes))
			r := c
			for f := len(sizes) - 1; f >= 0; f-- {
				lv[f] = r % sizes[f]
				r /= sizes[f]
			}
			y := 50 + 2*float64(b)
			for f := range sizes {
				m.Factors[f].Index = append(m.Factors[f].Index, lv[f])
				y += eff[f][lv[f]]
			}
			y += unit([3]int{b, lv[0], -1}, 2)
			if s == SplitPlot && len(sizes) == 3 {
				y += unit([3]int{b, lv[0], 1000 + lv[1]}, 1.5)
			}
			if s == StripPlot {
				y += unit([3]int{b, -1, lv[1]}, 2)
			}
			if len(sizes) > 1 {
				y += 0.5 * float64(lv[0]*lv[1]%3)
			}
			y += rng.NormFloat64()
			blk.Index = append(blk.Index, b)
			m.Response = append(m.Response, y)
		}
	}
	m.Block = &blk
	n := len(m.Response)
	for k := 0; k < missing; {
		i := rng.IntN(n)
		if !math.IsNaN(m.Response[i]) {
			m.Response[i] = math.NaN()
			k++
		}
	}
	return m
}

// 3 × 4 × 5 factorial in 4 blocks with 5% of the plots missing (12 of
// 240): type II ANOVA, every effect with comparisons and letters, and
// every slice.
func BenchmarkFactorial3x4x5Missing(b *testing.B) {
	m := simulated(7, []int{3, 4, 5}, 4, Factorial, 12)
	m.AllSlices = true
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Fit(m); err != nil {
			b.Fatal(err)
		}
	}
}

// Split plot, 6 main-plot × 10 subplot levels in 4 blocks, 3 subplots
// missing: REML, F tests, means, SEDs and slices.
func BenchmarkSplitPlot6x10REML(b *testing.B) {
	m := simulated(11, []int{6, 10}, 4, SplitPlot, 3)
	m.AllSlices = true
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Fit(m); err != nil {
			b.Fatal(err)
		}
	}
}

// The 3 × 4 × 5 factorial above adjusted for a covariate (made from the
// plot number): the covariance analysis, the separate-slopes test, the
// covariate's own analysis and the unadjusted one.
func BenchmarkFactorial3x4x5MissingCovariate(b *testing.B) {
	m := simulated(7, []int{3, 4, 5}, 4, Factorial, 12)
	m.AllSlices = true
	m.Covariate = make([]float64, len(m.Response))
	for i := range m.Covariate {
		m.Covariate[i] = float64((37*(i+1))%17) + 0.25*float64((i+1)%5)
	}
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Fit(m); err != nil {
			b.Fatal(err)
		}
	}
}
