package ui

import (
	"testing"
)

// The suggested next step follows the trial's state (the rule documented
// on suggestedStep): Record while fewer than 95 % of the values are in,
// Compare from there, Report once the user compares.
func TestSuggestedStep(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	u.OpenTrial(tr, "")
	if got := u.suggestedStep(); got != stepRecord {
		t.Fatalf("empty randomised trial: suggested %d, want Record", got)
	}
	// 12 plots × 2 traits = 24 values; 22 entered is 91.7 % (< 95 %), 23
	// is 95.8 % (arithmetic).
	n := 0
	for j := range tr.Traits {
		for i := range tr.Plots {
			if n < 22 {
				tr.Traits[j].Values[i] = float64(3 + i%4)
			}
			n++
		}
	}
	if got := u.suggestedStep(); got != stepRecord {
		t.Fatalf("22 of 24 values: suggested %d, want Record", got)
	}
	tr.Traits[1].Values[10] = 5
	if got := u.suggestedStep(); got != stepCompare {
		t.Fatalf("23 of 24 values: suggested %d, want Compare", got)
	}
	u.showStep(stepCompare)
	if got := u.suggestedStep(); got != stepReport {
		t.Fatalf("on Compare: suggested %d, want Report", got)
	}
	if !u.nav.items[stepReport].next || u.nav.items[stepCompare].next {
		t.Error("the navigator does not highlight Report while comparing")
	}
	tr.Title = " "
	if got := u.suggestedStep(); got != stepSetup {
		t.Fatalf("untitled trial: suggested %d, want Setup", got)
	}
}
