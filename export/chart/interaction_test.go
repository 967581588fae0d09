package chart

import (
	"bytes"
	"errors"
	"os"
	"testing"

	"furlong/trial"
	"furlong/trial/analysis"
)

// Tippett's (1950) warp breaks (R datasets::warpbreaks, 2 wools × 3
// tensions, 9 looms each; the cell means are those of the data, as in R
// 4.2.2's tapply(breaks, list(wool, tension), mean)): the chart has one
// line per wool and a bar of the SED, and a one-list result is refused.
func TestInteractionChart(t *testing.T) {
	t.Parallel()
	// The warp-break counts of R's warpbreaks, wool A then B, tension
	// L, M, H, 9 each.
	counts := [2][3][9]float64{
		{{26, 30, 54, 25, 70, 52, 51, 26, 67}, {18, 21, 29, 17, 12, 18, 35, 30, 36}, {36, 21, 24, 18, 10, 43, 28, 15, 26}},
		{{27, 14, 29, 19, 29, 31, 41, 20, 44}, {42, 26, 19, 16, 39, 28, 21, 39, 29}, {20, 21, 24, 17, 13, 15, 15, 16, 28}},
	}
	d := &analysis.Data{TraitKey: "breaks", Decimals: 0, HigherBetter: false, Kind: trial.Continuous, Design: trial.CRD,
		Factors: []analysis.FactorData{{Key: "wool", Levels: []string{"A", "B"}}, {Key: "tension", Levels: []string{"L", "M", "H"}}}}
	for w := range 2 {
		for tn := range 3 {
			d.Treatments = append(d.Treatments, trial.CombinationCode([]string{d.Factors[0].Levels[w], d.Factors[1].Levels[tn]}))
			for _, v := range counts[w][tn] {
				d.Values = append(d.Values, v)
				d.Treatment = append(d.Treatment, w*3+tn)
				d.Plot = append(d.Plot, len(d.Plot)+1)
				d.Factors[0].Index = append(d.Factors[0].Index, w)
				d.Factors[1].Index = append(d.Factors[1].Index, tn)
			}
		}
	}
	r, err := analysis.AnalyzeData(d, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	// Cell mean of wool A at tension L: R 4.2.2 emmeans gives
	// 44.5555555556 (the round-2 reference warpbreaks-factorial.expected.json;
	// the counts above are typed from memory and checked by this).
	if m := r.Factorial.Effect("wool:tension").Means[0]; m.Mean == nil || *m.Mean < 44.55 || *m.Mean > 44.56 {
		t.Fatalf("A-L mean %v", m.Mean)
	}
	p, err := Interaction(r, InteractionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if os.Getenv("FURLONG_CHART_OUT") != "" {
		f, _ := os.Create(os.Getenv("FURLONG_CHART_OUT"))
		_ = Save(p, f, "png", 453, 283)
		f.Close()
	}
	var buf bytes.Buffer
	if err := Save(p, &buf, "png", 400, 300); err != nil || buf.Len() == 0 {
		t.Fatal(err)
	}
	if _, err := Interaction(r, InteractionOptions{Swap: true}); err != nil {
		t.Errorf("swapped: %v", err)
	}
	one := &analysis.Result{}
	if _, err := Interaction(one, InteractionOptions{}); !errors.Is(err, ErrNoInteraction) {
		t.Errorf("one list: %v", err)
	}
}
