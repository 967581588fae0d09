package xlsx

import (
	"bytes"
	"encoding/csv"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"furlong/trial/analysis"
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
	if err := WriteReport(&buf, tr, res, ReportOptions{Method: analysis.LSD, Charts: true, Version: "test"}); err != nil {
		t.Fatal(err)
	}
	in := filepath.Join(dir, "report.xlsx")
	if err := os.WriteFile(in, buf.Bytes(), 0o644); err != nil {
		t.Fatal(err)
	}
	// Raw values first (token 9 false: cell contents as stored): LibreOffice
	// reads back every number exactly.
	soffice(t, dir, in, "csv:Text - txt - csv (StarCalc):44,34,76,1,,0,false,true,false,false,false,-1")
	yield := res[0].Result
	raw := readCSV(t, filepath.Join(dir, "report-Summary.csv"))
	head := csvRow(raw, "Treatment")
	if head < 0 {
		t.Fatalf("no header in the summary CSV: %q", raw)
	}
	for i, m := range yield.Means {
		r := raw[head+1+i]
		if got, err := strconv.ParseFloat(r[3], 64); err != nil || got != m.BackMean {
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
		// Shown with the trait's 2 decimals.
		if want := strconv.FormatFloat(m.BackMean, 'f', 2, 64); r[3] != want {
			t.Errorf("%s mean shown %q, want %q", m.Treatment, r[3], want)
		}
		if r[4] != m.LettersLSD {
			t.Errorf("%s letters %q", m.Treatment, r[4])
		}
	}
	var pRow []string
	for _, r := range sum {
		if len(r) > 0 && r[0] == "p (treatments)" {
			pRow = r
		}
	}
	// p = 0.00161 shows with three decimals.
	if pRow == nil || pRow[3] != "0.002" {
		t.Errorf("p row %q, want 0.002 for yield", pRow)
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
