package ui

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// Options configure the window.
type Options struct {
	Version string // shown in the About dialog

	// autosaveDelay overrides the debounce of the background saver (tests).
	autosaveDelay time.Duration
	// pollEvery overrides how often the open file is checked for outside
	// changes (tests).
	pollEvery time.Duration
}

// autosaveDelay is the debounce of the background saver: every edit is
// written to the trial file (or, for a trial never saved, to its recovery
// copy) within this delay plus one write.
const autosaveDelay = 800 * time.Millisecond

// pollEvery is how often the open trial file is checked for changes made
// by another program.
const pollEvery = 2 * time.Second

// App is Furlong's window: the step navigator, the screens of each step and
// the open trial.
type App struct {
	app   fyne.App
	win   fyne.Window
	opts  Options
	prefs *prefs

	doc         *document
	saver       *saver
	recoveryDir string
	lastSaved   uint64 // document generation last written anywhere
	epoch       uint64 // of the newest document

	nav    *navigator
	body   *fyne.Container // holds the current screen
	status *widget.Label   // save state, under the navigator
	cur    stepID
	steps  [numSteps]stepView
	start  *startScreen

	compute *analyser
	menu    menuItems

	// series is the open trial series (series.go), nil when none; while
	// it is open it takes the whole window, and seriesPrev is the content
	// it replaced.
	series     *seriesView
	seriesPrev fyne.CanvasObject
	// seriesPost, when set, replaces fyne.Do for the series view's
	// background work (tests run it on their own goroutine).
	seriesPost func(func())

	// unsavedAsk is the overlay of the save-changes question while it is
	// open.
	unsavedAsk fyne.CanvasObject

	// saved, when set, receives every finished save (tests wait on it).
	saved func(j saveJob, err error)
	// outside, when set, receives every outside change the watcher
	// reported, once the window has dealt with it (tests).
	outside func()
	// watcherToUI, when set, replaces fyne.Do for the file watcher's calls
	// (tests: Fyne's test driver runs fyne.Do at once on the calling
	// goroutine, which would race with the test's own goroutine).
	watcherToUI func(func())
	// exported, when set, receives every finished export (tests).
	exported func(uri fyne.URI, err error)
	// folderShown, when set, receives the outcome of "Show the folder"
	// (tests).
	folderShown func(err error)
}

// stepView is the screen of one step.
type stepView interface {
	object() fyne.CanvasObject
	// refresh redraws after the document changed.
	refresh(c change)
}

// New builds the whole window content on w: menus, shortcuts and the start
// screen. a provides preferences and storage; the caller runs the app.
func New(a fyne.App, w fyne.Window, opts Options) *App {
	u := &App{app: a, win: w, opts: opts, prefs: loadPrefs(a.Preferences())}
	a.Settings().SetTheme(newTheme())
	u.recoveryDir = recoveryDir(a)
	delay := autosaveDelay
	if opts.autosaveDelay > 0 {
		delay = opts.autosaveDelay
	}
	u.saver = newSaver(delay, func(j saveJob, r saveResult) {
		fyne.Do(func() { u.onSaved(j, r) })
	})
	u.compute = newAnalyser(u)

	u.status = widget.NewLabel("")
	u.status.Wrapping = fyne.TextWrapWord
	u.status.Importance = widget.LowImportance
	u.nav = newNavigator(u.showStep)
	u.body = container.NewStack()
	u.start = newStartScreen(u)

	navBox := container.NewBorder(nil, u.status, nil, nil, u.nav.object())
	split := container.NewHSplit(navBox, u.body)
	split.Offset = 0.16
	w.SetContent(split)
	u.buildMenus()
	u.addShortcuts()
	w.SetCloseIntercept(u.onClose)
	w.Resize(fyne.NewSize(float32(u.prefs.windowWidth), float32(u.prefs.windowHeight)))
	u.showStart()
	return u
}

// recoveryDir returns the folder for recovery copies: the app's storage,
// or the user's configuration folder when the app has none.
func recoveryDir(a fyne.App) string {
	if st := a.Storage(); st != nil {
		if root := st.RootURI(); root != nil && root.Scheme() == "file" {
			return filepath.Join(root.Path(), "recovery")
		}
	}
	if dir, err := os.UserConfigDir(); err == nil {
		return filepath.Join(dir, "furlong", "recovery")
	}
	return filepath.Join(os.TempDir(), "furlong-recovery")
}

// recoveryPath is the recovery file of the trial at path. A trial never
// saved gets a file of its own per session (untitled-TIME.furlong), so that
// a second untitled trial never overwrites the recovery of a first.
func (u *App) recoveryPath(path string) string {
	if path == "" {
		return filepath.Join(u.recoveryDir, "untitled-"+time.Now().Format("20060102-150405.000000")+trialExt)
	}
	sum := sha256.Sum256([]byte(path))
	return filepath.Join(u.recoveryDir, hex.EncodeToString(sum[:8])+trialExt)
}

// newestUntitled returns the most recent recovery file of a trial never
// saved, or "".
func (u *App) newestUntitled() string {
	m, _ := filepath.Glob(filepath.Join(u.recoveryDir, "untitled-*"+trialExt))
	if len(m) == 0 {
		return ""
	}
	slices.Sort(m) // the names sort by time
	return m[len(m)-1]
}

// OpenTrial shows t, read from path ("" for a trial not yet saved). The
// file's identity is taken now; OpenFile passes the one it read.
func (u *App) OpenTrial(t *trial.Trial, path string) {
	var id trialfile.Identity
	if path != "" {
		id, _ = trialfile.Stat(path)
	}
	u.openDocument(t, path, id)
}

// openDocument shows t, read from path as the version id.
func (u *App) openDocument(t *trial.Trial, path string, id trialfile.Identity) {
	u.closeDocument()
	u.epoch++
	u.doc = newDocument(t, path)
	u.doc.epoch = u.epoch
	u.doc.recovery = u.recoveryPath(path)
	u.doc.onChange = u.onChange
	u.lastSaved = 0
	if path == "" {
		u.status.SetText("This trial has no file yet: changes are kept in a recovery copy until File › Save as….")
	} else {
		u.status.SetText("Every change is saved to " + filepath.Base(path) + " within two seconds.")
		u.doc.disk, u.doc.base = id, cloneTrial(t)
		u.saver.setKnown(path, id)
		u.markOpen(path)
		u.watch()
	}
	for i := range u.steps {
		u.steps[i] = nil
	}
	if path != "" {
		u.prefs.onFileOpened(path)
		u.prefs.onLastFolderChanged(filepath.Dir(path))
	}
	u.nav.setEnabled(true)
	u.onChange(changeAll)
	// Open on the suggested step, but never straight into an analysis: a
	// large trial would start computing before the user asked for it.
	u.showStep(min(u.suggestedStep(), stepRecord))
}

// closeDocument forgets the open trial after its last autosave is written,
// and removes its open-trial marker.
func (u *App) closeDocument() {
	if u.doc == nil {
		return
	}
	u.saver.sync()
	u.unwatch()
	u.doc.presence.Release()
	u.compute.cancel()
	u.doc = nil
}

// OpenFile opens the trial file at path. When a recovery copy holds edits
// the file lacks, the user is offered to restore them. A file that cannot
// be read is explained in a dialog, and the error returned.
func (u *App) OpenFile(path string) error {
	t, id, err := trialfile.LoadIdentity(path)
	if err != nil {
		showMessage(u.win, "Could not open the trial",
			explain("The trial file "+filepath.Base(path)+" could not be opened", err).forFile(path))
		return err
	}
	u.openDocument(t, path, id)
	u.offerRecovery(path)
	return nil
}

// openPath opens a file from the recent list or a dialog, first asking
// what to do with unsaved changes of the open trial; OpenFile shows any
// error. A file that no longer exists leaves the recent list.
func (u *App) openPath(path string) {
	u.leaveSeries(func() { u.leaveOpen("Open another", func() { u.openNow(path) }) })
}

func (u *App) openNow(path string) {
	if err := u.OpenFile(path); errors.Is(err, fs.ErrNotExist) {
		u.prefs.onRecentRemoved(path)
		u.updateMenus()
		if u.doc == nil {
			u.start.refresh()
		}
	}
}

// offerRecovery asks whether to restore a recovery copy of path that holds
// edits the file lacks (whatever the times of the two files say); for path
// "" the newest copy of a trial never saved.
func (u *App) offerRecovery(path string) {
	rec, ok := u.pendingRecovery(path)
	if !ok {
		return
	}
	msg := "Furlong kept changes to this trial from " + rec.when.Format("2 Jan 2006 15:04") +
		" that are not in the file (the program may have closed unexpectedly, or the file was changed by another program meanwhile)." +
		"\n\nRestore those changes? Values changed in the file since then are kept too."
	if path == "" {
		msg = "Furlong kept the trial “" + rec.t.Title + "” from " + rec.when.Format("2 Jan 2006 15:04") +
			", which was never saved to a file.\n\nOpen it again? (No discards it.)"
	}
	dialog.ShowConfirm("Unsaved changes found", msg, func(ok bool) {
		if ok {
			u.restore(path, rec)
		} else {
			removeRecovery(rec.path)
		}
	}, u.win)
}

// recovered is a recovery copy found on disk.
type recovered struct {
	path string
	t    *trial.Trial
	base *trial.Trial // the version it was edited from, or nil
	when time.Time
}

// pendingRecovery returns the recovery copy of path when it holds edits
// the file lacks: its content differs from the file's and from the
// version it was edited from. A copy with nothing to offer is removed.
// For a trial never saved it returns the newest such copy. path must be
// the open document's file (its content is compared).
func (u *App) pendingRecovery(path string) (recovered, bool) {
	rp := u.recoveryPath(path)
	if path == "" {
		if rp = u.newestUntitled(); rp == "" {
			return recovered{}, false
		}
	}
	rs, err := os.Stat(rp)
	if err != nil {
		return recovered{}, false
	}
	rt, err := loadFile(rp)
	if err != nil {
		return recovered{}, false
	}
	rec := recovered{path: rp, t: rt, when: rs.ModTime()}
	if path == "" {
		return rec, true
	}
	if bt, err := loadFile(rp + baseSuffix); err == nil {
		rec.base = bt
	}
	if (u.doc != nil && u.doc.path == path && sameContent(rt, u.doc.t)) ||
		(rec.base != nil && sameContent(rt, rec.base)) {
		removeRecovery(rp)
		return recovered{}, false
	}
	return rec, true
}

// sameContent reports whether a and b would be written as the same file.
func sameContent(a, b *trial.Trial) bool {
	var x, y bytes.Buffer
	if trialfile.Encode(&x, a) != nil || trialfile.Encode(&y, b) != nil {
		return false
	}
	return bytes.Equal(x.Bytes(), y.Bytes())
}

// restore brings back the recovery copy rec as an undoable edit. With the
// version it was edited from, it is merged with the file as it is now, so
// that values changed in the file meanwhile are kept too (conflicts are
// put to the user); without, the copy replaces the trial.
func (u *App) restore(path string, rec recovered) {
	if path == "" || u.doc == nil {
		u.OpenTrial(rec.t, "")
		u.doc.recovery = rec.path // keep writing to the same copy
		u.doc.edited(changeAll)
		return
	}
	apply := func(t *trial.Trial) {
		u.doc.apply(&replaceTrial{what: "restore", before: cloneTrial(u.doc.t), after: t, c: changeAll})
		u.status.SetText("Restored the changes kept in the recovery copy.")
	}
	if rec.base == nil {
		apply(rec.t)
		return
	}
	merged, conflicts, err := trial.MergeValues(rec.base, rec.t, u.doc.t)
	if err != nil {
		apply(rec.t) // cannot merge: the copy as it was; Undo brings the file's version back
		return
	}
	if len(conflicts) == 0 {
		apply(merged)
		return
	}
	u.showMergeChoices(merged, conflicts, "the file", func(m *trial.Trial) { apply(m) }, nil)
}

// OpenDemo opens the built-in demo trial as a new, unsaved trial.
// A failure is explained in a dialog, and the error returned.
func (u *App) OpenDemo() error {
	t, err := demoTrial()
	if err != nil {
		showError(u.win, "Could not open the demo", "The demo trial could not be opened", err)
		return err
	}
	u.OpenTrial(t, "")
	return nil
}

// newTrial starts an empty trial with the usual defaults, first asking
// what to do with unsaved changes of the open one.
func (u *App) newTrial() {
	u.leaveSeries(func() { u.leaveOpen("Start new", u.startNewTrial) })
}

// leaveOpen runs then, which replaces the open trial, once the user chose
// what to do with its unsaved changes (at once when there are none).
// The discard button is worded for the action ("Start new without
// saving").
func (u *App) leaveOpen(action string, then func()) {
	if u.doc == nil || !u.doc.dirty {
		then()
		return
	}
	u.askUnsaved(action, then)
}

// startNewTrial replaces the open trial with an empty one.
func (u *App) startNewTrial() {
	now := time.Now()
	t := &trial.Trial{
		Title:   "New trial",
		Season:  now.Format("2006"),
		Created: now,
		Design:  trial.Design{Kind: trial.RCBD, Reps: 4},
		Layout:  trial.DefaultLayout(),
	}
	u.OpenTrial(t, "")
	u.doc.edited(changeDetails)
	u.showStep(stepSetup)
}

// onChange runs after every edit: title, navigator, autosave, screens.
func (u *App) onChange(c change) {
	if u.doc == nil {
		return
	}
	u.updateTitle()
	u.nav.update(u.doc.t, u.suggestedStep())
	for _, s := range u.steps {
		if s != nil {
			s.refresh(c)
		}
	}
	u.updateMenus()
	// Background work starts once this edit's screen work is done.
	if c&(changeValues|changeStructure) != 0 {
		u.compute.dataChanged()
	}
	// The snapshot goes to the saver last, once this edit's screen work is
	// done.
	if u.doc.dirty && u.doc.gen != u.lastSaved {
		if u.doc.path != "" && !u.doc.conflict {
			u.status.SetText("Saving…")
		}
		u.saver.submit(u.job(false))
	}
}

// job is a save of the open trial as it is now: to its file, or only to
// the recovery copy when it has none or its file changed on disk.
func (u *App) job(explicit bool) saveJob {
	d := u.doc
	j := saveJob{snap: cloneTrial(d.t), recovery: d.recovery, gen: d.gen, epoch: d.epoch, explicit: explicit}
	if d.path != "" {
		j.base = d.base
		if !d.conflict {
			j.path = d.path
		}
	}
	return j
}

// onSaved runs on the UI goroutine after a write finished.
func (u *App) onSaved(j saveJob, r saveResult) {
	if u.saved != nil {
		defer u.saved(j, r.err)
	}
	d := u.doc
	if d == nil || j.epoch != d.epoch {
		return
	}
	now := time.Now().Format("15:04:05")
	if r.err == nil || r.toRecovery {
		u.lastSaved = max(u.lastSaved, j.gen)
	}
	switch {
	case r.err == nil && j.path != "":
		d.disk, d.base = r.id, j.snap
		if j.gen == d.gen {
			d.dirty = false
		}
		if j.explicit {
			u.status.SetText("Saved to " + filepath.Base(j.path) + " at " + now + ".")
		} else {
			u.status.SetText("Every change is saved to " + filepath.Base(j.path) + " (last at " + now + ").")
		}
		u.updateTitle()
	case r.err == nil && d.conflict:
		u.status.SetText("Changes kept in a recovery copy (" + now + "): " + filepath.Base(d.path) +
			" was changed elsewhere. File › Save to decide.")
	case r.err == nil:
		u.status.SetText("Changes kept in a recovery copy at " + now + "; the trial has no file yet: choose File › Save as… to make one.")
	case errors.Is(r.err, trialfile.ErrChangedOnDisk):
		u.changedOnDisk(j.explicit)
	default:
		kept := ""
		if r.toRecovery {
			kept = " Your changes are kept in a recovery copy meanwhile."
		}
		u.status.SetText("Could not save to " + filepath.Base(j.path) + " (" + now + ")." + kept)
		if j.explicit {
			showError(u.win, "Could not save", "The trial could not be saved to "+j.path, r.err)
		}
	}
}

func (u *App) updateTitle() {
	title := "Furlong"
	if u.doc != nil {
		name := u.doc.t.Title
		if name == "" {
			name = "Untitled trial"
		}
		title += " — " + name
		if u.doc.dirty {
			title += " •"
		}
	}
	u.win.SetTitle(title)
}

// showStart shows the start screen (no trial open).
func (u *App) showStart() {
	u.nav.setEnabled(u.doc != nil)
	u.start.refresh()
	u.body.Objects = []fyne.CanvasObject{u.start.object()}
	u.body.Refresh()
	u.updateTitle()
	u.updateMenus()
	if u.doc == nil {
		u.offerRecovery("")
	}
}

// showStep shows one step's screen, building it on first use.
func (u *App) showStep(s stepID) {
	if u.doc == nil {
		u.showStart()
		return
	}
	if u.steps[s] == nil {
		u.steps[s] = u.buildStep(s)
	}
	u.cur = s
	u.nav.next = u.suggestedStep()
	u.nav.setCurrent(s)
	u.body.Objects = []fyne.CanvasObject{u.steps[s].object()}
	u.body.Refresh()
	// Analyses run only while a screen shows them; typing in Record does
	// not compete with them for the processor.
	if s == stepCompare || s == stepReport {
		u.compute.visible()
	} else {
		u.compute.active = false
	}
}

func (u *App) buildStep(s stepID) stepView {
	switch s {
	case stepSetup:
		return newSetupStep(u)
	case stepField:
		return newFieldStep(u)
	case stepRecord:
		return newRecordStep(u)
	case stepCompare:
		return newCompareStep(u)
	default:
		return newReportStep(u)
	}
}

// nearlyComplete is the share of expected values entered from which the
// analysis is worth looking at: a few plots are often never harvested, and
// the analysis copes with them (the statistics package handles missing
// plots), so Compare is suggested from here rather than at 100 %.
const nearlyComplete = 0.95

// suggestedStep is the next sensible step for the open trial: Setup until
// it has a title, two treatments and a trait; Field until the plots are
// laid out and randomised; Record while less than nearlyComplete of the
// values are entered; then Compare, and Report once the user compares.
func (u *App) suggestedStep() stepID {
	t := u.doc.t
	if len(t.Treatments) < 2 || len(t.Traits) == 0 || strings.TrimSpace(t.Title) == "" {
		return stepSetup
	}
	if len(t.Plots) == 0 || (!t.Randomized() && !t.HasData()) {
		return stepField
	}
	filled, total := dataProgress(t)
	if total == 0 || float64(filled) < nearlyComplete*float64(total) {
		return stepRecord
	}
	if u.cur == stepCompare || u.cur == stepReport {
		return stepReport
	}
	return stepCompare
}

// dataProgress counts the stored values entered and expected (derived
// traits are computed, not entered).
func dataProgress(t *trial.Trial) (filled, total int) {
	s := t.Summary()
	return s.Entered, s.Cells
}

// excludedPlots counts plots left out of at least one trait.
func excludedPlots(t *trial.Trial) int { return t.Summary().ExcludedPlots }

// onClose never discards changes silently.
func (u *App) onClose() {
	if u.series != nil && u.series.dirty {
		u.leaveSeries(u.onClose)
		return
	}
	if u.doc == nil || !u.doc.dirty {
		u.quit()
		return
	}
	u.askUnsaved("Quit", u.quit)
}

// askUnsaved asks what to do with unsaved changes before then runs (quit,
// or close the trial): save first, drop them on an explicit choice, or
// cancel. Nothing is discarded without that choice. action words the
// discard button ("Quit" gives "Quit without saving"). While the question
// is open a second request (Ctrl+Q again) is ignored rather than stacked.
func (u *App) askUnsaved(action string, then func()) {
	if u.doc.path != "" && !u.doc.conflict {
		// Only the autosave is pending: write it now (checked like every
		// save; a refusal shows what to do and then does not run).
		u.saveTo(u.doc.path, then)
		return
	}
	if u.unsavedAsk != nil && slices.Contains(u.win.Canvas().Overlays().List(), u.unsavedAsk) {
		return
	}
	var d dialog.Dialog
	save := widget.NewButton("Save", func() {
		d.Hide()
		u.save(false, then)
	})
	save.Importance = widget.HighImportance
	discard := widget.NewButton(action+" without saving", func() {
		d.Hide()
		u.saver.discardPending()
		removeRecovery(u.doc.recovery)
		u.doc.dirty = false
		then()
	})
	cancel := widget.NewButton("Cancel", func() { d.Hide() })
	text := widget.NewLabel("The trial “" + u.doc.t.Title + "” has changes that are not saved to its file.")
	text.Wrapping = fyne.TextWrapWord
	d = dialog.NewCustomWithoutButtons("Save changes?", container.NewVBox(text,
		container.NewHBox(cancel, discard, save)), u.win)
	d.Resize(fyne.NewSize(460, 180))
	d.SetOnClosed(func() { u.unsavedAsk = nil })
	d.Show()
	u.unsavedAsk = u.win.Canvas().Overlays().Top()
	closeOnEscape(u.win, d)
}

// quit writes what is pending, remembers the window size and closes.
func (u *App) quit() {
	u.prefs.onWindowSizeChanged(u.win.Canvas().Size())
	u.saver.stop()
	if u.doc != nil {
		u.unwatch()
		u.doc.presence.Release()
	}
	u.compute.cancel()
	u.win.Close()
}
