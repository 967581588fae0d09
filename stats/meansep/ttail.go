package meansep

import (
	"math"

	"gonum.org/v1/gonum/mathext"
)

// tTail evaluates the two-sided t probability p(t) = 2·P(T > |t|) for a
// fixed number of degrees of freedom. For many evaluations it interpolates
// log p piecewise on [0, tmax] with Chebyshev polynomials, each piece
// checked against the direct value at points between the nodes; pieces
// that miss a relative 1e-12, and values beyond tmax, use the direct
// computation.
type tTail struct {
	nu   float64
	h    float64     // piece width
	tmax float64     // end of the interpolated range
	coef [][]float64 // Chebyshev coefficients of log p per piece; nil: direct
}

const (
	tTailDeg   = 14   // polynomial degree per piece
	tTailWidth = 0.25 // piece width in t
	tTailTol   = 1e-12
	// tTailMin is the number of evaluations from which interpolation pays.
	tTailMin = 2000
)

// direct computes p(t) from the regularised incomplete beta function:
// with y = t²/(ν+t²), P(|T| < t) = I_y(1/2, ν/2) and p = I_{1−y}(ν/2, 1/2)
// (Abramowitz & Stegun 26.7.1 with 26.5.27). The first form (p = 1 − I_y,
// accurate to about 1e-16 absolute) is used while p > 0.001, since passing
// 1 − y to the incomplete beta function loses digits when y is small.
func (tt *tTail) direct(t float64) float64 {
	t2 := t * t
	nu := tt.nu
	if t2 < nu {
		if c := mathext.RegIncBeta(0.5, nu/2, t2/(nu+t2)); c < 0.999 {
			return 1 - c
		}
	}
	return math.Min(1, mathext.RegIncBeta(nu/2, 0.5, nu/(nu+t2)))
}

// newTTail prepares p(t) for n evaluations with |t| ≤ tmax.
func newTTail(nu float64, n int, tmax float64) *tTail {
	tt := &tTail{nu: nu, h: tTailWidth}
	if n < tTailMin || !(tmax > 0) || math.IsInf(tmax, 0) {
		return tt
	}
	// Beyond t = 100 (p below 1e-200 for ν ≥ 100; far in the tail for any
	// ν) direct evaluation is used, which also bounds the table's size.
	pieces := int(math.Ceil(math.Min(tmax, 100) / tt.h))
	tt.tmax = float64(pieces) * tt.h
	tt.coef = make([][]float64, pieces)
	const m = tTailDeg + 1
	f := make([]float64, m)
	for p := range pieces {
		a := float64(p) * tt.h
		ok := true
		for i := range m {
			x := math.Cos(math.Pi * (float64(i) + 0.5) / m)
			v := tt.direct(a + (x+1)*tt.h/2)
			if !(v > 0) {
				ok = false // underflow: keep direct values
				break
			}
			f[i] = math.Log(v)
		}
		if !ok {
			continue
		}
		c := make([]float64, m)
		for j := range m {
			var s float64
			for i := range m {
				s += f[i] * math.Cos(math.Pi*float64(j)*(float64(i)+0.5)/m)
			}
			c[j] = 2 * s / m
		}
		c[0] /= 2
		tt.coef[p] = c
		// Check between the nodes (and at the ends, where Chebyshev
		// interpolation errs most).
		for _, x := range []float64{-1, -0.5, 0.05, 0.55, 1} {
			t := a + (x+1)*tt.h/2
			if w := tt.direct(t); math.Abs(tt.eval(p, x)-w) > tTailTol*w {
				tt.coef[p] = nil
				break
			}
		}
	}
	return tt
}

// eval is the interpolant of piece p at x ∈ [−1, 1] (Clenshaw).
func (tt *tTail) eval(p int, x float64) float64 {
	c := tt.coef[p]
	var b1, b2 float64
	for j := len(c) - 1; j > 0; j-- {
		b1, b2 = 2*x*b1-b2+c[j], b1
	}
	return math.Exp(x*b1 - b2 + c[0])
}

// p returns 2·P(T > |t|).
func (tt *tTail) p(t float64) float64 {
	t = math.Abs(t)
	if t >= tt.tmax {
		return tt.direct(t)
	}
	i := int(t / tt.h)
	if i >= len(tt.coef) || tt.coef[i] == nil {
		return tt.direct(t)
	}
	x := 2*(t-float64(i)*tt.h)/tt.h - 1
	return math.Min(1, tt.eval(i, x))
}
