package ui

import (
	"context"
	"fmt"
	"io"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/widget"

	"furlong/export/pdf"
	"furlong/export/xlsx"
)

// labelChoices are the barcodes offered for plot labels.
var labelChoices = []struct {
	bc    pdf.Barcode
	label string
}{
	{pdf.Code128, "Code 128 (handheld scanners)"},
	{pdf.QR, "QR (phone cameras too)"},
}

// labelsForm is the form of the plot labels dialog: the label sheet (a
// preset, or columns × rows on the Report step's paper), the barcode and
// how many labels of the first sheet are used already.
type labelsForm struct {
	sheet   *widget.Select
	grid    *widget.Entry
	barcode *widget.RadioGroup
	skip    *widget.Entry
}

func newLabelsForm(paper xlsx.Paper) *labelsForm {
	f := &labelsForm{}
	f.sheet = widget.NewSelect(append(pdf.PresetNames(), "columns × rows below"), nil)
	if paper == xlsx.Letter {
		f.sheet.SetSelected("letter-3x10")
	} else {
		f.sheet.SetSelected("a4-3x8")
	}
	f.grid = widget.NewEntry()
	f.grid.SetPlaceHolder("e.g. 3x7")
	f.grid.OnChanged = func(s string) {
		if strings.TrimSpace(s) != "" {
			f.sheet.SetSelected("columns × rows below")
		}
	}
	var labels []string
	for _, c := range labelChoices {
		labels = append(labels, c.label)
	}
	f.barcode = widget.NewRadioGroup(labels, nil)
	f.barcode.SetSelected(labels[0])
	f.skip = widget.NewEntry()
	f.skip.SetPlaceHolder("0")
	return f
}

// options reads the form; the error says in plain words what is wrong.
func (f *labelsForm) options(paper xlsx.Paper) (pdf.LabelOptions, error) {
	var o pdf.LabelOptions
	if p, ok := pdf.SheetPresets[f.sheet.Selected]; ok {
		o.Sheet = p
	} else {
		c, r, err := pdf.ParseSheet(f.grid.Text)
		if err != nil {
			return o, fmt.Errorf("columns × rows: %w", err)
		}
		o.Sheet = pdf.Sheet{Paper: pdfPaper(paper), Cols: c, Rows: r}
	}
	for _, c := range labelChoices {
		if c.label == f.barcode.Selected {
			o.Barcode = c.bc
		}
	}
	if s := strings.TrimSpace(f.skip.Text); s != "" {
		n, err := strconv.Atoi(s)
		if err != nil || n < 0 || n >= o.Sheet.Cols*o.Sheet.Rows {
			return o, fmt.Errorf("labels already used: give a whole number from 0 to %d", o.Sheet.Cols*o.Sheet.Rows-1)
		}
		o.Skip = n
	}
	return o, nil
}

// exportLabels asks for the label sheet and barcode, then writes the plot
// labels (pdf.WriteLabels, as 'furlong labels') in walking order.
func (r *reportStep) exportLabels() {
	u := r.u
	if u.doc == nil {
		return
	}
	if len(u.doc.t.Plots) == 0 {
		r.state.SetText("The trial has no plots yet: lay it out in the Field step first.")
		return
	}
	paper := u.paper()
	f := newLabelsForm(paper)
	items := []*widget.FormItem{
		widget.NewFormItem("Label sheet", f.sheet),
		widget.NewFormItem("Columns × rows", f.grid),
		widget.NewFormItem("Barcode", f.barcode),
		widget.NewFormItem("Labels already used", f.skip),
	}
	d := dialog.NewForm("Plot labels", "Choose file…", "Cancel", items, func(ok bool) {
		if !ok {
			return
		}
		opts, err := f.options(paper)
		if err != nil {
			r.state.SetText("No labels written: " + err.Error() + ".")
			return
		}
		snap := cloneTrial(u.doc.t)
		u.exportDialog("plot labels", safeFileName(snap.Title)+" labels.pdf", []string{".pdf"}, false,
			func(ctx context.Context, w io.Writer, _ string, _ func(int, int)) error {
				return pdf.WriteLabels(w, snap, opts)
			})
	}, u.win)
	d.Resize(fyne.NewSize(520, d.MinSize().Height))
	d.Show()
}
