package ui

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/layout"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// The open trial and its file on disk: the window's open-trial marker,
// the watcher that notices changes made by other programs, and what the
// window does when the file changed under it (reload, merge, or save the
// window's version under another name). Nothing here ever writes over a
// version of the file the window has not seen.

// markOpen puts the window's open-trial marker beside path. Another
// window's fresh marker is named in a warning (the trial opens anyway); a
// stale one taken over is said in the status line.
func (u *App) markOpen(path string) {
	app := "Furlong"
	if u.opts.Version != "" {
		app += " " + u.opts.Version
	}
	p, err := trialfile.MarkOpen(path, app)
	if err != nil {
		u.status.SetText("Other windows will not be told that this trial is open here (the marker beside the file could not be written).")
		return
	}
	u.doc.presence = p
	switch {
	case p.Other != nil:
		o := p.Other
		showMessage(u.win, "Also open elsewhere", message{
			What: "This trial is also open in another Furlong window: " + who(o) + " on " + where(o) +
				", since " + o.Since.Local().Format("2 Jan 2006 15:04") + ".",
			Do: "Furlong opened it anyway. Each window saves its changes to the file and notices the other's within " +
				"a few seconds; values changed in both are put to you to choose, so none is lost. " +
				"Agree who records which plots to avoid choosing."})
	case p.TookOver != nil:
		o := p.TookOver
		u.status.SetText("Took over an old open-trial marker (" + who(o) + " on " + where(o) + ", since " +
			o.Since.Local().Format("2 Jan 15:04") + "): that window closed without tidying up.")
	}
}

func who(p *trialfile.PresenceInfo) string {
	if p.User == "" {
		return "someone"
	}
	return p.User
}

func where(p *trialfile.PresenceInfo) string {
	if p.Host == "" {
		return "an unknown computer"
	}
	return "the computer " + p.Host
}

// watch starts checking the open trial's file for outside changes every
// pollEvery, off the UI goroutine; a change comes back through fyne.Do.
func (u *App) watch() {
	d := u.doc
	if d == nil || d.path == "" || d.stopWatch != nil {
		return
	}
	every := pollEvery
	if u.opts.pollEvery > 0 {
		every = u.opts.pollEvery
	}
	stop := make(chan struct{})
	d.stopWatch = stop
	path, epoch := d.path, d.epoch
	toUI := fyne.Do
	if u.watcherToUI != nil {
		toUI = u.watcherToUI
	}
	go func() {
		tick := time.NewTicker(every)
		defer tick.Stop()
		for {
			select {
			case <-stop:
				return
			case <-tick.C:
			}
			id, changed, ok := u.saver.changedOutside(path)
			if !ok || !changed {
				continue
			}
			toUI(func() { u.onOutsideChange(epoch, path, id) })
		}
	}()
}

// unwatch stops the watcher of the open trial.
func (u *App) unwatch() {
	if u.doc != nil && u.doc.stopWatch != nil {
		close(u.doc.stopWatch)
		u.doc.stopWatch = nil
	}
}

// onOutsideChange runs on the UI goroutine when the watcher found the
// file changed by another program. Without unsaved edits the window loads
// the new version by itself and says so; with some, the user chooses.
func (u *App) onOutsideChange(epoch uint64, path string, id trialfile.Identity) {
	if u.outside != nil {
		defer u.outside()
	}
	d := u.doc
	if d == nil || d.epoch != epoch || d.path != path || d.conflict || id.Same(d.disk) {
		return
	}
	if id.IsZero() {
		// Removed or renamed: nothing to load or merge; the window's copy
		// is all there is. It goes to the recovery copy until saved again.
		d.conflict = true
		u.saver.submit(u.job(false))
		u.status.SetText(filepath.Base(d.path) + " was removed or renamed by another program. File › Save puts it back.")
		u.showFileGone()
		return
	}
	if !d.dirty {
		u.reloadFromDisk(true)
		return
	}
	u.changedOnDisk(false)
}

// showFileGone asks what to do when the trial's file was removed or
// renamed while open: write it again where it was, or somewhere else.
func (u *App) showFileGone() {
	d := u.doc
	text := widget.NewLabel("The trial file " + d.path + " was removed or renamed by another program while open here. " +
		"This window still holds the whole trial; it is kept in a recovery copy until you save it.")
	text.Wrapping = fyne.TextWrapWord
	var dlg *dialog.CustomDialog
	again := widget.NewButton("Save it again there", func() {
		dlg.Hide()
		u.saver.setKnown(d.path, trialfile.Identity{}) // a new file: refused if one appeared meanwhile
		d.disk, d.conflict = trialfile.Identity{}, false
		u.saveTo(d.path, nil)
	})
	again.Importance = widget.HighImportance
	elsewhere := widget.NewButton("Save as…", func() { dlg.Hide(); u.saveAsDialog(nil) })
	later := widget.NewButton("Decide later", func() { dlg.Hide() })
	dlg = dialog.NewCustomWithoutButtons("The trial file is gone", container.NewVBox(text,
		container.NewHBox(layout.NewSpacer(), later, elsewhere, again)), u.win)
	dlg.Resize(fyne.NewSize(560, 200))
	dlg.Show()
	closeOnEscape(u.win, dlg)
}

// changedOnDisk: the file changed on disk while the window holds edits
// the file lacks. From now on edits go to the recovery copy only, until
// the user chooses; the question is asked once (and again on File › Save).
func (u *App) changedOnDisk(explicit bool) {
	d := u.doc
	if d.conflict && !explicit {
		return
	}
	if !d.conflict {
		d.conflict = true
		u.saver.submit(u.job(false)) // the edits go to the recovery copy at once
	}
	u.status.SetText(filepath.Base(d.path) + " was changed by another program; nothing was saved over it. Choose what to do.")
	u.askAboutDisk()
}

// askAboutDisk puts the file's change to the user: a file removed or
// renamed, or a file changed.
func (u *App) askAboutDisk() {
	if _, err := os.Stat(u.doc.path); errors.Is(err, fs.ErrNotExist) {
		u.showFileGone()
		return
	}
	u.showConflict()
}

// reloadFromDisk loads the trial file again and shows it in place of the
// window's copy, as an edit that Undo takes back (Undo then puts the
// window's version back, to be saved over the file). auto says that the
// window did it by itself (it had no unsaved edits).
func (u *App) reloadFromDisk(auto bool) {
	d := u.doc
	t, id, err := trialfile.LoadIdentity(d.path)
	if err != nil {
		d.conflict = true // nothing is written over a file the window cannot read
		showMessage(u.win, "Could not load the changed file",
			explain("The trial file "+filepath.Base(d.path)+" was changed by another program and could not be read", err).forFile(d.path))
		return
	}
	u.takeVersion(t, id, "load the file again")
	if auto {
		u.status.SetText(filepath.Base(d.path) + " was changed by another program; Furlong loaded the new version at " +
			time.Now().Format("15:04:05") + " (there were no unsaved changes here). Undo goes back to the version before.")
	} else {
		u.status.SetText("Loaded " + filepath.Base(d.path) + " again; the changes made here were dropped (Undo brings them back).")
	}
}

// takeVersion makes t, the file's content as the version id, the
// window's trial without writing anything: it becomes the base of later
// merges and the version every save checks against.
func (u *App) takeVersion(t *trial.Trial, id trialfile.Identity, what string) {
	d := u.doc
	u.saver.setKnown(d.path, id)
	c := &replaceTrial{what: what, before: cloneTrial(d.t), after: cloneTrial(t), c: changeAll}
	c.do(d.t)
	d.hist.push(c)
	d.disk, d.base, d.conflict = id, cloneTrial(t), false
	d.gen++
	u.lastSaved = d.gen
	d.dirty = false
	removeRecovery(d.recovery)
	u.onChange(changeAll)
	u.updateTitle()
}

// showConflict asks what to do about a file changed on disk while the
// window has edits the file lacks.
func (u *App) showConflict() {
	d := u.doc
	name := filepath.Base(d.path)
	text := widget.NewLabel("Another program (or Furlong on another computer) changed " + name +
		" since this window last loaded or saved it, and this window has changes that are not in the file. " +
		"Nothing was saved over the file; your changes are kept in a recovery copy until you choose.")
	text.Wrapping = fyne.TextWrapWord
	var dlg *dialog.CustomDialog
	choice := func(label, explain string, imp widget.Importance, f func()) fyne.CanvasObject {
		b := widget.NewButton(label, func() { dlg.Hide(); f() })
		b.Importance = imp
		l := widget.NewLabel(explain)
		l.Wrapping = fyne.TextWrapWord
		return container.NewBorder(nil, nil, container.NewGridWrap(fyne.NewSize(210, b.MinSize().Height), b), nil, l)
	}
	merge := choice("Keep both", "Take the values changed in the file and keep yours. Where both changed the same value, you choose which to keep.",
		widget.HighImportance, u.mergeWithDisk)
	reload := choice("Load the file's version", "Show the file as it is now and drop the changes made here (Undo brings them back).",
		widget.MediumImportance, func() { u.reloadFromDisk(false) })
	saveAs := choice("Save mine as…", "Save this window's version under another name; the file stays as the other program left it.",
		widget.MediumImportance, func() { u.saveAsDialog(nil) })
	later := widget.NewButton("Decide later", func() { dlg.Hide() })
	dlg = dialog.NewCustomWithoutButtons("The trial file was changed on disk", container.NewVBox(text, widget.NewSeparator(),
		merge, reload, saveAs, container.NewHBox(layout.NewSpacer(), later)), u.win)
	dlg.Resize(fyne.NewSize(640, 330))
	dlg.Show()
	closeOnEscape(u.win, dlg)
}

// mergeWithDisk merges the window's edits with the file as it is now,
// three-way from the version the window last loaded or saved. Values that
// do not conflict merge by themselves; conflicts are put to the user.
func (u *App) mergeWithDisk() {
	d := u.doc
	theirs, id, err := trialfile.LoadIdentity(d.path)
	if err != nil {
		showMessage(u.win, "Could not merge", explain("The changed file "+filepath.Base(d.path)+" could not be read", err).forFile(d.path))
		return
	}
	merged, conflicts, err := trial.MergeValues(d.base, d.t, theirs)
	if err != nil {
		m := message{What: "The two versions cannot be merged value by value: " + plainMergeError(err) + ".",
			Do: "Choose File › Save again and load the file's version, or save yours under another name."}
		showMessage(u.win, "Could not merge", m)
		return
	}
	apply := func(m *trial.Trial) { u.applyMerge(m, theirs, id) }
	if len(conflicts) == 0 {
		apply(merged)
		return
	}
	u.showMergeChoices(merged, conflicts, "the file", apply, u.showConflict)
}

// plainMergeError is the reason of a merge error without the sentinel's
// words.
func plainMergeError(err error) string {
	s := err.Error()
	if errors.Is(err, trial.ErrNotMergeable) {
		p := trial.ErrNotMergeable.Error() + ": "
		if len(s) > len(p) && s[:len(p)] == p {
			s = s[len(p):]
		}
	}
	return s
}

// applyMerge makes merged the window's trial, as an undoable edit based
// on the file's version id (theirs): the autosave then writes it over
// exactly that version.
func (u *App) applyMerge(merged, theirs *trial.Trial, id trialfile.Identity) {
	d := u.doc
	u.saver.setKnown(d.path, id)
	d.disk, d.base, d.conflict = id, cloneTrial(theirs), false
	d.apply(&replaceTrial{what: "merge with the file", before: cloneTrial(d.t), after: merged, c: changeAll})
	u.status.SetText("Merged your changes with " + filepath.Base(d.path) + "; saving…")
}

// showMergeChoices lists the conflicts of a merge and lets the user keep,
// per value, the window's version or the other one (from). apply receives
// the merged trial with every choice made; cancel (may be nil) runs when
// the user backs out.
func (u *App) showMergeChoices(merged *trial.Trial, conflicts []trial.Conflict, from string,
	apply func(*trial.Trial), cancel func()) *mergeChoices {
	m := &mergeChoices{choice: make([]int, len(conflicts))}
	rows := container.NewVBox()
	var ok *widget.Button
	update := func() {
		for _, c := range m.choice {
			if c == 0 {
				ok.Disable()
				return
			}
		}
		ok.Enable()
	}
	for i, c := range conflicts {
		i := i
		mine, theirs := "Mine: "+conflictSide(merged, c, true), "In "+from+": "+conflictSide(merged, c, false)
		r := widget.NewRadioGroup([]string{mine, theirs}, func(s string) {
			switch s {
			case mine:
				m.choice[i] = 1
			case theirs:
				m.choice[i] = 2
			default:
				m.choice[i] = 0
			}
			update()
		})
		r.Horizontal = true
		m.radios = append(m.radios, r)
		head := widget.NewLabelWithStyle(conflictPlace(merged, c), fyne.TextAlignLeading, fyne.TextStyle{Bold: true})
		rows.Add(container.NewVBox(head, r))
	}
	var dlg *dialog.CustomDialog
	all := func(mine bool) {
		for _, r := range m.radios {
			r.SetSelected(r.Options[map[bool]int{true: 0, false: 1}[mine]])
		}
	}
	allMine := widget.NewButton("All mine", func() { all(true) })
	allTheirs := widget.NewButton("All from "+from, func() { all(false) })
	back := widget.NewButton("Cancel", func() {
		dlg.Hide()
		if cancel != nil {
			cancel()
		}
	})
	ok = widget.NewButton("Keep these", func() {
		out := cloneTrial(merged)
		for i, c := range conflicts {
			if err := trial.ApplyResolution(out, c, m.choice[i] == 1); err != nil {
				dlg.Hide()
				showError(u.win, "Could not merge", "The choice for "+conflictPlace(merged, c)+" could not be applied", err)
				return
			}
		}
		dlg.Hide()
		apply(out)
	})
	ok.Importance = widget.HighImportance
	ok.Disable()
	lead := widget.NewLabel(fmt.Sprintf("Everything else merged by itself. %s changed in both versions: choose which to keep for each.",
		plural(len(conflicts), "value was", "values were")))
	lead.Wrapping = fyne.TextWrapWord
	scroll := container.NewVScroll(rows)
	scroll.SetMinSize(fyne.NewSize(560, min(float32(len(conflicts))*78, 330)))
	dlg = dialog.NewCustomWithoutButtons("Choose between the two versions", container.NewBorder(lead,
		container.NewHBox(allMine, allTheirs, layout.NewSpacer(), back, ok), nil, nil, scroll), u.win)
	dlg.Resize(fyne.NewSize(660, 480))
	dlg.Show()
	closeOnEscape(u.win, dlg)
	m.ok, m.dlg = ok, dlg
	return m
}

// mergeChoices is the open merge dialog (tests drive it).
type mergeChoices struct {
	choice []int // per conflict: 0 none yet, 1 mine, 2 theirs
	radios []*widget.RadioGroup
	ok     *widget.Button
	dlg    *dialog.CustomDialog
}

// plural words a count: "1 value was", "3 values were".
func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

// conflictPlace names where a conflict is: plot and trait.
func conflictPlace(t *trial.Trial, c trial.Conflict) string {
	trait := c.Trait
	if tr := t.Trait(c.Trait); tr != nil {
		trait = tr.Name
		if tr.Unit != "" {
			trait += " (" + tr.Unit + ")"
		}
	}
	switch c.Kind {
	case trial.ConflictNote:
		return fmt.Sprintf("Plot %d · note", c.Plot)
	case trial.ConflictExclusion:
		if c.Trait == "" {
			return fmt.Sprintf("Plot %d · left out of every trait", c.Plot)
		}
		return fmt.Sprintf("Plot %d · left out of %s", c.Plot, trait)
	}
	s := fmt.Sprintf("Plot %d · %s", c.Plot, trait)
	if trial.IsMissing(c.Base) {
		return s + " · no value before"
	}
	return s + " · was " + conflictNumber(c.Base)
}

// conflictSide words one side of a conflict.
func conflictSide(t *trial.Trial, c trial.Conflict, mine bool) string {
	switch c.Kind {
	case trial.ConflictNote, trial.ConflictExclusion:
		s := c.TheirsText
		if mine {
			s = c.MineText
		}
		switch {
		case s == nil && c.Kind == trial.ConflictNote:
			return "no note"
		case s == nil:
			return "included"
		case c.Kind == trial.ConflictExclusion:
			return "left out (" + *s + ")"
		}
		return "“" + *s + "”"
	}
	v := c.Theirs
	if mine {
		v = c.Mine
	}
	if trial.IsMissing(v) {
		return "no value"
	}
	return conflictNumber(v)
}

func conflictNumber(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
