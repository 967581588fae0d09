package stats

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// compareFits requires two fits of the same data to agree to tol.
func compareFits(t *testing.T, what string, a, b *ANOVA, tol float64) {
	t.Helper()
	if len(a.Sources) != len(b.Sources) {
		t.Fatalf("%s: %d vs %d lines", what, len(a.Sources), len(b.Sources))
	}
	tot, _ := a.Total()
	scale := tot.SS // total SS: SS near 0 compared on this scale
	for i := range a.Sources {
		sa, sb := a.Sources[i], b.Sources[i]
		if sa.Name != sb.Name || sa.Role != sb.Role || sa.DF != sb.DF || sa.HasTest != sb.HasTest {
			t.Errorf("%s: line %d: %+v vs %+v", what, i, sa, sb)
		}
		if math.Abs(sa.SS-sb.SS) > tol*scale {
			t.Errorf("%s: %s SS %.15g vs %.15g", what, sa.Name, sa.SS, sb.SS)
		}
		if sa.HasTest && math.Abs(sa.P-sb.P) > tol*math.Max(sa.P, 1e-3) {
			t.Errorf("%s: %s P %.15g vs %.15g", what, sa.Name, sa.P, sb.P)
		}
	}
	checkRel(t, what+" MSE", a.MSE, b.MSE, tol)
	checkRel(t, what+" R²", a.RSquared, b.RSquared, tol)
	for i := range a.Means {
		checkRel(t, what+" LS mean", a.Means[i].Mean, b.Means[i].Mean, tol)
		checkRel(t, what+" raw mean", a.Means[i].RawMean, b.Means[i].RawMean, tol)
		checkRel(t, what+" SE", a.Means[i].SE, b.Means[i].SE, tol)
		for j := range a.Means {
			checkRel(t, what+" pair SE", a.PairSE(i, j), b.PairSE(i, j), tol)
		}
	}
	ys := math.Sqrt(scale / float64(a.N))
	for i := range a.Fitted {
		if math.Abs(a.Fitted[i]-b.Fitted[i]) > tol*(ys+math.Abs(a.Fitted[i])) ||
			math.Abs(a.Residuals[i]-b.Residuals[i]) > tol*(ys+math.Abs(a.Fitted[i])) {
			t.Errorf("%s: fitted/residual %d differ", what, i)
		}
		if math.Abs(a.Leverage[i]-b.Leverage[i]) > tol {
			t.Errorf("%s: leverage %d: %.15g vs %.15g", what, i, a.Leverage[i], b.Leverage[i])
		}
	}
}

// TestBalancedClosedFormMatchesQR: on random balanced RCBDs and Latin
// squares the closed forms and the absorbed-QR least-squares path give the
// same answer to 1e-10 (property test; both are exact least squares).
func TestBalancedClosedFormMatchesQR(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := 0; trial < 40; trial++ {
		var m Model
		if trial%4 == 3 {
			s := 3 + rng.IntN(6)
			m = latin(s, func(r, c int) float64 { return 50 + 5*rng.NormFloat64() + float64(r) })
		} else {
			tr, r := 2+rng.IntN(30), 2+rng.IntN(5)
			off := 1000 * rng.Float64()
			m = rcbd(tr, r, func(i, b int) float64 { return off + float64(i%3) + 2*float64(b) + rng.NormFloat64() })
		}
		a, err := fit(m, false)
		if err != nil {
			t.Fatal(err)
		}
		b, err := fit(m, true)
		if err != nil {
			t.Fatal(err)
		}
		if !a.Balanced || !b.Balanced || a.Adjusted || b.Adjusted {
			t.Fatalf("balanced design not seen as balanced")
		}
		checkFinite(t, a)
		checkFinite(t, b)
		compareFits(t, "balanced", a, b, 1e-10)
	}
}

// denseRef fits the full dummy-variable model [1, treatments, nuisances]
// (treatment contrasts) with gonum's dense QR and returns SSE, the hat
// diagonal from the thin Q, the emmeans-style LS means (nuisance effects
// averaged with equal weight over levels) and their covariance divided by
// σ², from (XᵀX)⁻¹. It is an independent, textbook least-squares reference
// (any linear models text, e.g. Searle 1971, Linear Models; from memory).
func denseRef(t *testing.T, m Model) (sse float64, hat, ls []float64, cov *mat.Dense) {
	t.Helper()
	n := len(m.Response)
	fs := append([]Factor{m.Treatment}, m.Nuisance...)
	p := 1
	for _, f := range fs {
		p += f.Levels - 1
	}
	x := mat.NewDense(n, p, nil)
	for i := 0; i < n; i++ {
		x.Set(i, 0, 1)
		c := 1
		for _, f := range fs {
			if l := f.Index[i]; l > 0 {
				x.Set(i, c+l-1, 1)
			}
			c += f.Levels - 1
		}
	}
	var qr mat.QR
	qr.Factorize(x)
	var beta mat.VecDense
	if err := qr.SolveVecTo(&beta, false, mat.NewVecDense(n, m.Response)); err != nil {
		t.Fatal(err)
	}
	var fit mat.VecDense
	fit.MulVec(x, &beta)
	for i := 0; i < n; i++ {
		e := m.Response[i] - fit.AtVec(i)
		sse += e * e
	}
	var q mat.Dense
	qr.QTo(&q)
	hat = make([]float64, n)
	for i := 0; i < n; i++ {
		for j := 0; j < p; j++ {
			hat[i] += q.At(i, j) * q.At(i, j)
		}
	}
	var xtx, inv mat.Dense
	xtx.Mul(x.T(), x)
	if err := inv.Inverse(&xtx); err != nil {
		t.Fatal(err)
	}
	k := m.Treatment.Levels
	L := mat.NewDense(k, p, nil)
	for i := 0; i < k; i++ {
		L.Set(i, 0, 1)
		if i > 0 {
			L.Set(i, i, 1)
		}
		c := k
		for _, f := range m.Nuisance {
			for l := 1; l < f.Levels; l++ {
				L.Set(i, c+l-1, 1/float64(f.Levels))
			}
			c += f.Levels - 1
		}
	}
	var lsv mat.VecDense
	lsv.MulVec(L, &beta)
	ls = make([]float64, k)
	for i := range ls {
		ls[i] = lsv.AtVec(i)
	}
	var tmp mat.Dense
	tmp.Mul(L, &inv)
	cov = &mat.Dense{}
	cov.Mul(&tmp, L.T())
	return sse, hat, ls, cov
}

// TestUnbalancedAgainstDenseLS: RCBDs and Latin squares with missing plots
// (random data; the reference is gonum's dense QR in denseRef), fitted by
// the absorbed QR, against the full dense least-squares fit:
// SSE, leverages, LS means, their SEs and every pair SE.
func TestUnbalancedAgainstDenseLS(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(3, 4))
	models := []Model{
		rcbd(7, 4, func(i, b int) float64 { return 20 + float64(i) + 3*float64(b) + rng.NormFloat64() }, "0,0", "3,2", "6,3"),
		rcbd(12, 3, func(i, b int) float64 { return 5 + rng.NormFloat64() }, "11,0", "11,1", "4,2"),
		latin(6, func(r, c int) float64 { return 40 + float64(r*c%5) + rng.NormFloat64() }, "0,0", "2,3", "5,1"),
		latin(5, func(r, c int) float64 { return 40 + float64(c) + rng.NormFloat64() }, "4,4"),
	}
	for mi, m := range models {
		a, err := Fit(m)
		if err != nil {
			t.Fatal(err)
		}
		checkFinite(t, a)
		if a.Balanced || !a.Adjusted {
			t.Errorf("model %d: Balanced %v Adjusted %v", mi, a.Balanced, a.Adjusted)
		}
		sse, hat, ls, cov := denseRef(t, m)
		errLine, _ := a.Error()
		checkRel(t, "SSE", errLine.SS, sse, 1e-10)
		for i, h := range hat {
			if math.Abs(a.Leverage[i]-h) > 1e-10 {
				t.Errorf("model %d: leverage %d = %.15g, want %.15g", mi, i, a.Leverage[i], h)
			}
		}
		k := m.Treatment.Levels
		for i := 0; i < k; i++ {
			checkRel(t, "LS mean", a.Means[i].Mean, ls[i], 1e-10)
			checkRel(t, "SE", a.Means[i].SE, math.Sqrt(a.MSE*cov.At(i, i)), 1e-10)
			for j := 0; j < k; j++ {
				if i == j {
					continue
				}
				want := math.Sqrt(a.MSE * (cov.At(i, i) + cov.At(j, j) - 2*cov.At(i, j)))
				checkRel(t, "pair SE", a.PairSE(i, j), want, 1e-10)
			}
		}
		// Type II SS of each factor: the SSE of the model without it minus
		// the full SSE, from dense fits with the factor dropped.
		for f := -1; f < len(m.Nuisance); f++ {
			red := Model{Response: m.Response}
			var name string
			if f < 0 {
				// Without treatment: put the first nuisance factor in the
				// treatment slot so denseRef can fit it.
				red.Treatment = m.Nuisance[0]
				red.Nuisance = m.Nuisance[1:]
				name = m.Treatment.Name
			} else {
				red.Treatment = m.Treatment
				red.Nuisance = append(append([]Factor(nil), m.Nuisance[:f]...), m.Nuisance[f+1:]...)
				name = m.Nuisance[f].Name
			}
			sseRed, _, _, _ := denseRef(t, red)
			got := a.Sources[f+1].SS
			if a.Sources[f+1].Name != name {
				t.Fatalf("line %d is %q, want %q", f+1, a.Sources[f+1].Name, name)
			}
			checkRel(t, name+" type II SS", got, sseRed-sse, 1e-9)
		}
	}
}

// TestOneWayUnequalReplication: a one-way layout with unequal replication
// (invented data) uses the one-way formulas (not adjusted) and agrees with
// the dense gonum QR fit of denseRef. The pair SE check uses the usual
// √(MSE(1/rᵢ + 1/rⱼ)) for unequal replication (common practice; e.g. Gomez &
// Gomez 1984, chapter 5, from memory); the SS identity is a property.
func TestOneWayUnequalReplication(t *testing.T) {
	t.Parallel()
	m := oneWay(3, []int{0, 0, 0, 1, 1, 2, 2, 2, 2}, []float64{5.1, 4.9, 5.6, 6.2, 6.8, 4.0, 4.4, 3.9, 4.6})
	a, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	if a.Balanced || a.Adjusted || a.SEMean != nil || a.SED != nil {
		t.Errorf("Balanced %v Adjusted %v SEMean %v SED %v", a.Balanced, a.Adjusted, a.SEMean, a.SED)
	}
	sse, hat, ls, cov := denseRef(t, m)
	checkRel(t, "SSE", a.MSE*float64(a.DFError), sse, 1e-12)
	for i := range hat {
		checkRel(t, "leverage", a.Leverage[i], hat[i], 1e-12)
	}
	for i := range ls {
		checkRel(t, "mean", a.Means[i].Mean, ls[i], 1e-12)
		checkRel(t, "SE", a.Means[i].SE, math.Sqrt(a.MSE*cov.At(i, i)), 1e-12)
	}
	checkRel(t, "pair SE", a.PairSE(0, 1), math.Sqrt(a.MSE*(1.0/3+1.0/2)), 1e-12)
	checkRel(t, "sum of SS", a.Sources[0].SS+a.Sources[1].SS, a.Sources[2].SS, 1e-13)
}
