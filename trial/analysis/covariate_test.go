package analysis

import (
	"encoding/csv"
	"math"
	"strings"
	"testing"

	"furlong/stats/refdata"
)

func readFiber(t *testing.T, cov string) []*Data {
	t.Helper()
	f, err := refdata.ReadFile("fiber-ancova.csv")
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(strings.NewReader(string(f))).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	ds, err := ParseTable(rows, TableColumns{Treatment: "machine", Covariate: cov})
	if err != nil {
		t.Fatal(err)
	}
	return ds
}

// TestCovariateTable: a table's covariate column adjusts the response and
// is not analysed itself; the adjusted means are Montgomery's (5th ed.,
// section 15.3, from memory: 40.38, 41.42, 38.80, slope 0.954), and the
// letters compare the adjusted means.
func TestCovariateTable(t *testing.T) {
	t.Parallel()
	ds := readFiber(t, "diameter")
	if len(ds) != 1 || ds[0].TraitKey != "strength" {
		t.Fatalf("got %d responses, want strength only", len(ds))
	}
	r, err := AnalyzeData(ds[0], Options{})
	if err != nil {
		t.Fatal(err)
	}
	c := r.Covariate
	if c == nil || c.Key != "diameter" {
		t.Fatalf("covariate %+v", c)
	}
	if math.Abs(c.Slope-0.954) > 0.0005 {
		t.Errorf("slope %g, want 0.954 (Montgomery)", c.Slope)
	}
	for i, w := range []float64{40.38, 41.42, 38.80} {
		if math.Abs(r.Means[i].Mean-w) > 0.005 {
			t.Errorf("adjusted mean %d = %g, want %g (Montgomery)", i, r.Means[i].Mean, w)
		}
		if r.Means[i].LettersTukey == "" {
			t.Errorf("mean %d has no Tukey letters", i)
		}
	}
	// Raw means 41.4, 43.2, 36.0 (the data), unadjusted LS means equal.
	for i, w := range []float64{41.4, 43.2, 36.0} {
		if math.Abs(c.Unadjusted[i]-w) > 1e-9 || math.Abs(r.Means[i].RawMean-w) > 1e-9 {
			t.Errorf("unadjusted mean %d = %g, raw %g, want %g", i, c.Unadjusted[i], r.Means[i].RawMean, w)
		}
	}
	// The diameters differ between machines (Montgomery's Txx = 66.13 on
	// 2 df against Exx = 195.60 on 12: F = 2.03, from memory), not
	// significantly: no warning that the covariate responds.
	if c.OnTreatmentF == nil || math.Abs(*c.OnTreatmentF-(66.13/2)/(195.60/12)) > 0.01 || c.Responds {
		t.Errorf("covariate on treatments: F %v, responds %v", c.OnTreatmentF, c.Responds)
	}
	if r.LSD != nil {
		t.Error("adjusted means have unequal SEs, so no single LSD")
	}
	if !strings.Contains(strings.Join(r.Notes, " "), "Adjusted for the covariate diameter") {
		t.Errorf("notes %q", r.Notes)
	}
}

// TestCovariateResponds: a covariate the treatments changed is flagged.
// The strength itself, shifted by machine, is such a covariate (common
// practice: a covariate must not be affected by the treatments).
func TestCovariateResponds(t *testing.T) {
	t.Parallel()
	var str, dia *Data
	ds := readFiber(t, "") // strength and diameter both responses
	for _, x := range ds {
		switch x.TraitKey {
		case "strength":
			str = x
		case "diameter":
			dia = x
		}
	}
	// Adjust the diameter for a covariate that is the strength plus 10 per
	// machine level: clearly different between machines.
	cov := make([]float64, len(str.Values))
	for i, v := range str.Values {
		cov[i] = v + 10*float64(str.Treatment[i])
	}
	dia.Covariate, dia.CovariateKey = cov, "shifted"
	r, err := AnalyzeData(dia, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if !r.Covariate.Responds {
		t.Fatalf("covariate responding to treatment not flagged: %+v", r.Covariate)
	}
	if !strings.Contains(strings.Join(r.Warnings, " "), "Do not use this covariate") {
		t.Errorf("warnings %q", r.Warnings)
	}
	// A missing covariate value leaves its plot out, counted.
	cov[2] = math.NaN()
	r, err = AnalyzeData(dia, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if r.N != 14 || r.Covariate.Left != 1 {
		t.Errorf("N %d, left %d; want 14 and 1", r.N, r.Covariate.Left)
	}
}
