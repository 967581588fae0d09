package diag

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/mathext"
)

// FTest is the outcome of a test whose statistic follows an F distribution.
type FTest struct {
	F   float64
	DF1 int // numerator degrees of freedom
	DF2 int // denominator degrees of freedom
	P   float64
}

// ChiSquareTest is the outcome of a test whose statistic follows a
// chi-square distribution.
type ChiSquareTest struct {
	ChiSquare float64
	DF        int
	P         float64
}

// Centre is the location from which Levene's test measures spread.
type Centre int

const (
	// Median centring (Brown & Forsythe 1974, J. Am. Stat. Assoc. 69,
	// 364–367): robust to skewed data; the usual choice.
	Median Centre = iota
	// Mean centring: Levene's (1960) original test.
	Mean
)

// fSurvival is P(F > f) for an F(d1, d2) variable, computed from the upper
// tail directly so that small p-values keep their precision.
func fSurvival(f float64, d1, d2 int) float64 {
	if f <= 0 {
		return 1
	}
	a, b := float64(d1), float64(d2)
	return mathext.RegIncBeta(b/2, a/2, b/(b+a*f))
}

// groupValues splits values by group, dropping groups with no values.
func groupValues(values []float64, group []int, groups int) [][]float64 {
	if len(values) != len(group) {
		panic("diag: values and group indices differ in length")
	}
	g := make([][]float64, groups)
	for i, v := range values {
		k := group[i]
		if k < 0 || k >= groups {
			panic("diag: group index out of range")
		}
		g[k] = append(g[k], v)
	}
	return slices.DeleteFunc(g, func(s []float64) bool { return len(s) == 0 })
}

func checkFinite(test string, values []float64) error {
	for _, v := range values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return notApplicable(test, "a value is missing or infinite; drop missing plots before testing")
		}
	}
	return nil
}

// Levene tests whether the treatments (groups) have equal variances, by a
// one-way analysis of variance of the absolute deviations of each value
// from its group's median (Brown–Forsythe) or mean. group[i] in
// [0, groups) is the group of values[i]; groups without values are
// ignored. At least two groups and more values than groups are needed.
func Levene(values []float64, group []int, groups int, centre Centre) (FTest, error) {
	if err := checkFinite("Levene", values); err != nil {
		return FTest{}, err
	}
	values, _ = standardise(values) // F is unit free; see standardise
	g := groupValues(values, group, groups)
	k := len(g)
	n := len(values)
	if k < 2 {
		return FTest{}, notApplicable("Levene", "the test of equal variances needs at least two treatments with data")
	}
	if n <= k {
		return FTest{}, notApplicable("Levene", "the test of equal variances needs more than one plot in some treatment")
	}
	z := make([][]float64, k)
	var grand float64
	for i, s := range g {
		var c float64
		if centre == Median {
			c = median(s)
		} else {
			c = mean(s)
		}
		z[i] = make([]float64, len(s))
		for j, v := range s {
			z[i][j] = math.Abs(v - c)
			grand += z[i][j]
		}
	}
	grand /= float64(n)
	var between, within float64
	for _, s := range z {
		m := mean(s)
		between += float64(len(s)) * (m - grand) * (m - grand)
		for _, v := range s {
			within += (v - m) * (v - m)
		}
	}
	if within <= 0 {
		return FTest{}, notApplicable("Levene", "the spread within treatments is too regular (or zero) for the test of equal variances")
	}
	d1, d2 := k-1, n-k
	f := (between / float64(d1)) / (within / float64(d2))
	return FTest{F: f, DF1: d1, DF2: d2, P: fSurvival(f, d1, d2)}, nil
}

// Bartlett tests whether the treatments (groups) have equal variances with
// Bartlett's (1937) statistic
//
//	K² = [(N−k) ln s²_p − Σ (n_i−1) ln s²_i] / [1 + (Σ 1/(n_i−1) − 1/(N−k)) / (3(k−1))],
//
// referred to a chi-square distribution with k−1 degrees of freedom
// (Snedecor & Cochran, Statistical Methods). It is sensitive to
// non-normality; Levene's test is the robust alternative. Every group with
// values needs at least two of them, not all equal.
func Bartlett(values []float64, group []int, groups int) (ChiSquareTest, error) {
	if err := checkFinite("Bartlett", values); err != nil {
		return ChiSquareTest{}, err
	}
	values, _ = standardise(values) // the statistic is unit free; see standardise
	g := groupValues(values, group, groups)
	k := len(g)
	if k < 2 {
		return ChiSquareTest{}, notApplicable("Bartlett", "the test of equal variances needs at least two treatments with data")
	}
	vars := make([]float64, k)
	dfs := make([]int, k)
	for i, s := range g {
		if len(s) < 2 {
			return ChiSquareTest{}, notApplicable("Bartlett", "Bartlett's test needs at least two plots of every treatment")
		}
		m := mean(s)
		var ss float64
		for _, v := range s {
			ss += (v - m) * (v - m)
		}
		dfs[i] = len(s) - 1
		vars[i] = ss / float64(dfs[i])
		if vars[i] <= 0 {
			return ChiSquareTest{}, notApplicable("Bartlett", "a treatment has the same value in every plot, so Bartlett's test cannot be computed")
		}
	}
	return bartlett(vars, dfs), nil
}

// BartlettVariances is Bartlett's statistic (see Bartlett) from k ≥ 2
// variance estimates s²ᵢ with νᵢ ≥ 1 degrees of freedom each, for example
// the error mean squares of the trials of a series. Every variance must be
// finite and above 0.
func BartlettVariances(variances []float64, df []int) (ChiSquareTest, error) {
	if len(variances) != len(df) {
		return ChiSquareTest{}, notApplicable("Bartlett", "each variance needs its degrees of freedom")
	}
	if len(variances) < 2 {
		return ChiSquareTest{}, notApplicable("Bartlett", "the test of equal variances needs at least two variances")
	}
	for i, v := range variances {
		if !(v > 0) || math.IsInf(v, 0) || df[i] < 1 {
			return ChiSquareTest{}, notApplicable("Bartlett", "every variance must be above 0 with at least one degree of freedom")
		}
	}
	// The statistic is unit free: scale by the largest variance so that
	// the logarithms stay well inside the float64 range.
	top := slices.Max(variances)
	scaled := make([]float64, len(variances))
	for i, v := range variances {
		scaled[i] = v / top
	}
	return bartlett(scaled, df), nil
}

// bartlett computes the statistic from valid variances and their df.
func bartlett(vars []float64, dfs []int) ChiSquareTest {
	k := len(vars)
	var dfe, pooled, sumLog, sumInv float64
	for i, v := range vars {
		df := float64(dfs[i])
		dfe += df
		pooled += df * v
		sumLog += df * math.Log(v)
		sumInv += 1 / df
	}
	pooled /= dfe
	num := dfe*math.Log(pooled) - sumLog
	den := 1 + (sumInv-1/dfe)/(3*float64(k-1))
	chi := math.Max(num/den, 0) // exactly 0 for equal variances; rounding can dip below
	df := k - 1
	return ChiSquareTest{ChiSquare: chi, DF: df, P: mathext.GammaIncRegComp(float64(df)/2, chi/2)}
}

func mean(s []float64) float64 {
	var m float64
	for _, v := range s {
		m += v
	}
	return m / float64(len(s))
}

func median(s []float64) float64 {
	c := slices.Clone(s)
	slices.Sort(c)
	n := len(c)
	if n%2 == 1 {
		return c[n/2]
	}
	return (c[n/2-1] + c[n/2]) / 2
}
