package fieldbook

import (
	"bytes"
	"encoding/binary"
	"math"
	"strings"
	"testing"
	"unicode/utf16"

	"furlong/trial"
	"furlong/trial/trialfile"
)

func TestRows(t *testing.T) {
	t.Parallel()
	tr, printed := barley(t)
	rows := Rows(tr)
	want := "plot,block,row,column,treatment,treatment_name,yield,spikes,cover"
	if got := strings.Join(rows[0], ","); got != want {
		t.Fatalf("header %s, want %s (the derived trait is not a column)", got, want)
	}
	if len(rows) != len(tr.Plots)+1 {
		t.Fatalf("%d rows", len(rows))
	}
	if got := strings.Join(rows[1][:6], ","); got != "101,1,1,1,V01,Glabron" {
		t.Errorf("first row %s", got)
	}
	// The yields are written with exactly the digits the dataset prints
	// (Immer et al. 1934 via R), NA as an empty cell.
	for i, p := range printed {
		if rows[i+1][6] != p {
			t.Errorf("plot %s: wrote %q, dataset prints %q", rows[i+1][0], rows[i+1][6], p)
		}
	}
	if rows[11][8] != "1e-07" {
		t.Errorf("1e-7 written as %q", rows[11][8])
	}
}

// WriteCSV → ReadTable → Plan → Apply reproduces every value bit for bit,
// whatever the CSV dialect.
func TestRoundTrip(t *testing.T) {
	t.Parallel()
	orig, _ := barley(t)
	for _, opts := range []Options{
		{},
		{Comma: ';', DecimalComma: true, CRLF: true, BOM: true},
		{Comma: '\t', CRLF: true},
		{Comma: ',', DecimalComma: true},
	} {
		var buf bytes.Buffer
		if err := WriteCSV(&buf, orig, opts); err != nil {
			t.Fatal(err)
		}
		table, err := ReadTable(&buf)
		if err != nil {
			t.Fatalf("%+v: %v", opts, err)
		}
		target := cleared(orig)
		plan, err := Plan(target, table)
		if err != nil {
			t.Fatal(err)
		}
		if plan.HasErrors(false) {
			var r strings.Builder
			plan.Report(&r)
			t.Fatalf("%+v: errors:\n%s", opts, r.String())
		}
		n, err := plan.Apply(target, false)
		if err != nil {
			t.Fatal(err)
		}
		if d := sameValues(orig, target); d != "" {
			t.Errorf("%+v: %s", opts, d)
		}
		// 58 yields + 59 counts + 59 percentages are present.
		if n != 58+59+59 {
			t.Errorf("%+v: %d values set", opts, n)
		}
		// Importing the same book again changes nothing and conflicts with nothing.
		again, _ := Plan(target, table)
		if len(again.Changes()) != 0 || len(again.Conflicts()) != 0 {
			t.Errorf("%+v: second import plans %d changes", opts, len(again.Changes()))
		}
		// The imported trial can be saved (the kind rules agree with the
		// trial file's).
		if err := trialfile.Encode(&bytes.Buffer{}, target); err != nil {
			t.Errorf("imported trial cannot be saved: %v", err)
		}
	}
}

// Files as spreadsheets write them in German and French locales: semicolon
// separators and decimal commas, CRLF line ends, a BOM in the "UTF-8 CSV"
// variant; tab-separated text; UTF-16LE "Unicode text" with a BOM (common
// practice).
func TestLocaleFiles(t *testing.T) {
	t.Parallel()
	tr := smallTrial()
	files := map[string][]byte{
		"german excel utf-8": []byte("\ufeffplot;block;row;column;treatment;treatment_name;ht;n\r\n1;1;1;1;A;Alpha;12,5;3\r\n2;1;1;2;B;Beta;13;4\r\n3;2;2;1;B;Beta;;\r\n4;2;2;2;A;Alpha;0,125;10\r\n;;;;;;;\r\n"),
		"french libreoffice": []byte("plot;treatment;HT (cm);n\n1;A;\"12,5\";3\n2;B;13;4\n4;A;0,125;10\n"),
		"tab":                []byte("plot\ttreatment\tht\tn\r\n1\tA\t12.5\t3\r\n2\tB\t13\t4\r\n4\tA\t0.125\t10\r\n"),
		"excel sep hint":     []byte("sep=;\r\nplot;ht;n\r\n1;12,5;3\r\n2;13;4\r\n4;0,125;10\r\n"),
		"comma quoted dec":   []byte("plot,ht,n\n1,\"12,5\",3\n2,13,4\n4,\"0,125\",10\n"),
		"utf-16le unicode":   utf16LE("plot\tht\tn\r\n1\t12,5\t3\r\n2\t13\t4\r\n4\t0,125\t10\r\n"),
	}
	for name, data := range files {
		table, err := ReadTable(bytes.NewReader(data))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		target := clone(tr)
		plan, err := Plan(target, table)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if plan.HasErrors(false) || len(plan.Warnings()) != 0 {
			var r strings.Builder
			plan.Report(&r)
			t.Fatalf("%s:\n%s", name, r.String())
		}
		if _, err := plan.Apply(target, false); err != nil {
			t.Fatal(err)
		}
		ht, n := target.Traits[0].Values, target.Traits[1].Values
		if ht[0] != 12.5 || ht[1] != 13 || ht[2] != 20 || ht[3] != 0.125 || n[0] != 3 || n[3] != 10 {
			t.Errorf("%s: ht %v n %v", name, ht, n)
		}
	}
}

func utf16LE(s string) []byte {
	b := []byte{0xFF, 0xFE}
	for _, u := range utf16.Encode([]rune(s)) {
		b = binary.LittleEndian.AppendUint16(b, u)
	}
	return b
}

// smallTrial: four plots, treatments A and B, traits ht (cm, 0–50,
// continuous), n (count), pc (percent, valid 0–40), all values missing
// except ht of plot 3 (= 20), and a derived trait.
func smallTrial() *trial.Trial {
	nan := trial.Missing
	return &trial.Trial{
		Treatments: []trial.Treatment{{Code: "A", Name: "Alpha"}, {Code: "B", Name: "Beta"}},
		Plots: []trial.Plot{
			{Number: 1, Block: 1, Row: 1, Column: 1, Treatment: "A"},
			{Number: 2, Block: 1, Row: 1, Column: 2, Treatment: "B"},
			{Number: 3, Block: 2, Row: 2, Column: 1, Treatment: "B"},
			{Number: 4, Block: 2, Row: 2, Column: 2, Treatment: "A"},
		},
		Traits: []trial.Trait{
			{Key: "ht", Kind: trial.Continuous, Min: fp(0), Max: fp(50), Values: []float64{nan, nan, 20, nan}},
			{Key: "n", Kind: trial.Count, Values: []float64{nan, nan, nan, nan}},
			{Key: "pc", Kind: trial.Percent, Min: fp(0), Max: fp(40), Values: []float64{nan, nan, nan, nan}},
			{Key: "adj", Derived: &trial.Derivation{Kind: trial.AdjustedYield}},
		},
	}
}

// Every kind of bad cell: the right report line, and Apply changes nothing.
func TestBadCells(t *testing.T) {
	t.Parallel()
	const header = "plot,block,row,column,treatment,ht,n,pc\n"
	cases := []struct {
		name, body string
		sev        Severity
		line, plot int
		trait      string
		old, new   float64 // NaN: missing / not applicable
		text       string  // expected in the rendered line
		blocks     bool    // HasErrors(true)
	}{
		{"not a number", "1,,,,,abc,,\n", Error, 2, 1, "ht", nan, nan, `error: line 2, plot 1, ht: “abc” is not a number`, true},
		{"hexadecimal", "1,,,,,0x1p3,,\n", Error, 2, 1, "ht", nan, nan, `“0x1p3” is not a number`, true},
		// NA, N/A and "." mark a missing value (common practice): like an empty cell, they keep the stored value.
		{"NA word", "3,,,,,NA,,\n", Info, 2, 3, "ht", 20, nan, `note: line 2, plot 3, ht: the cell is empty; the stored value 20 is kept`, false},
		{"N/A word", "3,,,,,N/A,,\n", Info, 2, 3, "ht", 20, nan, `the stored value 20 is kept`, false},
		{"dot", "3,,,,,.,,\n", Info, 2, 3, "ht", 20, nan, `the stored value 20 is kept`, false},
		{"thousands separator", "1,,,,,\"1.234,5\",,\n", Error, 2, 1, "ht", nan, nan, `“1.234,5” has a comma, which is ambiguous in a comma-separated file`, true},
		// RFC 4180 allows the separator inside a quoted cell; in a comma-separated file "8,490" may be 8.49 or 8490.
		{"quoted comma", "1,,,,,\"8,490\",,\n", Error, 2, 1, "ht", nan, nan, `error: line 2, plot 1, ht: “8,490” has a comma, which is ambiguous`, true},
		{"fractional count", "1,,,,,,2.5,\n", Error, 2, 1, "n", nan, 2.5, `error: line 2, plot 1, n: 2.5 is not a count`, true},
		{"negative count", "2,,,,,,-3,\n", Error, 2, 2, "n", nan, -3, `-3 is not a count`, true},
		{"percent above 100", "1,,,,,,,120\n", Error, 2, 1, "pc", nan, 120, `120 is not a percentage`, true},
		{"unknown plot", "1,,,,,1,,\n999,,,,,1,,\n", Error, 3, 999, "", nan, nan, `error: line 3, plot 999: the trial has no plot with this number`, true},
		{"duplicate plot", "2,,,,,1,,\n1,,,,,1,,\n2,,,,,1,,\n", Error, 4, 2, "", nan, nan, `error: line 4, plot 2: this plot is also on line 2`, true},
		{"treatment mismatch", "1,,,,B,1,,\n", Error, 2, 1, "", nan, nan, `the book gives treatment "B" but the trial has "A"`, true},
		{"split decimal comma", "1,,,,,12,5,3,7\n", Error, 2, 0, "", nan, nan, `error: line 2: the row has 9 cells but the header has 8`, true},
		{"no plot number", ",,,,,1,,\n", Error, 2, 0, "", nan, nan, `error: line 2, column "plot": the row has no plot number`, true},
		{"bad plot number", "1.5,,,,,1,,\n", Error, 2, 0, "", nan, nan, `"1.5" is not a plot number`, true},
		{"conflict", "3,,,,,21,,\n", Conflict, 2, 3, "ht", 20, 21, `conflict: line 2, plot 3, ht: 21 would replace the stored value 20`, false},
		{"above range", "1,,,,,55,,\n", Warning, 2, 1, "ht", nan, 55, `warning: line 2, plot 1, ht: 55 is above the valid maximum 50; it is imported`, false},
		{"below range", "1,,,,,-1,,\n", Warning, 2, 1, "ht", nan, -1, `-1 is below the valid minimum 0`, false},
		{"percent out of valid range", "1,,,,,,,45\n", Warning, 2, 1, "pc", nan, 45, `45 is above the valid maximum 40`, false},
		{"empty keeps", "3,,,,,,,\n", Info, 2, 3, "ht", 20, nan, `note: line 2, plot 3, ht: the cell is empty; the stored value 20 is kept`, false},
		{"missing plot", "1,,,,,1,,\n", Info, 0, 4, "", nan, nan, `note: plot 4: not in the field book; its values are left as they are`, false},
		// Spreadsheets write empty cells past the last column: they are ignored.
		{"trailing empty cells", "1,,,,,12.5,,,,,\n", Info, 0, 4, "", nan, nan, `note: plot 4: not in the field book`, false},
		{"block mismatch", "1,2,,,,1,,\n", Warning, 2, 1, "", nan, nan, `the book gives block "2" but the trial has 1`, false},
	}
	for _, c := range cases {
		tr := smallTrial()
		before := clone(tr)
		book, err := ReadBook(strings.NewReader(header+c.body), ReadOptions{})
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		plan, err := PlanBook(tr, book)
		if err != nil {
			t.Fatalf("%s: %v", c.name, err)
		}
		var found *Issue
		for _, is := range plan.Issues() {
			if is.Severity == c.sev && strings.Contains(is.String(), c.text) {
				found = &is
				break
			}
		}
		var report strings.Builder
		plan.Report(&report)
		if found == nil {
			t.Errorf("%s: no %v issue with %q in\n%s", c.name, c.sev, c.text, report.String())
			continue
		}
		if found.Line != c.line || found.Plot != c.plot || found.Trait != c.trait || !same(found.Old, c.old) || !same(found.New, c.new) {
			t.Errorf("%s: issue %+v", c.name, *found)
		}
		if !strings.Contains(report.String(), found.String()+"\n") || strings.Contains(report.String(), "NaN") {
			t.Errorf("%s: report lacks the line or shows NaN:\n%s", c.name, report.String())
		}
		if plan.HasErrors(true) != c.blocks {
			t.Errorf("%s: HasErrors(true) = %v", c.name, !c.blocks)
		}
		if c.sev == Error || c.sev == Conflict {
			if _, err := plan.Apply(tr, false); err == nil {
				t.Errorf("%s: Apply did not refuse", c.name)
			}
			if d := sameValues(before, tr); d != "" {
				t.Errorf("%s: a refused Apply changed the trial: %s", c.name, d)
			}
		}
		if c.sev == Error {
			if _, err := plan.Apply(tr, true); err == nil {
				t.Errorf("%s: Apply with overwrite did not refuse", c.name)
			}
			if d := sameValues(before, tr); d != "" {
				t.Errorf("%s: a refused Apply changed the trial: %s", c.name, d)
			}
		}
	}
}

var nan = math.NaN()

func same(a, b float64) bool { return a == b || (math.IsNaN(a) && math.IsNaN(b)) }

func TestOverwrite(t *testing.T) {
	t.Parallel()
	tr := smallTrial()
	table, _ := ReadTable(strings.NewReader("plot,ht,n\n3,21,\n1,7,2\n"))
	plan, _ := Plan(tr, table)
	if !plan.HasErrors(false) || plan.HasErrors(true) || len(plan.Conflicts()) != 1 || len(plan.Errors()) != 0 {
		t.Fatalf("conflicts %v errors %v", plan.Conflicts(), plan.Errors())
	}
	// The report's closing line says what happens with and without
	// overwriting allowed.
	var refused, allowed strings.Builder
	plan.WriteReport(&refused, false)
	plan.WriteReport(&allowed, true)
	if !strings.Contains(refused.String(), "Nothing is imported unless overwriting is allowed: 1 stored value would be replaced.") {
		t.Errorf("report without overwriting:\n%s", refused.String())
	}
	if !strings.Contains(allowed.String(), "Ready to import; 1 stored value will be replaced.") || strings.Contains(allowed.String(), "Nothing") {
		t.Errorf("report with overwriting:\n%s", allowed.String())
	}
	ch := plan.Changes()
	if len(ch) != 3 || !ch[0].Overwrite || ch[0].Old != 20 || ch[0].New != 21 || ch[1].Overwrite {
		t.Fatalf("changes %+v", ch)
	}
	n, err := plan.Apply(tr, true)
	if err != nil || n != 3 || tr.Traits[0].Values[2] != 21 || tr.Traits[0].Values[0] != 7 || tr.Traits[1].Values[0] != 2 {
		t.Fatalf("Apply: %d, %v, %v", n, err, tr.Traits[0].Values)
	}
	// The plan is stale now: applying it again is refused.
	if _, err := plan.Apply(tr, true); err == nil {
		t.Error("a stale plan was applied")
	}
}

// TestPartialBookOneNote: a book that covers few plots gets one note for
// the plots it leaves out, not one line per plot.
func TestPartialBookOneNote(t *testing.T) {
	t.Parallel()
	tr := &trial.Trial{Treatments: []trial.Treatment{{Code: "A"}, {Code: "B"}}}
	for i := 1; i <= 10; i++ {
		tr.Plots = append(tr.Plots, trial.Plot{Number: i, Block: 1, Row: 1, Column: i, Treatment: "A"})
	}
	tr.Traits = []trial.Trait{{Key: "ht", Name: "ht", Kind: trial.Continuous, Values: make([]float64, 10)}}
	for i := range tr.Traits[0].Values {
		tr.Traits[0].Values[i] = math.NaN()
	}
	table, _ := ReadTable(strings.NewReader("plot,ht\n1,5\n"))
	plan, err := Plan(tr, table)
	if err != nil {
		t.Fatal(err)
	}
	notes := plan.Notes()
	if len(notes) != 1 || !strings.Contains(notes[0].String(), "9 plots are not in the field book (2, 3, 4, 5, 6, ...)") {
		t.Errorf("notes %v", notes)
	}
}

func TestHeaderMatching(t *testing.T) {
	t.Parallel()
	tr := smallTrial()
	table, _ := ReadTable(strings.NewReader("Plot,HT (cm) 0-50,n per plot,pcx,adj,Notes,\n1,5,6,7,8,x,\n"))
	plan, err := Plan(tr, table)
	if err != nil {
		t.Fatal(err)
	}
	ch := plan.Changes()
	if len(ch) != 2 || ch[0].Trait != "ht" || ch[0].New != 5 || ch[1].Trait != "n" || ch[1].New != 6 {
		t.Errorf("changes %+v", ch)
	}
	var warned []string
	for _, w := range plan.Warnings() {
		warned = append(warned, w.Column)
	}
	if strings.Join(warned, "|") != "pcx|adj|Notes" {
		t.Errorf("warnings for %v", warned)
	}
	if _, err := Plan(tr, [][]string{{"plotnumber", "ht"}, {"1", "2"}}); err == nil {
		t.Error("a book without a plot column was accepted")
	}
	if _, err := Plan(tr, [][]string{nil, {""}}); err == nil {
		t.Error("an empty book was accepted")
	}
	p, _ := Plan(tr, [][]string{{"plot", "ht", "HT"}, {"1", "2", "3"}})
	if len(p.Errors()) != 1 {
		t.Errorf("two columns for one trait: %v", p.Issues())
	}
}

func TestReadTable(t *testing.T) {
	t.Parallel()
	// RFC 4180 §2: quoted fields may hold separators, doubled quotes and
	// line breaks. Line numbers follow the file.
	in := "plot,note,ht\r\n1,\"a, \"\"b\"\"\nc\",2\r\n\r\n3,x,4\r\n"
	table, err := ReadTable(strings.NewReader(in))
	if err != nil {
		t.Fatal(err)
	}
	if len(table) != 5 || table[1][1] != "a, \"b\"\nc" || table[4][0] != "3" || table[2] != nil || table[3] != nil {
		t.Fatalf("table %q", table)
	}
	for _, bad := range []string{"plot,ht\n1,\"2\n", "plot,ht\n1,2\"3\n"} {
		if _, err := ReadTable(strings.NewReader(bad)); err == nil || !strings.Contains(err.Error(), "line 2") {
			t.Errorf("%q: %v", bad, err)
		}
	}
}
