// Package refdata holds the reference datasets that the tests of more than
// one package check against: open datasets with results computed by R and
// scipy, and the project's generated reference trials. Each file is stored
// once, embedded in the test binaries that import this package; README.md
// says where every file comes from.
//
// Only tests import refdata. It imports the standard library alone.
package refdata

import (
	"bytes"
	"embed"
	"encoding/csv"
	"encoding/json"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"testing"
)

//go:embed *.csv *.json *.furlong nist-strd-anova ancova/*.csv ancova/*.json
var files embed.FS

// Names returns the names of the embedded files in sorted order, those in
// a folder as folder/name (nist-strd-anova/SiRstv.csv).
func Names() []string {
	var out []string
	fs.WalkDir(files, ".", func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			out = append(out, p)
		}
		return err
	})
	sort.Strings(out)
	return out
}

// FS returns the embedded files as a file system, for code written against
// fs.FS.
func FS() fs.FS { return files }

// ReadFile returns the contents of the named file, or an error naming it
// if there is no such file. It reads as os.ReadFile does.
func ReadFile(name string) ([]byte, error) {
	return files.ReadFile(name)
}

// Open opens the named file for reading, as os.Open does.
func Open(name string) (fs.File, error) {
	return files.Open(name)
}

// Bytes returns the contents of the named file; a missing file fails the
// test.
func Bytes(tb testing.TB, name string) []byte {
	tb.Helper()
	b, err := files.ReadFile(name)
	if err != nil {
		tb.Fatalf("refdata: %v", err)
	}
	return b
}

// CSV returns every record of the named CSV file, the header included.
func CSV(tb testing.TB, name string) [][]string {
	tb.Helper()
	recs, err := csv.NewReader(bytes.NewReader(Bytes(tb, name))).ReadAll()
	if err != nil {
		tb.Fatalf("refdata: %s: %v", name, err)
	}
	return recs
}

// JSON decodes the named JSON file into v.
func JSON(tb testing.TB, name string, v any) {
	tb.Helper()
	if err := json.Unmarshal(Bytes(tb, name), v); err != nil {
		tb.Fatalf("refdata: %s: %v", name, err)
	}
}

// File writes the named file into a fresh temporary directory of the test
// under its own name (in its folder, if it has one) and returns its path, for code that reads files from
// disk (a command line, a file dialog). The directory is removed when the
// test ends.
func File(tb testing.TB, name string) string {
	tb.Helper()
	p := filepath.Join(tb.TempDir(), filepath.FromSlash(name))
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		tb.Fatalf("refdata: %v", err)
	}
	if err := os.WriteFile(p, Bytes(tb, name), 0o644); err != nil {
		tb.Fatalf("refdata: %v", err)
	}
	return p
}
