package ui

import (
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"testing"

	"fyne.io/fyne/v2/storage"
	"fyne.io/fyne/v2/test"
)

// A cancelled export leaves no partial file; a finished one is complete
// (the product's export rule, issue 5; a partial file is worse than none:
// common practice).
func TestWriteExport(t *testing.T) {
	test.NewTempApp(t)
	dir := t.TempDir()
	for _, cancelIt := range []bool{false, true} {
		path := filepath.Join(dir, "out.txt")
		wc, err := storage.Writer(storage.NewFileURI(path))
		if err != nil {
			t.Fatal(err)
		}
		ctx, cancel := context.WithCancel(context.Background())
		job := func(ctx context.Context, w io.Writer, ext string, progress func(int, int)) error {
			if ext != ".txt" {
				t.Errorf("extension %q", ext)
			}
			io.WriteString(w, "part one\n")
			if cancelIt {
				cancel()
			}
			if err := ctx.Err(); err != nil {
				return err
			}
			_, err := io.WriteString(w, "part two\n")
			return err
		}
		err = writeExport(ctx, wc, job, nil)
		cancel()
		_, statErr := os.Stat(path)
		switch {
		case cancelIt && (!errors.Is(err, context.Canceled) || statErr == nil):
			t.Errorf("cancelled export: err %v, file left: %v", err, statErr == nil)
		case !cancelIt:
			data, _ := os.ReadFile(path)
			if err != nil || string(data) != "part one\npart two\n" {
				t.Errorf("finished export: err %v, %q", err, data)
			}
		}
	}
	if u := folderURL("/home/field/trials"); u.String() != "file:///home/field/trials" {
		t.Errorf("folder URL %s", u)
	}
}
