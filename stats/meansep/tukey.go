package meansep

import (
	"math"
	"sync"

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
	t := cachedTable(k, df)
	return rangeDist{survival: t.Survival, quantile: func(p float64) float64 { return invertSurvival(t.Survival, 1-p) }}
}

// invertSurvival returns q with s(q) = a for a decreasing survival
// function s, by bisection.
func invertSurvival(s func(float64) float64, a float64) float64 {
	lo, hi := 0.0, 1.0
	for s(hi) > a {
		lo, hi = hi, 2*hi
		if math.IsInf(hi, 0) {
			return hi
		}
	}
	for range 200 {
		mid := (lo + hi) / 2
		if mid <= lo || mid >= hi || hi-lo <= 1e-15*hi {
			break
		}
		if s(mid) > a {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// tableCache keeps the survival tables of the last few (k, df) pairs: a
// trial analysed again after an edit, or several traits with the same
// missing plots, reuse the table instead of building it again (about half
// the time of a 300-entry comparison). Tables are immutable and safe to
// share between goroutines.
var tableCache struct {
	sync.Mutex
	keys   [][2]int // most recent last
	tables map[[2]int]*dist.SurvivalTable
}

const tableCacheSize = 16

func cachedTable(k, df int) *dist.SurvivalTable {
	key := [2]int{k, df}
	tableCache.Lock()
	t, ok := tableCache.tables[key]
	tableCache.Unlock()
	if ok {
		return t
	}
	t = dist.NewSurvivalTable(float64(k), float64(df)) // outside the lock: builds may run in parallel
	tableCache.Lock()
	defer tableCache.Unlock()
	if tableCache.tables == nil {
		tableCache.tables = map[[2]int]*dist.SurvivalTable{}
	}
	if _, ok := tableCache.tables[key]; !ok {
		if len(tableCache.keys) == tableCacheSize {
			delete(tableCache.tables, tableCache.keys[0])
			tableCache.keys = tableCache.keys[1:]
		}
		tableCache.keys = append(tableCache.keys, key)
	}
	tableCache.tables[key] = t
	return t
}
