package stats

import (
	"encoding/json"
	"math"
	"math/big"
	"strconv"
	"testing"

	"furlong/stats/refdata"
)

// lre is the log relative error: the number of correct significant digits
// of got against the certified value, capped at 15 (the printed digits).
func lre(got, cert float64) float64 {
	if got == cert {
		return 15
	}
	d := -math.Log10(math.Abs(got-cert) / math.Abs(cert))
	return math.Min(15, math.Max(0, d))
}

// nistSet reads a NIST StRD one-way dataset. With exactOffset the common
// decimal offset (the first value) is subtracted from every response in
// exact rational arithmetic before conversion to float64, which removes the
// parsing error that otherwise limits every algorithm.
func nistSet(t *testing.T, name string, exactOffset bool) Model {
	t.Helper()
	header, rows := readRefCSV(t, "nist-strd-anova/"+name+".csv")
	groups := column(t, header, rows, "group")
	vals := column(t, header, rows, "value")
	y := make([]float64, len(vals))
	var off big.Rat
	if exactOffset {
		off.SetString(vals[0])
	}
	for i, s := range vals {
		if exactOffset {
			var r big.Rat
			if _, ok := r.SetString(s); !ok {
				t.Fatalf("bad value %q", s)
			}
			r.Sub(&r, &off)
			y[i], _ = r.Float64()
			continue
		}
		v, err := strconv.ParseFloat(s, 64)
		if err != nil {
			t.Fatal(err)
		}
		y[i] = v
	}
	trt, _ := factorOf("treatment", groups)
	return Model{Response: y, Treatment: trt}
}

// exactOneWay returns the between- and within-group sums of squares of m
// computed in exact rational arithmetic from the float64 responses, then
// rounded: the best any float64 algorithm can do with these inputs.
func exactOneWay(m Model) (between, within float64) {
	k := m.Treatment.Levels
	sum := make([]big.Rat, k)
	cnt := make([]int64, k)
	var tot big.Rat
	ys := make([]big.Rat, len(m.Response))
	for i, v := range m.Response {
		ys[i].SetFloat64(v)
		l := m.Treatment.Index[i]
		sum[l].Add(&sum[l], &ys[i])
		cnt[l]++
		tot.Add(&tot, &ys[i])
	}
	var gm big.Rat
	gm.Quo(&tot, new(big.Rat).SetInt64(int64(len(ys))))
	means := make([]big.Rat, k)
	var b, w, d big.Rat
	for l := range means {
		means[l].Quo(&sum[l], new(big.Rat).SetInt64(cnt[l]))
		d.Sub(&means[l], &gm)
		d.Mul(&d, &d)
		d.Mul(&d, new(big.Rat).SetInt64(cnt[l]))
		b.Add(&b, &d)
	}
	for i := range ys {
		d.Sub(&ys[i], &means[m.Treatment.Index[i]])
		d.Mul(&d, &d)
		w.Add(&w, &d)
	}
	between, _ = b.Float64()
	within, _ = w.Float64()
	return between, within
}

// TestNISTOneWay checks Fit against the certified values of the eleven NIST
// StRD one-way ANOVA datasets (NIST Statistical Reference Datasets, ANOVA
// section; stats/refdata/nist-strd-anova). Required digits follow the limit that
// a float64 parse of the responses allows (stats/refdata/README.md): 13 for
// SiRstv, 15 for SmLs01–03 (14.5 allowed for the last-digit rounding of the
// certified strings), about 10 for AtmWtAg and SmLs04–06 and about 4 for
// SmLs07–09. Exact rational arithmetic on the float64-parsed responses
// reaches only 9.9 digits on SmLs05–06 and 3.9 on SmLs08–09, so those
// bounds are applied with 0.15 digit of slack; the test then also requires
// (a) agreement with that exact computation to 14 digits, which is the
// algorithm's own accuracy, and (b) 14.5 digits against the certified
// values when the common decimal offset is removed before parsing.
func TestNISTOneWay(t *testing.T) {
	t.Parallel()
	b, err := refdata.ReadFile("nist-strd-anova/certified.json")
	if err != nil {
		t.Fatal(err)
	}
	var cert map[string]map[string]string
	if err := json.Unmarshal(b, &cert); err != nil {
		t.Fatal(err)
	}
	need := map[string]float64{
		"SiRstv": 13,
		"SmLs01": 14.5, "SmLs02": 14.5, "SmLs03": 14.5,
		"AtmWtAg": 10, "SmLs04": 10, "SmLs05": 10, "SmLs06": 10,
		"SmLs07": 4, "SmLs08": 4, "SmLs09": 4,
	}
	slack := map[string]float64{"AtmWtAg": 0.15, "SmLs04": 0.15, "SmLs05": 0.15, "SmLs06": 0.15, "SmLs07": 0.15, "SmLs08": 0.15, "SmLs09": 0.15}
	order := []string{"SiRstv", "SmLs01", "SmLs02", "SmLs03", "AtmWtAg", "SmLs04", "SmLs05", "SmLs06", "SmLs07", "SmLs08", "SmLs09"}
	for _, name := range order {
		c := cert[name]
		num := func(key string) float64 {
			v, err := strconv.ParseFloat(c[key], 64)
			if err != nil {
				t.Fatalf("%s %s: %v", name, key, err)
			}
			return v
		}
		for _, exact := range []bool{false, true} {
			a, err := Fit(nistSet(t, name, exact))
			if err != nil {
				t.Fatalf("%s: %v", name, err)
			}
			checkFinite(t, a)
			between, _ := a.Treatment()
			within, _ := a.Error()
			if between.DF != int(num("between_df")) || a.DFError != int(num("within_df")) {
				t.Errorf("%s: df %d, %d; want %s, %s", name, between.DF, a.DFError, c["between_df"], c["within_df"])
			}
			got := map[string]float64{
				"between_ss": between.SS,
				"within_ss":  within.SS,
				"between_ms": between.MS,
				"within_ms":  a.MSE,
				"f":          between.F,
				"r_squared":  a.RSquared,
				"resid_sd":   math.Sqrt(a.MSE),
			}
			keys := []string{"between_ss", "within_ss", "between_ms", "within_ms", "f", "r_squared", "resid_sd"}
			if !exact {
				eb, ew := exactOneWay(nistSet(t, name, false))
				lb, lw := lre(between.SS, eb), lre(within.SS, ew)
				t.Logf("%-8s digits against exact arithmetic on the same float64 inputs: between_ss=%.1f within_ss=%.1f", name, lb, lw)
				if lb < 14 || lw < 14 {
					t.Errorf("%s: SS agree with exact arithmetic on the same inputs to only %.1f, %.1f digits; want 14", name, lb, lw)
				}
			}
			minLRE := 15.0
			line := ""
			for _, k := range keys {
				l := lre(got[k], num(k))
				minLRE = math.Min(minLRE, l)
				line += " " + k + "=" + strconv.FormatFloat(l, 'f', 1, 64)
			}
			if exact {
				// With the parse error removed the algorithm itself should be
				// near the float64 limit on every set.
				t.Logf("%-8s offset-parsed digits:%s", name, line)
				if minLRE < 14.5 {
					t.Errorf("%s (exact offset): only %.1f correct digits, want at least 14.5", name, minLRE)
				}
				continue
			}
			t.Logf("%-8s float64-parsed digits:%s", name, line)
			if minLRE < need[name]-slack[name] {
				t.Errorf("%s: only %.1f correct digits, want at least %.1f", name, minLRE, need[name])
			}
		}
	}
}
