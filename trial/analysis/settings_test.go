package analysis

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"sort"
	"strconv"
	"strings"
	"testing"

	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/stats/refdata"
	"furlong/trial"
)

// insectSprays reads the square-root insect-spray counts and R's results
// (stats/refdata/README.md).
func insectSprays(t *testing.T) (*Data, []float64, struct {
	TCrit float64 `json:"t_crit_975"`
	Means []struct {
		Treatment string
		LSMean    float64 `json:"ls_mean"`
		SE        float64
	}
}) {
	t.Helper()
	f, err := refdata.Open("insect-sprays-sqrt.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	d := &Data{TraitKey: "n", Design: trial.CRD, Decimals: 0, HigherBetter: false}
	var roots []float64
	for i, r := range rows[1:] {
		v, err := strconv.ParseFloat(r[0], 64)
		if err != nil {
			t.Fatal(err)
		}
		k := -1
		for j, c := range d.Treatments {
			if c == r[1] {
				k = j
			}
		}
		if k < 0 {
			d.Treatments = append(d.Treatments, r[1])
			k = len(d.Treatments) - 1
		}
		d.Treatment = append(d.Treatment, k)
		d.Values = append(d.Values, v)
		d.Plot = append(d.Plot, i+2)
		roots = append(roots, v)
	}
	var ref struct {
		TCrit float64 `json:"t_crit_975"`
		Means []struct {
			Treatment string
			LSMean    float64 `json:"ls_mean"`
			SE        float64
		}
	}
	raw, err := refdata.ReadFile("insect-sprays-sqrt.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	return d, roots, ref
}

// TestConfidenceLimitsAgainstR: on the square-root scale R's emmeans gives
// each spray's LS mean and SE; the 95% limits are mean ± t(0.975, 66)·SE
// (t from R). Analysed as recorded, the limits are those; analysed from the
// counts under the sqrt transformation (the counts have zeros, so √(y+0.5)
// is used, stats.ApplyTransform), the limits are the squares of the
// transformed-scale limits less 0.5 — computed here by hand from group
// means and the pooled error of √(y+0.5) (Gomez & Gomez 1984, 7.2.2.2).
func TestConfidenceLimitsAgainstR(t *testing.T) {
	t.Parallel()
	d, roots, ref := insectSprays(t)
	r, err := AnalyzeData(d, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for i, m := range r.Means {
		want := ref.Means[i]
		if m.Lower == nil || m.Upper == nil {
			t.Fatalf("%s has no limits", m.Treatment)
		}
		near(t, m.Treatment+" lower", *m.Lower, want.LSMean-ref.TCrit*want.SE)
		near(t, m.Treatment+" upper", *m.Upper, want.LSMean+ref.TCrit*want.SE)
	}

	// The counts themselves, square-root transformed.
	counts := *d
	counts.Values = make([]float64, len(roots))
	for i, v := range roots {
		counts.Values[i] = math.Round(v * v) // the original whole counts
	}
	counts.Transform = stats.Sqrt
	rs, err := AnalyzeData(&counts, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if rs.Transform != stats.Sqrt || rs.Offset != 0.5 {
		t.Fatalf("transform %q offset %v", rs.Transform, rs.Offset)
	}
	k := len(d.Treatments)
	sum, n := make([]float64, k), make([]float64, k)
	for i, v := range counts.Values {
		sum[d.Treatment[i]] += math.Sqrt(v + 0.5)
		n[d.Treatment[i]]++
	}
	var sse float64
	for i, v := range counts.Values {
		g := d.Treatment[i]
		e := math.Sqrt(v+0.5) - sum[g]/n[g]
		sse += e * e
	}
	mse := sse / float64(len(counts.Values)-k)
	for g, m := range rs.Means {
		mean, se := sum[g]/n[g], math.Sqrt(mse/n[g])
		lo, hi := mean-ref.TCrit*se, mean+ref.TCrit*se
		near(t, m.Treatment+" back mean", m.BackMean, mean*mean-0.5)
		near(t, m.Treatment+" back lower", *m.Lower, math.Max(lo, 0)*math.Max(lo, 0)-0.5)
		near(t, m.Treatment+" back upper", *m.Upper, hi*hi-0.5)
		if !(*m.Lower < m.BackMean && m.BackMean < *m.Upper) {
			t.Errorf("%s: limits %v–%v do not hold the mean %v", m.Treatment, *m.Lower, *m.Upper, m.BackMean)
		}
	}
	if !strings.Contains(strings.Join(rs.Notes, " "), "confidence limits are on the original scale") {
		t.Errorf("no note on the scale of the limits: %q", rs.Notes)
	}
}

// TestTrialSettings: each trait is analysed on its own scale and read with
// the trial's method; the command line's --transform overrides the trait.
func TestTrialSettings(t *testing.T) {
	t.Parallel()
	tr := barleyTrial(t)
	tr.Traits[0].Transform = trial.TransformLog
	tr.Analysis.Method = trial.MethodTukey
	r, err := Analyze(tr, "yield", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Transform != stats.Log || r.Method != meansep.Tukey || r.MSD() != r.HSD || r.Letters(0) != r.Means[0].LettersTukey {
		t.Errorf("transform %q method %q", r.Transform, r.Method)
	}
	// The back-transformed mean of logs is the geometric mean of the
	// block values (a balanced RCBD: LS mean = plain mean of the logs).
	vals, _ := tr.TraitValues("yield")
	var logSum float64
	var cnt int
	for i, p := range tr.Plots {
		if p.Treatment == r.Means[0].Treatment {
			logSum += math.Log(vals[i])
			cnt++
		}
	}
	near(t, "geometric mean", r.Means[0].BackMean, math.Exp(logSum/float64(cnt)))
	r, err = Analyze(tr, "yield", Options{Transform: stats.Sqrt, Method: meansep.LSD})
	if err != nil {
		t.Fatal(err)
	}
	if r.Transform != stats.Sqrt || r.Method != meansep.LSD {
		t.Errorf("override: transform %q method %q", r.Transform, r.Method)
	}
	if _, err := AnalyzeData(&Data{TraitKey: "x"}, Options{Method: "duncan"}); err == nil || !strings.Contains(err.Error(), "not known") {
		t.Errorf("unknown method: %v", err)
	}
}

// TestPercentOfCheckAnyTrait: any trait the user picks shows percent of
// check; a worked case: checks at 3.5 and 4.5 average 4.0 (the plain mean
// of the check entries, common practice), so 5.0 is 125%.
func TestPercentOfCheckAnyTrait(t *testing.T) {
	t.Parallel()
	r := &Result{Means: []Mean{{Check: true, BackMean: 3.5}, {Check: true, BackMean: 4.5}, {BackMean: 5}, {BackMean: 4}}}
	percentOfCheck(r)
	if r.CheckMean == nil || *r.CheckMean != 4 {
		t.Fatalf("check mean %v", r.CheckMean)
	}
	for i, want := range []float64{87.5, 112.5, 125, 100} {
		if p := r.Means[i].PercentOfCheck; p == nil || *p != want {
			t.Errorf("mean %d: %v%%, want %v", i, p, want)
		}
	}
	// No check, or a check mean of 0 or below: absent, not a division by 0.
	r = &Result{Means: []Mean{{Check: true, BackMean: 0}, {BackMean: 5}}}
	if percentOfCheck(r); r.CheckMean != nil || r.Means[1].PercentOfCheck != nil {
		t.Error("percent of a zero check")
	}

	tr := barleyTrial(t)
	tr.Treatments[2].Role = trial.RoleCheck
	yes := true
	tr.Traits[0].PercentOfCheck = &yes
	tr.Traits[0].Key = "gy" // not keyed yield: shown only because chosen
	res, err := Analyze(tr, "gy", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if res.CheckMean == nil || res.Means[2].PercentOfCheck == nil || math.Abs(*res.Means[2].PercentOfCheck-100) > 1e-12 {
		t.Errorf("chosen trait has no percent of check: %v", res.CheckMean)
	}
	no := false
	tr.Traits[0].PercentOfCheck = &no
	if res, _ = Analyze(tr, "gy", Options{}); res.CheckMean != nil {
		t.Error("percent of check shown against the user's choice")
	}
}

// TestLSDRangeAgainstR: with two plots missing each pair of means has its
// own SE (R emmeans, stats/refdata); the pairwise LSD is t(0.975, df)·SE
// (t from R), and the result gives the smallest and largest of them.
func TestLSDRangeAgainstR(t *testing.T) {
	t.Parallel()
	tr := barleyTrial(t)
	var want struct {
		TCrit float64 `json:"t_crit_975"`
		Pairs []struct{ SE float64 }
	}
	raw, _ := refdata.ReadFile("barley-1931-rcbd-missing.expected.json")
	if err := json.Unmarshal(raw, &want); err != nil {
		t.Fatal(err)
	}
	for i, p := range tr.Plots {
		if (p.Block == 1 && tr.Treatment(p.Treatment).Name == "Trebi") || (p.Block == 4 && tr.Treatment(p.Treatment).Name == "Peatland") {
			if err := tr.Exclude(i, "", "test"); err != nil {
				t.Fatal(err)
			}
		}
	}
	r, err := Analyze(tr, "yield", Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.LSD != nil || r.LSDRange == nil || r.HSDRange == nil {
		t.Fatalf("LSD %v, range %v", r.LSD, r.LSDRange)
	}
	var ses []float64
	for _, p := range want.Pairs {
		ses = append(ses, p.SE)
	}
	sort.Float64s(ses)
	near(t, "smallest LSD", r.LSDRange.Min, want.TCrit*ses[0])
	near(t, "largest LSD", r.LSDRange.Max, want.TCrit*ses[len(ses)-1])
	for _, p := range r.Pairs {
		near(t, "pair LSD", p.LSD, want.TCrit*p.SE)
	}
	if !(r.HSDRange.Min > r.LSDRange.Min) {
		t.Error("HSD range below the LSD range")
	}
	// Balanced data: the range closes on the single LSD.
	b := barleyTrial(t)
	rb, err := Analyze(b, "yield", Options{})
	if err != nil {
		t.Fatal(err)
	}
	near(t, "balanced range", rb.LSDRange.Min, *rb.LSD)
	near(t, "balanced range", rb.LSDRange.Max, *rb.LSD)
}

// TestVarianceChecksRCBD: in an RCBD Levene's (Brown–Forsythe) and
// Bartlett's tests run on the residuals grouped by treatment. Checked
// against a dense computation here: residuals of the additive two-way
// model, y − treatment mean − block mean + grand mean (balanced data,
// Gomez & Gomez 1984, 2.2.3), absolute deviations from each treatment's
// median, one-way F of those.
func TestVarianceChecksRCBD(t *testing.T) {
	t.Parallel()
	tr := barleyTrial(t)
	r, err := Analyze(tr, "yield", Options{})
	if err != nil {
		t.Fatal(err)
	}
	d := r.Diagnostics
	if d.LeveneF == nil || d.BartlettK2 == nil || d.VarianceOn != "residuals" {
		t.Fatalf("variance checks %v %v %q", d.LeveneF, d.BartlettK2, d.VarianceOn)
	}
	vals, _ := tr.TraitValues("yield")
	k, b := len(tr.Treatments), tr.Blocks()
	tm, bm := make([]float64, k), make([]float64, b)
	var gm float64
	for i, p := range tr.Plots {
		tm[tr.TreatmentIndex(p.Treatment)] += vals[i] / float64(b)
		bm[p.Block-1] += vals[i] / float64(k)
		gm += vals[i] / float64(k*b)
	}
	groups := make([][]float64, k)
	for i, p := range tr.Plots {
		g := tr.TreatmentIndex(p.Treatment)
		groups[g] = append(groups[g], vals[i]-tm[g]-bm[p.Block-1]+gm)
	}
	var z [][]float64
	var zAll []float64
	for _, g := range groups {
		s := append([]float64(nil), g...)
		sort.Float64s(s)
		med := (s[len(s)/2] + s[(len(s)-1)/2]) / 2
		var zg []float64
		for _, v := range g {
			zg = append(zg, math.Abs(v-med))
		}
		z = append(z, zg)
		zAll = append(zAll, zg...)
	}
	var zbar float64
	for _, v := range zAll {
		zbar += v / float64(len(zAll))
	}
	var ssb, ssw float64
	for _, zg := range z {
		var m float64
		for _, v := range zg {
			m += v / float64(len(zg))
		}
		ssb += float64(len(zg)) * (m - zbar) * (m - zbar)
		for _, v := range zg {
			ssw += (v - m) * (v - m)
		}
	}
	f := (ssb / float64(k-1)) / (ssw / float64(len(zAll)-k))
	near(t, "Levene F on residuals", *d.LeveneF, f)
	found := false
	for _, rd := range d.Readings {
		if rd.Check == "levene" {
			found = strings.Contains(rd.Text, "on the residuals of the fitted model, grouped by treatment")
		}
	}
	if !found {
		t.Errorf("the reading does not say the test ran on residuals: %+v", d.Readings)
	}
}
