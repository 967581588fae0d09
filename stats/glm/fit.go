package glm

import (
	"fmt"
	"math"
	"strings"

	"gonum.org/v1/gonum/mat"
)

// Fit analyses one response: the analysis of variance (or, for split and
// strip plots with missing plots, REML F tests), variance components,
// estimated marginal means of every effect with their comparisons and
// letters, the SEDs of every kind of comparison, slices of interactions
// and the residuals. See the package documentation for the formulas.
func Fit(m Model) (*Result, error) {
	r, err := fit(m, false)
	if err == nil && m.Origin != 0 {
		r.addOrigin(m.Origin)
	}
	return r, err
}

// addOrigin puts the origin the caller took away back on every quantity
// that has the values' scale (Model.Origin). The covariance analysis'
// companions were fitted by Fit and carry it already.
func (r *Result) addOrigin(o float64) {
	r.GrandMean += o
	shift := func(ms []Mean) {
		for i := range ms {
			if ms[i].Estimable {
				ms[i].Mean += o
			}
			if ms[i].N > 0 {
				ms[i].RawMean += o
			}
		}
	}
	for i := range r.Effects {
		shift(r.Effects[i].Means)
	}
	for i := range r.Slices {
		shift(r.Slices[i].Means)
	}
	for i := range r.Fitted {
		r.Fitted[i] += o
	}
	for i := range r.Lines {
		l := &r.Lines[i]
		if l.Role == RoleError && l.HasSS {
			l.HasCV, l.CVPercent = false, 0
			if r.GrandMean > 0 {
				l.HasCV, l.CVPercent = true, 100*math.Sqrt(l.MS)/r.GrandMean
			}
		}
	}
}

// fit is Fit; forceREML fits balanced split and strip plots by REML too
// (for the tests: REML equals the strata analysis there).
func fit(m Model, forceREML bool) (*Result, error) {
	used, err := m.check()
	if err != nil {
		return nil, err
	}
	alpha := m.Alpha
	if alpha == 0 {
		alpha = 0.05
	}
	d := newDesign(&m, used)
	nf := d.nf
	trt := treatmentTerms(&m, nf)
	var meanTerms []term
	if d.hasBlock() {
		meanTerms = append(meanTerms, term{d.block()})
	}
	meanTerms = append(meanTerms, trt...)
	if d.x != nil && !(d.xs > 0) {
		return nil, errorf(NotEstimable, "", -1, "the covariate has the same value on every plot analysed, so it cannot adjust anything; analyse the trait without it")
	}
	mx := d.buildCov(meanTerms)
	ne := mx.normal(d.y, d.ybar)

	left := m.covariateLeft()
	res := &Result{
		Structure: m.Structure,
		N:         d.n,
		Missing:   len(m.Response) - d.n - left,
		GrandMean: d.ybar,
		Obs:       used,
		Alpha:     alpha,
	}
	res.Balanced = d.balanced(m.Structure, trt)
	var in *inference
	switch {
	case m.Structure == Factorial:
		res.Method = SumsOfSquares
		in, err = fitFactorial(d, mx, ne, trt, res)
	case res.Balanced && !forceREML:
		res.Method = SumsOfSquares
		in, err = fitStrata(d, mx, ne, &m, trt, res)
	default:
		res.Method = REML
		in, err = fitREML(d, mx, ne, &m, trt, res)
	}
	if err != nil {
		return nil, err
	}
	if err := effects(d, mx, in, &m, trt, res); err != nil {
		return nil, err
	}
	if res.Covariate != nil {
		res.Covariate.Left = left
		covariateCompanions(m, used, res.Covariate)
	}
	return res, nil
}

// balanced reports whether every cell has the same number of plots: the
// treatment combinations (within each block when there are blocks) for a
// factorial whose model is the full factorial, every block × combination
// once for split and strip plots.
func (d *design) balanced(s Structure, trt []term) bool {
	nc := 1
	for f := range d.nlev {
		nc *= d.nlev[f]
	}
	cnt := make([]int, nc)
	for i := range d.n {
		key := 0
		for f := range d.nlev {
			key = key*d.nlev[f] + d.lev[f][i]
		}
		cnt[key]++
	}
	if s != Factorial {
		return d.n == nc
	}
	for _, c := range cnt {
		if c != cnt[0] || c == 0 {
			return false
		}
	}
	return true
}

// termRange returns the column range of mean-model term k.
func (mx *matrix) termRange(k int) (int, int) {
	end := mx.tp
	if k+1 < len(mx.start) {
		end = mx.start[k+1]
	}
	return mx.start[k], end
}

// typeII returns the type II sum of squares and df of term k of mx: the
// term adjusted for every term that does not contain it (and for the
// covariate, when mx has one).
func typeII(mx *matrix, ne *normal, k int) (float64, int) {
	t := mx.terms[k]
	cols := []int{0}
	for j, u := range mx.terms {
		if j == k || u.contains(t) {
			continue
		}
		a, b := mx.termRange(j)
		for c := a; c < b; c++ {
			cols = append(cols, c)
		}
	}
	if mx.cov >= 0 {
		cols = append(cols, mx.cov)
	}
	from := len(cols)
	a, b := mx.termRange(k)
	for c := a; c < b; c++ {
		cols = append(cols, c)
	}
	ch := ne.chol(cols)
	return ch.ssOf(from, len(cols))
}

const noteTypeII = "some plots are missing, so each line's sum of squares is adjusted for all the terms that do not contain it (type II): the lines no longer add up to the total"

func fitFactorial(d *design, mx *matrix, ne *normal, trt []term, res *Result) (*inference, error) {
	all := make([]int, mx.p)
	for j := range all {
		all[j] = j
	}
	full, err := ne.fit(all)
	if err != nil {
		return nil, err
	}
	dfe := d.n - full.rank
	if dfe < 1 {
		return nil, errorf(NoErrorDF, "", -1, "there are too few plots with data to estimate the experimental error for this model; add replicates or leave out the highest interaction")
	}
	if !(full.rss > 1e-20*ne.yty) || ne.yty == 0 {
		return nil, errorf(ZeroError, "", -1, "the model fits the data exactly (or all values are equal), so there is no experimental error to test against; check the data")
	}
	mse := full.rss / float64(dfe)
	if mx.cov >= 0 && !keptCol(full.kept, mx.cov) {
		return nil, errorf(NotEstimable, "", -1, "the covariate does not vary within the treatment combinations (and blocks), so it cannot adjust this trait; analyse the trait without it")
	}
	for k, t := range mx.terms {
		ss, df := typeII(mx, ne, k)
		if df == 0 {
			return nil, errorf(NotEstimable, "", -1, "the %s effect cannot be estimated with the plots that have data; check the missing plots", termName(t, d.names))
		}
		l := Line{Source: termName(t, d.names), Role: RoleTreatment, Factors: append([]int(nil), t...), DF: df, HasSS: true, SS: ss, MS: ss / float64(df),
			HasTest: true, ErrorTerm: "error", DFDen: float64(dfe)}
		if d.hasBlock() && k == 0 {
			l.Role, l.Factors = RoleBlock, nil
		}
		l.F = l.MS / mse
		l.P = fSurvival(l.F, float64(df), float64(dfe))
		res.Lines = append(res.Lines, l)
	}
	c := mat.NewSymDense(mx.p, nil)
	c.ScaleSym(mse, full.xtxi)
	if mx.cov >= 0 {
		res.Lines = append(res.Lines, covariateLine(mx, ne, mse, dfe))
		res.Covariate = covariance(d, mx, ne, full, c, dfe)
	}
	res.Lines = append(res.Lines, errorLine("error", dfe, full.rss, d.ybar))
	res.Lines = append(res.Lines, Line{Source: "total", Role: RoleTotal, DF: d.n - 1, HasSS: true, SS: ne.yty})
	switch {
	case mx.cov >= 0:
		res.Notes = append(res.Notes, noteCovariate)
	case !res.Balanced:
		res.Notes = append(res.Notes, noteTypeII)
	}
	in := &inference{p: mx.p, beta: full.beta, c: c, null: full.null, fixedDF: float64(dfe)}
	fillResiduals(d, mx, full.beta, res)
	res.ResidualDF = dfe
	return in, nil
}

func errorLine(name string, df int, ss, ybar float64) Line {
	l := Line{Source: name, Role: RoleError, DF: df, HasSS: true, SS: ss, MS: ss / float64(df)}
	if ybar > 0 {
		l.HasCV = true
		l.CVPercent = 100 * math.Sqrt(l.MS) / ybar
	}
	return l
}

func fillResiduals(d *design, mx *matrix, beta []float64, res *Result) {
	res.Fitted = make([]float64, d.n)
	res.Residuals = make([]float64, d.n)
	for i := range d.n {
		row := mx.x[i*mx.p : (i+1)*mx.p]
		f := d.ybar
		for j, v := range row {
			f += v * beta[j]
		}
		res.Fitted[i] = f
		res.Residuals[i] = d.y[i] - f
	}
}

// strata describes the error strata of a split or strip plot: the random
// units (as terms of the combined factor list) and the stratum of each
// treatment term.
type strata struct {
	units   []term   // error units: block:A, (block:A:B), or block:A and block:B
	names   []string // error line names, one per unit and the residual
	comps   []string // variance component names, one per unit and the residual
	stratum []int    // per treatment term
}

func newStrata(d *design, s Structure, trt []term) strata {
	b := d.block()
	var st strata
	switch s {
	case SplitPlot:
		st.units = []term{{0, b}}
		st.comps = []string{"main_plot"}
		if d.nf == 3 {
			st.units = append(st.units, term{0, 1, b})
			st.comps = append(st.comps, "subplot")
		}
		for _, t := range trt {
			st.stratum = append(st.stratum, t[len(t)-1])
		}
	case StripPlot:
		st.units = []term{{0, b}, {1, b}}
		st.comps = []string{"horizontal_strip", "vertical_strip"}
		for _, t := range trt {
			k := 2
			if len(t) == 1 {
				k = t[0]
			}
			st.stratum = append(st.stratum, k)
		}
	}
	st.comps = append(st.comps, "residual")
	for k := range len(st.units) + 1 {
		st.names = append(st.names, "error_"+string(rune('a'+k)))
	}
	return st
}

// errorTerms expands the error unit of each stratum into the fixed terms
// that span its sums of squares: every subset of the unit containing the
// block (except the block alone) not already spanned by an earlier unit.
// So error (b) of a split-split plot is block:B + block:A:B.
func (st *strata) errorTerms(blk int) [][]term {
	var out [][]term
	var seen []term
	for _, u := range st.units {
		var ts []term
		for _, sub := range allTerms(len(u)) {
			t := make(term, len(sub))
			for a, i := range sub {
				t[a] = u[i]
			}
			if !t.contains(term{blk}) || len(t) == 1 {
				continue
			}
			dup := false
			for _, v := range seen {
				dup = dup || v.equal(t)
			}
			if dup {
				continue
			}
			seen = append(seen, t)
			ts = append(ts, t)
		}
		out = append(out, ts)
	}
	return out
}

// order lists the terms of the strata model: block, then per stratum its
// treatment terms and its error terms; kind says what each is (−1 block,
// k ≥ 0 treatment term k, −2−s an error term of stratum s).
func (st *strata) order(d *design, trt []term) ([]term, []int) {
	ets := st.errorTerms(d.block())
	order := []term{{d.block()}}
	kind := []int{-1}
	for s := range len(st.units) + 1 {
		for k, t := range trt {
			if st.stratum[k] == s {
				order = append(order, t)
				kind = append(kind, k)
			}
		}
		if s < len(st.units) {
			for _, et := range ets[s] {
				order = append(order, et)
				kind = append(kind, -2-s)
			}
		}
	}
	return order, kind
}

// unitResiduals fills the residuals of the higher strata: for stratum s,
// the fit of the strata model up to and including error s minus the fit
// without error s's terms. Every term involved is constant within a unit
// of s (a main plot, a strip), so this is one value per unit: the
// main-plot residual ȳ_ik − ȳ_i − ȳ_k + ȳ of a balanced split plot.
func unitResiduals(d *design, st strata, order []term, kind []int, res *Result) {
	for s, u := range st.units {
		var with, without []term
		last := -1
		for k := range order {
			if kind[k] == -2-s {
				last = k
			}
		}
		for k := 0; k <= last; k++ {
			with = append(with, order[k])
			if kind[k] != -2-s {
				without = append(without, order[k])
			}
		}
		fa := fitValues(d, with)
		fb := fitValues(d, without)
		if fa == nil || fb == nil {
			continue
		}
		idx, cnt := d.unitIndex(u)
		ur := UnitResiduals{Stratum: st.names[s], Unit: idx, Values: make([]float64, cnt)}
		if l, ok := res.Line(st.names[s]); ok {
			ur.DF = l.DF
		}
		for i := range d.n {
			ur.Values[idx[i]] = fa[i] - fb[i]
		}
		if ur.DF == 0 {
			ur.DF = rankOf(d, with) - rankOf(d, without)
		}
		res.UnitResiduals = append(res.UnitResiduals, ur)
	}
}

// fitValues returns the least-squares fitted values of the terms.
func fitValues(d *design, terms []term) []float64 {
	mx := d.build(terms)
	ne := mx.normal(d.y, d.ybar)
	all := make([]int, mx.p)
	for j := range all {
		all[j] = j
	}
	f, err := ne.fit(all)
	if err != nil {
		return nil
	}
	out := make([]float64, d.n)
	for i := range d.n {
		row := mx.x[i*mx.p : (i+1)*mx.p]
		v := d.ybar
		for j, x := range row {
			v += x * f.beta[j]
		}
		out[i] = v
	}
	return out
}

func rankOf(d *design, terms []term) int {
	mx := d.build(terms)
	ne := mx.normal(d.y, d.ybar)
	all := make([]int, mx.p)
	for j := range all {
		all[j] = j
	}
	return ne.chol(all).k
}

// unitSize is the number of plots in each unit of term u (balanced data).
func (d *design) unitSize(u term) float64 {
	c := 1
	for _, f := range u {
		c *= d.nlev[f]
	}
	return float64(d.n) / float64(c)
}

// unitIndex numbers the units of term u present in the data, per
// observation.
func (d *design) unitIndex(u term) (idx []int, count int) {
	ids := map[int]int{}
	idx = make([]int, d.n)
	for i := range d.n {
		key := 0
		for _, f := range u {
			key = key*d.nlev[f] + d.lev[f][i]
		}
		id, ok := ids[key]
		if !ok {
			id = len(ids)
			ids[key] = id
		}
		idx[i] = id
	}
	return idx, len(ids)
}

// fitStrata is the classic strata analysis of a complete split or strip
// plot: sequential sums of squares in the order block, the terms of
// stratum a, error (a), the terms of stratum b, error (b), ... (orthogonal
// in balanced data, so equal to the strata sums of squares), F tests
// against the error of each term's stratum, variance components from the
// expected mean squares, and the covariance of the estimates as a linear
// function of the error mean squares.
func fitStrata(d *design, mx *matrix, ne *normal, m *Model, trt []term, res *Result) (*inference, error) {
	st := newStrata(d, m.Structure, trt)
	ns := len(st.units) + 1
	order, kind := st.order(d, trt)
	smx := d.build(order)
	sne := smx.normal(d.y, d.ybar)
	all := make([]int, smx.p)
	for j := range all {
		all[j] = j
	}
	ch := sne.chol(all)
	ms := make([]float64, ns)
	dfs := make([]int, ns)
	type tl struct {
		ss float64
		df int
	}
	lines := make([]tl, len(order))
	used := 1
	for k := range order {
		a, b := smx.termRange(k)
		ss, df := ch.ssOf(a, b)
		lines[k] = tl{ss, df}
		used += df
		if kind[k] <= -2 {
			s := -2 - kind[k]
			dfs[s] += df
			ms[s] += ss
		}
	}
	for s := range ns - 1 {
		if dfs[s] > 0 {
			ms[s] /= float64(dfs[s])
		}
	}
	rss := ne.yty
	for _, l := range lines {
		rss -= l.ss
	}
	dfs[ns-1] = d.n - used
	if dfs[ns-1] < 1 {
		return nil, errorf(NoErrorDF, "", -1, "there are too few plots to estimate the lowest error stratum; add blocks")
	}
	for s := range ns - 1 {
		if dfs[s] < 1 {
			return nil, errorf(NoErrorDF, "", -1, "there are too few blocks to estimate %s; add blocks", st.names[s])
		}
	}
	ms[ns-1] = math.Max(rss, 0) / float64(dfs[ns-1])
	for s := range ns {
		if !(ms[s] > 1e-20*ne.yty) {
			return nil, errorf(ZeroError, "", -1, "%s is zero: the model fits exactly, so there is nothing to test against; check the data", st.names[s])
		}
	}
	for k, t := range order {
		switch {
		case kind[k] == -1:
			res.Lines = append(res.Lines, Line{Source: d.names[d.block()], Role: RoleBlock, DF: lines[k].df, HasSS: true, SS: lines[k].ss, MS: lines[k].ss / float64(lines[k].df)})
		case kind[k] >= 0:
			s := st.stratum[kind[k]]
			l := Line{Source: termName(t, d.names), Role: RoleTreatment, Factors: append([]int(nil), t...), DF: lines[k].df, HasSS: true, SS: lines[k].ss,
				MS: lines[k].ss / float64(lines[k].df), HasTest: true, ErrorTerm: st.names[s], DFDen: float64(dfs[s])}
			l.F = l.MS / ms[s]
			l.P = fSurvival(l.F, float64(l.DF), float64(dfs[s]))
			res.Lines = append(res.Lines, l)
		default:
			s := -2 - kind[k]
			if k+1 < len(order) && kind[k+1] == kind[k] {
				continue // the line comes with the stratum's last error term
			}
			res.Lines = append(res.Lines, errorLine(st.names[s], dfs[s], ms[s]*float64(dfs[s]), d.ybar))
		}
	}
	res.Lines = append(res.Lines, errorLine(st.names[ns-1], dfs[ns-1], math.Max(rss, 0), d.ybar))
	res.Lines = append(res.Lines, Line{Source: "total", Role: RoleTotal, DF: d.n - 1, HasSS: true, SS: ne.yty})

	// Expected mean squares: E(MS of stratum s) = σ²_e + Σ_j c_js σ²_j,
	// with c_js the plots per unit of u_j when u_j contains the error
	// unit of stratum s (Gomez & Gomez 1984, tables 3.5 and 3.10).
	em := mat.NewDense(ns, ns, nil)
	for s := range ns {
		em.Set(s, ns-1, 1)
		if s == ns-1 {
			continue
		}
		for j, u := range st.units {
			if u.contains(st.units[s]) {
				em.Set(s, j, d.unitSize(u))
			}
		}
	}
	var emi mat.Dense
	if err := emi.Inverse(em); err != nil {
		return nil, errorf(BadModel, "", -1, "the error strata cannot be separated; check the design")
	}
	sig := make([]float64, ns)
	for j := range ns {
		for s := range ns {
			sig[j] += emi.At(j, s) * ms[s]
		}
	}
	for j := range ns {
		c := Component{Name: st.comps[j], Variance: sig[j]}
		if sig[j] < 0 {
			c.Variance, c.Truncated = 0, true
			res.Notes = append(res.Notes, fmt.Sprintf("the mean square of %s is smaller than that of the error below it, so the %s variance is estimated as 0 (its estimate is negative, a chance result common with few blocks)", errorWords(st.names[j]), componentWords(st.comps[j])))
		}
		res.VarianceComponents = append(res.VarianceComponents, c)
	}

	// Covariance of the OLS (= GLS, balanced) estimates of the mean model:
	// (X'X)⁻¹X'VX(X'X)⁻¹ with V = σ²_e I + Σ σ²_j Z_jZ_j'.
	all = all[:0]
	for j := range mx.p {
		all = append(all, j)
	}
	full, err := ne.fit(all)
	if err != nil {
		return nil, err
	}
	p := mx.p
	basis := make([]*mat.SymDense, ns) // ∂C/∂σ²_j
	for j, u := range st.units {
		idx, cnt := d.unitIndex(u)
		xz := mat.NewDense(p, cnt, nil)
		for i := range d.n {
			row := mx.x[i*p : (i+1)*p]
			for a, v := range row {
				if v != 0 {
					xz.Set(a, idx[i], xz.At(a, idx[i])+v)
				}
			}
		}
		var t mat.Dense
		t.Mul(full.xtxi, xz)
		basis[j] = mat.NewSymDense(p, nil)
		basis[j].SymOuterK(1, &t)
	}
	basis[ns-1] = mat.NewSymDense(p, nil)
	basis[ns-1].CopySym(full.xtxi)
	in := &inference{p: p, beta: full.beta, null: full.null, c: mat.NewSymDense(p, nil), a: mat.NewSymDense(ns, nil)}
	for s := range ns {
		ds := mat.NewSymDense(p, nil)
		for j := range ns {
			if w := emi.At(j, s); w != 0 {
				ds.AddSym(ds, scaled(w, basis[j]))
			}
		}
		in.d = append(in.d, ds)
		in.c.AddSym(in.c, scaled(ms[s], ds))
		in.a.SetSym(s, s, 2*ms[s]*ms[s]/float64(dfs[s]))
	}
	// Residuals within the lowest stratum.
	stratumResiduals(d, smx, sne, res)
	res.ResidualDF = dfs[ns-1]
	unitResiduals(d, st, order, kind, res)
	return in, nil
}

func scaled(w float64, s *mat.SymDense) *mat.SymDense {
	n := s.SymmetricDim()
	out := mat.NewSymDense(n, nil)
	out.ScaleSym(w, s)
	return out
}

// stratumResiduals fills the residuals from the fit of the strata model
// (every error unit as a fixed effect).
func stratumResiduals(d *design, smx *matrix, sne *normal, res *Result) {
	all := make([]int, smx.p)
	for j := range all {
		all[j] = j
	}
	f, err := sne.fit(all)
	if err != nil {
		return
	}
	fillResiduals(d, smx, f.beta, res)
}

// errorWords names an error stratum in a sentence: "error (a)" for
// "error_a".
func errorWords(name string) string {
	if rest, ok := strings.CutPrefix(name, "error_"); ok {
		return "error (" + rest + ")"
	}
	return strings.ReplaceAll(name, "_", " ")
}

// componentWords names a variance component in a sentence: "main-plot" for
// "main_plot", "horizontal-strip" for "horizontal_strip".
func componentWords(name string) string {
	return strings.ReplaceAll(name, "_", "-")
}
