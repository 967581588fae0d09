package ui

import (
	"path/filepath"
	"testing"
)

// With no last folder, the file dialogs start in the user's Documents
// folder when the platform names one (Windows: common practice for a
// desktop program), in the home folder otherwise or when it is missing;
// folder names with spaces and non-ASCII letters work.
func TestChooserStartsInDocuments(t *testing.T) {
	home := t.TempDir()
	t.Setenv("HOME", home)
	t.Setenv("USERPROFILE", home)
	docs := mkdirs(t, "Mes documents – Échantillons/")
	docs = filepath.Join(docs, "Mes documents – Échantillons")
	old := documentsFolder
	t.Cleanup(func() { documentsFolder = old })

	for _, c := range []struct {
		name, docs, want string
	}{
		{"Documents named", docs, docs},
		{"none named", "", home},
		{"named but missing", filepath.Join(docs, "gone"), home},
	} {
		documentsFolder = func() string { return c.docs }
		u, _ := newTestApp(t, 0)
		u.prefs.lastFolder = ""
		ch := u.chooseFile(chooseOptions{title: "Open", exts: []string{trialExt}}, func(string) {})
		if ch.dir != c.want {
			t.Errorf("%s: starts in %q, want %q", c.name, ch.dir, c.want)
		}
	}
}
