package ui

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"furlong/trial"
)

// errNotNumber and friends are the reasons typed text is refused.
var (
	errNotNumber = errors.New("not a number")
	errNotCount  = errors.New("not a count")
	errNotPct    = errors.New("not a percentage")
)

// valueError is a refused value: a plain message that wraps one of the
// sentinels above.
type valueError struct {
	kind error
	msg  string
}

func (e *valueError) Error() string { return e.msg }
func (e *valueError) Unwrap() error { return e.kind }

func refuse(kind error, format string, args ...any) error {
	return &valueError{kind: kind, msg: fmt.Sprintf(format, args...)}
}

// parseValue reads the text typed for one plot and trait. Empty text is a
// missing value. A comma is accepted as the decimal mark when the text has
// no point. Text that is not a value of the trait's kind is refused with a
// plain message; a value outside the trait's valid range is accepted (the
// caller flags it, see rangeNote).
func parseValue(text string, tr *trial.Trait) (float64, error) {
	s := strings.TrimSpace(text)
	if s == "" {
		return trial.Missing, nil
	}
	if !strings.Contains(s, ".") && strings.Count(s, ",") == 1 {
		s = strings.Replace(s, ",", ".", 1)
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) || strings.ContainsAny(s, "xXpP_") {
		return 0, refuse(errNotNumber, "“%s” is not a number. Type a number such as 12.5, or clear the cell for a missing value", text)
	}
	switch tr.Kind {
	case trial.Count:
		if v < 0 || v != math.Trunc(v) {
			return 0, refuse(errNotCount, "%s counts %s, so the value must be a whole number, 0 or more", tr.Name, unitOr(tr.Unit, "items"))
		}
	case trial.Percent:
		if v < 0 || v > 100 {
			return 0, refuse(errNotPct, "%s is a percentage, so the value must lie between 0 and 100", tr.Name)
		}
	}
	return v, nil
}

func unitOr(u, alt string) string {
	if u == "" {
		return alt
	}
	return u
}

// rangeNote returns a warning when v lies outside the trait's valid range,
// or "" when it does not (or is missing).
func rangeNote(v float64, tr *trial.Trait) string {
	if trial.IsMissing(v) {
		return ""
	}
	if tr.Min != nil && v < *tr.Min {
		return fmt.Sprintf("%s is below the expected range of %s (%s). The value is kept; check it.", formatValue(v, tr.Decimals), tr.Name, rangeText(tr))
	}
	if tr.Max != nil && v > *tr.Max {
		return fmt.Sprintf("%s is above the expected range of %s (%s). The value is kept; check it.", formatValue(v, tr.Decimals), tr.Name, rangeText(tr))
	}
	return ""
}

// outOfRange reports whether v is outside the trait's valid range.
func outOfRange(v float64, tr *trial.Trait) bool {
	if trial.IsMissing(v) {
		return false
	}
	return (tr.Min != nil && v < *tr.Min) || (tr.Max != nil && v > *tr.Max)
}

func rangeText(tr *trial.Trait) string {
	switch {
	case tr.Min != nil && tr.Max != nil:
		return fmt.Sprintf("%s to %s", formatValue(*tr.Min, tr.Decimals), formatValue(*tr.Max, tr.Decimals))
	case tr.Min != nil:
		return "at least " + formatValue(*tr.Min, tr.Decimals)
	case tr.Max != nil:
		return "at most " + formatValue(*tr.Max, tr.Decimals)
	}
	return "any value"
}

// formatValue shows a value with the trait's decimals; missing is empty.
func formatValue(v float64, decimals int) string {
	if trial.IsMissing(v) {
		return ""
	}
	if decimals < 0 {
		decimals = 0
	}
	return strconv.FormatFloat(v, 'f', decimals, 64)
}

// editText is the text put in the entry for a stored value: every digit
// of it, so that committing unchanged text never rounds the value.
func editText(v float64) string {
	if trial.IsMissing(v) {
		return ""
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// traitLabel is a trait's name with its unit.
func traitLabel(tr *trial.Trait) string {
	if tr.Unit == "" {
		return tr.Name
	}
	return tr.Name + " (" + tr.Unit + ")"
}
