package pdf

import (
	"bytes"
	"context"
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"furlong/export"
	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// TestReportContrastsAndEfficacy prints the barley report with a contrast,
// the comparison with the check and, with the check made an untreated
// control of a lower-is-better trait, Abbott's efficacy; it reads them back
// with pdftotext against values worked from R's means.
func TestReportContrastsAndEfficacy(t *testing.T) {
	t.Parallel()
	tr, exp := barleyTrial(t)
	tr.Treatments[0].Role = trial.RoleUntreated
	for i := range tr.Traits {
		tr.Traits[i].HigherBetter = false
	}
	res, err := analysis.AnalyzeAll(context.Background(), tr, []string{"yield"}, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	c, err := trial.ParseContrast("new=V02,V03 vs V01")
	if err != nil {
		t.Fatal(err)
	}
	if err := analysis.AddExtras(res, []trial.Contrast{c}, analysis.Extras{VsCheck: true, Adjust: stats.Bonferroni}); err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, tr, res, ReportOptions{Traits: []string{"yield"}}); err != nil {
		t.Fatal(err)
	}
	norm := regexp.MustCompile(`\s+`).ReplaceAllString(pdfText(t, buf.Bytes(), 0, 0), " ")
	has := func(what, s string) {
		t.Helper()
		if !strings.Contains(norm, s) {
			t.Errorf("the report does not show %s %q", what, s)
		}
	}
	f := func(v float64, dec int) string { return strconv.FormatFloat(v, 'f', dec, 64) }
	ref := map[string]float64{}
	for _, m := range exp.Means {
		ref[m.Treatment] = m.LSMean
	}
	code := map[string]float64{}
	for _, tm := range tr.Treatments {
		code[tm.Code] = ref[tm.Name]
	}
	// (V02 + V03)/2 − V01 on R's means; in a balanced RCBD its SE is the SE
	// of a mean (R's, √(MSE/r)) times √Σc² = √1.5 (common practice); t on
	// the (10 − 1)(6 − 1) = 45 error df.
	est := (code["V02"]+code["V03"])/2 - code["V01"]
	se := exp.Means[0].SE * math.Sqrt(1.5)
	has("the contrast", "new V02,V03 vs V01 "+f(est, 3)+" "+f(se, 3)+" 45")
	has("the adjustment", "p adjusted by Bonferroni")
	// Abbott (1925): (C − T)/C × 100 on R's means, one decimal.
	has("Abbott's efficacy head", "(Abbott)")
	v := (code["V01"] - code["V02"]) / code["V01"] * 100
	if !regexp.MustCompile(`V02 .* ` + regexp.QuoteMeta(f(v, 1)) + `\b`).MatchString(norm) {
		t.Errorf("no efficacy %s for V02", f(v, 1))
	}
	has("the crop-protection caution", "Caution: "+export.ProtectionCautionText()[:40])
	has("the summary's vs check column", "vs check")
	has("the comparison with the check", "Each entry against the check (V01, Dunnett)")
}
