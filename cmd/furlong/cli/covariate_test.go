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

// TestAnalyzeCovariateTrial: Montgomery's fibre data (5th ed., section
// 15.3; results from memory: adjusted means 40.38, 41.42, 38.80, slope
// 0.954) entered in a trial made with `new`, the diameter a trait of its
// own, analysed with --covariate.
func TestAnalyzeCovariateTrial(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "fibre.furlong")
	code, _, stderr := run(t, "new", "-o", path, "--design", "crd", "--treatments", "M1,M2,M3",
		"--reps", "5", "--seed", "3", "--traits", "strength:lb,diam:mm")
	if code != ExitOK {
		t.Fatalf("new: exit %d: %s", code, stderr)
	}
	tr, err := trialfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	f, err := refdata.Open("fiber-ancova.csv")
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	next := map[string][][]string{}
	for _, r := range rows[1:] {
		next[r[0]] = append(next[r[0]], r)
	}
	for i, p := range tr.Plots {
		r := next[p.Treatment][0]
		next[p.Treatment] = next[p.Treatment][1:]
		y, _ := strconv.ParseFloat(r[1], 64)
		x, _ := strconv.ParseFloat(r[2], 64)
		if err := tr.SetValue(i, "strength", y); err != nil {
			t.Fatal(err)
		}
		if err := tr.SetValue(i, "diam", x); err != nil {
			t.Fatal(err)
		}
	}
	if err := trialfile.Save(path, tr); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr := run(t, "analyze", path, "--covariate", "diam", "--format", "json")
	if code != ExitOK {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	var out struct {
		Traits []struct {
			Trait string `json:"trait"`
			Means []struct {
				Treatment string  `json:"treatment"`
				Mean      float64 `json:"mean"`
				Unadj     float64 `json:"unadjusted_mean"`
			} `json:"means"`
			Covariate *struct {
				Key   string   `json:"key"`
				Slope float64  `json:"slope"`
				SE    float64  `json:"se"`
				P     float64  `json:"p"`
				HomP  *float64 `json:"homogeneity_p"`
			} `json:"covariate"`
		} `json:"traits"`
	}
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	if len(out.Traits) != 1 || out.Traits[0].Trait != "strength" || out.Traits[0].Covariate == nil {
		t.Fatalf("want strength adjusted for diam only: %s", stdout)
	}
	tt := out.Traits[0]
	if c := tt.Covariate; c.Key != "diam" || math.Abs(c.Slope-0.954) > 0.0005 || c.HomP == nil {
		t.Errorf("covariate %+v", c)
	}
	want := map[string]float64{"M1": 40.38, "M2": 41.42, "M3": 38.80} // Montgomery, from memory
	for _, m := range tt.Means {
		if math.Abs(m.Mean-want[m.Treatment]) > 0.005 {
			t.Errorf("%s adjusted mean %g, want %g", m.Treatment, m.Mean, want[m.Treatment])
		}
	}
	code, stdout, _ = run(t, "analyze", path, "--covariate", "diam")
	if code != ExitOK || !strings.Contains(stdout, "Adjusted mean") || !strings.Contains(stdout, "Covariate diam: means adjusted to its mean 24.133") {
		t.Errorf("text output:\n%s", stdout)
	}
	if code, _, stderr = run(t, "analyze", path, "--covariate", "nope"); code == ExitOK || !strings.Contains(stderr, "no trait \"nope\"") {
		t.Errorf("unknown covariate: exit %d, %s", code, stderr)
	}
	if code, _, stderr = run(t, "analyze", path, "--trait", "diam", "--covariate", "diam"); code == ExitOK || !strings.Contains(stderr, "its own covariate") {
		t.Errorf("own covariate: exit %d, %s", code, stderr)
	}
}
