package dist

import (
	"math"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat/distuv"
)

// Noncentral distributions for power and sample-size calculations. Both are
// Poisson mixtures of regularized incomplete beta functions; the mixture is
// summed outwards from its largest term until the Poisson weight left on
// each side is below poissonTail, so the absolute error of a CDF value is
// about poissonTail plus the error of mathext.RegIncBeta.

// poissonTail is the Poisson mass left out of a mixture sum.
const poissonTail = 1e-16

// maxMixtureTerms bounds a mixture sum on each side of its mode; with the
// noncentrality parameters this package accepts it is never reached.
const maxMixtureTerms = 100000

// maxNoncentrality bounds the noncentrality parameter: past it the mixture
// sums would need too many terms, and the distributions are then so far from
// 0 that a power is 1 to machine precision.
const maxNoncentrality = 1e6

const badNoncentral = "dist: noncentral distribution needs positive degrees of freedom and a finite noncentrality parameter"

// NoncentralT is the noncentral t distribution with Nu degrees of freedom
// and noncentrality parameter Ncp: the distribution of
//
//	T = (Z + Ncp) / sqrt(V/Nu),
//
// with Z standard normal and V an independent χ² variable with Nu degrees of
// freedom. It is the distribution of a t statistic when the true difference
// is Ncp standard errors, and so the basis of the power of a t test.
//
// The distribution function follows Lenth (1989), "Algorithm AS 243:
// cumulative distribution function of the non-central t distribution",
// Applied Statistics 38, 185–189: for t ≥ 0, with x = t²/(t²+Nu) and
// λ = Ncp²/2,
//
//	P(T ≤ t) = Φ(-Ncp) + ½ Σ_j [p_j I_x(j+½, Nu/2) + q_j I_x(j+1, Nu/2)],
//	p_j = e^(-λ) λ^j / j!,   q_j = Ncp e^(-λ) λ^j / (√2 Γ(j+3/2)),
//
// and P(T ≤ t; Nu, Ncp) = 1 - P(T ≤ -t; Nu, -Ncp) for t < 0. For more
// information, see https://en.wikipedia.org/wiki/Noncentral_t-distribution
type NoncentralT struct {
	Nu  float64 // degrees of freedom, > 0
	Ncp float64 // noncentrality parameter
}

func (d NoncentralT) check() {
	if !(d.Nu > 0) || math.IsNaN(d.Ncp) || math.Abs(d.Ncp) > math.Sqrt(2*maxNoncentrality) {
		panic(badNoncentral)
	}
}

// CDF returns P(T ≤ t).
func (d NoncentralT) CDF(t float64) float64 {
	d.check()
	switch {
	case math.IsNaN(t):
		return math.NaN()
	case math.IsInf(t, 1):
		return 1
	case math.IsInf(t, -1):
		return 0
	}
	if t < 0 {
		return 1 - nctUpper(-t, d.Nu, -d.Ncp)
	}
	return nctUpper(t, d.Nu, d.Ncp)
}

// Survival returns P(T > t).
func (d NoncentralT) Survival(t float64) float64 {
	d.check()
	switch {
	case math.IsNaN(t):
		return math.NaN()
	case math.IsInf(t, 1):
		return 0
	case math.IsInf(t, -1):
		return 1
	}
	if t < 0 {
		return nctUpper(-t, d.Nu, -d.Ncp)
	}
	return 1 - nctUpper(t, d.Nu, d.Ncp)
}

// Mean returns the mean of the distribution; NaN if Nu ≤ 1.
func (d NoncentralT) Mean() float64 {
	d.check()
	if d.Nu <= 1 {
		return math.NaN()
	}
	lg1, _ := math.Lgamma((d.Nu - 1) / 2)
	lg2, _ := math.Lgamma(d.Nu / 2)
	return d.Ncp * math.Sqrt(d.Nu/2) * math.Exp(lg1-lg2)
}

// Variance returns the variance of the distribution; NaN if Nu ≤ 2.
func (d NoncentralT) Variance() float64 {
	d.check()
	if d.Nu <= 2 {
		return math.NaN()
	}
	m := d.Mean()
	return d.Nu*(1+d.Ncp*d.Ncp)/(d.Nu-2) - m*m
}

// nctUpper is Lenth's sum for t ≥ 0: P(T ≤ t).
func nctUpper(t, nu, ncp float64) float64 {
	base := distuv.UnitNormal.CDF(-ncp)
	if t == 0 {
		return base
	}
	x := t * t / (t*t + nu)
	lambda := ncp * ncp / 2
	if lambda == 0 {
		// Central t: only the j = 0 term of p_j survives.
		return base + 0.5*mathext.RegIncBeta(0.5, nu/2, x)
	}
	logLambda := math.Log(lambda)
	term := func(j int) (value, weight float64) {
		fj := float64(j)
		lgj1, _ := math.Lgamma(fj + 1)
		lgj32, _ := math.Lgamma(fj + 1.5)
		logP := -lambda + fj*logLambda - lgj1
		p := math.Exp(logP)
		q := ncp / math.Sqrt2 * math.Exp(-lambda+fj*logLambda-lgj32)
		return p*mathext.RegIncBeta(fj+0.5, nu/2, x) + q*mathext.RegIncBeta(fj+1, nu/2, x), p
	}
	return base + 0.5*poissonMixture(lambda, term)
}

// poissonMixture sums term(j) over j ≥ 0, where term returns the j-th
// summand and its Poisson(λ) weight, outwards from the mode of the Poisson
// weights until the weight left on each side is below poissonTail.
func poissonMixture(lambda float64, term func(j int) (value, weight float64)) float64 {
	mode := int(math.Floor(lambda))
	pois := distuv.Poisson{Lambda: lambda}
	sum := 0.0
	// Upward from the mode (inclusive).
	for j := mode; j < mode+maxMixtureTerms; j++ {
		v, _ := term(j)
		sum += v
		if pois.Survival(float64(j)) < poissonTail {
			break
		}
	}
	// Downward from below the mode.
	for j := mode - 1; j >= 0 && j > mode-maxMixtureTerms; j-- {
		v, _ := term(j)
		sum += v
		if j == 0 || pois.CDF(float64(j-1)) < poissonTail {
			break
		}
	}
	return sum
}

// NoncentralF is the noncentral F distribution with D1 and D2 degrees of
// freedom and noncentrality parameter Lambda: the distribution of
//
//	F = (U/D1) / (V/D2),
//
// with U a noncentral χ² variable with D1 degrees of freedom and
// noncentrality Lambda and V an independent central χ² variable with D2
// degrees of freedom. It is the distribution of an ANOVA F statistic when
// the treatment means differ, with Lambda = Σ n_i (μ_i - μ̄)² / σ², and so
// the basis of the power of the F test.
//
// Its distribution function is the Poisson mixture
//
//	P(F ≤ f) = Σ_j e^(-Lambda/2) (Lambda/2)^j / j! · I_x(D1/2 + j, D2/2),
//	x = D1 f / (D1 f + D2)
//
// (Johnson, Kotz & Balakrishnan 1995, Continuous Univariate Distributions
// vol. 2, ch. 30). For more information, see
// https://en.wikipedia.org/wiki/Noncentral_F-distribution
type NoncentralF struct {
	D1, D2 float64 // degrees of freedom, > 0
	Lambda float64 // noncentrality parameter, ≥ 0
}

func (d NoncentralF) check() {
	if !(d.D1 > 0) || !(d.D2 > 0) || !(d.Lambda >= 0) || d.Lambda > maxNoncentrality {
		panic(badNoncentral)
	}
}

// CDF returns P(F ≤ f).
func (d NoncentralF) CDF(f float64) float64 {
	d.check()
	switch {
	case math.IsNaN(f):
		return math.NaN()
	case f <= 0:
		return 0
	case math.IsInf(f, 1):
		return 1
	}
	x := d.D1 * f / (d.D1*f + d.D2)
	return ncfMixture(d, func(a float64) float64 { return mathext.RegIncBeta(a, d.D2/2, x) })
}

// Survival returns P(F > f), computed from the upper incomplete beta
// functions directly so that small tail probabilities keep their digits.
func (d NoncentralF) Survival(f float64) float64 {
	d.check()
	switch {
	case math.IsNaN(f):
		return math.NaN()
	case f <= 0:
		return 1
	case math.IsInf(f, 1):
		return 0
	}
	// 1 - I_x(a, b) = I_{1-x}(b, a), with 1-x formed without cancellation.
	y := d.D2 / (d.D1*f + d.D2)
	return ncfMixture(d, func(a float64) float64 { return mathext.RegIncBeta(d.D2/2, a, y) })
}

// Mean returns the mean of the distribution; NaN if D2 ≤ 2.
func (d NoncentralF) Mean() float64 {
	d.check()
	if d.D2 <= 2 {
		return math.NaN()
	}
	return d.D2 * (d.D1 + d.Lambda) / (d.D1 * (d.D2 - 2))
}

func ncfMixture(d NoncentralF, beta func(a float64) float64) float64 {
	half := d.Lambda / 2
	if half == 0 {
		return beta(d.D1 / 2)
	}
	logHalf := math.Log(half)
	return poissonMixture(half, func(j int) (float64, float64) {
		fj := float64(j)
		lg, _ := math.Lgamma(fj + 1)
		w := math.Exp(-half + fj*logHalf - lg)
		return w * beta(d.D1/2+fj), w
	})
}
