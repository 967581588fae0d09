package meansep

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/stat/distuv"
)

// PairSEer gives the standard error of the difference between the means of
// treatments i and j (i ≠ j). *stats.ANOVA satisfies it.
type PairSEer interface {
	PairSE(i, j int) float64
}

// MeanDiffer gives the difference of means i and j more precisely than the
// means themselves can hold it (for example when all means share a large
// offset). *stats.ANOVA satisfies it for its least-squares means.
type MeanDiffer interface {
	MeanDiff(i, j int) float64
}

// PairSEFunc adapts a function to PairSEer.
type PairSEFunc func(i, j int) float64

// PairSE calls f(i, j).
func (f PairSEFunc) PairSE(i, j int) float64 { return f(i, j) }

// Errors returned by Compare for data that cannot be compared.
var (
	ErrTooFewMeans = errors.New("at least two treatments are needed to compare means")
	ErrNoErrorDF   = errors.New("the analysis has no degrees of freedom for error, so means cannot be compared")
	ErrBadAlpha    = errors.New("the significance level must be between 0 and 1 (for example 0.05 for 5%)")
	ErrBadSE       = errors.New("the standard error of a difference between two treatments is zero or missing, so their means cannot be compared; check the analysis")
)

// Pair is the comparison of treatments I < J.
type Pair struct {
	I, J   int
	Diff   float64 // mean_I − mean_J
	SE     float64 // standard error of Diff
	Lower  float64 // lower limit of the 1−alpha confidence interval of Diff (t, unadjusted)
	Upper  float64 // upper limit
	T      float64 // Diff / SE
	PLSD   float64 // two-sided p of the t test (Fisher's LSD, unadjusted)
	PTukey float64 // Tukey-adjusted p (Tukey–Kramer when the SEs differ)
}

// Result holds all pairwise comparisons of K means.
type Result struct {
	K     int
	DF    int     // error degrees of freedom
	Alpha float64 // significance level, e.g. 0.05
	Means []float64
	// Pairs lists every pair I < J in the order (0,1), (0,2), …, (0,K−1),
	// (1,2), …; Pair finds one.
	Pairs []Pair

	TCrit float64 // t quantile 1 − Alpha/2 with DF degrees of freedom
	QCrit float64 // studentised range quantile 1 − Alpha for K means and DF

	// EqualSE is true when every pair has the same standard error (to a
	// relative 1e-9), as in a balanced trial. Only then are SED, LSD and
	// HSD single numbers; otherwise they are nil (absent) and the per-pair
	// tests apply.
	EqualSE bool
	SED     *float64 // common standard error of a difference
	LSD     *float64 // TCrit·SED: least significant difference
	HSD     *float64 // QCrit·SED/√2: Tukey's honestly significant difference
}

// pairIndex is the position of pair i < j of k in Result.Pairs.
func pairIndex(k, i, j int) int { return i*(2*k-i-1)/2 + j - i - 1 }

// Pair returns the comparison of treatments i and j, i ≠ j, stored with
// I < J (so Diff is mean_min(i,j) − mean_max(i,j)).
func (r *Result) Pair(i, j int) Pair {
	if i > j {
		i, j = j, i
	}
	if i == j || i < 0 || j >= r.K {
		panic("meansep: bad pair")
	}
	return r.Pairs[pairIndex(r.K, i, j)]
}

// Compare computes every pairwise comparison of the means (least-squares
// means, in level order), with pair standard errors from se, df error
// degrees of freedom and significance level alpha.
//
// The LSD p-value is the two-sided t probability of |Diff|/SE with df
// degrees of freedom. The Tukey p-value is the survival function of the
// studentised range for K means and df at |Diff|/SE·√2; with unequal
// standard errors this is the Tukey–Kramer test (Kramer 1956, Biometrics
// 12, 307–310). The confidence intervals are unadjusted t intervals.
//
// Precision: LSD p-values to about 1e-12 relative. Tukey p-values and the
// critical value come from dist.StudentizedRange (relative error about
// 1e-10) for up to 49 pairs, and from a precomputed dist.SurvivalTable
// (absolute error below 1e-9) for 50 pairs (11 treatments) or more, which
// keeps large trials fast. Memory is the Pairs slice.
//
// When se is also a MeanDiffer, each difference comes from it rather than
// from subtracting two means, so means that share a large offset are
// compared at full precision; means must then be the means se describes.
// The tests depend only on Diff/SE, so they are the same in any unit.
func Compare(means []float64, se PairSEer, df int, alpha float64) (*Result, error) {
	k := len(means)
	if k < 2 {
		return nil, ErrTooFewMeans
	}
	if df < 1 {
		return nil, ErrNoErrorDF
	}
	if !(alpha > 0 && alpha < 1) {
		return nil, ErrBadAlpha
	}
	for _, m := range means {
		if math.IsNaN(m) || math.IsInf(m, 0) {
			return nil, ErrBadMean
		}
	}
	nu := float64(df)
	tdist := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: nu}
	r := &Result{
		K:     k,
		DF:    df,
		Alpha: alpha,
		Means: append([]float64(nil), means...),
		Pairs: make([]Pair, 0, k*(k-1)/2),
		TCrit: tdist.Quantile(1 - alpha/2),
	}
	r.EqualSE = true
	var se0, tmax float64
	for i := range k {
		for j := i + 1; j < k; j++ {
			s := se.PairSE(i, j)
			if !(s > 0) || math.IsInf(s, 0) {
				return nil, ErrBadSE
			}
			if len(r.Pairs) == 0 {
				se0 = s
			} else if math.Abs(s-se0) > 1e-9*se0 {
				r.EqualSE = false
			}
			d := means[i] - means[j]
			if md, ok := se.(MeanDiffer); ok {
				d = md.MeanDiff(i, j)
			}
			t := d / s
			tmax = math.Max(tmax, math.Abs(t))
			r.Pairs = append(r.Pairs, Pair{
				I: i, J: j,
				Diff:  d,
				SE:    s,
				Lower: d - r.TCrit*s,
				Upper: d + r.TCrit*s,
				T:     t,
			})
		}
	}
	ttail := newTTail(nu, len(r.Pairs), tmax)
	srange := studentizedRange(k, df, len(r.Pairs))
	r.QCrit = srange.quantile(1 - alpha)
	// The p-values of the pairs are independent: computed in parallel
	// chunks (the same values as one loop).
	parallelChunks(len(r.Pairs), func(lo, hi int) {
		for n := lo; n < hi; n++ {
			p := &r.Pairs[n]
			p.PLSD = ttail.p(p.T)
			p.PTukey = srange.survival(math.Abs(p.T) * math.Sqrt2)
		}
	})
	if r.EqualSE {
		sed, lsd, hsd := se0, r.TCrit*se0, r.QCrit*se0/math.Sqrt2
		r.SED, r.LSD, r.HSD = &sed, &lsd, &hsd
	}
	return r, nil
}
