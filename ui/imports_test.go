package ui

import (
	"go/build"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The allowed imports of ui and its subpackages (the project's layout
// table): never fyne's app package (main creates the app, so that the
// window builds headless), and nothing global: no fyne.CurrentApp().
func TestImports(t *testing.T) {
	t.Parallel()
	forbidden := []string{"fyne.io/fyne/v2/app"}
	err := filepath.WalkDir(".", func(path string, d os.DirEntry, err error) error {
		if err != nil || !d.IsDir() || d.Name() == "testdata" {
			return err
		}
		pkg, err := build.ImportDir(path, 0)
		if err != nil {
			if _, ok := err.(*build.NoGoError); ok {
				return nil
			}
			return err
		}
		for _, imp := range append(append(pkg.Imports, pkg.TestImports...), pkg.XTestImports...) {
			for _, f := range forbidden {
				if imp == f || strings.HasPrefix(imp, f+"/") {
					t.Errorf("%s imports %s", path, imp)
				}
			}
		}
		for _, name := range pkg.GoFiles {
			src, err := os.ReadFile(filepath.Join(path, name))
			if err != nil {
				return err
			}
			if strings.Contains(string(src), "fyne.Current"+"App()") {
				t.Errorf("%s/%s calls fyne.CurrentApp; use the injected app", path, name)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
}
