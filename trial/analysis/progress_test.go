package analysis

import (
	"math"
	"testing"
	"time"

	"furlong/trial"
)

// progressTrial is a small invented assessment series: untreated U and a
// programme P in two blocks, scored on three dates (listed out of order),
// with one plot excluded from the second score and one score missing.
func progressTrial() *trial.Trial {
	d := func(day int) time.Time { return time.Date(2026, 6, day, 0, 0, 0, 0, time.UTC) }
	plots := []trial.Plot{
		{Number: 101, Block: 1, Row: 1, Column: 1, Treatment: "U"}, {Number: 102, Block: 1, Row: 1, Column: 2, Treatment: "P"},
		{Number: 201, Block: 2, Row: 2, Column: 1, Treatment: "P"}, {Number: 202, Block: 2, Row: 2, Column: 2, Treatment: "U"},
	}
	plots[2].Exclusions = []trial.Exclusion{{Trait: "sev_2", Reason: "sprayer fault"}}
	return &trial.Trial{
		Design:     trial.Design{Kind: trial.RCBD, Reps: 2},
		Treatments: []trial.Treatment{{Code: "U", Name: "untreated", Role: trial.RoleUntreated}, {Code: "P", Name: "Programme A"}},
		Plots:      plots,
		Traits: []trial.Trait{
			{Key: "sev_2", Unit: "%", Kind: trial.Percent, Assessed: d(15), Values: []float64{20, 6, 99, 30}, Assessment: &trial.Assessment{Series: "sev"}},
			{Key: "sev_1", Unit: "%", Kind: trial.Percent, Assessed: d(1), Values: []float64{10, 2, 4, 12}, Assessment: &trial.Assessment{Series: "sev"}},
			{Key: "sev_3", Unit: "%", Kind: trial.Percent, Assessed: d(29), Values: []float64{40, trial.Missing, 10, 50}, Assessment: &trial.Assessment{Series: "sev"}},
		},
	}
}

// TestProgressHandWorked: each treatment's mean at each date, worked by
// hand (arithmetic means of the plots assessed, the excluded plot left
// out), at 0, 14 and 28 days after the first assessment.
func TestProgressHandWorked(t *testing.T) {
	t.Parallel()
	pr, err := ProgressOf(progressTrial(), "sev")
	if err != nil {
		t.Fatal(err)
	}
	if len(pr.Points) != 3 || pr.Points[0].Time != 0 || pr.Points[1].Time != 14 || pr.Points[2].Time != 28 || pr.Axis != "days after the first assessment" {
		t.Fatalf("points %+v, axis %q", pr.Points, pr.Axis)
	}
	want := map[string][]float64{
		"U": {(10 + 12) / 2.0, (20 + 30) / 2.0, (40 + 50) / 2.0}, // 11, 25, 45
		"P": {(2 + 4) / 2.0, 6, 10},                              // 3; 6 (plot 201 excluded); 10 (plot 102 missing)
	}
	for _, row := range pr.Rows {
		for j, w := range want[row.Treatment] {
			if math.Abs(row.Means[j]-w) > 1e-12 {
				t.Errorf("%s at %v days: %v, want %v", row.Treatment, pr.Points[j].Time, row.Means[j], w)
			}
		}
	}
	if pr.Rows[1].N[1] != 1 || pr.Untreated != "U" || pr.Unit != "%" {
		t.Errorf("n %v, untreated %q, unit %q", pr.Rows[1].N, pr.Untreated, pr.Unit)
	}
	if _, err := ProgressOf(progressTrial(), "nope"); err == nil {
		t.Error("an unknown series gives no error")
	}
}
