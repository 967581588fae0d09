package meansep

import "furlong/stats/dist"

// tableMinPairs is the number of pairs from which the Tukey p-values are
// read from a precomputed dist.SurvivalTable (absolute error below 1e-9,
// about 1e-11 observed) instead of being integrated one by one (relative
// error about 1e-11, also for very small p-values).
const tableMinPairs = 200

// rangeQuantile is the p quantile of the studentised range for k means and
// df degrees of freedom.
func rangeQuantile(k, df int, p float64) float64 {
	return dist.StudentizedRange{K: float64(k), Nu: float64(df)}.Quantile(p)
}

// rangeSurvival returns P(Q > q) for the studentised range with k means and
// df degrees of freedom, to be evaluated for n values of q ≤ qmax.
func rangeSurvival(k, df, n int, qmax float64) func(q float64) float64 {
	if n >= tableMinPairs {
		return dist.NewSurvivalTable(float64(k), float64(df)).Survival
	}
	return dist.StudentizedRange{K: float64(k), Nu: float64(df)}.Survival
}
