package stats

import (
	"errors"
	"math"
)

// ErrNoEfficacy is returned when percent efficacy cannot be worked out:
// the untreated check's mean (or, for Henderson–Tilton, a pre-treatment
// mean) is not above 0, or a mean is missing or negative.
var ErrNoEfficacy = errors.New("percent efficacy needs positive means of the untreated check")

// Abbott returns the percent efficacy of a treatment against the untreated
// check by Abbott's formula (Abbott 1925, J. Econ. Entomol. 18, 265–267):
//
//	E = (C − T) / C × 100
//
// with C the untreated check's mean and T the treatment's mean of the
// pest or disease assessment (severity, incidence, live insects): 100 %
// is complete control, 0 % no effect, below 0 more than the untreated.
// Abbott wrote it with the percentages of insects alive, which is the same
// ratio.
func Abbott(treated, untreated float64) (float64, error) {
	if !usable(treated) || !usable(untreated) || !(untreated > 0) {
		return math.NaN(), ErrNoEfficacy
	}
	return (untreated - treated) / untreated * 100, nil
}

// HendersonTilton returns the percent efficacy of a treatment from counts
// before and after treatment in the treated plots and the untreated check
// (Henderson & Tilton 1955, J. Econ. Entomol. 48, 157–161):
//
//	E = (1 − (Ta × Cb) / (Tb × Ca)) × 100
//
// with Tb, Ta the treatment's mean counts before and after, and Cb, Ca the
// untreated check's. It corrects Abbott's formula for unequal populations
// before treatment; with Tb = Cb it is Abbott's.
func HendersonTilton(treatedBefore, treatedAfter, untreatedBefore, untreatedAfter float64) (float64, error) {
	for _, v := range []float64{treatedBefore, treatedAfter, untreatedBefore, untreatedAfter} {
		if !usable(v) {
			return math.NaN(), ErrNoEfficacy
		}
	}
	if !(treatedBefore > 0) || !(untreatedAfter > 0) || !(untreatedBefore > 0) {
		return math.NaN(), ErrNoEfficacy
	}
	return (1 - (treatedAfter*untreatedBefore)/(treatedBefore*untreatedAfter)) * 100, nil
}

func usable(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) && v >= 0 }
