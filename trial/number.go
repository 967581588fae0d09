package trial

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// DecimalMark says which decimal marks ParseNumber accepts.
type DecimalMark uint8

const (
	// PointOrComma accepts a decimal point, or a decimal comma when the
	// text has one comma and no point ("5,23"): what people type, and what
	// semicolon- or tab-separated files from spreadsheets set to a European
	// locale hold.
	PointOrComma DecimalMark = iota
	// PointOnly accepts only a decimal point and refuses a comma: in a
	// comma-separated file "8,490" may mean 8.49 or 8490, so it is ambiguous.
	PointOnly
)

// NumberError is text that is not a number ParseNumber accepts.
type NumberError struct {
	Text string // the text as given
	Msg  string // why, in plain words
}

// Error returns the reason, naming the text.
func (e *NumberError) Error() string { return fmt.Sprintf("“%s” %s", e.Text, e.Msg) }

// ParseNumber reads a number typed by a person or written in a field book:
// an optional sign (+, - or the minus sign −), decimal digits with at most
// one decimal mark, and an optional exponent ("1.5e-7"). Surrounding spaces
// are ignored. It is the one rule for typed numbers in Furlong: the window,
// the field book import and the CSV tables all use it.
//
// It refuses, with a plain message: hexadecimal and other Go number syntax
// ("0x1p3", "1_000"), words ("inf", "NaN"; missing-value markers are for
// IsMissingText), thousands separators ("1,234,567", "1.234,5", "1 234"),
// a comma when mark is PointOnly, and numbers too large for a float64.
// Empty text is an error too: callers decide first whether it is missing.
func ParseNumber(s string, mark DecimalMark) (float64, error) {
	text := s
	s = strings.TrimSpace(s)
	if s == "" {
		return 0, &NumberError{Text: text, Msg: "is empty, not a number"}
	}
	if strings.HasPrefix(s, "−") { // U+2212, the minus sign of typeset text and some spreadsheets
		s = "-" + s[len("−"):]
	}
	commas := strings.Count(s, ",")
	switch {
	case commas == 0:
	case mark == PointOnly:
		return 0, &NumberError{Text: text, Msg: "has a comma, which is ambiguous in a comma-separated file (a decimal comma or a thousands separator?); write the number with a decimal point and no thousands separator"}
	case commas > 1 || strings.Contains(s, "."):
		return 0, &NumberError{Text: text, Msg: "is not a number Furlong can read: write it without thousands separators, with one decimal point or comma, such as 1234.5"}
	default:
		s = strings.Replace(s, ",", ".", 1)
	}
	if !plainDecimal(s) {
		if strings.ContainsAny(s, " \u00a0'") {
			return 0, &NumberError{Text: text, Msg: "is not a number Furlong can read: write it without spaces or thousands separators, such as 1234.5"}
		}
		return 0, &NumberError{Text: text, Msg: "is not a number: write digits with a decimal point or comma, such as 12.5 or 12,5"}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(v, 0) {
		// plainDecimal admits only what ParseFloat reads, so the one error
		// left is a value beyond the range of a float64.
		return 0, &NumberError{Text: text, Msg: "is too large to be a measured value"}
	}
	return v, nil
}

// plainDecimal reports whether s is [+-]digits[.digits][e[+-]digits], with
// at least one digit before the exponent.
func plainDecimal(s string) bool {
	i := 0
	if i < len(s) && (s[i] == '+' || s[i] == '-') {
		i++
	}
	digits, point := 0, false
	for ; i < len(s); i++ {
		c := s[i]
		switch {
		case c >= '0' && c <= '9':
			digits++
			continue
		case c == '.' && !point:
			point = true
			continue
		}
		break
	}
	if digits == 0 {
		return false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			i++
		}
		ed := 0
		for ; i < len(s) && s[i] >= '0' && s[i] <= '9'; i++ {
			ed++
		}
		if ed == 0 {
			return false
		}
	}
	return i == len(s)
}

// IsMissingText reports whether text stands for a missing value: empty (or
// only spaces), or one of the markers NA, N/A and "." in any letter case
// (common practice in statistics packages' and spreadsheets' files). It is
// the one missing-value rule for typed values, field books and CSV tables.
func IsMissingText(s string) bool {
	switch strings.ToUpper(strings.TrimSpace(s)) {
	case "", "NA", "N/A", ".":
		return true
	}
	return false
}
