package ui

import (
	"context"
	"errors"
	"io"
	"net/url"
	"os"
	"path/filepath"
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

// exportDialog asks where to save an export (the file chooser, which adds
// the first of exts to a name typed without an ending and asks before
// replacing a file), then writes it in the background. A long job shows a
// progress bar with a Cancel button. When done, the user is told where the
// file is and offered to show the folder.
func (u *App) exportDialog(what, fileName string, exts []string, long bool, job exportJob) {
	u.chooseFile(chooseOptions{title: "Export the " + what, save: true, exts: exts, name: fileName,
		confirm: "Export"}, func(path string) {
		wc, err := storage.Writer(storage.NewFileURI(path))
		if err != nil {
			showError(u.win, "Could not export", "The file "+filepath.Base(path)+" could not be created", err)
			return
		}
		u.runExport(what, wc, long, job)
	})
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
	u.showWritten("Export finished", "The "+what+" was written to", uri.Path())
}

// folderURL is the file:// URL of a folder.
func folderURL(dir string) *url.URL {
	p := filepath.ToSlash(dir)
	if !strings.HasPrefix(p, "/") {
		p = "/" + p // Windows drive letters
	}
	return &url.URL{Scheme: "file", Path: p}
}
