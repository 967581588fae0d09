package stats

import (
	"math"
	"sort"
	"testing"

	"furlong/stats/refdata"
)

// readRefCSV returns the header and rows of a CSV file of the shared
// reference data (stats/refdata, provenance in its README.md).
func readRefCSV(t *testing.T, name string) ([]string, [][]string) {
	t.Helper()
	recs := refdata.CSV(t, name)
	return recs[0], recs[1:]
}

// column returns the values of the named column.
func column(t *testing.T, header []string, rows [][]string, name string) []string {
	t.Helper()
	for j, h := range header {
		if h == name {
			out := make([]string, len(rows))
			for i, r := range rows {
				out[i] = r[j]
			}
			return out
		}
	}
	t.Fatalf("no column %q in %v", name, header)
	return nil
}

// factorOf codes labels as levels in sorted order, as R orders factor
// levels, and returns the factor and the level labels.
func factorOf(name string, labels []string) (Factor, []string) {
	seen := map[string]bool{}
	var lv []string
	for _, s := range labels {
		if !seen[s] {
			seen[s] = true
			lv = append(lv, s)
		}
	}
	sort.Strings(lv)
	code := map[string]int{}
	for i, s := range lv {
		code[s] = i
	}
	idx := make([]int, len(labels))
	for i, s := range labels {
		idx[i] = code[s]
	}
	return Factor{Name: name, Levels: len(lv), Index: idx}, lv
}

// expected is the part of an R reference file the tests use.
type expected struct {
	Source string `json:"source"`
	NObs   int    `json:"n_obs"`
	ANOVA  []struct {
		Source string   `json:"source"`
		DF     int      `json:"df"`
		SS     float64  `json:"ss"`
		MS     float64  `json:"ms"`
		F      *float64 `json:"f"`
		P      *float64 `json:"p"`
	} `json:"anova"`
	TotalSS   float64 `json:"total_ss_corrected"`
	DFError   int     `json:"df_error"`
	MSE       float64 `json:"mse"`
	GrandMean float64 `json:"grand_mean"`
	CV        float64 `json:"cv_percent"`
	Means     []struct {
		Treatment string  `json:"treatment"`
		N         int     `json:"n"`
		RawMean   float64 `json:"raw_mean"`
		LSMean    float64 `json:"ls_mean"`
		SE        float64 `json:"se"`
	} `json:"means"`
	Pairs []struct {
		Contrast string  `json:"contrast"`
		Diff     float64 `json:"diff"`
		SE       float64 `json:"se"`
	} `json:"pairs"`
	RE *float64 `json:"relative_efficiency_vs_crd"`
}

func readExpected(t *testing.T, name string) expected {
	t.Helper()
	var e expected
	refdata.JSON(t, name+".expected.json", &e)
	return e
}

// relDiff is |got−want|/|want|, or |got| when want is 0.
func relDiff(got, want float64) float64 {
	if want == 0 {
		return math.Abs(got)
	}
	return math.Abs(got-want) / math.Abs(want)
}

func checkRel(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if d := relDiff(got, want); !(d <= tol) {
		t.Errorf("%s = %.15g, want %.15g (relative difference %.2g > %.2g)", what, got, want, d, tol)
	}
}

// checkFinite fails when any number in the result is NaN or infinite.
func checkFinite(t *testing.T, a *ANOVA) {
	t.Helper()
	bad := func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) }
	for _, s := range a.Sources {
		if bad(s.SS) || bad(s.MS) || bad(s.F) || bad(s.P) {
			t.Errorf("non-finite value in line %+v", s)
		}
	}
	for _, p := range []*float64{&a.GrandMean, &a.MSE, &a.CVPercent, &a.RSquared, a.SEMean, a.SED, a.RelativeEfficiency} {
		if p != nil && bad(*p) {
			t.Errorf("non-finite summary value in %+v", a)
		}
	}
	for i, m := range a.Means {
		if bad(m.Mean) || bad(m.RawMean) || bad(m.SE) {
			t.Errorf("non-finite mean %d: %+v", i, m)
		}
	}
	for i := range a.Fitted {
		if bad(a.Fitted[i]) || bad(a.Residuals[i]) || bad(a.Leverage[i]) {
			t.Errorf("non-finite fitted/residual/leverage at %d", i)
		}
	}
}

// present returns *p, failing the test when the value is absent.
func present(t *testing.T, what string, p *float64) float64 {
	t.Helper()
	if p == nil {
		t.Errorf("%s is absent, want a value", what)
		return math.NaN()
	}
	return *p
}
