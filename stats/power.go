package stats

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat/distuv"

	"furlong/stats/dist"
)

// Power and sample size for comparing treatment means, with the error
// variance stated as a coefficient of variation (CV%, the error standard
// deviation as a percent of the mean) and differences as percent of the
// mean, as trial planners state them.
//
// For two means of r replicates each, the difference d (percent of the
// mean) has standard error SE = CV·sqrt(2/r), and the two-sided t test at
// level α on ν error degrees of freedom rejects with probability
//
//	power(d) = P(T' > t_{1-α/2,ν}) + P(T' < -t_{1-α/2,ν}),  T' ~ t'(ν, d/SE),
//
// the noncentral t with both tails counted (Cochran & Cox 1957, Experimental
// Designs, §2.3, give the same calculation with the upper tail only).

// ValueError is a value given to a planning or response calculation that
// cannot be used; its message is a plain sentence the user can act on.
type ValueError struct {
	Reason string
}

// Error returns the plain-language reason.
func (e *ValueError) Error() string { return e.Reason }

// PowerInput describes one two-mean comparison to plan.
type PowerInput struct {
	Reps    int     // replicates of each mean, ≥ 2
	DFError float64 // error degrees of freedom of the design, > 0
	CV      float64 // coefficient of variation, percent, > 0
	Alpha   float64 // significance level of the two-sided test, in (0, 1)
}

func (in PowerInput) check() error {
	switch {
	case in.Reps < 1:
		return &ValueError{Reason: "the number of replicates must be at least 1"}
	case !(in.DFError > 0) || math.IsInf(in.DFError, 0):
		return &ValueError{Reason: "the design leaves no degrees of freedom for the error: add replicates or treatments"}
	case !(in.CV > 0) || math.IsInf(in.CV, 0):
		return &ValueError{Reason: "the CV must be a percentage greater than 0"}
	case !(in.Alpha > 0 && in.Alpha < 1):
		return &ValueError{Reason: "the significance level must lie between 0 and 1 (for example 0.05)"}
	}
	return nil
}

// se returns the standard error of a difference of two means, percent.
func (in PowerInput) se() float64 { return in.CV * math.Sqrt(2/float64(in.Reps)) }

// critical returns t_{1-α/2,ν}.
func (in PowerInput) critical() float64 {
	return distuv.StudentsT{Mu: 0, Sigma: 1, Nu: in.DFError}.Quantile(1 - in.Alpha/2)
}

// PowerOfDifference returns the probability that the two-sided t test
// detects a true difference of diff percent of the mean.
func PowerOfDifference(in PowerInput, diff float64) (float64, error) {
	if err := in.check(); err != nil {
		return 0, err
	}
	if math.IsNaN(diff) || math.IsInf(diff, 0) {
		return 0, &ValueError{Reason: "the difference must be a number"}
	}
	return twoSidedPower(in.DFError, math.Abs(diff)/in.se(), in.critical()), nil
}

func twoSidedPower(nu, ncp, tc float64) float64 {
	const maxNcp = 1000 // power is 1 to machine precision long before
	if ncp > maxNcp {
		return 1
	}
	d := dist.NoncentralT{Nu: nu, Ncp: ncp}
	return d.Survival(tc) + d.CDF(-tc)
}

// DetectableDifference returns the smallest true difference between two
// means, as percent of the mean, that the two-sided t test at level Alpha
// detects with probability power.
func DetectableDifference(in PowerInput, power float64) (float64, error) {
	if err := in.check(); err != nil {
		return 0, err
	}
	if !(power > in.Alpha && power < 1) {
		return 0, &ValueError{Reason: fmt.Sprintf("the power must lie between the significance level (%g) and 1, for example 0.8", in.Alpha)}
	}
	tc := in.critical()
	f := func(ncp float64) float64 { return twoSidedPower(in.DFError, ncp, tc) - power }
	// Power rises from α at ncp = 0; bracket the root, then bisect (the
	// power is monotone in ncp ≥ 0, so bisection cannot go wrong).
	lo, hi := 0.0, tc+distuv.UnitNormal.Quantile(power)+1
	for f(hi) < 0 {
		lo, hi = hi, 2*hi
	}
	for i := 0; i < 200 && hi-lo > 1e-13*hi; i++ {
		mid := (lo + hi) / 2
		if f(mid) < 0 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2 * in.se(), nil
}

// ErrTooManyReps is returned by RepsNeeded when no number of replicates up
// to its limit detects the difference.
var ErrTooManyReps = errors.New("stats: more replicates needed than the limit")

// RepsNeeded returns the smallest number of replicates r in [minReps,
// maxReps] whose detectable difference (percent of the mean) at the given
// power is at most diff, with dfError(r) the design's error degrees of
// freedom for r replicates. It also returns the detectable difference with
// those replicates. Err wraps ErrTooManyReps when maxReps is not enough.
func RepsNeeded(diff, cv, alpha, power float64, minReps, maxReps int, dfError func(reps int) float64) (reps int, detectable float64, err error) {
	if !(diff > 0) || math.IsInf(diff, 0) {
		return 0, 0, &ValueError{Reason: "the difference to detect must be a percentage greater than 0"}
	}
	if minReps < 1 || maxReps < minReps {
		panic("stats: RepsNeeded needs 1 ≤ minReps ≤ maxReps")
	}
	last := math.Inf(1)
	for r := minReps; r <= maxReps; r++ {
		in := PowerInput{Reps: r, DFError: dfError(r), CV: cv, Alpha: alpha}
		if in.DFError <= 0 {
			continue
		}
		d, err := DetectableDifference(in, power)
		if err != nil {
			return 0, 0, err
		}
		if d <= diff {
			return r, d, nil
		}
		last = d
	}
	return 0, 0, fmt.Errorf("%w: even %d replicates detect only differences of %.3g%% of the mean or more", ErrTooManyReps, maxReps, last)
}

// FPower returns the power of the ANOVA F test of equal treatment means at
// level alpha, for true treatment means stated as percent of the grand
// mean (for example 95, 100, 105, 110), reps replicates of each, and the
// error degrees of freedom and CV of the design. The noncentrality is
//
//	λ = r Σ_i (m_i - m̄)² / CV²,
//
// and the power is P(F' > F_{1-α; t-1, ν}) for F' noncentral F with t-1 and
// ν degrees of freedom and noncentrality λ (Scheffé 1959, The Analysis of
// Variance, §2.8).
func FPower(means []float64, reps int, dfError, cv, alpha float64) (power, lambda float64, err error) {
	in := PowerInput{Reps: reps, DFError: dfError, CV: cv, Alpha: alpha}
	if err := in.check(); err != nil {
		return 0, 0, err
	}
	if len(means) < 2 {
		return 0, 0, &ValueError{Reason: "give the expected mean of at least two treatments"}
	}
	var mbar float64
	for _, m := range means {
		if math.IsNaN(m) || math.IsInf(m, 0) {
			return 0, 0, &ValueError{Reason: "every expected mean must be a number"}
		}
		mbar += m
	}
	mbar /= float64(len(means))
	for _, m := range means {
		lambda += (m - mbar) * (m - mbar)
	}
	lambda *= float64(reps) / (cv * cv)
	d1 := float64(len(means) - 1)
	crit := distuv.F{D1: d1, D2: dfError}.Quantile(1 - alpha)
	const maxLambda = 1e5 // power is 1 to machine precision long before
	if lambda > maxLambda {
		return 1, lambda, nil
	}
	return dist.NoncentralF{D1: d1, D2: dfError, Lambda: lambda}.Survival(crit), lambda, nil
}
