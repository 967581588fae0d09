package ui

import (
	"errors"
	"fmt"
	"strconv"
	"unicode"

	"furlong/trial"
)

// errNotNumber is the reason typed text that is not a number is refused.
var errNotNumber = errors.New("not a number")

// valueError is refused text: a plain message that wraps errNotNumber.
type valueError struct {
	kind error
	msg  string
}

func (e *valueError) Error() string { return e.msg }
func (e *valueError) Unwrap() error { return e.kind }

// parseValue reads the text typed for one plot. Empty text is a missing
// value. A comma is accepted as the decimal mark when the text has no
// point. Text that is not a finite number is refused with a plain message.
// Whether the number is possible for the trait (a whole count, a
// percentage of 0 to 100) is decided by trial.SetValue, and whether it is
// plausible by Trait.RangeNote: the window keeps no rules of its own.
func parseValue(text string) (float64, error) {
	if trial.IsMissingText(text) {
		return trial.Missing, nil
	}
	v, err := trial.ParseNumber(text, trial.PointOrComma)
	if err != nil {
		return 0, &valueError{kind: errNotNumber, msg: fmt.Sprintf("“%s” is not a number. Type a number such as 12.5, or clear the cell for a missing value", text)}
	}
	return v, nil
}

// upperFirst starts a message with a capital letter.
func upperFirst(s string) string {
	if s == "" {
		return s
	}
	r := []rune(s)
	r[0] = unicode.ToUpper(r[0])
	return string(r)
}

// rangeText describes a trait's valid range, for the Setup step's list.
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
