package dist

import "math"

// chebTable is a piecewise Chebyshev interpolant on [a, b]. The pieces come
// from dyadic bisection of [a, b], so a uniform grid of 2^level cells maps
// every point to its piece in constant time.
type chebTable struct {
	a, b    float64
	n       int       // coefficients per piece
	invCell float64   // cells per unit length
	lookup  []int32   // cell index → piece index
	lo, hi  []float64 // piece ends
	coef    []float64 // n coefficients per piece
}

// fitChebTable interpolates f at n Chebyshev points of the first kind on
// each piece, bisecting a piece (down to maxLevel bisections of [a, b]) until
// the sum of the magnitudes of its last four Chebyshev coefficients is at
// most tol. For a function analytic on the piece the coefficients decay
// geometrically and the interpolation error is about twice the first
// omitted coefficient, well below that sum.
func fitChebTable(f func(float64) float64, a, b float64, n int, tol float64, minLevel, maxLevel int) *chebTable {
	ct := &chebTable{a: a, b: b, n: n}
	type leaf struct {
		level int
		lo    float64
	}
	var leaves []leaf
	cosTab := make([]float64, n*n)
	for m := 0; m < n; m++ {
		for j := 0; j < n; j++ {
			cosTab[m*n+j] = math.Cos(math.Pi * float64(m) * (float64(j) + 0.5) / float64(n))
		}
	}
	vals := make([]float64, n)
	var rec func(lo, hi float64, level int)
	rec = func(lo, hi float64, level int) {
		if level < minLevel {
			mid := 0.5 * (lo + hi)
			rec(lo, mid, level+1)
			rec(mid, hi, level+1)
			return
		}
		c := 0.5 * (lo + hi)
		h := 0.5 * (hi - lo)
		// The n values are independent: computed on every processor.
		parallelRange(n, func(lo, hi int) {
			for j := lo; j < hi; j++ {
				vals[j] = f(c + h*cosTab[n+j])
			}
		})
		coef := make([]float64, n)
		for m := 0; m < n; m++ {
			var s float64
			for j := 0; j < n; j++ {
				s += vals[j] * cosTab[m*n+j]
			}
			coef[m] = 2 * s / float64(n)
		}
		coef[0] /= 2
		var tail float64
		for m := n - 4; m < n; m++ {
			tail += math.Abs(coef[m])
		}
		if (tail > tol || math.IsNaN(tail)) && level < maxLevel {
			rec(lo, c, level+1)
			rec(c, hi, level+1)
			return
		}
		leaves = append(leaves, leaf{level, lo})
		ct.lo = append(ct.lo, lo)
		ct.hi = append(ct.hi, hi)
		ct.coef = append(ct.coef, coef...)
	}
	rec(a, b, 0)
	top := 0
	for _, l := range leaves {
		if l.level > top {
			top = l.level
		}
	}
	cells := 1 << top
	ct.invCell = float64(cells) / (b - a)
	ct.lookup = make([]int32, cells)
	for p, l := range leaves {
		first := int(math.Round((l.lo - a) * ct.invCell))
		for c := first; c < first+(1<<(top-l.level)) && c < cells; c++ {
			ct.lookup[c] = int32(p)
		}
	}
	return ct
}

// eval returns the interpolant at x, which must lie in [a, b].
func (ct *chebTable) eval(x float64) float64 {
	c := int((x - ct.a) * ct.invCell)
	if c < 0 {
		c = 0
	} else if c >= len(ct.lookup) {
		c = len(ct.lookup) - 1
	}
	p := int(ct.lookup[c])
	lo, hi := ct.lo[p], ct.hi[p]
	u := (2*x - lo - hi) / (hi - lo)
	coef := ct.coef[p*ct.n : (p+1)*ct.n]
	// Clenshaw recurrence.
	var b1, b2 float64
	u2 := 2 * u
	for j := ct.n - 1; j >= 1; j-- {
		b1, b2 = coef[j]+u2*b1-b2, b1
	}
	return coef[0] + u*b1 - b2
}

// pieces returns the number of pieces.
func (ct *chebTable) pieces() int { return len(ct.lo) }
