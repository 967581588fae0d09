package trial

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
)

func TestParseNumber(t *testing.T) {
	t.Parallel()
	// Decimal notation with a point, as in ISO 80000-1 (which allows a point or
	// a comma as the decimal sign); exponent notation as in RFC 8259 numbers.
	ok := []struct {
		in   string
		mark DecimalMark
		want float64
	}{
		{"12.5", PointOrComma, 12.5},
		{"  12.5 ", PointOrComma, 12.5},
		{"12,5", PointOrComma, 12.5},
		{"-0,25", PointOrComma, -0.25},
		{"−3.5", PointOrComma, -3.5}, // U+2212 minus sign
		{"+4", PointOrComma, 4},
		{".5", PointOrComma, 0.5},
		{"5.", PointOrComma, 5},
		{"0", PointOrComma, 0},
		{"1.5e-7", PointOrComma, 1.5e-7},
		{"2E3", PointOnly, 2000},
		{"8.49", PointOnly, 8.49},
		{"1e308", PointOnly, 1e308},
		{"4.9e-324", PointOnly, 4.9e-324}, // the smallest subnormal float64 (IEEE 754)
		{"007", PointOrComma, 7},
	}
	for _, c := range ok {
		got, err := ParseNumber(c.in, c.mark)
		if err != nil || got != c.want {
			t.Errorf("ParseNumber(%q, %d) = %v, %v; want %v", c.in, c.mark, got, err, c.want)
		}
	}
	bad := []struct {
		in   string
		mark DecimalMark
		says string
	}{
		{"", PointOrComma, "empty"},
		{"   ", PointOrComma, "empty"},
		{"0x1p3", PointOrComma, "not a number"}, // Go's strconv reads this as 8
		{"0x10", PointOrComma, "not a number"},
		{"1_000", PointOrComma, "not a number"},
		{"inf", PointOrComma, "not a number"},
		{"-Inf", PointOrComma, "not a number"},
		{"NaN", PointOrComma, "not a number"},
		{"NA", PointOrComma, "not a number"},
		{"abc", PointOrComma, "not a number"},
		{"12.5.3", PointOrComma, "not a number"},
		{"1e", PointOrComma, "not a number"},
		{"e5", PointOrComma, "not a number"},
		{"--1", PointOrComma, "not a number"},
		{"1,234,567", PointOrComma, "thousands"},
		{"1.234,5", PointOrComma, "thousands"},
		{"1,234.5", PointOrComma, "thousands"},
		{"1 234", PointOrComma, "spaces"},
		{"8,490", PointOnly, "ambiguous"},
		{"12,5", PointOnly, "ambiguous"},
		{"1e400", PointOrComma, "too large"},
		{"-1e309", PointOnly, "too large"},
	}
	for _, c := range bad {
		v, err := ParseNumber(c.in, c.mark)
		var ne *NumberError
		if !errors.As(err, &ne) {
			t.Errorf("ParseNumber(%q, %d) = %v, %v; want a NumberError", c.in, c.mark, v, err)
			continue
		}
		if ne.Text != c.in || !strings.Contains(err.Error(), c.says) || !strings.Contains(err.Error(), "“"+c.in+"”") {
			t.Errorf("ParseNumber(%q): message %q should name the text and say %q", c.in, err, c.says)
		}
	}
}

// Every text the rule accepts reads as Go's strconv.ParseFloat reads the
// same text with the comma made a point (the standard library as the
// reference), and the result is finite.
func TestParseNumberAgreesWithStrconv(t *testing.T) {
	t.Parallel()
	for _, s := range []string{"0.1", "123456789.123456789", "9.999999999999999e22", "-2.2250738585072014e-308", "3,14159"} {
		got, err := ParseNumber(s, PointOrComma)
		if err != nil {
			t.Fatalf("%q: %v", s, err)
		}
		want := mustFloat(t, strings.Replace(s, ",", ".", 1))
		if got != want || math.IsInf(got, 0) || math.IsNaN(got) {
			t.Errorf("%q: %v, strconv gives %v", s, got, want)
		}
	}
}

func FuzzParseNumber(f *testing.F) {
	for _, s := range []string{"12.5", "12,5", "0x1p3", "1e400", "NaN", "−1", "1,2,3"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for _, m := range []DecimalMark{PointOrComma, PointOnly} {
			v, err := ParseNumber(s, m)
			if err == nil && (math.IsNaN(v) || math.IsInf(v, 0)) {
				t.Fatalf("%q gave %v", s, v)
			}
			if err == nil && m == PointOnly && strings.Contains(s, ",") {
				t.Fatalf("%q with a comma accepted in PointOnly mode", s)
			}
			if err == nil && strings.ContainsAny(s, "xXpP_nN") {
				t.Fatalf("%q accepted", s)
			}
		}
	})
}

func TestIsMissingText(t *testing.T) {
	t.Parallel()
	// NA, N/A and "." are the usual missing-value markers (common practice).
	for _, s := range []string{"", "  ", "NA", "na", " N/A ", "n/a", "."} {
		if !IsMissingText(s) {
			t.Errorf("%q is not taken as missing", s)
		}
	}
	for _, s := range []string{"0", "-", "NAN", "none", "..", "N.A."} {
		if IsMissingText(s) {
			t.Errorf("%q is taken as missing", s)
		}
	}
}

func mustFloat(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}
