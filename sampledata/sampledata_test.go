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
