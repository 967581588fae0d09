package glm

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// design holds the classifications of the observations used, as a
// combined factor list: the treatment factors 0..nf-1, then the block (nf)
// when there is one.
type design struct {
	n          int
	nf         int // treatment factors
	names      []string
	nlev       []int
	lev        [][]int // lev[f][i], i over used observations
	levelNames [][]string
	y          []float64
	ybar       float64
	// x is the covariate over the used observations, centred on its mean
	// xbar and divided by its spread xs (root mean square deviation), so
	// its column is of the size of the dummy columns and a mean with the
	// covariate's coefficient 0 is at the covariate's mean; nil without a
	// covariate.
	x        []float64
	xbar, xs float64
}

func newDesign(m *Model, used []int) *design {
	d := &design{n: len(used), nf: len(m.Factors)}
	all := append([]Factor(nil), m.Factors...)
	if m.Block != nil {
		all = append(all, *m.Block)
	}
	for _, f := range all {
		d.names = append(d.names, f.Name)
		d.nlev = append(d.nlev, len(f.Levels))
		d.levelNames = append(d.levelNames, f.Levels)
		l := make([]int, len(used))
		for k, i := range used {
			l[k] = f.Index[i]
		}
		d.lev = append(d.lev, l)
	}
	d.y = make([]float64, len(used))
	for k, i := range used {
		d.y[k] = m.Response[i]
		d.ybar += m.Response[i]
	}
	d.ybar /= float64(len(used))
	if m.Covariate != nil {
		d.x = make([]float64, len(used))
		for _, i := range used {
			d.xbar += m.Covariate[i]
		}
		d.xbar /= float64(len(used))
		for _, i := range used {
			v := m.Covariate[i] - d.xbar
			d.xs += v * v
		}
		d.xs = math.Sqrt(d.xs / float64(len(used)))
		for k, i := range used {
			if d.xs > 0 {
				d.x[k] = (m.Covariate[i] - d.xbar) / d.xs
			}
		}
	}
	return d
}

// hasBlock reports whether the combined list ends with a block.
func (d *design) hasBlock() bool { return len(d.nlev) > d.nf }

func (d *design) block() int { return d.nf }

// ncols is the number of effect-coded columns of a term.
func (d *design) ncols(t term) int {
	c := 1
	for _, f := range t {
		c *= d.nlev[f] - 1
	}
	return c
}

// code is the treatment (dummy) coding of level l of a factor with m
// levels in column c, the first level being the reference: 1 when l is
// level c+1, else 0. Level −1 stands for the average over the levels,
// 1/m in every column (for estimated marginal means). This is the coding
// R uses by default (contr.treatment), which matters only for the basis
// of the REML type II hypotheses (see typeIIRows).
func code(l, c, m int) float64 {
	switch {
	case l < 0:
		return 1 / float64(m)
	case l == c+1:
		return 1
	}
	return 0
}

// termRow fills out (length ncols(t)) with the coded columns of term t
// for the given levels of its factors (levels(f) for f in t, −1 for the
// average over f), the first factor varying fastest.
func (d *design) termRow(t term, levels func(f int) int, out []float64) {
	for k := range out {
		out[k] = 1
	}
	stride := 1
	for _, f := range t {
		m := d.nlev[f]
		l := levels(f)
		for k := range out {
			c := (k / stride) % (m - 1)
			out[k] *= code(l, c, m)
		}
		stride *= m - 1
	}
}

// matrix is a design matrix: an intercept, the columns of each term and,
// with a covariate, its column last.
type matrix struct {
	terms []term
	start []int // first column of each term
	tp    int   // columns of the intercept and the terms
	cov   int   // the covariate's column, −1 when there is none
	p     int
	x     []float64 // n×p, row-major
}

// build codes the terms for the used observations; buildCov adds the
// design's covariate (when it has one) as the last column.
func (d *design) build(terms []term) *matrix { return d.buildWith(terms, false) }

func (d *design) buildCov(terms []term) *matrix { return d.buildWith(terms, d.x != nil) }

func (d *design) buildWith(terms []term, withCov bool) *matrix {
	mx := &matrix{terms: terms, p: 1, cov: -1}
	for _, t := range terms {
		mx.start = append(mx.start, mx.p)
		mx.p += d.ncols(t)
	}
	mx.tp = mx.p
	if withCov {
		mx.cov = mx.p
		mx.p++
	}
	mx.x = make([]float64, d.n*mx.p)
	for i := range d.n {
		row := mx.x[i*mx.p : (i+1)*mx.p]
		row[0] = 1
		for k, t := range terms {
			d.termRow(t, func(f int) int { return d.lev[f][i] }, row[mx.start[k]:mx.start[k]+d.ncols(t)])
		}
		if withCov {
			row[mx.cov] = d.x[i]
		}
	}
	return mx
}

// cols lists the columns of the terms with the given indices, after the
// intercept when withIntercept.
func (mx *matrix) cols(withIntercept bool, ks ...int) []int {
	var c []int
	if withIntercept {
		c = append(c, 0)
	}
	for _, k := range ks {
		a, b := mx.termRange(k)
		for j := a; j < b; j++ {
			c = append(c, j)
		}
	}
	return c
}

// normal holds the cross products of a design matrix with itself and the
// centred response.
type normal struct {
	p   int
	g   []float64 // p×p
	xty []float64
	yty float64
}

func (mx *matrix) normal(y []float64, ybar float64) *normal {
	p := mx.p
	ne := &normal{p: p, g: make([]float64, p*p), xty: make([]float64, p)}
	n := len(y)
	for i := range n {
		row := mx.x[i*p : (i+1)*p]
		yi := y[i] - ybar
		ne.yty += yi * yi
		for a, xa := range row {
			if xa == 0 {
				continue
			}
			ne.xty[a] += xa * yi
			ga := ne.g[a*p:]
			for b := a; b < p; b++ {
				ga[b] += xa * row[b]
			}
		}
	}
	for a := range p {
		for b := a + 1; b < p; b++ {
			ne.g[b*p+a] = ne.g[a*p+b]
		}
	}
	return ne
}

// dropTol is the relative size of a Cholesky pivot below which a column is
// taken to be a combination of the columns before it.
const dropTol = 1e-9

// chol is a Cholesky factorisation of the normal matrix restricted to a
// list of columns, taken in order; columns dependent on earlier ones are
// dropped.
type chol struct {
	cols []int     // columns asked for
	kept []bool    // per entry of cols
	l    []float64 // k×k lower triangle over the kept columns
	k    int
	z    []float64 // per entry of cols: L⁻¹X'y for kept ones, 0 for dropped
}

func (ne *normal) chol(cols []int) *chol {
	m := len(cols)
	c := &chol{cols: cols, kept: make([]bool, m), z: make([]float64, m)}
	l := make([]float64, m*m) // rows of kept columns, packed by kept index
	keptIdx := make([]int, 0, m)
	p := ne.p
	for a, ca := range cols {
		k := len(keptIdx)
		row := l[k*m : k*m+m]
		// row[j] for j<k: L[a][j]
		for j, cj := range keptIdx {
			s := ne.g[ca*p+cols[cj]]
			lj := l[j*m : j*m+m]
			for t := range j {
				s -= row[t] * lj[t]
			}
			row[j] = s / lj[j]
		}
		d := ne.g[ca*p+ca]
		for t := range k {
			d -= row[t] * row[t]
		}
		if !(d > dropTol*ne.g[ca*p+ca]) {
			clear(row)
			continue
		}
		row[k] = math.Sqrt(d)
		s := ne.xty[ca]
		for t := range k {
			s -= row[t] * c.z[keptIdx[t]]
		}
		c.kept[a] = true
		c.z[a] = s / row[k]
		keptIdx = append(keptIdx, a)
	}
	c.k = len(keptIdx)
	c.l = l
	return c
}

// ssOf sums z² over the entries of cols in [from, to).
func (c *chol) ssOf(from, to int) (ss float64, df int) {
	for a := from; a < to; a++ {
		if c.kept[a] {
			ss += c.z[a] * c.z[a]
			df++
		}
	}
	return ss, df
}

// fitOLS solves the normal equations on the kept columns of the full
// matrix: the coefficients (0 for dropped columns), (X'X)⁻ on the kept
// columns (0 elsewhere), and a basis of the null space of X.
type olsFit struct {
	beta  []float64
	xtxi  *mat.SymDense // p×p generalised inverse
	null  [][]float64
	rank  int
	kept  []int
	rss   float64
	xtxiK *mat.SymDense // inverse on the kept columns only
}

func (ne *normal) fit(all []int) (*olsFit, error) {
	c := ne.chol(all)
	p := ne.p
	var kept, dropped []int
	for a, col := range all {
		if c.kept[a] {
			kept = append(kept, col)
		} else {
			dropped = append(dropped, col)
		}
	}
	k := len(kept)
	gk := mat.NewSymDense(k, nil)
	for a, ca := range kept {
		for b := a; b < k; b++ {
			gk.SetSym(a, b, ne.g[ca*p+kept[b]])
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(gk) {
		return nil, errorf(NotEstimable, "", -1, "the effects cannot be separated with the plots that have data; check that the treatment combinations have data")
	}
	inv := mat.NewSymDense(k, nil)
	if err := ch.InverseTo(inv); err != nil {
		return nil, errorf(NotEstimable, "", -1, "the effects cannot be separated with the plots that have data; check that the treatment combinations have data")
	}
	f := &olsFit{beta: make([]float64, p), xtxi: mat.NewSymDense(p, nil), rank: k, kept: kept, xtxiK: inv}
	rhs := make([]float64, k)
	for a, ca := range kept {
		rhs[a] = ne.xty[ca]
	}
	for a, ca := range kept {
		s := 0.0
		for b := range k {
			s += inv.At(a, b) * rhs[b]
			f.xtxi.SetSym(ca, kept[b], inv.At(a, b))
		}
		f.beta[ca] = s
	}
	f.rss = ne.yty
	for a := range kept {
		f.rss -= f.beta[kept[a]] * rhs[a]
	}
	if f.rss < 0 {
		f.rss = 0
	}
	for _, cd := range dropped {
		v := make([]float64, p)
		v[cd] = 1
		for a := range k {
			s := 0.0
			for b, cb := range kept {
				s += inv.At(a, b) * ne.g[cb*p+cd]
			}
			v[kept[a]] = -s
		}
		f.null = append(f.null, v)
	}
	return f, nil
}

// estimable reports whether l'β is estimable: l orthogonal to the null
// space of X.
func estimable(l []float64, null [][]float64) bool {
	for _, v := range null {
		s, nl, nv := 0.0, 0.0, 0.0
		for j := range l {
			s += l[j] * v[j]
			nl += l[j] * l[j]
			nv += v[j] * v[j]
		}
		if math.Abs(s) > 1e-7*math.Sqrt(nl*nv) {
			return false
		}
	}
	return true
}
