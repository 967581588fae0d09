package dist

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
)

func refRangeDensity(k, y float64) float64 {
	n := 20
	x := make([]float64, n)
	w := make([]float64, n)
	a, b := -12.0+y/2, 12.0+y/2
	panels := 400
	h := (b - a) / float64(panels)
	var s float64
	for p := 0; p < panels; p++ {
		quad.Legendre{}.FixedLocations(x, w, a+float64(p)*h, a+float64(p+1)*h)
		for i := range x {
			z := x[i]
			var lg float64
			if z >= y/2 {
				lg = rangeLogIntegrand(k, y, z)
			} else {
				lg = rangeLogIntegrand(k, y, y-z)
			}
			s += w[i] * math.Exp(lg)
		}
	}
	return k * (k - 1) * s
}

func TestScratchInner(t *testing.T) {
	maxe := 0.0
	for _, k := range []float64{2, 3, 5, 10, 50, 300, 1000} {
		for y := 0.01; y < 20; y *= 1.1 {
			r := refRangeDensity(k, y)
			g := rangeDensity(k, y)
			e := math.Abs(g - r)
			if e > maxe {
				maxe = e
				t.Logf("k=%v y=%.4g ref=%.16g got=%.16g err=%.3g rel=%.3g", k, y, r, g, e, e/r)
			}
		}
	}
	if k := 2.0; true {
		for y := 0.01; y < 20; y *= 1.3 {
			e := math.Abs(rangeDensity(k, y) - invSqrtPi*math.Exp(-y*y/4))
			if e > 1e-16 {
				t.Logf("k=2 y=%v err %g", y, e)
			}
		}
	}
}
