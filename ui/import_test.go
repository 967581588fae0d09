package ui

import (
	"bytes"
	"strings"
	"testing"

	"fyne.io/fyne/v2/test"

	"furlong/trial/fieldbook"
)

// A field book written by the fieldbook package and read back restores
// the values (the package's round-trip promise); the import is one
// undoable edit.
func TestImportFieldBook(t *testing.T) {
	u, w := newTestApp(t, 0)
	tr := smallTrial(t)
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 3 + float64(i)/4
	}
	var book bytes.Buffer
	if err := fieldbook.WriteCSV(&book, tr, fieldbook.Options{}); err != nil {
		t.Fatal(err)
	}
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = nan()
	}
	u.OpenTrial(tr, "")

	u.importFieldBook("book.csv", book.Bytes())
	if w.Canvas().Overlays().Top() == nil {
		t.Fatal("the import plan was not shown before importing")
	}
	if !sameValue(u.doc.t.Traits[0].Values[0], nan()) {
		t.Fatal("values changed before the user confirmed")
	}
	b, err := readFieldBook("book.csv", book.Bytes())
	if err != nil {
		t.Fatal(err)
	}
	plan, err := fieldbook.PlanBook(u.doc.t, b)
	if err != nil {
		t.Fatal(err)
	}
	if !u.applyImport(plan, false) {
		t.Fatal("import refused")
	}
	for i := range u.doc.t.Plots {
		if got, want := u.doc.t.Traits[0].Values[i], 3+float64(i)/4; got != want {
			t.Fatalf("plot %d: %v, want %v", i, got, want)
		}
	}
	u.undo()
	if !sameValue(u.doc.t.Traits[0].Values[5], nan()) {
		t.Fatal("the import was not undone in one step")
	}
	u.redo()
	if u.doc.t.Traits[0].Values[5] != 3+5.0/4 {
		t.Fatal("redo of the import")
	}
}

// A comma-separated field book with decimal commas in quoted cells, as
// spreadsheets set to a European locale write it ("5,25"): read with a
// decimal point the numbers are refused as ambiguous and the report points
// at the decimal-comma mode; ticking the mode reads the book again and the
// values import as written (the fieldbook package's DecimalComma writer is
// the outside reference for the file's form).
func TestImportFieldBookDecimalComma(t *testing.T) {
	u, w := newTestApp(t, 0)
	tr := smallTrial(t)
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 3 + float64(i)/4 // 3.25, 3.5, ...: every other one has a fraction
	}
	var book bytes.Buffer
	if err := fieldbook.WriteCSV(&book, tr, fieldbook.Options{Comma: ',', DecimalComma: true}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(book.String(), `"3,25"`) {
		t.Fatalf("the book was not written with quoted decimal commas:\n%s", book.String())
	}
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = nan()
	}
	u.OpenTrial(tr, "")

	u.importFieldBook("book.csv", book.Bytes())
	top := w.Canvas().Overlays().Top()
	if top == nil {
		t.Fatal("the import report was not shown")
	}
	if !strings.Contains(overlayText(top), "tick “Numbers have decimal commas”") {
		t.Errorf("the report does not point at the decimal-comma mode:\n%s", overlayText(top))
	}
	comma := findCheck(top, "Numbers have decimal commas")
	if comma == nil {
		t.Fatal("no decimal-comma check box in the report of a CSV book")
	}
	if imp := findButton(top, "Import"); imp == nil || !imp.Disabled() {
		t.Error("Import is enabled although every fractional number was refused")
	}
	test.Tap(comma)
	top = w.Canvas().Overlays().Top()
	if top == nil {
		t.Fatal("no report after choosing decimal commas")
	}
	comma = findCheck(top, "Numbers have decimal commas")
	if comma == nil || !comma.Checked {
		t.Fatal("the new report does not show the decimal-comma mode as chosen")
	}
	imp := findButton(top, "Import")
	if imp == nil || imp.Disabled() {
		t.Fatalf("Import is not possible in decimal-comma mode:\n%s", overlayText(top))
	}
	test.Tap(imp)
	for i := range u.doc.t.Plots {
		if got, want := u.doc.t.Traits[0].Values[i], 3+float64(i)/4; got != want {
			t.Fatalf("plot %d: %v, want %v", i, got, want)
		}
	}
	u.undo()
	if !sameValue(u.doc.t.Traits[0].Values[1], nan()) {
		t.Fatal("the import was not undone in one step")
	}
}

// The decimal-comma choice is offered for CSV books only: a workbook's
// cells hold numbers.
func TestImportModeOnlyForCSV(t *testing.T) {
	t.Parallel()
	if !isWorkbook("b.xlsx", nil) || !isWorkbook("b.bin", []byte("PK\x03\x04rest")) || isWorkbook("b.csv", []byte("plot,block\n")) {
		t.Error("isWorkbook does not tell a workbook (xlsx name or zip signature) from a CSV file")
	}
}
