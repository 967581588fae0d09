package dist

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/stat/distuv"
)

// nctByQuadrature computes P(T ≤ t) for the noncentral t from its
// definition, T = (Z + ncp)/sqrt(V/nu): P(T ≤ t) = E_V[Φ(t sqrt(V/nu) - ncp)],
// integrated over the χ²(nu) density with Gauss–Legendre quadrature. It shares
// no code with Lenth's series in NoncentralT.CDF.
func nctByQuadrature(t, nu, ncp float64) float64 {
	chi := distuv.ChiSquared{K: nu}
	hi := chi.Quantile(1 - 1e-15)
	f := func(v float64) float64 {
		return distuv.UnitNormal.CDF(t*math.Sqrt(v/nu)-ncp) * chi.Prob(v)
	}
	// Split at the mode, where the χ² density bends most.
	mid := math.Max(nu-2, 1)
	return quad.Fixed(f, 0, mid, 400, nil, 0) + quad.Fixed(f, mid, hi, 2000, nil, 0)
}

func TestNoncentralTAgainstDefinition(t *testing.T) {
	t.Parallel()
	// Reference: numerical integration of the definition (independent of
	// Lenth's series, Applied Statistics 38, 185–189).
	for _, c := range []struct{ t, nu, ncp float64 }{
		{2.0796, 21, 2.9381}, {-1.5, 10, 0.5}, {0.5, 4, -1.2}, {3, 38, 5.5},
		{1.7, 16, 3.1}, {-2.2, 6, -2.5}, {0, 9, 1.0}, {6, 60, 9},
	} {
		want := nctByQuadrature(c.t, c.nu, c.ncp)
		d := NoncentralT{Nu: c.nu, Ncp: c.ncp}
		if got := d.CDF(c.t); math.Abs(got-want) > 1e-9 {
			t.Errorf("CDF(%g; nu=%g, ncp=%g) = %.12g, want %.12g", c.t, c.nu, c.ncp, got, want)
		}
		if got := d.Survival(c.t); math.Abs(got-(1-want)) > 1e-9 {
			t.Errorf("Survival(%g; nu=%g, ncp=%g) = %.12g, want %.12g", c.t, c.nu, c.ncp, got, 1-want)
		}
	}
}

func TestNoncentralTCentralCase(t *testing.T) {
	t.Parallel()
	// With Ncp = 0 the distribution is Student's t (gonum's distuv.StudentsT
	// as the reference).
	for _, nu := range []float64{1, 3, 12, 100} {
		st := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}
		d := NoncentralT{Nu: nu}
		for _, x := range []float64{-4, -1, -0.2, 0, 0.7, 2.5} {
			if got, want := d.CDF(x), st.CDF(x); math.Abs(got-want) > 1e-13 {
				t.Errorf("nu=%g CDF(%g) = %.15g, want %.15g", nu, x, got, want)
			}
		}
	}
}

func TestNoncentralTMoments(t *testing.T) {
	t.Parallel()
	// Mean and variance against Monte Carlo draws of the definition.
	d := NoncentralT{Nu: 12, Ncp: 1.5}
	rng := rand.New(rand.NewPCG(7, 11))
	chi := distuv.ChiSquared{K: d.Nu, Src: rng}
	const n = 400000
	var sum, sum2 float64
	for i := 0; i < n; i++ {
		x := (rng.NormFloat64() + d.Ncp) / math.Sqrt(chi.Rand()/d.Nu)
		sum += x
		sum2 += x * x
	}
	mean := sum / n
	v := sum2/n - mean*mean
	if math.Abs(mean-d.Mean()) > 4*math.Sqrt(v/n) {
		t.Errorf("Mean = %g, Monte Carlo %g", d.Mean(), mean)
	}
	if math.Abs(v-d.Variance())/d.Variance() > 0.02 {
		t.Errorf("Variance = %g, Monte Carlo %g", d.Variance(), v)
	}
}

func TestNoncentralFOneNumeratorDF(t *testing.T) {
	t.Parallel()
	// With D1 = 1, F = T² for T noncentral t with Ncp = sqrt(Lambda):
	// P(F ≤ f) = P(-√f ≤ T ≤ √f) (Johnson, Kotz & Balakrishnan 1995,
	// ch. 30/31). The two sides use different series.
	for _, c := range []struct{ f, d2, lambda float64 }{
		{4.3, 21, 8.6}, {1, 5, 0.3}, {9, 40, 25}, {0.2, 3, 2},
	} {
		nct := NoncentralT{Nu: c.d2, Ncp: math.Sqrt(c.lambda)}
		want := nct.CDF(math.Sqrt(c.f)) - nct.CDF(-math.Sqrt(c.f))
		d := NoncentralF{D1: 1, D2: c.d2, Lambda: c.lambda}
		if got := d.CDF(c.f); math.Abs(got-want) > 1e-10 {
			t.Errorf("CDF(%g; 1, %g, %g) = %.12g, want %.12g", c.f, c.d2, c.lambda, got, want)
		}
		if got := d.Survival(c.f); math.Abs(got-(1-want)) > 1e-10 {
			t.Errorf("Survival(%g; 1, %g, %g) = %.12g, want %.12g", c.f, c.d2, c.lambda, got, 1-want)
		}
	}
}

func TestNoncentralFCentralAndMonteCarlo(t *testing.T) {
	t.Parallel()
	// Lambda = 0 is the central F (gonum's distuv.F as the reference).
	for _, c := range []struct{ d1, d2, f float64 }{{3, 10, 2.1}, {7, 21, 0.8}, {19, 38, 1.9}} {
		want := distuv.F{D1: c.d1, D2: c.d2}.CDF(c.f)
		if got := (NoncentralF{D1: c.d1, D2: c.d2}).CDF(c.f); math.Abs(got-want) > 1e-13 {
			t.Errorf("central CDF(%g; %g, %g) = %.15g, want %.15g", c.f, c.d1, c.d2, got, want)
		}
	}
	// Noncentral, D1 > 1: Monte Carlo draws of the definition
	// (U noncentral χ² as a sum of squared shifted normals).
	d := NoncentralF{D1: 4, D2: 15, Lambda: 6}
	rng := rand.New(rand.NewPCG(3, 5))
	chi := distuv.ChiSquared{K: d.D2, Src: rng}
	shift := math.Sqrt(d.Lambda) // all noncentrality on one coordinate
	const n = 300000
	const f0 = 2.4
	below := 0
	for i := 0; i < n; i++ {
		z := rng.NormFloat64() + shift
		u := z * z
		for k := 1; k < int(d.D1); k++ {
			z := rng.NormFloat64()
			u += z * z
		}
		if (u/d.D1)/(chi.Rand()/d.D2) <= f0 {
			below++
		}
	}
	p := float64(below) / n
	se := math.Sqrt(p * (1 - p) / n)
	if got := d.CDF(f0); math.Abs(got-p) > 4*se {
		t.Errorf("CDF(%g; 4, 15, 6) = %.6g, Monte Carlo %.6g ± %.2g", f0, got, p, se)
	}
	if m := d.Mean(); math.Abs(m-15*(4+6)/(4*13.0)) > 1e-12 {
		t.Errorf("Mean = %g", m)
	}
}

func TestNoncentralPanics(t *testing.T) {
	t.Parallel()
	for name, f := range map[string]func(){
		"t nu 0":     func() { NoncentralT{Nu: 0, Ncp: 1}.CDF(1) },
		"t ncp NaN":  func() { NoncentralT{Nu: 3, Ncp: math.NaN()}.CDF(1) },
		"f lambda<0": func() { NoncentralF{D1: 2, D2: 3, Lambda: -1}.CDF(1) },
	} {
		func() {
			defer func() {
				if recover() == nil {
					t.Errorf("%s: no panic", name)
				}
			}()
			f()
		}()
	}
}

func BenchmarkNoncentralTCDF(b *testing.B) {
	d := NoncentralT{Nu: 38, Ncp: 2.9}
	for i := 0; i < b.N; i++ {
		d.CDF(2.02)
	}
}
