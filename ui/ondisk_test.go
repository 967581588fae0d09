package ui

import (
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"fyne.io/fyne/v2/widget"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// savedTrial opens smallTrial in u, saved to a fresh file, and returns its
// path. Nothing is dirty afterwards.
func savedTrial(t *testing.T, u *App) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "strip.furlong")
	u.OpenTrial(smallTrial(t), "")
	u.saveTo(path, nil)
	if u.doc.dirty || u.doc.path != path {
		t.Fatalf("not saved: dirty %v, path %q", u.doc.dirty, u.doc.path)
	}
	return path
}

// outsideWrite changes the file as another program would (the CLI import
// runs the same trialfile.Update): it sets the yield of the given plot
// indices.
func outsideWrite(t *testing.T, path string, values map[int]float64) {
	t.Helper()
	if err := trialfile.Update(context.Background(), path, func(tr *trial.Trial) error {
		for i, v := range values {
			tr.Traits[0].Values[i] = v
		}
		return nil
	}); err != nil {
		t.Fatal(err)
	}
}

// typeValue enters a yield in the Record grid, as the user does.
func typeValue(t *testing.T, u *App, plot int, text string) {
	t.Helper()
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	r.table.Select(widget.TableCellID{Row: plot, Col: fixedCols})
	enter(r, text)
}

// fileYield reads the yield values on disk.
func fileYield(t *testing.T, path string) []float64 {
	t.Helper()
	ft, err := loadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return ft.Traits[0].Values
}

// watchNow makes the watcher of u look every few milliseconds and returns
// a channel of its calls to the window, which waitFor runs on the test's
// goroutine, as the real driver runs them on the UI goroutine (Fyne's test
// driver would run them on the watcher's goroutine, racing with the test).
func watchNow(u *App) chan func() {
	ch := make(chan func(), 8)
	u.watcherToUI = func(f func()) {
		select {
		case ch <- f:
		default: // the watcher keeps reporting a lasting change; one is enough
		}
	}
	u.opts.pollEvery = 20 * time.Millisecond
	u.unwatch()
	u.watch()
	return ch
}

// waitFor runs the watcher's first call to the window.
func waitFor(t *testing.T, ch chan func(), what string) {
	t.Helper()
	select {
	case f := <-ch:
		f()
	case <-time.After(10 * time.Second):
		t.Fatalf("%s: nothing within 10 s", what)
	}
}

// The file changed by another program while the window has no unsaved
// edits: the window notices within a few polls, loads it by itself and
// says so; it writes nothing (issue 12, section 1).
func TestOutsideChangeReloads(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := savedTrial(t, u)
	seen := watchNow(u)
	outsideWrite(t, path, map[int]float64{4: 7.5})
	before, _ := trialfile.Stat(path)
	waitFor(t, seen, "outside change")
	if got := u.doc.t.Traits[0].Values[4]; got != 7.5 {
		t.Fatalf("window shows %v after the outside change, want 7.5", got)
	}
	if u.doc.dirty || w.Canvas().Overlays().Top() != nil {
		t.Errorf("dirty %v, dialog %v: a reload without edits asks nothing", u.doc.dirty, w.Canvas().Overlays().Top() != nil)
	}
	if s := u.status.Text; !strings.Contains(s, "changed by another program") || !strings.Contains(s, "loaded the new version") {
		t.Errorf("status %q does not say what happened", s)
	}
	u.saver.sync()
	if after, _ := trialfile.Stat(path); !after.Same(before) {
		t.Error("the reload wrote the file")
	}
	// The next edit is saved over the new version, keeping its value.
	typeValue(t, u, 0, "3.25")
	u.save(false, nil)
	if v := fileYield(t, path); v[0] != 3.25 || v[4] != 7.5 {
		t.Fatalf("file holds %v, %v", v[0], v[4])
	}
}

// With unsaved edits, an outside change is put to the user; nothing is
// written over the file.
func TestOutsideChangeWithEditsAsks(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := savedTrial(t, u)
	typeValue(t, u, 0, "4.5") // waits for the (hour-long) autosave
	seen := watchNow(u)
	outsideWrite(t, path, map[int]float64{4: 7.5})
	waitFor(t, seen, "outside change")
	if !u.doc.conflict || w.Canvas().Overlays().Top() == nil {
		t.Fatal("the change was not put to the user")
	}
	dialogButton(t, w, "Keep both") // the three ways out are offered
	dialogButton(t, w, "Load the file's version")
	dialogButton(t, w, "Save mine as…")
	u.saver.sync()
	if v := fileYield(t, path); !sameValue(v[0], nan()) || v[4] != 7.5 {
		t.Fatalf("the file was written over: %v", v[:5])
	}
	// Loading the file's version drops the edit; Undo brings it back.
	dialogButton(t, w, "Load the file's version").OnTapped()
	if !sameValue(u.doc.t.Traits[0].Values[0], nan()) || u.doc.t.Traits[0].Values[4] != 7.5 || u.doc.conflict {
		t.Fatalf("after loading: %v, %v, conflict %v", u.doc.t.Traits[0].Values[0], u.doc.t.Traits[0].Values[4], u.doc.conflict)
	}
	u.undo()
	if u.doc.t.Traits[0].Values[0] != 4.5 {
		t.Fatal("Undo does not bring the dropped edit back")
	}
}

// The case measured in issue 12: a trial open in the window, an import
// writes 12 values into the file, the user types one value and presses
// Ctrl+S. Nothing is lost: the save is refused, "Keep both" merges, and
// the file ends with all 13 values (the window had no other edits, so
// there is no conflict to choose).
func TestImportWhileOpenNothingLost(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := savedTrial(t, u)
	imported := map[int]float64{}
	for i := 1; i <= 12 && i < len(u.doc.t.Plots); i++ {
		imported[i%len(u.doc.t.Plots)] = 5 + float64(i)/10
	}
	if len(imported) < 11 {
		t.Fatalf("trial too small: %d plots", len(u.doc.t.Plots))
	}
	outsideWrite(t, path, imported)
	typeValue(t, u, 0, "4.75")
	menuShortcut(t, w, scSave)
	if !u.doc.conflict {
		t.Fatal("Ctrl+S wrote over the imported values")
	}
	dialogButton(t, w, "Keep both").OnTapped()
	if w.Canvas().Overlays().Top() != nil {
		t.Fatal("a merge without conflicts still asks")
	}
	u.saver.sync()
	v := fileYield(t, path)
	if v[0] != 4.75 {
		t.Errorf("the typed value is lost: %v", v[0])
	}
	for i, want := range imported {
		if v[i] != want {
			t.Errorf("imported value of plot index %d: %v, want %v", i, v[i], want)
		}
	}
	if u.doc.dirty || u.doc.conflict {
		t.Errorf("after the merge: dirty %v, conflict %v", u.doc.dirty, u.doc.conflict)
	}
}

// Both changed the same values: the merge dialog lists them and the user
// chooses per value; values changed on one side only merge by themselves.
func TestMergeConflictsChosenPerValue(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := savedTrial(t, u)
	outsideWrite(t, path, map[int]float64{0: 6, 1: 6.5, 7: 8})
	typeValue(t, u, 0, "4")   // conflict: keep the file's 6
	typeValue(t, u, 1, "5.5") // conflict: keep mine
	typeValue(t, u, 2, "3")   // mine only
	u.save(false, nil)
	dialogButton(t, w, "Keep both").OnTapped()
	var radios []*widget.RadioGroup
	for _, o := range overlayWidgets(t, w) {
		if r, ok := o.(*widget.RadioGroup); ok {
			radios = append(radios, r)
		}
	}
	if len(radios) != 2 {
		t.Fatalf("%d choices listed, want 2", len(radios))
	}
	keep := dialogButton(t, w, "Keep these")
	if !keep.Disabled() {
		t.Error("the merge can be applied before every value is chosen")
	}
	for _, r := range radios {
		if !strings.HasPrefix(r.Options[0], "Mine: ") || !strings.HasPrefix(r.Options[1], "In the file: ") {
			t.Fatalf("choices %v", r.Options)
		}
	}
	// Conflicts come in plot order: plot index 0 first.
	if !strings.Contains(radios[0].Options[0], "4") || !strings.Contains(radios[0].Options[1], "6") {
		t.Fatalf("first conflict %v", radios[0].Options)
	}
	radios[0].SetSelected(radios[0].Options[1])
	radios[1].SetSelected(radios[1].Options[0])
	if keep.Disabled() {
		t.Fatal("every value chosen, still disabled")
	}
	keep.OnTapped()
	u.saver.sync()
	v := fileYield(t, path)
	if v[0] != 6 || v[1] != 5.5 || v[2] != 3 || v[7] != 8 {
		t.Fatalf("file after the merge %v", v[:8])
	}
	if u.doc.t.Traits[0].Values[0] != 6 {
		t.Fatal("the window does not show the merged trial")
	}
}

// "Save mine as…" writes the window's version to a new file and leaves
// the changed one as the other program wrote it.
func TestSaveMineAs(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := savedTrial(t, u)
	outsideWrite(t, path, map[int]float64{0: 6})
	typeValue(t, u, 0, "4")
	u.save(false, nil)
	u.prefs.lastFolder = filepath.Dir(path)
	dialogButton(t, w, "Save mine as…").OnTapped()
	var name *widget.Entry
	for _, o := range overlayWidgets(t, w) {
		if e, ok := o.(*widget.Entry); ok && e.PlaceHolder == "a file name, or a full path" {
			name = e
		}
	}
	if name == nil {
		t.Fatal("no file chooser")
	}
	name.SetText("strip-mine")
	name.OnSubmitted(name.Text)
	other := filepath.Join(filepath.Dir(path), "strip-mine.furlong")
	if v := fileYield(t, other); v[0] != 4 {
		t.Fatalf("the new file holds %v", v[0])
	}
	if v := fileYield(t, path); v[0] != 6 {
		t.Fatalf("the changed file was touched: %v", v[0])
	}
	if u.doc.path != other || u.doc.conflict || u.doc.dirty {
		t.Errorf("path %q, conflict %v, dirty %v", u.doc.path, u.doc.conflict, u.doc.dirty)
	}
}

// Autosave writes the trial file itself within two seconds of an edit
// (the README's promise), atomically through the checked save, and says
// so; no recovery copy is left.
func TestAutosaveWritesTrialFile(t *testing.T) {
	u, _ := newTestApp(t, 300*time.Millisecond)
	path := savedTrial(t, u)
	saved := make(chan struct{})
	u.saved = func(j saveJob, err error) {
		if err == nil && j.path == path && j.gen == u.doc.gen {
			u.saved = nil
			close(saved)
		}
	}
	start := time.Now()
	u.doc.apply(&setValue{trait: 0, plot: 3, old: u.doc.t.Traits[0].Values[3], new: 7.25})
	select {
	case <-saved:
	case <-time.After(2 * time.Second):
		t.Fatal("the edit was not in the trial file within 2 s")
	}
	t.Logf("edit in the trial file after %v", time.Since(start))
	if v := fileYield(t, path); v[3] != 7.25 {
		t.Fatalf("file holds %v", v[3])
	}
	if u.doc.dirty || !strings.Contains(u.status.Text, "saved to strip.furlong") {
		t.Errorf("dirty %v, status %q", u.doc.dirty, u.status.Text)
	}
	if _, err := os.Stat(u.doc.recovery); err == nil {
		t.Error("a recovery copy is left although the file holds the edit")
	}
}

// writeMarker writes another window's open-trial marker beside path, in
// the marker's JSON form.
func writeMarker(t *testing.T, path, host string, since time.Time) {
	t.Helper()
	data, _ := json.Marshal(map[string]any{"app": "Furlong 1.0", "user": "agronomist", "host": host,
		"pid": 4242, "since": since.UTC().Format(time.RFC3339Nano)})
	marker := filepath.Join(filepath.Dir(path), "."+filepath.Base(path)+".open")
	if err := os.WriteFile(marker, data, 0o644); err != nil {
		t.Fatal(err)
	}
}

// The window marks the trial open while it shows it and removes the
// marker on close; another window's fresh marker is named in a warning
// (the trial opens anyway); a stale one is taken over with a note.
func TestPresenceMarker(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := savedTrial(t, u)
	if p, err := trialfile.ReadPresence(path); err != nil || p == nil || !p.Mine {
		t.Fatalf("no marker of this window: %v, %v", p, err)
	}
	u.closeTrial()
	if p, _ := trialfile.ReadPresence(path); p != nil {
		t.Fatalf("the marker stays after closing: %+v", p)
	}

	writeMarker(t, path, "field-laptop-2", time.Now().Add(-time.Hour))
	if err := u.OpenFile(path); err != nil {
		t.Fatal(err)
	}
	var warned bool
	for _, o := range overlayWidgets(t, w) {
		if l, ok := o.(*widget.Label); ok && strings.Contains(l.Text, "agronomist on the computer field-laptop-2") {
			warned = true
		}
	}
	if !warned || u.doc == nil {
		t.Fatalf("no warning naming who has it open (open: %v)", u.doc != nil)
	}
	w.Canvas().Overlays().Top().Hide()
	u.closeTrial()
	if p, _ := trialfile.ReadPresence(path); p == nil || p.Host != "field-laptop-2" {
		t.Fatalf("closing removed the other window's marker: %+v", p)
	}

	writeMarker(t, path, "field-laptop-2", time.Now().Add(-50*time.Hour))
	if err := u.OpenFile(path); err != nil {
		t.Fatal(err)
	}
	if w.Canvas().Overlays().Top() != nil {
		t.Error("a stale marker raised a warning")
	}
	if !strings.Contains(u.status.Text, "Took over an old open-trial marker") {
		t.Errorf("status %q does not note the stale marker", u.status.Text)
	}
}

// A trial file removed while open is noticed; the window keeps the trial
// and writes it again where it was once the user says so.
func TestFileRemovedWhileOpen(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := savedTrial(t, u)
	typeValue(t, u, 0, "4.5")
	seen := watchNow(u)
	if err := os.Remove(path); err != nil {
		t.Fatal(err)
	}
	waitFor(t, seen, "removed file")
	u.saver.sync()
	if _, err := os.Stat(path); err == nil {
		t.Fatal("the removed file was written back without asking")
	}
	if rt, err := loadFile(u.doc.recovery); err != nil || rt.Traits[0].Values[0] != 4.5 {
		t.Fatalf("the trial is not in the recovery copy: %v", err)
	}
	dialogButton(t, w, "Save it again there").OnTapped()
	if v := fileYield(t, path); v[0] != 4.5 {
		t.Fatalf("saved again with %v", v[0])
	}
	if u.doc.conflict || u.doc.dirty {
		t.Errorf("conflict %v, dirty %v", u.doc.conflict, u.doc.dirty)
	}
}

// Restoring a recovery copy whose value the file also changed puts the
// two to the user, the file's version named as such.
func TestRecoveryRestoreConflict(t *testing.T) {
	u, _ := newTestApp(t, 0)
	path := savedTrial(t, u)
	outsideWrite(t, path, map[int]float64{0: 6})
	typeValue(t, u, 0, "4.5")
	u.saver.sync() // refused: the edit is in the recovery copy only
	u2, w2 := newTestApp(t, 0)
	u2.recoveryDir = u.recoveryDir
	if err := u2.OpenFile(path); err != nil {
		t.Fatal(err)
	}
	w2.Canvas().Overlays().Top().Hide() // the offer; restore as "Yes" does
	rec, ok := u2.pendingRecovery(path)
	if !ok {
		t.Fatal("not offered")
	}
	u2.restore(path, rec)
	var radios []*widget.RadioGroup
	for _, o := range overlayWidgets(t, w2) {
		if r, ok := o.(*widget.RadioGroup); ok {
			radios = append(radios, r)
		}
	}
	if len(radios) != 1 || radios[0].Options[0] != "Mine: 4.5" || radios[0].Options[1] != "In the file: 6" {
		t.Fatalf("choices %v", radios)
	}
	radios[0].SetSelected(radios[0].Options[0])
	dialogButton(t, w2, "Keep these").OnTapped()
	if got := u2.doc.t.Traits[0].Values[0]; got != 4.5 {
		t.Fatalf("restored %v", got)
	}
}

// Closing a trial that has a file while its autosave is still pending
// writes it and asks nothing; with the file changed on disk it asks.
func TestCloseWritesPendingAutosave(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := savedTrial(t, u)
	typeValue(t, u, 0, "4.5")
	u.closeTrial()
	if u.doc != nil || w.Canvas().Overlays().Top() != nil {
		t.Fatal("closing asked although the edit could simply be saved")
	}
	if v := fileYield(t, path); v[0] != 4.5 {
		t.Fatalf("file holds %v", v[0])
	}
	if err := u.OpenFile(path); err != nil {
		t.Fatal(err)
	}
	outsideWrite(t, path, map[int]float64{0: 6})
	typeValue(t, u, 0, "5")
	u.closeTrial()
	if u.doc == nil || w.Canvas().Overlays().Top() == nil {
		t.Fatal("closed over a changed file without asking")
	}
	if v := fileYield(t, path); v[0] != 6 {
		t.Fatalf("file holds %v", v[0])
	}
}
