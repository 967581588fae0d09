package cli

import (
	"encoding/json"
	"math"
	"testing"

	"furlong/stats/refdata"
)

// The analysis-of-covariance references computed with R 4.2.2, car and
// emmeans are in stats/refdata/ancova (its README, the R script beside the
// data).

type rAnova struct {
	Source string   `json:"source"`
	DF     int      `json:"df"`
	SS     float64  `json:"ss"`
	F      *float64 `json:"f"`
	P      *float64 `json:"p"`
}

type rMean struct {
	Levels map[string]string `json:"levels"`
	EMMean float64           `json:"emmean"`
	SE     float64           `json:"se"`
}

type rCov struct {
	Anova      []rAnova `json:"anova"`
	Slope      float64  `json:"slope"`
	SlopeSE    float64  `json:"slope_se"`
	SlopeP     float64  `json:"slope_p"`
	HomF       float64  `json:"homogeneity_f"`
	HomP       float64  `json:"homogeneity_p"`
	Means      []rMean  `json:"means"`
	MeansWool  []rMean  `json:"means_wool"`
	MeansTens  []rMean  `json:"means_tension"`
	MeansCells []rMean  `json:"means_wool_tension"`
}

func ancovaRef(t *testing.T) (fiber, wb rCov) {
	t.Helper()
	var doc struct {
		Fiber      rCov `json:"fiber"`
		Warpbreaks rCov `json:"warpbreaks"`
	}
	refdata.JSON(t, "ancova/ancova.expected.json", &doc)
	return doc.Fiber, doc.Warpbreaks
}

type ancovaOut struct {
	Traits []struct {
		Anova []struct {
			Source string   `json:"source"`
			DF     int      `json:"df"`
			SS     float64  `json:"ss"`
			F      *float64 `json:"f"`
			P      *float64 `json:"p"`
		} `json:"anova"`
		Means []struct {
			Treatment string  `json:"treatment"`
			Mean      float64 `json:"mean"`
			SE        float64 `json:"se"`
		} `json:"means"`
		Covariate struct {
			Slope float64 `json:"slope"`
			SE    float64 `json:"se"`
			P     float64 `json:"p"`
			HomF  float64 `json:"homogeneity_f"`
			HomP  float64 `json:"homogeneity_p"`
		} `json:"covariate"`
		Effects []struct {
			Effect string `json:"effect"`
			Means  []struct {
				Levels map[string]string `json:"levels"`
				Mean   float64           `json:"mean"`
				SE     float64           `json:"se"`
			} `json:"means"`
		} `json:"effects"`
	} `json:"traits"`
}

func closeRel(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Max(1, math.Abs(want))
}

// checkAncova compares the command's ANOVA lines and covariate with R's;
// names maps R's line names to ours.
func checkAncova(t *testing.T, label string, out ancovaOut, ref rCov, names map[string]string) {
	t.Helper()
	got := out.Traits[0]
	for _, l := range ref.Anova {
		name := names[l.Source]
		found := false
		for _, g := range got.Anova {
			if g.Source != name {
				continue
			}
			found = true
			if g.DF != l.DF || !closeRel(g.SS, l.SS, 1e-9) || (l.F != nil && (g.F == nil || !closeRel(*g.F, *l.F, 1e-9))) ||
				(l.P != nil && (g.P == nil || !closeRel(*g.P, *l.P, 1e-7))) {
				t.Errorf("%s %s: df %d SS %.12g F %v p %v; R %d %.12g %v %v", label, name, g.DF, g.SS, g.F, g.P, l.DF, l.SS, l.F, l.P)
			}
		}
		if !found {
			t.Errorf("%s: no line %q (R's %q)", label, name, l.Source)
		}
	}
	c := got.Covariate
	if !closeRel(c.Slope, ref.Slope, 1e-9) || !closeRel(c.SE, ref.SlopeSE, 1e-9) || !closeRel(c.P, ref.SlopeP, 1e-7) ||
		!closeRel(c.HomF, ref.HomF, 1e-9) || !closeRel(c.HomP, ref.HomP, 1e-7) {
		t.Errorf("%s covariate %+v; R slope %g SE %g p %g, equal slopes F %g p %g", label, c, ref.Slope, ref.SlopeSE, ref.SlopeP, ref.HomF, ref.HomP)
	}
}

// TestAnalyzeCovariateAgainstR: `furlong analyze --covariate` on emmeans's
// fibre data (one list of treatments, CRD) and on warp breaks in blocks
// with a covariate (2 × 3 factorial, plots missing) gives R's type II
// lines, slope, test of equal slopes and adjusted (estimated marginal)
// means with their SEs (stats/refdata/ancova: R 4.2.2, car, emmeans).
func TestAnalyzeCovariateAgainstR(t *testing.T) {
	t.Parallel()
	fiber, wb := ancovaRef(t)

	code, stdout, stderr := run(t, "analyze", refdata.File(t, "ancova/fiber-emmeans.csv"), "--treatment", "machine", "--covariate", "diameter", "--response", "strength", "--format", "json")
	if code != ExitOK {
		t.Fatalf("fiber: exit %d: %s", code, stderr)
	}
	var out ancovaOut
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	checkAncova(t, "fiber", out, fiber, map[string]string{"diameter": "covariate", "machine": "treatment", "Residuals": "error"})
	for i, m := range fiber.Means {
		g := out.Traits[0].Means[i]
		if g.Treatment != m.Levels["machine"] || !closeRel(g.Mean, m.EMMean, 1e-9) || !closeRel(g.SE, m.SE, 1e-9) {
			t.Errorf("fiber %s: %.12g ± %.12g; emmeans %.12g ± %.12g", g.Treatment, g.Mean, g.SE, m.EMMean, m.SE)
		}
	}

	code, stdout, stderr = run(t, "analyze", refdata.File(t, "ancova/warpbreaks-covariate.csv"), "--factor", "wool", "--factor", "tension", "--block", "rep",
		"--covariate", "x", "--response", "breaks", "--format", "json")
	if code != ExitOK {
		t.Fatalf("warp breaks: exit %d: %s", code, stderr)
	}
	out = ancovaOut{}
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	checkAncova(t, "warp breaks", out, wb, map[string]string{"rep": "block", "x": "covariate", "wool": "wool", "tension": "tension", "wool:tension": "wool:tension", "Residuals": "error"})
	want := map[string][]rMean{"wool": wb.MeansWool, "tension": wb.MeansTens, "wool:tension": wb.MeansCells}
	seen := 0
	for _, e := range out.Traits[0].Effects {
		ref, ok := want[e.Effect]
		if !ok {
			continue
		}
		seen++
		for _, r := range ref {
			found := false
			for _, g := range e.Means {
				same := len(g.Levels) == len(r.Levels)
				for k, v := range r.Levels {
					same = same && g.Levels[k] == v
				}
				if !same {
					continue
				}
				found = true
				if !closeRel(g.Mean, r.EMMean, 1e-9) || !closeRel(g.SE, r.SE, 1e-9) {
					t.Errorf("%s %v: %.12g ± %.12g; emmeans %.12g ± %.12g", e.Effect, r.Levels, g.Mean, g.SE, r.EMMean, r.SE)
				}
			}
			if !found {
				t.Errorf("%s: no mean for %v", e.Effect, r.Levels)
			}
		}
	}
	if seen != 3 {
		t.Errorf("%d of the 3 effects found", seen)
	}
}
