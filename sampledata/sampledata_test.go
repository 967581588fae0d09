package sampledata

import (
	"bytes"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"testing"

	"furlong/trial"
	"furlong/trial/analysis"
)

// TestDemoTrial checks the demo (invented data) against what it is for: an
// RCBD with 8 to 12 entries and 4 blocks, a check, plot weight,
// moisture, derived yield, height and a lodging score, one excluded plot and
// one missing value.
func TestDemoTrial(t *testing.T) {
	t.Parallel()
	tr, err := Trial()
	if err != nil {
		t.Fatal(err)
	}
	if err := tr.Validate(); err != nil {
		t.Fatal(err)
	}
	if tr.Design.Kind != trial.RCBD || tr.Design.Reps != 4 {
		t.Errorf("design %v", tr.Design)
	}
	if n := len(tr.Treatments); n < 8 || n > 12 {
		t.Errorf("%d entries", n)
	}
	if len(tr.Checks()) != 1 {
		t.Errorf("%d checks, want 1", len(tr.Checks()))
	}
	y := tr.Trait("yield")
	if y == nil || y.Derived == nil {
		t.Fatal("no derived yield trait")
	}
	missing, excluded := 0, 0
	for _, tt := range tr.Traits {
		if tt.Derived != nil {
			continue
		}
		for _, v := range tt.Values {
			if math.IsNaN(v) {
				missing++
			}
		}
	}
	for i := range tr.Plots {
		if ex, _ := tr.Excluded(i, "yield"); ex {
			excluded++
		}
	}
	if missing != 1 || excluded != 1 {
		t.Errorf("%d missing values and %d excluded plots, want 1 and 1", missing, excluded)
	}
	// Realistic differences: the entries differ on yield (F test), but not
	// every entry from every other (common practice for a variety trial).
	r, err := analysis.Analyze(tr, "yield", analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	if trt, _ := r.ANOVA.Treatment(); trt.P >= 0.01 {
		t.Errorf("yield treatment p = %g: the demo should show clear differences", trt.P)
	}
	sig := 0
	for _, p := range r.Pairs {
		if p.PTukey < 0.05 {
			sig++
		}
	}
	if sig == 0 || sig > len(r.Pairs)/2 {
		t.Errorf("%d of %d pairs differ by Tukey: want some, but most not", sig, len(r.Pairs))
	}
}

// TestDemoIsReproducible regenerates the demo file and compares it byte for
// byte with the embedded one: the numbers come from a seeded generator.
func TestDemoIsReproducible(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the generator")
	}
	t.Parallel()
	out := filepath.Join(t.TempDir(), "demo.furlong")
	cmd := exec.Command("go", "run", "./internal/gen", "-o", out)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("generator: %v\n%s", err, b)
	}
	got, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, Bytes()) {
		t.Error("go generate ./sampledata would change demo.furlong: regenerate it and commit")
	}
}

// TestDemoSeries checks the demo series (invented data) against what it is
// for: four to six sites of one season with the same entries and check,
// RCBDs of four blocks, one entry not sown at one site, and a derived
// yield in t/ha at every site in a plausible range for spring wheat
// (4–10 t/ha: from memory).
func TestDemoSeries(t *testing.T) {
	t.Parallel()
	trials, err := SeriesTrials()
	if err != nil {
		t.Fatal(err)
	}
	if n := len(trials); n < 4 || n > 6 {
		t.Fatalf("%d sites", n)
	}
	sites := map[string]bool{}
	missing := 0
	for _, st := range trials {
		tr := st.Trial
		if err := tr.Validate(); err != nil {
			t.Fatalf("%s: %v", st.FileName, err)
		}
		if tr.Season != "2026" || tr.Site.Name == "" || sites[tr.Site.Name] {
			t.Errorf("%s: season %q, site %q (sites must be named and differ)", st.FileName, tr.Season, tr.Site.Name)
		}
		sites[tr.Site.Name] = true
		if tr.Design.Kind != trial.RCBD || tr.Design.Reps != 4 {
			t.Errorf("%s: design %v", st.FileName, tr.Design)
		}
		if len(tr.Checks()) != 1 || tr.Checks()[0].Code != "CHK" {
			t.Errorf("%s: checks %v", st.FileName, tr.Checks())
		}
		missing += 10 - len(tr.Treatments)
		y := tr.Trait("yield")
		if y == nil || y.Derived == nil || y.Unit != trial.UnitTHa {
			t.Fatalf("%s: no derived yield in t/ha", st.FileName)
		}
		r, err := analysis.Analyze(tr, "yield", analysis.Options{})
		if err != nil {
			t.Fatalf("%s: %v", st.FileName, err)
		}
		if m := r.ANOVA.GrandMean; m < 4 || m > 10 {
			t.Errorf("%s: mean yield %.2f t/ha", st.FileName, m)
		}
	}
	if missing != 1 {
		t.Errorf("%d entries missing across the sites, want 1", missing)
	}
}

// TestDemoSeriesIsReproducible regenerates the demo series' files and
// compares them byte for byte with the embedded ones.
func TestDemoSeriesIsReproducible(t *testing.T) {
	if testing.Short() {
		t.Skip("builds the generator")
	}
	t.Parallel()
	dir := t.TempDir()
	cmd := exec.Command("go", "run", "./internal/gen", "-o", filepath.Join(dir, "demo.furlong"), "-series", dir)
	if b, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("generator: %v\n%s", err, b)
	}
	trials, err := SeriesTrials()
	if err != nil {
		t.Fatal(err)
	}
	for _, st := range trials {
		got, err := os.ReadFile(filepath.Join(dir, st.FileName))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(got, st.Bytes) {
			t.Errorf("go generate ./sampledata would change series/%s: regenerate it and commit", st.FileName)
		}
	}
	if m, _ := filepath.Glob(filepath.Join(dir, "series-*.furlong")); len(m) != len(trials) {
		t.Errorf("the generator writes %d series files, the package embeds %d", len(m), len(trials))
	}
}
