package ui

import (
	"errors"

	"furlong/trial"
	"furlong/trial/analysis"
)

// errAnalysisFailed is reported when the statistics failed unexpectedly.
var errAnalysisFailed = errors.New("the analysis failed unexpectedly on these data")

// errChartFailed is reported when a chart could not be drawn.
var errChartFailed = errors.New("the chart could not be drawn from these data")

// analyzeFunc is the analysis behind the Compare and Report steps.
var analyzeFunc = func(t *trial.Trial, key string, opts analysis.Options) (*analysis.Result, error) {
	return nil, errors.New("the analysis engine is not part of this build yet")
}
