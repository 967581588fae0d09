package pdf

import (
	"bytes"
	"context"
	"encoding/json"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"furlong/export"
	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// TestReportResponse prints the nitrogen-rate trial (the reference data as
// a trial file, stats/refdata) with a price ratio of 0.008 and
// reads back the response section: R 4.2.2's economic optima of the
// quadratic and the quadratic-plateau, to the one decimal printed, the
// trend lines and the economic caution.
func TestReportResponse(t *testing.T) {
	t.Parallel()
	b, err := refdata.ReadFile("nitrogen-rates.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
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
	tr, err := trialfile.Load(refdata.File(t, "nitrogen-rates.furlong"))
	if err != nil {
		t.Fatal(err)
	}
	tr.Analysis.Response.PriceRatio = 0.008
	res, err := analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, tr, res, ReportOptions{Charts: true}); err != nil {
		t.Fatal(err)
	}
	norm := regexp.MustCompile(`\s+`).ReplaceAllString(pdfText(t, buf.Bytes(), 0, 0), " ")
	f1 := func(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) }
	for _, want := range []string{
		"Response to rate (kg N/ha)", "lack of fit", "quadratic-plateau",
		f1(ref.Q.Optimum), f1(ref.QP.Optimum), f1(ref.QP.Join),
		"Economic optimum rate of each model at price ratios around 0.008",
	} {
		if !strings.Contains(norm, want) {
			t.Errorf("the report does not show %q", want)
		}
	}
	// The caution's first sentence (it may break across lines).
	first := strings.SplitAfter(export.EconomicCautionText(), ".")[0]
	if !strings.Contains(norm, first) {
		t.Errorf("no economic caution %q", first)
	}
}

// TestReportMargins: the margins table reaches the PDF with the margin of
// each treatment worked out by hand (price × mean − cost) from the means
// the analysis gives.
func TestReportMargins(t *testing.T) {
	t.Parallel()
	tr, err := trialfile.Load(refdata.File(t, "nitrogen-rates.furlong"))
	if err != nil {
		t.Fatal(err)
	}
	p := 30.0
	tr.Economics = trial.Economics{Currency: "EUR", ProducePrice: 200, Costs: []trial.TreatmentCost{{Treatment: "N50", Product: &p, Application: 12}}}
	res, err := analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, tr, res, ReportOptions{}); err != nil {
		t.Fatal(err)
	}
	norm := regexp.MustCompile(`\s+`).ReplaceAllString(pdfText(t, buf.Bytes(), 0, 0), " ")
	if !strings.Contains(norm, "Margin over input cost") || !strings.Contains(norm, "(EUR)") {
		t.Fatal("no margins in the PDF")
	}
	for _, m := range res[0].Result.Means {
		cost := 0.0
		if m.Treatment == "N50" {
			cost = 42
		}
		if want := strconv.FormatFloat(200*m.Mean-cost, 'f', 2, 64); !strings.Contains(norm, want) {
			t.Errorf("%s: no margin %s in the PDF", m.Treatment, want)
		}
	}
}
