package dist

import (
	"errors"
	"math"
	"math/rand/v2"
	"sort"

	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// ManyToOne is the joint distribution of k t statistics that share one
// error estimate,
//
//	T_i = Z_i / S,   Z ~ N(0, R),   S = χ_Nu/√Nu,
//
// as in Dunnett's comparisons of k treatments with one control (Dunnett
// 1955, "A multiple comparison procedure for comparing several treatments
// with a control", J. Am. Stat. Assoc. 50, 1096–1121). Its Survival gives
// the single-step adjusted p-value P(max_i |T_i| > c) (two-sided) or
// P(max_i T_i > c) (one-sided), and Quantile the critical value of
// simultaneous confidence intervals.
//
// Three methods, chosen by NewManyToOne from the correlation matrix:
//
//   - Product: when R_ij = λ_i λ_j for i ≠ j (equal replication gives
//     λ_i = 1/√2, R_ij = ½; unequal replication in a one-way layout gives
//     λ_i = √(n_i/(n_i+n_0))), Z_i = √(1-λ_i²) X_i + λ_i W with independent
//     standard normals, and the probability is the double integral
//
//     P(max|T_i| > c) = ∫ f_S(s) ∫ φ(w) [1 − Π_i (Φ(a_i) − Φ(b_i))] dw ds,
//     a_i = (cs − λ_i w)/√(1−λ_i²),  b_i = (−cs − λ_i w)/√(1−λ_i²),
//
//     The inner integral H(u) (over w, for u = c·s) is a fixed
//     Gauss–Legendre rule on pieces scaled to the steepest λ, tabulated once
//     per distribution as a piecewise Chebyshev interpolant in u; the outer
//     integral over s is adaptive Gauss–Kronrod on that table, so every
//     critical value and p-value after the first costs microseconds. Tests
//     hold it to 1e-11 of nested adaptive quadrature in both variables
//     (itself good to about 1e-12); Error reports 1e-11. Terms with the
//     same λ are grouped, so large k costs little.
//
//   - Lattice: a general R (for example a blocked layout with missing plots)
//     with k ≤ LatticeMaxK: the separation-of-variables transformation of
//     Genz & Bretz (2002), J. Comput. Graph. Stat. 11, 950–971, integrated by
//     a randomised rank-1 lattice rule (Richtmyer generators, baker's
//     periodisation) over 12 seeded random shifts, adding points (1024,
//     1536, 2048, 3072, ... up to 65536 a shift, each step extending the
//     sums already made) until 3.5 standard errors of the 12 shift
//     estimates are below Tol. The closest
//     one-factor structure, integrated exactly, is the control variate. The
//     seed is fixed, so results repeat exactly; Error reports that estimate.
//     Quantile takes Newton steps from the one-factor critical value, so it
//     costs a few lattice integrals, not a bisection's forty.
//
//   - Factor: a general R with k > LatticeMaxK: the product method applied to
//     the closest one-factor structure λλ' (Hsu 1992, J. Comput. Graph. Stat.
//     1, 151–168). This is an approximation; Error reports NaN for it, and
//     MaxFactorResidual the largest |R_ij − λ_iλ_j| left out.
type ManyToOne struct {
	k      int
	nu     float64
	method ManyToOneMethod
	// Product and factor methods: grouped λ values and their counts.
	lambda []float64
	count  []int
	// Lattice method: Cholesky factor of R (lower, row-major) and the
	// points' S values, cached per size.
	chol, cholFactor []float64
	sCache           [][]float64
	tables           [2]*condTable
	panels           []outerPanel
	tol              float64
	residual         float64
}

// ManyToOneMethod names the method of a ManyToOne distribution.
type ManyToOneMethod string

// The methods of ManyToOne.
const (
	ProductMethod ManyToOneMethod = "exact-product"
	LatticeMethod ManyToOneMethod = "lattice"
	FactorMethod  ManyToOneMethod = "factor-approximation"
)

// LatticeMaxK is the largest number of comparisons integrated by the
// lattice rule; larger general problems use the factor approximation.
const LatticeMaxK = 60

// DefaultLatticeTol is the absolute error target of the lattice method.
const DefaultLatticeTol = 1e-6

// productTol is how closely R_ij must equal λ_iλ_j for the product method.
const productTol = 1e-10

// NewManyToOne returns the distribution for the k × k correlation matrix
// corr (row-major) and nu error degrees of freedom (math.Inf(1) for a known
// variance). tol is the lattice method's absolute error target (0: the
// default).
func NewManyToOne(corr []float64, k int, nu, tol float64) (*ManyToOne, error) {
	if k < 1 || len(corr) != k*k {
		panic("dist: ManyToOne needs a k × k correlation matrix")
	}
	if !(nu > 0) {
		return nil, errors.New("dist: ManyToOne needs positive degrees of freedom")
	}
	for i := 0; i < k; i++ {
		if math.Abs(corr[i*k+i]-1) > 1e-9 {
			return nil, errors.New("dist: the correlation matrix must have a unit diagonal")
		}
		for j := 0; j < k; j++ {
			v := corr[i*k+j]
			if math.IsNaN(v) || math.Abs(v) > 1+1e-12 || math.Abs(v-corr[j*k+i]) > 1e-9 {
				return nil, errors.New("dist: the correlation matrix must be symmetric with entries in [-1, 1]")
			}
		}
	}
	if tol <= 0 {
		tol = DefaultLatticeTol
	}
	d := &ManyToOne{k: k, nu: nu, tol: tol}
	lam, res := oneFactor(corr, k)
	for _, l := range lam {
		if math.Abs(l) >= 1-1e-12 {
			return nil, errors.New("dist: two comparisons are perfectly correlated")
		}
	}
	d.residual = res
	switch {
	case res <= productTol:
		d.method = ProductMethod
	case k <= LatticeMaxK:
		d.method = LatticeMethod
		l, ok := cholesky(corr, k)
		if !ok {
			return nil, errors.New("dist: the correlation matrix is not positive definite")
		}
		d.chol = l
		f := make([]float64, k*k)
		for i := 0; i < k; i++ {
			for j := 0; j < k; j++ {
				f[i*k+j] = lam[i] * lam[j]
			}
			f[i*k+i] = 1
		}
		if d.cholFactor, ok = cholesky(f, k); !ok {
			return nil, errors.New("dist: the one-factor structure is not positive definite")
		}
	default:
		d.method = FactorMethod
	}
	grid := 1e-13
	if d.method == FactorMethod {
		grid = factorGrid // the approximation need not tell λs closer than this apart
	}
	d.lambda, d.count = groupLambda(lam, grid)
	return d, nil
}

// Method returns the method used.
func (d *ManyToOne) Method() ManyToOneMethod { return d.method }

// MaxFactorResidual returns the largest |R_ij − λ_iλ_j| of the closest
// one-factor structure (0 for a product structure).
func (d *ManyToOne) MaxFactorResidual() float64 { return d.residual }

// Error returns the absolute error bound (product), estimate (lattice) or
// NaN (factor approximation) of Survival.
func (d *ManyToOne) Error() float64 {
	switch d.method {
	case ProductMethod:
		return 1e-11
	case LatticeMethod:
		return d.tol
	}
	return math.NaN()
}

// Survival returns P(max_i |T_i| > c) when twoSided, else P(max_i T_i > c).
func (d *ManyToOne) Survival(c float64, twoSided bool) float64 {
	if math.IsNaN(c) {
		return math.NaN()
	}
	if twoSided {
		c = math.Abs(c)
	}
	if math.IsInf(c, 1) {
		return 0
	}
	if d.method == LatticeMethod {
		return clamp01(d.latticeSurvival(c, twoSided))
	}
	return clamp01(d.productSurvival(c, twoSided))
}

// Quantile returns the critical value c with Survival(c) = alpha.
func (d *ManyToOne) Quantile(alpha float64, twoSided bool) float64 {
	if !(alpha > 0 && alpha < 1) {
		panic(badPercentile)
	}
	if d.method == LatticeMethod {
		return d.latticeQuantile(alpha, twoSided)
	}
	return bisectQuantile(alpha, twoSided, func(c float64) float64 { return d.Survival(c, twoSided) })
}

// bisectQuantile solves sf(c) = alpha for a decreasing sf by bracketing
// and bisection to 1e-10 relative.
func bisectQuantile(alpha float64, twoSided bool, sf func(float64) float64) float64 {
	lo, hi := 0.0, 1.0
	if !twoSided {
		lo = -1
		for sf(lo) < alpha {
			lo *= 2
		}
	}
	for sf(hi) > alpha {
		lo, hi = hi, 2*hi
	}
	for i := 0; i < 100 && hi-lo > 1e-10*math.Max(1, math.Abs(hi)); i++ {
		mid := (lo + hi) / 2
		if sf(mid) > alpha {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// latticeQuantile solves Survival(c) = alpha for the lattice method with
// few lattice evaluations: from the critical value of the closest
// one-factor structure (exact and cheap), Newton steps with that
// structure's slope. The general survival differs from the one-factor one
// by a small smooth function, so each step shrinks the error by the ratio
// of the slopes; it stops when Survival(c) is within 1e-9 of alpha or the
// step is below 1e-9, and otherwise (at most latticeNewton evaluations)
// returns the best c seen. Survival is a deterministic function of c (the
// points are fixed), so this is the root a bisection of it would find, and
// the intervals agree with the p-values (an interval excludes 0 exactly
// when p < alpha) except within 1e-9 of alpha.
func (d *ManyToOne) latticeQuantile(alpha float64, twoSided bool) float64 {
	c := bisectQuantile(alpha, twoSided, func(c float64) float64 { return clamp01(d.productSurvival(c, twoSided)) })
	best, bestGap := c, math.Inf(1)
	for i := 0; i < latticeNewton; i++ {
		gap := d.Survival(c, twoSided) - alpha
		if math.Abs(gap) < bestGap {
			best, bestGap = c, math.Abs(gap)
		}
		if math.Abs(gap) <= 1e-9 {
			break
		}
		const h = 1e-4
		slope := (d.productSurvival(c+h, twoSided) - d.productSurvival(c-h, twoSided)) / (2 * h)
		if !(slope < 0) {
			break
		}
		step := gap / slope
		c -= step
		if math.Abs(step) <= 1e-9 {
			// Not evaluated at the new c; the step is below any
			// resolution the lattice's p-values have.
			return c
		}
	}
	return best
}

// latticeNewton bounds the lattice evaluations of latticeQuantile.
const latticeNewton = 8

// ---- product structure ----

// productSurvival integrates over S the conditional survival H(c·s), with
// H read from its Chebyshev table (cheap, so the outer integral can be
// adaptive: H(c·s) changes on the scale 1/c in s, which no fixed rule
// follows for every c). The first level of the adaptive rule, the 15
// Kronrod nodes of each piece between sBreaks and the density of S there,
// is the same for every c and kept (outerPanels); a piece is bisected only
// when its Kronrod–Gauss difference asks for it, exactly as adaptiveGK
// would.
func (d *ManyToOne) productSurvival(c float64, twoSided bool) float64 {
	t := d.table(twoSided)
	if math.IsInf(d.nu, 1) {
		return t.at(c)
	}
	if d.panels == nil {
		d.panels = outerPanels(d.nu)
	}
	f := func(s float64) pair { return pair{sDensity(s, d.nu) * t.at(c*s), 0} }
	var sum float64
	for i := range d.panels {
		p := &d.panels[i]
		fc := p.dens[7] * t.at(c*p.x[7])
		kv := gk15w[7] * fc
		gv := g7w[3] * fc
		for j := 0; j < 7; j++ {
			sv := p.dens[j]*t.at(c*p.x[j]) + p.dens[14-j]*t.at(c*p.x[14-j])
			kv += gk15w[j] * sv
			if j%2 == 1 {
				gv += g7w[j/2] * sv
			}
		}
		kv *= p.h
		gv *= p.h
		if math.Abs(kv-gv) <= math.Max(outerAbs, outerRel*math.Abs(kv)) {
			sum += kv
			continue
		}
		mid := 0.5 * (p.a + p.b)
		sum += adaptiveGK(f, p.a, mid, outerRel, outerAbs, outerDepth-1).v +
			adaptiveGK(f, mid, p.b, outerRel, outerAbs, outerDepth-1).v
	}
	return sum
}

// outerPanel is one piece of the outer integral with its 15 Kronrod nodes
// (x[7] the centre, x[j] and x[14−j] the pair c ∓ h·gk15x[j]) and the
// density of S at them.
type outerPanel struct {
	a, b, h float64
	x, dens [15]float64
}

// outerPanels splits each piece between sBreaks, as adaptiveGK would, until
// the 15-point rule integrates the density of S alone to the outer
// tolerance: then only H(c·s) can ask for more, and only where it changes
// fast.
func outerPanels(nu float64) []outerPanel {
	b := sBreaks(nu)
	var ps []outerPanel
	var split func(a, b float64, depth int)
	split = func(a, b float64, depth int) {
		p := outerPanel{a: a, b: b, h: 0.5 * (b - a)}
		c := 0.5 * (a + b)
		for j := 0; j < 7; j++ {
			p.x[j] = c - p.h*gk15x[j]
			p.x[14-j] = c + p.h*gk15x[j]
		}
		p.x[7] = c
		for j := range p.x {
			p.dens[j] = sDensity(p.x[j], nu)
		}
		kv := gk15w[7] * p.dens[7]
		gv := g7w[3] * p.dens[7]
		for j := 0; j < 7; j++ {
			sv := p.dens[j] + p.dens[14-j]
			kv += gk15w[j] * sv
			if j%2 == 1 {
				gv += g7w[j/2] * sv
			}
		}
		if depth > 0 && math.Abs(kv-gv)*p.h > math.Max(outerAbs, outerRel*math.Abs(kv*p.h)) {
			split(a, c, depth-1)
			split(c, b, depth-1)
			return
		}
		ps = append(ps, p)
	}
	for i := 1; i < len(b); i++ {
		if b[i] > b[i-1] {
			split(b[i-1], b[i], 12)
		}
	}
	return ps
}

// The outer integral's panels are accepted at a Kronrod–Gauss difference
// of outerRel relative or outerAbs absolute; the Kronrod estimate is far
// more accurate than that difference (the error of the 15-point rule on a
// smooth panel is about the square of it). outerDepth bounds the
// bisections of a piece.
const (
	outerRel   = 1e-11
	outerAbs   = 1e-16
	outerDepth = 24
)

// sBreaks returns break points for integrals over S = χ_ν/√ν covering all
// but about 1e-16 of its probability.
func sBreaks(nu float64) []float64 {
	chi := distuv.ChiSquared{K: nu}
	var b []float64
	for _, p := range []float64{1e-16, 1e-6, 0.01, 0.2, 0.5, 0.8, 0.99, 1 - 1e-6, 1 - 1e-16} {
		b = append(b, math.Sqrt(chi.Quantile(p)/nu))
	}
	return b
}

// sDensity is the density of S = χ_ν/√ν. Below s = ½ it is computed
// directly, 2a^a/Γ(a) s^(ν−1) e^(−a s²) with a = ν/2 (logScaledChiDensity
// forms s² − 1 and loses s² below 1e-8, which matters when ν = 1 and the
// density does not vanish at 0); there no large terms cancel unless ν is
// large, and then the density is below e^(−0.6a).
func sDensity(s, nu float64) float64 {
	if s <= 0 {
		return 0
	}
	if s >= 0.5 {
		return math.Exp(logScaledChiDensity(s, nu))
	}
	a := nu / 2
	lg, _ := math.Lgamma(a)
	return math.Exp(ln2 + a*math.Log(a) - lg + (nu-1)*math.Log(s) - a*s*s)
}

// wEnd bounds the inner integral over the common factor W: the standard
// normal mass beyond ±wEnd is below 3e-19.
const wEnd = 9.0

// wRule returns Gauss–Legendre nodes over w ∈ [−wEnd, wEnd] and their
// weights times φ(w), for the λ values of d: 24 nodes on each of equal
// pieces no wider than 2.5 (ample for φ itself) nor than 2.5·min √(1−λ²)/|λ|,
// the scale on which Φ((u − λw)/√(1−λ²)) changes with w.
func wRule(lambda []float64) (xs, ws []float64) {
	width := 2.5
	for _, l := range lambda {
		if l != 0 {
			width = math.Min(width, 2.5*math.Sqrt(1-l*l)/math.Abs(l))
		}
	}
	pieces := max(6, int(math.Ceil(2*wEnd/width)))
	x := make([]float64, 24)
	w := make([]float64, 24)
	for i := 0; i < pieces; i++ {
		a := -wEnd + 2*wEnd*float64(i)/float64(pieces)
		b := -wEnd + 2*wEnd*float64(i+1)/float64(pieces)
		quad.Legendre{}.FixedLocations(x, w, a, b)
		for j := range x {
			xs = append(xs, x[j])
			ws = append(ws, w[j]*phi(x[j]))
		}
	}
	return xs, ws
}

// condSurvival is 1 − P(all comparisons inside the limits | S = s) for
// u = c·s, H(u) = ∫ φ(w) [1 − Π_i (1 − q_i(w))] dw, by the fixed rule
// (xs, ws) from wRule. Two-sided, q_i(w) = A_i(w) + A_i(−w) with
// A_i(w) = Φ̄((u − λ_i w)/√(1−λ_i²)); the rule is symmetric (node j and
// node n−1−j are ±w), so each A is computed once.
func (d *ManyToOne) condSurvival(u float64, twoSided bool, xs, ws []float64) float64 {
	n := len(xs)
	groups := len(d.lambda)
	var tail []float64 // A_g at node j, j*groups + g
	if twoSided {
		tail = make([]float64, n*groups)
		for j, w := range xs {
			for g, l := range d.lambda {
				tail[j*groups+g] = normSurvival((u - l*w) / math.Sqrt(1-l*l))
			}
		}
	}
	var sum float64
	for i, w := range xs {
		var logIn float64
		full := false
		for g, l := range d.lambda {
			var q float64
			if twoSided {
				q = tail[i*groups+g] + tail[(n-1-i)*groups+g]
			} else {
				q = normSurvival((u - l*w) / math.Sqrt(1-l*l))
			}
			if q >= 1 {
				full = true
				break
			}
			if q < 1e-17 {
				logIn -= float64(d.count[g]) * q // log1p(−q) = −q to double precision
			} else {
				logIn += float64(d.count[g]) * math.Log1p(-q)
			}
		}
		if full {
			sum += ws[i]
			continue
		}
		sum += -math.Expm1(logIn) * ws[i]
	}
	return sum
}

func phi(w float64) float64 { return math.Exp(-w*w/2) / math.Sqrt(2*math.Pi) }

// oneFactor fits R_ij ≈ λ_iλ_j (i ≠ j) by the principal-axis iteration and
// returns λ and the largest off-diagonal residual.
func oneFactor(r []float64, k int) ([]float64, float64) {
	lam := make([]float64, k)
	switch k {
	case 1:
		return lam, 0
	case 2:
		v := r[1]
		if v < 0 {
			// R_12 = λ1λ2 < 0: opposite signs.
			lam[0], lam[1] = math.Sqrt(-v), -math.Sqrt(-v)
		} else {
			lam[0], lam[1] = math.Sqrt(v), math.Sqrt(v)
		}
		return lam, 0
	}
	// Alternating least squares on Σ_{i≠j} (R_ij − λ_iλ_j)²: each λ_i in
	// turn is the least-squares coefficient given the others, O(k²) a sweep.
	for i := range lam {
		lam[i] = 0.7
	}
	for sweep := 0; sweep < 200; sweep++ {
		var ss float64
		for _, l := range lam {
			ss += l * l
		}
		var change float64
		for i := 0; i < k; i++ {
			var num float64
			row := r[i*k : (i+1)*k]
			for j, l := range lam {
				if j != i {
					num += row[j] * l
				}
			}
			den := ss - lam[i]*lam[i]
			if den <= 0 {
				continue
			}
			v := num / den
			ss += v*v - lam[i]*lam[i]
			change = math.Max(change, math.Abs(v-lam[i]))
			lam[i] = v
		}
		if change < 1e-12 {
			break
		}
	}
	var res float64
	for i := 0; i < k; i++ {
		for j := i + 1; j < k; j++ {
			res = math.Max(res, math.Abs(r[i*k+j]-lam[i]*lam[j]))
		}
	}
	return lam, res
}

// factorGrid is the resolution of the λ values of the factor
// approximation: values closer than this are integrated as one.
const factorGrid = 1e-3

// groupLambda groups λ values that differ by at most grid.
func groupLambda(lam []float64, grid float64) ([]float64, []int) {
	s := append([]float64(nil), lam...)
	sort.Float64s(s)
	var vals []float64
	var counts []int
	for _, v := range s {
		if n := len(vals); n > 0 && math.Abs(vals[n-1]-v) <= grid {
			counts[n-1]++
			continue
		}
		vals = append(vals, v)
		counts = append(counts, 1)
	}
	return vals, counts
}

// ---- general structure: randomised lattice ----

func cholesky(r []float64, k int) ([]float64, bool) {
	var ch mat.Cholesky
	if !ch.Factorize(mat.NewSymDense(k, append([]float64(nil), r...))) {
		return nil, false
	}
	var l mat.TriDense
	ch.LTo(&l)
	out := make([]float64, k*k)
	for i := 0; i < k; i++ {
		for j := 0; j <= i; j++ {
			out[i*k+j] = l.At(i, j)
		}
	}
	return out, true
}

// latticeShifts is the number of random shifts of the lattice rule.
const latticeShifts = 12

// latticeSeed fixes the shifts, so results repeat exactly.
const latticeSeed = 0x6c617474696365

func (d *ManyToOne) latticeSurvival(c float64, twoSided bool) float64 {
	k := d.k
	dims := k // k−1 normal dimensions plus one for S (none for Nu = ∞)
	if math.IsInf(d.nu, 1) {
		dims = k - 1
	}
	gen := make([]float64, dims)
	for i := range gen {
		gen[i] = math.Sqrt(float64(primes[i%len(primes)])) // Richtmyer generators
		gen[i] -= math.Floor(gen[i])
	}
	rng := rand.New(rand.NewPCG(latticeSeed, uint64(k)))
	shifts := make([][]float64, latticeShifts)
	for i := range shifts {
		shifts[i] = make([]float64, dims)
		for j := range shifts[i] {
			shifts[i][j] = rng.Float64()
		}
	}
	chi := distuv.ChiSquared{K: d.nu}
	lower, upper := -c, c
	if !twoSided {
		lower = math.Inf(-1)
	}
	// sov returns P(all inside | point) by the separation of variables for
	// the lower Cholesky factor l.
	sov := func(l, y, w []float64, s float64) float64 {
		prod := 1.0
		wi := 0
		if !math.IsInf(d.nu, 1) {
			wi = 1
		}
		for i := 0; i < k; i++ {
			var sum float64
			for j := 0; j < i; j++ {
				sum += l[i*k+j] * y[j]
			}
			lii := l[i*k+i]
			var a float64
			if twoSided {
				a = distuv.UnitNormal.CDF((lower*s - sum) / lii)
			}
			b := distuv.UnitNormal.CDF((upper*s - sum) / lii)
			e := b - a
			if e <= 0 {
				return 0
			}
			prod *= e
			if i == k-1 {
				break
			}
			u := a + w[wi]*e
			wi++
			y[i] = distuv.UnitNormal.Quantile(math.Min(math.Max(u, 1e-300), 1-1e-16))
		}
		return prod
	}
	// The closest one-factor structure is integrated exactly and serves as
	// a control variate: the lattice rule only estimates the difference
	// between the general and the one-factor integrands at the same points,
	// which is small and smooth when R is near λλ'.
	exactIn := 1 - d.productSurvival(c, twoSided)
	// Each shift's sum over its points j = 1..n; a larger n adds the points
	// beyond the last n to the same sums (the Kronecker sequence
	// j·gen + shift is extensible), so no point is computed twice. The shifts are
	// independent and are summed on every processor.
	acc := make([]float64, latticeShifts)
	var est float64
	done := 0
	for n := latticeMinPoints; n <= latticeMaxPoints; n = nextLatticeN(n) {
		for si := range shifts {
			d.latticeS(chi, si, shifts[si], gen, n) // fill the cache before going parallel
		}
		parallelRange(latticeShifts, func(lo, hi int) {
			yg := make([]float64, k)
			yf := make([]float64, k)
			w := make([]float64, dims)
			for si := lo; si < hi; si++ {
				sh := shifts[si]
				s := d.sCache[si]
				a := acc[si]
				for j := done + 1; j <= n; j++ {
					for t := range w {
						x := float64(j)*gen[t] + sh[t]
						x -= math.Floor(x)
						w[t] = 1 - math.Abs(2*x-1) // baker's transformation
					}
					a += sov(d.chol, yg, w, s[j-1]) - sov(d.cholFactor, yf, w, s[j-1])
				}
				acc[si] = a
			}
		})
		done = n
		var sum, sum2 float64
		for _, a := range acc {
			m := a / float64(n)
			sum += m
			sum2 += m * m
		}
		est = sum / latticeShifts
		v := (sum2/latticeShifts - est*est) / (latticeShifts - 1)
		if 3.5*math.Sqrt(math.Max(v, 0)) <= d.tol {
			break
		}
	}
	return 1 - (exactIn + est)
}

// nextLatticeN returns the next number of points per shift after n: the
// steps alternate ×1.5 and ×4/3 (1024, 1536, 2048, 3072, ...), so the
// rule stops at most 50% beyond the points it needs.
func nextLatticeN(n int) int {
	if n&(n-1) == 0 {
		return n + n/2
	}
	return n / 3 * 4
}

// latticeMinPoints is the number of points per shift of the first
// estimate.
const latticeMinPoints = 1024

// latticeMaxPoints bounds the points per shift of the lattice rule.
const latticeMaxPoints = 1 << 16

// latticeS returns the S value of each of the first n points of shift si
// (all 1 for Nu = ∞), cached across calls: it depends neither on the
// critical value nor on the correlation.
func (d *ManyToOne) latticeS(chi distuv.ChiSquared, si int, sh, gen []float64, n int) []float64 {
	if d.sCache == nil {
		d.sCache = make([][]float64, latticeShifts)
	}
	have := d.sCache[si]
	for j := len(have) + 1; j <= n; j++ {
		s := 1.0
		if !math.IsInf(d.nu, 1) {
			x := float64(j)*gen[0] + sh[0]
			x -= math.Floor(x)
			u := 1 - math.Abs(2*x-1)
			s = math.Sqrt(chi.Quantile(math.Min(math.Max(u, 1e-300), 1-1e-16)) / d.nu)
		}
		have = append(have, s)
	}
	d.sCache[si] = have
	return have[:n]
}

// primes are the first primes, for the Richtmyer lattice generators.
var primes = [...]int{2, 3, 5, 7, 11, 13, 17, 19, 23, 29, 31, 37, 41, 43, 47, 53, 59, 61, 67, 71,
	73, 79, 83, 89, 97, 101, 103, 107, 109, 113, 127, 131, 137, 139, 149, 151, 157, 163, 167, 173,
	179, 181, 191, 193, 197, 199, 211, 223, 227, 229, 233, 239, 241, 251, 257, 263, 269, 271, 277, 281,
	283, 293, 307, 311, 313, 317, 331, 337, 347, 349}

// condTable is H(u) = condSurvival tabulated for u in [lo, hi] as a
// piecewise Chebyshev interpolant (fitChebTable) whose pieces are bisected
// until the last four coefficients sum to at most condTol (the factor
// approximation: factorCondTol): H is analytic in u, so the interpolation
// error is far below that. Two-sided, only u ≥ 0 is needed (c ≥ 0 and
// s > 0). hi is where the bound k·Φ̄(u) (two-sided 2k·Φ̄(u)) of H falls to
// 1e-20, and one-sided lo = −9.3, where 1 − H(u) ≤ Φ(u) is below 1e-20;
// beyond the ends H is read at the end, within 1e-20 of its value.
type condTable struct {
	lo, hi float64
	t      *chebTable
}

const (
	condTol       = 1e-14
	factorCondTol = 1e-11
	condEndTail   = 1e-20
)

func (d *ManyToOne) table(twoSided bool) *condTable {
	i := 0
	if twoSided {
		i = 1
	}
	if d.tables[i] != nil {
		return d.tables[i]
	}
	xs, ws := wRule(d.lambda)
	t := &condTable{lo: -9.3}
	bound := float64(d.k)
	if twoSided {
		t.lo = 0
		bound *= 2
	}
	lo, hi := 0.0, 40.0
	for hi-lo > 1e-3 {
		if mid := (lo + hi) / 2; bound*normSurvival(mid) > condEndTail {
			lo = mid
		} else {
			hi = mid
		}
	}
	t.hi = hi
	tol := condTol
	if d.method == FactorMethod {
		tol = factorCondTol
	}
	t.t = fitChebTable(func(u float64) float64 { return d.condSurvival(u, twoSided, xs, ws) },
		t.lo, t.hi, chebPoints, tol, 1, tableMaxBisect)
	d.tables[i] = t
	return t
}

func (t *condTable) at(u float64) float64 {
	return t.t.eval(math.Min(math.Max(u, t.lo), t.hi))
}
