package ui

import (
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"testing"

	"fyne.io/fyne/v2"
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

// An export name typed without an ending gets the first one offered, no
// empty file stays under the bare name, and an existing file of the new
// name is not replaced without asking (common practice for save dialogs).
func TestExportEnding(t *testing.T) {
	u, w := newTestApp(t, 0)
	dir := t.TempDir()
	bare := filepath.Join(dir, "report")
	wc, err := storage.Writer(storage.NewFileURI(bare))
	if err != nil {
		t.Fatal(err)
	}
	var got string
	u.withEnding(wc, []string{".xlsx"}, func(wc fyne.URIWriteCloser) {
		got = wc.URI().Path()
		wc.Close()
	})
	if got != bare+".xlsx" {
		t.Fatalf("export goes to %q, want %q", got, bare+".xlsx")
	}
	if _, err := os.Stat(bare); err == nil {
		t.Error("the empty file under the bare name is left behind")
	}

	// report.xlsx exists now: choosing "report" again must ask first.
	if err := os.WriteFile(bare+".xlsx", []byte("keep"), 0o644); err != nil {
		t.Fatal(err)
	}
	wc, err = storage.Writer(storage.NewFileURI(bare))
	if err != nil {
		t.Fatal(err)
	}
	got = ""
	u.withEnding(wc, []string{".xlsx"}, func(wc fyne.URIWriteCloser) { got = wc.URI().Path(); wc.Close() })
	if got != "" || w.Canvas().Overlays().Top() == nil {
		t.Fatal("an existing file is replaced without asking")
	}
	if data, _ := os.ReadFile(bare + ".xlsx"); string(data) != "keep" {
		t.Fatalf("existing file changed to %q", data)
	}

	// A name with an offered ending goes through as chosen.
	chosen := filepath.Join(dir, "map.png")
	wc, err = storage.Writer(storage.NewFileURI(chosen))
	if err != nil {
		t.Fatal(err)
	}
	u.withEnding(wc, []string{".pdf", ".png"}, func(wc fyne.URIWriteCloser) { got = wc.URI().Path(); wc.Close() })
	if got != chosen {
		t.Fatalf("export goes to %q, want %q", got, chosen)
	}
}
