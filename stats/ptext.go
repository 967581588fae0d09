package stats

import (
	"math"
	"strconv"
)

// PFloor is the smallest p-value written as a number: smaller ones are
// written "<0.001" (common practice in trial reports). PDecimals is the
// number of decimals a p-value is written with. Every report format takes
// both from here (FormatP for text, the workbook's number format for cells).
const (
	PFloor     = 0.001
	PDecimals  = 3
	PFloorText = "0.001" // PFloor as written
)

// FormatP writes a p-value for people: "<0.001" below PFloor, otherwise
// PDecimals decimals ("0.023"). A value that is not a probability (NaN,
// infinite, negative or above 1) is written "–", never "NaN".
func FormatP(p float64) string {
	switch {
	case math.IsNaN(p) || p < 0 || p > 1:
		return "–"
	case p < PFloor:
		return "<" + PFloorText
	}
	return strconv.FormatFloat(p, 'f', PDecimals, 64)
}
