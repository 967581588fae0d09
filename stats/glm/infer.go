package glm

import (
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// inference is the covariance of the fixed-effect estimates as a function
// of a few variance parameters φ: C = Cov(β̂) at the estimate, D[i] =
// ∂C/∂φᵢ and A = Cov(φ̂). The variance of a contrast l'β̂ is l'Cl and its
// Satterthwaite (1946) degrees of freedom 2(l'Cl)²/(g'Ag) with gᵢ = l'Dᵢl.
// Three cases share it:
//   - one error (factorial): φ = σ², C = σ²(X'X)⁻, A = 2σ⁴/df, so every
//     contrast has the error df;
//   - balanced strata: φ = the error mean squares Eₖ, C linear in them,
//     A = diag(2Eₖ²/dfₖ): the classic Satterthwaite combination of mean
//     squares (Gomez & Gomez 1984, section 3.4);
//   - REML: φ = the variance components, A = 2H⁻¹ from the Hessian H of
//     the REML deviance (as in Kuznetsova, Brockhoff & Christensen 2017,
//     J. Stat. Softw. 82(13)).
type inference struct {
	p    int
	beta []float64
	c    *mat.SymDense
	d    []*mat.SymDense
	a    *mat.SymDense
	null [][]float64
	// fixedDF > 0 means every contrast has these degrees of freedom.
	fixedDF float64
}

// dfOf returns the Satterthwaite df of a variance v with gradient g.
func (in *inference) dfOf(v float64, g []float64) float64 {
	if in.fixedDF > 0 {
		return in.fixedDF
	}
	q := 0.0
	for i := range g {
		for j := range g {
			q += g[i] * in.a.At(i, j) * g[j]
		}
	}
	if !(q > 0) {
		return math.Inf(1)
	}
	df := 2 * v * v / q
	// A contrast within one stratum of a balanced design has that
	// stratum's df; keep it whole despite rounding.
	if r := math.Round(df); math.Abs(df-r) < 1e-9*df {
		df = r
	}
	return df
}

// quad returns l'Sl.
func quad(s mat.Symmetric, l []float64) float64 {
	n := len(l)
	t := 0.0
	for i := range n {
		if l[i] == 0 {
			continue
		}
		r := 0.0
		for j := range n {
			if l[j] != 0 {
				r += s.At(i, j) * l[j]
			}
		}
		t += l[i] * r
	}
	return t
}

// family is the covariance of a set of estimates Lβ̂ (one row of L per
// estimate): M = LCL' and its derivatives, so pairs and slices cost O(1)
// each.
type family struct {
	in  *inference
	est []float64
	m   *mat.SymDense
	dm  []*mat.SymDense
}

func (in *inference) family(rows [][]float64) *family {
	k := len(rows)
	l := mat.NewDense(k, in.p, nil)
	for i, r := range rows {
		l.SetRow(i, r)
	}
	f := &family{in: in, est: make([]float64, k)}
	for i, r := range rows {
		s := 0.0
		for j, v := range r {
			s += v * in.beta[j]
		}
		f.est[i] = s
	}
	sandwich := func(s *mat.SymDense) *mat.SymDense {
		var t mat.Dense
		t.Mul(l, s)
		var u mat.Dense
		u.Mul(&t, l.T())
		out := mat.NewSymDense(k, nil)
		for i := range k {
			for j := i; j < k; j++ {
				out.SetSym(i, j, (u.At(i, j)+u.At(j, i))/2)
			}
		}
		return out
	}
	f.m = sandwich(in.c)
	if in.fixedDF == 0 {
		for _, d := range in.d {
			f.dm = append(f.dm, sandwich(d))
		}
	}
	return f
}

// contrast returns the variance and df of Σ w_i·est_i.
func (f *family) contrast(w []float64) (v, df float64) {
	v = quad(f.m, w)
	if f.in.fixedDF > 0 {
		return v, f.in.fixedDF
	}
	g := make([]float64, len(f.dm))
	for i, d := range f.dm {
		g[i] = quad(d, w)
	}
	return v, f.in.dfOf(v, g)
}

// pair returns the variance and df of est_i − est_j.
func (f *family) pair(i, j int) (v, df float64) {
	v = f.m.At(i, i) + f.m.At(j, j) - 2*f.m.At(i, j)
	if f.in.fixedDF > 0 {
		return v, f.in.fixedDF
	}
	g := make([]float64, len(f.dm))
	for k, d := range f.dm {
		g[k] = d.At(i, i) + d.At(j, j) - 2*d.At(i, j)
	}
	return v, f.in.dfOf(v, g)
}

// ftest is the Wald F test of the hypothesis W·est = 0 (rows of W are
// combinations of the family's estimates), with the denominator degrees of
// freedom of Fai & Cornelius (1996), J. Stat. Comput. Simul. 54, 363–378:
// the covariance of the contrasts is diagonalised, each of the q
// independent contrasts gets its Satterthwaite df νₘ, and with
// E = Σ νₘ/(νₘ−2) the F statistic has 2E/(E−q) denominator df (2 when
// some νₘ ≤ 2). With one error stratum every νₘ is the error df.
type ftest struct {
	ok      bool
	f, p    float64
	df      int
	dfDen   float64
	contrib []float64
}

func (fam *family) ftest(w [][]float64) ftest {
	q0 := len(w)
	if q0 == 0 {
		return ftest{}
	}
	k := len(fam.est)
	wm := mat.NewDense(q0, k, nil)
	for i, r := range w {
		wm.SetRow(i, r)
	}
	vl := symSandwich(wm, fam.m)
	var eig mat.EigenSym
	if !eig.Factorize(vl, true) {
		return ftest{}
	}
	vals := eig.Values(nil)
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	maxv := 0.0
	for _, v := range vals {
		maxv = math.Max(maxv, v)
	}
	if !(maxv > 0) {
		return ftest{}
	}
	tol := 1e-8 * maxv
	var t2sum float64
	var nus []float64
	q := 0
	for m := len(vals) - 1; m >= 0; m-- {
		if vals[m] <= tol {
			continue
		}
		q++
		// contrast vector over the estimates: P_mᵀ W
		c := make([]float64, k)
		for i := range q0 {
			pm := vecs.At(i, m)
			for j := range k {
				c[j] += pm * wm.At(i, j)
			}
		}
		e := 0.0
		for j := range k {
			e += c[j] * fam.est[j]
		}
		t2sum += e * e / vals[m]
		_, nu := fam.contrast(c)
		nus = append(nus, nu)
	}
	fv := t2sum / float64(q)
	ddf := faiCornelius(nus)
	res := ftest{ok: true, f: fv, df: q, dfDen: ddf}
	res.p = fSurvival(fv, float64(q), ddf)
	return res
}

// faiCornelius combines the df of q independent t statistics into the
// denominator df of their F statistic.
func faiCornelius(nu []float64) float64 {
	if len(nu) == 1 {
		return nu[0]
	}
	same := true
	for _, v := range nu[1:] {
		if math.Abs(v-nu[0]) > 1e-8*math.Max(1, math.Abs(nu[0])) {
			same = false
		}
	}
	if same {
		return nu[0]
	}
	e := 0.0
	for _, v := range nu {
		if v <= 2 {
			return 2
		}
		e += v / (v - 2)
	}
	q := float64(len(nu))
	if e <= q {
		return 2
	}
	return 2 * e / (e - q)
}

func symSandwich(w *mat.Dense, s mat.Symmetric) *mat.SymDense {
	r, _ := w.Dims()
	var t mat.Dense
	t.Mul(w, s)
	var u mat.Dense
	u.Mul(&t, w.T())
	out := mat.NewSymDense(r, nil)
	for i := range r {
		for j := i; j < r; j++ {
			out.SetSym(i, j, (u.At(i, j)+u.At(j, i))/2)
		}
	}
	return out
}

// fSurvival is P(F > f) for an F distribution; infinite denominator df
// gives the chi-square limit.
func fSurvival(f, d1, d2 float64) float64 {
	if !(f > 0) {
		return 1
	}
	if math.IsInf(d2, 1) {
		return distuv.ChiSquared{K: d1}.Survival(f * d1)
	}
	return distuv.F{D1: d1, D2: d2}.Survival(f)
}

// tSurvival2 is the two-sided P(|T| > |t|).
func tSurvival2(t, df float64) float64 {
	if math.IsInf(df, 1) {
		return 2 * distuv.UnitNormal.Survival(math.Abs(t))
	}
	return 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Survival(math.Abs(t))
}

func tQuantile(p, df float64) float64 {
	if math.IsInf(df, 1) {
		return distuv.UnitNormal.Quantile(p)
	}
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: df}.Quantile(p)
}
