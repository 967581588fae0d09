package cli

import (
	"errors"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"furlong/trial"
	"furlong/trial/trialfile"
)

func TestExitCodes(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	cases := []struct {
		args []string
		code int
		in   string // expected in stderr
	}{
		{[]string{"nosuch"}, ExitUsage, `there is no command "nosuch"`},
		{[]string{"new", "--design", "rcbd"}, ExitUsage, "-o FILE"},
		{[]string{"new", "-o", filepath.Join(dir, "x.furlong"), "--design", "split", "--treatments", "3", "--reps", "2"}, ExitUsage, "crd, rcbd, latin, split-plot or strip-plot"},
		{[]string{"new", "-o", filepath.Join(dir, "x.furlong"), "--treatments", "4"}, ExitUsage, "--reps"},
		{[]string{"new", "--bogus"}, ExitUsage, "bogus"},
		{[]string{"show", filepath.Join(dir, "missing.furlong")}, ExitFailure, "cannot find"},
		{[]string{"analyze", "x.csv", "--format", "xml"}, ExitUsage, "text, json or csv"},
		{[]string{"show"}, ExitUsage, "one trial file"},
		// Flag values the flag package cannot parse are told in plain words.
		{[]string{"new", "-o", filepath.Join(dir, "x.furlong"), "--treatments", "3", "--reps", "2", "--plot-length", "abc"}, ExitUsage, `--plot-length must be a number, not "abc"`},
		{[]string{"new", "--bogus"}, ExitUsage, "there is no flag --bogus"},
		{[]string{"analyze", "x.csv", "--alpha"}, ExitUsage, "--alpha needs a value"},
		{[]string{"new", "-o", filepath.Join(dir, "nofolder", "x.furlong"), "--treatments", "3", "--reps", "2", "--seed", "1"}, ExitFailure, "cannot find the folder " + filepath.Join(dir, "nofolder")},
	}
	for _, c := range cases {
		code, _, stderr := run(t, c.args...)
		if code != c.code {
			t.Errorf("%v: exit %d, want %d (%s)", c.args, code, c.code, stderr)
		}
		if !strings.Contains(stderr, c.in) {
			t.Errorf("%v: stderr %q does not say %q", c.args, stderr, c.in)
		}
		if strings.Contains(stderr, "goroutine") || strings.Contains(stderr, ".go:") || strings.Contains(stderr, "parse error") || strings.Contains(stderr, ".saving-") {
			t.Errorf("%v: stderr shows Go internals: %s", c.args, stderr)
		}
	}
}

func TestHelpCoversEveryCommand(t *testing.T) {
	t.Parallel()
	code, out, _ := run(t, "--help")
	if code != 0 {
		t.Fatalf("--help exit %d", code)
	}
	for name := range commands {
		if !strings.Contains(out, "  "+name+" ") {
			t.Errorf("--help does not list %s", name)
		}
		code, h, _ := run(t, "help", name)
		if code != 0 || !strings.Contains(h, "Usage:") {
			t.Errorf("help %s: exit %d, %q", name, code, h)
		}
	}
}

func TestNewLatinSquareTakesRepsFromTreatments(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "ls.furlong")
	code, out, stderr := run(t, "new", "-o", path, "--design", "latin", "--treatments", "A,B,C,D,E", "--seed", "7", "--traits", "yield:t/ha")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if !strings.Contains(out, "seed 7") {
		t.Errorf("output does not report the seed: %q", out)
	}
	tr, err := trialfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	if tr.Design.Reps != 5 || len(tr.Plots) != 25 {
		t.Fatalf("reps %d, plots %d; want 5 and 25", tr.Design.Reps, len(tr.Plots))
	}
	// A Latin square: each treatment once in every field row and column
	// (the definition; Gomez & Gomez 1984, sec. 2.3).
	rows, cols := map[[2]any]int{}, map[[2]any]int{}
	for _, p := range tr.Plots {
		rows[[2]any{p.Row, p.Treatment}]++
		cols[[2]any{p.Column, p.Treatment}]++
	}
	for k, n := range rows {
		if n != 1 {
			t.Errorf("row/treatment %v occurs %d times", k, n)
		}
	}
	for k, n := range cols {
		if n != 1 {
			t.Errorf("column/treatment %v occurs %d times", k, n)
		}
	}
	// The same seed gives the same layout.
	path2 := filepath.Join(t.TempDir(), "ls2.furlong")
	run(t, "new", "-o", path2, "--design", "latin", "--treatments", "A,B,C,D,E", "--seed", "7", "--traits", "yield:t/ha")
	tr2, err := trialfile.Load(path2)
	if err != nil {
		t.Fatal(err)
	}
	for i := range tr.Plots {
		if a, b := tr.Plots[i], tr2.Plots[i]; a.Number != b.Number || a.Treatment != b.Treatment || a.Row != b.Row || a.Column != b.Column {
			t.Fatalf("plot %d differs between two runs with seed 7", i)
		}
	}
}

// TestFieldBookRoundTrip walks the foundation flow: create and randomise a
// trial, write its field book, fill it in as a crew would, import it.
func TestFieldBookRoundTrip(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	tf := filepath.Join(dir, "t.furlong")
	code, _, stderr := run(t, "new", "-o", tf, "--design", "rcbd", "--treatments", "CHK*=Standard,L1=Line one,L2,L3", "--reps", "3",
		"--seed", "42", "--traits", "wt:kg,mst:%", "--crop", "maize", "--yield-from", "wt,mst", "--title", "Round trip")
	if code != 0 {
		t.Fatalf("new: exit %d: %s", code, stderr)
	}
	book := filepath.Join(dir, "book.csv")
	if code, _, stderr := run(t, "fieldbook", tf, "-o", book); code != 0 {
		t.Fatalf("fieldbook: exit %d: %s", code, stderr)
	}
	raw, err := os.ReadFile(book)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(raw)), "\n")
	if lines[0] != "plot,block,row,column,treatment,treatment_name,wt,mst" {
		t.Fatalf("header %q", lines[0])
	}
	if len(lines) != 13 {
		t.Fatalf("%d lines, want header + 12 plots", len(lines))
	}
	// Fill the book with semicolons and decimal commas, as a spreadsheet in
	// a German or French locale saves it (common practice).
	var filled []string
	filled = append(filled, strings.ReplaceAll(lines[0], ",", ";"))
	for i, l := range lines[1:] {
		cells := strings.Split(l, ",")
		cells[6] = strings.Replace(formatG(8+float64(i)/4), ".", ",", 1)
		cells[7] = strings.Replace(formatG(14+float64(i%3)/2), ".", ",", 1)
		filled = append(filled, strings.Join(cells, ";"))
	}
	if err := os.WriteFile(book, []byte(strings.Join(filled, "\r\n")+"\r\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, stderr := run(t, "import", tf, book)
	if code != 0 {
		t.Fatalf("import: exit %d\n%s\n%s", code, out, stderr)
	}
	tr, err := trialfile.Load(tf)
	if err != nil {
		t.Fatal(err)
	}
	wt, _ := tr.TraitValues("wt")
	y, _ := tr.TraitValues("yield")
	for i := range tr.Plots {
		if want := 8 + float64(i)/4; wt[i] != want {
			t.Errorf("plot %d wt = %v, want %v", tr.Plots[i].Number, wt[i], want)
		}
		if math.IsNaN(y[i]) {
			t.Errorf("plot %d has no derived yield", tr.Plots[i].Number)
		}
	}
	if _, err := os.Stat(tf + ".bak"); err != nil {
		t.Errorf("no backup of the previous file: %v", err)
	}
	// A second import with a changed value is refused without --overwrite
	// and changes nothing.
	filled[1] = strings.Replace(filled[1], strings.Split(filled[1], ";")[6], "99", 1)
	os.WriteFile(book, []byte(strings.Join(filled, "\n")), 0o644)
	before, _ := os.ReadFile(tf)
	code, out, _ = run(t, "import", tf, book)
	if code != ExitFailure {
		t.Fatalf("conflicting import: exit %d, want 1\n%s", code, out)
	}
	after, _ := os.ReadFile(tf)
	if string(before) != string(after) {
		t.Fatal("a refused import changed the trial file")
	}
	code, _, stderr = run(t, "import", tf, book, "--overwrite")
	if code != 0 {
		t.Fatalf("--overwrite import: exit %d: %s", code, stderr)
	}
	tr, _ = trialfile.Load(tf)
	if v := tr.Traits[tr.TraitIndex("wt")].Values[0]; v != 99 {
		t.Errorf("overwritten value = %v, want 99 (out of the 0–∞ range? no: wt has no range)", v)
	}

	// show and analyze work on the filled trial.
	if code, out, _ := run(t, "show", tf); code != 0 || !strings.Contains(out, "Round trip") || !strings.Contains(out, "Block 3") {
		t.Errorf("show: exit %d\n%s", code, out)
	}
	if code, out, stderr := run(t, "analyze", tf, "--trait", "yield"); code != 0 || !strings.Contains(out, "treatment") {
		t.Errorf("analyze: exit %d\n%s\n%s", code, out, stderr)
	}
}

func TestImportReportsBadCells(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	tf := filepath.Join(dir, "t.furlong")
	if code, _, stderr := run(t, "new", "-o", tf, "--treatments", "3", "--reps", "2", "--seed", "1", "--traits", "ht:cm"); code != 0 {
		t.Fatal(stderr)
	}
	tr, _ := trialfile.Load(tf)
	p0, p1 := tr.Plots[0].Number, tr.Plots[1].Number
	book := filepath.Join(dir, "bad.csv")
	content := "plot,ht\n" +
		itoa(p0) + ",12x\n" + // not a number
		"999,5\n" + // unknown plot
		itoa(p1) + ",4\n" + itoa(p1) + ",5\n" // duplicated row
	os.WriteFile(book, []byte(content), 0o644)
	before, _ := os.ReadFile(tf)
	code, out, stderr := run(t, "import", tf, book)
	if code != ExitFailure {
		t.Fatalf("exit %d, want 1", code)
	}
	for _, want := range []string{"12x", "999", itoa(p1)} {
		if !strings.Contains(out, want) {
			t.Errorf("report does not mention %q:\n%s", want, out)
		}
	}
	if !strings.Contains(stderr, "nothing was imported") {
		t.Errorf("stderr %q", stderr)
	}
	after, _ := os.ReadFile(tf)
	if string(before) != string(after) {
		t.Fatal("a refused import changed the trial file")
	}
	_ = trial.Missing
}

func formatG(v float64) string { return strings.TrimRight(strings.TrimRight(ftoa(v), "0"), ".") }

func ftoa(v float64) string { return strconvFormat(v) }

func TestWindowArgsCatchMistypedCommands(t *testing.T) {
	t.Parallel()
	var ue *UsageError
	if _, err := ParseWindowArgs([]string{"anlyze"}); !errors.As(err, &ue) || !strings.Contains(err.Error(), `there is no command "anlyze"`) {
		t.Errorf("a mistyped command: %v", err)
	}
	missing := filepath.Join(t.TempDir(), "gone.furlong")
	if _, err := ParseWindowArgs([]string{missing}); err == nil || !strings.Contains(err.Error(), "cannot find "+missing) {
		t.Errorf("a missing trial file: %v", err)
	}
	if _, err := ParseWindowArgs([]string{"--demo-series", "--demo"}); !errors.As(err, &ue) {
		t.Errorf("--demo-series with --demo: %v", err)
	}
}

// The window opens a series file as a series (by its ending) and the demo
// series on --demo-series (the README's contract). The display check may
// refuse without one; the choice is made before it.
func TestWindowArgsSeries(t *testing.T) {
	t.Setenv("DISPLAY", ":99")
	path := filepath.Join(t.TempDir(), "wheat.furlong-series")
	if err := os.WriteFile(path, []byte("{}"), 0o644); err != nil {
		t.Fatal(err)
	}
	o, err := ParseWindowArgs([]string{path})
	if err != nil || !o.Series || o.Path != path || o.Demo || o.DemoSeries {
		t.Errorf("a series file: %+v, %v", o, err)
	}
	o, err = ParseWindowArgs([]string{"--demo-series"})
	if err != nil || !o.DemoSeries || o.Series || o.Path != "" {
		t.Errorf("--demo-series: %+v, %v", o, err)
	}
	o, err = ParseWindowArgs([]string{"--demo"})
	if err != nil || !o.Demo || o.DemoSeries || o.Series {
		t.Errorf("--demo: %+v, %v", o, err)
	}
}

// TestShowMapReadsLikeTheField checks that stacked blocks are printed top
// of the field first, so that field row 1 ends up at the bottom of the text
// as the header says (common practice for field maps), and that column
// labels fit their cells.
func TestShowMapReadsLikeTheField(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "s.furlong")
	if code, _, stderr := run(t, "new", "-o", path, "--design", "rcbd", "--treatments", "3", "--reps", "3", "--seed", "5", "--blocks", "stacked"); code != 0 {
		t.Fatal(stderr)
	}
	_, out, _ := run(t, "show", path)
	b3, b1 := strings.Index(out, "Block 3"), strings.Index(out, "Block 1")
	if b3 < 0 || b1 < 0 || b3 > b1 {
		t.Errorf("block 3 (top of the field) must be printed before block 1:\n%s", out)
	}
	for _, l := range strings.Split(out, "\n") {
		if strings.HasSuffix(l, " ") {
			t.Errorf("line ends in blanks: %q", l)
		}
	}
	lat := filepath.Join(dir, "l.furlong")
	if code, _, stderr := run(t, "new", "-o", lat, "--design", "latin", "--treatments", "A,B,C,D", "--numbering", "sequential", "--seed", "5"); code != 0 {
		t.Fatal(stderr)
	}
	_, out, _ = run(t, "show", lat)
	if !strings.Contains(out, "16 in 4 rows × 4 columns") {
		t.Errorf("Latin square plots line:\n%s", out)
	}
	// Every grid line and the column labels start their cells at the same
	// places: "| " before each cell, two blanks between labels.
	var grid, cols string
	for _, l := range strings.Split(out, "\n") {
		if strings.HasPrefix(l, "  row   1 |") {
			grid = l
		}
		if strings.Contains(l, "col 1") {
			cols = l
		}
	}
	for c := 1; c <= 4; c++ {
		label := "col " + itoa(c)
		i := strings.Index(cols, label)
		if i < 2 || i > len(grid) || grid[i-2:i] != "| " {
			t.Errorf("column label %q not under its cell:\n%s\n%s", label, grid, cols)
		}
	}
}
