package ui

import (
	"path/filepath"
	"strconv"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/driver/desktop"
	"fyne.io/fyne/v2/widget"

	"furlong/export"
	"furlong/stats/meansep"
)

// Shortcuts use the platform's usual modifier: Ctrl on Linux and Windows,
// Cmd on macOS. Undo and redo are Fyne's own shortcuts: the desktop driver
// turns Ctrl+Z and Ctrl+Y into fyne.ShortcutUndo and fyne.ShortcutRedo,
// never into a custom shortcut, so a custom one would never fire.
var (
	scNew    = &desktop.CustomShortcut{KeyName: fyne.KeyN, Modifier: fyne.KeyModifierShortcutDefault}
	scOpen   = &desktop.CustomShortcut{KeyName: fyne.KeyO, Modifier: fyne.KeyModifierShortcutDefault}
	scSave   = &desktop.CustomShortcut{KeyName: fyne.KeyS, Modifier: fyne.KeyModifierShortcutDefault}
	scSaveAs = &desktop.CustomShortcut{KeyName: fyne.KeyS, Modifier: fyne.KeyModifierShortcutDefault | fyne.KeyModifierShift}
	scUndo   = &fyne.ShortcutUndo{}
	scRedo   = &fyne.ShortcutRedo{}
	scExport = &desktop.CustomShortcut{KeyName: fyne.KeyE, Modifier: fyne.KeyModifierShortcutDefault}
	scQuit   = &desktop.CustomShortcut{KeyName: fyne.KeyQ, Modifier: fyne.KeyModifierShortcutDefault}
)

// menuItems keeps the items whose state follows the document.
type menuItems struct {
	save, saveAs, export, undo, redo *fyne.MenuItem
	recent                           *fyne.MenuItem
	closeItem                        *fyne.MenuItem
}

func (u *App) buildMenus() {
	m := &u.menu
	newItem := fyne.NewMenuItem("New trial", u.newTrial)
	newItem.Shortcut = scNew
	open := fyne.NewMenuItem("Open…", u.openDialog)
	open.Shortcut = scOpen
	m.recent = fyne.NewMenuItem("Open recent", nil)
	openSeries := fyne.NewMenuItem("Open series…", u.openSeriesDialog)
	newSeries := fyne.NewMenuItem("New series", u.NewSeries)
	m.save = fyne.NewMenuItem("Save", func() { u.saveCommand(false) })
	m.save.Shortcut = scSave
	m.saveAs = fyne.NewMenuItem("Save as…", func() { u.saveCommand(true) })
	m.saveAs.Shortcut = scSaveAs
	m.export = fyne.NewMenuItem("Export…", u.exportCommand)
	m.export.Shortcut = scExport
	m.closeItem = fyne.NewMenuItem("Close trial", u.closeCommand)
	quit := fyne.NewMenuItem("Quit", u.onClose)
	quit.IsQuit = true
	quit.Shortcut = scQuit
	file := fyne.NewMenu("File", newItem, open, m.recent, fyne.NewMenuItemSeparator(),
		openSeries, newSeries, fyne.NewMenuItemSeparator(),
		m.save, m.saveAs, m.export, fyne.NewMenuItemSeparator(), m.closeItem, quit)

	m.undo = fyne.NewMenuItem("Undo", u.undo)
	m.undo.Shortcut = scUndo
	m.redo = fyne.NewMenuItem("Redo", u.redo)
	m.redo.Shortcut = scRedo
	prefsItem := fyne.NewMenuItem("Preferences…", u.showPreferences)
	edit := fyne.NewMenu("Edit", m.undo, m.redo, fyne.NewMenuItemSeparator(), prefsItem)

	about := fyne.NewMenuItem("About Furlong", u.showAbout)
	cautions := fyne.NewMenuItem("Cautions", u.showCautions)
	help := fyne.NewMenu("Help", about, cautions)
	u.win.SetMainMenu(fyne.NewMainMenu(file, edit, help))
	u.updateMenus()
}

func (u *App) addShortcuts() {
	c := u.win.Canvas()
	c.AddShortcut(scNew, func(fyne.Shortcut) { u.newTrial() })
	c.AddShortcut(scOpen, func(fyne.Shortcut) { u.openDialog() })
	c.AddShortcut(scSave, func(fyne.Shortcut) { u.saveCommand(false) })
	c.AddShortcut(scSaveAs, func(fyne.Shortcut) { u.saveCommand(true) })
	c.AddShortcut(scUndo, func(fyne.Shortcut) { u.undo() })
	c.AddShortcut(scRedo, func(fyne.Shortcut) { u.redo() })
	c.AddShortcut(scExport, func(fyne.Shortcut) {
		if u.doc != nil || u.series != nil {
			u.exportCommand()
		}
	})
	c.AddShortcut(scQuit, func(fyne.Shortcut) { u.onClose() })
}

// updateMenus follows the document state.
func (u *App) updateMenus() {
	if r, ok := u.steps[stepRecord].(*recordStep); ok && r != nil {
		r.updateUndo()
	}
	m := &u.menu
	if m.save == nil {
		return
	}
	open := u.doc != nil
	m.save.Disabled = !open
	m.saveAs.Disabled = !open
	m.export.Disabled = !open
	m.undo.Disabled = !open || !u.doc.hist.canUndo()
	m.redo.Disabled = !open || !u.doc.hist.canRedo()
	m.undo.Label, m.redo.Label = "Undo", "Redo"
	if !m.undo.Disabled {
		m.undo.Label = "Undo " + u.doc.hist.done[len(u.doc.hist.done)-1].label()
	}
	if !m.redo.Disabled {
		m.redo.Label = "Redo " + u.doc.hist.undone[len(u.doc.hist.undone)-1].label()
	}
	var items []*fyne.MenuItem
	for _, p := range u.prefs.recent {
		path := p
		items = append(items, fyne.NewMenuItem(filepath.Base(path), func() { u.openPath(path) }))
	}
	m.recent.ChildMenu = fyne.NewMenu("", items...)
	m.recent.Disabled = len(items) == 0
	m.closeItem.Label = "Close trial"
	if u.series != nil {
		// The series view: Save, Save as and Export act on the series.
		m.save.Disabled, m.saveAs.Disabled, m.export.Disabled = false, false, false
		m.closeItem.Label = "Close series"
	}
	if mm := u.win.MainMenu(); mm != nil {
		mm.Refresh()
	}
}

// undo takes back the last edit and says which one ("Undid: value of
// plot 103, Yield.").
func (u *App) undo() {
	if u.doc == nil || !u.doc.hist.canUndo() {
		return
	}
	what := u.doc.hist.done[len(u.doc.hist.done)-1].label()
	if u.doc.undo() {
		u.status.SetText("Undid: " + what + ".")
	}
}

// redo makes the last undone edit again and says which one.
func (u *App) redo() {
	if u.doc == nil || !u.doc.hist.canRedo() {
		return
	}
	what := u.doc.hist.undone[len(u.doc.hist.undone)-1].label()
	if u.doc.redo() {
		u.status.SetText("Redid: " + what + ".")
	}
}

// closeTrial returns to the start screen, asking first about unsaved work.
func (u *App) closeTrial() {
	if u.doc == nil {
		return
	}
	back := func() {
		u.closeDocument()
		u.showStart()
	}
	if !u.doc.dirty {
		back()
		return
	}
	u.askUnsaved("Close", back)
}

func (u *App) showAbout() {
	v := u.opts.Version
	if v == "" {
		v = "development build"
	}
	text := widget.NewLabel("Furlong " + v + "\n\nPlans replicated field trials (CRD, RCBD, Latin square), " +
		"records plot data and compares treatments with the analysis of variance and LSD or Tukey letters.\n\n" + export.CautionText())
	text.Wrapping = fyne.TextWrapWord
	d := dialog.NewCustom("About Furlong", "Close", text, u.win)
	d.Resize(fyne.NewSize(520, 340))
	d.Show()
	closeOnEscape(u.win, d)
}

func (u *App) showCautions() {
	text := widget.NewLabel(export.CautionText())
	text.Wrapping = fyne.TextWrapWord
	d := dialog.NewCustom("Cautions", "Close", text, u.win)
	d.Resize(fyne.NewSize(480, 240))
	d.Show()
	closeOnEscape(u.win, d)
}

// showPreferences edits the user's defaults; each control writes one key.
func (u *App) showPreferences() {
	p := u.prefs
	units := widget.NewRadioGroup([]string{"Metric (m, kg, t/ha)", "Imperial (ft, lb, bu/ac)"}, nil)
	if p.units == unitsImperial {
		units.SetSelected(units.Options[1])
	} else {
		units.SetSelected(units.Options[0])
	}
	units.OnChanged = func(s string) {
		if s == units.Options[1] {
			p.onUnitsChanged(unitsImperial)
		} else {
			p.onUnitsChanged(unitsMetric)
		}
	}
	alpha := widget.NewSelect(alphaChoices, func(s string) {
		if a, err := strconv.ParseFloat(s, 64); err == nil {
			p.onAlphaChanged(a)
		}
	})
	alpha.SetSelected(strconv.FormatFloat(p.alpha, 'g', -1, 64))
	method := widget.NewRadioGroup([]string{methodLabel(meansep.LSD), methodLabel(meansep.Tukey)}, nil)
	method.SetSelected(methodLabel(p.method))
	method.OnChanged = func(s string) {
		if s == methodLabel(meansep.Tukey) {
			p.onMethodChanged(meansep.Tukey)
		} else {
			p.onMethodChanged(meansep.LSD)
		}
	}
	order := widget.NewRadioGroup([]string{"Best mean first", "Trial order"}, nil)
	if p.meansOrder == orderTrial {
		order.SetSelected("Trial order")
	} else {
		order.SetSelected("Best mean first")
	}
	order.OnChanged = func(s string) {
		if s == "Trial order" {
			p.onMeansOrderChanged(orderTrial)
		} else {
			p.onMeansOrderChanged(orderBestFirst)
		}
		if c, ok := u.steps[stepCompare].(*compareStep); ok && c != nil {
			c.show(c.shown) // the means table follows at once
		}
		u.compute.dataChanged() // and the charts, redrawn in the new order
	}
	form := widget.NewForm(
		widget.NewFormItem("Units", units),
		widget.NewFormItem("Significance level", alpha),
		widget.NewFormItem("Mean separation", method),
		widget.NewFormItem("Order of means", order),
	)
	d := dialog.NewCustom("Preferences", "Close", container.NewPadded(form), u.win)
	d.Resize(fyne.NewSize(460, 360))
	d.Show()
	closeOnEscape(u.win, d)
}

// alphaChoices are the significance levels offered.
var alphaChoices = []string{"0.01", "0.05", "0.1"}

func methodLabel(m meansep.Method) string {
	if m == meansep.Tukey {
		return "Tukey HSD"
	}
	return "Fisher's LSD"
}
