package analysis

import (
	"context"
	"math"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/trialfile"
)

func nitrogenResult(t *testing.T, tr *trial.Trial) *Result {
	t.Helper()
	oc, err := AnalyzeAll(context.Background(), tr, nil, Options{})
	if err != nil || oc[0].Err != nil {
		t.Fatal(err, oc[0].Err)
	}
	return oc[0].Result
}

// TestMarginsWithoutCosts: with no costs the margins are the price times
// the means, their SEs the price times the SEs, the Wald test of equal
// margins is the ANOVA's treatment F (an identity for least-squares means
// in a balanced RCBD: common practice; Searle 1971, ch. 5, from memory) and the letters are the means'.
func TestMarginsWithoutCosts(t *testing.T) {
	t.Parallel()
	tr, err := trialfile.Load(refdata.File(t, nitrogenFixture))
	if err != nil {
		t.Fatal(err)
	}
	tr.Economics = trial.Economics{Currency: "EUR", ProducePrice: 200}
	r := nitrogenResult(t, tr)
	m, err := MarginsOf(tr, r)
	if err != nil {
		t.Fatal(err)
	}
	trt, _ := r.ANOVA.Treatment()
	if math.Abs(m.F-trt.F) > 1e-9*trt.F || m.DF1 != trt.DF || m.DF != r.ANOVA.DFError {
		t.Errorf("F %.12g on %d, %d; ANOVA %.12g on %d, %d", m.F, m.DF1, m.DF, trt.F, trt.DF, r.ANOVA.DFError)
	}
	for i, row := range m.Rows {
		mean := r.Means[i]
		if row.Margin != 200*mean.Mean || row.MarginSE != 200*mean.SE || row.Letters != mean.LettersLSD || row.CostFrom != CostNone {
			t.Errorf("%s: margin %g ± %g %q (%s); mean %g ± %g %q", row.Treatment, row.Margin, row.MarginSE, row.Letters, row.CostFrom, mean.Mean, mean.SE, mean.LettersLSD)
		}
	}
	if len(m.Notes) == 0 {
		t.Error("no note that no costs were given")
	}
}

// TestMarginsWithCosts, worked by hand: the rate treatments costed from the
// price ratio (input price = ratio × produce price = 0.008 × 200 = 1.6 per
// kg N), an application cost on top, one product cost given; margin =
// price × mean − cost. A cost that makes two margins equal makes them share
// a letter even though their means differ.
func TestMarginsWithCosts(t *testing.T) {
	t.Parallel()
	tr, err := trialfile.Load(refdata.File(t, nitrogenFixture))
	if err != nil {
		t.Fatal(err)
	}
	tr.Analysis.Response.PriceRatio = 0.008
	r := nitrogenResult(t, tr)
	mean := map[string]float64{}
	for _, mm := range r.Means {
		mean[mm.Treatment] = mm.Mean
	}
	// N50's product cost chosen so that its margin equals N0's.
	given := 200*(mean["N50"]-mean["N0"]) - 10
	tr.Economics = trial.Economics{ProducePrice: 200, Costs: []trial.TreatmentCost{
		{Treatment: "N0", Application: 0},
		{Treatment: "N50", Product: &given, Application: 10},
		{Treatment: "N100", Application: 10},
	}}
	m, err := MarginsOf(tr, r)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(m.InputPrice-1.6) > 1e-12 {
		t.Errorf("input price %g, want 1.6", m.InputPrice)
	}
	rows := map[string]MarginRow{}
	for _, row := range m.Rows {
		rows[row.Treatment] = row
	}
	n100 := rows["N100"]
	if n100.CostFrom != CostFromRate || math.Abs(n100.Product-160) > 1e-9 || math.Abs(n100.Cost-170) > 1e-9 || math.Abs(n100.Margin-(200*mean["N100"]-170)) > 1e-9 {
		t.Errorf("N100: %+v", n100)
	}
	if n200 := rows["N200"]; n200.CostFrom != CostFromRate || math.Abs(n200.Cost-320) > 1e-9 {
		t.Errorf("N200: %+v", n200)
	}
	if n50, n0 := rows["N50"], rows["N0"]; n50.CostFrom != CostGiven || math.Abs(n50.Margin-n0.Margin) > 1e-9 || !shareLetter(n50.Letters, n0.Letters) {
		t.Errorf("N50 margin %g %q, N0 %g %q: equal margins must share a letter", n50.Margin, n50.Letters, n0.Margin, n0.Letters)
	}
	// Their means do differ (the yield letters keep them apart).
	for _, mm := range r.Means {
		if mm.Treatment == "N50" {
			for _, m0 := range r.Means {
				if m0.Treatment == "N0" && shareLetter(mm.LettersLSD, m0.LettersLSD) {
					t.Errorf("the means of N0 and N50 share a letter; the test needs them apart")
				}
			}
		}
	}

	tr.Economics.ProducePrice = 0
	if _, err := MarginsOf(tr, r); err != ErrNoPrice {
		t.Errorf("no price: %v", err)
	}
}

func shareLetter(a, b string) bool {
	for _, x := range a {
		for _, y := range b {
			if x == y && x != ' ' {
				return true
			}
		}
	}
	return false
}
