package diag

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/mathext"
)

// ShapiroWilkResult is the outcome of the Shapiro–Wilk test of normality.
type ShapiroWilkResult struct {
	N int     // number of values tested
	W float64 // test statistic, in (0, 1]; values near 1 are consistent with normality
	P float64 // p-value: small values are evidence against normality
}

// MinShapiroWilk and MaxShapiroWilk bound the sample sizes for which the
// approximations of Royston (1995) hold.
const (
	MinShapiroWilk = 3
	MaxShapiroWilk = 5000
)

// Polynomial coefficients of Royston (1995), Remark AS R94, Applied
// Statistics 44(4), 547–551: c1 and c2 approximate the two largest
// coefficients a_n and a_{n−1} as polynomials in 1/√n; g gives the bound γ
// for 4 ≤ n ≤ 11; c3, c4 (n ≤ 11, in n) and c5, c6 (n ≥ 12, in log n) give
// the mean and log standard deviation of the normalised statistic.
var (
	swC1 = [...]float64{0, 0.221157, -0.147981, -2.07119, 4.434685, -2.706056}
	swC2 = [...]float64{0, 0.042981, -0.293762, -1.752461, 5.682633, -3.582633}
	swC3 = [...]float64{0.544, -0.39978, 0.025054, -6.714e-4}
	swC4 = [...]float64{1.3822, -0.77857, 0.062767, -0.0020322}
	swC5 = [...]float64{-1.5861, -0.31082, -0.083751, 0.0038915}
	swC6 = [...]float64{-0.4803, -0.082676, 0.0030302}
	swG  = [...]float64{-2.273, 0.459}
)

// poly evaluates c[0] + c[1]x + c[2]x² + … in the order of AS R94, so that
// results agree to the last bits with other implementations of it.
func poly(c []float64, x float64) float64 {
	r := c[0]
	if len(c) > 1 {
		p := x * c[len(c)-1]
		for j := len(c) - 2; j > 0; j-- {
			p = (p + c[j]) * x
		}
		r += p
	}
	return r
}

// ShapiroWilk tests whether x (typically the residuals of a fitted model)
// could come from a normal distribution, using the W statistic of Shapiro
// and Wilk (1965) with the coefficient and p-value approximations of
// Royston (1995), "Remark AS R94: A remark on Algorithm AS 181: The W-test
// for normality", Applied Statistics 44(4), 547–551. The coefficients come
// from polynomial approximations in 1/√n; the p-value from the exact
// distribution for n = 3 and from normalising transformations of W for
// 4 ≤ n ≤ 11 and n ≥ 12.
//
// x is not modified. It needs 3 to 5000 finite values that are not all
// equal; otherwise a *NotApplicableError is returned.
func ShapiroWilk(x []float64) (ShapiroWilkResult, error) {
	n := len(x)
	if n < MinShapiroWilk {
		return ShapiroWilkResult{}, notApplicable("normality", "the normality test needs at least 3 residuals")
	}
	if n > MaxShapiroWilk {
		return ShapiroWilkResult{}, notApplicable("normality", "the normality test handles at most 5000 residuals")
	}
	for _, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return ShapiroWilkResult{}, notApplicable("normality", "a residual is missing or infinite, so normality cannot be tested")
		}
	}
	// W does not depend on the unit or origin of x: work on standardised
	// values so that tiny (1e-160) or huge (1e100) residuals are tested
	// like any others.
	xs, unit := standardise(x)
	slices.Sort(xs)
	rng := xs[n-1] - xs[0]
	if unit == 0 || !(rng > 0) {
		return ShapiroWilkResult{}, notApplicable("normality", "all residuals are equal, so normality cannot be tested")
	}

	a := swCoefficients(n)

	// W as the squared correlation between the ordered data and the
	// coefficients, computed through 1 − W to keep precision when W is
	// close to 1 (AS R94).
	var sa, sx float64
	for i := range n {
		sa += swCoef(a, n, i)
		sx += xs[i] / rng
	}
	sa /= float64(n)
	sx /= float64(n)
	var ssa, ssx, sax float64
	for i := range n {
		asa := swCoef(a, n, i) - sa
		xsx := xs[i]/rng - sx
		ssa += asa * asa
		ssx += xsx * xsx
		sax += asa * xsx
	}
	ssassx := math.Sqrt(ssa * ssx)
	w1 := (ssassx - sax) * (ssassx + sax) / (ssa * ssx)
	w := 1 - w1

	return ShapiroWilkResult{N: n, W: w, P: swPValue(n, w, w1)}, nil
}

// swCoef is the coefficient applied to the i-th smallest of n values: −a[i]
// in the lower half, +a[n−1−i] in the upper half, 0 for the middle value of
// an odd sample.
func swCoef(a []float64, n, i int) float64 {
	j := n - 1 - i
	switch {
	case i < j:
		return -a[i]
	case i > j:
		return a[j]
	}
	return 0
}

// swCoefficients returns the n/2 positive Shapiro–Wilk coefficients, largest
// first (AS R94).
func swCoefficients(n int) []float64 {
	nn2 := n / 2
	a := make([]float64, nn2)
	if n == 3 {
		a[0] = math.Sqrt(0.5)
		return a
	}
	an := float64(n)
	m := make([]float64, nn2)
	var summ2 float64
	for i := range nn2 {
		m[i] = mathext.NormalQuantile((float64(i+1) - 0.375) / (an + 0.25))
		summ2 += m[i] * m[i]
	}
	summ2 *= 2
	ssumm2 := math.Sqrt(summ2)
	rsn := 1 / math.Sqrt(an)
	a1 := poly(swC1[:], rsn) - m[0]/ssumm2
	var i1 int
	var fac float64
	if n > 5 {
		i1 = 2
		a2 := -m[1]/ssumm2 + poly(swC2[:], rsn)
		fac = math.Sqrt((summ2 - 2*m[0]*m[0] - 2*m[1]*m[1]) / (1 - 2*a1*a1 - 2*a2*a2))
		a[1] = a2
	} else {
		i1 = 1
		fac = math.Sqrt((summ2 - 2*m[0]*m[0]) / (1 - 2*a1*a1))
	}
	a[0] = a1
	for i := i1; i < nn2; i++ {
		a[i] = -m[i] / fac
	}
	return a
}

// swPValue is the p-value of W (AS R94); w1 = 1 − W computed accurately.
func swPValue(n int, w, w1 float64) float64 {
	if n == 3 {
		// Exact distribution for n = 3 (Shapiro & Wilk 1965):
		// P = (6/π)(asin √W − asin √(3/4)).
		p := 6 / math.Pi * (math.Asin(math.Sqrt(w)) - math.Pi/3)
		return math.Min(math.Max(p, 0), 1)
	}
	y := math.Log(w1)
	an := float64(n)
	var mu, sigma float64
	if n <= 11 {
		gamma := poly(swG[:], an)
		if y >= gamma {
			// W is below the range of the approximation: far from normal.
			return 0
		}
		y = -math.Log(gamma - y)
		mu = poly(swC3[:], an)
		sigma = math.Exp(poly(swC4[:], an))
	} else {
		xx := math.Log(an)
		mu = poly(swC5[:], xx)
		sigma = math.Exp(poly(swC6[:], xx))
	}
	// Upper tail of the normal distribution.
	return 0.5 * math.Erfc((y-mu)/(sigma*math.Sqrt2))
}
