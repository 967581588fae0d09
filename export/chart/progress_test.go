package chart

import (
	"bytes"
	"strings"
	"testing"
	"time"

	"furlong/trial"
	"furlong/trial/analysis"
)

// TestProgressChart draws a small series: one line per treatment with the
// untreated check named in the key, the time axis labelled, and an SVG
// that holds the treatment codes.
func TestProgressChart(t *testing.T) {
	t.Parallel()
	d := func(day int) time.Time { return time.Date(2026, 6, day, 0, 0, 0, 0, time.UTC) }
	tr := &trial.Trial{
		Title:      "Progress test",
		Design:     trial.Design{Kind: trial.CRD, Reps: 1},
		Treatments: []trial.Treatment{{Code: "U", Role: trial.RoleUntreated}, {Code: "P1"}, {Code: "P2"}},
		Plots: []trial.Plot{{Number: 1, Block: 1, Row: 1, Column: 1, Treatment: "U"}, {Number: 2, Block: 1, Row: 1, Column: 2, Treatment: "P1"},
			{Number: 3, Block: 1, Row: 1, Column: 3, Treatment: "P2"}},
		Traits: []trial.Trait{
			{Key: "s1", Unit: "%", Kind: trial.Percent, Assessed: d(1), Values: []float64{10, 2, 3}, Assessment: &trial.Assessment{Series: "sev"}},
			{Key: "s2", Unit: "%", Kind: trial.Percent, Assessed: d(8), Values: []float64{30, 5, trial.Missing}, Assessment: &trial.Assessment{Series: "sev"}},
		},
	}
	pr, err := analysis.ProgressOf(tr, "sev")
	if err != nil {
		t.Fatal(err)
	}
	p, err := Progress(tr, pr)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(p.X.Label.Text, "days after the first assessment") || !strings.Contains(p.Y.Label.Text, "%") {
		t.Errorf("axes %q, %q", p.X.Label.Text, p.Y.Label.Text)
	}
	var buf bytes.Buffer
	if err := Save(p, &buf, "svg", 400, 300); err != nil {
		t.Fatal(err)
	}
	for _, s := range []string{"U (untreated)", "P1", "P2"} {
		if !strings.Contains(buf.String(), s) {
			t.Errorf("the chart's key lacks %q", s)
		}
	}
	if _, err := Progress(tr, nil); err == nil {
		t.Error("no progress, no error")
	}
}
