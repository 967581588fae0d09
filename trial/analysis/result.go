// Package analysis is the bridge between a trial and the statistics engine:
// it turns one trait of a trial into stats inputs (missing values and
// excluded plots left out, and counted), runs the ANOVA that fits the design,
// separates the means, runs the diagnostics, and returns results keyed by
// treatment codes.
package analysis

import (
	"furlong/stats"
	"furlong/stats/diag"
	"furlong/stats/meansep"
	"furlong/trial"
)

// Options control an analysis.
type Options struct {
	Alpha float64 // significance level, default 0.05
	// Unprotected gives LSD letters even when the treatment F test is not
	// significant at Alpha.
	Unprotected bool
	// Transform, when set, is applied to the responses of every trait
	// before fitting (the command line's --transform); otherwise each trait
	// is analysed on its own scale (Data.Transform, from the trait's
	// setting in the trial). Means are reported back-transformed with
	// back-transformed confidence limits.
	Transform stats.Transform
	// Method is the mean-separation method the results are read with
	// (Result.Method, Result.Letters, Result.MSD); "" takes the trial's
	// remembered method (trial.Trial.MeanSeparation), LSD for a table.
	// Both letterings are computed whatever the method.
	Method meansep.Method
	// Covariate is the key of a trait (or a table's column) to adjust
	// every analysed trait for by analysis of covariance; "" for each
	// trait's own saved covariate (trial.Trait.Covariate, none when it has
	// none), NoCovariate for none at all.
	Covariate string
}

// Result is the full analysis of one trait.
type Result struct {
	TraitKey     string
	TraitName    string
	Unit         string
	Decimals     int
	HigherBetter bool
	// Untreated is the code of the trial's untreated check ("" for none):
	// the reference of the comparisons with the check when the trial has
	// no other check (CheckOf).
	Untreated string

	Design    trial.DesignKind
	Alpha     float64
	Method    meansep.Method // the mean-separation method chosen (Options.Method)
	Transform stats.Transform
	// Offset was added to every value before a log or square-root
	// transformation because some values are 0 (0 when nothing was added).
	Offset float64

	N        int        // observations analysed
	Missing  int        // plots with no value (not excluded)
	Excluded []Excluded // plots left out, with their reasons

	ANOVA *stats.ANOVA
	// Factorial is the analysis of crossed treatment factors (factorial,
	// split plot, strip plot): strata ANOVA, effects, SEDs, slices; nil
	// for one list of treatments. ANOVA, Means and Pairs are filled too
	// (the treatment combinations), so every view of one list works.
	Factorial *Factorial
	// Covariate is the covariance adjustment (nil without a covariate):
	// ANOVA, Means, Pairs and the letters are then the adjusted analysis.
	Covariate *Covariate

	// Means, one per treatment in the trial's treatment order.
	Means []Mean

	// LSD and HSD at Alpha for balanced data; nil when replication is
	// unequal (then each pair has its own standard error in Pairs).
	LSD *float64
	HSD *float64
	// LSDRange and HSDRange are the smallest and largest of the pairwise
	// LSDs and HSDs (Pair.LSD, Pair.HSD): equal ends for balanced data,
	// a yardstick for unequal replication; nil with fewer than two means.
	LSDRange *Range
	HSDRange *Range
	// CheckMean is the mean of the check entries on the original scale,
	// nil when the trait does not show percent of check (Data.
	// PercentOfCheck), the trial has no check, or the check mean is not
	// above 0; Mean.PercentOfCheck is then nil too.
	CheckMean *float64
	// LSDLettersGiven is false when the treatment F test was not
	// significant at Alpha and the protected LSD letters were therefore
	// withheld (Warnings says so); Options.Unprotected gives them anyway.
	LSDLettersGiven bool

	Pairs []Pair
	// VsCheck compares every treatment with one check (Dunnett); nil
	// unless asked for with CompareWithCheck.
	VsCheck *CheckComparison
	// Efficacy is the percent efficacy of every treatment against the
	// untreated check, for a trait where lower is better in a trial with
	// an untreated check; nil otherwise.
	Efficacy *Efficacy
	// Contrasts are the user's planned comparisons; nil unless asked for
	// with EstimateContrasts.
	Contrasts   *ContrastSet
	Diagnostics Diagnostics
	// Notes are plain-language notes on the analysis: missing and
	// excluded plots, adjusted sums of squares, the transformation,
	// withheld letters.
	Notes []string
	// Warnings are the Notes followed by the model checks that call for
	// attention (Diagnostics.Readings with Flagged set).
	Warnings []string

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
	BackMean float64
	// Lower and Upper are the 1−Alpha confidence limits of the mean on the
	// original scale: Mean ± t·SE on the analysis scale, back-transformed
	// (so not symmetric about BackMean after a transformation). nil when
	// the error has no degrees of freedom.
	Lower, Upper *float64
	LettersLSD   string // "" when withheld
	LettersTukey string
	// PercentOfCheck is 100·BackMean/Result.CheckMean, nil when the result
	// has no CheckMean.
	PercentOfCheck *float64
}

// Range is the smallest and the largest of a set of values.
type Range struct{ Min, Max float64 }

// Letters returns the letters of mean i by the result's method ("" when
// withheld).
func (r *Result) Letters(i int) string {
	if r.Method == meansep.Tukey {
		return r.Means[i].LettersTukey
	}
	return r.Means[i].LettersLSD
}

// MSD returns the least significant difference of the result's method (LSD
// or HSD), nil when replication is unequal (see MSDRange).
func (r *Result) MSD() *float64 {
	if r.Method == meansep.Tukey {
		return r.HSD
	}
	return r.LSD
}

// MSDRange returns the range of the pairwise LSDs or HSDs, by the result's
// method.
func (r *Result) MSDRange() *Range {
	if r.Method == meansep.Tukey {
		return r.HSDRange
	}
	return r.LSDRange
}

// Pair is one pairwise comparison of treatment means, A minus B.
type Pair struct {
	A, B         string // treatment codes
	Diff         float64
	SE           float64
	Lower, Upper float64 // confidence interval for the difference at 1−Alpha (unadjusted t)
	PLSD         float64 // unadjusted p (t test with the error df)
	PTukey       float64 // Tukey-adjusted p
	// LSD and HSD are this pair's least significant differences at Alpha:
	// t·SE and q·SE/√2 (Tukey–Kramer with unequal replication).
	LSD, HSD float64
}

// Diagnostics of the fitted model. Pointers are nil where a test does not
// apply to the design or could not be computed (too few residuals).
type Diagnostics struct {
	ShapiroW, ShapiroP *float64 // Shapiro–Wilk on residuals
	// Brown–Forsythe (median-centred Levene) and Bartlett, by treatment:
	// on the values for a CRD, on the residuals for an RCBD and a Latin
	// square (VarianceOn says which).
	LeveneF, LeveneP      *float64
	BartlettK2, BartlettP *float64
	VarianceOn            string   // "values" or "residuals"; "" when not computed
	NonAdditivityF        *float64 // Tukey's one-degree-of-freedom test, RCBD
	NonAdditivityP        *float64
	StandardizedResiduals []float64 // per observation, as PlotIndex
	Outliers              []Outlier // |standardised residual| > 3
	// Readings are the model checks in words, one per check made, at the
	// level diag.CheckAlpha (stated in the text).
	Readings []diag.Reading
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

// MeanDecimals is the number of decimals a mean (and its LSD, SE and
// confidence limits) is shown with: one more than the values were recorded
// with (common practice: a mean of several plots is known more finely than
// one plot, so that LS mean 75.55 and raw mean 76.0 do not both print as
// "76"). It is the one rule for the command line, the window and the
// workbook. Values on a transformed scale are shown with
// TransformedDecimals.
func MeanDecimals(dataDecimals int) int { return max(dataDecimals, 0) + 1 }

// TransformedDecimals is the number of decimals of means and statistics on
// a transformed scale (logarithms, square roots, angles), whatever the
// recorded decimals: three (common practice).
const TransformedDecimals = 3
