package stats

// ANOVA is the fitted model and its analysis of variance.
type ANOVA struct {
	// Sources lists treatment, then the nuisance factors in Model order,
	// then error and total; find a line by its Role (Treatment, Error,
	// Total, Line). With unbalanced data (missing plots) each
	// factor's SS is adjusted for all the others (type II, equal to type III
	// for these additive models) and the lines no longer add up to the total.
	Sources Table
	N       int // observations fitted

	GrandMean float64 // arithmetic mean of all observations
	MSE       float64 // error mean square
	// RootMSE is √MSE, computed before MSE is scaled back to the data's
	// unit, so it keeps full precision even where MSE itself (the square of
	// very small data) falls below the float64 range. Use it for
	// standardised residuals.
	RootMSE   float64
	DFError   int
	CVPercent float64 // 100·√MSE / GrandMean
	RSquared  float64 // 1 − SS(error)/SS(total)

	// Balanced is true when every treatment×nuisance cell has the same
	// count (no missing plots); sums of squares then add up.
	Balanced bool
	Adjusted bool // true when SS are adjusted (unbalanced data)

	Means []LevelMean // one per treatment level, in level order
	// SEMean and SED are the standard error of a treatment mean and of a
	// difference of two means for balanced data; nil when unbalanced (each
	// mean has its own SE, each pair its PairSE).
	SEMean *float64
	SED    *float64
	// RelativeEfficiency of the blocking against a completely randomised
	// design (Gomez & Gomez 1984, section 2.2.3), with that section's
	// adjustment when the error df are below 20; nil when it does not apply
	// (only an RCBD has one; with missing plots it uses the adjusted block
	// mean square and is approximate).
	RelativeEfficiency *float64

	Fitted    []float64 // per observation, in input order
	Residuals []float64

	// Leverage of each observation (diagonal of the hat matrix), for
	// standardised residuals: r_i / √(MSE·(1−h_i)). h_i is 1 for the only
	// observation of a treatment; its residual is then 0 and has no
	// standardised value.
	Leverage []float64

	pairSE func(i, j int) float64
	meanW  []float64 // least-squares means on the standardised scale
	unit   float64   // that scale's unit in the data's unit
}

// MeanDiff is the difference of the least-squares means of treatment
// levels i and j, Means[i].Mean − Means[j].Mean, computed on the centred
// scale of the fit: exact to rounding even when the means share a large
// offset (1e15 + small differences) that the means themselves cannot hold
// to the last digit. It panics when i or j is not a treatment level.
func (a *ANOVA) MeanDiff(i, j int) float64 {
	if a.meanW == nil {
		return a.Means[i].Mean - a.Means[j].Mean
	}
	return a.unit * (a.meanW[i] - a.meanW[j])
}

// PairSE is the standard error of the difference of the least-squares means
// of treatment levels i and j, from the fitted model:
// √(MSE·(1/nᵢ + 1/nⱼ + (cᵢ−cⱼ)ᵀS(cᵢ−cⱼ))), where S is the covariance (over
// σ²) of the nuisance effects and cᵢ the imbalance of treatment i over the
// nuisance levels (zero for balanced data). It costs O(p) for p nuisance
// parameters, so all pairs of a large trial are cheap. PairSE(i, i) is 0;
// it panics when i or j is not a treatment level.
func (a *ANOVA) PairSE(i, j int) float64 { return a.pairSE(i, j) }
