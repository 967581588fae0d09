package glm

import (
	"math"

	"furlong/stats/dist"
)

// tukeyP is the Tukey–Kramer p-value of a t statistic among k means.
func tukeyP(t *dist.SurvivalTable, tv float64) float64 {
	return math.Min(1, math.Max(0, t.Survival(math.Abs(tv)*math.Sqrt2)))
}
