package ui

import (
	"errors"

	"furlong/trial/analysis"
)

// errAnalysisFailed is reported when the statistics failed unexpectedly.
var errAnalysisFailed = errors.New("the analysis failed unexpectedly on these data")

// errChartFailed is reported when a chart could not be drawn.
var errChartFailed = errors.New("the chart could not be drawn from these data")

// analyzeFunc is the analysis behind the Compare and Report steps.
var analyzeFunc = analysis.Analyze
