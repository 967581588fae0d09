package dist

import (
	"math"
	"sync"
)

// tableCache keeps the survival tables of the last few (k, ν) pairs: a
// trial analysed again after an edit, several traits with the same missing
// plots, or the effects and slices of one factorial meet the same pairs, and
// reuse the table instead of building it again. Tables are immutable and
// safe to share between goroutines.
var tableCache struct {
	sync.Mutex
	keys   [][2]int // most recent last
	tables map[[2]int]*SurvivalTable
}

const tableCacheSize = 64

// CachedSurvivalTable returns the SurvivalTable for k means and df error
// degrees of freedom, built once and kept for the most recent pairs.
func CachedSurvivalTable(k, df int) *SurvivalTable {
	key := [2]int{k, df}
	tableCache.Lock()
	t, ok := tableCache.tables[key]
	tableCache.Unlock()
	if ok {
		return t
	}
	t = NewSurvivalTable(float64(k), float64(df)) // outside the lock: builds may run in parallel
	tableCache.Lock()
	defer tableCache.Unlock()
	if tableCache.tables == nil {
		tableCache.tables = map[[2]int]*SurvivalTable{}
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

// Quantile returns q with P(Q ≤ q) = p, by bisection on the table's
// survival function.
func (t *SurvivalTable) Quantile(p float64) float64 {
	if !(p >= 0 && p <= 1) {
		panic(badPercentile)
	}
	a := 1 - p
	lo, hi := 0.0, 1.0
	for t.Survival(hi) > a {
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
		if t.Survival(mid) > a {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}
