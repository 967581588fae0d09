package trial

import (
	"math"
	"math/big"
	"strconv"
)

// SharedDigits splits measured values into their common part and what is
// left of each, in exact decimal arithmetic: values[i] = origin + rest[i].
// It is how Furlong keeps every digit of values that share many leading
// digits (1000000000000.4, 1000000000000.3, ...), whose differences a
// float64 would otherwise hold only to a few digits.
//
// Each value is taken as the decimal number it was typed as: the shortest
// decimal that reads back as the same float64 (strconv's 'e', -1 form).
// That recovers the typed number exactly for every value typed with at most
// 15 significant digits, whatever path it came by (a CSV table, a field
// book, the window, a trial file), because float64 tells all such decimals
// apart. A value whose shortest form needs 16 or 17 digits is taken at its
// exact binary value instead. The origin is one of the values (the one nearest the middle of
// their range), so rest[i] is an exact decimal difference rounded once to
// float64.
//
// ok is false, and rest is nil, when the values share no leading digit
// (their spread is more than a tenth of their size, so less than one digit
// could be gained), or there are fewer than two finite values. NaN values (missing) stay NaN in rest.
func SharedDigits(values []float64) (origin float64, rest []float64, ok bool) {
	lo, hi, n := math.Inf(1), math.Inf(-1), 0
	for _, v := range values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			continue
		}
		lo, hi, n = math.Min(lo, v), math.Max(hi, v), n+1
	}
	if n < 2 {
		return 0, nil, false
	}
	size := math.Max(math.Abs(lo), math.Abs(hi))
	if size == 0 || (hi-lo)*10 > size {
		return 0, nil, false
	}
	mid := lo + (hi-lo)/2
	origin = lo
	for _, v := range values {
		if !math.IsNaN(v) && !math.IsInf(v, 0) && math.Abs(v-mid) < math.Abs(origin-mid) {
			origin = v
		}
	}
	o := typedDecimal(origin)
	rest = make([]float64, len(values))
	var d big.Rat
	for i, v := range values {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			rest[i] = v
			continue
		}
		d.Sub(typedDecimal(v), o)
		rest[i], _ = d.Float64() // the nearest float64, ties to even
	}
	return origin, rest, true
}

// typedDecimal is v as the decimal it was typed as: the shortest decimal
// that reads back as v when that has at most 15 significant digits (then it
// is the typed number, trailing zeros aside), else v's exact binary value
// (a value with more digits than float64 tells apart, or one computed
// rather than typed, is taken as the float64 holds it).
func typedDecimal(v float64) *big.Rat {
	s := strconv.FormatFloat(v, 'e', -1, 64)
	digits := 0
	for _, c := range s {
		if c == 'e' {
			break
		}
		if c >= '0' && c <= '9' {
			digits++
		}
	}
	if digits > 15 {
		return new(big.Rat).SetFloat64(v)
	}
	r, ok := new(big.Rat).SetString(s)
	if !ok { // FormatFloat of a finite value is always a decimal big.Rat reads
		panic("trial: cannot read back " + s)
	}
	return r
}
