package stats

import (
	"encoding/json"
	"math"
	"strconv"
	"testing"

	"furlong/stats/refdata"
)

// TestEqualityTestNIST: with the group means of NIST StRD SiRstv and their
// covariance MSE/nᵢ (certified within-groups mean square), the Wald test of
// equal means is the certified one-way F (an identity for least-squares
// means: common practice; Searle 1971, ch. 5, from memory); shifting every estimate by the same amount
// changes nothing, shifting one changes F.
func TestEqualityTestNIST(t *testing.T) {
	t.Parallel()
	header, rows := readRefCSV(t, "nist-strd-anova/SiRstv.csv")
	groups := column(t, header, rows, "group")
	vals := column(t, header, rows, "value")
	sum, n := map[string]float64{}, map[string]int{}
	var order []string
	for i, g := range groups {
		v, err := strconv.ParseFloat(vals[i], 64)
		if err != nil {
			t.Fatal(err)
		}
		if n[g] == 0 {
			order = append(order, g)
		}
		sum[g] += v
		n[g]++
	}
	b, err := refdata.ReadFile("nist-strd-anova/certified.json")
	if err != nil {
		t.Fatal(err)
	}
	var cert map[string]map[string]string
	if err := json.Unmarshal(b, &cert); err != nil {
		t.Fatal(err)
	}
	mse, _ := strconv.ParseFloat(cert["SiRstv"]["within_ms"], 64)
	wantF, _ := strconv.ParseFloat(cert["SiRstv"]["f"], 64)
	df, _ := strconv.Atoi(cert["SiRstv"]["within_df"])
	k := len(order)
	theta := make([]float64, k)
	cov := make([]float64, k*k)
	for i, g := range order {
		theta[i] = sum[g] / float64(n[g])
		cov[i*k+i] = mse / float64(n[g])
	}
	f, df1, p, err := EqualityTest(theta, cov, df)
	if err != nil {
		t.Fatal(err)
	}
	if df1 != k-1 || math.Abs(f-wantF) > 1e-9*wantF {
		t.Errorf("F = %.15g on %d df, certified %.15g on %d", f, df1, wantF, k-1)
	}
	if !(p > 0.3 && p < 0.4) { // F 1.18 on 4 and 20 df: p ≈ 0.35 (F table, from memory)
		t.Errorf("p = %g", p)
	}
	shifted := make([]float64, k)
	for i := range theta {
		shifted[i] = theta[i] + 7
	}
	if f2, _, _, _ := EqualityTest(shifted, cov, df); math.Abs(f2-f) > 1e-9*f {
		t.Errorf("a common shift changed F: %g, %g", f2, f)
	}
	shifted[0] += 1
	if f3, _, _, _ := EqualityTest(shifted, cov, df); !(f3 > 10*f) {
		t.Errorf("moving one estimate by 1 (about 20 SEs) left F at %g", f3)
	}
	if _, _, _, err := EqualityTest(theta[:1], cov[:1], df); err == nil {
		t.Error("one estimate tested")
	}
	if _, _, _, err := EqualityTest(theta, make([]float64, k*k), df); err == nil {
		t.Error("a zero covariance accepted")
	}
}
