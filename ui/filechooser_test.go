package ui

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"
)

// mkdirs creates folders and empty files (a name ending in / is a folder)
// under a fresh temporary folder and returns it.
func mkdirs(t *testing.T, names ...string) string {
	t.Helper()
	root := t.TempDir()
	for _, n := range names {
		p := filepath.Join(root, filepath.FromSlash(n))
		if strings.HasSuffix(n, "/") {
			if err := os.MkdirAll(p, 0o755); err != nil {
				t.Fatal(err)
			}
			continue
		}
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte("x"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return root
}

// rowFor returns a list row showing the entry called name.
func rowFor(t *testing.T, c *fileChooser, name string) *chooserRow {
	t.Helper()
	for i, e := range c.entries {
		if e.name == name {
			r := newChooserRow(c)
			r.set(i)
			return r
		}
	}
	t.Fatalf("%s is not listed in %s (%v)", name, c.dir, c.entries)
	return nil
}

// The save dialog takes a typed path: a full path, a relative one and
// ~/...; a name without the ending gets it; a folder that does not exist
// is said in the dialog, which stays open (issue 12, section 2: Save
// refused a typed path).
func TestChooserSaveTypedPath(t *testing.T) {
	root := mkdirs(t, "season/", "other/")
	home := t.TempDir()
	t.Setenv("HOME", home)
	t.Setenv("USERPROFILE", home)
	for _, c := range []struct{ typed, want string }{
		{filepath.Join(root, "other", "plan.furlong"), filepath.Join(root, "other", "plan.furlong")},
		{filepath.Join(root, "other", "plan"), filepath.Join(root, "other", "plan.furlong")},
		{"other/b.furlong", filepath.Join(root, "other", "b.furlong")},
		{"~/c", filepath.Join(home, "c.furlong")},
	} {
		u, _ := newTestApp(t, 0)
		u.prefs.lastFolder = filepath.Join(root, "season")
		var got string
		ch := u.chooseFile(chooseOptions{title: "Save", save: true, exts: []string{trialExt}, name: "x.furlong"},
			func(p string) { got = p })
		if ch.dir != filepath.Join(root, "season") {
			t.Fatalf("starts in %s, want the last folder", ch.dir)
		}
		if c.typed == "other/b.furlong" {
			ch.goTo(root)
		}
		ch.name.SetText(c.typed)
		ch.submit()
		if got != c.want {
			t.Errorf("typed %q: chose %q, want %q (note %q)", c.typed, got, c.want, ch.note.Text)
		}
	}

	u, w := newTestApp(t, 0)
	var got string
	ch := u.chooseFile(chooseOptions{title: "Save", save: true, exts: []string{trialExt}}, func(p string) { got = p })
	ch.name.SetText(filepath.Join(root, "missing", "plan"))
	ch.submit()
	if got != "" || !strings.Contains(ch.note.Text, "no folder") || w.Canvas().Overlays().Top() == nil {
		t.Errorf("a path into a missing folder: chose %q, note %q", got, ch.note.Text)
	}
}

// A name whose file exists asks before replacing it, also when the
// ending was added (the file replaced is the one named in the question).
func TestChooserSaveAsksBeforeReplacing(t *testing.T) {
	root := mkdirs(t, "strip.furlong")
	u, w := newTestApp(t, 0)
	u.prefs.lastFolder = root
	var got string
	ch := u.chooseFile(chooseOptions{title: "Save", save: true, exts: []string{trialExt}}, func(p string) { got = p })
	ch.name.SetText("strip")
	ch.submit()
	if got != "" {
		t.Fatal("an existing file was chosen without asking")
	}
	dialogButton(t, w, "Yes").OnTapped()
	if got != filepath.Join(root, "strip.furlong") {
		t.Fatalf("after agreeing, chose %q", got)
	}
}

// Open has a path field: a typed file opens, a typed folder is shown, a
// missing file is said in the dialog (issue 12, section 2).
func TestChooserOpenTypedPath(t *testing.T) {
	root := mkdirs(t, "a/b/", "a/trial.furlong", "a/notes.txt", ".hidden.furlong")
	u, _ := newTestApp(t, 0)
	u.prefs.lastFolder = root
	var got string
	ch := u.chooseFile(chooseOptions{title: "Open", exts: []string{trialExt}}, func(p string) { got = p })
	if len(ch.entries) != 1 || ch.entries[0].name != "a" || !ch.entries[0].dir {
		t.Fatalf("listed %v, want only the folder a (hidden files are not listed)", ch.entries)
	}
	ch.name.SetText("a")
	ch.submit()
	if ch.dir != filepath.Join(root, "a") || got != "" {
		t.Fatalf("typing a folder shows %s (chose %q)", ch.dir, got)
	}
	if len(ch.entries) != 2 { // b/ and trial.furlong, not notes.txt
		t.Errorf("listed %v", ch.entries)
	}
	ch.name.SetText("nothing.furlong")
	ch.submit()
	if got != "" || !strings.Contains(ch.note.Text, "no file nothing.furlong") {
		t.Errorf("a missing file: chose %q, note %q", got, ch.note.Text)
	}
	ch.name.SetText(filepath.Join(root, "a", "trial.furlong"))
	ch.submit()
	if got != filepath.Join(root, "a", "trial.furlong") {
		t.Errorf("typed full path chose %q", got)
	}
	ch.folder.SetText(filepath.Join(root, "a", "b"))
	ch.folder.OnSubmitted(ch.folder.Text)
	if ch.dir != filepath.Join(root, "a", "b") {
		t.Errorf("the folder field went to %s", ch.dir)
	}
}

// A double click on a folder opens that folder only, never the subfolder
// that appears under the pointer; a single click only selects; a double
// click on a file chooses it (issue 12, section 2).
func TestChooserDoubleClick(t *testing.T) {
	root := mkdirs(t, "a/a/a/", "a/a/x.furlong")
	u, _ := newTestApp(t, 0)
	u.prefs.lastFolder = root
	var got string
	ch := u.chooseFile(chooseOptions{title: "Open", exts: []string{trialExt}}, func(p string) { got = p })
	test.Tap(rowFor(t, ch, "a"))
	if ch.dir != root || ch.sel != 0 {
		t.Fatalf("a single click moved to %s (selected %d)", ch.dir, ch.sel)
	}
	test.DoubleTap(rowFor(t, ch, "a"))
	if ch.dir != filepath.Join(root, "a") {
		t.Fatalf("a double click shows %s, want %s", ch.dir, filepath.Join(root, "a"))
	}
	test.DoubleTap(rowFor(t, ch, "a"))
	test.DoubleTap(rowFor(t, ch, "x.furlong"))
	if got != filepath.Join(root, "a", "a", "x.furlong") {
		t.Fatalf("double click on a file chose %q", got)
	}
}

// An export typed without an ending gets the first one offered; a name
// with another offered ending keeps it (common practice for save dialogs).
func TestChooserExportEnding(t *testing.T) {
	root := mkdirs(t, "x/")
	for _, c := range []struct {
		exts        []string
		typed, want string
	}{
		{[]string{".xlsx"}, "report", "report.xlsx"},
		{[]string{".pdf", ".png"}, "map.png", "map.png"},
		{[]string{".pdf", ".png"}, "map.PNG", "map.PNG"},
		{[]string{".csv"}, "book.v2", "book.v2.csv"},
	} {
		u, _ := newTestApp(t, 0)
		u.prefs.lastFolder = root
		var got string
		ch := u.chooseFile(chooseOptions{title: "Export", save: true, exts: c.exts}, func(p string) { got = p })
		ch.name.SetText(c.typed)
		ch.submit()
		if got != filepath.Join(root, c.want) {
			t.Errorf("%v %q: chose %q, want %q", c.exts, c.typed, got, c.want)
		}
	}
}

// On a machine without a file manager, "Show the folder" says so and the
// path stays on screen to copy (issue 12, section 2: the old question did
// nothing without a word).
func TestShowFolderWithoutFileManager(t *testing.T) {
	u, w := newTestApp(t, 0)
	folderOpener = func(string) error { return errNoFolderViewer }
	t.Cleanup(func() { folderOpener = nil })
	shown := make(chan error, 1)
	u.folderShown = func(err error) { shown <- err }
	path := filepath.Join(t.TempDir(), "report.xlsx")
	u.showWritten("Export finished", "The report was written to", path)
	dialogButton(t, w, "Show the folder").OnTapped()
	if err := <-shown; err == nil {
		t.Fatal("the opener's failure was not reported")
	}
	var said, pathShown bool
	for _, o := range overlayWidgets(t, w) {
		switch v := o.(type) {
		case *widget.Label:
			said = said || strings.Contains(v.Text, "no file manager")
		case *widget.Entry:
			pathShown = pathShown || v.Text == filepath.Dir(path)
		}
	}
	if !said || !pathShown {
		t.Errorf("message shown %v, path shown %v", said, pathShown)
	}
	dialogButton(t, w, "Copy the path").OnTapped()
	if got := u.app.Clipboard().Content(); got != path {
		t.Errorf("clipboard holds %q", got)
	}
}
