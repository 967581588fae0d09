package ui

import (
	"errors"
	"math"
	"testing"

	"furlong/stats"
)

func TestParseValue(t *testing.T) {
	t.Parallel()
	// Decimal comma as used in many European locales (common practice);
	// the kind of a trait is checked by trial.SetValue, not here.
	for _, c := range []struct {
		text string
		want float64
		err  error
	}{
		{"", math.NaN(), nil},
		{"  ", math.NaN(), nil},
		{"5.25", 5.25, nil},
		{"5,25", 5.25, nil},
		{"1e1", 10, nil},
		{"-3", -3, nil},
		{"3.5", 3.5, nil},
		{"abc", 0, errNotNumber},
		{"1,234.5", 0, errNotNumber},
		{"NaN", 0, errNotNumber},
		{"inf", 0, errNotNumber},
		{"0x10", 0, errNotNumber},
	} {
		got, err := parseValue(c.text)
		if !errors.Is(err, c.err) {
			t.Errorf("parseValue(%q) error %v, want %v", c.text, err, c.err)
			continue
		}
		if err == nil && !sameValue(got, c.want) {
			t.Errorf("parseValue(%q) = %v, want %v", c.text, got, c.want)
		}
	}
}

// A column copied from a spreadsheet arrives as one cell per line, two
// columns as tab-separated cells (common practice of spreadsheet programs'
// plain-text clipboard format).
func TestParseTreatmentList(t *testing.T) {
	t.Parallel()
	next := func(i int) string { return []string{"T01", "T02", "T03"}[i] }
	got := parseTreatmentList("Alpha\r\n\r\nBravo\nCharlie\n", next)
	if len(got) != 3 || got[0].Code != "T01" || got[0].Name != "Alpha" || got[2].Code != "T03" || got[2].Name != "Charlie" {
		t.Errorf("names: %+v", got)
	}
	got = parseTreatmentList("A1\tAlpha\tignored\nB2\tBravo\n", next)
	if len(got) != 2 || got[0].Code != "A1" || got[0].Name != "Alpha" || got[1].Code != "B2" {
		t.Errorf("code and name: %+v", got)
	}
}

func TestFormat(t *testing.T) {
	t.Parallel()
	// No NaN may reach a result table (project rule).
	for _, s := range []string{num(math.NaN(), 4), fixed(math.Inf(1), 2), stats.FormatP(math.NaN()), optNum(nil, 2)} {
		if s != "–" {
			t.Errorf("non-finite shown as %q", s)
		}
	}
	// Conventional reporting of p below 0.001 (common practice).
	if stats.FormatP(0.0004) != "<0.001" || stats.FormatP(0.0234) != "0.023" {
		t.Error("p formatting")
	}
	if num(8.78751, 5) != "8.7875" || num(14.3083, 5) != "14.308" || num(0.976389, 5) != "0.97639" {
		t.Errorf("num: %s %s %s", num(8.78751, 5), num(14.3083, 5), num(0.976389, 5))
	}
}
