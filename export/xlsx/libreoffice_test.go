package xlsx

import (
	"bytes"
	"context"
	"encoding/csv"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"furlong/stats/meansep"
	"furlong/trial/fieldbook"
)

// soffice converts in to the format given in dir, with a private profile so
// that parallel runs do not clash. It skips the test when LibreOffice is not
// installed.
func soffice(t *testing.T, dir, in, format string) {
	t.Helper()
	bin, err := exec.LookPath("soffice")
	if err != nil {
		t.Skip("soffice (LibreOffice) is not installed; skipping the LibreOffice check")
	}
	profile := "file://" + filepath.Join(dir, "profile")
	cmd := exec.Command(bin, "-env:UserInstallation="+profile, "--headless", "--convert-to", format, "--outdir", dir, in)
	cmd.Env = append(os.Environ(), "HOME="+dir)
	done := make(chan error, 1)
	var out bytes.Buffer
	cmd.Stdout, cmd.Stderr = &out, &out
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	go func() { done <- cmd.Wait() }()
	select {
	case err := <-done:
		if err != nil {
			t.Fatalf("soffice: %v\n%s", err, out.String())
		}
	case <-time.After(3 * time.Minute):
		cmd.Process.Kill()
		t.Fatal("soffice took more than 3 minutes")
	}
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	raw, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	r := csv.NewReader(bytes.NewReader(raw))
	r.FieldsPerRecord = -1
	recs, err := r.ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	return recs
}

// TestLibreOffice opens the report in an independent spreadsheet program,
// LibreOffice Calc, and checks the values it shows: every sheet exported as
// CSV "as shown" (LibreOffice's CSV filter options: separator 44, quote 34,
// UTF-8 76, first line 1, ..., token 9 true = save cell contents as shown,
// last token -1 = every sheet to its own file).
func TestLibreOffice(t *testing.T) {
	if testing.Short() {
		t.Skip("LibreOffice conversion is slow; skipped with -short")
	}
	tr, _ := barleyTrial(t)
	res := barleyResults(t, tr)
	res[0].Result.ANOVA.Sources[1].P = 1e-17 // shown as <0.001
	dir := t.TempDir()
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, tr, res, ReportOptions{Method: meansep.LSD, Charts: true, Version: "test"}); err != nil {
		t.Fatal(err)
	}
	in := filepath.Join(dir, "report.xlsx")
	if err := os.WriteFile(in, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	// Raw values first (token 9 false: cell contents as stored). LibreOffice
	// writes numbers to at most 15 significant digits (from memory; seen
	// here), so the comparison is to 15 digits; the full float64 precision of
	// the stored cells is checked by reading them back with excelize.
	soffice(t, dir, in, "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1")
	yield := res[0].Result
	raw := readCSV(t, filepath.Join(dir, "report-Summary.csv"))
	head := csvRow(raw, "Treatment")
	if head < 0 {
		t.Fatalf("no header in the summary CSV: %q", raw)
	}
	for i, m := range yield.Means {
		r := raw[head+1+i]
		if !sameTo15(r[3], strconv.FormatFloat(m.BackMean, 'g', -1, 64)) {
			t.Errorf("%s mean read by LibreOffice %q, want %v", m.Treatment, r[3], m.BackMean)
		}
	}
	// Then as shown (token 9 true), into its own folder.
	shown := filepath.Join(dir, "shown")
	soffice(t, shown, in, "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,true,false,false,-1")
	sum := readCSV(t, filepath.Join(shown, "report-Summary.csv"))
	for i, m := range yield.Means {
		r := sum[head+1+i]
		if r[0] != m.Treatment {
			t.Fatalf("row %d = %q", i, r)
		}
		// Shown one decimal finer than the trait's 2 (common practice).
		if want := strconv.FormatFloat(m.BackMean, 'f', 3, 64); r[3] != want {
			t.Errorf("%s mean shown %q, want %q", m.Treatment, r[3], want)
		}
		if r[4] != m.LettersLSD {
			t.Errorf("%s letters %q", m.Treatment, r[4])
		}
	}
	// The statistics block: a row per trait, p in column I.
	var pRow []string
	for i, r := range sum {
		if len(r) > 0 && r[0] == "Statistics of each trait" && i+2 < len(sum) {
			pRow = sum[i+2]
		}
	}
	// p = 0.00161 shows with three decimals.
	if len(pRow) < 9 || pRow[8] != "0.002" {
		t.Errorf("statistics row %q, want p 0.002 for yield", pRow)
	}

	trait := readCSV(t, filepath.Join(shown, "report-Yield.csv"))
	found := false
	for _, r := range trait {
		if len(r) >= 6 && r[0] == "Blocks" {
			found = true
			if r[5] != "<0.001" {
				t.Errorf("block p shown %q, want <0.001", r[5])
			}
		}
		if len(r) >= 6 && r[0] == "Treatments" && r[1] != "9" {
			t.Errorf("treatment df shown %q", r[1])
		}
	}
	if !found {
		t.Errorf("no Blocks line in the trait sheet CSV: %q", trait)
	}
	lodge := readCSV(t, filepath.Join(shown, "report-Lodging.csv"))
	if !strings.Contains(strings.Join(lodge[1], ","), "no values recorded") {
		t.Errorf("lodging sheet: %q", lodge)
	}

	// The print layout, converted to PDF, for a person to look at.
	soffice(t, dir, in, "pdf")
	if keep := os.Getenv("FURLONG_KEEP_DIR"); keep != "" {
		for _, n := range []string{"report.xlsx", "report.pdf"} {
			b, _ := os.ReadFile(filepath.Join(dir, n))
			os.WriteFile(filepath.Join(keep, n), b, 0o644)
		}
	}
	if st, err := os.Stat(filepath.Join(dir, "report.pdf")); err != nil || st.Size() == 0 {
		t.Errorf("no PDF: %v", err)
	}
}

func csvRow(recs [][]string, first string) int {
	for i, r := range recs {
		if len(r) > 0 && r[0] == first {
			return i
		}
	}
	return -1
}

// TestLibreOfficeFieldBook opens the field book in LibreOffice Calc: the
// header and values it reads back match the CSV field book's table
// (fieldbook.Rows) apart from the longer trait headers.
func TestLibreOfficeFieldBook(t *testing.T) {
	if testing.Short() {
		t.Skip("LibreOffice conversion is slow; skipped with -short")
	}
	tr := fieldBookTrial(t)
	dir := t.TempDir()
	var buf bytes.Buffer
	if err := WriteFieldBook(&buf, tr, FieldBookOptions{}); err != nil {
		t.Fatal(err)
	}
	in := filepath.Join(dir, "book.xlsx")
	if err := os.WriteFile(in, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	soffice(t, dir, in, "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1")
	got := readCSV(t, filepath.Join(dir, "book-Field book.csv"))
	want := fieldbook.Rows(tr)
	if len(got) != len(want) {
		t.Fatalf("%d rows, want %d", len(got), len(want))
	}
	for i := range want {
		for j := range want[i] {
			g := ""
			if j < len(got[i]) {
				g = got[i][j]
			}
			if i == 0 && strings.HasPrefix(g, want[i][j]) || g == want[i][j] || sameTo15(g, want[i][j]) {
				continue
			}
			t.Errorf("row %d column %d: LibreOffice reads %q, the CSV field book has %q", i, j, g, want[i][j])
		}
	}
	soffice(t, dir, in, "pdf")
	if keep := os.Getenv("FURLONG_KEEP_DIR"); keep != "" {
		b, _ := os.ReadFile(filepath.Join(dir, "book.pdf"))
		os.WriteFile(filepath.Join(keep, "book.pdf"), b, 0o644)
	}
}

// sameTo15 reports whether two numbers written as text agree to 15
// significant digits.
func sameTo15(a, b string) bool {
	x, err1 := strconv.ParseFloat(a, 64)
	y, err2 := strconv.ParseFloat(b, 64)
	return err1 == nil && err2 == nil &&
		strconv.FormatFloat(x, 'g', 15, 64) == strconv.FormatFloat(y, 'g', 15, 64)
}
