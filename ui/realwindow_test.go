package ui

import (
	"os"
	"strconv"
	"strings"
	"testing"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// TestRealWindowFile checks a trial file saved by the real window after
// .ci/realwindow.sh typed values into the Record grid with xdotool. It
// runs only when that script sets FURLONG_REALWINDOW_FILE, and checks the
// values the script typed, listed in FURLONG_REALWINDOW_WANT as
// "trait:row=value,row=value;trait:..." ("missing" for an empty cell).
// The expected values are the keys the script pressed (common practice: a
// data-entry grid stores exactly what was typed).
func TestRealWindowFile(t *testing.T) {
	path := os.Getenv("FURLONG_REALWINDOW_FILE")
	if path == "" {
		t.Skip("run by .ci/realwindow.sh, which drives a real window")
	}
	tr, err := trialfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	want := os.Getenv("FURLONG_REALWINDOW_WANT")
	n := 0
	for _, part := range strings.Split(want, ";") {
		key, cells, ok := strings.Cut(part, ":")
		if !ok {
			t.Fatalf("FURLONG_REALWINDOW_WANT part %q has no trait", part)
		}
		trt := tr.Trait(key)
		if trt == nil {
			t.Fatalf("the saved trial has no trait %q", key)
		}
		for _, c := range strings.Split(cells, ",") {
			rs, vs, _ := strings.Cut(c, "=")
			row, err := strconv.Atoi(rs)
			if err != nil || row < 0 || row >= len(trt.Values) {
				t.Fatalf("bad row in %q", c)
			}
			got := trt.Values[row]
			if vs == "missing" {
				if !trial.IsMissing(got) {
					t.Errorf("%s, plot %d: %v saved, want an empty cell", key, tr.Plots[row].Number, got)
				}
			} else if v, err := strconv.ParseFloat(vs, 64); err != nil {
				t.Fatalf("bad value in %q", c)
			} else if got != v {
				t.Errorf("%s, plot %d: %v saved, want %v as typed", key, tr.Plots[row].Number, got, v)
			}
			n++
		}
	}
	t.Logf("%d cells checked in %s", n, path)
}
