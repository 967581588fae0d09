package stats

import (
	"math"
	"strconv"
	"strings"
	"testing"
)

// refTol is the relative tolerance against the R 4.2.2 reference results,
// which are printed to 15 significant digits.
const refTol = 1e-9

// loadRef builds the model of an open dataset: response column, treatment
// column and nuisance columns, dropping rows whose response is NA.
func loadRef(t *testing.T, name, response, treatment string, nuisance ...string) (Model, []string) {
	t.Helper()
	header, rows := readRefCSV(t, name+".csv")
	ys := column(t, header, rows, response)
	var keep [][]string
	var y []float64
	for i, s := range ys {
		if s == "NA" {
			continue
		}
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatal(err)
		}
		y = append(y, v)
		keep = append(keep, rows[i])
	}
	trt, levels := factorOf(treatment, column(t, header, keep, treatment))
	m := Model{Response: y, Treatment: trt}
	for _, nn := range nuisance {
		f, _ := factorOf(nn, column(t, header, keep, nn))
		m.Nuisance = append(m.Nuisance, f)
	}
	return m, levels
}

// checkAgainstR compares a fit with an R reference file (lm, car::Anova
// type II, emmeans).
func checkAgainstR(t *testing.T, a *ANOVA, e expected, levels []string) {
	t.Helper()
	checkFinite(t, a)
	byName := map[string]Source{}
	for _, s := range a.Sources {
		byName[s.Name] = s
	}
	for _, line := range e.ANOVA {
		name := line.Source
		s, ok := byName[name]
		if name == "Residuals" {
			s, ok = a.Error()
		}
		if !ok {
			t.Errorf("no ANOVA line %q in %v", name, a.Sources)
			continue
		}
		if s.DF != line.DF {
			t.Errorf("%s: df %d, want %d", name, s.DF, line.DF)
		}
		checkRel(t, name+" SS", s.SS, line.SS, refTol)
		checkRel(t, name+" MS", s.MS, line.MS, refTol)
		if line.F != nil {
			if !s.HasTest {
				t.Errorf("%s: HasTest false", name)
			}
			checkRel(t, name+" F", s.F, *line.F, refTol)
			checkRel(t, name+" P", s.P, *line.P, refTol)
		} else if s.HasTest || s.F != 0 || s.P != 0 {
			t.Errorf("%s: has a test (%v, F %g, P %g), want none", name, s.HasTest, s.F, s.P)
		}
	}
	if e.TotalSS != 0 {
		tot, ok := a.Total()
		if !ok || tot.Name != "total" || tot.DF != a.N-1 || tot.HasTest {
			t.Errorf("total line %+v", tot)
		}
		checkRel(t, "total SS", tot.SS, e.TotalSS, refTol)
		errLine, _ := a.Error()
		checkRel(t, "R²", a.RSquared, 1-errLine.SS/e.TotalSS, refTol)
	}
	if e.NObs != 0 && a.N != e.NObs {
		t.Errorf("N = %d, want %d", a.N, e.NObs)
	}
	if e.DFError != 0 && a.DFError != e.DFError {
		t.Errorf("DFError = %d, want %d", a.DFError, e.DFError)
	}
	if e.MSE != 0 {
		checkRel(t, "MSE", a.MSE, e.MSE, refTol)
	}
	if e.GrandMean != 0 {
		checkRel(t, "grand mean", a.GrandMean, e.GrandMean, refTol)
	}
	checkRel(t, "CV%", a.CVPercent, e.CV, refTol)
	if e.RE != nil {
		// Gomez & Gomez (1984), section 2.2.3, as computed in the reference file.
		checkRel(t, "relative efficiency", present(t, "relative efficiency", a.RelativeEfficiency), *e.RE, refTol)
	}
	code := map[string]int{}
	for i, l := range levels {
		code[l] = i
	}
	for _, em := range e.Means {
		i, ok := code[em.Treatment]
		if !ok {
			t.Fatalf("unknown treatment %q", em.Treatment)
		}
		m := a.Means[i]
		if m.N != em.N {
			t.Errorf("%s: N %d, want %d", em.Treatment, m.N, em.N)
		}
		checkRel(t, em.Treatment+" raw mean", m.RawMean, em.RawMean, refTol)
		checkRel(t, em.Treatment+" LS mean", m.Mean, em.LSMean, refTol)
		checkRel(t, em.Treatment+" SE", m.SE, em.SE, refTol)
	}
	for _, p := range e.Pairs {
		names := strings.Split(p.Contrast, " - ")
		i, j := code[names[0]], code[names[1]]
		checkRel(t, p.Contrast+" pair SE", a.PairSE(i, j), p.SE, refTol)
		checkRel(t, p.Contrast+" pair SE (reversed)", a.PairSE(j, i), p.SE, refTol)
		// The difference of LS means: absolute tolerance, as some are ~0.
		if d := a.Means[i].Mean - a.Means[j].Mean; math.Abs(d-p.Diff) > refTol*math.Max(1, math.Abs(p.Diff)) {
			t.Errorf("%s: difference %.15g, want %.15g", p.Contrast, d, p.Diff)
		}
	}
}

// TestPlantGrowth: one-way, 3 × 10; R 4.2.2 lm/anova/emmeans on
// datasets::PlantGrowth (Dobson 1983, Table 7.1).
func TestPlantGrowth(t *testing.T) {
	t.Parallel()
	m, lv := loadRef(t, "plant-growth", "weight", "treatment")
	a, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	checkAgainstR(t, a, readExpected(t, "plant-growth"), lv)
	if !a.Balanced || a.Adjusted {
		t.Errorf("Balanced %v Adjusted %v, want true false", a.Balanced, a.Adjusted)
	}
	// Balanced: SE of a mean and of a difference, as emmeans gives them.
	e := readExpected(t, "plant-growth")
	checkRel(t, "SEMean", present(t, "SEMean", a.SEMean), e.Means[0].SE, refTol)
	checkRel(t, "SED", present(t, "SED", a.SED), e.Pairs[0].SE, refTol)
}

// TestInsectSprays: one-way, 6 × 12, raw counts and square-root counts;
// R 4.2.2 on datasets::InsectSprays (Beall 1942).
func TestInsectSprays(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ file, resp string }{
		{"insect-sprays", "count"},
		{"insect-sprays-sqrt", "sqrt_count"},
	} {
		m, lv := loadRef(t, c.file, c.resp, "treatment")
		a, err := Fit(m)
		if err != nil {
			t.Fatal(err)
		}
		checkAgainstR(t, a, readExpected(t, c.file), lv)
	}
}

// TestBarleyRCBD: RCBD, 10 varieties in 6 sites; R 4.2.2 lm, emmeans and
// Gomez & Gomez relative efficiency on lattice::barley, 1931 (Immer, Hayes
// & Powers 1934).
func TestBarleyRCBD(t *testing.T) {
	t.Parallel()
	m, lv := loadRef(t, "barley-1931-rcbd", "yield", "variety", "site")
	a, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	e := readExpected(t, "barley-1931-rcbd")
	checkAgainstR(t, a, e, lv)
	if !a.Balanced || a.Adjusted {
		t.Errorf("Balanced %v Adjusted %v, want true false", a.Balanced, a.Adjusted)
	}
	// Lines in table order, each with its role and the factor's own name.
	wantLines := []struct {
		name string
		role Role
	}{{"variety", RoleTreatment}, {"site", RoleBlock}, {"error", RoleError}, {"total", RoleTotal}}
	for i, w := range wantLines {
		if i >= len(a.Sources) || a.Sources[i].Name != w.name || a.Sources[i].Role != w.role {
			t.Errorf("line %d: %+v, want %s (%v)", i, a.Sources, w.name, w.role)
		}
	}
	checkRel(t, "SEMean", present(t, "SEMean", a.SEMean), e.Means[0].SE, refTol)
	checkRel(t, "SED", present(t, "SED", a.SED), e.Pairs[0].SE, refTol)
	// Balanced: the lines add up to the total.
	checkRel(t, "sum of SS", a.Sources[0].SS+a.Sources[1].SS+a.Sources[2].SS, a.Sources[3].SS, 1e-13)
	checkLeverage(t, a, m)
}

// TestBarleyRCBDMissing: the same RCBD with two plots missing; R 4.2.2
// car::Anova type II, emmeans LS means, SEs and pairwise SEs.
func TestBarleyRCBDMissing(t *testing.T) {
	t.Parallel()
	m, lv := loadRef(t, "barley-1931-rcbd-missing", "yield", "variety", "site")
	a, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	checkAgainstR(t, a, readExpected(t, "barley-1931-rcbd-missing"), lv)
	if a.Balanced || !a.Adjusted {
		t.Errorf("Balanced %v Adjusted %v, want false true", a.Balanced, a.Adjusted)
	}
	if a.SEMean != nil || a.SED != nil {
		t.Errorf("SEMean %v SED %v, want absent for unbalanced data", a.SEMean, a.SED)
	}
	// Relative efficiency with the adjusted block MS (Gomez & Gomez 1984,
	// sec. 2.2.3, applied to incomplete data as an approximation): from R's
	// adjusted site MS 1014.3678279768 and MSE 20.2427912051622 with r = 6,
	// t = 10 and 43 error df (no small-df factor):
	// (5·1014.3678279768 + 54·20.2427912051622) / (59·20.2427912051622).
	wantRE := (5*1014.3678279768 + 54*20.2427912051622) / (59 * 20.2427912051622)
	if re := present(t, "relative efficiency", a.RelativeEfficiency); !(math.Abs(re-wantRE) <= 1e-9*wantRE) {
		t.Errorf("relative efficiency %.12g, want %.12g", re, wantRE)
	}
	checkLeverage(t, a, m)
}

// TestOrchardSpraysLatin: 8 × 8 Latin square; R 4.2.2 lm/anova on
// datasets::OrchardSprays (Finney 1947).
func TestOrchardSpraysLatin(t *testing.T) {
	t.Parallel()
	m, lv := loadRef(t, "orchard-sprays-latin", "decrease", "treatment", "row", "col")
	a, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	checkAgainstR(t, a, readExpected(t, "orchard-sprays-latin"), lv)
	if !a.Balanced {
		t.Error("Latin square not recognised as balanced")
	}
	// Two nuisance factors without a role of their own are the rows and
	// columns of the square, whatever they are called.
	for _, r := range []Role{RoleTreatment, RoleRow, RoleColumn, RoleError, RoleTotal} {
		if got := a.Sources.Lines(r); len(got) != 1 {
			t.Errorf("%d lines of role %v, want 1: %+v", len(got), r, a.Sources)
		}
	}
	if s, _ := a.Line(RoleColumn); s.Name != "col" {
		t.Errorf("column line named %q, want the factor's name col", s.Name)
	}
	if a.RelativeEfficiency != nil {
		t.Errorf("RelativeEfficiency %g for a Latin square, want absent", *a.RelativeEfficiency)
	}
	checkLeverage(t, a, m)
}

// checkLeverage checks general properties of a least-squares fit (common
// practice, any regression text): leverages lie in (0, 1] and sum to the
// number of parameters, fitted + residual = response, and the residuals sum
// to zero within each treatment.
func checkLeverage(t *testing.T, a *ANOVA, m Model) {
	t.Helper()
	params := float64(a.N - a.DFError)
	var s float64
	for i, h := range a.Leverage {
		if h <= 0 || h > 1+1e-12 {
			t.Errorf("leverage %d = %g outside (0, 1]", i, h)
		}
		s += h
		if d := math.Abs(a.Fitted[i] + a.Residuals[i] - m.Response[i]); d > 1e-12*math.Abs(m.Response[i]) {
			t.Errorf("fitted + residual ≠ response at %d (off by %g)", i, d)
		}
	}
	checkRel(t, "trace of hat matrix", s, params, 1e-12)
	rs := make([]float64, m.Treatment.Levels)
	for i, r := range a.Residuals {
		rs[m.Treatment.Index[i]] += r
	}
	for l, v := range rs {
		if math.Abs(v) > 1e-10 {
			t.Errorf("residuals of treatment %d sum to %g", l, v)
		}
	}
}
