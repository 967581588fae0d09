package meansep

import "furlong/stats/dist"

// rangeQuantile is the p quantile of the studentised range for k means and
// df degrees of freedom.
func rangeQuantile(k, df int, p float64) float64 {
	return dist.StudentizedRange{K: float64(k), Nu: float64(df)}.Quantile(p)
}

// rangeSurvival returns P(Q > q) for the studentised range with k means and
// df degrees of freedom, to be evaluated for n values of q ≤ qmax.
func rangeSurvival(k, df, n int, qmax float64) func(q float64) float64 {
	return dist.StudentizedRange{K: float64(k), Nu: float64(df)}.Survival
}
