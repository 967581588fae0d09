package ui

import (
	"math"
	"strconv"

	"furlong/export"
)

// num formats a statistic with sig significant digits; NaN and infinities
// (which must never reach a table) show as a dash.
func num(v float64, sig int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "–"
	}
	if v == 0 {
		return "0"
	}
	a := math.Abs(v)
	if a >= 1e7 || a < 1e-4 {
		return strconv.FormatFloat(v, 'e', sig-1, 64)
	}
	d := sig - 1 - int(math.Floor(math.Log10(a)))
	if d < 0 {
		d = 0
	}
	return strconv.FormatFloat(v, 'f', d, 64)
}

// fixed formats v with dec decimals, or a dash (export.Fixed).
func fixed(v float64, dec int) string { return export.Fixed(v, dec) }

// optNum formats an optional statistic (export.OptFixed).
func optNum(p *float64, dec int) string { return export.OptFixed(p, dec) }
