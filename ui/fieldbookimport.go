package ui

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/widget"

	"furlong/export/xlsx"
	"furlong/trial"
	"furlong/trial/fieldbook"
)

// importFieldBookDialog reads a field book (CSV or xlsx) and shows what the
// import would do before anything changes.
func (u *App) importFieldBookDialog() {
	if u.doc == nil {
		return
	}
	u.chooseFile(chooseOptions{title: "Import a field book", exts: []string{".csv", ".xlsx", ".txt"},
		confirm: "Read"}, func(path string) {
		data, err := os.ReadFile(path)
		if err != nil {
			showError(u.win, "Could not import", "The field book could not be read", err)
			return
		}
		u.importFieldBook(filepath.Base(path), data)
	})
}

// isWorkbook says whether a field book is an xlsx workbook (by its name or
// its zip signature) rather than a CSV file.
func isWorkbook(name string, data []byte) bool {
	return strings.HasSuffix(strings.ToLower(name), ".xlsx") || bytes.HasPrefix(data, []byte("PK\x03\x04"))
}

// readFieldBook reads a CSV or xlsx field book with a decimal point (a
// comma inside a number of a comma-separated file is refused as ambiguous).
func readFieldBook(name string, data []byte) (*fieldbook.Book, error) {
	return readFieldBookMode(name, data, false)
}

// readFieldBookMode reads a CSV or xlsx field book; decimalComma reads the
// quoted numbers of a comma-separated file with decimal commas ("5,23"),
// as the command line's --decimal-comma does. Workbooks hold numbers, so
// the mode does not apply to them.
func readFieldBookMode(name string, data []byte, decimalComma bool) (*fieldbook.Book, error) {
	if isWorkbook(name, data) {
		return xlsx.ReadBook(bytes.NewReader(data))
	}
	return fieldbook.ReadBook(bytes.NewReader(data), fieldbook.ReadOptions{DecimalComma: decimalComma})
}

// importFieldBook plans the import of a field book and shows the report.
func (u *App) importFieldBook(name string, data []byte) {
	u.importFieldBookMode(name, data, false)
}

// importFieldBookMode plans the import of a field book read in the given
// decimal mode and shows the report, in which a CSV book's mode can be
// changed (the book is then read and planned again).
func (u *App) importFieldBookMode(name string, data []byte, decimalComma bool) {
	book, err := readFieldBookMode(name, data, decimalComma)
	if err != nil {
		showError(u.win, "Could not import", "The field book "+name+" could not be read", err)
		return
	}
	plan, err := fieldbook.PlanBook(u.doc.t, book)
	if err != nil {
		showError(u.win, "Could not import", "The field book "+name+" does not match this trial", err)
		return
	}
	var mode *importMode
	if !isWorkbook(name, data) {
		mode = &importMode{decimalComma: decimalComma, reread: func(dc bool) { u.importFieldBookMode(name, data, dc) }}
	}
	u.showImportPlanMode(name, plan, mode)
}

// importMode is the decimal mode of a CSV field book's import, shown as a
// check box in the import report; reread plans the import again in the
// mode chosen.
type importMode struct {
	decimalComma bool
	reread       func(decimalComma bool)
}

// ambiguousComma says whether a plan refused numbers for a comma in a
// comma-separated file (trial.NumberError's wording), so that the report
// can point at the decimal-comma mode.
func ambiguousComma(plan *fieldbook.ImportPlan) bool {
	for _, it := range plan.Errors() {
		if strings.Contains(it.String(), "ambiguous in a comma-separated file") {
			return true
		}
	}
	return false
}

// showImportPlan lists errors, warnings and changes, with an Overwrite
// option, and applies the plan as one undoable edit when confirmed.
func (u *App) showImportPlan(name string, plan *fieldbook.ImportPlan) {
	u.showImportPlanMode(name, plan, nil)
}

// showImportPlanMode is showImportPlan with, for a CSV book (mode not nil),
// the choice of reading its numbers with decimal commas.
func (u *App) showImportPlanMode(name string, plan *fieldbook.ImportPlan, mode *importMode) {
	var b strings.Builder
	changes := plan.Changes()
	overwrites := 0
	for _, c := range changes {
		if c.Overwrite {
			overwrites++
		}
	}
	fmt.Fprintf(&b, "%d plots matched; %d values to set, %d of them replacing a different stored value.\n", plan.Matched(), len(changes), overwrites)
	section := func(title string, is []fieldbook.Issue) {
		if len(is) == 0 {
			return
		}
		fmt.Fprintf(&b, "\n%s (%d)\n", title, len(is))
		for i, it := range is {
			if i == 30 {
				fmt.Fprintf(&b, "  … and %d more\n", len(is)-30)
				break
			}
			b.WriteString("  • " + it.String() + "\n")
		}
	}
	section("Errors — nothing can be imported until they are fixed", plan.Errors())
	section("Conflicts with stored values", plan.Conflicts())
	section("Warnings", plan.Warnings())
	section("Notes", plan.Notes())
	if mode != nil && !mode.decimalComma && ambiguousComma(plan) {
		b.WriteString("\nIf the whole file uses decimal commas (5,23 for five point two three), tick “Numbers have decimal commas” below: the file is then read again.\n")
	}
	report := widget.NewLabel(b.String())
	report.Wrapping = fyne.TextWrapWord
	overwrite := widget.NewCheck("Replace values already stored in the trial", nil)
	overwrite.Checked = false
	if overwrites == 0 {
		overwrite.Disable()
	}
	var d dialog.Dialog
	importBtn := widget.NewButton("Import", nil)
	importBtn.Importance = widget.HighImportance
	update := func() {
		if plan.HasErrors(overwrite.Checked) {
			importBtn.Disable()
		} else {
			importBtn.Enable()
		}
	}
	overwrite.OnChanged = func(bool) { update() }
	update()
	importBtn.OnTapped = func() {
		if u.applyImport(plan, overwrite.Checked) {
			d.Hide()
		}
	}
	cancel := widget.NewButton("Cancel", func() { d.Hide() })
	bottom := container.NewVBox(overwrite)
	if mode != nil {
		comma := widget.NewCheck("Numbers have decimal commas (“5,23” in a comma-separated file)", nil)
		comma.Checked = mode.decimalComma
		comma.OnChanged = func(on bool) {
			d.Hide()
			mode.reread(on)
		}
		bottom.Add(comma)
	}
	bottom.Add(container.NewHBox(cancel, importBtn))
	body := container.NewBorder(nil, bottom, nil, nil, container.NewVScroll(report))
	d = dialog.NewCustomWithoutButtons("Import "+name, body, u.win)
	d.Resize(fyne.NewSize(min(760, u.win.Canvas().Size().Width*0.9), min(560, u.win.Canvas().Size().Height*0.9)))
	d.Show()
	closeOnEscape(u.win, d)
}

// applyImport carries out a plan as one undoable edit.
func (u *App) applyImport(plan *fieldbook.ImportPlan, overwrite bool) bool {
	var n int
	ok := u.structuralEdit("field book import", "The field book could not be imported", func(t *trial.Trial) error {
		var err error
		n, err = plan.Apply(t, overwrite)
		return err
	})
	if ok {
		u.status.SetText(fmt.Sprintf("Imported %d values.", n))
	}
	return ok
}
