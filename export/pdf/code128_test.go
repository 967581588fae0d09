package pdf

import "testing"

// TestCode128Structure checks the pattern table and the encoder against the
// rules of ISO/IEC 15417: every symbol is 11 modules of 3 bars and 3 spaces
// with an even number of bar modules (the parity rule), the stop pattern 13;
// a symbol is start + data + check + stop.
func TestCode128Structure(t *testing.T) {
	t.Parallel()
	seen := map[string]bool{}
	for v, p := range code128Patterns {
		want := 11
		if v == 106 {
			want = 13
		}
		sum, bars := 0, 0
		for i, r := range p {
			sum += int(r - '0')
			if i%2 == 0 {
				bars += int(r - '0')
			}
		}
		if sum != want || bars%2 != 0 {
			t.Errorf("symbol %d %q: %d modules, %d in bars; want %d modules and an even bar count (ISO/IEC 15417)", v, p, sum, bars, want)
		}
		if seen[p] {
			t.Errorf("symbol %d %q repeats an earlier pattern", v, p)
		}
		seen[p] = true
	}
	w, err := code128("101")
	if err != nil {
		t.Fatal(err)
	}
	total := 0
	for _, x := range w {
		total += x
	}
	// Start B, three characters, check character (11 modules each) and the
	// 13-module stop of 7 bars and spaces (ISO/IEC 15417).
	if total != 11*5+13 {
		t.Errorf("code128(101) is %d modules wide, want %d", total, 11*5+13)
	}
	// Check character of "101" in code set B: (104 + 1·17 + 2·16 + 3·17) mod
	// 103 = 204 mod 103 = 101 (ISO/IEC 15417 §4.7.2 weighting).
	got := ""
	for _, x := range w[len(w)-7-6 : len(w)-7] {
		got += string(rune('0' + x))
	}
	if got != code128Patterns[101] {
		t.Errorf("check character pattern %s, want symbol 101 %s", got, code128Patterns[101])
	}
	if _, err := code128("Plot\n"); err == nil {
		t.Error("a control character was accepted")
	}
}
