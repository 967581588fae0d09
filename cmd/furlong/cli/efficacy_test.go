package cli

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"furlong/trial/trialfile"
)

// End to end: 'new' with an untreated check, an assessment series and a
// pre-treatment count; values entered; 'analyze' gives AUDPC and percent
// efficacy in text and JSON. The expected values are worked by hand from
// the formulas of Abbott (1925, J. Econ. Entomol. 18, 265–267),
// Henderson & Tilton (1955, J. Econ. Entomol. 48, 157–161) and the
// trapezoidal AUDPC of Shaner & Finney (1977, Phytopathology 67,
// 1051–1056). With every plot present in an RCBD the least-squares means
// are the plain means.
func TestEfficacyEndToEnd(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "spray.furlong")
	code, _, stderr := run(t, "new", "-o", path, "--design", "rcbd", "--reps", "2", "--seed", "11",
		"--treatments", "UTC=Untreated,PA=Programme A,PB=Programme B", "--untreated", "UTC",
		"--traits", "aph0,aph", "--pre-count", "aph0=aph",
		"--assess", "sev:%=2026-06-01/0DAT,2026-06-08/7DAT,2026-06-22/21DAT")
	if code != ExitOK {
		t.Fatalf("new: exit %d: %s", code, stderr)
	}
	tr, err := trialfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	// values[treatment][block-1] per trait
	values := map[string]map[string][2][]float64{
		"aph0": {"UTC": {{39}, {41}}, "PA": {{51}, {49}}, "PB": {{30}, {30}}},
		"aph":  {"UTC": {{78}, {82}}, "PA": {{11}, {9}}, "PB": {{15}, {15}}},
		// sev_1, sev_2, sev_3 of each plot
		"sev": {"UTC": {{5, 20, 40}, {5, 20, 40}}, "PA": {{4, 6, 10}, {6, 8, 12}}, "PB": {{5, 10, 20}, {5, 10, 20}}},
	}
	for i, p := range tr.Plots {
		for key, byTrt := range values {
			v := byTrt[p.Treatment][p.Block-1]
			if key == "sev" {
				for k, x := range v {
					if err := tr.SetValue(i, "sev_"+itoa(k+1), x); err != nil {
						t.Fatal(err)
					}
				}
				continue
			}
			if err := tr.SetValue(i, key, v[0]); err != nil {
				t.Fatal(err)
			}
		}
	}
	if err := trialfile.Save(path, tr); err != nil {
		t.Fatal(err)
	}

	// Means: aph0 UTC 40, PA 50, PB 30; aph UTC 80, PA 10, PB 15.
	// Abbott PA (80−10)/80 = 87.5 %, PB (80−15)/80 = 81.25 %.
	// Henderson–Tilton PA 1 − (10·40)/(50·80) = 0.9 → 90 %;
	// PB 1 − (15·40)/(30·80) = 1 − 600/2400 = 0.75 → 75 %.
	// AUDPC over days 0, 7, 21: UTC (5+20)/2·7 + (20+40)/2·14 = 87.5 + 420
	// = 507.5; PA block 1 (4+6)/2·7 + (6+10)/2·14 = 35 + 112 = 147, block 2
	// (6+8)/2·7 + (8+12)/2·14 = 49 + 140 = 189, mean 168; PB (5+10)/2·7 +
	// (10+20)/2·14 = 52.5 + 210 = 262.5. Abbott on AUDPC: PA (507.5 − 168)/
	// 507.5 = 339.5/507.5 = 97/145; PB 245/507.5 = 14/29. The standardised
	// AUDPC divides every plot by the 21 days, so its means are these over
	// 21 and its efficacy the same.
	want := map[string]map[string][2]float64{ // trait -> treatment -> Abbott, HT (NaN: none)
		"aph":        {"PA": {87.5, 90}, "PB": {81.25, 75}},
		"sev_audpc":  {"PA": {100 * 97.0 / 145, math.NaN()}, "PB": {100 * 14.0 / 29, math.NaN()}},
		"sev_saudpc": {"PA": {100 * 97.0 / 145, math.NaN()}, "PB": {100 * 14.0 / 29, math.NaN()}},
	}
	wantUntreated := map[string]float64{"aph": 80, "sev_audpc": 507.5, "sev_saudpc": 507.5 / 21}
	code, stdout, stderr := run(t, "analyze", path, "--format", "json")
	if code != ExitOK {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	var out struct {
		Traits []struct {
			Trait    string `json:"trait"`
			Efficacy []struct {
				Treatment string   `json:"treatment"`
				Abbott    *float64 `json:"abbott_percent"`
				HT        *float64 `json:"henderson_tilton_percent"`
			} `json:"efficacy"`
			Untreated *struct {
				Treatment string  `json:"treatment"`
				Mean      float64 `json:"mean"`
				PreCount  string  `json:"pre_count_trait"`
			} `json:"efficacy_untreated"`
		} `json:"traits"`
	}
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	seen := 0
	for _, tr := range out.Traits {
		w, ok := want[tr.Trait]
		if !ok {
			continue // aph0 and the single assessments sev_1..3 are not checked here
		}
		seen++
		if tr.Untreated == nil || tr.Untreated.Treatment != "UTC" || math.Abs(tr.Untreated.Mean-wantUntreated[tr.Trait]) > 1e-9 {
			t.Errorf("%s: efficacy_untreated %+v, want UTC with mean %g", tr.Trait, tr.Untreated, wantUntreated[tr.Trait])
		}
		if len(tr.Efficacy) != 2 {
			t.Fatalf("%s: %d efficacy rows, want 2", tr.Trait, len(tr.Efficacy))
		}
		for _, row := range tr.Efficacy {
			e := w[row.Treatment]
			if row.Abbott == nil || math.Abs(*row.Abbott-e[0]) > 1e-9 {
				t.Errorf("%s %s: Abbott %v, want %g", tr.Trait, row.Treatment, row.Abbott, e[0])
			}
			switch {
			case math.IsNaN(e[1]) && row.HT != nil:
				t.Errorf("%s %s: Henderson–Tilton %g without pre-counts", tr.Trait, row.Treatment, *row.HT)
			case !math.IsNaN(e[1]) && (row.HT == nil || math.Abs(*row.HT-e[1]) > 1e-9):
				t.Errorf("%s %s: Henderson–Tilton %v, want %g", tr.Trait, row.Treatment, row.HT, e[1])
			}
		}
	}
	if seen != len(want) {
		t.Errorf("efficacy for %d of %d traits", seen, len(want))
	}

	// The text output shows the table, the definitions and the cautions.
	code, stdout, stderr = run(t, "analyze", path, "--trait", "aph")
	if code != ExitOK {
		t.Fatalf("analyze --trait aph: exit %d: %s", code, stderr)
	}
	for _, s := range []string{"Percent efficacy against the untreated check UTC", "87.5", "90.0", "Henderson–Tilton", "label is the law"} {
		if !strings.Contains(stdout, s) {
			t.Errorf("analyze text lacks %q:\n%s", s, stdout)
		}
	}
	// show marks the untreated check and the series.
	_, stdout, _ = run(t, "show", path)
	for _, s := range []string{"untreated check", "area under the curve of series sev (3 assessments over 21 days)"} {
		if !strings.Contains(stdout, s) {
			t.Errorf("show lacks %q", s)
		}
	}
	// Mistakes in the command line are plain errors.
	for _, args := range [][]string{
		{"--untreated", "ZZ"},
		{"--assess", "sev=2026-06-01"},
		{"--assess", "sev=2026-06-01,soon"},
		{"--pre-count", "nothere=aph"},
	} {
		a := append([]string{"new", "-o", filepath.Join(t.TempDir(), "x.furlong"), "--reps", "2", "--treatments", "UTC,PA", "--traits", "aph"}, args...)
		if code, _, stderr := run(t, a...); code != ExitUsage || stderr == "" {
			t.Errorf("new %v: exit %d, %q; want a usage error", args, code, stderr)
		}
	}
}
