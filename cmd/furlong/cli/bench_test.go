package cli

import (
	"context"
	"io"
	"math/rand/v2"
	"path/filepath"
	"strconv"
	"testing"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// benchTrial writes an RCBD of k entries × r blocks with ten traits filled
// from a seeded generator (invented numbers: a speed test) and 1% missing.
func benchTrial(b *testing.B, k, r int) string {
	b.Helper()
	trts := make([]trial.Treatment, k)
	for i := range trts {
		trts[i] = trial.Treatment{Code: "E" + strconv.Itoa(i+1), Name: "Entry " + strconv.Itoa(i+1), Role: trial.RoleEntry}
	}
	trts[0].Role = trial.RoleCheck
	var traits []trial.Trait
	for j := 0; j < 10; j++ {
		traits = append(traits, trial.Trait{Key: "t" + strconv.Itoa(j), Name: "Trait " + strconv.Itoa(j), Unit: "u", Kind: trial.Continuous, Decimals: 2, HigherBetter: true})
	}
	t, err := trial.New(trial.NewOptions{Title: "speed", Treatments: trts, Design: trial.Design{Kind: trial.RCBD, Reps: r}, Traits: traits, Seed: 1})
	if err != nil {
		b.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(3, 4))
	for j := range t.Traits {
		for i := range t.Plots {
			v := 6 + 0.5*rng.NormFloat64()
			if rng.Float64() < 0.01 {
				v = trial.Missing
			}
			t.Traits[j].Values[i] = v
		}
	}
	path := filepath.Join(b.TempDir(), "t.furlong")
	if err := trialfile.Save(path, t); err != nil {
		b.Fatal(err)
	}
	return path
}

func benchReportCommand(b *testing.B, k, r int) {
	path := benchTrial(b, k, r)
	out := filepath.Join(b.TempDir(), "r.xlsx")
	env := Env{Stdout: io.Discard, Stderr: io.Discard, Version: "bench"}
	b.ResetTimer()
	for b.Loop() {
		if code := Main(context.Background(), []string{"report", path, "-o", out, "--force"}, env); code != 0 {
			b.Fatalf("exit %d", code)
		}
	}
}

// BenchmarkReportCommand1200 is the whole `furlong report` a user runs on a
// 1,200-plot trial with 10 traits: load, analyse every trait, write the
// workbook with charts (target under 2 s).
func BenchmarkReportCommand1200(b *testing.B) { benchReportCommand(b, 300, 4) }

// BenchmarkReportCommand24000: 24,000 plots (600 entries × 40 replicates),
// 10 traits (target under 20 s, memory under 1 GiB).
func BenchmarkReportCommand24000(b *testing.B) { benchReportCommand(b, 600, 40) }
