package cli

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReportAndMapPDF runs 'furlong report -o r.pdf' and 'furlong map -o
// m.pdf' on the demo trial; the xlsx report keeps working beside them.
func TestReportAndMapPDF(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	trialPath := filepath.Join(dir, "demo.furlong")
	if code, _, errs := run(t, "new", "--demo", "-o", trialPath); code != 0 {
		t.Fatalf("new --demo: %d %s", code, errs)
	}
	for _, tc := range []struct {
		args  []string
		magic string
	}{
		{[]string{"report", trialPath, "-o", filepath.Join(dir, "r.pdf"), "--paper", "letter", "--no-charts", "--vs-check=false"}, "%PDF-"},
		{[]string{"report", trialPath, "-o", filepath.Join(dir, "r.xlsx"), "--no-charts"}, "PK"},
		{[]string{"map", trialPath, "-o", filepath.Join(dir, "m.pdf")}, "%PDF-"},
	} {
		code, out, errs := run(t, tc.args...)
		if code != 0 {
			t.Fatalf("%v: exit %d: %s", tc.args, code, errs)
		}
		path := tc.args[3]
		data, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.HasPrefix(data, []byte(tc.magic)) || !strings.Contains(out, path) {
			t.Errorf("%v: wrote %d bytes starting %q, said %q", tc.args, len(data), data[:min(8, len(data))], out)
		}
		if strings.HasSuffix(path, ".pdf") && tc.args[0] == "report" && !bytes.Contains(data, []byte("[0 0 612.00 792.00]")) {
			t.Errorf("--paper letter: no US Letter page (612 × 792 pt)")
		}
	}
	// A report to another format is a usage error (exit 2) saying what to give.
	code, _, errs := run(t, "report", trialPath, "-o", filepath.Join(dir, "r.docx"))
	if code != 2 || !strings.Contains(errs, "REPORT.pdf") {
		t.Errorf("report -o r.docx: exit %d, %q; want 2 and a hint of .xlsx or .pdf", code, errs)
	}
	for _, tc := range []struct {
		args []string
		want string
	}{
		{[]string{"--check", "CHK", "--vs-check=false"}, "--check goes with"},
		{[]string{"--contrast", "new=HM01 vs NOPE"}, "NOPE"},
		{[]string{"--contrast", "new=HM01 vs CHK", "--adjust", "sometimes"}, "--adjust"},
	} {
		args := append([]string{"report", trialPath, "-o", filepath.Join(dir, "r2.xlsx")}, tc.args...)
		code, _, errs = run(t, args...)
		if code == 0 || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d, %q; want an error naming %q", tc.args, code, errs, tc.want)
		}
	}
}
