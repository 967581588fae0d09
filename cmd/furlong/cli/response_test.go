package cli

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial/trialfile"
)

// nitrogenCSV is the R reference of the rate analysis (5 N rates × 4
// blocks; R 4.2.2 aov with contr.poly(scores = rates), lm, profiled
// quadratic-plateau), in stats/refdata.
const nitrogenCSV = "nitrogen-rates.csv"
const nitrogenJSON = "nitrogen-rates.expected.json"

type nitrogenRef struct {
	Contrasts []struct {
		Source string  `json:"source"`
		SS     float64 `json:"ss"`
		F      float64 `json:"f"`
	} `json:"contrasts"`
	QP struct {
		Join    float64 `json:"join_point"`
		Optimum float64 `json:"economic_optimum_rate"`
	} `json:"quadratic_plateau"`
	Q struct {
		Optimum float64 `json:"economic_optimum_rate"`
	} `json:"quadratic"`
}

type responseOut struct {
	Traits []responseJSON `json:"traits"`
}

func checkNitrogen(t *testing.T, label string, got responseJSON) {
	t.Helper()
	b, err := refdata.ReadFile(nitrogenJSON)
	if err != nil {
		t.Fatal(err)
	}
	var ref nitrogenRef
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	if got.Error != "" {
		t.Fatalf("%s: %s", label, got.Error)
	}
	if len(got.Contrasts) != len(ref.Contrasts) {
		t.Fatalf("%s: %d trend lines, want %d", label, len(got.Contrasts), len(ref.Contrasts))
	}
	for i, c := range ref.Contrasts {
		g := got.Contrasts[i]
		if g.Source != c.Source || math.Abs(g.SS-c.SS) > 1e-9*c.SS || math.Abs(g.F-c.F) > 1e-8*c.F {
			t.Errorf("%s %s: ss %.12g F %.12g; R %.12g %.12g", label, c.Source, g.SS, g.F, c.SS, c.F)
		}
	}
	found := 0
	for _, m := range got.Models {
		switch m.Model {
		case "quadratic":
			found++
			if m.EconOptimum == nil || math.Abs(*m.EconOptimum-ref.Q.Optimum) > 1e-7 {
				t.Errorf("%s quadratic optimum %v, R %g", label, m.EconOptimum, ref.Q.Optimum)
			}
		case "quadratic-plateau":
			found++
			if m.JoinPoint == nil || math.Abs(*m.JoinPoint-ref.QP.Join) > 1e-5 || m.EconOptimum == nil || math.Abs(*m.EconOptimum-ref.QP.Optimum) > 1e-5 {
				t.Errorf("%s quadratic-plateau join %v optimum %v; R %g %g", label, m.JoinPoint, m.EconOptimum, ref.QP.Join, ref.QP.Optimum)
			}
		}
	}
	if found != 2 || got.Caution == "" || len(got.Sensitivity) == 0 || len(got.Margin) == 0 {
		t.Errorf("%s: models %d/2, caution %q, %d sensitivity rows, %d margin points", label, found, got.Caution, len(got.Sensitivity), len(got.Margin))
	}
}

func TestResponseCSVAgainstR(t *testing.T) {
	t.Parallel()
	code, stdout, stderr := run(t, "response", refdata.File(t, nitrogenCSV), "--rate", "rate", "--block", "block", "--response", "yield", "--price-ratio", "0.008", "--format", "json")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var out responseOut
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	if len(out.Traits) != 1 {
		t.Fatalf("%d traits", len(out.Traits))
	}
	checkNitrogen(t, "csv", out.Traits[0])
	// The text form carries the same analysis and the cautions.
	code, stdout, _ = run(t, "response", refdata.File(t, nitrogenCSV), "--rate", "rate", "--block", "block", "--response", "yield", "--price-ratio", "0.008")
	if code != ExitOK || !strings.Contains(stdout, "quadratic-plateau") || !strings.Contains(stdout, "lack of fit") || !strings.Contains(stdout, "not a recommendation") {
		t.Errorf("text output:\n%s", stdout)
	}
}

func TestResponseTrialFile(t *testing.T) {
	t.Parallel()
	// The same data in a trial made with --rates, plus an untreated control
	// without a rate, which is left out of the trend: the results are R's.
	dir := t.TempDir()
	path := filepath.Join(dir, "n.furlong")
	code, _, stderr := run(t, "new", "-o", path, "--design", "rcbd", "--treatments", "N0,N50,N100,N150,N200,UTC",
		"--rates", "0,50,100,150,200,", "--rate-unit", "kg N/ha", "--reps", "4", "--seed", "11", "--traits", "yield:t/ha")
	if code != ExitOK {
		t.Fatalf("new: exit %d: %s", code, stderr)
	}
	tr, err := trialfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	f, err := refdata.Open(nitrogenCSV)
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	value := map[[2]string]float64{} // (block, code) -> yield
	for _, r := range rows[1:] {
		y, _ := strconv.ParseFloat(r[3], 64)
		value[[2]string{r[1], "N" + r[2]}] = y
	}
	for i, p := range tr.Plots {
		code := p.Treatment
		y, ok := value[[2]string{strconv.Itoa(p.Block), code}]
		if !ok {
			y = 3 + float64(p.Block)/10 // the control: any values, it is left out of the trend
		}
		if err := tr.SetValue(i, "yield", y); err != nil {
			t.Fatal(err)
		}
	}
	if err := trialfile.Save(path, tr); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr := run(t, "response", path, "--price-ratio", "0.008", "--format", "json")
	if code != ExitOK {
		t.Fatalf("response: exit %d: %s", code, stderr)
	}
	var out responseOut
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	if len(out.Traits) != 1 || len(out.Traits[0].LeftOut) != 1 || out.Traits[0].LeftOut[0] != "UTC" || out.Traits[0].RateUnit != "kg N/ha" {
		t.Fatalf("traits %+v", out.Traits)
	}
	// With the control in the model the error MS is the RCBD's over all six
	// treatments, so F differs from R's five-treatment aov; the sums of
	// squares of the trends and the curves on the means do not.
	got := out.Traits[0]
	b, _ := refdata.ReadFile(nitrogenJSON)
	var ref nitrogenRef
	_ = json.Unmarshal(b, &ref)
	for i, c := range ref.Contrasts {
		if g := got.Contrasts[i]; math.Abs(g.SS-c.SS) > 1e-9*c.SS {
			t.Errorf("%s: ss %.12g, R %.12g", c.Source, g.SS, c.SS)
		}
	}
	for _, m := range got.Models {
		if m.Model == "quadratic-plateau" && (m.JoinPoint == nil || math.Abs(*m.JoinPoint-ref.QP.Join) > 1e-5) {
			t.Errorf("join %v, R %g", m.JoinPoint, ref.QP.Join)
		}
	}

	// The price ratio saved in the trial (the window's Response view) is
	// used when --price-ratio is not given: the optimum is R's again.
	tr.Analysis.Response.PriceRatio = 0.008
	if err := trialfile.Save(path, tr); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr = run(t, "response", path, "--format", "json")
	if code != ExitOK {
		t.Fatalf("response with a saved ratio: exit %d: %s", code, stderr)
	}
	out = responseOut{}
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	found := false
	for _, m := range out.Traits[0].Models {
		if m.Model == "quadratic" {
			found = m.EconOptimum != nil && math.Abs(*m.EconOptimum-ref.Q.Optimum) <= 1e-7
		}
	}
	if !found || out.Traits[0].PriceRatio == nil || *out.Traits[0].PriceRatio != 0.008 {
		t.Errorf("saved price ratio not used: %+v", out.Traits[0].Models)
	}
}

func TestResponseErrors(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "plain.furlong")
	if code, _, stderr := run(t, "new", "-o", path, "--treatments", "4", "--reps", "3", "--seed", "1", "--traits", "yield"); code != ExitOK {
		t.Fatal(stderr)
	}
	for _, c := range []struct {
		args []string
		code int
		in   string
	}{
		{[]string{"response", path}, ExitFailure, "at least 3 treatments with a rate"},
		{[]string{"response", refdata.File(t, nitrogenCSV)}, ExitUsage, "--rate COL"},
		{[]string{"response", path, "--leave-out", "ZZ"}, ExitUsage, `no treatment "ZZ"`},
		{[]string{"response", path, "--format", "xml"}, ExitUsage, "text or json"},
		{[]string{"new", "-o", filepath.Join(dir, "x.furlong"), "--treatments", "3", "--reps", "2", "--rates", "0,1"}, ExitUsage, "one place per treatment"},
	} {
		code, _, stderr := run(t, c.args...)
		if code != c.code || !strings.Contains(stderr, c.in) {
			t.Errorf("%v: exit %d %q; want %d with %q", c.args, code, stderr, c.code, c.in)
		}
	}
}
