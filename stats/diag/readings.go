package diag

import (
	"fmt"
	"math"
	"strconv"
)

// Thresholds used by Readings. They are common practice in field-trial
// work, not laws: a CV above 20% is high for a yield trial and above 30%
// very high; normality is doubted only at p < 0.01 because the analysis of
// variance tolerates mild departures; unequal variances and non-additivity
// are flagged at p < 0.05.
const (
	CVHigh             = 20.0
	CVVeryHigh         = 30.0
	NormalityAlpha     = 0.01
	EqualVarianceAlpha = 0.05
	NonAdditivityAlpha = 0.05
)

// Summary collects the diagnostic numbers of one analysis for Readings.
// Each Has flag says whether the matching value was computed; values whose
// flag is false are ignored.
type Summary struct {
	HasCV     bool
	CVPercent float64

	HasNormality bool
	NormalityP   float64 // Shapiro–Wilk p of the residuals

	HasEqualVariance bool
	EqualVarianceP   float64 // Levene (median) p

	HasNonAdditivity bool
	NonAdditivityP   float64 // Tukey one degree of freedom p

	Outliers []Outlier // from Outliers
}

// Readings turns a Summary into plain-language warnings for the trial
// manager, most important first. It returns nil when nothing calls for
// attention.
func Readings(s Summary) []string {
	var w []string
	if s.HasCV && !math.IsNaN(s.CVPercent) {
		cv := strconv.FormatFloat(s.CVPercent, 'f', 0, 64)
		switch {
		case s.CVPercent > CVVeryHigh:
			w = append(w, fmt.Sprintf("CV is %s%%: very high for a field trial; differences between treatments will be hard to detect; check the data for errors or a bad patch", cv))
		case s.CVPercent > CVHigh:
			w = append(w, fmt.Sprintf("CV is %s%%: high for a yield trial; check the data for errors or a bad patch", cv))
		}
	}
	for _, o := range s.Outliers {
		plot := o.Plot
		if plot == "" {
			plot = "plot " + strconv.Itoa(o.Index+1)
		}
		w = append(w, fmt.Sprintf("%s has a standardised residual of %s: check the recorded value", plot, strconv.FormatFloat(o.Std, 'f', 1, 64)))
	}
	if s.HasNormality && s.NormalityP < NormalityAlpha {
		w = append(w, "residuals look non-normal: check for outliers or consider a transformation (log for yields spreading with the mean, square root for counts, arcsine for percentages)")
	}
	if s.HasEqualVariance && s.EqualVarianceP < EqualVarianceAlpha {
		w = append(w, "variances differ between treatments: the common error term may not suit every treatment; consider a transformation (log when spread grows with the mean)")
	}
	if s.HasNonAdditivity && s.NonAdditivityP < NonAdditivityAlpha {
		w = append(w, "treatment effects seem to change with block fertility (non-additivity): a log transformation often helps; otherwise interpret treatment differences with care")
	}
	return w
}
