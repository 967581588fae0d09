package ui

import (
	"errors"
	"math"
	"testing"

	"furlong/trial"
)

func TestParseValue(t *testing.T) {
	t.Parallel()
	cont := &trial.Trait{Name: "Yield", Kind: trial.Continuous, Min: f64(0), Max: f64(10)}
	count := &trial.Trait{Name: "Heads", Kind: trial.Count}
	pct := &trial.Trait{Name: "Cover", Kind: trial.Percent}
	// Kinds as defined by the trial package's Trait docs (a count is a whole
	// number, 0 or more; a percentage lies in 0–100); decimal comma as used
	// in many European locales (common practice).
	for _, c := range []struct {
		text string
		tr   *trial.Trait
		want float64
		err  error
	}{
		{"", cont, math.NaN(), nil},
		{"  ", cont, math.NaN(), nil},
		{"5.25", cont, 5.25, nil},
		{"5,25", cont, 5.25, nil},
		{"1e1", cont, 10, nil},
		{"12", cont, 12, nil}, // out of range: accepted, flagged elsewhere
		{"-3", cont, -3, nil},
		{"abc", cont, 0, errNotNumber},
		{"1,234.5", cont, 0, errNotNumber},
		{"NaN", cont, 0, errNotNumber},
		{"inf", cont, 0, errNotNumber},
		{"0x10", cont, 0, errNotNumber},
		{"3", count, 3, nil},
		{"3.5", count, 0, errNotCount},
		{"-1", count, 0, errNotCount},
		{"100", pct, 100, nil},
		{"100.5", pct, 0, errNotPct},
	} {
		got, err := parseValue(c.text, c.tr)
		if !errors.Is(err, c.err) {
			t.Errorf("parseValue(%q) error %v, want %v", c.text, err, c.err)
			continue
		}
		if err == nil && !sameValue(got, c.want) {
			t.Errorf("parseValue(%q) = %v, want %v", c.text, got, c.want)
		}
	}
	if rangeNote(12, cont) == "" || rangeNote(5, cont) != "" || rangeNote(math.NaN(), cont) != "" {
		t.Error("rangeNote does not flag exactly the values outside 0–10")
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
	for _, s := range []string{num(math.NaN(), 4), fixed(math.Inf(1), 2), pValue(math.NaN()), optNum(nil, 2)} {
		if s != "–" {
			t.Errorf("non-finite shown as %q", s)
		}
	}
	// Conventional reporting of p below 0.001 (common practice).
	if pValue(0.0004) != "<0.001" || pValue(0.0234) != "0.023" {
		t.Error("p formatting")
	}
	if num(8.78751, 5) != "8.7875" || num(14.3083, 5) != "14.308" || num(0.976389, 5) != "0.97639" {
		t.Errorf("num: %s %s %s", num(8.78751, 5), num(14.3083, 5), num(0.976389, 5))
	}
}
