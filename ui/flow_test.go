package ui

import (
	"context"
	"encoding/csv"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/storage"
	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"

	"furlong/stats"
	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/analysis"
)

// barley is the 1931 barley RCBD (stats/refdata/README.md): yield by site and
// variety, in file order.
type barley struct {
	sites, varieties []string
	yield            map[[2]string]float64
}

func readBarley(t *testing.T) barley {
	t.Helper()
	f, err := refdata.Open("barley-1931-rcbd.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	b := barley{yield: map[[2]string]float64{}}
	seen := map[string]bool{}
	for _, r := range rows[1:] {
		v, err := strconv.ParseFloat(r[2], 64)
		if err != nil {
			t.Fatal(err)
		}
		if !seen["s"+r[0]] {
			seen["s"+r[0]] = true
			b.sites = append(b.sites, r[0])
		}
		if !seen["v"+r[1]] {
			seen["v"+r[1]] = true
			b.varieties = append(b.varieties, r[1])
		}
		b.yield[[2]string{r[0], r[1]}] = v
	}
	return b
}

// expectedANOVA is the part of an .expected.json file the test uses.
type expectedANOVA struct {
	Anova []struct {
		Source string   `json:"source"`
		DF     int      `json:"df"`
		SS     float64  `json:"ss"`
		F      *float64 `json:"f"`
	} `json:"anova"`
	MSE       float64 `json:"mse"`
	CVPercent float64 `json:"cv_percent"`
}

func readExpected(t *testing.T, name string) expectedANOVA {
	t.Helper()
	var e expectedANOVA
	refdata.JSON(t, name, &e)
	return e
}

func closeRel(a, b, tol float64) bool {
	return math.Abs(a-b) <= tol*math.Max(1, math.Abs(b))
}

// waitAnalysis runs show (which starts a round of analyses) and waits for
// the round's results, delivered on the test goroutine.
func waitAnalysis(t testing.TB, u *App, show func()) *resultSet {
	t.Helper()
	return pumpAnalysis(t, u, show)
}

// checkANOVA compares the treatment, block and error lines with R.
func checkANOVA(t *testing.T, got *analysis.Result, want expectedANOVA) {
	t.Helper()
	roles := map[string]stats.Role{"variety": stats.RoleTreatment, "site": stats.RoleBlock, "Residuals": stats.RoleError}
	for _, w := range want.Anova {
		var found bool
		for _, g := range got.ANOVA.Sources {
			if r, ok := roles[w.Source]; !ok || g.Role != r {
				continue
			}
			found = true
			if g.DF != w.DF || !closeRel(g.SS, w.SS, 1e-6) {
				t.Errorf("%s: df %d SS %.6f, R gives df %d SS %.6f", g.Name, g.DF, g.SS, w.DF, w.SS)
			}
			if w.F != nil && !closeRel(g.F, *w.F, 1e-6) {
				t.Errorf("%s: F %.6f, R gives %.6f", g.Name, g.F, *w.F)
			}
		}
		if !found {
			t.Errorf("no %s line in the ANOVA", w.Source)
		}
	}
	if !closeRel(got.ANOVA.MSE, want.MSE, 1e-6) {
		t.Errorf("MSE %.6f, R gives %.6f", got.ANOVA.MSE, want.MSE)
	}
}

// TestFlow walks the whole window as a user would: create a trial, paste
// the treatments, choose the design, add a trait, randomise, type the 1931
// barley data (stats/refdata/README.md) into the grid, compare the ANOVA with
// R's, exclude two plots and compare with R's missing-plot analysis,
// export the season report, save, reopen and find everything.
func TestFlow(t *testing.T) {
	b := readBarley(t)
	u, _ := newTestApp(t, 0)

	// Setup.
	u.newTrial()
	if u.cur != stepSetup {
		t.Fatalf("a new trial opens on step %d, want Setup", u.cur)
	}
	s := u.steps[stepSetup].(*setupStep)
	s.title.SetText("")
	test.Type(s.title, "Barley 1931")
	if u.doc.t.Title != "Barley 1931" {
		t.Fatalf("title %q", u.doc.t.Title)
	}
	if !strings.Contains(u.win.Title(), "Barley 1931") || !strings.HasSuffix(u.win.Title(), "•") {
		t.Fatalf("window title %q", u.win.Title())
	}
	s.pasteTreatments(strings.Join(b.varieties, "\n"))
	if len(u.doc.t.Treatments) != 10 {
		t.Fatalf("%d treatments after pasting", len(u.doc.t.Treatments))
	}
	s.designSel.SetSelected(designLabels[1])
	s.reps.SetText("6")
	s.applyDesign()
	if d := u.doc.t.Design; d.Kind != trial.RCBD || d.Reps != 6 {
		t.Fatalf("design %+v", d)
	}
	ok := u.structuralEdit("add trait", "test", func(tt *trial.Trial) error {
		return tt.AddTrait(trial.Trait{Key: "yield", Name: "Yield", Unit: "bu/ac", Kind: trial.Continuous,
			Min: f64(20), Max: f64(60), Decimals: 1, HigherBetter: true})
	})
	if !ok {
		t.Fatal("trait not added")
	}

	// Field: randomise with a seed.
	u.showStep(stepField)
	f := u.steps[stepField].(*fieldStep)
	f.seed.SetText("1931")
	f.randomise()
	tr := u.doc.t
	if !tr.Randomized() || tr.Random.Seed != 1931 || len(tr.Plots) != 60 {
		t.Fatalf("randomisation: %v seed %d, %d plots", tr.Randomized(), tr.Random.Seed, len(tr.Plots))
	}
	if len(f.fmap.Plots()) != 60 {
		t.Fatalf("field map shows %d plots", len(f.fmap.Plots()))
	}

	// Record: type every value in walking order.
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	r.table.Select(widget.TableCellID{Row: 0, Col: fixedCols})
	enter(r, "4o.1") // a typing slip
	if r.sel.Row != 0 || r.msg.Importance != widget.DangerImportance {
		t.Fatal("a bad value was not refused")
	}
	flagged := 0
	for i, p := range tr.Plots {
		if r.sel.Row != i {
			t.Fatalf("entry is on row %d, want %d", r.sel.Row, i)
		}
		tname := tr.Treatment(p.Treatment).Name
		v := b.yield[[2]string{b.sites[p.Block-1], tname}]
		enter(r, strconv.FormatFloat(v, 'f', -1, 64))
		if tr.Traits[0].Values[i] != v {
			t.Fatalf("plot %d holds %v, typed %v", p.Number, tr.Traits[0].Values[i], v)
		}
		if v < 20 || v > 60 {
			flagged++
			if r.msg.Importance != widget.WarningImportance {
				t.Fatalf("plot %d: %v is outside 20–60 but not flagged", p.Number, v)
			}
		}
	}
	if flagged == 0 {
		t.Fatal("the data have values outside 20–60 (19.7, 65.77); none was flagged")
	}
	if got := recordStatus(tr); got != "data 100% entered" {
		t.Fatalf("status %q", got)
	}

	// Compare: the ANOVA and letters on screen are Analyze's, and match R.
	set := waitAnalysis(t, u, func() { u.showStep(stepCompare) })
	c := u.steps[stepCompare].(*compareStep)
	res := set.result("yield")
	if res == nil || res.err != nil {
		t.Fatalf("no result: %+v", res)
	}
	checkANOVA(t, res.res, readExpected(t, "barley-1931-rcbd.expected.json"))
	direct, err := analysis.Analyze(tr.Clone(), "yield", analysis.Options{Alpha: c.alpha})
	if err != nil {
		t.Fatal(err)
	}
	if len(c.meanRows) != len(direct.Means) {
		t.Fatalf("%d means shown, Analyze gives %d", len(c.meanRows), len(direct.Means))
	}
	for _, m := range c.meanRows {
		for _, d := range direct.Means {
			if d.Treatment == m.Treatment && (d.LettersLSD != m.LettersLSD || d.LettersTukey != m.LettersTukey || d.BackMean != m.BackMean) {
				t.Errorf("%s: shown %v %q, Analyze %v %q", m.Treatment, m.BackMean, m.LettersLSD, d.BackMean, d.LettersLSD)
			}
		}
	}
	if len(c.anova.Objects) != 6*(1+len(direct.ANOVA.Sources)) {
		t.Errorf("ANOVA grid has %d cells", len(c.anova.Objects))
	}

	// Exclude the two plots R's missing-plot set leaves out.
	u.showStep(stepRecord)
	for _, cell := range [][2]string{{"Crookston", "Trebi"}, {"Morris", "Peatland"}} {
		for i, p := range tr.Plots {
			if b.sites[p.Block-1] == cell[0] && tr.Treatment(p.Treatment).Name == cell[1] {
				if err := r.setExclusion(i, "", "test exclusion", "", false); err != nil {
					t.Fatal(err)
				}
			}
		}
	}
	if got := recordStatus(tr); got != "data 100% entered · 2 plots excluded" {
		t.Fatalf("status %q", got)
	}
	set = waitAnalysis(t, u, func() { u.showStep(stepCompare) })
	checkANOVA(t, set.result("yield").res, readExpected(t, "barley-1931-rcbd-missing.expected.json"))

	// Report: the work behind the save dialog, into a real file URI.
	dir := t.TempDir()
	rs := newReportStep(u)
	opts, keys := rs.reportOptions()
	report := filepath.Join(dir, "barley report.xlsx")
	wc, err := storage.Writer(storage.NewFileURI(report))
	if err != nil {
		t.Fatal(err)
	}
	exported := make(chan error)
	u.exported = func(_ fyne.URI, err error) { exported <- err }
	snap := cloneTrial(tr)
	u.runExport("season report", wc, true, func(ctx context.Context, w io.Writer, _ string, p func(int, int)) error {
		return writeReport(ctx, w, snap, keys, opts, p)
	})
	if err := <-exported; err != nil {
		t.Fatal(err)
	}
	if st, err := os.Stat(report); err != nil || st.Size() < 1000 {
		t.Fatalf("report not written: %v", err)
	}

	// Save, reopen, find everything.
	path := filepath.Join(dir, "barley.furlong")
	u.saveTo(path, nil)
	u2, _ := newTestApp(t, 0)
	if err := u2.OpenFile(path); err != nil {
		t.Fatal(err)
	}
	u2.compute.rounds.Wait()
	back := u2.doc.t
	if back.Title != "Barley 1931" || back.Random.Seed != 1931 || len(back.Plots) != 60 {
		t.Fatalf("reopened %q seed %d plots %d", back.Title, back.Random.Seed, len(back.Plots))
	}
	for i := range tr.Plots {
		if !sameValue(back.Traits[0].Values[i], tr.Traits[0].Values[i]) || len(back.Plots[i].Exclusions) != len(tr.Plots[i].Exclusions) {
			t.Fatalf("plot %d differs after reopening", tr.Plots[i].Number)
		}
	}
	if strings.HasSuffix(u2.win.Title(), "•") {
		t.Fatalf("a freshly opened file is marked unsaved: %q", u2.win.Title())
	}
}
