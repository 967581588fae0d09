package glm

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// remlProblem is the linear mixed model y = Xβ + Σ Z_j u_j + e with
// u_j ~ N(0, σ²_j I), e ~ N(0, σ²_e I), in the formulation of Bates et al.
// (2015, J. Stat. Softw. 67(1)): with θ_j = σ_j/σ_e and Λ = diag(θ) the
// matrix Cθ = [ΛZ'ZΛ + I, ΛZ'X; X'ZΛ, X'X] gives the profiled REML
// deviance log|Cθ| + (n−p)·log r²(θ), where r² is the penalised residual
// sum of squares. Every evaluation is one Cholesky factorisation of a
// (q+p)-square matrix, q units and p fixed effects, whatever the number of
// plots.
type remlProblem struct {
	n, p, q int
	unitOf  []int // random term of each random column
	nu      int   // random terms
	wtw     []float64
	wty     []float64
	yty     float64
	xcols   []int // mean-model columns of the X part
}

type remlEval struct {
	ok     bool
	logdet float64
	r2     float64
	sol    []float64
	chol   mat.Cholesky
}

func (rp *remlProblem) eval(theta []float64) *remlEval {
	m := rp.q + rp.p
	s := make([]float64, m)
	for j := range m {
		if j < rp.q {
			s[j] = theta[rp.unitOf[j]]
		} else {
			s[j] = 1
		}
	}
	c := mat.NewSymDense(m, nil)
	rhs := make([]float64, m)
	for a := range m {
		for b := a; b < m; b++ {
			v := s[a] * rp.wtw[a*m+b] * s[b]
			if a == b && a < rp.q {
				v++
			}
			c.SetSym(a, b, v)
		}
		rhs[a] = s[a] * rp.wty[a]
	}
	e := &remlEval{}
	if !e.chol.Factorize(c) {
		return e
	}
	var sv mat.VecDense
	if err := e.chol.SolveVecTo(&sv, mat.NewVecDense(m, rhs)); err != nil {
		return e
	}
	e.sol = sv.RawVector().Data
	e.r2 = rp.yty
	for a := range m {
		e.r2 -= e.sol[a] * rhs[a]
	}
	if !(e.r2 > 0) {
		return e
	}
	e.logdet = e.chol.LogDet()
	e.ok = true
	return e
}

// profiled is the profiled REML deviance (without constants).
func (rp *remlProblem) profiled(theta []float64) float64 {
	e := rp.eval(theta)
	if !e.ok {
		return math.Inf(1)
	}
	return e.logdet + float64(rp.n-rp.p)*math.Log(e.r2)
}

// covBeta is Cov(β̂) = σ²_e·(Cθ⁻¹)_XX at φ.
func (rp *remlProblem) covBeta(phi []float64) (*mat.SymDense, bool) {
	k := len(phi) - 1
	se := phi[k]
	theta := make([]float64, k)
	for j := range k {
		theta[j] = math.Sqrt(math.Max(phi[j], 0) / se)
	}
	e := rp.eval(theta)
	if !e.ok {
		return nil, false
	}
	m := rp.q + rp.p
	inv := mat.NewSymDense(m, nil)
	if err := e.chol.InverseTo(inv); err != nil {
		return nil, false
	}
	out := mat.NewSymDense(rp.p, nil)
	for a := range rp.p {
		for b := a; b < rp.p; b++ {
			out.SetSym(a, b, se*inv.At(rp.q+a, rp.q+b))
		}
	}
	return out, true
}

// minimise finds θ minimising the profiled deviance: Newton's method with
// central-difference derivatives and a backtracking line search (the
// deviance is even in each θ_j, so θ is unconstrained and a component at
// 0 is an ordinary point), falling back to Nelder–Mead when Newton fails.
func (rp *remlProblem) minimise(theta0 []float64) ([]float64, bool) {
	k := len(theta0)
	f := rp.profiled
	x := append([]float64(nil), theta0...)
	fx := f(x)
	ok := false
	for it := 0; it < 60 && !math.IsInf(fx, 1); it++ {
		g, h := derivs(f, x, fx)
		gmax := 0.0
		for _, v := range g {
			gmax = math.Max(gmax, math.Abs(v))
		}
		if gmax < 1e-7 {
			ok = true
			break
		}
		step := newtonStep(g, h, k)
		t := 1.0
		var xn []float64
		fn := math.Inf(1)
		slope := 0.0
		for j := range k {
			slope += g[j] * step[j]
		}
		for range 40 {
			xn = make([]float64, k)
			for j := range k {
				xn[j] = x[j] + t*step[j]
			}
			fn = f(xn)
			if fn <= fx+1e-4*t*slope {
				break
			}
			t /= 2
		}
		if !(fn <= fx) {
			break
		}
		done := fx-fn < 1e-13*math.Max(1, math.Abs(fx)) && gmax < 1e-4
		x, fx = xn, fn
		if done {
			ok = true
			break
		}
	}
	if !ok {
		if xs, fs := nelderMead(f, theta0, 4000); fs < fx {
			x, fx = xs, fs
		}
		ok = !math.IsInf(fx, 1)
	}
	// A variance component on the boundary (0) may beat an interior
	// stationary point.
	for j := range k {
		z := append([]float64(nil), x...)
		z[j] = 0
		if fz := f(z); fz < fx-1e-10*math.Abs(fx) {
			x, fx = z, fz
		}
	}
	for j := range x {
		x[j] = math.Abs(x[j])
	}
	return x, ok
}

// derivs returns the central-difference gradient and Hessian of f at x.
func derivs(f func([]float64) float64, x []float64, fx float64) ([]float64, []float64) {
	k := len(x)
	g := make([]float64, k)
	h := make([]float64, k*k)
	step := make([]float64, k)
	for j := range k {
		step[j] = 1e-4 * math.Max(1, math.Abs(x[j]))
	}
	at := func(di, dj int, si, sj float64) float64 {
		z := append([]float64(nil), x...)
		z[di] += si * step[di]
		z[dj] += sj * step[dj]
		return f(z)
	}
	for i := range k {
		fp := at(i, i, 1, 0)
		fm := at(i, i, -1, 0)
		g[i] = (fp - fm) / (2 * step[i])
		h[i*k+i] = (fp - 2*fx + fm) / (step[i] * step[i])
		for j := range i {
			v := (at(i, j, 1, 1) - at(i, j, 1, -1) - at(i, j, -1, 1) + at(i, j, -1, -1)) / (4 * step[i] * step[j])
			h[i*k+j], h[j*k+i] = v, v
		}
	}
	return g, h
}

// newtonStep solves H s = −g, shifting H towards positive definite when
// needed.
func newtonStep(g, h []float64, k int) []float64 {
	shift := 0.0
	for range 30 {
		hs := mat.NewSymDense(k, nil)
		for i := range k {
			for j := i; j < k; j++ {
				v := h[i*k+j]
				if i == j {
					v += shift
				}
				hs.SetSym(i, j, v)
			}
		}
		var c mat.Cholesky
		if c.Factorize(hs) {
			var s mat.VecDense
			if c.SolveVecTo(&s, mat.NewVecDense(k, g)) == nil {
				out := s.RawVector().Data
				for i := range out {
					out[i] = -out[i]
				}
				return out
			}
		}
		if shift == 0 {
			shift = 1e-6
			for i := range k {
				shift = math.Max(shift, math.Abs(h[i*k+i]))
			}
			shift *= 1e-3
		} else {
			shift *= 10
		}
	}
	out := make([]float64, k)
	for i := range g {
		out[i] = -g[i]
	}
	return out
}

// fitREML fits a split or strip plot with missing plots by REML: blocks
// and treatments fixed, the units of each error stratum (main plots,
// sub-plots of a split-split plot, strips) random.
func fitREML(d *design, mx *matrix, ne *normal, m *Model, trt []term, res *Result) (*inference, error) {
	st := newStrata(d, m.Structure, trt)
	all := make([]int, mx.p)
	for j := range all {
		all[j] = j
	}
	full, err := ne.fit(all)
	if err != nil {
		return nil, err
	}
	xcols := full.kept
	p := len(xcols)
	nu := len(st.units)
	var unitIdx [][]int
	var unitOf []int
	q := 0
	for j, u := range st.units {
		idx, cnt := d.unitIndex(u)
		for i := range idx {
			idx[i] += q
		}
		unitIdx = append(unitIdx, idx)
		for range cnt {
			unitOf = append(unitOf, j)
		}
		q += cnt
	}
	if d.n-p < 1 {
		return nil, errorf(NoErrorDF, "", -1, "there are too few plots with data to estimate the experimental error; add blocks")
	}
	mdim := q + p
	rp := &remlProblem{n: d.n, p: p, q: q, unitOf: unitOf, nu: nu, wtw: make([]float64, mdim*mdim), wty: make([]float64, mdim), yty: ne.yty, xcols: xcols}
	row := make([]float64, mdim)
	nz := make([]int, 0, mdim)
	for i := range d.n {
		clear(row)
		nz = nz[:0]
		for j := range nu {
			row[unitIdx[j][i]] = 1
			nz = append(nz, unitIdx[j][i])
		}
		xr := mx.x[i*mx.p : (i+1)*mx.p]
		for a, c := range xcols {
			if xr[c] != 0 {
				row[q+a] = xr[c]
				nz = append(nz, q+a)
			}
		}
		yi := d.y[i] - d.ybar
		for _, a := range nz {
			rp.wty[a] += row[a] * yi
			for _, b := range nz {
				rp.wtw[a*mdim+b] += row[a] * row[b]
			}
		}
	}
	theta0 := make([]float64, nu)
	for j := range theta0 {
		theta0[j] = 1
	}
	theta, ok := rp.minimise(theta0)
	if !ok || theta == nil {
		return nil, errorf(NotEstimable, "", -1, "the mixed model for the missing plots could not be fitted; check the data for extreme values")
	}
	e := rp.eval(theta)
	if !e.ok {
		return nil, errorf(ZeroError, "", -1, "the model fits the data exactly, so there is no experimental error to test against; check the data")
	}
	se := e.r2 / float64(d.n-p)
	phi := make([]float64, nu+1)
	for j := range nu {
		phi[j] = theta[j] * theta[j] * se
	}
	phi[nu] = se
	for j := range nu + 1 {
		res.VarianceComponents = append(res.VarianceComponents, Component{Name: st.comps[j], Variance: phi[j]})
		if j < nu && phi[j] <= 1e-10*se {
			res.Notes = append(res.Notes, fmt.Sprintf("the %s variance is estimated as 0: its units vary no more than the plots within them", st.comps[j]))
		}
	}
	res.Notes = append(res.Notes, fmt.Sprintf("%d plots are missing, so the model was fitted by REML (blocks and treatments fixed, %s random); F tests use Satterthwaite denominator degrees of freedom", res.Missing, unitWords(m.Structure, nu)))

	// Parameters away from the boundary carry the uncertainty.
	var free []int
	for j := range nu + 1 {
		if j == nu || phi[j] > 1e-10*se {
			free = append(free, j)
		}
	}
	kf := len(free)
	hess := rp.observedInfo(d, mx, unitIdx, theta, phi, free, e)
	hs := mat.NewSymDense(kf, nil)
	for a := range kf {
		for b := a; b < kf; b++ {
			hs.SetSym(a, b, hess[a*kf+b])
		}
	}
	acov := mat.NewSymDense(kf, nil)
	var hc mat.Cholesky
	if hc.Factorize(hs) {
		_ = hc.InverseTo(acov)
		acov.ScaleSym(2, acov)
	} else {
		return nil, errorf(NotEstimable, "", -1, "the variance components of the mixed model are not determined by these data; check the missing plots")
	}
	cK, okc := rp.covBeta(phi)
	if !okc {
		return nil, errorf(NotEstimable, "", -1, "the mixed model for the missing plots could not be fitted; check the data")
	}
	expand := func(s *mat.SymDense) *mat.SymDense {
		out := mat.NewSymDense(mx.p, nil)
		for a, ca := range xcols {
			for b := a; b < p; b++ {
				out.SetSym(ca, xcols[b], s.At(a, b))
			}
		}
		return out
	}
	in := &inference{p: mx.p, c: expand(cK), a: acov, null: full.null, beta: make([]float64, mx.p)}
	for a, ca := range xcols {
		in.beta[ca] = e.sol[q+a]
	}
	for _, j := range free {
		h := 1e-4 * phi[j]
		up := append([]float64(nil), phi...)
		dn := append([]float64(nil), phi...)
		up[j] += h
		dn[j] -= h
		cu, ok1 := rp.covBeta(up)
		cd, ok2 := rp.covBeta(dn)
		if !ok1 || !ok2 {
			return nil, errorf(NotEstimable, "", -1, "the mixed model for the missing plots could not be fitted; check the data")
		}
		dd := mat.NewSymDense(p, nil)
		for a := range p {
			for b := a; b < p; b++ {
				dd.SetSym(a, b, (cu.At(a, b)-cd.At(a, b))/(2*h))
			}
		}
		in.d = append(in.d, expand(dd))
	}

	// Type II Wald F tests of the treatment terms.
	for k, t := range mx.terms {
		if d.hasBlock() && k == 0 {
			continue
		}
		rows := typeIIRows(mx, ne, k)
		if len(rows) == 0 {
			continue
		}
		fam := in.family(rows)
		w := make([][]float64, len(rows))
		for i := range w {
			w[i] = make([]float64, len(rows))
			w[i][i] = 1
		}
		ft := fam.ftest(w)
		if !ft.ok {
			continue
		}
		res.Lines = append(res.Lines, Line{Source: termName(t, d.names), Role: RoleTreatment, Factors: append([]int(nil), t...), DF: ft.df, HasTest: true, F: ft.f, P: ft.p, DFDen: ft.dfDen})
	}
	// Residuals within the lowest stratum, and per unit of the higher ones.
	order, kind := st.order(d, trt)
	smx := d.build(order)
	stratumResiduals(d, smx, smx.normal(d.y, d.ybar), res)
	res.ResidualDF = d.n - rankOf(d, order)
	unitResiduals(d, st, order, kind, res)
	return in, nil
}

func unitWords(s Structure, nu int) string {
	if s == StripPlot {
		return "strips"
	}
	if nu == 2 {
		return "main plots and subplots"
	}
	return "main plots"
}

// typeIIRows is the type II hypothesis of mean-model term k as rows over
// β. Its span is that of X₁'(I − P₀)X, X₁ the term's columns and P₀ the
// projection on the terms that do not contain it, whose least-squares
// Wald statistic is the type II sum of squares (Searle 1987, Linear Models
// for Unbalanced Data, ch. 4). The Satterthwaite df of a multi-df test
// depends on the basis of that span, so the basis is the one of
// Kuznetsova et al. (2017, section 4): for a term no other term contains,
// the unit rows of its coefficients; otherwise the term's rows of the
// unit upper triangular factor of the Doolittle decomposition of X'X
// with the columns ordered unrelated terms, the term, the terms
// containing it — that is D⁻¹L⁻¹S, where S = X₁'(I − P₀)X and
// S₁₁ = LDL'.
func typeIIRows(mx *matrix, ne *normal, k int) [][]float64 {
	t := mx.terms[k]
	p := mx.p
	a, b := mx.termRange(k)
	contained := false
	cols0 := []int{0}
	for j, u := range mx.terms {
		if j == k {
			continue
		}
		if u.contains(t) {
			contained = true
			continue
		}
		ua, ub := mx.termRange(j)
		for c := ua; c < ub; c++ {
			cols0 = append(cols0, c)
		}
	}
	var rows [][]float64
	if !contained {
		for c := a; c < b; c++ {
			r := make([]float64, p)
			r[c] = 1
			rows = append(rows, r)
		}
		return rows
	}
	f0, err := ne.fit(cols0)
	if err != nil {
		return nil
	}
	for c := a; c < b; c++ {
		r := make([]float64, p)
		coef := make([]float64, p)
		for _, i := range f0.kept {
			s := 0.0
			for _, j := range f0.kept {
				s += f0.xtxi.At(i, j) * ne.g[j*p+c]
			}
			coef[i] = s
		}
		for col := range p {
			v := ne.g[c*p+col]
			for _, i := range f0.kept {
				v -= coef[i] * ne.g[i*p+col]
			}
			r[col] = v
		}
		rows = append(rows, r)
	}
	// Doolittle within the term: eliminate forward, scale by the pivot.
	q := b - a
	var out [][]float64
	for i := range q {
		piv := rows[i][a+i]
		if math.Abs(piv) <= dropTol*math.Abs(ne.g[(a+i)*p+a+i]) {
			continue // dependent column (empty cell)
		}
		for r := i + 1; r < q; r++ {
			f := rows[r][a+i] / piv
			if f == 0 {
				continue
			}
			for col := range p {
				rows[r][col] -= f * rows[i][col]
			}
		}
		for col := range p {
			rows[i][col] /= piv
		}
		out = append(out, rows[i])
	}
	return out
}

// orthonormalRows replaces the rows by an orthonormal basis of their span
// (Gram–Schmidt, twice), dropping dependent rows.
func orthonormalRows(rows [][]float64) [][]float64 {
	var out [][]float64
	for _, r := range rows {
		v := append([]float64(nil), r...)
		n0 := math.Sqrt(dotv(v, v))
		for range 2 {
			for _, q := range out {
				c := dotv(q, v)
				for i := range v {
					v[i] -= c * q[i]
				}
			}
		}
		nv := math.Sqrt(dotv(v, v))
		if !(nv > 1e-9*n0) {
			continue
		}
		for i := range v {
			v[i] /= nv
		}
		out = append(out, v)
	}
	return out
}

func dotv(a, b []float64) float64 {
	s := 0.0
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

// nelderMead minimises f from x0 by the simplex method of Nelder & Mead
// (1965, Comput. J. 7, 308–313) with the usual coefficients (reflection 1,
// expansion 2, contraction and shrink 1/2).
func nelderMead(f func([]float64) float64, x0 []float64, maxEval int) ([]float64, float64) {
	k := len(x0)
	pts := make([][]float64, k+1)
	fv := make([]float64, k+1)
	for i := range pts {
		pts[i] = append([]float64(nil), x0...)
		if i > 0 {
			pts[i][i-1] += 0.5 * math.Max(1, math.Abs(x0[i-1]))
		}
		fv[i] = f(pts[i])
	}
	evals := k + 1
	at := func(c []float64, w float64, x []float64) []float64 {
		out := make([]float64, k)
		for j := range k {
			out[j] = c[j] + w*(x[j]-c[j])
		}
		return out
	}
	for evals < maxEval {
		for i := 1; i <= k; i++ {
			for j := i; j > 0 && fv[j] < fv[j-1]; j-- {
				fv[j], fv[j-1] = fv[j-1], fv[j]
				pts[j], pts[j-1] = pts[j-1], pts[j]
			}
		}
		if math.Abs(fv[k]-fv[0]) <= 1e-12*math.Max(1, math.Abs(fv[0])) {
			break
		}
		c := make([]float64, k)
		for i := range k {
			for j := range k {
				c[j] += pts[i][j] / float64(k)
			}
		}
		xr := at(c, -1, pts[k])
		fr := f(xr)
		evals++
		switch {
		case fr < fv[0]:
			xe := at(c, -2, pts[k])
			fe := f(xe)
			evals++
			if fe < fr {
				pts[k], fv[k] = xe, fe
			} else {
				pts[k], fv[k] = xr, fr
			}
		case fr < fv[k-1]:
			pts[k], fv[k] = xr, fr
		default:
			xc := at(c, 0.5, pts[k])
			fc := f(xc)
			evals++
			if fc < fv[k] {
				pts[k], fv[k] = xc, fc
			} else {
				for i := 1; i <= k; i++ {
					pts[i] = at(pts[0], 0.5, pts[i])
					fv[i] = f(pts[i])
					evals++
				}
			}
		}
	}
	best := 0
	for i := range fv {
		if fv[i] < fv[best] {
			best = i
		}
	}
	return pts[best], fv[best]
}

// observedInfo is the Hessian of the REML deviance −2ℓ_R with respect to
// the free variance parameters φ (σ²_j of the units, then σ²_e), from its
// analytic form (Searle, Casella & McCulloch 1992, Variance Components,
// ch. 6): H_ij = −tr(PV_iPV_j) + 2·y'PV_iPV_jPy, with V_i = Z_iZ_i' (I for
// σ²_e) and P = V⁻¹ − V⁻¹X(X'V⁻¹X)⁻¹X'V⁻¹ = (I − W̃Cθ⁻¹W̃')/σ²_e,
// W̃ = [ZΛ, X]. Finite differences of the deviance lose too many digits
// here (the deviance is a difference of large terms).
func (rp *remlProblem) observedInfo(d *design, mx *matrix, unitIdx [][]int, theta, phi []float64, free []int, e *remlEval) []float64 {
	n, m := d.n, rp.q+rp.p
	nu := len(unitIdx)
	se := phi[nu]
	w := make([]float64, n*m)
	for i := range n {
		r := w[i*m : (i+1)*m]
		for j := range nu {
			r[unitIdx[j][i]] = theta[j]
		}
		xr := mx.x[i*mx.p : (i+1)*mx.p]
		for a, c := range rp.xcols {
			r[rp.q+a] = xr[c]
		}
	}
	inv := mat.NewSymDense(m, nil)
	if err := e.chol.InverseTo(inv); err != nil {
		return nil
	}
	wm := mat.NewDense(n, m, w)
	var b mat.Dense
	b.Mul(wm, inv)
	var pm mat.Dense
	pm.Mul(&b, wm.T())
	P := pm.RawMatrix().Data // stride n
	for i := range n {
		for j := range n {
			v := -P[i*n+j]
			if i == j {
				v++
			}
			P[i*n+j] = v / se
		}
	}
	y := make([]float64, n)
	for i := range n {
		y[i] = d.y[i] - d.ybar
	}
	mul := func(v []float64) []float64 {
		out := make([]float64, n)
		for i := range n {
			s := 0.0
			row := P[i*n : (i+1)*n]
			for j, x := range v {
				s += row[j] * x
			}
			out[i] = s
		}
		return out
	}
	// applyV returns V_j v.
	applyV := func(j int, v []float64) []float64 {
		if j == nu {
			return append([]float64(nil), v...)
		}
		idx := unitIdx[j]
		tot := map[int]float64{}
		for i, x := range v {
			tot[idx[i]] += x // few calls: a map is fine
		}
		out := make([]float64, n)
		for i := range n {
			out[i] = tot[idx[i]]
		}
		return out
	}
	r := mul(y)
	kf := len(free)
	ps := make([][]float64, kf)
	sv := make([][]float64, kf)
	pv := make([][]float64, kf) // P V_j, n×n
	for a, j := range free {
		sv[a] = applyV(j, r)
		ps[a] = mul(sv[a])
		if j == nu {
			pv[a] = P
			continue
		}
		idx := unitIdx[j]
		lo, hi := idx[0], idx[0]
		for _, u := range idx {
			lo, hi = min(lo, u), max(hi, u)
		}
		nq := hi - lo + 1
		agg := make([]float64, nq)
		mv := make([]float64, n*n)
		for i := range n {
			clear(agg)
			row := P[i*n : (i+1)*n]
			for c := range n {
				agg[idx[c]-lo] += row[c]
			}
			out := mv[i*n : (i+1)*n]
			for c := range n {
				out[c] = agg[idx[c]-lo]
			}
		}
		pv[a] = mv
	}
	h := make([]float64, kf*kf)
	for a := range kf {
		for c := a; c < kf; c++ {
			tr := 0.0
			for i := range n {
				for k := range n {
					tr += pv[a][i*n+k] * pv[c][k*n+i]
				}
			}
			q := 0.0
			for i := range n {
				q += sv[a][i] * ps[c][i]
			}
			h[a*kf+c] = -tr + 2*q
			h[c*kf+a] = h[a*kf+c]
		}
	}
	return h
}
