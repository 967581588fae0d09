package chart

import (
	"context"
	"math"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// nitrogenFixture is the nitrogen-rate reference data (5 N rates × 4
// blocks, R 4.2.2 results beside it) as a trial file (see the README in its
// folder); here only the drawing is checked, the numbers are checked
// against R in trial/analysis.
const nitrogenFixture = "nitrogen-rates.furlong"

// rateTrial is the nitrogen trial, plus (with control) an untreated
// control without a rate, which must stay off the chart.
func rateTrial(tb testing.TB, control bool) *trial.Trial {
	tb.Helper()
	t, err := trialfile.Load(refdata.File(tb, nitrogenFixture))
	if err != nil {
		tb.Fatal(err)
	}
	if control {
		t.Treatments = append(t.Treatments, trial.Treatment{Code: "UTC", Role: trial.RoleUntreated})
		for b := 1; b <= 4; b++ {
			t.Plots = append(t.Plots, trial.Plot{Number: 100 + b, Block: b, Treatment: "UTC"})
			t.Traits[0].Values = append(t.Traits[0].Values, 3+float64(b)/10) // any values: left out
		}
	}
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
