package diag

import (
	"math"
	"slices"
)

// OutlierLimit is the absolute standardised residual above which a plot is
// flagged as a possible outlier (common practice: 3).
const OutlierLimit = 3.0

// StandardisedResiduals returns r_i / √(MSE·(1 − h_i)) for residuals r,
// leverages h (the diagonal of the hat matrix) and the error mean square
// MSE. A plot with leverage 1 (the only plot of its treatment, say) is
// fitted exactly: its residual is 0 and so is its standardised residual.
func StandardisedResiduals(residuals, leverage []float64, mse float64) ([]float64, error) {
	if len(residuals) != len(leverage) {
		panic("diag: residuals and leverages differ in length")
	}
	if !(mse > 0) || math.IsInf(mse, 0) {
		return nil, notApplicable("residuals", "the error mean square is zero: the model fits every plot exactly, so there are no residuals to assess")
	}
	out := make([]float64, len(residuals))
	for i, r := range residuals {
		h := leverage[i]
		if math.IsNaN(r) || math.IsInf(r, 0) || math.IsNaN(h) || h < 0 || h > 1+1e-9 {
			return nil, notApplicable("residuals", "a residual or leverage is missing or out of range; refit the model")
		}
		if 1-h <= 1e-10 {
			continue // leverage 1: fitted exactly
		}
		out[i] = r / math.Sqrt(mse*(1-h))
	}
	return out, nil
}

// Outlier is a plot whose standardised residual is beyond the limit.
type Outlier struct {
	Index int     // position in the residuals given
	Plot  string  // label for messages; Readings uses "plot <Index+1>" when empty
	Std   float64 // standardised residual
}

// Outliers returns the plots with |standardised residual| > limit, largest
// first (limit ≤ 0 means OutlierLimit).
func Outliers(std []float64, limit float64) []Outlier {
	if limit <= 0 {
		limit = OutlierLimit
	}
	var out []Outlier
	for i, s := range std {
		if math.Abs(s) > limit {
			out = append(out, Outlier{Index: i, Std: s})
		}
	}
	slices.SortStableFunc(out, func(a, b Outlier) int {
		switch x, y := math.Abs(a.Std), math.Abs(b.Std); {
		case x > y:
			return -1
		case x < y:
			return 1
		}
		return 0
	})
	return out
}
