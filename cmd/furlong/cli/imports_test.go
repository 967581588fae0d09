package cli

import (
	"go/build"
	"io/fs"
	"path/filepath"
	"strings"
	"testing"
)

// importRules are Furlong's layering rules (DEVELOPERS.md): for each package
// prefix, the module packages and third-party prefixes it may import. The
// standard library is always allowed. The longest matching prefix applies.
var importRules = []struct {
	pkg        string
	module     []string // allowed furlong/... prefixes
	thirdParty []string // allowed third-party prefixes
}{
	{"furlong/stats/dist", nil, []string{"gonum.org/v1/gonum"}},
	{"furlong/stats/diag", []string{"furlong/stats"}, []string{"gonum.org/v1/gonum"}},
	{"furlong/stats/meansep", []string{"furlong/stats/dist"}, []string{"gonum.org/v1/gonum"}},
	{"furlong/stats/glm", []string{"furlong/stats/dist", "furlong/stats/meansep"}, []string{"gonum.org/v1/gonum"}},
	{"furlong/stats/series", []string{"furlong/stats"}, []string{"gonum.org/v1/gonum"}},
	{"furlong/stats", []string{"furlong/stats/"}, []string{"gonum.org/v1/gonum"}},
	{"furlong/trial", nil, nil},
	{"furlong/trial/trialfile", []string{"furlong/trial"}, nil},
	{"furlong/trial/fieldbook", []string{"furlong/trial"}, []string{"golang.org/x/text"}},
	{"furlong/trial/analysis", []string{"furlong/trial", "furlong/stats"}, nil},
	{"furlong/trial/series", []string{"furlong/trial", "furlong/stats"}, nil},
	{"furlong/sampledata", []string{"furlong/trial"}, nil},
	{"furlong/export", []string{"furlong/export", "furlong/trial", "furlong/stats"}, []string{"github.com/xuri/excelize/v2", "gonum.org/v1/plot", "gonum.org/v1/gonum"}},
	{"furlong/export/pdf", []string{"furlong/export", "furlong/trial", "furlong/stats"}, []string{"gonum.org/v1/plot", "gonum.org/v1/gonum", "codeberg.org/go-pdf/fpdf", "codeberg.org/go-fonts/liberation", "github.com/skip2/go-qrcode"}},
	{"furlong/ui", []string{"furlong/"}, []string{"fyne.io/fyne/v2", "gonum.org/v1/plot", "gonum.org/v1/gonum", "codeberg.org/go-fonts/liberation"}},
	{"furlong/cmd/furlong/cli", []string{"furlong/trial", "furlong/stats", "furlong/export", "furlong/sampledata"}, []string{"gonum.org/v1/plot"}},
	{"furlong/cmd/furlong", []string{"furlong/"}, []string{"fyne.io/fyne/v2"}},
	{"furlong/cmd/disttool", nil, []string{"github.com/xuri/excelize/v2"}},
}

// TestImportRules walks every package of the module with go/build and fails
// on an import its layer may not use: stats knows no trials, trial knows no
// windows or exports, only ui and cmd import fyne.
func TestImportRules(t *testing.T) {
	t.Parallel()
	root := filepath.Join("..", "..", "..")
	checked := 0
	err := filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if !d.IsDir() {
			return nil
		}
		name := d.Name()
		if path != root && (strings.HasPrefix(name, ".") || name == "testdata") {
			return filepath.SkipDir
		}
		pkg, err := build.ImportDir(path, 0)
		if err != nil {
			return nil // no Go files here
		}
		rel, _ := filepath.Rel(root, path)
		ip := "furlong/" + filepath.ToSlash(rel)
		if strings.Contains(ip, "/internal/gen") {
			return nil // generators are build tools, not part of the program
		}
		rule := -1
		for i, r := range importRules {
			if (ip == r.pkg || strings.HasPrefix(ip, r.pkg+"/")) && (rule < 0 || len(r.pkg) > len(importRules[rule].pkg)) {
				rule = i
			}
		}
		if rule < 0 {
			t.Errorf("%s has no import rule; add it to importRules and DEVELOPERS.md", ip)
			return nil
		}
		checked++
		r := importRules[rule]
		for _, imp := range pkg.Imports {
			if !strings.Contains(strings.SplitN(imp, "/", 2)[0], ".") && !strings.HasPrefix(imp, "furlong") {
				continue // standard library
			}
			allowed := imp == ip || strings.HasPrefix(imp, ip+"/")
			list := r.thirdParty
			if strings.HasPrefix(imp, "furlong/") {
				list = r.module
			}
			for _, p := range list {
				if imp == strings.TrimSuffix(p, "/") || strings.HasPrefix(imp, p) && (strings.HasSuffix(p, "/") || strings.HasPrefix(imp, p+"/") || imp == p) {
					allowed = true
				}
			}
			if !allowed {
				t.Errorf("%s imports %s, which its layer may not use", ip, imp)
			}
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if checked < 10 {
		t.Fatalf("checked only %d packages; is the module root right?", checked)
	}
}
