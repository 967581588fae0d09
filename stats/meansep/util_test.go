package meansep

import (
	"math"

	"furlong/stats/dist"
)

func nanValue() float64 { return math.NaN() }

func exactRange(k, df int) func(q float64) float64 {
	return dist.StudentizedRange{K: float64(k), Nu: float64(df)}.Survival
}
