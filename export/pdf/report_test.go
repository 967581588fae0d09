package pdf

import (
	"bytes"
	"context"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"furlong/export"
	"furlong/trial/analysis"
)

// TestReportPrintsTheAnalysis reads the PDF report of the 1931 barley RCBD
// back with pdftotext and finds R's numbers in it.
func TestReportPrintsTheAnalysis(t *testing.T) {
	t.Parallel()
	_, exp, data := barleyReport(t, ReportOptions{Charts: true, Version: "test"}, true)
	text := pdfText(t, data, 0, 0)
	norm := regexp.MustCompile(`[ \t]+`).ReplaceAllString(text, " ")
	has := func(what, s string) {
		t.Helper()
		if !strings.Contains(norm, s) {
			t.Errorf("the report does not show %s %q", what, s)
		}
	}
	f := func(v float64, dec int) string { return strconv.FormatFloat(v, 'f', dec, 64) }
	// ANOVA lines: R 4.2.2, stats::lm on lattice::barley 1931 (stats/refdata/README.md).
	for _, a := range exp.ANOVA {
		name := map[string]string{"site": "Blocks", "variety": "Treatments", "Residuals": "Error"}[a.Source]
		line := name + " " + strconv.Itoa(a.DF) + " " + f(a.SS, 3) + " " + f(a.MS, 3)
		if a.F != nil {
			line += " " + f(*a.F, 2)
		}
		has("the ANOVA line", line)
	}
	// Grand mean, CV% and LSD (0.05) as R gives them (same source).
	has("the grand mean", "Grand mean "+f(exp.GrandMean, 3))
	has("the CV%", "CV% "+f(exp.CV, 1))
	has("the LSD", "LSD (0.05) "+f(exp.LSD, 3))
	// Every variety's least-squares mean and SE (emmeans, same source).
	for _, m := range exp.Means {
		line := regexp.MustCompile(regexp.QuoteMeta(m.Treatment) + `( \(check\))? \d+ ` + regexp.QuoteMeta(f(m.LSMean, 3)) + ` .* ` + regexp.QuoteMeta(f(m.SE, 3)))
		if !line.MatchString(norm) {
			t.Errorf("the report has no means line for %s with mean %s and SE %s", m.Treatment, f(m.LSMean, 3), f(m.SE, 3))
		}
	}
	// The cautions, the non-ASCII title as typed, page numbers.
	for _, c := range export.Cautions[:1] {
		has("the caution", c)
	}
	has("the title", barleyTitle)
	has("R squared", "R²")
	pages := len(regexp.MustCompile(`page \d+ of \d+`).FindAllString(norm, -1))
	if pages < 5 {
		t.Errorf("found %d page numbers, want one per page (cover, summary, trait, data, map at least)", pages)
	}
	has("the comparison with the check", "Each entry against the check (V01, Dunnett)")
	has("the map's dimensions", "10 m long × 1.5 m wide")
}

// TestReportPaper checks the page sizes: A4 is 595 × 842 points (ISO 216,
// 210 × 297 mm) and US Letter 612 × 792 (8.5 × 11 in), portrait, with the
// field map page landscape.
func TestReportPaper(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		paper Paper
		w, h  string
	}{{A4, "595.28", "841.89"}, {Letter, "612.00", "792.00"}} {
		_, _, data := barleyReport(t, ReportOptions{Paper: tc.paper}, false)
		portrait := "[0 0 " + tc.w + " " + tc.h + "]"
		landscape := "[0 0 " + tc.h + " " + tc.w + "]"
		if !bytes.Contains(data, []byte(portrait)) || !bytes.Contains(data, []byte(landscape)) {
			t.Errorf("%s: want portrait pages %s and a landscape map page %s", tc.paper, portrait, landscape)
		}
	}
}

// TestReportStops checks that a cancelled report stops with the context's
// error and that a trait without values gets a page saying so.
func TestReportStops(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	var buf bytes.Buffer
	if err := WriteReport(ctx, &buf, tr, nil, ReportOptions{}); err != context.Canceled {
		t.Fatalf("cancelled: got %v, want context.Canceled", err)
	}
	// No results: every trait page explains itself instead of failing.
	buf.Reset()
	if err := WriteReport(context.Background(), &buf, tr, []analysis.Outcome{}, ReportOptions{}); err != nil {
		t.Fatal(err)
	}
	if !bytes.HasPrefix(buf.Bytes(), []byte("%PDF-")) {
		t.Fatal("not a PDF")
	}
	text := pdfText(t, buf.Bytes(), 0, 0)
	if !strings.Contains(text, "No analysis: this trait was not analysed.") {
		t.Errorf("the trait page does not say why there is no analysis:\n%s", text)
	}
}
