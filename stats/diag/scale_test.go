package diag

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// TestScaleInvariance: Shapiro–Wilk, Levene, Bartlett and Tukey's
// non-additivity test give the same statistic and p-value for a + b·y as
// for y (each is unchanged by a shift and a positive scaling: a property of
// their definitions), for tiny and huge units and a large common offset;
// the non-additivity sums of squares move with b². Values are multiples of
// 1/4, so 1e15 + y is exact.
func TestScaleInvariance(t *testing.T) {
	t.Parallel()
	const tol = 1e-9
	rng := rand.New(rand.NewPCG(7, 8))
	rel := func(got, want float64) bool { return math.Abs(got-want) <= tol*math.Max(math.Abs(want), 1e-300) }
	for n := range 10 {
		b, k := 3+rng.IntN(4), 3+rng.IntN(5)
		var y []float64
		var blk, trt []int
		for i := range b {
			for j := range k {
				y = append(y, math.Round(4*(20+float64(i)+float64(j*j%5)+(1+float64(j%2))*rng.NormFloat64()))/4)
				blk, trt = append(blk, i), append(trt, j)
			}
		}
		sw0, err0 := ShapiroWilk(y)
		lv0, _ := Levene(y, trt, k, Median)
		bt0, _ := Bartlett(y, trt, k)
		na0, naErr0 := TukeyNonAdditivity(y, blk, trt, b, k)
		if err0 != nil {
			t.Fatal(err0)
		}
		for _, sc := range []struct{ a, b float64 }{{0, 1e-160}, {0, 1e-10}, {0, 1e100}, {1e15, 1}, {-1e15, 1e100}} {
			what := fmt.Sprintf("set %d, %g + %g·y", n, sc.a, sc.b)
			z := make([]float64, len(y))
			for i, v := range y {
				z[i] = sc.a + sc.b*v
			}
			if sw, err := ShapiroWilk(z); err != nil || !rel(sw.W, sw0.W) || !rel(sw.P, sw0.P) {
				t.Errorf("%s: Shapiro–Wilk %+v %v, want %+v", what, sw, err, sw0)
			}
			if lv, err := Levene(z, trt, k, Median); err != nil || !rel(lv.F, lv0.F) || !rel(lv.P, lv0.P) {
				t.Errorf("%s: Levene %+v %v, want %+v", what, lv, err, lv0)
			}
			if bt, err := Bartlett(z, trt, k); err != nil || !rel(bt.ChiSquare, bt0.ChiSquare) || !rel(bt.P, bt0.P) {
				t.Errorf("%s: Bartlett %+v %v, want %+v", what, bt, err, bt0)
			}
			na, err := TukeyNonAdditivity(z, blk, trt, b, k)
			if (err == nil) != (naErr0 == nil) {
				t.Errorf("%s: non-additivity error %v, want %v", what, err, naErr0)
				continue
			}
			if err == nil && (!rel(na.F, na0.F) || !rel(na.P, na0.P) || (sc.a == 0 && sc.b > 1e-150 && !rel(na.SS, na0.SS*sc.b*sc.b))) {
				t.Errorf("%s: non-additivity %+v, want F %g p %g", what, na, na0.F, na0.P)
			}
		}
	}
}
