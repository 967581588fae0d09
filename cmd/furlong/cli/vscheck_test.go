package cli

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"furlong/stats/refdata"
)

func TestAnalyzeVsCheckAgainstMultcomp(t *testing.T) {
	t.Parallel()
	// Reference: R 4.2.2 multcomp::glht Dunnett single-step on an RCBD with
	// one plot missing (stats/refdata/dunnett-example.expected.json);
	// multcomp's p-values are good to about 1e-6, differences and SEs are
	// exact least squares.
	b, err := refdata.ReadFile("dunnett-example.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		VsCheck []struct {
			Treatment string  `json:"treatment"`
			Diff      float64 `json:"diff"`
			SE        float64 `json:"se"`
			PTwo      float64 `json:"p_two_sided"`
			PGreater  float64 `json:"p_greater"`
		} `json:"vs_check"`
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr := run(t, "analyze", refdata.File(t, "dunnett-example.csv"), "--treatment", "entry", "--block", "block",
		"--response", "yield", "--check", "STD", "--format", "json")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var out struct {
		Traits []jsonTrait `json:"traits"`
	}
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	got := out.Traits[0].VsCheck
	if len(got) != len(ref.VsCheck) {
		t.Fatalf("%d comparisons, want %d", len(got), len(ref.VsCheck))
	}
	for i, w := range ref.VsCheck {
		g := got[i]
		if g.Treatment != w.Treatment || math.Abs(g.Diff-w.Diff) > 1e-9 || math.Abs(g.SE-w.SE) > 1e-9 ||
			math.Abs(g.PTwoSided-w.PTwo) > 2e-6 || math.Abs(g.PBetter-w.PGreater) > 2e-6 {
			t.Errorf("%s: diff %.10g se %.10g p %.8g p> %.8g; multcomp %.10g %.10g %.8g %.8g",
				w.Treatment, g.Diff, g.SE, g.PTwoSided, g.PBetter, w.Diff, w.SE, w.PTwo, w.PGreater)
		}
		// The simultaneous interval is diff ± critical·SE and excludes 0
		// exactly when the adjusted two-sided p is below α.
		if (g.Lower > 0 || g.Upper < 0) != (g.PTwoSided < 0.05) {
			t.Errorf("%s: interval [%g, %g] disagrees with p %g", g.Treatment, g.Lower, g.Upper, g.PTwoSided)
		}
	}
	info := out.Traits[0].VsCheckInfo
	if info == nil || info.Check != "STD" || info.Method == "" {
		t.Errorf("vs_check_method %+v", info)
	}
	// Lower is better: the one-sided p looks the other way.
	code, stdout, _ = run(t, "analyze", refdata.File(t, "dunnett-example.csv"), "--treatment", "entry", "--block", "block",
		"--response", "yield", "--check", "STD", "--lower-is-better", "--format", "json")
	if code != ExitOK {
		t.Fatal(stdout)
	}
	out.Traits = nil
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	// With lower values better, an entry above the check has a one-sided
	// p of P(max_j T_j > −|t|) ≥ P(T_1 > −|t|) > ½ (the statistics are
	// symmetric), while its two-sided p is unchanged.
	for i, g := range out.Traits[0].VsCheck {
		if g.Diff > 0 && !(g.PBetter > 0.5) {
			t.Errorf("%s: above the check but lower-is-better p %g", g.Treatment, g.PBetter)
		}
		if math.Abs(g.PTwoSided-got[i].PTwoSided) > 1e-12 {
			t.Errorf("%s: two-sided p changed with the direction", g.Treatment)
		}
	}
}

func TestAnalyzeVsCheckErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		args []string
		code int
		in   string
	}{
		{[]string{"analyze", refdata.File(t, "dunnett-example.csv"), "--treatment", "entry", "--block", "block", "--response", "yield", "--check", "NOPE"}, ExitFailure, `no treatment "NOPE"`},
		{[]string{"analyze", "x.furlong", "--lower-is-better"}, ExitUsage, "for CSV tables"},
	} {
		code, _, stderr := run(t, c.args...)
		if code != c.code || !strings.Contains(stderr, c.in) {
			t.Errorf("%v: exit %d %q; want %d with %q", c.args, code, stderr, c.code, c.in)
		}
	}
}
