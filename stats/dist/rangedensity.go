package dist

import "math"

// rangeLogIntegrand returns the logarithm of φ(z)·φ(z-y)·D(z)^(k-2), with
// D(z) = Φ(z) - Φ(z-y), for z ≥ y/2, the right half of the (symmetric)
// integrand of the range density.
func rangeLogIntegrand(k, y, z float64) float64 {
	u := z - y
	h := -0.5*(z*z+u*u) - log2Pi
	if k == 2 {
		return h
	}
	var d float64
	if u < 0 {
		// Φ(z) - Φ(z-y) = (erf(z/√2) + erf((y-z)/√2))/2: a sum of positive
		// terms.
		d = 0.5 * (math.Erf(z*invSqrt2) + math.Erf(-u*invSqrt2))
	} else {
		// Both points in the upper tail: a difference of tail areas.
		d = 0.5 * (math.Erfc(u*invSqrt2) - math.Erfc(z*invSqrt2))
	}
	if d <= 0 {
		return math.Inf(-1)
	}
	return h + (k-2)*math.Log(d)
}

// rangeLogIntegrandDeriv returns rangeLogIntegrand(k, y, z) and its
// derivative with respect to z.
func rangeLogIntegrandDeriv(k, y, z float64) (h, dh float64) {
	u := z - y
	h = -0.5*(z*z+u*u) - log2Pi
	dh = -z - u
	if k == 2 {
		return h, dh
	}
	var d float64
	if u < 0 {
		d = 0.5 * (math.Erf(z*invSqrt2) + math.Erf(-u*invSqrt2))
	} else {
		d = 0.5 * (math.Erfc(u*invSqrt2) - math.Erfc(z*invSqrt2))
	}
	if d <= 0 {
		return math.Inf(-1), math.Inf(-1)
	}
	h += (k - 2) * math.Log(d)
	dh += (k - 2) * invSqrt2Pi * (math.Exp(-0.5*z*z) - math.Exp(-0.5*u*u)) / d
	return h, dh
}

// rangeDensity returns the density at y of the range of k independent
// standard normal variables,
//
//	p(y) = k(k-1) ∫ φ(z) φ(z-y) [Φ(z) - Φ(z-y)]^(k-2) dz.
//
// The integrand is symmetric about z = y/2 and log-concave with second
// derivative of its logarithm at most -2, so it is integrated over
// [y/2, y/2+L] and doubled, where L is where its logarithm has dropped by 44
// below the peak (at most √44 by the concavity bound); beyond L the neglected
// mass is below 1e-19 of the peak. A single innerNodes-point Gauss–Legendre
// rule is used on [y/2, y/2+L].
func rangeDensity(k, y float64) float64 {
	if !(y > 0) {
		if y == 0 && k == 2 {
			return invSqrtPi
		}
		return 0
	}
	if math.IsInf(y, 1) {
		return 0
	}
	m := 0.5 * y
	hm := rangeLogIntegrand(k, y, m)
	if math.IsInf(hm, -1) || hm < -800 {
		return 0
	}
	// Curvature of the log integrand at the peak:
	// -h''(m) = 2 + (k-2)·2mφ(m)/(2Φ(m)-1).
	curv := k
	if m > 1e-6 {
		curv = 2 + (k-2)*2*m*invSqrt2Pi*math.Exp(-0.5*m*m)/math.Erf(m*invSqrt2)
	}
	// Find l where the log integrand has dropped by about 44 below the
	// peak. The drop is convex and increasing in the distance from the
	// peak, so Newton's method started to the right of the root (at the
	// Gaussian estimate, or at the concavity bound √44) decreases
	// monotonically to it; it stops once the drop is within [44, 48].
	const drop = 44.0
	maxL := math.Sqrt(drop) * (1 + 1e-12)
	l := math.Sqrt(2 * drop / curv)
	if l > maxL {
		l = maxL
	}
	hl, dl := rangeLogIntegrandDeriv(k, y, m+l)
	if hm-hl < drop {
		l = maxL
		hl, dl = rangeLogIntegrandDeriv(k, y, m+l)
	}
	for it := 0; it < 50 && hm-hl > drop+4 && dl < 0; it++ {
		l -= (hm - hl - drop) / -dl
		hl, dl = rangeLogIntegrandDeriv(k, y, m+l)
	}
	var sum float64
	for i, x := range glx {
		sum += glw[i] * math.Exp(rangeLogIntegrand(k, y, m+l*x)-hm)
	}
	return 2 * k * (k - 1) * l * sum * math.Exp(hm)
}

// rangeSupport returns an interval [lo, hi] outside which the range of k
// standard normal variables has probability below tailTarget. It uses
// P(R ≤ x) ≤ k (x/√(2π))^(k-1) and P(R > x) ≤ 2k(1-Φ(x/2)).
func rangeSupport(k float64) (lo, hi float64) {
	lo = sqrt2Pi * math.Exp(math.Log(tailTarget/k)/(k-1))
	hi = 8.0
	for 2*k*normSurvival(hi/2) > tailTarget {
		hi += 0.25
	}
	return lo, hi
}
