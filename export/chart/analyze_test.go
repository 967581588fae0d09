package chart

import (
	"encoding/csv"
	"math"
	"slices"
	"sort"
	"strconv"
	"testing"

	"furlong/stats/meansep"
	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/analysis"
)

// barleyTrial builds a trial from stats/refdata/barley-1931-rcbd.csv (sites as
// blocks, one field row per site, varieties in data order along the row).
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
	tr := &trial.Trial{Title: "Barley varieties, 1931", Design: trial.Design{Kind: trial.RCBD, Reps: 6}}
	yield := trial.Trait{Key: "yield", Name: "Yield", Unit: "bu/ac", Kind: trial.Continuous, Decimals: 1, HigherBetter: true}
	block := map[string]int{}
	col := map[string]int{}
	for _, r := range rows[1:] {
		site, variety := r[0], r[1]
		if block[site] == 0 {
			block[site] = len(block) + 1
		}
		if tr.TreatmentIndex(variety) < 0 {
			tr.Treatments = append(tr.Treatments, trial.Treatment{Code: variety, Name: variety, Role: trial.RoleEntry})
		}
		col[site]++
		v, err := strconv.ParseFloat(r[2], 64)
		if err != nil {
			t.Fatal(err)
		}
		b := block[site]
		tr.Plots = append(tr.Plots, trial.Plot{Number: 100*b + col[site], Block: b, Row: b, Column: col[site], Treatment: variety})
		yield.Values = append(yield.Values, v)
	}
	tr.Traits = []trial.Trait{yield}
	return tr
}

type barleyExpected struct {
	DFError int     `json:"df_error"`
	TCrit   float64 `json:"t_crit_975"`
	Means   []struct {
		Treatment string  `json:"treatment"`
		LSMean    float64 `json:"ls_mean"`
		SE        float64 `json:"se"`
	} `json:"means"`
}

func TestMeansFromAnalysisBarley(t *testing.T) {
	t.Parallel()
	tr := barleyTrial(t)
	r, err := analysis.Analyze(tr, "yield", analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var want barleyExpected
	refdata.JSON(t, "barley-1931-rcbd.expected.json", &want)
	bars, _, _, err := meanBars(r, MeansOptions{ErrorBars: ConfidenceInterval, Letters: meansep.Tukey})
	if err != nil {
		t.Fatal(err)
	}
	// R 4.2.2 (emmeans): each bar is ls_mean ± t(0.975; 45)·se.
	sort.Slice(want.Means, func(i, j int) bool { return want.Means[i].LSMean > want.Means[j].LSMean })
	if len(bars) != len(want.Means) {
		t.Fatalf("%d bars, want %d", len(bars), len(want.Means))
	}
	for i, w := range want.Means {
		got := bars[i]
		if got.code != w.Treatment {
			t.Errorf("bar %d is %s, want %s (highest mean first)", i, got.code, w.Treatment)
			continue
		}
		half := want.TCrit * w.SE
		if math.Abs(got.y-w.LSMean) > 1e-6 || math.Abs(got.top-(w.LSMean+half)) > 1e-6 || math.Abs(got.low-(w.LSMean-half)) > 1e-6 {
			t.Errorf("%s: %g in [%g, %g], want %g ± %g", got.code, got.y, got.low, got.top, w.LSMean, half)
		}
	}
	p, err := Means(tr, r, MeansOptions{ErrorBars: ConfidenceInterval, Letters: meansep.Tukey})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	if got := countFill(svg, hexEntry); got != 10+1 {
		t.Errorf("%d entry fills, want 10 bars + 1 key swatch", got)
	}
	texts := svgTexts(svg)
	for _, m := range r.Means {
		if m.LettersTukey == "" || !slices.Contains(texts, m.LettersTukey) {
			t.Errorf("%s: Tukey letters %q not drawn", m.Treatment, m.LettersTukey)
		}
	}
	if !slices.Contains(texts, "Error bars: 95% confidence interval") || !slices.Contains(texts, "Yield (bu/ac)") {
		t.Errorf("key or axis title missing: %q", texts)
	}
}

func TestDiagnosticsFromAnalysis(t *testing.T) {
	t.Parallel()
	tr := fixtureTrial()
	r, err := analysis.Analyze(tr, "yield", analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	// The analysis leaves out the missing plot and the excluded one: 22
	// observations, each mapped back to its plot.
	d, err := residualsOf(tr, r)
	if err != nil {
		t.Fatal(err)
	}
	if len(d.std) != 22 {
		t.Fatalf("%d residuals, want 22", len(d.std))
	}
	for i, pi := range r.PlotIndex {
		if want := "plot " + strconv.Itoa(tr.Plots[pi].Number); d.labels[i] != want {
			t.Errorf("observation %d labelled %q, want %q", i, d.labels[i], want)
		}
		if pi == 9 || pi == 15 {
			t.Errorf("missing or excluded plot index %d analysed", pi)
		}
	}
	for _, f := range []func(*trial.Trial, *analysis.Result) error{
		func(t *trial.Trial, r *analysis.Result) error { _, err := Residuals(t, r); return err },
		func(t *trial.Trial, r *analysis.Result) error { _, err := QQ(t, r); return err },
	} {
		if err := f(tr, r); err != nil {
			t.Error(err)
		}
	}
	p, err := HeatMap(tr, "yield", HeatMapOptions{})
	if err != nil {
		t.Fatal(err)
	}
	render(t, p, "png")
}
