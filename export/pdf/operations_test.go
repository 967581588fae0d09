package pdf

import (
	"bytes"
	"context"
	"regexp"
	"strings"
	"testing"
	"time"

	"furlong/trial"
	"furlong/trial/analysis"
)

// TestReportOperationsPage: the log of operations is printed on the last
// page, each entry with its details, none cut off.
func TestReportOperationsPage(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	rate, water := 0.8, 150.0
	for _, op := range []trial.Operation{
		{Kind: trial.OpApplication, Date: time.Date(2026, 5, 14, 0, 0, 0, 0, time.UTC), Treatments: []string{"V02"}, Product: "Programme B",
			Rate: &rate, RateUnit: "L/ha", WaterVolume: &water, Equipment: "knapsack sprayer with a 2 m boom and air-induction nozzles"},
		{Kind: trial.OpSowing, Date: time.Date(2026, 4, 1, 0, 0, 0, 0, time.UTC)},
	} {
		if err := tr.AddOperation(op); err != nil {
			t.Fatal(err)
		}
	}
	res, err := analysis.AnalyzeAll(context.Background(), tr, []string{"yield"}, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, tr, res, ReportOptions{Traits: []string{"yield"}}); err != nil {
		t.Fatal(err)
	}
	text := regexp.MustCompile(`\s+`).ReplaceAllString(pdfText(t, buf.Bytes(), 0, 0), " ")
	for _, want := range []string{
		"Log of operations", "2026-04-01 Sowing all plots",
		"2026-05-14 Application V02 Programme B, 0.8 L/ha in 150 L/ha water knapsack sprayer with a 2 m boom and air-induction nozzles",
		"Caution: The product label is the law",
	} {
		if !strings.Contains(text, want) {
			t.Errorf("the report does not show %q", want)
		}
	}
}
