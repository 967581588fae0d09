package dist

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// equicorrelated returns the k × k matrix with ρ off the diagonal.
func equicorrelated(k int, rho float64) []float64 {
	r := make([]float64, k*k)
	for i := 0; i < k; i++ {
		for j := 0; j < k; j++ {
			r[i*k+j] = rho
		}
		r[i*k+i] = 1
	}
	return r
}

// productCorr returns R_ij = λ_iλ_j for the one-way many-to-one layout
// with n0 control plots and n_i treatment plots: λ_i = √(n_i/(n_i+n_0))
// (Dunnett 1955, §3).
func productCorr(n0 float64, n []float64) []float64 {
	k := len(n)
	r := make([]float64, k*k)
	for i := 0; i < k; i++ {
		for j := 0; j < k; j++ {
			r[i*k+j] = math.Sqrt(n[i]/(n[i]+n0)) * math.Sqrt(n[j]/(n[j]+n0))
		}
		r[i*k+i] = 1
	}
	return r
}

func TestManyToOneOneComparisonIsT(t *testing.T) {
	t.Parallel()
	// With one comparison the statistic is Student's t (gonum's StudentsT).
	for _, nu := range []float64{1, 2, 3, 12, 60} {
		d, err := NewManyToOne([]float64{1}, 1, nu, 0)
		if err != nil {
			t.Fatal(err)
		}
		st := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}
		for _, c := range []float64{0.5, 1.7, 2.9, 5} {
			if got, want := d.Survival(c, true), 2*st.Survival(c); math.Abs(got-want) > 1e-11 {
				t.Errorf("nu=%g c=%g two-sided %.15g, want %.15g", nu, c, got, want)
			}
			if got, want := d.Survival(c, false), st.Survival(c); math.Abs(got-want) > 1e-11 {
				t.Errorf("nu=%g c=%g one-sided %.15g, want %.15g", nu, c, got, want)
			}
		}
	}
}

// bvnSquare is P(|X| ≤ u, |Y| ≤ u) (two-sided) or P(X ≤ u, Y ≤ u) for a
// standard bivariate normal with correlation rho, by 2-D Gauss–Legendre
// quadrature of the density itself (no factor representation).
func bvnSquare(u, rho float64, twoSided bool) float64 {
	lo := -u
	if !twoSided {
		lo = -10
	}
	c := 1 / (2 * math.Pi * math.Sqrt(1-rho*rho))
	inner := func(x float64) float64 {
		f := func(y float64) float64 {
			return c * math.Exp(-(x*x-2*rho*x*y+y*y)/(2*(1-rho*rho)))
		}
		return quad.Fixed(f, lo, u, 80, nil, 0)
	}
	return quad.Fixed(inner, lo, u, 80, nil, 0)
}

func TestManyToOneTwoComparisonsAgainstQuadrature(t *testing.T) {
	t.Parallel()
	// k = 2: the bivariate t probability by direct 2-D quadrature of the
	// bivariate normal density, then over S by Gauss–Legendre — an
	// independent route to the double integral of Dunnett (1955).
	for _, c := range []struct {
		rho, nu, c float64
		two        bool
	}{
		{0.5, math.Inf(1), 2.2121, true}, {0.5, 10, 2.57, true}, {0.3, 20, 1.9, false}, {0.7, 6, 2.3, true},
	} {
		d, err := NewManyToOne([]float64{1, c.rho, c.rho, 1}, 2, c.nu, 0)
		if err != nil {
			t.Fatal(err)
		}
		var want float64
		if math.IsInf(c.nu, 1) {
			want = 1 - bvnSquare(c.c, c.rho, c.two)
		} else {
			chi := distuv.ChiSquared{K: c.nu}
			hi := math.Sqrt(chi.Quantile(1-1e-13) / c.nu)
			lo := math.Sqrt(chi.Quantile(1e-13) / c.nu)
			f := func(s float64) float64 {
				return math.Exp(logScaledChiDensity(s, c.nu)) * (1 - bvnSquare(c.c*s, c.rho, c.two))
			}
			want = quad.Fixed(f, lo, hi, 60, nil, 0)
		}
		if got := d.Survival(c.c, c.two); math.Abs(got-want) > 1e-9 {
			t.Errorf("rho=%g nu=%g c=%g two=%v: %.12g, quadrature %.12g", c.rho, c.nu, c.c, c.two, got, want)
		}
	}
}

func TestManyToOneDunnettTables(t *testing.T) {
	t.Parallel()
	// Critical values for equal replication (ρ = ½), ν = ∞, α = 0.05, from
	// Dunnett's tables (Dunnett 1955 one-sided, Dunnett 1964 two-sided;
	// values from memory, to the 2 decimals printed).
	for _, c := range []struct {
		k    int
		two  bool
		want float64
	}{
		{2, true, 2.21}, {3, true, 2.35}, {4, true, 2.44}, {5, true, 2.51},
		{2, false, 1.92}, {3, false, 2.06}, {4, false, 2.16}, {5, false, 2.23},
	} {
		d, err := NewManyToOne(equicorrelated(c.k, 0.5), c.k, math.Inf(1), 0)
		if err != nil {
			t.Fatal(err)
		}
		if d.Method() != ProductMethod {
			t.Fatalf("method %s", d.Method())
		}
		if got := d.Quantile(0.05, c.two); math.Abs(got-c.want) > 0.0051 {
			t.Errorf("k=%d two=%v: critical %.4f, table %.2f", c.k, c.two, got, c.want)
		}
	}
}

func TestManyToOneMonteCarlo(t *testing.T) {
	t.Parallel()
	// Unequal replication in a one-way layout (product structure) against
	// draws of the definition.
	n := []float64{4, 4, 3, 5, 2}
	r := productCorr(6, n)
	d, err := NewManyToOne(r, len(n), 15, 0)
	if err != nil || d.Method() != ProductMethod {
		t.Fatalf("%v %v", err, d.Method())
	}
	lam := make([]float64, len(n))
	for i := range n {
		lam[i] = math.Sqrt(n[i] / (n[i] + 6))
	}
	rng := rand.New(rand.NewPCG(21, 4))
	chi := distuv.ChiSquared{K: 15, Src: rng}
	const draws = 200000
	const c = 2.4
	over := 0
	for i := 0; i < draws; i++ {
		w := rng.NormFloat64()
		s := math.Sqrt(chi.Rand() / 15)
		for j := range lam {
			z := math.Sqrt(1-lam[j]*lam[j])*rng.NormFloat64() + lam[j]*w
			if math.Abs(z/s) > c {
				over++
				break
			}
		}
	}
	p := float64(over) / draws
	se := math.Sqrt(p * (1 - p) / draws)
	if got := d.Survival(c, true); math.Abs(got-p) > 4*se {
		t.Errorf("survival %.6f, Monte Carlo %.6f ± %.2g", got, p, se)
	}
}

// cubeInside is P(|Z_i| ≤ u for all i) for a 4-variate standard normal
// with correlation matrix r, by a tensor Gauss–Legendre rule (32 nodes a
// side) on the density itself over the cube.
func cubeInside(u float64, r []float64) float64 { return cubeInsideN(u, r, 32) }

// cubeInsideN is cubeInside with the given number of nodes a side.
func cubeInsideN(u float64, r []float64, nodes int) float64 {
	const k = 4
	var ch mat.Cholesky
	if !ch.Factorize(mat.NewSymDense(k, append([]float64(nil), r...))) {
		panic("not positive definite")
	}
	var inv mat.SymDense
	if err := ch.InverseTo(&inv); err != nil {
		panic(err)
	}
	norm := 1 / (math.Pow(2*math.Pi, k/2.0) * math.Sqrt(ch.Det()))
	x := make([]float64, nodes)
	w := make([]float64, nodes)
	quad.Legendre{}.FixedLocations(x, w, -u, u)
	var sum float64
	var z [k]float64
	var idx [k]int

	for {
		wt := 1.0
		for i := 0; i < k; i++ {
			z[i] = x[idx[i]]
			wt *= w[idx[i]]
		}
		var q float64
		for i := 0; i < k; i++ {
			for j := 0; j < k; j++ {
				q += z[i] * inv.At(i, j) * z[j]
			}
		}
		sum += wt * norm * math.Exp(-q/2)
		i := 0
		for ; i < k; i++ {
			idx[i]++
			if idx[i] < nodes {
				break
			}
			idx[i] = 0
		}
		if i == k {
			return sum
		}
	}
}

func TestManyToOneLatticeGeneral(t *testing.T) {
	t.Parallel()
	// A correlation matrix that is not λλ' (as blocked layouts with missing
	// plots give; with 3 comparisons every positive R is λλ', so 4 are
	// needed): the lattice rule against a tensor Gauss–Legendre integral of
	// the 4-variate normal density over the cube (ν = ∞), within the stated
	// error.
	r := []float64{
		1, 0.5, 0.45, 0.5,
		0.5, 1, 0.62, 0.4,
		0.45, 0.62, 1, 0.5,
		0.5, 0.4, 0.5, 1,
	}
	d, err := NewManyToOne(r, 4, math.Inf(1), 0)
	if err != nil {
		t.Fatal(err)
	}
	if d.Method() != LatticeMethod {
		t.Fatalf("method %s (residual %g)", d.Method(), d.MaxFactorResidual())
	}
	for _, c := range []float64{1.6, 2.3, 2.9} {
		want := 1 - cubeInside(c, r)
		if got := d.Survival(c, true); math.Abs(got-want) > d.Error() {
			t.Errorf("c=%g: lattice %.9f, quadrature %.9f (stated error %g)", c, got, want, d.Error())
		}
	}
}

func TestManyToOneChoosesMethod(t *testing.T) {
	t.Parallel()
	// A general structure (not λλ'): lattice for small k, factor beyond.
	k := 4
	r := equicorrelated(k, 0.5)
	r[0*k+1], r[1*k+0] = 0.3, 0.3
	d, err := NewManyToOne(r, k, 10, 0)
	if err != nil || d.Method() != LatticeMethod || !(d.MaxFactorResidual() > 1e-3) {
		t.Errorf("method %v residual %g err %v", d.Method(), d.MaxFactorResidual(), err)
	}
	big := LatticeMaxK + 5
	rb := equicorrelated(big, 0.5)
	rb[1], rb[big] = 0.45, 0.45
	db, err := NewManyToOne(rb, big, 30, 0)
	if err != nil || db.Method() != FactorMethod || !math.IsNaN(db.Error()) {
		t.Errorf("big: method %v err %v", db.Method(), err)
	}
	if _, err := NewManyToOne([]float64{1, 2, 2, 1}, 2, 5, 0); err == nil {
		t.Error("correlation 2 accepted")
	}
}

func BenchmarkManyToOneProduct300(b *testing.B) {
	n := make([]float64, 300)
	for i := range n {
		n[i] = 4
	}
	n[7], n[100] = 3, 3
	r := productCorr(4, n)
	for i := 0; i < b.N; i++ {
		d, _ := NewManyToOne(r, len(n), 897, 0)
		d.Survival(3.1, true)
	}
}

func TestManyToOneFactorMatchesAdaptive(t *testing.T) {
	t.Parallel()
	// The factor approximation integrates the closest one-factor structure
	// by the product method's fast path (Chebyshev table of the inner
	// integral); on a general structure with k > LatticeMaxK its survival
	// equals the nested adaptive quadrature of that structure's grouped λ
	// (adaptiveSurvival) to 1e-11, so its only error is the approximation.
	k := LatticeMaxK + 20
	r := equicorrelated(k, 0.5)
	for i := 0; i < 10; i++ {
		j := (7*i + 3) % k
		r[i*k+j], r[j*k+i] = 0.4, 0.4
	}
	d, err := NewManyToOne(r, k, 20, 0)
	if err != nil || d.Method() != FactorMethod {
		t.Fatalf("%v %v", err, d.Method())
	}
	for _, c := range []float64{-1.5, 0.3, 1.9, 2.6, 3.4, 4.8} {
		for _, two := range []bool{true, false} {
			if two && c < 0 {
				continue
			}
			a, b := adaptiveSurvival(d, c, two), d.Survival(c, two)
			if math.Abs(a-b) > 1e-11 {
				t.Errorf("c=%g two=%v: adaptive %.13g, table %.13g", c, two, a, b)
			}
		}
	}
}
