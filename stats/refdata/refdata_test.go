package refdata

import (
	"os"
	"regexp"
	"slices"
	"strings"
	"testing"
)

// TestReadmeListsEveryFile checks that README.md, which gives the
// provenance, names every embedded file (in backquotes) and names no file
// that is not embedded.
func TestReadmeListsEveryFile(t *testing.T) {
	readme, err := os.ReadFile("README.md")
	if err != nil {
		t.Fatal(err)
	}
	listed := map[string]bool{}
	for _, m := range regexp.MustCompile("`([^` ]+\\.(?:csv|json|furlong))`").FindAllStringSubmatch(string(readme), -1) {
		listed[m[1]] = true
	}
	names := Names()
	if len(names) == 0 {
		t.Fatal("no embedded files")
	}
	for _, n := range names {
		if !listed[n] {
			t.Errorf("%s is embedded but README.md does not list it", n)
		}
	}
	for n := range listed {
		if !slices.Contains(names, n) {
			t.Errorf("README.md lists %s, which is not embedded", n)
		}
	}
}

// TestFilesParse checks that each CSV file parses into a header and rows of
// its width, and each JSON file (and trial file) decodes into an object.
func TestFilesParse(t *testing.T) {
	for _, n := range Names() {
		switch {
		case strings.HasSuffix(n, ".csv"):
			recs := CSV(t, n)
			if len(recs) < 2 {
				t.Errorf("%s: %d records, want a header and data", n, len(recs))
				continue
			}
			for i, r := range recs {
				if len(r) != len(recs[0]) || len(r) < 2 {
					t.Errorf("%s: record %d has %d fields, header %d", n, i+1, len(r), len(recs[0]))
				}
			}
		case strings.HasSuffix(n, ".json"), strings.HasSuffix(n, ".furlong"): // a trial file is JSON
			var v map[string]any
			JSON(t, n, &v)
			if len(v) == 0 {
				t.Errorf("%s: empty object", n)
			}
		default:
			t.Errorf("%s: neither CSV nor JSON", n)
		}
	}
}

// TestErrors checks that a missing name is an error, not a panic.
func TestErrors(t *testing.T) {
	if _, err := ReadFile("no-such-file.csv"); err == nil {
		t.Error("ReadFile of a missing file: no error")
	}
	if _, err := Open("no-such-file.csv"); err == nil {
		t.Error("Open of a missing file: no error")
	}
	b, err := ReadFile("plant-growth.csv")
	if err != nil || !strings.HasPrefix(string(b), "weight,treatment\n") {
		t.Errorf("ReadFile(plant-growth.csv) = %.20q, %v", b, err)
	}
	p := File(t, "plant-growth.csv")
	d, err := os.ReadFile(p)
	if err != nil || string(d) != string(b) {
		t.Errorf("File: %s holds %d bytes, want %d (%v)", p, len(d), len(b), err)
	}
}
