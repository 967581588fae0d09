package xlsx

import (
	"archive/zip"
	"bytes"
	"io"
	"math"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"furlong/trial"
	"furlong/trial/fieldbook"
)

// fieldBookTrial is the barley trial with a count trait, a percentage and
// values that need all 17 significant digits.
func fieldBookTrial(tb testing.TB) *trial.Trial {
	tb.Helper()
	t, _ := barleyTrial(tb)
	t.Traits = append(t.Traits,
		trial.Trait{Key: "tillers", Name: "Tillers", Unit: "per m", Kind: trial.Count, Min: fptr(0), Max: fptr(500)},
		trial.Trait{Key: "cover", Name: "Ground cover", Unit: "%", Kind: trial.Percent, Decimals: 1},
	)
	n := len(t.Plots)
	t.Traits[len(t.Traits)-2].Values = make([]float64, n)
	t.Traits[len(t.Traits)-1].Values = make([]float64, n)
	for i := range t.Plots {
		t.Traits[len(t.Traits)-2].Values[i] = float64(100 + i)
		t.Traits[len(t.Traits)-1].Values[i] = trial.Missing
	}
	t.Traits[len(t.Traits)-1].Values[0] = 12.345678901234567 // 17 significant digits
	t.Traits[0].Values[1] = 0.1 + 0.2                        // 0.30000000000000004
	return t
}

func TestFieldBookRoundTrip(t *testing.T) {
	t.Parallel()
	tr := fieldBookTrial(t)
	var buf bytes.Buffer
	if err := WriteFieldBook(&buf, tr, FieldBookOptions{}); err != nil {
		t.Fatal(err)
	}
	rows, err := ReadTable(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != len(tr.Plots)+1 {
		t.Fatalf("%d rows, want %d", len(rows), len(tr.Plots)+1)
	}
	// The CSV field book's columns (fieldbook.Rows), trait headers
	// extended with unit and range.
	csvHead := fieldbook.Rows(tr)[0]
	for i, h := range csvHead {
		if !strings.HasPrefix(rows[0][i], h) {
			t.Errorf("column %d = %q, CSV field book has %q", i, rows[0][i], h)
		}
	}
	if rows[0][6] != "yield (bu/ac) 0–100" {
		t.Errorf("trait header %q", rows[0][6])
	}

	// Import into a copy of the trial without data: every value comes back
	// exactly.
	empty := fieldBookTrial(t)
	for j := range empty.Traits {
		for i := range empty.Traits[j].Values {
			empty.Traits[j].Values[i] = trial.Missing
		}
	}
	plan, err := fieldbook.Plan(empty, rows)
	if err != nil {
		t.Fatal(err)
	}
	if plan.HasErrors(false) {
		var b strings.Builder
		plan.Report(&b)
		t.Fatalf("import plan has errors:\n%s", b.String())
	}
	if _, err := plan.Apply(empty, false); err != nil {
		t.Fatal(err)
	}
	for j, want := range tr.Traits {
		if want.Derived != nil {
			continue
		}
		got := empty.Traits[j]
		for i := range want.Values {
			w, g := want.Values[i], got.Values[i]
			if math.Float64bits(w) != math.Float64bits(g) && !(math.IsNaN(w) && math.IsNaN(g)) {
				t.Errorf("%s plot %d: %v after the round trip, want %v", want.Key, tr.Plots[i].Number, g, w)
			}
		}
	}
	// The unchanged book against the trial it came from changes nothing.
	again, err := fieldbook.Plan(tr, rows)
	if err != nil {
		t.Fatal(err)
	}
	if n := len(again.Changes()); n != 0 || len(again.Conflicts()) != 0 {
		t.Errorf("unchanged book: %d changes, %d conflicts", n, len(again.Conflicts()))
	}
}

func TestFieldBookValidation(t *testing.T) {
	t.Parallel()
	tr := fieldBookTrial(t)
	var buf bytes.Buffer
	if err := WriteFieldBook(&buf, tr, FieldBookOptions{Paper: Letter}); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	dvs, err := f.GetDataValidations(FieldBookSheet)
	if err != nil {
		t.Fatal(err)
	}
	byCol := map[string]*excelize.DataValidation{}
	for _, dv := range dvs {
		byCol[strings.SplitN(dv.Sqref, ":", 2)[0]] = dv
	}
	last := len(tr.Plots) + 1
	// Column G: yield 0–100 decimal; K: lodging score 1–9; L: tillers,
	// whole 0–500; M: cover, a percentage 0–100.
	for _, c := range []struct {
		cell, typ, op, f1, f2 string
	}{
		{"G2", "decimal", "between", "0", "100"},
		{"K2", "decimal", "between", "1", "9"},
		{"L2", "whole", "between", "0", "500"},
		{"M2", "decimal", "between", "0", "100"},
	} {
		dv := byCol[c.cell]
		if dv == nil {
			t.Errorf("no data validation on %s; have %v", c.cell, byCol)
			continue
		}
		if dv.Type != c.typ || (dv.Operator != c.op && !(c.op == "between" && dv.Operator == "")) ||
			untag(dv.Formula1) != c.f1 || untag(dv.Formula2) != c.f2 {
			t.Errorf("%s: %s %s %q %q, want %s %s %s %s", c.cell, dv.Type, dv.Operator, dv.Formula1, dv.Formula2, c.typ, c.op, c.f1, c.f2)
		}
		if !strings.HasSuffix(dv.Sqref, cellName(1, last)[1:]) {
			t.Errorf("%s: range %s does not reach row %d", c.cell, dv.Sqref, last)
		}
		if dv.Error == nil || *dv.Error == "" || !dv.ShowErrorMessage {
			t.Errorf("%s: no error message", c.cell)
		}
	}
	panes, _ := f.GetPanes(FieldBookSheet)
	if !panes.Freeze || panes.YSplit != 1 {
		t.Errorf("header row not frozen: %+v", panes)
	}
	// Header repeated on every printed page.
	names := f.GetDefinedName()
	found := false
	for _, n := range names {
		if n.Name == "_xlnm.Print_Titles" && n.Scope == FieldBookSheet && strings.HasSuffix(n.RefersTo, "!$1:$1") {
			found = true
		}
	}
	if !found {
		t.Errorf("no print titles: %+v", names)
	}
	pl, _ := f.GetPageLayout(FieldBookSheet)
	if pl.Size == nil || *pl.Size != 1 || pl.FitToWidth == nil || *pl.FitToWidth != 1 {
		t.Errorf("page layout %+v", pl)
	}
	// Gridlines printed: <printOptions gridLines="1"/> (ECMA-376 §18.3.1.70).
	zr, err := zip.NewReader(bytes.NewReader(buf.Bytes()), int64(buf.Len()))
	if err != nil {
		t.Fatal(err)
	}
	for _, zf := range zr.File {
		if zf.Name == "xl/worksheets/sheet1.xml" {
			rc, _ := zf.Open()
			b, _ := io.ReadAll(rc)
			rc.Close()
			i := bytes.Index(b, []byte(`<printOptions gridLines="1"/>`))
			j := bytes.Index(b, []byte(`<pageMargins`))
			if i < 0 || (j >= 0 && j < i) {
				t.Errorf("printOptions missing or out of order (at %d, pageMargins at %d)", i, j)
			}
		}
	}
}

func TestReadTableOtherSheet(t *testing.T) {
	t.Parallel()
	// A workbook saved by someone else: the field book is the second sheet
	// and a value has many digits; a trailing cell is empty.
	f := excelize.NewFile()
	f.SetCellStr("Sheet1", "A1", "notes")
	f.NewSheet("field book")
	f.SetCellStr("field book", "A1", "plot")
	f.SetCellStr("field book", "B1", "yield")
	f.SetCellStr("field book", "C1", "ht")
	f.SetCellInt("field book", "A2", 101)
	f.SetCellFloat("field book", "B2", 1.0/3, -1, 64)
	f.SetCellFloat("field book", "B3", 2.5, 1, 64)
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		t.Fatal(err)
	}
	rows, err := ReadTable(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 3 || len(rows[1]) != 3 || rows[0][0] != "plot" || rows[1][0] != "101" || rows[2][1] != "2.5" || rows[1][2] != "" {
		t.Errorf("rows %q", rows)
	}
	if _, err := ReadTable(strings.NewReader("plot,yield\n101,3\n")); err == nil {
		t.Error("a CSV file was read as a workbook")
	}
}

// untag drops XML tags around a formula, as excelize versions differ in
// whether they keep them.
func untag(s string) string {
	var b strings.Builder
	in := false
	for _, r := range s {
		switch {
		case r == '<':
			in = true
		case r == '>':
			in = false
		case !in:
			b.WriteRune(r)
		}
	}
	return b.String()
}
