package ui

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/widget"
)

// menuShortcut runs the main-menu item bound to sh, as Fyne's desktop
// driver does for a key press (it matches the shortcut's name against the
// menu items before anything else).
func menuShortcut(t *testing.T, w fyne.Window, sh fyne.Shortcut) {
	t.Helper()
	var find func(items []*fyne.MenuItem) *fyne.MenuItem
	find = func(items []*fyne.MenuItem) *fyne.MenuItem {
		for _, i := range items {
			if i.Shortcut != nil && i.Shortcut.ShortcutName() == sh.ShortcutName() {
				return i
			}
			if i.ChildMenu != nil {
				if f := find(i.ChildMenu.Items); f != nil {
					return f
				}
			}
		}
		return nil
	}
	for _, m := range w.MainMenu().Items {
		if i := find(m.Items); i != nil {
			i.Action()
			return
		}
	}
	t.Fatalf("no menu item answers %s", sh.ShortcutName())
}

// Ctrl+Z and Ctrl+Y reach the window as Fyne's Undo and Redo shortcuts
// (the desktop driver never makes custom shortcuts of them; fyne.io/fyne/v2
// internal/driver/glfw/window.go, triggersShortcut), so the Edit menu must
// answer those.
func TestUndoRedoKeys(t *testing.T) {
	u, w := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	r.table.Select(widget.TableCellID{Row: 0, Col: fixedCols})
	enter(r, "4.5")
	if got := u.doc.t.Traits[0].Values[0]; got != 4.5 {
		t.Fatalf("value entered %v, want 4.5", got)
	}
	menuShortcut(t, w, &fyne.ShortcutUndo{})
	if got := u.doc.t.Traits[0].Values[0]; !sameValue(got, nan()) {
		t.Fatalf("after Ctrl+Z the value is %v, want missing", got)
	}
	menuShortcut(t, w, &fyne.ShortcutRedo{})
	if got := u.doc.t.Traits[0].Values[0]; got != 4.5 {
		t.Fatalf("after Ctrl+Y the value is %v, want 4.5", got)
	}
}

// New trial and Open never replace a trial with unsaved changes without
// asking (issue 5: nothing is discarded silently).
func TestNewAsksFirst(t *testing.T) {
	u, w := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.doc.edited(changeDetails)
	before := u.doc.t
	menuShortcut(t, w, scNew)
	if u.doc.t != before {
		t.Fatal("New trial replaced a trial with unsaved changes without asking")
	}
	if w.Canvas().Overlays().Top() == nil {
		t.Fatal("no question about the unsaved changes")
	}
	other := filepath.Join(t.TempDir(), "other.furlong")
	if err := saveFile(other, smallTrial(t)); err != nil {
		t.Fatal(err)
	}
	u.openPath(other)
	if u.doc.t != before {
		t.Fatal("Open replaced a trial with unsaved changes without asking")
	}

	// Without unsaved changes New goes ahead.
	u.doc.dirty = false
	menuShortcut(t, w, scNew)
	if u.doc.t == before || u.doc.t.Title != "New trial" {
		t.Fatalf("New trial did not start one (title %q)", u.doc.t.Title)
	}
}

// The advice for a damaged file names its real backup copy, or says there
// is none, never the placeholder.
func TestDamagedFileAdvice(t *testing.T) {
	u, w := newTestApp(t, 0)
	dir := t.TempDir()
	bad := filepath.Join(dir, "bad.furlong")
	if err := os.WriteFile(bad, []byte(`{"format":`), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := loadFile(bad)
	if err == nil {
		t.Fatal("a cut-short file loads")
	}
	m := explain("The trial file could not be opened", err).forFile(bad)
	if strings.Contains(m.Do, backupHint) || !strings.Contains(m.Do, "no backup copy (bad.furlong.bak)") {
		t.Errorf("advice without a backup: %q", m.Do)
	}
	if err := os.WriteFile(bad+".bak", []byte("{}"), 0o644); err != nil {
		t.Fatal(err)
	}
	m = explain("The trial file could not be opened", err).forFile(bad)
	if !strings.Contains(m.Do, "bad.furlong.bak") || strings.Contains(m.Do, backupHint) {
		t.Errorf("advice with a backup: %q", m.Do)
	}
	if u.OpenFile(bad) == nil || w.Canvas().Overlays().Top() == nil {
		t.Error("a damaged file opens without a dialog")
	}
}
