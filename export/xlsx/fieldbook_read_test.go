package xlsx

import (
	"bytes"
	"math"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"furlong/trial"
	"furlong/trial/fieldbook"
)

// A workbook as a spreadsheet program leaves it after the crew typed the
// values, built with excelize: number formats by their built-in ids
// (ECMA-376 Part 1, §18.8.30: 9 = 0%, 10 = 0.00%, 14 = a date), a custom
// percentage format, a true/false cell, a date, and a formula whose result
// was never calculated.
func TestReadBookReadsWhatTheCellShows(t *testing.T) {
	t.Parallel()
	f := excelize.NewFile()
	const sh = "Plots"
	if err := f.SetSheetName("Sheet1", sh); err != nil {
		t.Fatal(err)
	}
	f.NewSheet("Notes")
	style := func(s *excelize.Style) int {
		id, err := f.NewStyle(s)
		if err != nil {
			t.Fatal(err)
		}
		return id
	}
	pct2 := style(&excelize.Style{NumFmt: 10})
	pct0 := style(&excelize.Style{NumFmt: 9})
	custom := "0.0%"
	pctCustom := style(&excelize.Style{CustomNumFmt: &custom})
	date := style(&excelize.Style{NumFmt: 14})
	dec := style(&excelize.Style{NumFmt: 2})
	for i, h := range []string{"plot", "treatment", "moist", "ht"} {
		cell, _ := excelize.CoordinatesToCellName(i+1, 1)
		f.SetCellStr(sh, cell, h)
	}
	set := func(cell string, v any, style int) {
		t.Helper()
		if err := f.SetCellValue(sh, cell, v); err != nil {
			t.Fatal(err)
		}
		if style > 0 {
			if err := f.SetCellStyle(sh, cell, cell, style); err != nil {
				t.Fatal(err)
			}
		}
	}
	set("A2", 1, 0)
	set("C2", 0.154, pct2) // shown 15.40%
	set("D2", 21.25, dec)
	set("A3", 2, 0)
	set("C3", 0.2, pct0) // shown 20%
	set("D3", true, 0)
	set("A4", 3, 0)
	set("C4", 0.1234, pctCustom) // shown 12.3%; read at full precision 12.34
	set("D4", time.Date(2026, 7, 14, 0, 0, 0, 0, time.UTC), 0)
	set("A5", 4, 0)
	set("C5", 46217.0, date) // a serial number formatted as a date
	if err := f.SetCellFormula(sh, "D5", "C5*2"); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	b, err := ReadBook(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if got := b.Rows[1][2]; got != "15.4" {
		t.Errorf("C2 (0.154 shown as a percentage) read as %q, want 15.4", got)
	}
	if got := b.Rows[2][2]; got != "20" {
		t.Errorf("C3 read as %q, want 20", got)
	}
	if got := b.Rows[3][2]; got != "12.34" {
		t.Errorf("C4 read as %q, want 12.34", got)
	}
	if got := b.Rows[1][3]; got != "21.25" {
		t.Errorf("D2 read as %q, want 21.25", got)
	}
	want := map[string]string{
		"D3": "sheet Plots, cell D3 holds TRUE",
		"D4": "sheet Plots, cell D4 holds a date",
		"C5": "sheet Plots, cell C5 holds a date",
		"D5": "sheet Plots, cell D5 holds the formula =C5*2, whose result was never saved",
	}
	got := map[string]string{}
	for _, p := range b.Problems {
		ref, _ := excelize.CoordinatesToCellName(p.Column+1, p.Line)
		got[ref] = p.Msg
	}
	for ref, msg := range want {
		if !strings.Contains(got[ref], msg) {
			t.Errorf("cell %s: problem %q, want %q", ref, got[ref], msg)
		}
	}
	if len(got) != len(want) {
		t.Errorf("problems %v, want only %v", got, want)
	}
	if len(b.Notes) != 1 || !strings.Contains(b.Notes[0], `read sheet "Plots"`) || !strings.Contains(b.Notes[0], `"Notes"`) || !strings.Contains(b.Notes[0], "ignored") {
		t.Errorf("notes %q", b.Notes)
	}

	// Through the import: the percentage is imported as shown, the problem
	// cells are errors naming the cell, and nothing is imported.
	nan := math.NaN()
	tr := &trial.Trial{
		Treatments: []trial.Treatment{{Code: "A"}, {Code: "B"}},
		Design:     trial.Design{Kind: trial.CRD},
		Plots: []trial.Plot{
			{Number: 1, Row: 1, Column: 1, Treatment: "A"}, {Number: 2, Row: 1, Column: 2, Treatment: "B"},
			{Number: 3, Row: 2, Column: 1, Treatment: "B"}, {Number: 4, Row: 2, Column: 2, Treatment: "A"},
		},
		Traits: []trial.Trait{
			{Key: "moist", Kind: trial.Percent, Values: []float64{nan, nan, nan, nan}},
			{Key: "ht", Kind: trial.Continuous, Values: []float64{nan, nan, nan, nan}},
		},
	}
	plan, err := fieldbook.PlanBook(tr, b)
	if err != nil {
		t.Fatal(err)
	}
	var report strings.Builder
	plan.Report(&report)
	for _, s := range []string{"error: line 3, plot 2, ht: sheet Plots, cell D3 holds TRUE", "error: line 5, plot 4, ht: sheet Plots, cell D5 holds the formula", "error: line 4, plot 3, ht: sheet Plots, cell D4 holds a date"} {
		if !strings.Contains(report.String(), s) {
			t.Errorf("report lacks %q:\n%s", s, report.String())
		}
	}
	var moist float64
	for _, c := range plan.Changes() {
		if c.Plot == 1 && c.Trait == "moist" {
			moist = c.New
		}
	}
	if moist != 15.4 {
		t.Errorf("plot 1 moisture %v, want 15.4\n%s", moist, report.String())
	}
	if !plan.HasErrors(true) {
		t.Error("a book with a date and a boolean in a numeric trait is importable")
	}
}

func TestClassifyFormat(t *testing.T) {
	t.Parallel()
	// Format codes as in ECMA-376 Part 1, §18.8.31.
	cases := map[string]shownAs{
		"0.0%":                 shownPercent,
		"0%;[Red]-0%":          shownPercent,
		`0.0 "%"`:              shownPlain, // a quoted percent sign is text
		"yyyy-mm-dd":           shownDate,
		"[h]:mm:ss":            shownDate,
		"d/m/yy h:mm":          shownDate,
		"#,##0.00":             shownPlain,
		`0.00 "kg"`:            shownPlain,
		"[$-409]0.00":          shownPlain,
		"0.00E+00":             shownPlain,
		`#,##0 "days";"-"`:     shownPlain,
		`0.0\%`:                shownPlain,
		"General":              shownPlain,
		`[Blue]0.0%;[Red]0.0%`: shownPercent,
	}
	for code, want := range cases {
		if got := classifyFormat(code); got != want {
			t.Errorf("%q: %v, want %v", code, got, want)
		}
	}
}
