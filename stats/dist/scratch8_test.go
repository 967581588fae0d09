package dist

import (
	"math"
	"testing"
	"time"
)

func TestScratchTol(t *testing.T) {
	for _, rel := range []float64{1e-6, 1e-7, 1e-8, 1e-9} {
		maxe, maxr := 0.0, 0.0
		cntS, cntR := 0, 0
		var tS, tR time.Duration
		for _, k := range []float64{2, 3, 10, 300, 1000} {
			for _, nu := range []float64{1, 2, 5, 20, 880, 1e4, math.Inf(1)} {
				for _, q := range []float64{0.3, 1, 2, 3, 4, 5, 6, 7, 9, 15, 40, 200} {
					for _, up := range []bool{true, false} {
						pR := func(k, y float64) float64 { cntS++; return rangeDensity(k, y) }
						st := time.Now()
						ref := tailWithTol(k, nu, q, pR, up, 1e-13)
						tS += time.Since(st)
						pR2 := func(k, y float64) float64 { cntR++; return rangeDensity(k, y) }
						st = time.Now()
						got := tailWithTol(k, nu, q, pR2, up, rel)
						tR += time.Since(st)
						e := math.Abs(got - ref)
						if e > maxe {
							maxe = e
						}
						if ref > 0 && e/ref > maxr {
							maxr = e / ref
							t.Logf("  rel=%g k=%v nu=%v q=%v up=%v ref=%v got=%v", rel, k, nu, q, up, ref, got)
						}
					}
				}
			}
		}
		t.Logf("rel=%g maxabs=%.3g maxrel=%.3g evals strict=%d relaxed=%d time %v %v", rel, maxe, maxr, cntS, cntR, tS, tR)
	}
}

func tailWithTol(k, nu, q float64, pR func(k, y float64) float64, up bool, rel float64) float64 {
	old := testRel
	testRel = rel
	defer func() { testRel = old }()
	return studRangeTail(k, nu, q, pR, up, false).v
}
