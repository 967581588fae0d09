package ui

import (
	"context"
	"errors"
	"io"
	"net/url"
	"os"
	"path/filepath"
	"slices"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/storage"
	"fyne.io/fyne/v2/widget"
)

// exportJob writes one export. It runs off the UI goroutine and must only
// use snapshots. ext is the chosen file's extension in lower case (".pdf");
// progress may be called with the work done and the total.
type exportJob func(ctx context.Context, w io.Writer, ext string, progress func(done, total int)) error

// exportDialog asks where to save an export (dialog.NewFileSave), then
// writes it in the background. A nil writer means the user cancelled. A
// long job shows a progress bar with a Cancel button. When done, the user
// is offered to open the folder.
func (u *App) exportDialog(what, fileName string, exts []string, long bool, job exportJob) {
	d := dialog.NewFileSave(func(wc fyne.URIWriteCloser, err error) {
		if err != nil {
			// The dialog joins what was typed to the folder it shows, so
			// a typed folder path ends up in a folder that does not exist.
			showMessage(u.win, "Could not export", message{
				"The " + what + " could not be written there: Furlong could not create a file of that name in that folder.",
				"Type only the file name (without / or \\), choose the folder in the dialog, and export again."})
			return
		}
		if wc == nil {
			return // cancelled
		}
		u.withEnding(wc, exts, func(wc fyne.URIWriteCloser) { u.runExport(what, wc, long, job) })
	}, u.win)
	d.SetFileName(fileName)
	if len(exts) > 0 {
		d.SetFilter(storage.NewExtensionFileFilter(exts))
	}
	if l := u.lastFolder(); l != nil {
		d.SetLocation(l)
	}
	d.Resize(dialogSize(u.win))
	d.Show()
}

// withEnding passes wc to then when its name ends in one of exts (or exts
// is empty). A name typed without an ending gets the first of exts: the
// empty file the dialog made goes, and an existing file of the new name is
// only replaced once the user agrees (the dialog asked about the bare name).
func (u *App) withEnding(wc fyne.URIWriteCloser, exts []string, then func(fyne.URIWriteCloser)) {
	uri := wc.URI()
	ext := strings.ToLower(uri.Extension())
	if len(exts) == 0 || uri.Scheme() != "file" || slices.Contains(exts, ext) {
		then(wc)
		return
	}
	wc.Close()
	bare := uri.Path()
	if fi, err := os.Stat(bare); err == nil && fi.Mode().IsRegular() && fi.Size() == 0 {
		os.Remove(bare)
	}
	path := bare + exts[0]
	open := func() {
		w, err := storage.Writer(storage.NewFileURI(path))
		if err != nil {
			showError(u.win, "Could not export", "The file "+filepath.Base(path)+" could not be created", err)
			return
		}
		then(w)
	}
	if _, err := os.Stat(path); err != nil {
		open()
		return
	}
	dialog.ShowConfirm("Replace the file?", "A file "+filepath.Base(path)+" already exists in "+
		filepath.Dir(path)+".\n\nReplace it?", func(ok bool) {
		if ok {
			open()
		}
	}, u.win)
}

// runExport writes job into wc in the background and reports the outcome.
func (u *App) runExport(what string, wc fyne.URIWriteCloser, long bool, job exportJob) {
	ctx, cancel := context.WithCancel(context.Background())
	var prog *dialog.CustomDialog
	var bar *widget.ProgressBar
	if long {
		bar = widget.NewProgressBar()
		stop := widget.NewButton("Cancel", cancel)
		prog = dialog.NewCustomWithoutButtons("Writing the "+what+"…", container.NewVBox(bar, stop), u.win)
		prog.Resize(fyne.NewSize(400, 140))
		prog.Show()
	}
	progress := func(done, total int) {
		if bar == nil || total <= 0 {
			return
		}
		fyne.Do(func() { bar.SetValue(float64(done) / float64(total)) })
	}
	go func() {
		err := writeExport(ctx, wc, job, progress)
		fyne.Do(func() {
			cancel()
			if prog != nil {
				prog.Hide()
			}
			u.exportDone(what, wc.URI(), err)
		})
	}()
}

// writeExport runs job into wc and closes it; a failed or cancelled export
// leaves no partial file behind.
func writeExport(ctx context.Context, wc fyne.URIWriteCloser, job exportJob, progress func(int, int)) error {
	err := job(ctx, wc, strings.ToLower(wc.URI().Extension()), progress)
	if cerr := wc.Close(); err == nil {
		err = cerr
	}
	if err == nil {
		err = ctx.Err()
	}
	if err != nil && wc.URI().Scheme() == "file" {
		os.Remove(wc.URI().Path())
	}
	return err
}

// exportDone reports the outcome and offers to open the folder.
func (u *App) exportDone(what string, uri fyne.URI, err error) {
	if u.exported != nil {
		defer u.exported(uri, err)
	}
	switch {
	case errors.Is(err, context.Canceled):
		u.status.SetText("Export cancelled; nothing was written.")
		return
	case err != nil:
		showError(u.win, "Could not export", "The "+what+" could not be written", err)
		return
	}
	u.status.SetText("Wrote " + uri.Name())
	if uri.Scheme() != "file" {
		return
	}
	dir := filepath.Dir(uri.Path())
	u.prefs.onLastFolderChanged(dir)
	dialog.ShowConfirm("Export finished", "The "+what+" was written to "+uri.Name()+".\n\nOpen the folder?", func(ok bool) {
		if !ok {
			return
		}
		if err := u.app.OpenURL(folderURL(dir)); err != nil {
			showError(u.win, "Could not open the folder", "The folder could not be opened", err)
		}
	}, u.win)
}

// folderURL is the file:// URL of a folder.
func folderURL(dir string) *url.URL {
	p := filepath.ToSlash(dir)
	if !strings.HasPrefix(p, "/") {
		p = "/" + p // Windows drive letters
	}
	return &url.URL{Scheme: "file", Path: p}
}
