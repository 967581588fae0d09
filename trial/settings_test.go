package trial

import "testing"

// TestSettingsValidation: the analysis settings are checked by Validate.
// The arcsine square root is for percentages (Gomez & Gomez 1984,
// Statistical Procedures for Agricultural Research, 7.2.2.3).
func TestSettingsValidation(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name   string
		edit   func(*Trial)
		field  string
		substr string
	}{
		{"unknown method", func(tr *Trial) { tr.Analysis.Method = "scheffe" }, "Analysis.Method", `"scheffe" is not known; use lsd or tukey`},
		{"unknown transform", func(tr *Trial) { tr.Traits[2].Transform = "cube" }, "Traits[2].Transform", `"cube" is not known`},
		{"arcsine of a length", func(tr *Trial) { tr.Traits[2].Transform = TransformArcsine }, "Traits[2].Transform", "for percentages"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			tr := sampleTrial(t)
			c.edit(tr)
			wantProblem(t, tr.Validate(), c.field, c.substr)
		})
	}
	tr := sampleTrial(t)
	tr.Analysis.Method = MethodTukey
	tr.Traits[1].Transform = TransformArcsine // moisture is a percent trait
	tr.Traits[2].Transform = TransformLog
	if err := tr.Validate(); err != nil {
		t.Errorf("valid settings refused: %v", err)
	}
	if tr.MeanSeparation() != MethodTukey || (&Trial{}).MeanSeparation() != MethodLSD {
		t.Error("MeanSeparation does not default to lsd")
	}
}

// TestShowsPercentOfCheck: by default only the trial's yield is shown as a
// percentage of the check (common practice in variety trial reports); the
// user's choice per trait overrides that.
func TestShowsPercentOfCheck(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t) // wt, mst, ht, yld (derived adjusted yield)
	want := map[string]bool{"wt": false, "mst": false, "ht": false, "yld": true, "nope": false}
	for k, w := range want {
		if got := tr.ShowsPercentOfCheck(k); got != w {
			t.Errorf("default %s: %v, want %v", k, got, w)
		}
	}
	yes, no := true, false
	tr.Traits[2].PercentOfCheck = &yes
	tr.Traits[3].PercentOfCheck = &no
	if !tr.ShowsPercentOfCheck("ht") || tr.ShowsPercentOfCheck("yld") {
		t.Error("the trait's own choice is not honoured")
	}
	// Without a derived yield, a trait keyed or named yield is the yield.
	traits := []Trait{{Key: "ht"}, {Key: "gy", Name: " Yield "}, {Key: "yield"}}
	if got := YieldTrait(traits); got != 1 {
		t.Errorf("YieldTrait = %d, want 1", got)
	}
	if got := YieldTrait(traits[:1]); got != -1 {
		t.Errorf("YieldTrait without yield = %d", got)
	}
}
