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

// readFieldBook reads a CSV or xlsx field book.
func readFieldBook(name string, data []byte) (*fieldbook.Book, error) {
	if strings.HasSuffix(strings.ToLower(name), ".xlsx") || bytes.HasPrefix(data, []byte("PK\x03\x04")) {
		return xlsx.ReadBook(bytes.NewReader(data))
	}
	return fieldbook.ReadBook(bytes.NewReader(data), fieldbook.ReadOptions{})
}

// importFieldBook plans the import of a field book and shows the report.
func (u *App) importFieldBook(name string, data []byte) {
	book, err := readFieldBook(name, data)
	if err != nil {
		showError(u.win, "Could not import", "The field book "+name+" could not be read", err)
		return
	}
	plan, err := fieldbook.PlanBook(u.doc.t, book)
	if err != nil {
		showError(u.win, "Could not import", "The field book "+name+" does not match this trial", err)
		return
	}
	u.showImportPlan(name, plan)
}

// showImportPlan lists errors, warnings and changes, with an Overwrite
// option, and applies the plan as one undoable edit when confirmed.
func (u *App) showImportPlan(name string, plan *fieldbook.ImportPlan) {
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
	body := container.NewBorder(nil, container.NewVBox(overwrite, container.NewHBox(cancel, importBtn)), nil, nil,
		container.NewVScroll(report))
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
