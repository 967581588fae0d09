package pdf

import (
	"bytes"
	"context"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// TestReportFactorialPage prints Yates's oats split plot (stats/refdata:
// the trial file made from oats-split.csv, R 4.2.2 results beside it) and
// reads its page back with pdftotext: the two-way table of variety ×
// nitrogen means with R's marginal means (lmer, blocks fixed), and each
// split-plot SED of R's strata analysis, to the decimals printed.
func TestReportFactorialPage(t *testing.T) {
	t.Parallel()
	tr, err := trialfile.Load(refdata.File(t, "oats-split.furlong"))
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		SED     map[string]float64 `json:"sed"`
		Effects map[string][]struct {
			Levels map[string]string `json:"levels"`
			Mean   float64           `json:"mean"`
		} `json:"effects"`
	}
	refdata.JSON(t, "oats-split.expected.json", &ref)
	res, err := analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil || res[0].Err != nil {
		t.Fatal(err, res[0].Err)
	}
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, tr, res, ReportOptions{Charts: true}); err != nil {
		t.Fatal(err)
	}
	norm := regexp.MustCompile(`\s+`).ReplaceAllString(pdfText(t, buf.Bytes(), 0, 0), " ")
	for _, want := range []string{"Means of variety × nitrogen", "Standard errors of differences",
		"two nitrogen levels at the same variety level", "two variety levels at the same nitrogen level", "Satterthwaite"} {
		if !strings.Contains(norm, want) {
			t.Errorf("the page does not show %q", want)
		}
	}
	dec := analysis.MeanDecimals(tr.Traits[0].Decimals)
	for k, v := range ref.SED {
		if s := strconv.FormatFloat(v, 'f', dec+1, 64); !strings.Contains(norm, s) {
			t.Errorf("SED %s %s not printed", k, s)
		}
	}
	n := 0
	for _, ms := range ref.Effects {
		for _, m := range ms {
			n++
			if s := strconv.FormatFloat(m.Mean, 'f', dec, 64); !strings.Contains(norm, s) {
				t.Errorf("mean %v = %s not printed", m.Levels, s)
			}
		}
	}
	if n == 0 {
		t.Error("no reference means read")
	}
}
