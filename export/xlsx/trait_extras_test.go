package xlsx

import (
	"context"
	"math"
	"strconv"
	"strings"
	"testing"

	"furlong/export"
	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// TestReportVsCheckAndContrasts writes the barley report with each variety
// against the check V01 and two contrasts, and reads the numbers back.
func TestReportVsCheckAndContrasts(t *testing.T) {
	t.Parallel()
	tr, exp := barleyTrial(t)
	res, err := analysis.AnalyzeAll(context.Background(), tr, []string{"yield"}, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	cs := []trial.Contrast{}
	for _, def := range []string{"new=V02,V03 vs V01", "pair=V04 vs V05"} {
		c, err := trial.ParseContrast(def)
		if err != nil {
			t.Fatal(err)
		}
		cs = append(cs, c)
	}
	if err := analysis.AddExtras(res, nil, analysis.Extras{VsCheck: true, Contrasts: cs, Adjust: stats.Holm}); err != nil {
		t.Fatal(err)
	}
	a := res[0].Result
	vc := a.VsCheck
	if vc == nil || len(vc.Rows) != len(exp.Means)-1 {
		t.Fatalf("comparison with the check: %+v", vc)
	}
	f, _ := writeReport(t, tr, res, ReportOptions{Charts: true, Traits: []string{"yield"}})
	sh := "Yield"
	head := findRow(t, f, sh, 1, "Each entry against the check V01 (Dunnett)")
	if head == 0 {
		t.Fatal("no table of the entries against the check")
	}
	head += 3 // two notes, then the column heads
	if got := textAt(t, f, sh, cell(3, head)); got != "Difference" {
		t.Fatalf("column heads at row %d start %q", head, got)
	}
	ref := map[string]float64{}
	for _, m := range exp.Means {
		ref[m.Treatment] = m.LSMean
	}
	// The balanced RCBD: every difference has SE √(2·MSE/r) (common
	// practice), with MSE and the means from R (stats/refdata/barley-1931-rcbd.*).
	reps := float64(exp.Means[0].N)
	sed := math.Sqrt(2 * exp.MSE / reps)
	for i, row := range vc.Rows {
		r := head + 1 + i
		if got := textAt(t, f, sh, cell(1, r)); got != row.Treatment {
			t.Fatalf("row %d: %q, want %s", r, got, row.Treatment)
		}
		for c, want := range []float64{row.Diff, row.SE, row.Lower, row.Upper, row.PTwoSided, row.PBetter} {
			if got := numberAt(t, f, sh, cell(3+c, r)); got != want {
				t.Errorf("%s column %d = %v, want %v (the analysis, at full precision)", row.Treatment, 3+c, got, want)
			}
		}
		if got := textAt(t, f, sh, cell(9, r)); got != row.Verdict {
			t.Errorf("%s reading %q, want %q", row.Treatment, got, row.Verdict)
		}
		name := ""
		for _, tm := range tr.Treatments {
			if tm.Code == row.Treatment {
				name = tm.Name
			}
		}
		if want := ref[name] - ref[tr.Treatments[0].Name]; math.Abs(row.Diff-want) > 1e-9 {
			t.Errorf("%s difference %v, want %v from R's means", row.Treatment, row.Diff, want)
		}
		if math.Abs(row.SE-sed) > 1e-9 {
			t.Errorf("%s SE %v, want %v", row.Treatment, row.SE, sed)
		}
	}
	// Dunnett's two-sided 5% critical values for 9 entries against one
	// check are 2.81 on 40 and 2.77 on 60 error df (Dunnett 1964,
	// Biometrics 20, 482–491, table II; from memory, to two decimals);
	// interpolated in 1/df, 2.797 on the 45 df here.
	crit := findRow(t, f, sh, 1, "Critical value of the intervals: "+strconv.FormatFloat(vc.Critical, 'f', 4, 64)+" on 45 error df.")
	if crit == 0 || math.Abs(vc.Critical-2.797) > 0.006 || exp.DFError != 45 {
		t.Errorf("critical value %v (row %d), error df %d; want about 2.797 on 45 df", vc.Critical, crit, exp.DFError)
	}

	// The contrasts: (V02+V03)/2 − V01 and V04 − V05 on R's means, SEs
	// √(MSE·Σc²/r) (common practice), t on the error df.
	ch := findRow(t, f, sh, 1, "Contrasts")
	if ch == 0 {
		t.Fatal("no contrasts table")
	}
	ch += 2
	byCode := map[string]float64{}
	for _, tm := range tr.Treatments {
		byCode[tm.Code] = ref[tm.Name]
	}
	want := []struct {
		name     string
		est, sum float64
	}{
		{"new", (byCode["V02"]+byCode["V03"])/2 - byCode["V01"], 0.25 + 0.25 + 1},
		{"pair", byCode["V04"] - byCode["V05"], 2},
	}
	for i, w := range want {
		r := ch + 1 + i
		if got := textAt(t, f, sh, cell(1, r)); got != w.name {
			t.Fatalf("contrast row %d is %q, want %s", r, got, w.name)
		}
		est := numberAt(t, f, sh, cell(3, r))
		se := numberAt(t, f, sh, cell(4, r))
		if math.Abs(est-w.est) > 1e-9 || math.Abs(se-math.Sqrt(exp.MSE*w.sum/reps)) > 1e-9 {
			t.Errorf("%s: estimate %v SE %v, want %v and %v", w.name, est, se, w.est, math.Sqrt(exp.MSE*w.sum/reps))
		}
		if df := numberAt(t, f, sh, cell(5, r)); df != float64(exp.DFError) {
			t.Errorf("%s: df %v", w.name, df)
		}
		row := a.Contrasts.Rows[i]
		if got := numberAt(t, f, sh, cell(8, r)); got != row.PAdjusted {
			t.Errorf("%s: p adjusted %v, want %v", w.name, got, row.PAdjusted)
		}
	}
	if !strings.Contains(textAt(t, f, sh, cell(1, ch-1)), "p adjusted by Holm") {
		t.Errorf("contrasts note %q does not say Holm", textAt(t, f, sh, cell(1, ch-1)))
	}
	// Holm on two p-values: the smaller doubled, the larger kept (but not
	// below the first) (Holm 1979, Scand. J. Statist. 6, 65–70).
	p0, p1 := a.Contrasts.Rows[0].P, a.Contrasts.Rows[1].P
	lo, hi := math.Min(p0, p1), math.Max(p0, p1)
	adjLo, adjHi := math.Min(1, 2*lo), math.Max(math.Min(1, 2*lo), hi)
	if p0 > p1 {
		adjLo, adjHi = adjHi, adjLo
	}
	if math.Abs(a.Contrasts.Rows[0].PAdjusted-adjLo) > 1e-15 || math.Abs(a.Contrasts.Rows[1].PAdjusted-adjHi) > 1e-15 {
		t.Errorf("Holm: %v %v from %v %v", a.Contrasts.Rows[0].PAdjusted, a.Contrasts.Rows[1].PAdjusted, p0, p1)
	}

	// Two charts on the sheet: the means and the entries against the check,
	// the latter under its table.
	pics, err := f.GetPictureCells(sh)
	if err != nil || len(pics) != 2 {
		t.Fatalf("pictures %v (%v), want the means chart and the chart against the check", pics, err)
	}
	// The summary's vs check column: the check marked, each entry's reading.
	sum := SummarySheet
	vsCol := 0
	for c := 4; c < 12; c++ {
		if textAt(t, f, sum, cell(c, 5)) == "vs check" {
			vsCol = c
		}
	}
	if vsCol == 0 {
		t.Fatal("no vs check column on the summary")
	}
	for i, tm := range tr.Treatments {
		got := textAt(t, f, sum, cell(vsCol, 6+i))
		want := export.VsIsCheck
		for _, row := range vc.Rows {
			if row.Treatment == tm.Code {
				want = map[string]string{"better": export.VsBetter, "worse": export.VsWorse, "not different": export.VsNotDifferent}[row.Verdict]
			}
		}
		if got != want {
			t.Errorf("summary vs check of %s: %q, want %q", tm.Code, got, want)
		}
	}
}

// TestReportEfficacy marks the barley check as an untreated control of a
// trait where lower is better and reads Abbott's efficacy back.
func TestReportEfficacy(t *testing.T) {
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
	if res[0].Result.Efficacy == nil {
		t.Fatal("no efficacy")
	}
	f, _ := writeReport(t, tr, res, ReportOptions{Traits: []string{"yield"}})
	sh := "Yield"
	head := findRow(t, f, sh, 1, "Treatment")
	col := 0
	for c := 1; c < 20; c++ {
		if textAt(t, f, sh, cell(c, head)) == "% efficacy (Abbott)" {
			col = c
		}
	}
	if col == 0 {
		t.Fatal("no efficacy column beside the means")
	}
	ref := map[string]float64{}
	for _, m := range exp.Means {
		ref[m.Treatment] = m.LSMean
	}
	untreated := ref[tr.Treatments[0].Name]
	for i, tm := range tr.Treatments {
		r := head + 1 + i
		if i == 0 {
			if got := textAt(t, f, sh, cell(col, r)); got != "untreated" {
				t.Errorf("untreated row shows %q", got)
			}
			continue
		}
		// Abbott (1925, J. Econ. Entomol. 18, 265–267): (C − T)/C × 100, on
		// R's means.
		want := (untreated - ref[tm.Name]) / untreated * 100
		if got := numberAt(t, f, sh, cell(col, r)); math.Abs(got-want) > 1e-9 {
			t.Errorf("%s efficacy %v, want %v", tm.Code, got, want)
		}
	}
	if findRow(t, f, sh, 1, "Caution: "+export.ProtectionCautionText()) == 0 {
		t.Error("no crop-protection caution under the efficacy")
	}
}
