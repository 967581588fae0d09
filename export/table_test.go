package export

import (
	"errors"
	"testing"

	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

func fp(v float64) *float64 { return &v }

func TestYieldTrait(t *testing.T) {
	t.Parallel()
	adj := trial.Trait{Key: "gy", Derived: &trial.Derivation{Kind: trial.AdjustedYield}}
	for _, c := range []struct {
		traits []trial.Trait
		want   int
	}{
		{[]trial.Trait{{Key: "ht"}, {Key: "Yield"}, adj}, 2}, // derived adjusted yield first
		{[]trial.Trait{{Key: "ht"}, {Key: "y", Name: "yield"}}, 1},
		{[]trial.Trait{{Key: "ht"}, {Key: "YIELD"}}, 1},
		{[]trial.Trait{{Key: "ht"}, {Key: "yield_kg"}}, -1},
		{nil, -1},
	} {
		if got := YieldTrait(c.traits); got != c.want {
			t.Errorf("YieldTrait(%v) = %d, want %d", c.traits, got, c.want)
		}
	}
}

// TestSummaryPercentOfCheck: the summary carries each trait's percentages
// of the check from its result (computed and checked in trial/analysis).
func TestSummaryPercentOfCheck(t *testing.T) {
	t.Parallel()
	tr := &trial.Trial{
		Treatments: []trial.Treatment{
			{Code: "A", Role: trial.RoleCheck}, {Code: "B", Role: trial.RoleCheck}, {Code: "C"}, {Code: "D"},
		},
		Traits: []trial.Trait{{Key: "yield", Name: "Yield", Decimals: 1}, {Key: "ht", Name: "Height"}},
	}
	res := &analysis.Result{TraitKey: "yield", LSD: fp(0.7), HSD: nil,
		ANOVA: &stats.ANOVA{GrandMean: 4.25, CVPercent: 9.5, Sources: stats.Table{{Name: "treatment", Role: stats.RoleTreatment, HasTest: true, P: 0.012}, {Name: "error", Role: stats.RoleError}}},
		Means: []analysis.Mean{
			{Treatment: "A", BackMean: 3.5, LettersLSD: "b", LettersTukey: "a", PercentOfCheck: fp(87.5)},
			{Treatment: "B", BackMean: 4.5, LettersLSD: "ab", LettersTukey: "a", PercentOfCheck: fp(112.5)},
			{Treatment: "C", BackMean: 5.0, LettersLSD: "a", LettersTukey: "a", PercentOfCheck: fp(125)},
			{Treatment: "D", BackMean: 4.0, LettersLSD: "ab", LettersTukey: "a", PercentOfCheck: fp(100)},
		}, CheckMean: fp(4)}
	outs := []analysis.Outcome{{Key: "yield", Result: res}, {Key: "ht", Err: errors.New(NoValues)}}
	s := NewSummary(tr, outs, nil, meansep.LSD, 0.05)
	if !s.HasPercentOfCheck() || s.Traits[0].CheckMean == nil || *s.Traits[0].CheckMean != 4.0 || s.Traits[1].CheckMean != nil {
		t.Fatalf("check mean %v / %v", s.Traits[0].CheckMean, s.Traits[1].CheckMean)
	}
	for i, want := range []float64{87.5, 112.5, 125, 100} {
		if p := s.Rows[i].Cells[0].PercentOfCheck; p == nil || *p != want {
			t.Errorf("row %d %% of check = %v, want %v", i, p, want)
		}
	}
	if s.Rows[2].Cells[0].Letters != "a" || s.Rows[0].Cells[0].Letters != "b" {
		t.Error("LSD letters not taken")
	}
	if st := s.Traits[0]; st.MSD == nil || *st.MSD != 0.7 || !st.HasP || st.P != 0.012 || st.GrandMean != 4.25 {
		t.Errorf("trait statistics %+v", st)
	}
	if st := s.Traits[1]; st.Result != nil || st.Reason != NoValues || s.Rows[0].Cells[1].OK {
		t.Errorf("trait without values %+v", st)
	}
	// Tukey: HSD absent (unequal n) gives a nil MSD.
	if s := NewSummary(tr, outs, []string{"yield"}, meansep.Tukey, 0.05); s.Traits[0].MSD != nil || s.Rows[0].Cells[0].Letters != "a" {
		t.Error("Tukey summary")
	}
	if got := MSDLabel(meansep.Tukey, 0.01); got != "HSD (0.01)" {
		t.Errorf("MSDLabel = %q", got)
	}
}

// TestMSDText: a single LSD, or the range of the pairwise ones when plots
// are missing, so that the reader keeps a yardstick.
func TestMSDText(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		msd  *float64
		rng  *analysis.Range
		want string
	}{
		{fp(0.512), &analysis.Range{Min: 0.512, Max: 0.512}, "0.51"},
		{nil, &analysis.Range{Min: 0.4791, Max: 0.5533}, "0.48–0.55 (by pair)"},
		{nil, &analysis.Range{Min: 0.5, Max: 0.5001}, "0.50 (by pair)"},
		{nil, nil, "–"},
	} {
		if got := MSDText(c.msd, c.rng, 2); got != c.want {
			t.Errorf("MSDText(%v, %v) = %q, want %q", c.msd, c.rng, got, c.want)
		}
	}
}

// TestExclusionReason: the reasons of a plot's exclusions that apply to a
// trait, joined.
func TestExclusionReason(t *testing.T) {
	t.Parallel()
	p := trial.Plot{Exclusions: []trial.Exclusion{{Reason: "hail"}, {Trait: "ht", Reason: "lodged"}, {Trait: "yield"}}}
	if got := ExclusionReason(p, "ht"); got != "hail; lodged" {
		t.Errorf("ExclusionReason = %q", got)
	}
	if got := PlotExclusions(p); got != "hail; ht: lodged; yield: excluded" {
		t.Errorf("PlotExclusions = %q", got)
	}
}

// TestSourceName: ANOVA lines are labelled by their role, whatever the
// factor is called; other roles show their own name (common practice for
// the labels of an ANOVA table).
func TestSourceName(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		src  stats.Source
		want string
	}{
		{stats.Source{Name: "variety", Role: stats.RoleTreatment}, "Treatments"},
		{stats.Source{Name: "site", Role: stats.RoleBlock}, "Blocks"},
		{stats.Source{Name: "r", Role: stats.RoleRow}, "Rows"},
		{stats.Source{Name: "c", Role: stats.RoleColumn}, "Columns"},
		{stats.Source{Name: "error", Role: stats.RoleError}, "Error"},
		{stats.Source{Name: "total", Role: stats.RoleTotal}, "Total"},
		{stats.Source{Name: "nitrogen", Role: stats.RoleFactor}, "Nitrogen"},
		{stats.Source{}, "—"},
	} {
		if got := SourceName(c.src); got != c.want {
			t.Errorf("SourceName(%+v) = %q, want %q", c.src, got, c.want)
		}
	}
}
