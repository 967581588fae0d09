package cli

import (
	"encoding/binary"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"unicode/utf16"

	"furlong/stats/refdata"
)

// 'furlong analyze data.csv' reads what 'furlong import' reads: every form
// of the same table gives the same analysis as the plain file, which
// TestAnalyzeCSVAgainstR checks against R (PlantGrowth, R datasets).
func TestAnalyzeReadsEveryFormOfACSVFile(t *testing.T) {
	t.Parallel()
	plain, err := refdata.ReadFile("plant-growth.csv")
	if err != nil {
		t.Fatal(err)
	}
	text := strings.ReplaceAll(string(plain), "\r\n", "\n")
	lines := strings.Split(strings.TrimSuffix(text, "\n"), "\n")
	semi := strings.ReplaceAll(text, ",", ";")
	withNote := lines[0] + ",note\n" + lines[1] + ",\"two\nlines\"\n" + strings.Join(lines[2:], ",x\n") + ",x\n"
	utf16le := func(s string) []byte {
		u := utf16.Encode([]rune(s))
		b := make([]byte, 2*len(u))
		for i, c := range u {
			binary.LittleEndian.PutUint16(b[2*i:], c)
		}
		return b
	}
	forms := []struct {
		name string
		data []byte
		args []string
	}{
		{"sep line and semicolons", []byte("sep=;\n" + semi), nil},
		{"decimal commas", []byte(strings.ReplaceAll(semi, ".", ",")), nil},
		{"quoted decimal commas with --decimal-comma", []byte(quoteDecimals(text)), []string{"--decimal-comma"}},
		{"blank lines", []byte(strings.Replace(strings.Replace(text, "\n", "\n\n", 3), "\n", "\n  \n", 1) + "\n\n"), nil},
		{"rows of empty cells", []byte(strings.Replace(text, "\n", "\n,,\n", 4)), nil},
		{"trailing empty cells", []byte(strings.ReplaceAll(text, "\n", ",,\n")), nil},
		// RFC 4180 §2.6: a quoted cell may span lines.
		{"quoted cell with a line break", []byte(withNote), nil},
		{"CR line endings", []byte(strings.ReplaceAll(text, "\n", "\r")), nil},
		{"CRLF line endings", []byte(strings.ReplaceAll(text, "\n", "\r\n")), nil},
		{"UTF-16 without BOM", utf16le(text), nil},
		{"UTF-8 BOM", append([]byte{0xEF, 0xBB, 0xBF}, text...), nil},
	}
	dir := t.TempDir()
	ref := filepath.Join(dir, "plain.csv")
	os.WriteFile(ref, []byte(text), 0o644)
	args := []string{"--treatment", "treatment", "--response", "weight", "--format", "json"}
	code, want, stderr := run(t, append([]string{"analyze", ref}, args...)...)
	if code != 0 {
		t.Fatalf("plain file: exit %d: %s", code, stderr)
	}
	for i, f := range forms {
		path := filepath.Join(dir, "form"+itoa(i)+".csv")
		os.WriteFile(path, f.data, 0o644)
		code, got, stderr := run(t, append(append([]string{"analyze", path}, args...), f.args...)...)
		if code != 0 {
			t.Errorf("%s: exit %d: %s", f.name, code, stderr)
			continue
		}
		if got != want {
			t.Errorf("%s: the analysis differs from the plain file's", f.name)
		}
	}
}

// quoteDecimals writes every number with a decimal comma, quoted as RFC 4180
// requires for a cell holding the separator.
func quoteDecimals(text string) string {
	var b strings.Builder
	for _, line := range strings.SplitAfter(text, "\n") {
		cells := strings.Split(strings.TrimSuffix(line, "\n"), ",")
		for i, c := range cells {
			if strings.Contains(c, ".") {
				cells[i] = `"` + strings.Replace(c, ".", ",", 1) + `"`
			}
		}
		b.WriteString(strings.Join(cells, ","))
		if strings.HasSuffix(line, "\n") {
			b.WriteByte('\n')
		}
	}
	return b.String()
}

func TestAnalyzeRefusesAnAmbiguousComma(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "d.csv")
	os.WriteFile(path, []byte("treatment,weight\nA,\"8,490\"\nA,8.2\nB,7.1\nB,7.4\n"), 0o644)
	code, _, stderr := run(t, "analyze", path, "--treatment", "treatment", "--response", "weight")
	if code != ExitFailure || !strings.Contains(stderr, "line 2, column weight") || !strings.Contains(stderr, "8,490") || !strings.Contains(stderr, "--decimal-comma") {
		t.Errorf("exit %d: %s", code, stderr)
	}
}

// Import: a book in a CR-only file imports every value; a quoted "8,490"
// in a comma-separated book is refused naming the cell; an unfilled book
// says there is nothing to import; NA is a missing value.
func TestImportInputForms(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	tf := filepath.Join(dir, "t.furlong")
	if code, _, stderr := run(t, "new", "-o", tf, "--treatments", "3", "--reps", "2", "--seed", "1", "--traits", "ht:cm"); code != 0 {
		t.Fatal(stderr)
	}
	book := filepath.Join(dir, "book.csv")
	if code, _, stderr := run(t, "fieldbook", tf, "-o", book); code != 0 {
		t.Fatal(stderr)
	}
	empty, _ := os.ReadFile(book)
	code, out, stderr := run(t, "import", tf, book)
	if code != 0 || !strings.Contains(out, "Nothing to import") || strings.Contains(out, "Ready to import") || !strings.Contains(out, "left as it was") {
		t.Errorf("unfilled book: exit %d\n%s\n%s", code, out, stderr)
	}
	lines := strings.Split(strings.TrimRight(strings.ReplaceAll(string(empty), "\r\n", "\n"), "\n"), "\n")
	filled := []string{lines[0]}
	for i, l := range lines[1:] {
		v := itoa(10 + i)
		if i == 0 {
			v = "NA"
		}
		filled = append(filled, l+v)
	}
	cr := filepath.Join(dir, "cr.csv")
	os.WriteFile(cr, []byte(strings.Join(filled, "\r")+"\r"), 0o644)
	code, out, stderr = run(t, "import", tf, cr, "--dry-run")
	if code != 0 || !strings.Contains(out, "5 values to import") || strings.Contains(out, "warning") {
		t.Errorf("CR-only book: exit %d\n%s\n%s", code, out, stderr)
	}
	filled[2] = strings.TrimSuffix(filled[2], "11") + `"8,490"`
	amb := filepath.Join(dir, "amb.csv")
	os.WriteFile(amb, []byte(strings.Join(filled, "\n")+"\n"), 0o644)
	code, out, _ = run(t, "import", tf, amb)
	if code != ExitFailure || !strings.Contains(out, "error: line 3") || !strings.Contains(out, "“8,490” has a comma, which is ambiguous") {
		t.Errorf("ambiguous comma: exit %d\n%s", code, out)
	}
	code, out, stderr = run(t, "import", tf, amb, "--decimal-comma", "--dry-run")
	if code != 0 || strings.Contains(out, "error") {
		t.Errorf("--decimal-comma: exit %d\n%s\n%s", code, out, stderr)
	}
}
