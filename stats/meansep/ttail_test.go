package meansep

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// The two-sided t probability, direct and interpolated, against closed
// forms for 1, 2 and 3 degrees of freedom (Cauchy: p = 1 − (2/π) atan t;
// ν = 2: p = 1 − t/√(2+t²); ν = 3: p = 1 − (2/π)[atan(t/√3) +
// (t/√3)/(1+t²/3)]; from memory, e.g. Johnson, Kotz & Balakrishnan,
// Continuous Univariate Distributions 2, ch. 28) to 1e-12 relative, and
// gonum's distuv.StudentsT for larger ν to 1e-10 (1e-9 for |t| < 1: gonum
// passes ν/(ν+t²) to the incomplete beta function and loses digits near
// t = 0, as the closed forms show).
func TestTTail(t *testing.T) {
	t.Parallel()
	closed := map[float64]func(x float64) float64{
		1: func(x float64) float64 { return 2 / math.Pi * math.Atan(1/x) },
		2: func(x float64) float64 { return 1 - x/math.Sqrt(2+x*x) },
		3: func(x float64) float64 {
			u := x / math.Sqrt(3)
			return 1 - 2/math.Pi*(math.Atan(u)+u/(1+u*u))
		},
	}
	rng := rand.New(rand.NewPCG(5, 6))
	for _, nu := range []float64{1, 2, 3, 5, 27, 66, 880, 2997} {
		d := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}
		tt := newTTail(nu, tTailMin, 30)
		for i, c := range tt.coef {
			if c == nil {
				t.Errorf("nu %v: piece %d fell back to direct evaluation", nu, i)
			}
		}
		for range 2000 {
			x := 32 * rng.Float64()
			if rng.IntN(4) == 0 {
				x = rng.Float64() / 4
			}
			if rng.IntN(2) == 0 {
				x = -x
			}
			ax := math.Abs(x)
			want, tol := 2*d.Survival(ax), 1e-10
			if ax < 1 {
				tol = 1e-9 // gonum's own error near t = 0
			}
			if f, ok := closed[nu]; ok {
				want, tol = f(ax), 1e-12
				if nu == 3 && ax > 8 {
					tol = 1e-7 // the closed form cancels for large t
				}
			}
			for _, got := range []float64{tt.p(x), tt.direct(x)} {
				if math.Abs(got-want) > tol*want {
					t.Fatalf("nu %v t %v: %.15g, reference %.15g", nu, x, got, want)
				}
			}
		}
	}
}
