package ui

import (
	"path/filepath"
	"strings"

	"fyne.io/fyne/v2"

	"furlong/sampledata"
	"furlong/trial"
	"furlong/trial/trialfile"
)

// trialExt is the extension of trial files.
const trialExt = ".furlong"

func loadFile(path string) (*trial.Trial, error) { return trialfile.Load(path) }

func saveFile(path string, t *trial.Trial) error { return trialfile.Save(path, t) }

func demoTrial() (*trial.Trial, error) { return sampledata.Trial() }

// openDialog asks for a trial file to open.
func (u *App) openDialog() {
	u.chooseFile(chooseOptions{title: "Open a trial", exts: []string{trialExt}}, u.openPath)
}

// dialogSize is a file dialog size that fits the window.
func dialogSize(w fyne.Window) fyne.Size {
	s := w.Canvas().Size()
	return fyne.NewSize(min(900, s.Width*0.9), min(640, s.Height*0.9))
}

// save writes the trial to its file, asking for a place when it has none
// (or asNew is set); then runs after it succeeded. While the file has
// changed on disk, it asks what to do instead.
func (u *App) save(asNew bool, then func()) {
	if u.doc == nil {
		return
	}
	if u.doc.path == "" || asNew {
		u.saveAsDialog(then)
		return
	}
	if u.doc.conflict {
		u.askAboutDisk()
		return
	}
	u.saveTo(u.doc.path, then)
}

// saveTo writes the trial to path through the saver and waits for it. A
// new path (Save as) becomes the trial's file: the window's marker and
// watcher move to it, and a file the user agreed to replace is expected
// as it is now.
func (u *App) saveTo(path string, then func()) {
	d := u.doc
	stale := ""
	if d.path != path {
		stale = d.recovery
		u.unwatch()
		d.presence.Release()
		d.presence = nil
		id, _ := trialfile.Stat(path) // zero for a new file
		u.saver.setKnown(path, id)
		d.path, d.disk, d.conflict = path, id, false
		d.recovery = u.recoveryPath(path)
		u.prefs.onFileOpened(path)
		u.prefs.onLastFolderChanged(filepath.Dir(path))
		u.markOpen(path)
		u.watch()
	}
	done := make(chan error, 1)
	j := u.job(true)
	j.stale, j.done = stale, done
	u.saver.submit(j)
	// The explicit save is small; wait for it so that "then" (for example
	// closing the window) only runs once the file is on disk.
	if err := <-done; err == nil && then != nil {
		then()
	}
}

// saveAsDialog asks where to save the trial.
func (u *App) saveAsDialog(then func()) {
	u.chooseFile(chooseOptions{title: "Save the trial as", save: true, exts: []string{trialExt},
		name: safeFileName(u.doc.t.Title) + trialExt}, func(path string) {
		if u.doc != nil {
			u.saveTo(path, then)
		}
	})
}

// safeFileName turns a title into a file name.
func safeFileName(title string) string {
	title = strings.TrimSpace(title)
	if title == "" {
		return "trial"
	}
	return strings.Map(func(r rune) rune {
		switch r {
		case '/', '\\', ':', '*', '?', '"', '<', '>', '|':
			return '-'
		}
		return r
	}, title)
}
