package ui

import (
	"context"
	"errors"
	"os/exec"
	"path/filepath"
	"runtime"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/layout"
	"fyne.io/fyne/v2/widget"
)

// errNoFolderViewer: nothing on this computer shows folders (no file
// manager, or xdg-open missing or without a handler for folders).
var errNoFolderViewer = errors.New("no program to show folders is set up on this computer")

// folderOpener, when set, replaces the real way of showing a folder
// (tests).
var folderOpener func(dir string) error

// openFolder shows dir in the desktop's file manager and returns whether
// that worked. On Linux and the BSDs it runs xdg-open and waits for its
// answer (a few seconds at most), because Fyne's OpenURL only starts it
// and so never hears that no file manager exists. It blocks: run it off
// the UI goroutine.
func (u *App) openFolder(dir string) error {
	if folderOpener != nil {
		return folderOpener(dir)
	}
	switch runtime.GOOS {
	case "windows", "darwin", "android", "ios", "js":
		return u.app.OpenURL(folderURL(dir))
	}
	bin, err := exec.LookPath("xdg-open")
	if err != nil {
		return errNoFolderViewer
	}
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
	defer cancel()
	err = exec.CommandContext(ctx, bin, folderURL(dir).String()).Run()
	if ctx.Err() != nil {
		return nil // still running after seconds: a viewer is showing it
	}
	var exit *exec.ExitError
	if errors.As(err, &exit) {
		return errNoFolderViewer // xdg-open found no program for folders
	}
	return err
}

// showWritten tells where a file was written, with the full path the user
// can copy, and offers to show its folder. When the folder cannot be
// shown, it says so and keeps the path on screen.
func (u *App) showWritten(title, lead, path string) {
	dir := filepath.Dir(path)
	text := widget.NewLabel(lead + " " + filepath.Base(path) + " in the folder:")
	text.Wrapping = fyne.TextWrapWord
	where := widget.NewEntry()
	where.SetText(dir)
	where.OnChanged = func(string) { where.SetText(dir) } // shown to read and copy, not to edit
	note := widget.NewLabel("")
	note.Wrapping = fyne.TextWrapWord
	note.Hide()
	var d *dialog.CustomDialog
	copyBtn := widget.NewButton("Copy the path", func() {
		u.app.Clipboard().SetContent(path)
		note.SetText("The path of " + filepath.Base(path) + " is on the clipboard.")
		note.Show()
	})
	var show *widget.Button
	show = widget.NewButton("Show the folder", func() {
		show.Disable()
		note.SetText("Opening the folder…")
		note.Show()
		go func() {
			err := u.openFolder(dir)
			fyne.Do(func() {
				if u.folderShown != nil {
					defer u.folderShown(err)
				}
				if err == nil {
					d.Hide()
					return
				}
				note.SetText("The folder could not be shown: " + plainFolderError(err) +
					". Find the file with the path above (Copy the path puts it on the clipboard).")
				note.Importance = widget.WarningImportance
				note.Refresh()
			})
		}()
	})
	show.Importance = widget.HighImportance
	closeBtn := widget.NewButton("Close", func() { d.Hide() })
	d = dialog.NewCustomWithoutButtons(title, container.NewVBox(text, where, note,
		container.NewHBox(layout.NewSpacer(), copyBtn, closeBtn, show)), u.win)
	d.Resize(fyne.NewSize(560, 230))
	d.Show()
	closeOnEscape(u.win, d)
}

// plainFolderError words the failure of openFolder.
func plainFolderError(err error) string {
	if errors.Is(err, errNoFolderViewer) {
		return "this computer has no file manager set up for Furlong to call"
	}
	return err.Error()
}
