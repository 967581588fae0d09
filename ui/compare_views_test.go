package ui

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"gonum.org/v1/gonum/stat/distuv"

	"furlong/stats/meansep"
	"furlong/stats/refdata"
	"furlong/trial"
)

// barleyTrial is the 1931 barley RCBD (stats/refdata/README.md) as a trial:
// the varieties as treatments (codes V1…V10 in file order, the varieties
// as names), the sites as blocks 1–6 in
// file order, every plot's yield filled in.
func barleyTrial(t *testing.T) *trial.Trial {
	t.Helper()
	b := readBarley(t)
	var ts []trial.Treatment
	code := map[string]string{}
	for i, v := range b.varieties {
		code[v] = "V" + strconv.Itoa(i+1)
		ts = append(ts, trial.Treatment{Code: code[v], Name: v, Role: trial.RoleEntry})
	}
	tr, err := trial.New(trial.NewOptions{
		Title: "Barley 1931", Crop: "barley", Season: "1931", Treatments: ts,
		Design: trial.Design{Kind: trial.RCBD, Reps: len(b.sites)},
		Traits: []trial.Trait{{Key: "yield", Name: "Yield", Unit: "bu/ac", Kind: trial.Continuous, Decimals: 1, HigherBetter: true}},
		Seed:   1931, Now: time.Date(2026, 4, 1, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range tr.Plots {
		tr.Traits[0].Values[i] = b.yield[[2]string{b.sites[p.Block-1], tr.Treatment(p.Treatment).Name}]
	}
	return tr
}

// barleyPairs is the pairs part of the R reference of the barley RCBD.
type barleyPairs struct {
	Pairs []struct {
		Contrast string  `json:"contrast"`
		Diff     float64 `json:"diff"`
		SE       float64 `json:"se"`
		PTukey   float64 `json:"p_tukey_exact"`
		PLSD     float64 `json:"p_lsd"`
	} `json:"pairs"`
	Shapiro struct {
		W float64 `json:"w"`
		P float64 `json:"p"`
	} `json:"shapiro_residuals"`
}

// pText reads a P as the window writes it ("<0.001" is 0.0005, below
// every rounding of a P at or above 0.001).
func pText(t *testing.T, s string) float64 {
	t.Helper()
	if s == "<0.001" {
		return 0.0005
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("P %q is not a number", s)
	}
	return v
}

// Compare's Pairs tab shows every pair of the barley RCBD with the
// difference, SE, the t-test P and Tukey's P of R 4.2.2 (emmeans; Tukey's
// exact P from scipy), as stats/refdata/barley-1931-rcbd.expected.json gives
// them; the statistics show R's Shapiro–Wilk W and P on the residuals.
func TestComparePairsAndChecksAgainstR(t *testing.T) {
	var want barleyPairs
	refdata.JSON(t, "barley-1931-rcbd.expected.json", &want)
	u, _ := newTestApp(t, 0)
	u.OpenTrial(barleyTrial(t), "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	c := u.steps[stepCompare].(*compareStep)
	var pv *pairsView
	for _, v := range c.views {
		if p, ok := v.(*pairsView); ok {
			pv = p
		}
	}
	if pv == nil {
		t.Fatal("Compare has no Pairs view")
	}
	if len(pv.table.rows) != 0 {
		t.Errorf("the pairs were formatted before their tab was shown (%d rows)", len(pv.table.rows))
	}
	c.tabs.Select(pv.item) // as the user does
	rows := pv.table.rows
	if len(rows) != len(want.Pairs) || len(rows) != 45 {
		t.Fatalf("%d pairs shown, R lists %d (10 varieties: 45)", len(rows), len(want.Pairs))
	}
	// The table names a treatment "CODE  name"; R names the varieties.
	byPair := map[string][]string{}
	name := func(label string) string { return label[strings.Index(label, "  ")+2:] }
	for _, r := range rows {
		byPair[name(r[0])+" - "+name(r[1])] = r
	}
	col := func(name string) int {
		for i, h := range pv.table.head {
			if strings.HasPrefix(h, name) {
				return i
			}
		}
		t.Fatalf("no column %q in %q", name, pv.table.head)
		return -1
	}
	cDiff, cSE, cT, cTukey, cDiffer := col("Difference"), col("SE"), col("P (t"), col("P (Tukey"), col("Differ by")
	for _, w := range want.Pairs {
		r, sign := byPair[w.Contrast], 1.0
		if r == nil {
			ab := strings.SplitN(w.Contrast, " - ", 2)
			r, sign = byPair[ab[1]+" - "+ab[0]], -1
		}
		if r == nil {
			t.Errorf("pair %s not shown", w.Contrast)
			continue
		}
		d, _ := strconv.ParseFloat(r[cDiff], 64)
		se, _ := strconv.ParseFloat(r[cSE], 64)
		// Shown with the means' decimals (2 here): within half a unit of the last.
		if math.Abs(sign*d-w.Diff) > 0.0051 || math.Abs(se-w.SE) > 0.0051 {
			t.Errorf("%s: difference %s SE %s, R gives %.4f %.4f", w.Contrast, r[cDiff], r[cSE], w.Diff, w.SE)
		}
		if p := pText(t, r[cT]); math.Abs(p-w.PLSD) > 0.00051 {
			t.Errorf("%s: P (t test) %s, R gives %.5f", w.Contrast, r[cT], w.PLSD)
		}
		if p := pText(t, r[cTukey]); math.Abs(p-w.PTukey) > 0.00051 {
			t.Errorf("%s: P (Tukey) %s, R gives %.5f", w.Contrast, r[cTukey], w.PTukey)
		}
		if got, exp := r[cDiffer], map[bool]string{true: "yes", false: "no"}[w.PLSD < 0.05]; got != exp {
			t.Errorf("%s: differs by LSD %q, R's P %.4f says %q", w.Contrast, got, w.PLSD, exp)
		}
	}
	// With Tukey chosen the verdict follows Tukey's P.
	c.methodSel.SetSelected(methodLabel(meansep.Tukey))
	for _, r := range pv.table.rows {
		p := pText(t, r[cTukey])
		if (p < 0.05) != (r[cDiffer] == "yes") {
			t.Errorf("%s - %s: Tukey P %s but differs %q", r[0], r[1], r[cTukey], r[cDiffer])
		}
	}
	// Shapiro–Wilk on the residuals, as R's shapiro.test gives it.
	lines := checkLines(u.compute.current.result("yield").res.Diagnostics)
	found := false
	for _, l := range lines {
		if strings.HasPrefix(l[0], "Shapiro–Wilk") {
			found = true
			wantText := "W " + strconv.FormatFloat(want.Shapiro.W, 'f', 3, 64) + ", P " + strconv.FormatFloat(want.Shapiro.P, 'f', 3, 64)
			if l[1] != wantText {
				t.Errorf("Shapiro–Wilk shows %q, R gives %q", l[1], wantText)
			}
		}
	}
	if !found {
		t.Errorf("no Shapiro–Wilk line among %q", lines)
	}
	if !strings.Contains(statsText(c), "Tukey non-additivity") {
		t.Errorf("the statistics of an RCBD show no non-additivity test:\n%s", statsText(c))
	}
}

// statsText is the text of Compare's statistics grid.
func statsText(c *compareStep) string {
	return overlayText(c.statsBox)
}

// A transformed trait's means table shows each mean's confidence limits on
// the recorded scale instead of an SE: exp(m ± t·SE) for the log, with t
// the 97.5 % quantile of Student's t on the error df (gonum's distuv).
func TestCompareMeansShowLimitsWhenTransformed(t *testing.T) {
	tr := barleyTrial(t)
	tr.Traits[0].Transform = trial.TransformLog
	u, _ := newTestApp(t, 0)
	u.OpenTrial(tr, "")
	set := pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	c := u.steps[stepCompare].(*compareStep)
	r := set.result("yield").res
	if !c.limits || c.meansHeader(3) != "95 % limits" {
		t.Fatalf("means column 3 is %q for a log-transformed trait", c.meansHeader(3))
	}
	tq := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(r.ANOVA.DFError)}.Quantile(0.975)
	for i, m := range c.meanRows {
		lo, hi := math.Exp(m.Mean-tq*m.SE), math.Exp(m.Mean+tq*m.SE)
		want := strconv.FormatFloat(lo, 'f', 2, 64) + " – " + strconv.FormatFloat(hi, 'f', 2, 64)
		if got := c.meanText(i, 3); got != want {
			t.Errorf("%s: limits %q, want %q", m.Treatment, got, want)
		}
	}
	if c.means.Size().Width > 0 && c.limitsWidth < cellTextWidth(c.meanText(0, 3)) {
		t.Errorf("limits column %v narrower than its text", c.limitsWidth)
	}
	if !strings.Contains(statsText(c), "(log scale)") {
		t.Errorf("the grand mean of a log-transformed trait does not name its scale:\n%s", statsText(c))
	}
	// Untransformed again (one undoable edit): the SE is back.
	if !u.structuralEdit("transform", "test", func(t *trial.Trial) error {
		tt := t.Traits[0]
		tt.Transform = trial.TransformNone
		return t.UpdateTrait("yield", tt)
	}) {
		t.Fatal("transform not removed")
	}
	pumpAnalysis(t, u, func() { u.compute.dataChanged() })
	if c.limits || c.meansHeader(3) != "SE" {
		t.Fatalf("untransformed trait still shows %q", c.meansHeader(3))
	}
}
