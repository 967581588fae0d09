package trial

import (
	"math"
	"testing"
	"time"
)

// The trapezoidal rule of Shaner & Finney (1977, Phytopathology 67,
// 1051–1056): AUDPC = Σ (y_i + y_{i+1})/2 · (t_{i+1} − t_i). Worked by hand.
func TestAreaUnderCurveHandWorked(t *testing.T) {
	t.Parallel()
	cases := []struct {
		times, values []float64
		want          float64
	}{
		// (2+6)/2·7 = 28; (6+15)/2·7 = 73.5; (15+30)/2·14 = 315; sum 416.5
		{[]float64{0, 7, 14, 28}, []float64{2, 6, 15, 30}, 416.5},
		// one interval: (10+20)/2·10 = 150
		{[]float64{5, 15}, []float64{10, 20}, 150},
		// flat at 4 over 21 days: 84
		{[]float64{0, 10, 21}, []float64{4, 4, 4}, 84},
	}
	for _, c := range cases {
		got, err := AreaUnderCurve(c.times, c.values)
		if err != nil || math.Abs(got-c.want) > 1e-12 {
			t.Errorf("AreaUnderCurve(%v, %v) = %g, %v; want %g", c.times, c.values, got, err, c.want)
		}
	}
	if v, err := AreaUnderCurve([]float64{0, 7}, []float64{1, Missing}); err != nil || !IsMissing(v) {
		t.Errorf("a missing assessment: %g, %v; want missing", v, err)
	}
	for _, bad := range [][]float64{{0}, {0, 0}, {7, 3}} {
		if _, err := AreaUnderCurve(bad, make([]float64, len(bad))); err == nil {
			t.Errorf("times %v: want an error", bad)
		}
	}
}

// A series of three dated assessments on two plots; AUDPC and the
// standardised AUDPC computed through the trial, worked by hand.
func TestAUDPCTraitHandWorked(t *testing.T) {
	t.Parallel()
	d := func(day int) time.Time { return time.Date(2026, 6, day, 0, 0, 0, 0, time.UTC) }
	tr := &Trial{
		Design:     Design{Kind: CRD, Reps: 1},
		Treatments: []Treatment{{Code: "A", Role: RoleUntreated}, {Code: "B"}},
		Plots:      []Plot{{Number: 1, Block: 1, Row: 1, Column: 1, Treatment: "A"}, {Number: 2, Block: 1, Row: 1, Column: 2, Treatment: "B"}},
		Traits: []Trait{
			// listed out of time order on purpose: the series is sorted by date
			{Key: "sev_2", Kind: Percent, Assessed: d(11), Values: []float64{20, 6}, Assessment: &Assessment{Series: "sev"}},
			{Key: "sev_1", Kind: Percent, Assessed: d(1), Values: []float64{10, 2}, Assessment: &Assessment{Series: "sev"}},
			{Key: "sev_3", Kind: Percent, Assessed: d(25), Values: []float64{40, Missing}, Assessment: &Assessment{Series: "sev"}},
			AUDPCTrait("audpc", "sev", "%", false),
			AUDPCTrait("saudpc", "sev", "%", true),
		},
	}
	// plot 1: (10+20)/2·10 = 150; (20+40)/2·14 = 420; AUDPC 570; over 24 days: 23.75
	// plot 2: its last assessment is missing, so its AUDPC is missing
	got, err := tr.TraitValues("audpc")
	if err != nil || got[0] != 570 || !IsMissing(got[1]) {
		t.Fatalf("AUDPC = %v, %v; want [570 missing]", got, err)
	}
	got, err = tr.TraitValues("saudpc")
	if err != nil || got[0] != 23.75 {
		t.Fatalf("standardised AUDPC = %v, %v; want 23.75", got, err)
	}
	if u := tr.Untreated(); u != "A" {
		t.Errorf("Untreated() = %q", u)
	}
	// Day counts instead of dates: 0, 10, 24 DAT give the same area.
	for i, days := range []int{10, 0, 24} {
		tr.Traits[i].Assessed = time.Time{}
		tr.Traits[i].Assessment.Days, tr.Traits[i].Assessment.From = days, DaysAfterTreatment
	}
	if got, err = tr.TraitValues("audpc"); err != nil || got[0] != 570 {
		t.Fatalf("AUDPC from day counts = %v, %v; want 570", got, err)
	}
	// Two assessments at the same time cannot make a curve.
	tr.Traits[1].Assessment.Days = 10
	if _, err = tr.TraitValues("audpc"); err == nil {
		t.Error("two assessments at 10 DAT: want an error")
	}
}
