// Package analysis is the bridge between a trial and the statistics engine:
// it turns one trait of a trial into stats inputs (missing values and
// excluded plots left out, and counted), runs the ANOVA that fits the design,
// separates the means, runs the diagnostics, and returns results keyed by
// treatment codes.
package analysis

import (
	"furlong/stats"
	"furlong/trial"
)

// Options control an analysis.
type Options struct {
	Alpha float64 // significance level, default 0.05
	// Unprotected gives LSD letters even when the treatment F test is not
	// significant at Alpha.
	Unprotected bool
	// Transform is applied to the responses before fitting; means are
	// reported back-transformed beside the transformed analysis.
	Transform stats.Transform
}

// Result is the full analysis of one trait.
type Result struct {
	TraitKey     string
	TraitName    string
	Unit         string
	Decimals     int
	HigherBetter bool

	Design    trial.DesignKind
	Alpha     float64
	Transform stats.Transform
	// Offset was added to every value before a log or square-root
	// transformation because some values are 0 (0 when nothing was added).
	Offset float64

	N        int        // observations analysed
	Missing  int        // plots with no value (not excluded)
	Excluded []Excluded // plots left out, with their reasons

	ANOVA *stats.ANOVA

	// Means, one per treatment in the trial's treatment order.
	Means []Mean

	// LSD and HSD at Alpha for balanced data; nil when replication is
	// unequal (then each pair has its own standard error in Pairs).
	LSD *float64
	HSD *float64
	// LSDLettersGiven is false when the treatment F test was not
	// significant at Alpha and the protected LSD letters were therefore
	// withheld (Warnings says so); Options.Unprotected gives them anyway.
	LSDLettersGiven bool

	Pairs []Pair
	// VsCheck compares every treatment with one check (Dunnett); nil
	// unless asked for with CompareWithCheck.
	VsCheck     *CheckComparison
	Diagnostics Diagnostics
	Warnings    []string // plain-language readings and notes

	// PlotIndex[i] is the index in Trial.Plots of observation i of the
	// fitted model (ANOVA.Fitted, ANOVA.Residuals).
	PlotIndex []int
}

// Excluded is a plot left out of the analysis.
type Excluded struct {
	Plot   int
	Reason string
}

// Mean is one treatment's estimated mean.
type Mean struct {
	Treatment string // code
	Name      string
	Check     bool
	N         int
	Mean      float64 // least-squares mean, on the analysis scale
	RawMean   float64
	SE        float64
	// BackMean is the least-squares mean back-transformed to the original
	// scale; equal to Mean when there is no transformation.
	BackMean     float64
	LettersLSD   string // "" when withheld
	LettersTukey string
}

// Pair is one pairwise comparison of treatment means, A minus B.
type Pair struct {
	A, B         string // treatment codes
	Diff         float64
	SE           float64
	Lower, Upper float64 // confidence interval for the difference at 1−Alpha (unadjusted t)
	PLSD         float64 // unadjusted p (t test with the error df)
	PTukey       float64 // Tukey-adjusted p
}

// Diagnostics of the fitted model. Pointers are nil where a test does not
// apply to the design or could not be computed (too few residuals).
type Diagnostics struct {
	ShapiroW, ShapiroP    *float64 // Shapiro–Wilk on residuals
	LeveneF, LeveneP      *float64 // Brown–Forsythe (median-centred Levene), CRD
	BartlettK2, BartlettP *float64 // Bartlett, CRD
	NonAdditivityF        *float64 // Tukey's one-degree-of-freedom test, RCBD
	NonAdditivityP        *float64
	StandardizedResiduals []float64 // per observation, as PlotIndex
	Outliers              []Outlier // |standardised residual| > 3
}

// Outlier is an observation with a large standardised residual.
type Outlier struct {
	// Plot number (for a CSV table: the line); Value is the recorded
	// value, Residual and StdResidual are on the analysis scale.
	Plot        int
	Treatment   string
	Value       float64
	Residual    float64
	StdResidual float64
}
