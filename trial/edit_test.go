package trial

import (
	"errors"
	"strings"
	"testing"
)

func TestNewDefaults(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if tr.Layout != DefaultLayout() {
		t.Errorf("Layout = %+v, want DefaultLayout()", tr.Layout)
	}
	if len(tr.Plots) != 12 || tr.Random.Seed != 42 || !tr.Randomized() {
		t.Errorf("%d plots, random %+v", len(tr.Plots), tr.Random)
	}
	if tr.Traits[3].Values != nil {
		t.Error("derived trait got values")
	}
	if err := tr.CheckRandomization(); err != nil {
		t.Error(err)
	}
	if _, err := New(NewOptions{Treatments: lettered(1), Design: Design{Kind: RCBD, Reps: 2}}); err == nil {
		t.Error("New with one treatment: no error")
	}
}

func TestIndexHelpers(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if tr.TraitIndex("ht") != 2 || tr.TraitIndex("nope") != -1 {
		t.Error("TraitIndex")
	}
	if tr.TreatmentIndex("MZ-102") != 2 || tr.TreatmentIndex("mz-102") != -1 {
		t.Error("TreatmentIndex")
	}
	for i, p := range tr.Plots {
		if got := tr.PlotIndexByNumber(p.Number); got != i {
			t.Errorf("PlotIndexByNumber(%d) = %d, want %d", p.Number, got, i)
		}
	}
	if tr.PlotIndexByNumber(999) != -1 {
		t.Error("PlotIndexByNumber(999) found a plot")
	}
	if p := tr.Treatment("MZ-101"); p == nil || p.Name != "Meadowgate 101" || tr.Treatment("none") != nil {
		t.Errorf("Treatment(MZ-101) = %+v", p)
	}
	if p := tr.Trait("ht"); p == nil || p.Unit != "cm" || tr.Trait("none") != nil {
		t.Errorf("Trait(ht) = %+v", p)
	}
	if c := tr.Checks(); len(c) != 1 || c[0].Code != "CHK" {
		t.Errorf("Checks = %+v", c)
	}
}

func TestPlotIndexLargeAndStale(t *testing.T) {
	t.Parallel()
	tr, err := New(NewOptions{Treatments: treatments(40), Design: Design{Kind: RCBD, Reps: 5}, Seed: 3})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range tr.Plots {
		if got := tr.PlotIndexByNumber(p.Number); got != i {
			t.Fatalf("PlotIndexByNumber(%d) = %d, want %d", p.Number, got, i)
		}
	}
	// Renumber in place: the cached map is stale but answers stay right.
	old := tr.Plots[7].Number
	tr.Plots[7].Number = 9999
	if got := tr.PlotIndexByNumber(9999); got != 7 {
		t.Errorf("after renumbering, PlotIndexByNumber(9999) = %d, want 7", got)
	}
	if got := tr.PlotIndexByNumber(old); got != -1 {
		t.Errorf("after renumbering, PlotIndexByNumber(%d) = %d, want -1", old, got)
	}
	// A clone has its own plots.
	c := tr.Clone()
	c.Plots[0].Number = 1
	if tr.PlotIndexByNumber(1) != -1 || c.PlotIndexByNumber(1) != 0 {
		t.Error("clone shares plot numbers")
	}
}

func TestSetValueAndData(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if tr.HasData() {
		t.Fatal("new trial has data")
	}
	if err := tr.SetValue(0, "ht", 250); err != nil {
		t.Fatal(err)
	}
	if !tr.HasData() {
		t.Error("HasData false after SetValue")
	}
	v, _ := tr.TraitValues("ht")
	v[0] = 1 // a copy
	if tr.Traits[2].Values[0] != 250 {
		t.Error("TraitValues returned the stored slice")
	}
	for _, c := range []struct {
		idx int
		key string
		v   float64
		msg string
	}{
		{0, "mst", 101, "is a percentage, so 101 is not possible"},
		{0, "yld", 10, "is computed from other traits, so it cannot be entered"},
		{0, "lodge", 1, `the trial has no trait "lodge"`},
		{12, "ht", 100, "there is no plot 13 in walking order; the trial has 12 plots"},
	} {
		err := tr.SetValue(c.idx, c.key, c.v)
		if err == nil || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("SetValue(%d, %q, %g) = %v, want %q", c.idx, c.key, c.v, err, c.msg)
		}
	}
	if tr.Traits[2].Values[0] != 250 {
		t.Error("refused value was stored")
	}
	// A value outside the valid range is data: kept, and flagged by
	// RangeNote (the field book import treats it the same way).
	if err := tr.SetValue(0, "ht", 401); err != nil {
		t.Errorf("out-of-range value refused: %v", err)
	}
	if got, want := tr.Traits[2].RangeNote(401), "Plant height 401 is outside its valid range 20 to 400; check it"; got != want {
		t.Errorf("RangeNote = %q, want %q", got, want)
	}
	if tr.Traits[2].RangeNote(250) != "" || tr.Traits[2].RangeNote(Missing) != "" {
		t.Error("RangeNote flags a value in range or a missing value")
	}
	if err := tr.SetValue(0, "ht", Missing); err != nil || tr.HasData() {
		t.Errorf("clearing: %v, HasData %v", err, tr.HasData())
	}
}

func TestExclusions(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if err := tr.Exclude(2, "ht", "hail"); err != nil {
		t.Fatal(err)
	}
	if ex, why := tr.Excluded(2, "ht"); !ex || why != "hail" {
		t.Errorf("Excluded(2, ht) = %v, %q", ex, why)
	}
	if ex, _ := tr.Excluded(2, "wt"); ex {
		t.Error("exclusion for ht leaks to wt")
	}
	// Excluding the weight leaves the derived yield out too.
	if err := tr.Exclude(4, "wt", "combine spill"); err != nil {
		t.Fatal(err)
	}
	if ex, why := tr.Excluded(4, "yld"); !ex || why != "combine spill" {
		t.Errorf("Excluded(4, yld) = %v, %q", ex, why)
	}
	// All traits.
	if err := tr.Exclude(5, "", "flooding"); err != nil {
		t.Fatal(err)
	}
	for _, k := range []string{"wt", "mst", "ht", "yld"} {
		if ex, _ := tr.Excluded(5, k); !ex {
			t.Errorf("plot 6 not excluded from %s", k)
		}
	}
	// Re-excluding replaces the reason.
	_ = tr.Exclude(2, "ht", "hail damage")
	if len(tr.Plots[2].Exclusions) != 1 || tr.Plots[2].Exclusions[0].Reason != "hail damage" {
		t.Errorf("exclusions %+v", tr.Plots[2].Exclusions)
	}
	if err := tr.Exclude(2, "lodge", "x"); err == nil {
		t.Error("exclusion for an unknown trait accepted")
	}
	s := tr.Summary()
	if s.ExcludedPlots != 3 || s.Exclusions != 3 {
		t.Errorf("summary exclusions %d plots, %d in all", s.ExcludedPlots, s.Exclusions)
	}
	if err := tr.Include(2, "ht"); err != nil {
		t.Fatal(err)
	}
	if ex, _ := tr.Excluded(2, "ht"); ex {
		t.Error("Include did not take back the exclusion")
	}
	_ = tr.Include(5, "")
	if ex, _ := tr.Excluded(5, "ht"); ex {
		t.Error("Include(5, \"\") left an exclusion")
	}
	if err := tr.SetNote(0, "weedy corner"); err != nil || tr.Plots[0].Note != "weedy corner" {
		t.Errorf("SetNote: %v", err)
	}
	if err := tr.SetNote(-1, "x"); err == nil {
		t.Error("SetNote(-1) accepted")
	}
}

func TestSummary(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	s := tr.Summary()
	if s.Plots != 12 || s.Treatments != 4 || s.Checks != 1 || s.Blocks != 3 || s.RecordedTraits != 3 || s.DerivedTraits != 1 {
		t.Errorf("summary %+v", s)
	}
	if s.Cells != 36 || s.Entered != 0 || s.PercentEntered != 0 {
		t.Errorf("empty trial entered %d of %d, %g %%", s.Entered, s.Cells, s.PercentEntered)
	}
	for i := range 9 {
		_ = tr.SetValue(i, "ht", 200)
	}
	_ = tr.SetValue(0, "wt", 10)
	_ = tr.SetValue(0, "mst", 20)
	s = tr.Summary()
	// 11 of 36 values: 30.555... %.
	if s.Entered != 11 || s.PercentEntered != 100*11.0/36 {
		t.Errorf("entered %d, %g %%", s.Entered, s.PercentEntered)
	}
	if s.Traits[3].Key != "yld" || s.Traits[3].Entered != 1 || s.Traits[3].Missing != 11 {
		t.Errorf("yield summary %+v", s.Traits[3])
	}
	if (&Trial{}).Summary().PercentEntered != 0 {
		t.Error("empty trial percentage not 0")
	}
}

func TestCloneAndClearData(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	_ = tr.SetValue(0, "ht", 200)
	_ = tr.Exclude(0, "ht", "hail")
	c := tr.Clone()
	c.Traits[2].Values[0] = 300
	*c.Traits[2].Min = 0
	c.Traits[3].Derived.StandardMoisture = 0
	c.Plots[0].Exclusions[0].Reason = "other"
	c.Treatments[0].Name = "changed"
	if tr.Traits[2].Values[0] != 200 || *tr.Traits[2].Min != 20 || tr.Traits[3].Derived.StandardMoisture != 15.5 ||
		tr.Plots[0].Exclusions[0].Reason != "hail" || tr.Treatments[0].Name != "Farm check" {
		t.Error("Clone shares memory with the original")
	}
	if err := c.Randomize(7); !errors.Is(err, ErrHasData) {
		t.Errorf("randomising a clone with data: %v", err)
	}
	c.ClearData()
	if c.HasData() || len(c.Plots[0].Exclusions) != 0 {
		t.Error("ClearData left data")
	}
	if err := c.Randomize(7); err != nil {
		t.Errorf("randomising a cleared clone: %v", err)
	}
}

func TestEditTreatments(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if err := tr.AddTreatment(Treatment{Code: "MZ-104"}); err != nil {
		t.Fatal(err)
	}
	if len(tr.Plots) != 15 || tr.Randomized() || len(tr.Traits[0].Values) != 15 {
		t.Errorf("after adding: %d plots, randomised %v, %d values", len(tr.Plots), tr.Randomized(), len(tr.Traits[0].Values))
	}
	// Laid out again in standard order: block 1 holds the list in order.
	for i, want := range []string{"CHK", "MZ-101", "MZ-102", "MZ-103", "MZ-104"} {
		if tr.Plots[i].Treatment != want {
			t.Errorf("plot %d: %s, want %s", i+1, tr.Plots[i].Treatment, want)
		}
	}
	if err := tr.AddTreatment(Treatment{Code: "mz-104"}); err == nil {
		t.Error("duplicate code accepted")
	}
	if err := tr.AddTreatment(Treatment{Code: "MZ 105"}); err == nil {
		t.Error("code with a space accepted")
	}
	if err := tr.MoveTreatment("MZ-104", 0); err != nil {
		t.Fatal(err)
	}
	if tr.Treatments[0].Code != "MZ-104" || tr.Treatments[1].Code != "CHK" || tr.Plots[0].Treatment != "MZ-104" {
		t.Errorf("after moving: %v", tr.Treatments)
	}
	if err := tr.MoveTreatment("MZ-104", 5); err == nil {
		t.Error("move past the end accepted")
	}
	if err := tr.RemoveTreatment("MZ-101"); err != nil {
		t.Fatal(err)
	}
	if len(tr.Treatments) != 4 || len(tr.Plots) != 12 || tr.TreatmentIndex("MZ-101") != -1 {
		t.Errorf("after removing: %d treatments, %d plots", len(tr.Treatments), len(tr.Plots))
	}
	if err := tr.Randomize(9); err != nil {
		t.Fatal(err)
	}
	// Describing and renaming do not move plots and are allowed with data.
	_ = tr.SetValue(0, "ht", 180)
	code0 := tr.Plots[0].Treatment
	if err := tr.UpdateTreatment(code0, Treatment{Code: "NEW", Name: "Renamed"}); err != nil {
		t.Fatal(err)
	}
	if tr.Plots[0].Treatment != "NEW" || tr.TreatmentIndex(code0) != -1 {
		t.Error("rename not carried to the plots")
	}
	if err := tr.Validate(); err != nil {
		t.Errorf("after rename: %v", err)
	}
	for _, err := range []error{
		tr.AddTreatment(Treatment{Code: "X"}),
		tr.RemoveTreatment("NEW"),
		tr.MoveTreatment("NEW", 3),
		tr.SetDesign(Design{Kind: RCBD, Reps: 4}),
	} {
		if !errors.Is(err, ErrHasData) || !strings.Contains(err.Error(), "changing its treatments, design or field arrangement would move treatments away from their values") {
			t.Errorf("edit with data = %v, want ErrHasData", err)
		}
	}
}

func TestEditLatinGrows(t *testing.T) {
	t.Parallel()
	tr, err := New(NewOptions{Treatments: lettered(4), Design: Design{Kind: Latin}, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if err := tr.AddTreatment(Treatment{Code: "E"}); err != nil {
		t.Fatal(err)
	}
	if tr.Design.Reps != 5 || len(tr.Plots) != 25 {
		t.Errorf("Latin square after adding: reps %d, %d plots", tr.Design.Reps, len(tr.Plots))
	}
	if err := tr.Randomize(2); err != nil {
		t.Fatal(err)
	}
	if err := tr.Validate(); err != nil {
		t.Error(err)
	}
}

func TestSetDesignAndLayout(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if err := tr.SetDesign(Design{Kind: RCBD, Reps: 1}); err == nil {
		t.Error("1 replicate accepted")
	}
	if err := tr.SetDesign(Design{Kind: RCBD, Reps: 4}); err != nil {
		t.Fatal(err)
	}
	if len(tr.Plots) != 16 || tr.Randomized() {
		t.Errorf("%d plots, randomised %v", len(tr.Plots), tr.Randomized())
	}
	_ = tr.Randomize(1)
	_ = tr.SetValue(0, "ht", 100)
	// Geometry may change with data; arrangement may not.
	l := tr.Layout
	l.HarvestLength = 9
	if err := tr.SetLayout(l); err != nil || tr.Layout.HarvestLength != 9 || !tr.Randomized() {
		t.Errorf("geometry change: %v", err)
	}
	l.Walk = WalkStraight
	if err := tr.SetLayout(l); !errors.Is(err, ErrHasData) {
		t.Errorf("arrangement change with data = %v", err)
	}
	l.PlotLength = -1
	if err := tr.SetLayout(l); err == nil {
		t.Error("negative plot length accepted")
	}
}

func TestEditTraits(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if err := tr.AddTrait(Trait{Key: "lodge", Kind: Score, Min: fptr(1), Max: fptr(9)}); err != nil {
		t.Fatal(err)
	}
	j := tr.TraitIndex("lodge")
	if j != 4 || len(tr.Traits[j].Values) != 12 || !IsMissing(tr.Traits[j].Values[0]) {
		t.Errorf("new trait %+v", tr.Traits[j])
	}
	for _, bad := range []Trait{
		{Key: "LODGE"},
		{Key: "plant vigour"},
		{Key: "vig", Decimals: 9},
		{Key: "vig", Values: []float64{1, 2}},
		AdjustedYieldTrait("yld2", "wt", "nothing", "maize", UnitTHa),
	} {
		if err := tr.AddTrait(bad); err == nil {
			t.Errorf("AddTrait(%+v) accepted", bad)
		}
	}
	if len(tr.Traits) != 5 {
		t.Errorf("refused traits were kept: %d traits", len(tr.Traits))
	}
	_ = tr.Exclude(0, "lodge", "x")
	if err := tr.RemoveTrait("lodge"); err != nil {
		t.Fatal(err)
	}
	if tr.TraitIndex("lodge") != -1 || len(tr.Plots[0].Exclusions) != 0 {
		t.Error("trait or its exclusion left behind")
	}
	if err := tr.RemoveTrait("wt"); err == nil || !strings.Contains(err.Error(), `used to compute trait "yld"`) {
		t.Errorf("removing a yield input: %v", err)
	}
	if err := tr.Validate(); err != nil {
		t.Error(err)
	}
}

func TestPlotIndexConcurrent(t *testing.T) {
	t.Parallel()
	tr, err := New(NewOptions{Treatments: treatments(30), Design: Design{Kind: RCBD, Reps: 4}, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	c := tr.Clone()
	done := make(chan error, 4)
	for g := range 4 {
		go func() {
			x := tr
			if g%2 == 1 {
				x = c
			}
			for i, p := range x.Plots {
				if got := x.PlotIndexByNumber(p.Number); got != i {
					done <- errors.New("wrong index")
					return
				}
			}
			done <- nil
		}()
	}
	for range 4 {
		if err := <-done; err != nil {
			t.Error(err)
		}
	}
}

func TestUpdateTrait(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if err := tr.SetValue(0, "ht", 250); err != nil {
		t.Fatal(err)
	}
	if err := tr.Exclude(1, "ht", "hail"); err != nil {
		t.Fatal(err)
	}
	nt := *tr.Trait("ht")
	nt.Key, nt.Name, nt.Unit, nt.Decimals = "height", "Height at harvest", "cm", 1
	if err := tr.UpdateTrait("ht", nt); err != nil {
		t.Fatal(err)
	}
	got := tr.Trait("height")
	if got == nil || got.Name != "Height at harvest" || got.Values[0] != 250 {
		t.Fatalf("after the update: %+v", got)
	}
	if ex, _ := tr.Excluded(1, "height"); !ex {
		t.Error("the exclusion did not follow the new key")
	}
	// A kind that makes a stored value impossible is refused, nothing changes.
	if err := tr.SetValue(2, "height", 12.5); err != nil {
		t.Fatal(err)
	}
	bad := *tr.Trait("height")
	bad.Kind, bad.Min, bad.Max = Count, nil, nil
	if err := tr.UpdateTrait("height", bad); err == nil || !strings.Contains(err.Error(), "is a count, so 12.5 is not possible") {
		t.Errorf("count with 12.5 stored: %v", err)
	}
	if tr.Trait("height").Kind == Count {
		t.Error("a refused update changed the trial")
	}
	// A key used by another trait is refused.
	dup := *tr.Trait("height")
	dup.Key = tr.Traits[0].Key
	if err := tr.UpdateTrait("height", dup); err == nil {
		t.Error("duplicate key accepted")
	}
}
