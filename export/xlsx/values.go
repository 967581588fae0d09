package xlsx

import (
	"math"

	"furlong/trial"
)

// traitValues returns the values of trait tr for every plot of t, derived
// traits computed; plots without a value (or a trait whose values cannot be
// had) are NaN.
func traitValues(t *trial.Trial, tr trial.Trait) []float64 {
	v, err := t.TraitValues(tr.Key)
	if err != nil || len(v) != len(t.Plots) {
		v = make([]float64, len(t.Plots))
		for i := range v {
			v[i] = math.NaN()
		}
	}
	return v
}
