package meansep

import (
	"furlong/stats/dist"
)

// tableMinPairs is the number of pairs from which the studentised range is
// read from a precomputed dist.SurvivalTable (absolute error below 1e-9,
// about 1e-11 observed; building it costs about as much as a dozen direct
// evaluations) instead of being integrated for each pair (relative error
// about 1e-10 even for tiny p-values). So trials of up to 10 treatments
// get p-values accurate in relative terms, larger ones accurate to 1e-9.
const tableMinPairs = 50

// rangeDist is the studentised range for k means and df degrees of
// freedom, as used by Compare.
type rangeDist struct {
	survival func(q float64) float64 // P(Q > q)
	quantile func(p float64) float64 // q with P(Q ≤ q) = p
}

// studentizedRange returns the distribution for n evaluations. With many
// evaluations both functions use the survival table: the quantile is found
// by bisection on it (relative error about 1e-10 in q, from the table's
// error divided by the density).
func studentizedRange(k, df, n int) rangeDist {
	if n < tableMinPairs {
		d := dist.StudentizedRange{K: float64(k), Nu: float64(df)}
		return rangeDist{survival: d.Survival, quantile: d.Quantile}
	}
	t := dist.CachedSurvivalTable(k, df)
	return rangeDist{survival: t.Survival, quantile: t.Quantile}
}
