package analysis

import (
	"encoding/csv"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"strconv"
	"testing"

	"furlong/stats"
	"furlong/stats/refdata"
	"furlong/trial"
)

// barleyTrial builds the 1931 barley RCBD (Immer, Hayes & Powers 1934; see
// stats/refdata/README.md) as a trial: sites are blocks, varieties treatments.
func barleyTrial(t *testing.T) *trial.Trial {
	t.Helper()
	f, err := refdata.Open("barley-1931-rcbd.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var sites, varieties []string
	idx := func(list *[]string, s string) int {
		for i, v := range *list {
			if v == s {
				return i
			}
		}
		*list = append(*list, s)
		return len(*list) - 1
	}
	type obs struct {
		site, variety int
		y             float64
	}
	var data []obs
	for _, r := range rows[1:] {
		y, err := strconv.ParseFloat(r[2], 64)
		if err != nil {
			t.Fatal(err)
		}
		data = append(data, obs{idx(&sites, r[0]), idx(&varieties, r[1]), y})
	}
	var trts []trial.Treatment
	for i, v := range varieties {
		trts = append(trts, trial.Treatment{Code: fmt.Sprintf("V%02d", i+1), Name: v, Role: trial.RoleEntry})
	}
	tr, err := trial.New(trial.NewOptions{
		Title: "barley 1931", Treatments: trts, Design: trial.Design{Kind: trial.RCBD, Reps: len(sites)},
		Traits: []trial.Trait{{Key: "yield", Name: "Yield", Unit: "bu/ac", Kind: trial.Continuous, Decimals: 2, HigherBetter: true}},
		Seed:   3,
	})
	if err != nil {
		t.Fatal(err)
	}
	// Put each observation on the plot of its variety in its site's block.
	for _, o := range data {
		code := trts[o.variety].Code
		found := false
		for i, p := range tr.Plots {
			if p.Block == o.site+1 && p.Treatment == code {
				tr.Traits[0].Values[i] = o.y
				found = true
			}
		}
		if !found {
			t.Fatalf("no plot for site %d variety %s", o.site, code)
		}
	}
	return tr
}

func near(t *testing.T, what string, got, want float64) {
	t.Helper()
	if math.Abs(got-want) > 1e-9*math.Max(1, math.Abs(want)) {
		t.Errorf("%s = %.15g, want %.15g (R 4.2.2 reference)", what, got, want)
	}
}

// TestExcludedPlotsAreLeftOut excludes the two plots the reference set has
// missing (Crookston/Trebi and Morris/Peatland) and checks the analysis
// against R's results for the data without them: exclusion must act exactly
// like a missing value while the value stays in the trial.
func TestExcludedPlotsAreLeftOut(t *testing.T) {
	t.Parallel()
	tr := barleyTrial(t)
	var want struct {
		ANOVA []struct {
			Source string
			DF     int
			SS, F  float64
			P      float64
		}
		MSE   float64
		Means []struct {
			Treatment string
			LSMean    float64 `json:"ls_mean"`
			SE        float64
		}
		Pairs []struct {
			Contrast    string
			SE          float64
			PTukeyExact float64 `json:"p_tukey_exact"`
		}
	}
	raw, _ := refdata.ReadFile("barley-1931-rcbd-missing.expected.json")
	if err := json.Unmarshal(raw, &want); err != nil {
		t.Fatal(err)
	}
	for _, drop := range []struct {
		site    int
		variety string
	}{{1, "Trebi"}, {4, "Peatland"}} {
		// Crookston is the 1st site, Morris the 4th in the file's order.
		for i, p := range tr.Plots {
			if p.Block == drop.site && tr.Treatment(p.Treatment).Name == drop.variety {
				if err := tr.Exclude(i, "", "test exclusion"); err != nil {
					t.Fatal(err)
				}
			}
		}
	}
	r, err := Analyze(tr, "yield", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.N != 58 || len(r.Excluded) != 2 || r.Missing != 0 {
		t.Fatalf("n %d, excluded %d, missing %d; want 58, 2, 0", r.N, len(r.Excluded), r.Missing)
	}
	lines := map[string]stats.Source{}
	for _, s := range r.ANOVA.Sources {
		lines[s.Name] = s
	}
	for _, w := range want.ANOVA {
		name := map[string]string{"site": "block", "variety": "treatment", "Residuals": "error"}[w.Source]
		near(t, name+" SS", lines[name].SS, w.SS)
		if w.Source != "Residuals" {
			near(t, name+" F", lines[name].F, w.F)
			near(t, name+" p", lines[name].P, w.P)
		}
	}
	near(t, "MSE", r.ANOVA.MSE, want.MSE)
	byName := map[string]Mean{}
	for _, m := range r.Means {
		byName[m.Name] = m
	}
	for _, w := range want.Means {
		near(t, w.Treatment+" LS mean", byName[w.Treatment].Mean, w.LSMean)
		near(t, w.Treatment+" SE", byName[w.Treatment].SE, w.SE)
	}
	if r.LSD != nil || r.HSD != nil {
		t.Error("LSD/HSD given for unequal replication")
	}
	if !r.ANOVA.Adjusted {
		t.Error("sums of squares not marked adjusted")
	}
	codeOf := map[string]string{}
	for _, m := range r.Means {
		codeOf[m.Name] = m.Treatment
	}
	pairs := map[string]Pair{}
	for _, p := range r.Pairs {
		pairs[p.A+"|"+p.B], pairs[p.B+"|"+p.A] = p, p
	}
	for _, w := range want.Pairs {
		var a, b string
		fmt.Sscanf(w.Contrast, "%s - %s", &a, &b)
		p := pairs[codeOf[a]+"|"+codeOf[b]]
		near(t, w.Contrast+" SE", p.SE, w.SE)
		near(t, w.Contrast+" Tukey p", p.PTukey, w.PTukeyExact)
	}
	// The excluded values are still in the trial.
	kept := 0
	for i := range tr.Plots {
		if ex, _ := tr.Excluded(i, "yield"); ex && !math.IsNaN(tr.Traits[0].Values[i]) {
			kept++
		}
	}
	if kept != 2 {
		t.Errorf("%d excluded plots keep their value, want 2", kept)
	}
}

// TestDegenerateTraits checks the plain-language errors for traits that
// cannot be analysed (common practice: a report must say why).
func TestDegenerateTraits(t *testing.T) {
	t.Parallel()
	tr := barleyTrial(t)
	// A treatment with no values.
	for i, p := range tr.Plots {
		if p.Treatment == "V03" {
			tr.Traits[0].Values[i] = trial.Missing
		}
	}
	_, err := Analyze(tr, "yield", Options{})
	var ae *Error
	if !errors.As(err, &ae) || !errors.Is(err, stats.ErrEmptyLevel) {
		t.Fatalf("got %v, want an empty-treatment error", err)
	}
	if want := "yield: treatment V03 has no values to analyse; enter its values or exclude it"; err.Error() != want {
		t.Errorf("message %q, want %q", err, want)
	}
	// No values at all.
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = trial.Missing
	}
	if _, err := Analyze(tr, "yield", Options{}); !errors.Is(err, stats.ErrNoData) {
		t.Errorf("all missing: got %v", err)
	}
	// All values equal: no error variance.
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 5
	}
	if _, err := Analyze(tr, "yield", Options{}); !errors.Is(err, stats.ErrZeroErrorVariance) {
		t.Errorf("all equal: got %v", err)
	}
	if _, err := Analyze(tr, "nosuch", Options{}); !errors.Is(err, ErrNoTrait) {
		t.Errorf("unknown trait: got %v", err)
	}
}
