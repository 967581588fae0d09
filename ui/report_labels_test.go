package ui

import (
	"strings"
	"testing"

	"fyne.io/fyne/v2/test"

	"furlong/export/pdf"
	"furlong/export/xlsx"
)

// The labels dialog's form: the paper's usual sheet by default, columns ×
// rows typed in make a sheet on the Report step's paper, QR can be chosen,
// and a count of used labels beyond one sheet is refused in words.
func TestLabelsForm(t *testing.T) {
	test.NewTempApp(t)
	f := newLabelsForm(xlsx.A4)
	o, err := f.options(xlsx.A4)
	if err != nil || o.Sheet != pdf.SheetPresets["a4-3x8"] || o.Barcode != pdf.Code128 || o.Skip != 0 {
		t.Fatalf("defaults %+v, %v", o, err)
	}
	if g := newLabelsForm(xlsx.Letter); g.sheet.Selected != "letter-3x10" {
		t.Errorf("letter paper: %q", g.sheet.Selected)
	}
	f.grid.SetText("2x5")
	f.barcode.SetSelected(labelChoices[1].label)
	f.skip.SetText("3")
	o, err = f.options(xlsx.Letter)
	if err != nil || o.Sheet.Cols != 2 || o.Sheet.Rows != 5 || o.Sheet.Paper != pdf.Letter || o.Barcode != pdf.QR || o.Skip != 3 {
		t.Fatalf("custom %+v, %v", o, err)
	}
	f.skip.SetText("10")
	if _, err := f.options(xlsx.A4); err == nil || !strings.Contains(err.Error(), "0 to 9") {
		t.Errorf("10 used of 10: %v", err)
	}
	f.skip.SetText("")
	f.grid.SetText("three by seven")
	if _, err := f.options(xlsx.A4); err == nil {
		t.Error("a grid that is not COLSxROWS accepted")
	}
}
