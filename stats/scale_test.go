package stats

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"
)

// affine is a change of unit and origin, y → A + B·y.
type affine struct{ A, B float64 }

// scaleCases are the units and origins the analysis must not notice: tiny
// and huge units, with and without a large common offset, and the offset
// alone (1e15 + small differences, which float64 holds exactly when the
// differences are multiples of 1/8).
var scaleCases = []affine{
	{0, 1e-160}, {0, 1e-10}, {0, 1e100},
	{1e15, 1e-160}, {1e15, 1e-10}, {1e15, 1e100},
	{1e15, 1}, {-1e15, 1}, {0, -1e-10},
}

// quarterModels are random models (one-way with unequal replication,
// balanced and incomplete RCBDs, Latin squares) whose responses are
// multiples of 1/4, so that a + y is exact for |a| up to 2^50.
func quarterModels(rng *rand.Rand) []Model {
	q := func(mu, sd float64) float64 { return math.Round(4*(mu+sd*rng.NormFloat64())) / 4 }
	var ms []Model
	for range 6 {
		k := 2 + rng.IntN(6)
		var idx []int
		var y []float64
		for l := range k {
			for range 2 + rng.IntN(4) {
				idx = append(idx, l)
				y = append(y, q(20+float64(l), 2))
			}
		}
		ms = append(ms, oneWay(k, idx, y))
		t, r := 3+rng.IntN(8), 3+rng.IntN(3)
		eff := rng.NormFloat64()
		ms = append(ms, rcbd(t, r, func(i, b int) float64 { return q(40+eff*float64(i%3)+float64(b), 3) }))
		ms = append(ms, rcbd(t, r, func(i, b int) float64 { return q(40+float64(i%2)+float64(b), 3) }, "0,0", fmt.Sprint(t-1, ",", r-1)))
		s := 4 + rng.IntN(3)
		ms = append(ms, latin(s, func(r, c int) float64 { return q(30+float64(r)-float64(c)/2, 2) }))
	}
	return ms
}

// TestScaleInvariance: F, p, R² and leverages do not change when the data
// are put in another unit or given another origin, and the levels (means,
// fitted values) and spreads (SE, pair SE, residuals, RootMSE) move with
// them (a property of least squares: the model is linear and contains the
// mean). Where float64 cannot hold the differences at all (1e15 + 1e-10·y),
// Fit says every plot has the same value instead of analysing noise.
func TestScaleInvariance(t *testing.T) {
	t.Parallel()
	const tol = 1e-9
	rng := rand.New(rand.NewPCG(12, 34))
	for mi, m := range quarterModels(rng) {
		ref, err := Fit(m)
		if err != nil {
			t.Fatalf("model %d: %v", mi, err)
		}
		for _, sc := range scaleCases {
			what := fmt.Sprintf("model %d, %g + %g·y", mi, sc.A, sc.B)
			m2 := m
			m2.Response = make([]float64, len(m.Response))
			same := true
			for i, v := range m.Response {
				m2.Response[i] = sc.A + sc.B*v
				same = same && m2.Response[i] == m2.Response[0]
			}
			a, err := Fit(m2)
			if same {
				var ie *InputError
				if !errors.As(err, &ie) || ie.Kind != ZeroErrorVariance {
					t.Errorf("%s: values all equal in float64, got %v", what, err)
				}
				continue
			}
			if err != nil {
				t.Errorf("%s: %v", what, err)
				continue
			}
			checkFinite(t, a)
			b := math.Abs(sc.B)
			for i, s := range a.Sources {
				r := ref.Sources[i]
				if s.Role != r.Role || s.DF != r.DF || s.HasTest != r.HasTest {
					t.Fatalf("%s: line %d %+v, want %+v", what, i, s, r)
				}
				if s.HasTest {
					checkRel(t, what+" F", s.F, r.F, tol)
					checkRel(t, what+" p", s.P, r.P, tol)
				}
				// Sums of squares scale with b² where float64 can hold them.
				if want := r.SS * b * b; want > 1e-290 && want < 1e290 {
					checkRel(t, what+" SS", s.SS, want, tol)
				}
			}
			checkRel(t, what+" R²", a.RSquared, ref.RSquared, tol)
			checkRel(t, what+" RootMSE", a.RootMSE, ref.RootMSE*b, tol)
			if sc.A == 0 {
				checkRel(t, what+" CV%", a.CVPercent, ref.CVPercent, tol)
			}
			for i := range a.Means {
				// A level is compared on the scale of the spread: a + b·mean
				// holds only as many digits as the offset leaves.
				level := func(got, want float64) {
					t.Helper()
					if d := math.Abs(got - (sc.A + sc.B*want)); d > tol*(b*math.Abs(want)+math.Abs(sc.A))+4*ulp(sc.A+sc.B*want) {
						t.Errorf("%s: level %.17g, want %.17g", what, got, sc.A+sc.B*want)
					}
				}
				level(a.Means[i].Mean, ref.Means[i].Mean)
				level(a.Means[i].RawMean, ref.Means[i].RawMean)
				checkRel(t, what+" SE", a.Means[i].SE, ref.Means[i].SE*b, tol)
				for j := range a.Means {
					checkRel(t, what+" pair SE", a.PairSE(i, j), ref.PairSE(i, j)*b, tol)
					// Differences near 0 are rounding noise: compare on the
					// scale of their standard error.
					if d, w := a.MeanDiff(i, j), ref.MeanDiff(i, j)*sc.B; math.Abs(d-w) > tol*b*(math.Abs(ref.MeanDiff(i, j))+ref.PairSE(i, j)) {
						t.Errorf("%s: mean difference %d−%d = %g, want %g", what, i, j, d, w)
					}
				}
			}
			for i := range a.Residuals {
				if math.Abs(a.Residuals[i]-sc.B*ref.Residuals[i]) > tol*b*ref.RootMSE {
					t.Errorf("%s: residual %d = %g, want %g", what, i, a.Residuals[i], sc.B*ref.Residuals[i])
				}
				if math.Abs(a.Leverage[i]-ref.Leverage[i]) > tol {
					t.Errorf("%s: leverage %d", what, i)
				}
			}
		}
	}
}

func ulp(v float64) float64 { return math.Nextafter(math.Abs(v), math.Inf(1)) - math.Abs(v) }

// TestTooWideSpread: differences whose squares overflow float64 are refused
// in words, not analysed into Inf or NaN (project rule).
func TestTooWideSpread(t *testing.T) {
	t.Parallel()
	m := oneWay(2, []int{0, 0, 1, 1}, []float64{1e160, 2e160, -1e160, 3e160})
	_, err := Fit(m)
	var ie *InputError
	if !errors.As(err, &ie) || ie.Kind != NonFiniteValue {
		t.Fatalf("got %v, want a NonFiniteValue input error", err)
	}
}
