package analysis

import (
	"encoding/csv"
	"math"
	"strconv"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial"
)

// TestSavedCovariate: a trait's saved covariate (trial.Trait.Covariate)
// adjusts it in every view without being asked: Montgomery's fibre example
// as a CRD trial gives his adjusted means (5th ed., section 15.3, from
// memory: 40.38, 41.42, 38.80) with no option, the same as naming the
// covariate, and NoCovariate gives the plain means.
func TestSavedCovariate(t *testing.T) {
	t.Parallel()
	f, err := refdata.Open("fiber-ancova.csv")
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	tr := &trial.Trial{Design: trial.Design{Kind: trial.CRD, Reps: 5}, Layout: trial.Layout{PlotLength: 8, PlotWidth: 1.5}}
	str := trial.Trait{Key: "strength", Name: "Strength", Decimals: 2, HigherBetter: true, Covariate: "diameter"}
	dia := trial.Trait{Key: "diameter", Name: "Diameter", Decimals: 0}
	seen := map[string]bool{}
	for i, r := range rows[1:] {
		if !seen[r[0]] {
			seen[r[0]] = true
			tr.Treatments = append(tr.Treatments, trial.Treatment{Code: r[0]})
		}
		s, _ := strconv.ParseFloat(r[1], 64)
		d, _ := strconv.ParseFloat(r[2], 64)
		tr.Plots = append(tr.Plots, trial.Plot{Number: i + 1, Block: 1, Row: 1, Column: i + 1, Treatment: r[0]})
		str.Values = append(str.Values, s)
		dia.Values = append(dia.Values, d)
	}
	tr.Traits = []trial.Trait{str, dia}
	if err := tr.Validate(); err != nil {
		t.Fatal(err)
	}
	saved, err := Analyze(tr, "strength", Options{})
	if err != nil {
		t.Fatal(err)
	}
	named, err := Analyze(tr, "strength", Options{Covariate: "diameter"})
	if err != nil {
		t.Fatal(err)
	}
	if saved.Covariate == nil || saved.Covariate.Key != "diameter" {
		t.Fatalf("the saved covariate was not used: %+v", saved.Covariate)
	}
	want := []float64{40.38, 41.42, 38.80}
	for i, m := range saved.Means {
		if math.Abs(m.Mean-want[i]) > 0.005 || m.Mean != named.Means[i].Mean || m.SE != named.Means[i].SE {
			t.Errorf("%s: %.4f (named %.4f), Montgomery %.2f", m.Treatment, m.Mean, named.Means[i].Mean, want[i])
		}
	}
	plain, err := Analyze(tr, "strength", Options{Covariate: NoCovariate})
	if err != nil {
		t.Fatal(err)
	}
	if plain.Covariate != nil || plain.ANOVA.DFError != saved.ANOVA.DFError+1 {
		t.Errorf("NoCovariate: %+v, error df %d vs %d", plain.Covariate, plain.ANOVA.DFError, saved.ANOVA.DFError)
	}
	// The covariate's own analysis is plain.
	if d, err := Analyze(tr, "diameter", Options{}); err != nil || d.Covariate != nil {
		t.Errorf("diameter: %v, %+v", err, d.Covariate)
	}
	// Renaming the covariate follows; removing it leaves the trait plain.
	ren := dia
	ren.Key = "diam"
	if err := tr.UpdateTrait("diameter", ren); err != nil {
		t.Fatal(err)
	}
	if tr.Traits[0].Covariate != "diam" {
		t.Errorf("after renaming: covariate %q", tr.Traits[0].Covariate)
	}
	if err := tr.RemoveTrait("diam"); err != nil {
		t.Fatal(err)
	}
	if tr.Traits[0].Covariate != "" {
		t.Errorf("after removing: covariate %q", tr.Traits[0].Covariate)
	}
	// A covariate the trial lacks is refused in words.
	tr.Traits[0].Covariate = "nope"
	if err := tr.Validate(); err == nil {
		t.Error("an unknown covariate passed validation")
	}
}
