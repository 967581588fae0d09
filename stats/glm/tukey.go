package glm

import (
	"math"
	"sync"

	"furlong/stats/dist"
)

// rangeTables caches the studentised-range survival tables of the
// (means, df) pairs met so far: building one costs about as much as a few
// direct integrations, and an analysis meets the same few pairs in every
// effect and slice (and again after each edit of the data). Tables are
// immutable and safe to share between goroutines. dist.SurvivalTable is
// accurate to 1e-9 absolute.
var rangeTables struct {
	sync.Mutex
	order []([2]int)
	m     map[[2]int]*dist.SurvivalTable
}

const rangeTablesMax = 64

func rangeTable(k, df int) *dist.SurvivalTable {
	key := [2]int{k, df}
	rangeTables.Lock()
	t := rangeTables.m[key]
	rangeTables.Unlock()
	if t != nil {
		return t
	}
	t = dist.NewSurvivalTable(float64(k), float64(df))
	rangeTables.Lock()
	defer rangeTables.Unlock()
	if rangeTables.m == nil {
		rangeTables.m = map[[2]int]*dist.SurvivalTable{}
	}
	if _, ok := rangeTables.m[key]; !ok {
		if len(rangeTables.order) == rangeTablesMax {
			delete(rangeTables.m, rangeTables.order[0])
			rangeTables.order = rangeTables.order[1:]
		}
		rangeTables.order = append(rangeTables.order, key)
	}
	rangeTables.m[key] = t
	return t
}

// rangeQuantile returns q with P(Q > q) = a, by bisection on the table.
func rangeQuantile(t *dist.SurvivalTable, a float64) float64 {
	lo, hi := 0.0, 1.0
	for t.Survival(hi) > a {
		lo, hi = hi, 2*hi
		if hi > 1e6 {
			return hi
		}
	}
	for range 200 {
		mid := (lo + hi) / 2
		if mid <= lo || mid >= hi || hi-lo <= 1e-13*hi {
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

// tukeyP is the Tukey–Kramer p-value of a t statistic among k means.
func tukeyP(t *dist.SurvivalTable, tv float64) float64 {
	return math.Min(1, math.Max(0, t.Survival(math.Abs(tv)*math.Sqrt2)))
}
