package cli

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial/trialfile"
)

// nitrogenFixture: the nitrogen-rate reference data as a trial file (see
// stats/refdata/README.md).
const nitrogenFixture = "nitrogen-rates.furlong"

func copyNitrogen(t *testing.T) string {
	t.Helper()
	b, err := refdata.ReadFile(nitrogenFixture)
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "n.furlong")
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	return path
}

// TestMargins: margin = price × mean − (product + application), its SE the
// price times the mean's SE (by hand, from the same run's means); with no
// costs the F test of equal margins is the ANOVA's treatment F (common
// practice: the Wald test of least-squares means); --save keeps the prices
// in the trial for the next run.
func TestMargins(t *testing.T) {
	t.Parallel()
	path := copyNitrogen(t)
	code, stdout, stderr := run(t, "margins", path, "--price", "200", "--format", "json")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var plain marginsJSON
	if err := json.Unmarshal([]byte(stdout), &plain); err != nil {
		t.Fatal(err)
	}
	code, stdout, _ = run(t, "analyze", path, "--format", "json")
	if code != ExitOK {
		t.Fatalf("analyze exit %d", code)
	}
	var an struct {
		Traits []struct {
			ANOVA []struct {
				Source string  `json:"source"`
				F      float64 `json:"f"`
			} `json:"anova"`
		} `json:"traits"`
	}
	if err := json.Unmarshal([]byte(stdout), &an); err != nil {
		t.Fatal(err)
	}
	for _, l := range an.Traits[0].ANOVA {
		if l.Source == "treatment" && math.Abs(l.F-plain.F) > 1e-9*l.F {
			t.Errorf("F of equal margins without costs %.12g, treatment F %.12g", plain.F, l.F)
		}
	}

	code, stdout, stderr = run(t, "margins", path, "--price", "200", "--currency", "EUR",
		"--cost", "N50=30+12", "--cost", "N100=60,5+12", "--cost", "N0=+0", "--save", "--format", "json")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var m marginsJSON
	if err := json.Unmarshal([]byte(stdout), &m); err != nil {
		t.Fatal(err)
	}
	cost := map[string][2]float64{"N50": {30, 12}, "N100": {60.5, 12}, "N0": {0, 0}}
	for _, r := range m.Margins {
		c := cost[r.Treatment]
		want := 200*r.Mean - c[0] - c[1]
		if math.Abs(r.Margin-want) > 1e-9 || math.Abs(r.MarginSE-200*r.SE) > 1e-9 || r.Product != c[0] || r.Application != c[1] {
			t.Errorf("%s: margin %g ± %g (product %g, application %g), want %g ± %g", r.Treatment, r.Margin, r.MarginSE, r.Product, r.Application, want, 200*r.SE)
		}
		if _, ok := cost[r.Treatment]; ok != (r.CostFrom == "given") {
			t.Errorf("%s: cost from %q", r.Treatment, r.CostFrom)
		}
		if r.Letters == "" {
			t.Errorf("%s: no letters", r.Treatment)
		}
	}
	if m.Currency != "EUR" || !strings.Contains(m.Caution, "not a recommendation") || !strings.Contains(stderr, "saved the prices") {
		t.Errorf("currency %q, caution %q, stderr %q", m.Currency, m.Caution, stderr)
	}
	tr, err := trialfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	if tr.Economics.ProducePrice != 200 || len(tr.Economics.Costs) != 3 {
		t.Fatalf("saved economics %+v", tr.Economics)
	}
	// The saved prices serve the next run, with the same margins.
	code, stdout, _ = run(t, "margins", path, "--format", "json")
	var again marginsJSON
	if code != ExitOK || json.Unmarshal([]byte(stdout), &again) != nil || len(again.Margins) != len(m.Margins) || again.Margins[1].Margin != m.Margins[1].Margin {
		t.Errorf("with the saved prices: exit %d, %+v", code, again.Margins)
	}
	// The text form carries the letters and the caution.
	code, stdout, _ = run(t, "margins", path)
	if code != ExitOK || !strings.Contains(stdout, "Margin over input cost") || !strings.Contains(stdout, "200 EUR per t") || !strings.Contains(stdout, "not a recommendation") {
		t.Errorf("text:\n%s", stdout)
	}
}

func TestMarginsErrors(t *testing.T) {
	t.Parallel()
	path := copyNitrogen(t)
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"margins", path}, ExitUsage, "price of the produce"},
		{[]string{"margins", path, "--price", "200", "--cost", "N50"}, ExitUsage, "CODE=PRODUCT+APPLICATION"},
		{[]string{"margins", path, "--price", "200", "--cost", "N50=lots"}, ExitUsage, "not a positive number"},
		{[]string{"margins", path, "--price", "200", "--cost", "ZZ=1"}, ExitFailure, `no treatment "ZZ"`},
		{[]string{"margins", path, "--price", "-3"}, ExitFailure, "price of the produce"},
		{[]string{"margins", path, "--price", "200", "--trait", "nope"}, ExitFailure, `no trait "nope"`},
	} {
		code, _, stderr := run(t, c.args...)
		if code != c.code || !strings.Contains(stderr, c.want) {
			t.Errorf("%v: exit %d, %q; want %d with %q", c.args[2:], code, stderr, c.code, c.want)
		}
	}
}
