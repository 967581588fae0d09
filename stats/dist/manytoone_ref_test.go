package dist

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat/distuv"
)

// adaptiveSurvival is the product method as first written, kept as the
// reference of the fast path: nested adaptive Gauss–Kronrod quadrature
// (adaptiveGK, QUADPACK's 15-point rule) over S and then over the common
// factor W, each panel accepted at a relative Kronrod–Gauss difference of
// 1e-11, so the double integral of Dunnett (1955) is good to about 1e-12.
// It shares nothing with the fast path but the grouped λ values and the
// chi density.
func adaptiveSurvival(d *ManyToOne, c float64, twoSided bool) float64 {
	if twoSided {
		c = math.Abs(c)
	}
	h := func(u float64) float64 {
		f := func(w float64) pair {
			var logIn float64
			for g, l := range d.lambda {
				sd := math.Sqrt(1 - l*l)
				q := normSurvival((u - l*w) / sd)
				if twoSided {
					q += normSurvival((u + l*w) / sd)
				}
				if q >= 1 {
					return pair{phi(w), 0}
				}
				logIn += float64(d.count[g]) * math.Log1p(-q)
			}
			return pair{-math.Expm1(logIn) * phi(w), 0}
		}
		return refPieces(f, []float64{-9, -4, -1.5, 0, 1.5, 4, 9}, 1e-11, 1e-16)
	}
	if math.IsInf(d.nu, 1) {
		return h(c)
	}
	f := func(s float64) pair {
		return pair{sDensity(s, d.nu) * h(c*s), 0}
	}
	return refPieces(f, sBreaks(d.nu), 1e-11, 1e-15)
}

// refPieces is integratePieces with the bisection depth bounded by 16 (a
// panel 65536 times narrower than its piece), so that integrands with
// rounding noise above the tolerance (H(0) = 1 up to rounding, ν = 1)
// cannot bisect without end.
func refPieces(f func(float64) pair, breaks []float64, rel, abs float64) float64 {
	var sum float64
	for i := 1; i < len(breaks); i++ {
		sum += adaptiveGK(f, breaks[i-1], breaks[i], rel, abs, 16).v
	}
	return sum
}

func TestManyToOneFastMatchesAdaptive(t *testing.T) {
	t.Parallel()
	// The product method (fixed rules and a Chebyshev table of the inner
	// integral) against the nested adaptive quadrature it replaced, on
	// equal replication (ρ = ½, Dunnett 1955), one-way unequal replication
	// (product form, Dunnett 1955 §3) with λ up to 0.95, and a blocked
	// layout with one plot missing (also a product form), over small and
	// large error df and the whole range of p.
	cases := []struct {
		name string
		corr []float64
		k    int
	}{
		{"equal k=2", equicorrelated(2, 0.5), 2},
		{"equal k=9", equicorrelated(9, 0.5), 9},
		{"equal k=299", equicorrelated(299, 0.5), 299},
		{"one-way 6:4,4,3,5,2", productCorr(6, []float64{4, 4, 3, 5, 2}), 5},
		{"one-way 1:10,2,5", productCorr(1, []float64{10, 2, 5}), 3},
		{"rcbd 10x4 one missing", rcbdCorr(10, 4, [][2]int{{7, 2}}), 9},
		{"rcbd 10x4 check missing", rcbdCorr(10, 4, [][2]int{{0, 1}}), 9},
	}
	nus := []float64{1, 2, 26, 897, math.Inf(1)}
	if testing.Short() {
		nus = []float64{2, 26}
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			t.Parallel()
			for _, nu := range nus {
				d, err := NewManyToOne(tc.corr, tc.k, nu, 0)
				if err != nil {
					t.Fatal(err)
				}
				if d.Method() != ProductMethod {
					t.Fatalf("method %s", d.Method())
				}
				for _, c := range []float64{-2, 0.5, 1.5, 2.6, 3.5, 5.5, 15} {
					for _, two := range []bool{true, false} {
						if two && c < 0 {
							continue
						}
						got, want := d.Survival(c, two), adaptiveSurvival(d, c, two)
						if math.Abs(got-want) > 1e-11 {
							t.Errorf("nu=%g c=%g two=%v: fast %.15g, adaptive %.15g (diff %.2g)", nu, c, two, got, want, got-want)
						}
					}
				}
			}
		})
	}
}

func TestManyToOneOrthant(t *testing.T) {
	t.Parallel()
	// With ρ = ½ the comparisons are (X_i − X_0)/√2 for independent X, so
	// P(all T_i < 0) is the chance that X_0 is the largest of k + 1, 1/(k+1),
	// whatever ν (common practice; the classic orthant probability of
	// equicorrelated normals), and P(max |T_i| > 0) = 1.
	for _, k := range []int{1, 4, 9, 299} {
		for _, nu := range []float64{1, 5, 40, math.Inf(1)} {
			d, err := NewManyToOne(equicorrelated(k, 0.5), k, nu, 0)
			if err != nil {
				t.Fatal(err)
			}
			if got, want := d.Survival(0, false), 1-1/float64(k+1); math.Abs(got-want) > 1e-11 {
				t.Errorf("k=%d nu=%g: P(max T > 0) %.15g, want %.15g", k, nu, got, want)
			}
			if got := d.Survival(0, true); math.Abs(got-1) > 1e-11 {
				t.Errorf("k=%d nu=%g: P(max |T| > 0) %.15g, want 1", k, nu, got)
			}
		}
	}
}

func TestManyToOneLatticeQuantile(t *testing.T) {
	t.Parallel()
	// The lattice method's critical value comes from Newton steps started
	// at the one-factor critical value; at it the lattice survival must be
	// alpha to within the stated error. The matrices: an RCBD with 10
	// entries in 4 blocks and two plots missing, as in the demo trial
	// (common practice: (X'X)⁻¹ of the additive model), where the one-factor
	// critical value is already within the error, and the 4 × 4 matrix of
	// TestManyToOneLatticeGeneral, far from one-factor, where it is not.
	general := []float64{
		1, 0.5, 0.45, 0.5,
		0.5, 1, 0.62, 0.4,
		0.45, 0.62, 1, 0.5,
		0.5, 0.4, 0.5, 1,
	}
	for _, tc := range []struct {
		r      []float64
		k      int
		nu     float64
		moves  bool
		alphas []float64
		sides  []bool
	}{
		{rcbdCorr(10, 4, [][2]int{{1, 0}, {7, 2}}), 9, 25, false, []float64{0.05, 0.01}, []bool{true, false}},
		{general, 4, 12, true, []float64{0.05}, []bool{true}},
	} {
		d, err := NewManyToOne(tc.r, tc.k, tc.nu, 0)
		if err != nil || d.Method() != LatticeMethod {
			t.Fatalf("%v %v", err, d.Method())
		}
		for _, alpha := range tc.alphas {
			for _, two := range tc.sides {
				c := d.Quantile(alpha, two)
				if p := d.Survival(c, two); math.Abs(p-alpha) > d.Error() {
					t.Errorf("k=%d alpha=%g two=%v: critical %.8f has survival %.9f", tc.k, alpha, two, c, p)
				}
				f := bisectQuantile(alpha, two, func(c float64) float64 { return d.productSurvival(c, two) })
				if tc.moves && math.Abs(f-c) < 1e-4 {
					t.Errorf("k=%d alpha=%g two=%v: critical %.8f is the one-factor one", tc.k, alpha, two, c)
				}
			}
		}
	}
}

func TestWRuleSymmetric(t *testing.T) {
	t.Parallel()
	// condSurvival reads node n−1−j as the mirror image of node j.
	for _, lam := range [][]float64{{0.7071}, {0.3, 0.95}, {0}} {
		xs, ws := wRule(lam)
		n := len(xs)
		for j := range xs {
			if math.Abs(xs[j]+xs[n-1-j]) > 1e-14 || math.Abs(ws[j]-ws[n-1-j]) > 1e-16 {
				t.Fatalf("λ %v: node %d (%g, %g) and %d (%g, %g) are not mirror images", lam, j, xs[j], ws[j], n-1-j, xs[n-1-j], ws[n-1-j])
			}
		}
	}
}

func TestManyToOneLatticeFiniteDF(t *testing.T) {
	t.Parallel()
	// The lattice method with error df (the S dimension of the lattice) on
	// a structure far from one-factor, against an independent double
	// integral: a tensor Gauss–Legendre rule on the 4-variate normal density
	// over the cube (20 nodes a side) inside an 8-point Gauss–Legendre rule
	// on five pieces of S (between its 1e-9, 0.02, 0.3, 0.7, 0.98 and
	// 1 − 1e-9 quantiles). The reference is good to about 1e-9 (6 or 10 S
	// nodes, 20 or 32 cube nodes agree to 2e-9); the lattice must be within
	// its stated error.
	r := []float64{
		1, 0.5, 0.45, 0.5,
		0.5, 1, 0.62, 0.4,
		0.45, 0.62, 1, 0.5,
		0.5, 0.4, 0.5, 1,
	}
	const nu = 6
	d, err := NewManyToOne(r, 4, nu, 0)
	if err != nil || d.Method() != LatticeMethod {
		t.Fatalf("%v %v", err, d.Method())
	}
	chi := distuv.ChiSquared{K: nu}
	q := func(p float64) float64 { return math.Sqrt(chi.Quantile(p) / nu) }
	br := []float64{q(1e-9), q(0.02), q(0.3), q(0.7), q(0.98), q(1 - 1e-9)}
	for _, c := range []float64{2.0, 2.8} {
		var want float64
		for i := 1; i < len(br); i++ {
			want += quad.Fixed(func(s float64) float64 { return sDensity(s, nu) * (1 - cubeInsideN(c*s, r, 20)) }, br[i-1], br[i], 8, nil, 0)
		}
		if got := d.Survival(c, true); math.Abs(got-want) > d.Error() {
			t.Errorf("c=%g: lattice %.9f, quadrature %.9f (stated error %g)", c, got, want, d.Error())
		}
	}
}
