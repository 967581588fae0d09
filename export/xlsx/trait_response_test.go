package xlsx

import (
	"context"
	"encoding/json"
	"math"
	"testing"

	"furlong/export"
	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// The nitrogen-rate reference data (5 rates × 4 blocks) as a trial file,
// and R 4.2.2's results for it (aov with contr.poly(scores = rates), lm,
// the profiled quadratic-plateau, the economic optimum at a price ratio of
// 0.008; see stats/refdata/README.md).
const (
	nitrogenFixture = "nitrogen-rates.furlong"
	nitrogenJSON    = "nitrogen-rates.expected.json"
)

func nitrogenTrial(tb testing.TB) *trial.Trial {
	tb.Helper()
	t, err := trialfile.Load(refdata.File(tb, nitrogenFixture))
	if err != nil {
		tb.Fatal(err)
	}
	return t
}

// TestReportResponse: a rate trial's trait sheet carries the trends, the
// four models and, at the trial's price ratio, the economic optimum, with
// the numbers R gives; a trial without rates has no such section.
func TestReportResponse(t *testing.T) {
	t.Parallel()
	b, err := refdata.ReadFile(nitrogenJSON)
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Contrasts []struct {
			Source string  `json:"source"`
			SS     float64 `json:"ss"`
			F      float64 `json:"f"`
		} `json:"contrasts"`
		Q struct {
			Optimum float64 `json:"economic_optimum_rate"`
		} `json:"quadratic"`
		QP struct {
			Join    float64 `json:"join_point"`
			Optimum float64 `json:"economic_optimum_rate"`
		} `json:"quadratic_plateau"`
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	tr := nitrogenTrial(t)
	tr.Analysis.Response.PriceRatio = 0.008
	res, err := analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, _ := writeReport(t, tr, res, ReportOptions{Charts: true})
	sh := "Yield"
	head := findRow(t, f, sh, 1, "Response to rate (kg N/ha)")
	if head == 0 {
		t.Fatal("no response section on the trait sheet")
	}
	trend := findRow(t, f, sh, 1, "Trend")
	if trend <= head {
		t.Fatalf("trend table at row %d, section at %d", trend, head)
	}
	for i, c := range ref.Contrasts {
		r := trend + 1 + i
		if got := textAt(t, f, sh, cell(1, r)); got != map[string]string{"lack_of_fit": "lack of fit"}[c.Source] && got != c.Source {
			t.Errorf("row %d: %q, want %s", r, got, c.Source)
		}
		if ss, fv := numberAt(t, f, sh, cell(3, r)), numberAt(t, f, sh, cell(5, r)); math.Abs(ss-c.SS) > 1e-9*c.SS || math.Abs(fv-c.F) > 1e-8*c.F {
			t.Errorf("%s: SS %.12g F %.12g; R %.12g %.12g", c.Source, ss, fv, c.SS, c.F)
		}
	}
	model := findRow(t, f, sh, 1, "Model")
	if model == 0 || textAt(t, f, sh, cell(11, model)) != "Economic optimum" {
		t.Fatalf("models table at row %d without the optimum column", model)
	}
	got := map[string]int{}
	for r := model + 1; r <= model+4; r++ {
		got[textAt(t, f, sh, cell(1, r))] = r
	}
	q, ok := got["quadratic"]
	if !ok {
		t.Fatalf("model rows %v", got)
	}
	if v := numberAt(t, f, sh, cell(11, q)); math.Abs(v-ref.Q.Optimum) > 1e-7 {
		t.Errorf("quadratic optimum %.9g, R %.9g", v, ref.Q.Optimum)
	}
	qp := got["quadratic-plateau"]
	if qp == 0 {
		qp = got["quadratic-plateau (lowest AIC)"]
	}
	if qp == 0 || math.Abs(numberAt(t, f, sh, cell(8, qp))-ref.QP.Join) > 1e-5 || math.Abs(numberAt(t, f, sh, cell(11, qp))-ref.QP.Optimum) > 1e-5 {
		t.Errorf("quadratic-plateau row %d: join or optimum differ from R's %g, %g", qp, ref.QP.Join, ref.QP.Optimum)
	}
	if findRow(t, f, sh, 1, "Caution: "+export.EconomicCautionText()) == 0 {
		t.Error("no economic caution on the sheet")
	}
	pics, err := f.GetPictureCells(sh)
	if err != nil || len(pics) < 2 {
		t.Errorf("pictures on the sheet: %v, %v (want the means chart and the response chart)", pics, err)
	}

	// Without rates, no section.
	for i := range tr.Treatments {
		tr.Treatments[i].Rate = nil
	}
	res, err = analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, _ = writeReport(t, tr, res, ReportOptions{Charts: true})
	if findRow(t, f, sh, 1, "Response to rate (kg N/ha)") != 0 || findRow(t, f, sh, 1, "Response to rate") != 0 {
		t.Error("a trial without rates has a response section")
	}
}

// TestReportMargins: with a produce price the yield sheet carries the
// margins: gross return = price × mean, margin = gross − costs (by hand
// from the same sheet's means), the SE the price times the mean's SE.
func TestReportMargins(t *testing.T) {
	t.Parallel()
	tr := nitrogenTrial(t)
	p := 30.0
	tr.Economics = trial.Economics{Currency: "EUR", ProducePrice: 200, Costs: []trial.TreatmentCost{{Treatment: "N50", Product: &p, Application: 12}}}
	res, err := analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, _ := writeReport(t, tr, res, ReportOptions{Charts: false})
	sh := "Yield"
	head := findRow(t, f, sh, 1, "Margin over input cost")
	if head == 0 {
		t.Fatal("no margins on the yield sheet")
	}
	h := head + 3 // the notes, then the column heads
	if textAt(t, f, sh, cell(8, h)) != "Margin (EUR)" {
		t.Fatalf("heads at row %d: %q", h, textAt(t, f, sh, cell(8, h)))
	}
	seen := 0
	for r := h + 1; r <= h+5; r++ {
		code := textAt(t, f, sh, cell(1, r))
		mean, gross, cost, margin := numberAt(t, f, sh, cell(3, r)), numberAt(t, f, sh, cell(4, r)), numberAt(t, f, sh, cell(7, r)), numberAt(t, f, sh, cell(8, r))
		want := 0.0
		if code == "N50" {
			want = 42
		}
		if math.Abs(gross-200*mean) > 1e-9 || cost != want || math.Abs(margin-(gross-cost)) > 1e-9 {
			t.Errorf("%s: mean %g gross %g cost %g margin %g", code, mean, gross, cost, margin)
		}
		if textAt(t, f, sh, cell(10, r)) == "" {
			t.Errorf("%s: no letters", code)
		}
		seen++
	}
	if seen != 5 {
		t.Errorf("%d margin rows", seen)
	}
	// Without a price there are no margins.
	tr.Economics.ProducePrice = 0
	f, _ = writeReport(t, tr, res, ReportOptions{})
	if findRow(t, f, sh, 1, "Margin over input cost") != 0 {
		t.Error("margins without a price")
	}
}
