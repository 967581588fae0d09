package ui

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// A window edit kept only in the recovery copy (the file had changed on
// disk, so the window wrote nothing over it) is offered again after a
// crash although the file is newer than the copy, and restoring it keeps
// the outside change too (issue 12: compare content, not times).
func TestRecoveryAfterCrash(t *testing.T) {
	u, _ := newTestApp(t, 0)
	path := filepath.Join(t.TempDir(), "strip.furlong")
	u.OpenTrial(smallTrial(t), "")
	u.saveTo(path, nil)
	// Another program writes plot 6's yield.
	if err := trialfile.Update(context.Background(), path, func(tr *trial.Trial) error {
		tr.Traits[0].Values[5] = 6.5
		return nil
	}); err != nil {
		t.Fatal(err)
	}
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	r.table.Select(widget.TableCellID{Row: 0, Col: fixedCols})
	enter(r, "4.5")
	u.saver.sync() // the checked save refuses; the edit goes to the recovery copy
	if !u.doc.conflict {
		t.Fatal("the window did not notice that the file changed")
	}
	if ft, _ := loadFile(path); !sameValue(ft.Traits[0].Values[0], nan()) || ft.Traits[0].Values[5] != 6.5 {
		t.Fatal("the window wrote over the changed file")
	}
	// The recovery copy is older than the file: times must not decide.
	old := time.Now().Add(-time.Hour)
	if err := os.Chtimes(u.doc.recovery, old, old); err != nil {
		t.Fatal(err)
	}
	// ... and the window is killed here.

	u2, w2 := newTestApp(t, 0)
	u2.recoveryDir = u.recoveryDir
	if err := u2.OpenFile(path); err != nil {
		t.Fatal(err)
	}
	if w2.Canvas().Overlays().Top() == nil {
		t.Fatal("no dialog offers the edit kept in the recovery copy")
	}
	rec, ok := u2.pendingRecovery(path)
	if !ok {
		t.Fatal("the recovery copy is not offered")
	}
	u2.restore(path, rec)
	got := u2.doc.t.Traits[0].Values
	if got[0] != 4.5 || got[5] != 6.5 || !u2.doc.dirty {
		t.Fatalf("restored values %v / %v, dirty %v; want both edits", got[0], got[5], u2.doc.dirty)
	}
	u2.undo()
	if !sameValue(u2.doc.t.Traits[0].Values[0], nan()) {
		t.Fatal("the restore cannot be undone")
	}
	u2.redo()
	u2.saveTo(path, nil)
	if ft, _ := loadFile(path); ft.Traits[0].Values[0] != 4.5 || ft.Traits[0].Values[5] != 6.5 {
		t.Fatalf("file after saving the restore holds %v", ft.Traits[0].Values[:6])
	}
	// Saved: nothing is offered any more.
	if _, ok := u2.pendingRecovery(path); ok {
		t.Fatal("a recovery copy is still offered after saving")
	}
}

// A recovery copy with the same content as the file offers nothing, and
// is removed, whatever its time.
func TestRecoveryIdenticalNotOffered(t *testing.T) {
	u, w := newTestApp(t, 0)
	path := filepath.Join(t.TempDir(), "strip.furlong")
	tr := smallTrial(t)
	if err := saveFile(path, tr); err != nil {
		t.Fatal(err)
	}
	rp := u.recoveryPath(path)
	if err := os.MkdirAll(filepath.Dir(rp), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := saveFile(rp, tr); err != nil {
		t.Fatal(err)
	}
	future := time.Now().Add(time.Hour)
	os.Chtimes(rp, future, future)
	if err := u.OpenFile(path); err != nil {
		t.Fatal(err)
	}
	if w.Canvas().Overlays().Top() != nil {
		t.Fatal("an identical recovery copy is offered")
	}
	if _, err := os.Stat(rp); err == nil {
		t.Fatal("the identical recovery copy is left behind")
	}
}

// Closing with unsaved changes asks first; nothing is discarded silently.
func TestCloseAsks(t *testing.T) {
	u, w := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.doc.edited(changeDetails)
	u.onClose()
	if w.Canvas().Overlays().Top() == nil {
		t.Fatal("closing with unsaved changes did not ask")
	}
	if u.doc == nil || !u.doc.dirty {
		t.Fatal("the unsaved trial was dropped")
	}
	// File > Close trial asks the same way.
	w.Canvas().Overlays().Top().Hide()
	u.closeTrial()
	if w.Canvas().Overlays().Top() == nil || u.doc == nil {
		t.Fatal("closing the trial with unsaved changes did not ask")
	}
}

// Preferences: one key per setting, read back by a fresh load.
func TestPrefs(t *testing.T) {
	u, _ := newTestApp(t, 0)
	p := u.prefs
	p.onAlphaChanged(0.01)
	p.onMethodChanged("tukey")
	p.onUnitsChanged(unitsImperial)
	for _, f := range []string{"/a/1.furlong", "/a/2.furlong", "/a/1.furlong"} {
		p.onFileOpened(f)
	}
	q := loadPrefs(p.store)
	if q.alpha != 0.01 || q.method != "tukey" || q.units != unitsImperial {
		t.Errorf("reloaded %+v", q)
	}
	if len(q.recent) != 2 || q.recent[0] != "/a/1.furlong" {
		t.Errorf("recent files %v", q.recent)
	}
}

// A bad file never crashes the window: it is explained in plain words.
func TestBadFiles(t *testing.T) {
	dir := t.TempDir()
	for _, c := range []struct{ name, data, want string }{
		{"garbage.furlong", "\x00\x01 not json", "not a Furlong trial file"},
		{"damaged.furlong", `{"format": "furlong-trial", "version": 1, "trial": {"title": "x",, "crop": "y"}}`, "damaged"},
		{"cut.furlong", `{"format": "furlong-trial", "version": 1, "trial": {"title": "x"`, "ends in the middle"},
		{"other.furlong", `{"hello": "world"}`, "not a Furlong trial file"},
	} {
		path := filepath.Join(dir, c.name)
		if err := os.WriteFile(path, []byte(c.data), 0o644); err != nil {
			t.Fatal(err)
		}
		u, w := newTestApp(t, 0)
		err := u.OpenFile(path)
		if err == nil {
			t.Fatalf("%s opened", c.name)
		}
		if u.doc != nil || w.Canvas().Overlays().Top() == nil {
			t.Errorf("%s: no dialog, or a trial open", c.name)
		}
		m := explain("The trial file could not be opened", err)
		if !strings.Contains(m.What, c.want) || m.Do == "" {
			t.Errorf("%s: message %q / %q, want it to say %q", c.name, m.What, m.Do, c.want)
		}
	}
	u, _ := newTestApp(t, 0)
	if err := u.OpenFile(filepath.Join(dir, "missing.furlong")); err == nil ||
		!strings.Contains(explain("x", err).What, "does not exist") {
		t.Errorf("missing file: %v", err)
	}
}

// A trial never saved is offered back on the start screen of the next
// session, and a second untitled trial does not overwrite its copy.
func TestUntitledRecovery(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.doc.t.Title = "First"
	u.doc.edited(changeDetails)
	u.saver.sync()
	first := u.doc.recovery
	u.OpenTrial(smallTrial(t), "")
	u.doc.edited(changeDetails)
	u.saver.sync()
	if u.doc.recovery == first {
		t.Fatal("two untitled trials share a recovery file")
	}
	if rt, err := loadFile(first); err != nil || rt.Title != "First" {
		t.Fatalf("the first recovery copy was lost: %v", err)
	}
	u2, w2 := newTestApp(t, 0)
	u2.recoveryDir = u.recoveryDir
	u2.showStart()
	if w2.Canvas().Overlays().Top() == nil {
		t.Fatal("the start screen does not offer the unsaved trial")
	}
}

// The window takes its remembered size; the first-run size fits a
// 1366 × 768 laptop screen (the smallest screen issue 5 names).
func TestWindowSize(t *testing.T) {
	a := test.NewTempApp(t)
	w := test.NewTempWindow(t, widget.NewLabel(""))
	u := New(a, w, Options{autosaveDelay: time.Hour})
	t.Cleanup(u.saver.stop)
	if s := w.Canvas().Size(); s.Width > 1366 || s.Height > 768-48 || s.Width < 1000 {
		t.Errorf("first-run size %v does not fit 1366×768 with a title bar", s)
	}
	a.Preferences().SetFloat(keyWindowWidth, 1500)
	a.Preferences().SetFloat(keyWindowHeight, 900)
	w2 := test.NewTempWindow(t, widget.NewLabel(""))
	u2 := New(a, w2, Options{autosaveDelay: time.Hour})
	t.Cleanup(u2.saver.stop)
	if s := w2.Canvas().Size(); s.Width != 1500 || s.Height != 900 {
		t.Errorf("remembered size not applied: %v", s)
	}
}

// A recent file that was moved away is explained and leaves the list.
func TestRecentMissing(t *testing.T) {
	u, w := newTestApp(t, 0)
	gone := filepath.Join(t.TempDir(), "moved.furlong")
	u.prefs.onFileOpened(gone)
	u.showStart()
	u.openPath(gone)
	if w.Canvas().Overlays().Top() == nil {
		t.Error("no dialog for a missing recent file")
	}
	if len(u.prefs.recent) != 0 {
		t.Errorf("recent list still holds %v", u.prefs.recent)
	}
}
