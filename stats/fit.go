package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// rankTol is the relative size below which a diagonal element of R, compared
// with the norm of its column, marks the design as rank deficient.
const rankTol = 1e-9

// Fit fits the additive model m by least squares and returns its analysis
// of variance.
//
// Balanced data (every pair of factors crossed with the same number of
// observations in each cell, and any one-way layout) use the classic closed
// forms on centred data with compensated sums, so the results stay close to
// the float64 limit even when all responses share many leading digits.
//
// Unbalanced data with nuisance factors (missing plots) are fitted through
// the Frisch–Waugh–Lovell theorem: the treatment factor is absorbed exactly
// by subtracting treatment means, and the small matrix of nuisance dummy
// variables, centred within treatments, is fitted by Householder QR. Each
// factor's sum of squares is then adjusted for all the others (type II),
// least-squares means average the nuisance effects with equal weight over
// their levels, and PairSE gives the model standard error of each
// difference.
//
// Problems with the data (a treatment or block without observations, no
// error degrees of freedom, an exact fit, non-finite values, confounded
// factors) are returned as *InputError. Slices of unequal length and level
// indices out of range are programming errors and panic.
func Fit(m Model) (*ANOVA, error) { return fit(m, false) }

// factorInfo is a validated factor with its level counts.
type factorInfo struct {
	name   string
	role   Role
	levels int
	idx    []int
	counts []int
}

// fitResult is what either fitting path hands to assemble.
type fitResult struct {
	ssTrt    float64
	ssNuis   []float64
	sse      float64
	rawMeans []float64
	lsMeans  []float64
	fitted   []float64
	resid    []float64
	lev      []float64
	// w holds R⁻ᵀcᵢ for every treatment i (k×p, row-major), where cᵢ is the
	// difference between treatment i's average nuisance design row and the
	// equally weighted average over nuisance levels. nil when all cᵢ are 0.
	w []float64
	p int
}

func fit(m Model, forceQR bool) (*ANOVA, error) {
	n := len(m.Response)
	trt := prepFactor(m.Treatment, n, "treatment")
	trt.role = RoleTreatment
	nuis := make([]factorInfo, len(m.Nuisance))
	for f, nf := range m.Nuisance {
		nuis[f] = prepFactor(nf, n, defaultNuisanceName(f, len(m.Nuisance)))
		nuis[f].role = nf.Role
		if nf.Role == RoleNone {
			nuis[f].role = nuisanceRole(f, len(m.Nuisance))
		}
	}
	if n == 0 {
		return nil, &InputError{Kind: NoData, Level: -1, Obs: -1, Reason: ErrNoData.Reason}
	}
	for i, v := range m.Response {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, &InputError{Kind: NonFiniteValue, Level: -1, Obs: i,
				Reason: fmt.Sprintf("value number %d is not a finite number; mark it as missing instead", i+1)}
		}
	}
	if math.IsNaN(m.Origin) || math.IsInf(m.Origin, 0) {
		return nil, &InputError{Kind: NonFiniteValue, Level: -1, Obs: -1, Reason: "the common part of the values is not a finite number"}
	}
	if err := checkLevels(trt, nuis); err != nil {
		return nil, err
	}
	k := trt.levels
	p := 0
	for _, f := range nuis {
		p += f.levels - 1
	}
	dfe := n - k - p
	if dfe <= 0 {
		return nil, &InputError{Kind: NoErrorDF, Level: -1, Obs: -1,
			Reason: "there are too few observations to estimate the experimental error: each treatment needs more replicates, or fewer plots may be missing"}
	}
	balanced := isBalanced(trt, nuis, n)

	// Fit the data centred and scaled to [-1, 1], so that the analysis is
	// the same whatever the unit and origin of the values.
	y, sc := standardise(m.Response)
	if sc.spread == 0 {
		return nil, &InputError{Kind: ZeroErrorVariance, Level: -1, Obs: -1, Reason: sameValueReason}
	}
	if sc.spread > maxSpread {
		return nil, &InputError{Kind: NonFiniteValue, Level: -1, Obs: -1,
			Reason: "the values differ by too much to analyse (their squares cannot be represented); record them in a larger unit"}
	}
	maxAbs := 0.0
	for _, v := range y {
		maxAbs = math.Max(maxAbs, math.Abs(v))
	}

	gm := mean(y)
	d := make([]float64, n)
	for i, v := range y {
		d[i] = v - gm
	}
	md := mean(d)
	var ta accum
	for _, v := range d {
		ta.add((v - md) * (v - md))
	}
	sst := ta.sum()

	var r *fitResult
	if len(nuis) == 0 || (balanced && !forceQR) {
		r = closedForm(y, d, gm, md, trt, nuis)
	} else {
		var err error
		r, err = absorbedQR(y, gm, trt, nuis)
		if err != nil {
			return nil, err
		}
	}

	// Below this the residuals are rounding noise: the model fits exactly.
	floor := float64(n) * math.Pow(32*eps*maxAbs, 2)
	switch {
	case sst <= floor:
		return nil, &InputError{Kind: ZeroErrorVariance, Level: -1, Obs: -1, Reason: sameValueReason}
	case r.sse <= floor:
		reason := "every plot of a treatment has exactly the same value, so there is no experimental error to test against; check that values were not copied from plot to plot"
		if len(nuis) > 0 {
			reason = "the treatment and blocking effects explain every value exactly (for example every plot of a treatment has exactly the same value), so there is no experimental error to test against; check that values were not copied or filled in"
		}
		return nil, &InputError{Kind: ZeroErrorVariance, Level: -1, Obs: -1, Reason: reason}
	}
	a := assemble(r, trt, nuis, n, dfe, gm, sst, balanced)
	sc.origin = m.Origin
	sc.restore(a)
	return a, nil
}

const sameValueReason = "every plot has exactly the same value, so there is no variation to analyse; check that the data were entered for this trait"

// maxSpread is the largest spread of the values Fit accepts: sums of
// squares of larger differences would overflow float64.
const maxSpread = 1e150

// scaling maps the responses to y = s1·(c + s2·w), with s1 and s2 powers of
// two (so that dividing by them is exact) and w centred in [-1, 1].
type scaling struct {
	s1, c, s2 float64
	spread    float64 // s1·s2: the unit of w in the data's own unit
	origin    float64 // Model.Origin, added back to every level
}

// standardise returns the responses centred and scaled as scaling
// describes. Dividing by a power of two is exact; subtracting the centre
// from nearby values is exact too (Sterbenz), so the differences between
// the values survive intact even when they are tiny compared with the
// values themselves (1e15 + small differences). spread is 0 when every
// value is the same.
func standardise(y []float64) ([]float64, scaling) {
	maxAbs := 0.0
	for _, v := range y {
		maxAbs = math.Max(maxAbs, math.Abs(v))
	}
	if maxAbs == 0 {
		return make([]float64, len(y)), scaling{s1: 1, s2: 1}
	}
	s1 := pow2Above(maxAbs)
	z := make([]float64, len(y))
	for i, v := range y {
		z[i] = v / s1
	}
	c := mean(z)
	dev := 0.0
	for i := range z {
		z[i] -= c
		dev = math.Max(dev, math.Abs(z[i]))
	}
	if dev == 0 {
		return z, scaling{s1: s1, c: c, s2: 1}
	}
	s2 := pow2Above(dev)
	for i := range z {
		z[i] /= s2
	}
	return z, scaling{s1: s1, c: c, s2: s2, spread: s1 * s2}
}

// pow2Above is the smallest power of two not below v > 0.
func pow2Above(v float64) float64 {
	f, e := math.Frexp(v) // v = f·2^e, 0.5 ≤ f < 1
	if f == 0.5 {
		return math.Ldexp(1, e-1)
	}
	return math.Ldexp(1, e)
}

// level is a value of the standardised scale in the data's unit.
func (s scaling) level(w float64) float64 { return s.s1*(s.c+s.s2*w) + s.origin }

// restore puts the results of a fit to the standardised responses back in
// the data's unit: levels (means, fitted values) through level, differences
// (residuals, standard errors) times spread, sums of squares times spread².
// F, p, R², CV%, leverages and the relative efficiency do not depend on the
// unit and are left as they are. Sums of squares of data smaller than about
// 1e-154 fall below the float64 range and lose digits (or become 0); the
// tests and standard errors, computed on the standardised scale, do not.
func (s scaling) restore(a *ANOVA) {
	d, d2 := s.spread, s.spread*s.spread
	// CV% from the standardised fit: 100·√MSE / |grand mean|, unit free.
	gmz := s.c + s.s2*a.GrandMean
	a.CVPercent = 0
	a.RootMSE = d * math.Sqrt(a.MSE)
	switch {
	case s.origin != 0:
		a.GrandMean = s.s1*gmz + s.origin
		if a.GrandMean != 0 {
			a.CVPercent = 100 * a.RootMSE / math.Abs(a.GrandMean)
		}
	default:
		if gmz != 0 {
			a.CVPercent = 100 * s.s2 * math.Sqrt(a.MSE) / math.Abs(gmz)
		}
		a.GrandMean = s.s1 * gmz
	}
	a.MSE *= d2
	for i := range a.Sources {
		a.Sources[i].SS *= d2
		a.Sources[i].MS *= d2
	}
	a.meanW = make([]float64, len(a.Means))
	a.unit = d
	for i := range a.Means {
		m := &a.Means[i]
		a.meanW[i] = m.Mean
		m.Mean, m.RawMean, m.SE = s.level(m.Mean), s.level(m.RawMean), m.SE*d
	}
	for _, p := range []*float64{a.SEMean, a.SED} {
		if p != nil {
			*p *= d
		}
	}
	for i := range a.Fitted {
		a.Fitted[i] = s.level(a.Fitted[i])
		a.Residuals[i] *= d
	}
	inner := a.pairSE
	a.pairSE = func(i, j int) float64 { return d * inner(i, j) }
}

const eps = 0x1p-52

// prepFactor validates f against n observations (panicking on programming
// errors) and counts its levels.
func prepFactor(f Factor, n int, defName string) factorInfo {
	name := f.Name
	if name == "" {
		name = defName
	}
	if f.Levels < 0 {
		panic(fmt.Sprintf("stats: factor %q has negative level count %d", name, f.Levels))
	}
	if len(f.Index) != n {
		panic(fmt.Sprintf("stats: factor %q has %d level indices for %d responses", name, len(f.Index), n))
	}
	counts := make([]int, f.Levels)
	for i, l := range f.Index {
		if l < 0 || l >= f.Levels {
			panic(fmt.Sprintf("stats: factor %q: observation %d has level %d outside 0..%d", name, i, l, f.Levels-1))
		}
		counts[l]++
	}
	return factorInfo{name: name, levels: f.Levels, idx: f.Index, counts: counts}
}

func defaultNuisanceName(f, nf int) string {
	switch {
	case nf == 1:
		return "block"
	case nf == 2 && f == 0:
		return "row"
	case nf == 2 && f == 1:
		return "column"
	}
	return fmt.Sprintf("factor %d", f+1)
}

// checkLevels reports treatments or nuisance levels without observations.
func checkLevels(trt factorInfo, nuis []factorInfo) error {
	withData := 0
	for _, c := range trt.counts {
		if c > 0 {
			withData++
		}
	}
	if withData < 2 {
		return &InputError{Kind: TooFewTreatments, Factor: trt.name, Level: -1, Obs: -1, Reason: ErrTooFewTreatments.Reason}
	}
	for l, c := range trt.counts {
		if c == 0 {
			return &InputError{Kind: EmptyLevel, Factor: trt.name, Level: l, Obs: -1,
				Reason: fmt.Sprintf("treatment number %d has no plots with data; every treatment in the analysis needs at least one", l+1)}
		}
	}
	for _, f := range nuis {
		noun := levelNoun(f.name)
		if f.levels < 2 {
			return &InputError{Kind: TooFewLevels, Factor: f.name, Level: -1, Obs: -1,
				Reason: fmt.Sprintf("there is only one %s, so its effect cannot be separated; analyse without it", noun)}
		}
		for l, c := range f.counts {
			if c == 0 {
				return &InputError{Kind: EmptyLevel, Factor: f.name, Level: l, Obs: -1,
					Reason: fmt.Sprintf("%s number %d has no plots with data; leave it out of the analysis or record its plots", noun, l+1)}
			}
		}
	}
	return nil
}

// isBalanced reports whether every pair of factors is crossed with the same
// number of observations in each cell (for a one-way layout: equal
// replication). Such factors are orthogonal and the closed forms hold.
func isBalanced(trt factorInfo, nuis []factorInfo, n int) bool {
	fs := append([]factorInfo{trt}, nuis...)
	if len(fs) == 1 {
		for _, c := range trt.counts {
			if c != trt.counts[0] {
				return false
			}
		}
		return true
	}
	for a := 0; a < len(fs); a++ {
		for b := a + 1; b < len(fs); b++ {
			La, Lb := fs[a].levels, fs[b].levels
			if n%(La*Lb) != 0 {
				return false
			}
			want := n / (La * Lb)
			cell := make([]int, La*Lb)
			for i := 0; i < n; i++ {
				cell[fs[a].idx[i]*Lb+fs[b].idx[i]]++
			}
			for _, c := range cell {
				if c != want {
					return false
				}
			}
		}
	}
	return true
}

// closedForm fits a one-way layout (any replication) or a balanced
// orthogonal design from the deviations d = y − gm, whose mean is md.
func closedForm(y, d []float64, gm, md float64, trt factorInfo, nuis []factorInfo) *fitResult {
	n := len(d)
	fs := append([]factorInfo{trt}, nuis...)
	eff := make([][]float64, len(fs))
	ss := make([]float64, len(fs))
	var trtDevMeans []float64
	for fi, f := range fs {
		lm := levelMeans(d, f.idx, f.counts)
		if fi == 0 {
			trtDevMeans = append([]float64(nil), lm...)
		}
		var a accum
		for l := range lm {
			lm[l] -= md
			a.add(float64(f.counts[l]) * lm[l] * lm[l])
		}
		eff[fi] = lm
		ss[fi] = a.sum()
	}
	r := &fitResult{
		ssTrt:  ss[0],
		ssNuis: ss[1:],
		fitted: make([]float64, n),
		resid:  make([]float64, n),
		lev:    make([]float64, n),
	}
	var se accum
	for i := range d {
		var e float64
		h := 1 / float64(n)
		if len(fs) == 1 {
			// One-way: the residual is the deviation from the level mean.
			e = d[i] - trtDevMeans[trt.idx[i]]
			h = 1 / float64(trt.counts[trt.idx[i]])
		} else {
			e = d[i] - md
			for fi, f := range fs {
				l := f.idx[i]
				e -= eff[fi][l]
				h += 1/float64(f.counts[l]) - 1/float64(n)
			}
		}
		r.resid[i] = e
		r.fitted[i] = y[i] - e
		r.lev[i] = h
		se.add(e * e)
	}
	r.sse = se.sum()
	r.rawMeans = make([]float64, trt.levels)
	for l := range r.rawMeans {
		r.rawMeans[l] = gm + trtDevMeans[l]
	}
	r.lsMeans = r.rawMeans
	return r
}

// absorbedQR fits treatment + nuisance factors to unbalanced data: the
// treatment factor is absorbed by centring within treatments (an exact
// orthogonal projection) and the nuisance dummies are fitted by QR.
func absorbedQR(y []float64, gm float64, trt factorInfo, nuis []factorInfo) (*fitResult, error) {
	n := len(y)
	k := trt.levels
	off := make([]int, len(nuis)+1)
	for f, nf := range nuis {
		off[f+1] = off[f] + nf.levels - 1
	}
	p := off[len(nuis)]

	ybar := levelMeans(y, trt.idx, trt.counts)
	yt := make([]float64, n)
	for i, v := range y {
		yt[i] = v - ybar[trt.idx[i]]
	}

	// frac[f][t*L+l]: share of treatment t's observations at level l of f.
	frac := make([][]float64, len(nuis))
	for f, nf := range nuis {
		L := nf.levels
		fr := make([]float64, k*L)
		for i := 0; i < n; i++ {
			fr[trt.idx[i]*L+nf.idx[i]]++
		}
		for t := 0; t < k; t++ {
			for l := 0; l < L; l++ {
				fr[t*L+l] /= float64(trt.counts[t])
			}
		}
		frac[f] = fr
	}

	// Full model, treatment absorbed: X̃ = dummies − treatment means.
	xt := make([]float64, n*p)
	for i := 0; i < n; i++ {
		t := trt.idx[i]
		row := xt[i*p : (i+1)*p]
		for f, nf := range nuis {
			L := nf.levels
			for l := 1; l < L; l++ {
				v := -frac[f][t*L+l]
				if nf.idx[i] == l {
					v++
				}
				row[off[f]+l-1] = v
			}
		}
	}
	full, ok := lsq(xt, n, p, yt)
	if !ok {
		return nil, &InputError{Kind: Confounded, Level: -1, Obs: -1,
			Reason: "with the plots that have data, the treatment effects cannot be separated from the blocking effects; too many plots are missing in the same places"}
	}

	// Nuisance factors only (treatment SS adjusted for them).
	xc := make([]float64, n*p)
	yc := make([]float64, n)
	for i := 0; i < n; i++ {
		yc[i] = y[i] - gm
		row := xc[i*p : (i+1)*p]
		for f, nf := range nuis {
			for l := 1; l < nf.levels; l++ {
				v := -float64(nf.counts[l]) / float64(n)
				if nf.idx[i] == l {
					v++
				}
				row[off[f]+l-1] = v
			}
		}
	}
	nuisOnly, ok := lsq(xc, n, p, yc)
	if !ok {
		return nil, &InputError{Kind: Confounded, Level: -1, Obs: -1, Reason: ErrConfounded.Reason}
	}

	r := &fitResult{
		ssTrt:  math.Max(0, nuisOnly.sse-full.sse),
		ssNuis: make([]float64, len(nuis)),
		sse:    full.sse,
		resid:  full.resid,
		fitted: make([]float64, n),
		lev:    make([]float64, n),
		p:      p,
	}

	// Each nuisance factor adjusted for treatment and the other factors.
	for f := range nuis {
		q := p - (off[f+1] - off[f])
		sub := make([]float64, n*q)
		for i := 0; i < n; i++ {
			row := xt[i*p : (i+1)*p]
			s := sub[i*q : (i+1)*q]
			copy(s, row[:off[f]])
			copy(s[off[f]:], row[off[f+1]:])
		}
		drop, ok := lsq(sub, n, q, yt)
		if !ok {
			return nil, &InputError{Kind: Confounded, Level: -1, Obs: -1, Reason: ErrConfounded.Reason}
		}
		r.ssNuis[f] = math.Max(0, drop.sse-full.sse)
	}

	// Fitted values and leverages: ŷ = ȳ_t + x̃ᵀβ, h = 1/n_t + ‖R⁻ᵀx̃‖².
	v := make([]float64, p)
	for i := 0; i < n; i++ {
		t := trt.idx[i]
		r.fitted[i] = y[i] - full.resid[i]
		forwardRT(full.r, p, xt[i*p:(i+1)*p], v)
		r.lev[i] = 1/float64(trt.counts[t]) + dot(v, v)
	}

	// Least-squares means: ȳ_t − cₜᵀβ, with cₜ the treatment's average
	// design row minus the equal-weight average over nuisance levels.
	r.rawMeans = ybar
	r.lsMeans = make([]float64, k)
	r.w = make([]float64, k*p)
	c := make([]float64, p)
	for t := 0; t < k; t++ {
		for f, nf := range nuis {
			L := nf.levels
			for l := 1; l < L; l++ {
				c[off[f]+l-1] = frac[f][t*L+l] - 1/float64(L)
			}
		}
		r.lsMeans[t] = ybar[t] - dot(c, full.beta)
		forwardRT(full.r, p, c, r.w[t*p:(t+1)*p])
	}
	return r, nil
}

// lsqResult is a least-squares fit.
type lsqResult struct {
	beta  []float64
	resid []float64
	sse   float64
	r     []float64 // p×p upper triangular factor, row-major
}

// lsq fits y ≈ Xβ by Householder QR (X is n×p row-major). It reports false
// when X is rank deficient.
func lsq(x []float64, n, p int, y []float64) (lsqResult, bool) {
	if p == 0 {
		res := append([]float64(nil), y...)
		return lsqResult{resid: res, sse: sumSq(res)}, true
	}
	a := mat.NewDense(n, p, x)
	var qr mat.QR
	qr.Factorize(a)
	var rd mat.Dense
	qr.RTo(&rd)
	rr := make([]float64, p*p)
	for i := 0; i < p; i++ {
		for j := i; j < p; j++ {
			rr[i*p+j] = rd.At(i, j)
		}
	}
	for j := 0; j < p; j++ {
		// The entries are centred 0/1 dummies, so a plain sum of squares
		// cannot overflow.
		var ss float64
		for i := 0; i < n; i++ {
			ss += x[i*p+j] * x[i*p+j]
		}
		norm := math.Sqrt(ss)
		if norm == 0 || math.Abs(rr[j*p+j]) <= rankTol*norm {
			return lsqResult{}, false
		}
	}
	var bv mat.VecDense
	if err := qr.SolveVecTo(&bv, false, mat.NewVecDense(n, y)); err != nil {
		return lsqResult{}, false
	}
	beta := make([]float64, p)
	for j := range beta {
		beta[j] = bv.AtVec(j)
	}
	res := make([]float64, n)
	for i := 0; i < n; i++ {
		res[i] = y[i] - dot(x[i*p:(i+1)*p], beta)
	}
	return lsqResult{beta: beta, resid: res, sse: sumSq(res), r: rr}, true
}

// forwardRT solves Rᵀw = c for w, R p×p upper triangular row-major.
func forwardRT(r []float64, p int, c, w []float64) {
	for j := 0; j < p; j++ {
		s := c[j]
		for m := 0; m < j; m++ {
			s -= r[m*p+j] * w[m]
		}
		w[j] = s / r[j*p+j]
	}
}

func dot(a, b []float64) float64 {
	var s float64
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

// fSurvival is P(F > f) for the F(d1, d2) distribution, computed as the
// regularised incomplete beta I_x(d2/2, d1/2) at x = d2/(d2 + d1·f) so
// that small probabilities keep their relative accuracy (1 − CDF would
// lose them below about 1e-16).
func fSurvival(f float64, d1, d2 int) float64 {
	if f <= 0 {
		return 1
	}
	x := float64(d2) / (float64(d2) + float64(d1)*f)
	return distuv.Beta{Alpha: float64(d2) / 2, Beta: float64(d1) / 2}.CDF(x)
}

// assemble turns a fit into the ANOVA table and summaries.
func assemble(r *fitResult, trt factorInfo, nuis []factorInfo, n, dfe int, gm, sst float64, balanced bool) *ANOVA {
	k := trt.levels
	mse := r.sse / float64(dfe)
	line := func(name string, role Role, df int, ss float64) Source {
		ms := ss / float64(df)
		f := ms / mse
		return Source{Name: name, Role: role, DF: df, SS: ss, MS: ms, HasTest: true, F: f, P: fSurvival(f, df, dfe)}
	}
	src := make(Table, 0, len(nuis)+3)
	src = append(src, line(trt.name, RoleTreatment, k-1, r.ssTrt))
	for f, nf := range nuis {
		src = append(src, line(nf.name, nf.role, nf.levels-1, r.ssNuis[f]))
	}
	src = append(src,
		Source{Name: "error", Role: RoleError, DF: dfe, SS: r.sse, MS: mse},
		Source{Name: "total", Role: RoleTotal, DF: n - 1, SS: sst})

	a := &ANOVA{
		Sources:   src,
		N:         n,
		GrandMean: gm,
		MSE:       mse,
		DFError:   dfe,
		RSquared:  1 - r.sse/sst,
		Balanced:  balanced,
		Adjusted:  !balanced && len(nuis) > 0,
		Fitted:    r.fitted,
		Residuals: r.resid,
		Leverage:  r.lev,
	}
	p := r.p
	w := r.w
	a.Means = make([]LevelMean, k)
	for t := range a.Means {
		v := 1 / float64(trt.counts[t])
		if w != nil {
			wt := w[t*p : (t+1)*p]
			v += dot(wt, wt)
		}
		a.Means[t] = LevelMean{N: trt.counts[t], Mean: r.lsMeans[t], RawMean: r.rawMeans[t], SE: math.Sqrt(mse * v)}
	}
	if balanced {
		reps := float64(n) / float64(k)
		se, sed := math.Sqrt(mse/reps), math.Sqrt(2*mse/reps)
		a.SEMean, a.SED = &se, &sed
	}
	if blk, ok := src.Line(RoleBlock); ok && len(nuis) == 1 && mse > 0 {
		re := relativeEfficiency(blk.MS, mse, nuis[0].levels, k, a.DFError)
		a.RelativeEfficiency = &re
	}
	counts := trt.counts
	a.pairSE = func(i, j int) float64 {
		if i < 0 || i >= k || j < 0 || j >= k {
			panic(fmt.Sprintf("stats: PairSE(%d, %d) outside 0..%d", i, j, k-1))
		}
		if i == j {
			return 0
		}
		v := 1/float64(counts[i]) + 1/float64(counts[j])
		if w != nil {
			wi, wj := w[i*p:(i+1)*p], w[j*p:(j+1)*p]
			for m := range wi {
				dm := wi[m] - wj[m]
				v += dm * dm
			}
		}
		return math.Sqrt(mse * v)
	}
	return a
}

// relativeEfficiency of an RCBD with r blocks and t treatments against a
// completely randomised design, from the block mean square eb and the error
// mean square ee (Gomez & Gomez 1984, section 2.2.3):
//
//	RE = [(r−1)·Eb + r(t−1)·Ee] / [(rt−1)·Ee].
//
// When the error degrees of freedom are below 20 the ratio is multiplied by
// the precision adjustment k = [(n₁+1)(n₂+3)] / [(n₁+3)(n₂+1)], with
// n₁ = (r−1)(t−1) and n₂ = t(r−1) the error df of the RCBD and of the CRD
// (same section, from memory).
//
// With missing plots the same formula is applied to the block mean square
// adjusted for treatments and to the actual error df (n₁ = error df, n₂ =
// n₁ + r − 1, which reduce to the values above for complete data): an
// approximation, as usual for incomplete RCBDs (common practice).
func relativeEfficiency(eb, ee float64, r, t, dfe int) float64 {
	rf, tf := float64(r), float64(t)
	re := ((rf-1)*eb + rf*(tf-1)*ee) / ((rf*tf - 1) * ee)
	n1 := float64(dfe)
	if n1 < 20 {
		n2 := n1 + rf - 1
		re *= ((n1 + 1) * (n2 + 3)) / ((n1 + 3) * (n2 + 1))
	}
	return re
}
