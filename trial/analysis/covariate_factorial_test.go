package analysis

import (
	"encoding/csv"
	"math"
	"strconv"
	"strings"
	"testing"

	"furlong/stats"
	"furlong/stats/glm"
	"furlong/stats/refdata"
	"furlong/trial"
)

// standOf is the constructed covariate of the oats plot with the given
// number in stats/refdata/oats-split-missing.csv (Yates 1935, R MASS::oats;
// the data have no covariate, so one is made from the plot number: these
// tests check the wiring and the arithmetic, not the agronomy). Plot 20
// has none.
func standOf(plot int) float64 {
	if plot == 20 {
		return math.NaN()
	}
	return 10 + float64((37*plot)%17) + 0.25*float64(plot%5)
}

type oatsRow struct {
	plot                     int
	block, variety, nitrogen string
	yield                    float64
}

func readOats(t *testing.T, name string) []oatsRow {
	t.Helper()
	f, err := refdata.Open(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var out []oatsRow
	for _, r := range rows[1:] {
		p, _ := strconv.Atoi(r[0])
		y := math.NaN()
		if r[4] != "" {
			if y, err = strconv.ParseFloat(r[4], 64); err != nil {
				t.Fatal(err)
			}
		}
		out = append(out, oatsRow{p, r[1], r[2], r[3], y})
	}
	return out
}

// oatsFactorialTrial lays the oats out as a 3 × 4 factorial in six
// randomised complete blocks (design kind) with the yield and the stand
// (standOf) recorded on each plot by its block, variety and nitrogen.
func oatsFactorialTrial(t *testing.T, kind trial.DesignKind, stand func(oatsRow) float64) *trial.Trial {
	t.Helper()
	rows := readOats(t, "oats-split-missing.csv")
	blocks := map[string]int{}
	byKey := map[[3]string]oatsRow{}
	for _, r := range rows {
		if _, ok := blocks[r.block]; !ok {
			blocks[r.block] = len(blocks) + 1
		}
		byKey[[3]string{strconv.Itoa(blocks[r.block]), r.variety, r.nitrogen}] = r
	}
	var nl []trial.Level
	for _, c := range []string{"0.0cwt", "0.2cwt", "0.4cwt", "0.6cwt"} {
		nl = append(nl, trial.Level{Code: c})
	}
	d := trial.Design{Kind: kind, Reps: 6}
	if kind == trial.SplitPlot {
		d.MainFactor = "variety"
	}
	tr, err := trial.New(trial.NewOptions{
		Title: "Oats factorial with a stand count",
		Factors: []trial.Factor{
			{Key: "variety", Levels: []trial.Level{{Code: "Vic", Name: "Victory"}, {Code: "GRain", Name: "Golden.rain"}, {Code: "Marv", Name: "Marvellous"}}},
			{Key: "nitrogen", Levels: nl},
		},
		Design: d,
		Traits: []trial.Trait{{Key: "yield", Kind: trial.Continuous, HigherBetter: true}, {Key: "stand", Kind: trial.Continuous, HigherBetter: true}},
		Seed:   7,
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range tr.Plots {
		r, ok := byKey[[3]string{strconv.Itoa(p.Block), varietyName[tr.LevelCode(p.Treatment, 0)], tr.LevelCode(p.Treatment, 1)}]
		if !ok {
			t.Fatalf("plot %d: no oats row", p.Number)
		}
		if !math.IsNaN(r.yield) {
			if err := tr.SetValue(i, "yield", r.yield); err != nil {
				t.Fatal(err)
			}
		}
		if s := stand(r); !math.IsNaN(s) {
			if err := tr.SetValue(i, "stand", s); err != nil {
				t.Fatal(err)
			}
		}
	}
	return tr
}

// TestCovariateFactorialTrial: a factorial RCBD trial adjusted for a
// covariate trait gives, through the trial's layout, exactly the glm
// analysis of covariance of the same data read straight from the CSV
// (package glm is itself checked against a dense least-squares fit and
// against stats.FitCovariate): lines, slope and its tests, the adjusted
// means of every effect and combination, the unadjusted means (equal to
// the factorial analysis without the covariate on the same plots), the
// counts and the notes.
func TestCovariateFactorialTrial(t *testing.T) {
	t.Parallel()
	tr := oatsFactorialTrial(t, trial.RCBD, func(r oatsRow) float64 { return standOf(r.plot) })
	r, err := Analyze(tr, "yield", Options{Covariate: "stand"})
	if err != nil {
		t.Fatal(err)
	}
	// The reference: glm on the CSV rows in file order.
	rows := readOats(t, "oats-split-missing.csv")
	lev := func(get func(oatsRow) string) glm.Factor {
		var f glm.Factor
		pos := map[string]int{}
		for _, r := range rows {
			if _, ok := pos[get(r)]; !ok {
				pos[get(r)] = len(f.Levels)
				f.Levels = append(f.Levels, get(r))
			}
			f.Index = append(f.Index, pos[get(r)])
		}
		return f
	}
	vf, nf, bf := lev(func(r oatsRow) string { return r.variety }), lev(func(r oatsRow) string { return r.nitrogen }), lev(func(r oatsRow) string { return r.block })
	vf.Name, nf.Name, bf.Name = "variety", "nitrogen", "block"
	m := glm.Model{Factors: []glm.Factor{vf, nf}, Block: &bf, LowerIsBetter: false}
	for _, row := range rows {
		m.Response = append(m.Response, row.yield)
		m.Covariate = append(m.Covariate, standOf(row.plot))
	}
	g, err := glm.Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	near := func(a, b float64) bool { return math.Abs(a-b) <= 1e-9*math.Max(1, math.Abs(b)) }
	c := r.Covariate
	gc := g.Covariate
	if c == nil || c.Key != "stand" || c.Left != 1 || r.Missing != 3 || r.N != 68 {
		t.Fatalf("covariate %+v, missing %d, N %d; want stand, 1 left, 3 missing, 68", c, r.Missing, r.N)
	}
	if !near(c.Slope, gc.Slope) || !near(c.SE, gc.SE) || !near(c.P, gc.P) || !near(c.Mean, gc.Mean) ||
		c.HomogeneityP == nil || !near(*c.HomogeneityP, gc.HomogeneityP) || c.HomogeneityDF1 != gc.HomogeneityDF1 ||
		c.OnTreatmentP == nil || !near(*c.OnTreatmentP, gc.OnTreatmentTest.P) || c.Responds != (gc.OnTreatmentTest.P < 0.05) {
		t.Errorf("covariate %+v, glm %+v", c, gc)
	}
	for _, gl := range g.Lines {
		l := r.Factorial.Line(gl.Source)
		if l == nil || l.DF != gl.DF || l.SS == nil || !near(*l.SS, gl.SS) {
			t.Errorf("line %s: %+v, want %+v", gl.Source, l, gl)
		}
	}
	if l := r.Factorial.Line("covariate"); l == nil || l.Role != stats.RoleCovariate || l.F == nil {
		t.Errorf("covariate line %+v", l)
	}
	if a := r.ANOVA; a.DFError != g.ResidualDF || !a.Adjusted {
		t.Errorf("ANOVA error df %d adjusted %v, want %d true", a.DFError, a.Adjusted, g.ResidualDF)
	}
	// Means of every effect, by level names.
	name := func(key, code string) string {
		if key == "variety" {
			return varietyName[code]
		}
		return code
	}
	for _, ge := range g.Effects {
		fe := r.Factorial.Effect(ge.Name)
		if fe == nil {
			t.Fatalf("no effect %s", ge.Name)
		}
		for _, gm := range ge.Means {
			found := false
			for _, em := range fe.Means {
				match := true
				for k, f := range ge.Factors {
					if name(fe.Factors[k], em.Levels[k]) != m.Factors[f].Levels[gm.Levels[k]] {
						match = false
					}
				}
				if match {
					found = true
					if em.Mean == nil || !near(*em.Mean, gm.Mean) || !near(*em.SE, gm.SE) {
						t.Errorf("%s %v: %v, want %g ± %g", ge.Name, gm.Levels, em.Mean, gm.Mean, gm.SE)
					}
				}
			}
			if !found {
				t.Errorf("%s %v: not in the result", ge.Name, gm.Levels)
			}
		}
	}
	// The unadjusted combination means are the plain factorial analysis of
	// the same plots (the one without a stand left out too).
	plain := oatsFactorialTrial(t, trial.RCBD, func(r oatsRow) float64 { return standOf(r.plot) })
	stands, err := plain.TraitValues("stand")
	if err != nil {
		t.Fatal(err)
	}
	for i, s := range stands {
		if math.IsNaN(s) {
			if err := plain.SetValue(i, "yield", math.NaN()); err != nil {
				t.Fatal(err)
			}
		}
	}
	u, err := Analyze(plain, "yield", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Unadjusted) != len(r.Means) {
		t.Fatalf("%d unadjusted means for %d treatments", len(c.Unadjusted), len(r.Means))
	}
	for i := range r.Means {
		if u.Means[i].Treatment != r.Means[i].Treatment || !near(c.Unadjusted[i], u.Means[i].Mean) {
			t.Errorf("unadjusted %s = %g, want %g", r.Means[i].Treatment, c.Unadjusted[i], u.Means[i].Mean)
		}
	}
	notes := strings.Join(r.Notes, " ")
	for _, w := range []string{"Adjusted for the covariate stand", "1 plot without a value of stand left out", "3 plots without a value left out"} {
		if !strings.Contains(notes, w) {
			t.Errorf("notes lack %q: %q", w, r.Notes)
		}
	}
}

// TestCovariateFactorialRefusedAndFlagged: a split plot with a covariate
// is refused in plain words (no strata version is offered); a covariate
// the treatments changed is flagged (common practice: a covariate must
// not be affected by the treatments).
func TestCovariateFactorialRefusedAndFlagged(t *testing.T) {
	t.Parallel()
	sp := oatsFactorialTrial(t, trial.SplitPlot, func(r oatsRow) float64 { return standOf(r.plot) })
	_, err := Analyze(sp, "yield", Options{Covariate: "stand"})
	if err == nil || !strings.Contains(err.Error(), "completely randomised design or in randomised complete blocks") {
		t.Errorf("split plot with a covariate: %v", err)
	}
	// The stand rises by 15 per nitrogen level: it responds to treatment.
	nlev := map[string]float64{"0.0cwt": 0, "0.2cwt": 1, "0.4cwt": 2, "0.6cwt": 3}
	tr := oatsFactorialTrial(t, trial.RCBD, func(r oatsRow) float64 { return standOf(r.plot) + 15*nlev[r.nitrogen] })
	r, err := Analyze(tr, "yield", Options{Covariate: "stand"})
	if err != nil {
		t.Fatal(err)
	}
	if !r.Covariate.Responds || !strings.Contains(strings.Join(r.Warnings, " "), "Do not use this covariate") {
		t.Errorf("responding covariate not flagged: %+v, %q", r.Covariate, r.Warnings)
	}
}
