package chart

import (
	"context"
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"furlong/trial"
	"furlong/trial/analysis"
)

// nitrogenCSV: 5 N rates × 4 blocks with R 4.2.2 results beside it (see its
// README); here only the drawing is checked, the numbers are checked
// against R in trial/analysis and the CLI.
const nitrogenCSV = "../../stats/testdata/response/nitrogen-rates.csv"

// rateTrial is the nitrogen data as an RCBD trial whose treatments carry
// their rates, plus (with control) an untreated control without a rate.
func rateTrial(tb testing.TB, control bool) *trial.Trial {
	tb.Helper()
	f, err := os.Open(nitrogenCSV)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	t := &trial.Trial{Title: "Nitrogen rates", Design: trial.Design{Kind: trial.RCBD, Reps: 4}}
	yield := trial.Trait{Key: "yield", Name: "Grain yield", Unit: "t/ha", Decimals: 2, HigherBetter: true}
	seen := map[string]bool{}
	for i, r := range rows[1:] {
		b, _ := strconv.Atoi(r[1])
		rate, _ := strconv.ParseFloat(r[2], 64)
		y, _ := strconv.ParseFloat(r[3], 64)
		code := "N" + r[2]
		if !seen[code] {
			seen[code] = true
			t.Treatments = append(t.Treatments, trial.Treatment{Code: code, Rate: &rate, RateUnit: "kg N/ha"})
		}
		t.Plots = append(t.Plots, trial.Plot{Number: i + 1, Block: b, Treatment: code})
		yield.Values = append(yield.Values, y)
	}
	if control {
		t.Treatments = append(t.Treatments, trial.Treatment{Code: "UTC", Role: trial.RoleUntreated})
		for b := 1; b <= 4; b++ {
			t.Plots = append(t.Plots, trial.Plot{Number: 100 + b, Block: b, Treatment: "UTC"})
			yield.Values = append(yield.Values, 3+float64(b)/10)
		}
	}
	t.Traits = []trial.Trait{yield}
	return t
}

func rateResponse(tb testing.TB, t *trial.Trial, ratio float64) *analysis.Response {
	tb.Helper()
	oc, err := analysis.AnalyzeAll(context.Background(), t, []string{"yield"}, analysis.Options{})
	if err != nil || oc[0].Err != nil {
		tb.Fatal(err, oc)
	}
	rates, err := analysis.RatesOf(t, nil)
	if err != nil {
		tb.Fatal(err)
	}
	r, err := analysis.ResponseOf(oc[0].Result, rates, ratio)
	if err != nil {
		tb.Fatal(err)
	}
	return r
}

// TestRateResponse: the chart has a legend line per model with its R², the
// lowest-AIC model marked, the means with their SE bars, a tick per tested
// rate, and the economic optimum only when there is a price ratio.
func TestRateResponse(t *testing.T) {
	t.Parallel()
	tr := rateTrial(t, true)
	r := rateResponse(t, tr, 0.008)
	p, err := RateResponse(tr, r)
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(render(t, p, "svg"))
	joined := strings.Join(texts, "\n")
	for _, want := range []string{"Linear (R²", "Quadratic (R²", "Linear-plateau (R²", "Quadratic-plateau (R²", ", lowest AIC", "Treatment mean ± 1 SE", "Rate (kg N/ha)", "Economic optimum"} {
		if !strings.Contains(joined, want) {
			t.Errorf("no %q in the chart's texts:\n%s", want, joined)
		}
	}
	for _, tick := range []string{"0", "50", "100", "150", "200"} {
		if countText(texts, tick) < 1 {
			t.Errorf("no tick %q", tick)
		}
	}
	if strings.Contains(joined, "UTC") {
		t.Error("the untreated control, which has no rate, is on the chart")
	}
	b := r.BestFit()
	if b == nil || b.Econ == nil || !strings.Contains(joined, "Economic optimum "+strconv.FormatFloat(*b.Econ, 'f', 0, 64)) {
		t.Errorf("the optimum's label does not give the best model's optimum %v", b)
	}
	if math.IsNaN(p.X.Min) || p.X.Min >= 0 || p.X.Max <= 200 {
		t.Errorf("x range %g to %g does not hold the rates 0 to 200", p.X.Min, p.X.Max)
	}

	p, err = RateResponse(tr, rateResponse(t, tr, 0))
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(strings.Join(svgTexts(render(t, p, "svg")), "\n"), "Economic optimum") {
		t.Error("an economic optimum without a price ratio")
	}
	if _, err := RateResponse(tr, &analysis.Response{}); err != ErrNoData {
		t.Errorf("empty response: %v, want ErrNoData", err)
	}
}
