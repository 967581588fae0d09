package export

import (
	"errors"
	"strings"
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

// TestSummaryPercentOfCheck checks the percentage of the check on a small
// worked case: check mean 4.0 (two checks 3.5 and 4.5, averaged, common
// practice), an entry at 5.0 is 125%.
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
			{Treatment: "A", BackMean: 3.5, LettersLSD: "b", LettersTukey: "a"},
			{Treatment: "B", BackMean: 4.5, LettersLSD: "ab", LettersTukey: "a"},
			{Treatment: "C", BackMean: 5.0, LettersLSD: "a", LettersTukey: "a"},
			{Treatment: "D", BackMean: 4.0, LettersLSD: "ab", LettersTukey: "a"},
		}}
	outs := []analysis.Outcome{{Key: "yield", Result: res}, {Key: "ht", Err: errors.New(NoValues)}}
	s := NewSummary(tr, outs, nil, meansep.LSD, 0.05)
	if !s.HasCheck || s.CheckMean != 4.0 || s.Yield != 0 {
		t.Fatalf("check mean %v (has %v), yield trait %d", s.CheckMean, s.HasCheck, s.Yield)
	}
	for i, want := range []float64{87.5, 112.5, 125, 100} {
		if p := s.Rows[i].PercentOfCheck; p == nil || *p != want {
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

func TestDiagnosticsWords(t *testing.T) {
	t.Parallel()
	r := &analysis.Result{Decimals: 1}
	r.Diagnostics.ShapiroW, r.Diagnostics.ShapiroP = fp(0.9517), fp(0.0187)
	r.Diagnostics.NonAdditivityF, r.Diagnostics.NonAdditivityP = fp(1.2), fp(0.28)
	r.Diagnostics.LeveneF, r.Diagnostics.LeveneP = fp(3.1), fp(0.0004)
	r.Diagnostics.Outliers = []analysis.Outlier{{Plot: 203, Treatment: "T4", Value: 12.34, StdResidual: 3.4}}
	got := strings.Join(Diagnostics(r), "\n")
	for _, want := range []string{
		"Shapiro–Wilk): W = 0.952, p = 0.019: the residuals depart",
		"Levene, median-centred): F = 3.100, p = <0.001: the spread differs",
		"p = 0.280: no evidence that treatment differences change",
		"Plot 203 (T4): value 12.3",
	} {
		if !strings.Contains(got, want) {
			t.Errorf("diagnostics lack %q:\n%s", want, got)
		}
	}
	if strings.Contains(got, "Bartlett") {
		t.Error("a test that was not run is described")
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
