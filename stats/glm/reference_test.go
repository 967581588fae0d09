package glm

import "testing"

// Tippett (1950) warp breaks, 2 × 3 factorial CRD: type II ANOVA and LS
// means computed with R 4.2.2 (lm + car::Anova, emmeans), in
// testdata/warpbreaks-factorial.expected.json.
func TestWarpbreaksFactorial(t *testing.T) {
	t.Parallel()
	m := loadCSV(t, "warpbreaks-factorial.csv", []string{"wool", "tension"}, "", "breaks")
	r, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	checkAgainst(t, m, r, loadRef(t, "warpbreaks-factorial.expected.json"), 1e-9, 1e-9)
	// Roles of the lines (common practice: main effects, interaction, one error).
	for _, c := range []struct {
		src                  string
		role                 Role
		interaction, stratum bool
	}{{"wool", RoleTreatment, false, false}, {"wool:tension", RoleTreatment, true, false}, {"error", RoleError, false, false}, {"total", RoleTotal, false, false}} {
		l, _ := r.Line(c.src)
		if l.Role != c.role || l.Interaction() != c.interaction || l.Stratum() != c.stratum {
			t.Errorf("%s: role %v interaction %v stratum %v", c.src, l.Role, l.Interaction(), l.Stratum())
		}
	}
}

// Yates (1935) oats split plot, R 4.2.2 aov with Error(block/variety) and
// lmer means: testdata/oats-split.expected.json.
func TestOatsSplit(t *testing.T) {
	t.Parallel()
	m := loadCSV(t, "oats-split.csv", []string{"variety", "nitrogen"}, "block", "yield")
	m.Structure = SplitPlot
	r, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	ref := loadRef(t, "oats-split.expected.json")
	// The means and SEs of the reference come from lmer, whose optimum is
	// good to about 1e-6 relative (refdata README): hence the looser
	// tolerance for them.
	checkAgainst(t, m, r, ref, 1e-9, 1e-6)
	if l, _ := r.Line("error_a"); !l.Stratum() || l.Role != RoleError {
		t.Errorf("error_a is not a stratum error line: %+v", l)
	}
	if l, _ := r.Line("variety:nitrogen"); !l.Interaction() || l.ErrorTerm != "error_b" {
		t.Errorf("variety:nitrogen: %+v", l)
	}
	if l, _ := r.Line("variety"); l.Interaction() || l.ErrorTerm != "error_a" {
		t.Errorf("variety: %+v", l)
	}
	for k, v := range ref.SED {
		s, ok := r.SED(k)
		if !ok || !near(s.SED, v, 1e-9) || s.Min != s.Max && !near(s.Min, s.Max, 1e-9) {
			t.Errorf("SED %s = %+v, want %.10g", k, s, v)
		}
	}
}

// The same with plots 3, 40 and 61 missing: lme4 REML, lmerTest type II F
// with Satterthwaite df, emmeans (R 4.2.2): oats-split-missing.expected.json.
func TestOatsSplitMissingREML(t *testing.T) {
	t.Parallel()
	m := loadCSV(t, "oats-split-missing.csv", []string{"variety", "nitrogen"}, "block", "yield")
	m.Structure = SplitPlot
	r, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	if r.Method != REML {
		t.Fatalf("method %v", r.Method)
	}
	ref := loadRef(t, "oats-split-missing.expected.json")
	checkAgainst(t, m, r, ref, 1e-5, 1e-5)
	for k, v := range ref.VC {
		c, ok := r.Component(k)
		if !ok || !near(c.Variance, v, 1e-5) {
			t.Errorf("component %s = %v, want %.10g", k, c.Variance, v)
		}
	}
}
