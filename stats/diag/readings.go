package diag

import (
	"fmt"
	"math"
	"strconv"

	"furlong/stats"
)

// CheckAlpha is the one level at which every model check (normality,
// equal variances, additivity) is read, and the readings say so. The 5%
// level is the usual convention for assumption tests (common practice);
// with the few plots of a field trial these tests have little power, so a
// stricter level would hide real departures.
const CheckAlpha = 0.05

// CV levels at which Readings calls the coefficient of variation high or
// very high for a field trial (common practice: above 20% is high for a
// yield trial, above 30% very high).
const (
	CVHigh     = 20.0
	CVVeryHigh = 30.0
)

// Summary collects the diagnostic results of one analysis for Readings.
// Each Has flag says whether the matching values were computed; values
// whose flag is false are ignored.
type Summary struct {
	HasCV     bool
	CVPercent float64

	HasNormality bool
	NormalityW   float64 // Shapiro–Wilk W of the residuals
	NormalityP   float64

	// VarianceOn says what the variance tests were run on, in words for the
	// reading: "values" (one-way layout) or "residuals" (blocked designs,
	// grouped by treatment).
	VarianceOn       string
	HasEqualVariance bool
	LeveneF          float64 // Brown–Forsythe (median-centred Levene)
	EqualVarianceP   float64
	HasBartlett      bool
	BartlettK2       float64
	BartlettP        float64

	HasNonAdditivity bool
	NonAdditivityF   float64 // Tukey's one-degree-of-freedom test
	NonAdditivityP   float64

	Outliers []Outlier // from Outliers
}

// Reading is one model check in words.
type Reading struct {
	Check   string // "cv", "normality", "levene", "bartlett", "additivity", "outlier"
	Text    string // a sentence with the statistic, its p-value and the level it is read at
	Flagged bool   // the check calls for attention
}

// Readings reads every check in s in plain words, one sentence each, in the
// order CV (only when high), normality, equal variances (Levene, Bartlett),
// additivity, large residuals. Each test is read at CheckAlpha, which the
// sentence states; Flagged marks those that call for attention.
func Readings(s Summary) []Reading {
	var out []Reading
	if s.HasCV && finite(s.CVPercent) {
		cv := strconv.FormatFloat(s.CVPercent, 'f', 0, 64)
		switch {
		case s.CVPercent > CVVeryHigh:
			out = append(out, Reading{"cv", fmt.Sprintf("CV is %s%%, very high for a field trial (above %g%%): differences between treatments will be hard to detect; check the data for errors or a bad patch.", cv, CVVeryHigh), true})
		case s.CVPercent > CVHigh:
			out = append(out, Reading{"cv", fmt.Sprintf("CV is %s%%, high for a yield trial (above %g%%): check the data for errors or a bad patch.", cv, CVHigh), true})
		}
	}
	level := "p < " + strconv.FormatFloat(CheckAlpha, 'f', -1, 64)
	read := func(check, what string, p float64, bad, good string) {
		if !finite(p) {
			return
		}
		if p < CheckAlpha {
			out = append(out, Reading{check, fmt.Sprintf("%s, %s (%s): %s", what, pText(p), level, bad), true})
			return
		}
		out = append(out, Reading{check, fmt.Sprintf("%s, %s (not %s): %s", what, pText(p), level, good), false})
	}
	if s.HasNormality {
		read("normality", fmt.Sprintf("Normality of residuals (Shapiro–Wilk): W = %.3f", s.NormalityW), s.NormalityP,
			"the residuals depart from a normal distribution; look for outliers or consider a transformation (log for values spreading with the mean, square root for counts, arcsine for percentages).",
			"no evidence against normally distributed residuals.")
	}
	on := "the values"
	if s.VarianceOn == "residuals" {
		on = "the residuals of the fitted model, grouped by treatment"
	}
	if s.HasEqualVariance {
		read("levene", fmt.Sprintf("Equal variances among treatments (Levene, median-centred, on %s): F = %.3f", on, s.LeveneF), s.EqualVarianceP,
			"the spread differs between treatments; the common error term may not suit every treatment (consider a transformation, log when the spread grows with the mean).",
			"no evidence that the spread differs between treatments.")
	}
	if s.HasBartlett {
		read("bartlett", fmt.Sprintf("Equal variances among treatments (Bartlett, on %s): K² = %.3f", on, s.BartlettK2), s.BartlettP,
			"the spread differs between treatments (Bartlett's test is also sensitive to non-normal data).",
			"no evidence that the spread differs between treatments.")
	}
	if s.HasNonAdditivity {
		read("additivity", fmt.Sprintf("Additivity of blocks and treatments (Tukey's one-degree-of-freedom test): F = %.3f", s.NonAdditivityF), s.NonAdditivityP,
			"treatment differences change from block to block; a log transformation often helps, otherwise read treatment differences with care.",
			"no evidence that treatment differences change from block to block.")
	}
	for _, o := range s.Outliers {
		plot := o.Plot
		if plot == "" {
			plot = "Plot " + strconv.Itoa(o.Index+1)
		}
		out = append(out, Reading{"outlier", fmt.Sprintf("%s lies far from its expected value (standardised residual %s, beyond ±%g): check the field record.",
			plot, strconv.FormatFloat(o.Std, 'f', 2, 64), OutlierLimit), true})
	}
	return out
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// pText writes "p = 0.023", or "p < 0.001" below stats.PFloor: the one
// p-value rule (stats.FormatP) in a sentence.
func pText(p float64) string {
	if p < stats.PFloor {
		return "p < " + stats.PFloorText
	}
	return "p = " + stats.FormatP(p)
}
