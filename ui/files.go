package ui

import (
	"os"
	"path/filepath"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/storage"

	"furlong/sampledata"
	"furlong/trial"
	"furlong/trial/trialfile"
)

// trialExt is the extension of trial files.
const trialExt = ".furlong"

func loadFile(path string) (*trial.Trial, error) { return trialfile.Load(path) }

func saveFile(path string, t *trial.Trial) error { return trialfile.Save(path, t) }

func demoTrial() (*trial.Trial, error) { return sampledata.Trial() }

// lastFolder returns the remembered folder as a listable URI, or nil.
func (u *App) lastFolder() fyne.ListableURI {
	if u.prefs.lastFolder == "" {
		return nil
	}
	l, err := storage.ListerForURI(storage.NewFileURI(u.prefs.lastFolder))
	if err != nil {
		return nil
	}
	return l
}

// openDialog asks for a trial file to open.
func (u *App) openDialog() {
	d := dialog.NewFileOpen(func(r fyne.URIReadCloser, err error) {
		if err != nil {
			showError(u.win, "Could not open the trial", "The file could not be opened", err)
			return
		}
		if r == nil {
			return
		}
		path := r.URI().Path()
		r.Close()
		u.openPath(path)
	}, u.win)
	d.SetFilter(storage.NewExtensionFileFilter([]string{trialExt}))
	if l := u.lastFolder(); l != nil {
		d.SetLocation(l)
	}
	d.Resize(dialogSize(u.win))
	d.Show()
}

// dialogSize is a file dialog size that fits the window.
func dialogSize(w fyne.Window) fyne.Size {
	s := w.Canvas().Size()
	return fyne.NewSize(min(900, s.Width*0.9), min(640, s.Height*0.9))
}

// save writes the trial to its file, asking for a place when it has none
// (or asNew is set); then runs after it succeeded.
func (u *App) save(asNew bool, then func()) {
	if u.doc == nil {
		return
	}
	if u.doc.path == "" || asNew {
		u.saveAsDialog(then)
		return
	}
	u.saveTo(u.doc.path, then)
}

// saveTo writes the trial to path through the saver and waits for it.
func (u *App) saveTo(path string, then func()) {
	old := u.doc.recovery
	if u.doc.path != path {
		u.doc.recovery = u.recoveryPath(path)
		u.doc.path = path
		u.prefs.onFileOpened(path)
		u.prefs.onLastFolderChanged(filepath.Dir(path))
	}
	done := make(chan error, 1)
	u.saver.submit(saveJob{snap: cloneTrial(u.doc.t), path: path, gen: u.doc.gen,
		explicit: true, staleRecovery: old, done: done})
	// The explicit save is small; wait for it so that "then" (for example
	// closing the window) only runs once the file is on disk.
	if err := <-done; err == nil && then != nil {
		then()
	}
}

// saveAsDialog asks where to save the trial.
func (u *App) saveAsDialog(then func()) {
	d := dialog.NewFileSave(func(wc fyne.URIWriteCloser, err error) {
		if err != nil {
			// The dialog joins what was typed to the folder it shows, so
			// a typed folder path ends up in a folder that does not exist.
			showMessage(u.win, "Could not save", message{
				"The trial could not be saved there: Furlong could not create a file of that name in that folder.",
				"Type only the file name (for example trial.furlong, without / or \\), choose the folder in the dialog, and save again."})
			return
		}
		if wc == nil {
			return
		}
		chosen := wc.URI().Path()
		// The dialog has created (or emptied) the file; the saver writes
		// atomically over it.
		wc.Close()
		u.saveChosen(chosen, then)
	}, u.win)
	d.SetFilter(storage.NewExtensionFileFilter([]string{trialExt}))
	d.SetFileName(safeFileName(u.doc.t.Title) + trialExt)
	if l := u.lastFolder(); l != nil {
		d.SetLocation(l)
	}
	d.Resize(dialogSize(u.win))
	d.Show()
}

// saveChosen saves the trial under the name chosen in the save dialog,
// adding the .furlong ending when it was left off.
func (u *App) saveChosen(chosen string, then func()) {
	path := chosen
	if strings.HasSuffix(strings.ToLower(path), trialExt) {
		u.saveTo(path, then)
		return
	}
	// A name typed without the ending: the trial goes to NAME.furlong,
	// and the empty file the dialog made under the bare name goes.
	path += trialExt
	if fi, err := os.Stat(chosen); err == nil && fi.Mode().IsRegular() && fi.Size() == 0 {
		os.Remove(chosen)
	}
	if _, err := os.Stat(path); err != nil || path == u.doc.path {
		u.saveTo(path, then)
		return
	}
	// The dialog asked about the bare name only; ask about the file
	// that will really be replaced.
	dialog.ShowConfirm("Replace the file?", "A trial file "+filepath.Base(path)+" already exists in "+
		filepath.Dir(path)+".\n\nReplace it with this trial?", func(ok bool) {
		if ok {
			u.saveTo(path, then)
		}
	}, u.win)
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
