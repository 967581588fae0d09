package dist

import "math"

const (
	invSqrt2    = 0.70710678118654752440084436210484903928483593768847 // 1/√2
	invSqrtPi   = 0.56418958354775628694807945156077258584405062932900 // 1/√π
	log2Pi      = 1.83787706640934548356065947281123527972279494727556 // log(2π)
	logSqrt2Pi  = 0.91893853320467274178032973640561763986139747363778 // log(√(2π))
	sqrt2Pi     = 2.50662827463100050241576528481104525300698674060994 // √(2π)
	invSqrt2Pi  = 0.39894228040143267793994605993438186847585863116493 // 1/√(2π)
	ln2         = 0.69314718055994530941723212145817656807550013436026 // log 2
	tailTarget  = 1e-20                                                // mass neglected outside the range support
	tableTarget = 1e-13                                                // probability beyond the ends of a SurvivalTable
)

// normSurvival returns 1 - Φ(z) computed from erfc, accurate in the upper
// tail.
func normSurvival(z float64) float64 {
	return 0.5 * math.Erfc(z*invSqrt2)
}

// log1pmx returns log(1+d) - d, accurate for small |d|.
func log1pmx(d float64) float64 {
	if math.Abs(d) >= 0.1 {
		return math.Log1p(d) - d
	}
	// -d²/2 + d³/3 - d⁴/4 + ...
	term := d
	sum := 0.0
	for n := 2; n < 40; n++ {
		term *= -d
		t := term / float64(n)
		sum += t
		if math.Abs(t) <= 1e-17*math.Abs(sum) {
			break
		}
	}
	return sum
}

// stirlerr returns log Γ(a) - ((a-½)log a - a + ½ log 2π), the error of
// Stirling's approximation, without cancellation for large a.
func stirlerr(a float64) float64 {
	if a < 10 {
		lg, _ := math.Lgamma(a)
		return lg - ((a-0.5)*math.Log(a) - a + 0.5*log2Pi)
	}
	// Stirling's series 1/(12a) - 1/(360a³) + 1/(1260a⁵) - 1/(1680a⁷)
	// + 1/(1188a⁹) - 691/(360360a¹¹) + 1/(156a¹³) (Abramowitz & Stegun
	// 6.1.40).
	r := 1 / a
	r2 := r * r
	return r * (1.0/12 - r2*(1.0/360-r2*(1.0/1260-r2*(1.0/1680-r2*(1.0/1188-r2*(691.0/360360-r2/156))))))
}

// logScaledChiDensity returns the logarithm of the density at s of
// S = χ_ν/√ν, the ratio of a sample standard deviation with ν degrees of
// freedom to σ:
//
//	f(s) = 2 (ν/2)^(ν/2) / Γ(ν/2) · s^(ν-1) · exp(-ν s²/2).
//
// The constant and the exponent are rearranged with Stirling's series so
// that no large terms cancel when ν is large.
func logScaledChiDensity(s, nu float64) float64 {
	if s <= 0 {
		return math.Inf(-1)
	}
	a := 0.5 * nu
	// log f = log 2 + ½ log a - ½ log 2π - stirlerr(a) - log s - a(s²-1-log s²)
	d := (s - 1) * (s + 1)
	return ln2 + 0.5*math.Log(a) - 0.5*log2Pi - stirlerr(a) - math.Log(s) + a*log1pmx(d)
}
