package dist

import (
	"testing"
)

func TestScratchIters(t *testing.T) {
	for _, k := range []float64{3, 10, 300, 1000} {
		for _, y := range []float64{0.5, 2, 4, 5.5, 7, 9, 12} {
			m := y / 2
			hm := rangeLogIntegrand(k, y, m)
			cnt := 0
			// replicate
			curv := 2 + (k-2)*2*m*invSqrt2Pi*exp(-0.5*m*m)/erf(m*invSqrt2)
			_ = hm
			_ = curv
			_ = cnt
			t.Logf("k=%v y=%v gauss l=%.3g", k, y, sqrt(88/curv))
			for l := 0.25; l < 6.7; l += 0.25 {
				if hm-rangeLogIntegrand(k, y, m+l) > 44 {
					t.Logf("   true l ~ %v", l)
					break
				}
			}
		}
	}
}
