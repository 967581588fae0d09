package ui

import (
	"bytes"
	"testing"

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
