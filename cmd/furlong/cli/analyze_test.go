package cli

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"furlong/stats/refdata"
)

// run runs the CLI as a user would and returns exit code, stdout, stderr.
func run(t *testing.T, args ...string) (int, string, string) {
	t.Helper()
	var out, errb bytes.Buffer
	code := Main(context.Background(), args, Env{Stdout: &out, Stderr: &errb, Version: "test"})
	return code, out.String(), errb.String()
}

type refANOVA struct {
	Source string   `json:"source"`
	DF     int      `json:"df"`
	SS     float64  `json:"ss"`
	MS     float64  `json:"ms"`
	F      *float64 `json:"f"`
	P      *float64 `json:"p"`
}

type refExpected struct {
	ANOVA     []refANOVA `json:"anova"`
	DFError   int        `json:"df_error"`
	MSE       float64    `json:"mse"`
	GrandMean float64    `json:"grand_mean"`
	CV        float64    `json:"cv_percent"`
	NObs      int        `json:"n_obs"`
	Means     []struct {
		Treatment string  `json:"treatment"`
		N         int     `json:"n"`
		RawMean   float64 `json:"raw_mean"`
		LSMean    float64 `json:"ls_mean"`
		SE        float64 `json:"se"`
	} `json:"means"`
	Pairs []struct {
		Contrast    string  `json:"contrast"`
		Diff        float64 `json:"diff"`
		SE          float64 `json:"se"`
		PLSD        float64 `json:"p_lsd"`
		PTukeyExact float64 `json:"p_tukey_exact"`
	} `json:"pairs"`
	LSD     *float64          `json:"lsd_05"`
	HSD     *float64          `json:"hsd_05"`
	Letters map[string]string `json:"letters_tukey_example"`
	Shapiro *struct {
		W float64 `json:"w"`
		P float64 `json:"p"`
	} `json:"shapiro_residuals"`
	Levene *struct {
		F float64 `json:"f"`
		P float64 `json:"p"`
	} `json:"levene_median"`
	Bartlett *struct {
		K2 float64 `json:"k2"`
		P  float64 `json:"p"`
	} `json:"bartlett"`
	RE *float64 `json:"relative_efficiency_vs_crd"`
}

type gotJSON struct {
	Traits []jsonTrait `json:"traits"`
}

func close(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	d := math.Abs(got - want)
	if d > tol*math.Max(1, math.Abs(want)) {
		t.Errorf("%s = %.15g, want %.15g (R 4.2.2 / scipy reference), diff %.3g", what, got, want, d)
	}
}

// TestAnalyzeCSVAgainstR runs `furlong analyze DATA.csv --format json` on
// open datasets and compares every number with the reference results made by
// R 4.2.2 (stats::lm, car::Anova type II, emmeans, shapiro.test,
// car::leveneTest, bartlett.test) and scipy's studentized_range for the exact
// Tukey p-values (see stats/refdata/README.md).
func TestAnalyzeCSVAgainstR(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name  string
		args  []string
		rName map[string]string // R source name -> ours
	}{
		{"plant-growth", []string{"--treatment", "treatment", "--response", "weight"}, map[string]string{"treatment": "treatment"}},
		{"insect-sprays-sqrt", []string{"--treatment", "treatment", "--response", "sqrt_count"}, map[string]string{"treatment": "treatment"}},
		{"barley-1931-rcbd", []string{"--treatment", "variety", "--block", "site"}, map[string]string{"variety": "treatment", "site": "block"}},
		{"barley-1931-rcbd-missing", []string{"--treatment", "variety", "--block", "site"}, map[string]string{"variety": "treatment", "site": "block"}},
		{"orchard-sprays-latin", []string{"--treatment", "treatment", "--row", "row", "--column", "col"}, map[string]string{"treatment": "treatment", "row": "row", "col": "column"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			var want refExpected
			refdata.JSON(t, c.name+".expected.json", &want)
			args := append([]string{"analyze", refdata.File(t, c.name+".csv"), "--format", "json"}, c.args...)
			code, out, stderr := run(t, args...)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, stderr)
			}
			var got gotJSON
			if err := json.Unmarshal([]byte(out), &got); err != nil {
				t.Fatalf("output is not JSON: %v\n%s", err, out)
			}
			if len(got.Traits) != 1 {
				t.Fatalf("got %d traits, want 1", len(got.Traits))
			}
			g := got.Traits[0]
			const tol = 1e-9
			lines := map[string]jsonANOVA{}
			for _, l := range g.ANOVA {
				lines[l.Source] = l
			}
			for _, w := range want.ANOVA {
				name := c.rName[w.Source]
				if w.Source == "Residuals" {
					name = "error"
				}
				l, ok := lines[name]
				if !ok {
					t.Fatalf("no ANOVA line %q (R's %q)", name, w.Source)
				}
				if l.DF != w.DF {
					t.Errorf("%s df = %d, want %d", name, l.DF, w.DF)
				}
				close(t, name+" SS", l.SS, w.SS, tol)
				close(t, name+" MS", *l.MS, w.MS, tol)
				if w.F != nil {
					close(t, name+" F", *l.F, *w.F, tol)
					close(t, name+" p", *l.P, *w.P, tol)
				} else if l.F != nil {
					t.Errorf("%s has an F test; R's has none", name)
				}
			}
			close(t, "CV%", *g.CVPercent, want.CV, tol)
			if want.MSE != 0 {
				close(t, "MSE", *g.MSE, want.MSE, tol)
				close(t, "grand mean", *g.GrandMean, want.GrandMean, tol)
				if *g.DFError != want.DFError {
					t.Errorf("error df = %d, want %d", *g.DFError, want.DFError)
				}
			}
			means := map[string]jsonMean{}
			for _, m := range g.Means {
				means[m.Treatment] = m
			}
			for _, w := range want.Means {
				m, ok := means[w.Treatment]
				if !ok {
					t.Fatalf("no mean for %s", w.Treatment)
				}
				if m.N != w.N {
					t.Errorf("%s n = %d, want %d", w.Treatment, m.N, w.N)
				}
				close(t, w.Treatment+" LS mean", m.Mean, w.LSMean, tol)
				close(t, w.Treatment+" raw mean", m.RawMean, w.RawMean, tol)
				close(t, w.Treatment+" SE", m.SE, w.SE, tol)
			}
			pairs := map[string]jsonPair{}
			for _, p := range g.Pairs {
				pairs[p.A+" - "+p.B] = p
				pairs[p.B+" - "+p.A] = jsonPair{A: p.B, B: p.A, Diff: -p.Diff, SE: p.SE, PLSD: p.PLSD, PTukey: p.PTukey}
			}
			for _, w := range want.Pairs {
				p, ok := pairs[w.Contrast]
				if !ok {
					t.Fatalf("no pair %q", w.Contrast)
				}
				close(t, w.Contrast+" diff", p.Diff, w.Diff, tol)
				close(t, w.Contrast+" SE", p.SE, w.SE, tol)
				close(t, w.Contrast+" p (LSD)", p.PLSD, w.PLSD, tol)
				// scipy's studentized_range, good to about 1e-15 (stats/refdata/README.md).
				close(t, w.Contrast+" p (Tukey)", p.PTukey, w.PTukeyExact, tol)
			}
			if want.LSD != nil {
				if g.LSD == nil {
					t.Error("no LSD for balanced data")
				} else {
					close(t, "LSD", *g.LSD, *want.LSD, tol)
				}
			}
			if want.HSD != nil {
				if g.HSD == nil {
					t.Error("no HSD for balanced data")
				} else {
					close(t, "HSD", *g.HSD, *want.HSD, tol)
				}
			}
			if strings.HasSuffix(c.name, "-missing") && (g.LSD != nil || g.HSD != nil) {
				t.Error("LSD/HSD given although replication is unequal")
			}
			// Letters: compare which pairs share a letter, not the letters.
			shares := func(a, b string) bool { return strings.ContainsAny(a, b) }
			for a, la := range want.Letters {
				for b, lb := range want.Letters {
					if a >= b {
						continue
					}
					if got, want := shares(means[a].LettersTukey, means[b].LettersTukey), shares(la, lb); got != want {
						t.Errorf("%s and %s share a Tukey letter: %v, reference %v (%q %q)", a, b, got, want, means[a].LettersTukey, means[b].LettersTukey)
					}
				}
			}
			d := g.Diagnostics
			if want.Shapiro != nil {
				close(t, "Shapiro-Wilk W", *d.ShapiroW, want.Shapiro.W, 1e-9)
				close(t, "Shapiro-Wilk p", *d.ShapiroP, want.Shapiro.P, 1e-9)
			}
			if want.Levene != nil {
				close(t, "Levene F", *d.LeveneF, want.Levene.F, tol)
				close(t, "Levene p", *d.LeveneP, want.Levene.P, tol)
			}
			if want.Bartlett != nil {
				close(t, "Bartlett K2", *d.BartlettK2, want.Bartlett.K2, tol)
				close(t, "Bartlett p", *d.BartlettP, want.Bartlett.P, tol)
			}
			if want.RE != nil {
				close(t, "relative efficiency", *g.RelEff, *want.RE, tol)
			}
		})
	}
}
