package analysis

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"furlong/stats"
	"furlong/stats/refdata"
	"furlong/trial"
)

// TestContrastsWithMissingPlotsAgainstR: Immer et al.'s barley with two
// plots left out (stats/refdata/barley-1931-rcbd-missing.expected.json, R 4.2.2
// lm + emmeans). A pairwise contrast is R's pair (diff, se, p_lsd); a
// contrast of two groups has the variance −½ΣΣ c_i c_j SED²_ij computed here
// from R's own pair SEs, and the estimate from R's LS means.
func TestContrastsWithMissingPlotsAgainstR(t *testing.T) {
	t.Parallel()
	tr := barleyTrial(t)
	var want struct {
		DFError int `json:"df_error"`
		Means   []struct {
			Treatment string
			LSMean    float64 `json:"ls_mean"`
		}
		Pairs []struct {
			Contrast string
			Diff, SE float64
			PLSD     float64 `json:"p_lsd"`
		}
	}
	raw, _ := refdata.ReadFile("barley-1931-rcbd-missing.expected.json")
	if err := json.Unmarshal(raw, &want); err != nil {
		t.Fatal(err)
	}
	for _, drop := range []struct {
		site    int
		variety string
	}{{1, "Trebi"}, {4, "Peatland"}} {
		for i, p := range tr.Plots {
			if p.Block == drop.site && tr.Treatment(p.Treatment).Name == drop.variety {
				if err := tr.Exclude(i, "", "test exclusion"); err != nil {
					t.Fatal(err)
				}
			}
		}
	}
	r, err := Analyze(tr, "yield", Options{})
	if err != nil {
		t.Fatal(err)
	}
	code := map[string]string{}
	for _, trt := range tr.Treatments {
		code[trt.Name] = trt.Code
	}
	lsm := map[string]float64{}
	for _, m := range want.Means {
		lsm[m.Treatment] = m.LSMean
	}
	sed := func(a, b string) float64 {
		for _, p := range want.Pairs {
			if p.Contrast == a+" - "+b || p.Contrast == b+" - "+a {
				return p.SE
			}
		}
		t.Fatalf("no pair %s, %s", a, b)
		return 0
	}
	pair, _ := trial.ParseContrast("pair=" + code["Glabron"] + " vs " + code["Trebi"])
	groups, _ := trial.ParseContrast("groups=" + code["Trebi"] + "," + code["Peatland"] + " vs " + code["Glabron"] + "," + code["Manchuria"])
	set, err := EstimateContrasts(r, []trial.Contrast{pair, groups}, stats.AdjustNone)
	if err != nil {
		t.Fatal(err)
	}
	// R: Glabron − Trebi diff −5.61454657773386, se 2.73819292553181,
	// p_lsd 0.0464469672077731 on 43 df.
	p := set.Rows[0]
	if math.Abs(p.Estimate+5.61454657773386) > 1e-8 || math.Abs(p.SE-2.73819292553181) > 1e-9 || math.Abs(p.P-0.0464469672077731) > 1e-8 || p.DF != want.DFError {
		t.Errorf("pair %+v", p)
	}
	// Groups: c = (½, ½, −½, −½) on Trebi, Peatland, Glabron, Manchuria.
	names := []string{"Trebi", "Peatland", "Glabron", "Manchuria"}
	c := []float64{0.5, 0.5, -0.5, -0.5}
	est, v := 0.0, 0.0
	for i, a := range names {
		est += c[i] * lsm[a]
		for j, b := range names {
			if i != j {
				s := sed(a, b)
				v -= c[i] * c[j] * s * s / 2
			}
		}
	}
	g := set.Rows[1]
	if math.Abs(g.Estimate-est) > 1e-6 || math.Abs(g.SE-math.Sqrt(v)) > 1e-9 {
		t.Errorf("groups %+v, from R estimate %.10g se %.10g", g, est, math.Sqrt(v))
	}
	if g.Definition != groups.Definition() || g.PAdjusted != g.P {
		t.Errorf("groups row %+v", g)
	}
	bad, _ := trial.ParseContrast("bad=" + code["Trebi"] + " vs XX")
	if _, err := EstimateContrasts(r, []trial.Contrast{bad}, stats.AdjustNone); err == nil || !strings.Contains(err.Error(), `no treatment "XX"`) {
		t.Errorf("unknown code: %v", err)
	}
}
