package trial

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"
	"time"
)

// The merge rules checked here are those of a three-way merge as version
// control systems do it (common practice): a change on one side is taken,
// the same change on both sides is taken once, different changes to the
// same cell are a conflict.

func mergeBase(t *testing.T) *Trial {
	t.Helper()
	tr := sampleTrial(t)
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 10 + float64(i)
		if i%3 == 0 {
			tr.Traits[1].Values[i] = 14
		}
	}
	tr.Plots[2].Note = "rabbit damage"
	tr.Plots[4].Exclusions = []Exclusion{{Trait: "wt", Reason: "hail"}}
	return tr
}

func mustMerge(t *testing.T, b, m, th *Trial) (*Trial, []Conflict) {
	t.Helper()
	out, cs, err := MergeValues(b, m, th)
	if err != nil {
		t.Fatal(err)
	}
	return out, cs
}

func TestMergeValuesCells(t *testing.T) {
	t.Parallel()
	base := mergeBase(t)
	mine, theirs := base.Clone(), base.Clone()
	// No change at all: no conflict, the same values.
	out, cs := mustMerge(t, base, mine, theirs)
	if len(cs) != 0 || !same3(out.Traits[0].Values, base.Traits[0].Values) {
		t.Fatalf("merge of unchanged copies: %d conflicts", len(cs))
	}
	mine.Traits[0].Values[0] = 50        // one-sided, mine
	theirs.Traits[0].Values[1] = 51      // one-sided, theirs
	mine.Traits[0].Values[2] = 52        // same edit on both sides
	theirs.Traits[0].Values[2] = 52      //
	mine.Traits[0].Values[3] = 53        // real conflict
	theirs.Traits[0].Values[3] = 63      //
	theirs.Traits[0].Values[5] = Missing // deletion on disk
	mine.Traits[0].Values[6] = Missing   // deletion here, edit on disk: conflict
	theirs.Traits[0].Values[6] = 66      //
	theirs.Traits[2].Values[7] = 180     // new value where base had none
	mine.Traits[1].Values[0] = Missing   // deletion on both sides
	theirs.Traits[1].Values[0] = Missing //
	out, cs = mustMerge(t, base, mine, theirs)
	wt := out.Traits[0].Values
	want := map[int]float64{0: 50, 1: 51, 2: 52, 3: 53, 5: Missing, 6: Missing, 4: 14}
	for i, w := range want {
		if !sameValue(wt[i], w) {
			t.Errorf("wt of plot index %d: %v, want %v", i, wt[i], w)
		}
	}
	if out.Traits[2].Values[7] != 180 || !IsMissing(out.Traits[1].Values[0]) {
		t.Errorf("ht[7] %v, mst[0] %v", out.Traits[2].Values[7], out.Traits[1].Values[0])
	}
	if len(cs) != 2 {
		t.Fatalf("%d conflicts, want 2: %v", len(cs), cs)
	}
	c := cs[0]
	if c.Kind != ConflictValue || c.Plot != base.Plots[3].Number || c.Trait != "wt" || c.Base != 13 || c.Mine != 53 || c.Theirs != 63 {
		t.Errorf("first conflict %+v", c)
	}
	if !strings.Contains(c.String(), "yours 53, on disk 63") {
		t.Errorf("conflict text %q", c.String())
	}
	if !IsMissing(cs[1].Mine) || cs[1].Theirs != 66 || !strings.Contains(cs[1].String(), "yours no value") {
		t.Errorf("second conflict %+v", cs[1])
	}
	// Resolve: theirs for the first, mine for the second.
	if err := ApplyResolution(out, cs[0], false); err != nil {
		t.Fatal(err)
	}
	if err := ApplyResolution(out, cs[1], true); err != nil {
		t.Fatal(err)
	}
	if out.Traits[0].Values[3] != 63 || !IsMissing(out.Traits[0].Values[6]) {
		t.Errorf("after resolving: %v %v", out.Traits[0].Values[3], out.Traits[0].Values[6])
	}
	// The inputs are untouched.
	if base.Traits[0].Values[0] != 10 || mine.Traits[0].Values[1] != 11 || theirs.Traits[0].Values[0] != 10 {
		t.Error("MergeValues changed an input")
	}
	out.Treatments[0].Name = "changed"
	if theirs.Treatments[0].Name == "changed" || mine.Treatments[0].Name == "changed" {
		t.Error("the merged trial shares memory with an input")
	}
}

// TestMergeValuesRandom checks many random edit sets against the rule
// stated per cell (who edited it), computed independently of the values.
func TestMergeValuesRandom(t *testing.T) {
	t.Parallel()
	base := mergeBase(t)
	rng := rand.New(rand.NewPCG(3, 5))
	for round := range 200 {
		mine, theirs := base.Clone(), base.Clone()
		type cell struct{ j, i int }
		mineEd, theirsEd := map[cell]float64{}, map[cell]float64{}
		for _, side := range []struct {
			t  *Trial
			ed map[cell]float64
		}{{mine, mineEd}, {theirs, theirsEd}} {
			for range rng.IntN(8) {
				c := cell{rng.IntN(3), rng.IntN(len(base.Plots))}
				v := float64(rng.IntN(4)) // few values, so both sides often agree
				if rng.IntN(5) == 0 {
					v = Missing
				}
				if sameValue(v, base.Traits[c.j].Values[c.i]) {
					continue // not an edit
				}
				side.ed[c] = v
				side.t.Traits[c.j].Values[c.i] = v
			}
		}
		out, cs := mustMerge(t, base, mine, theirs)
		conflicts := 0
		for j := range 3 {
			for i := range base.Plots {
				c := cell{j, i}
				mv, mOK := mineEd[c]
				tv, tOK := theirsEd[c]
				want := base.Traits[j].Values[i]
				switch {
				case mOK && tOK && !sameValue(mv, tv):
					conflicts++
					want = mv
				case mOK:
					want = mv
				case tOK:
					want = tv
				}
				if got := out.Traits[j].Values[i]; !sameValue(got, want) {
					t.Fatalf("round %d, trait %d plot %d: %v, want %v", round, j, i, got, want)
				}
			}
		}
		if len(cs) != conflicts {
			t.Fatalf("round %d: %d conflicts, want %d", round, len(cs), conflicts)
		}
	}
}

func TestMergeNotesAndExclusions(t *testing.T) {
	t.Parallel()
	base := mergeBase(t)
	mine, theirs := base.Clone(), base.Clone()
	mine.Plots[0].Note = "weeds"                                            // one side
	theirs.Plots[2].Note = ""                                               // removed on disk
	mine.Plots[3].Note, theirs.Plots[3].Note = "a", "b"                     // conflict
	theirs.Plots[4].Exclusions = nil                                        // exclusion removed on disk
	mine.Plots[5].Exclusions = []Exclusion{{Trait: "", Reason: "flooding"}} // added here
	mine.Plots[6].Exclusions = []Exclusion{{Trait: "wt", Reason: "x"}}      // added both, different reasons
	theirs.Plots[6].Exclusions = []Exclusion{{Trait: "wt", Reason: "y"}, {Trait: "mst", Reason: "lost"}}
	out, cs := mustMerge(t, base, mine, theirs)
	if out.Plots[0].Note != "weeds" || out.Plots[2].Note != "" || out.Plots[3].Note != "a" {
		t.Errorf("notes %q %q %q", out.Plots[0].Note, out.Plots[2].Note, out.Plots[3].Note)
	}
	if len(out.Plots[4].Exclusions) != 0 || len(out.Plots[5].Exclusions) != 1 {
		t.Errorf("exclusions %v %v", out.Plots[4].Exclusions, out.Plots[5].Exclusions)
	}
	ex := out.Plots[6].Exclusions
	if len(ex) != 2 || ex[0] != (Exclusion{"wt", "x"}) || ex[1] != (Exclusion{"mst", "lost"}) {
		t.Errorf("plot 6 exclusions %v", ex)
	}
	if len(cs) != 2 || cs[0].Kind != ConflictNote || cs[1].Kind != ConflictExclusion || *cs[1].TheirsText != "y" || cs[1].BaseText != nil {
		t.Fatalf("conflicts %+v", cs)
	}
	for _, c := range cs {
		if err := ApplyResolution(out, c, false); err != nil {
			t.Fatal(err)
		}
	}
	if out.Plots[3].Note != "b" || out.Plots[6].Exclusions[0].Reason != "y" {
		t.Errorf("after taking theirs: %q %v", out.Plots[3].Note, out.Plots[6].Exclusions)
	}
	// Taking "not excluded" removes the exclusion.
	c := Conflict{Kind: ConflictExclusion, Plot: out.Plots[6].Number, Trait: "wt", MineText: nil, TheirsText: strPtr("y")}
	if err := ApplyResolution(out, c, true); err != nil || len(out.Plots[6].Exclusions) != 1 {
		t.Errorf("removing an exclusion: %v %v", err, out.Plots[6].Exclusions)
	}
}

func TestMergeSettingsAndTraits(t *testing.T) {
	t.Parallel()
	base := mergeBase(t)
	mine, theirs := base.Clone(), base.Clone()
	mine.Title = "new title"                       // one side
	theirs.Site.Soil = "clay"                      // other side, other field
	theirs.Traits[0].Decimals = 3                  // trait setting on disk
	mine.Traits[0].Name = "Harvest weight"         // another setting here
	theirs.Modified = base.Modified.Add(time.Hour) // later on disk
	added := Trait{Key: "lodg", Name: "Lodging", Kind: Score, Values: make([]float64, len(base.Plots))}
	for i := range added.Values {
		added.Values[i] = Missing
	}
	added.Values[0] = 3
	theirs.Traits = append(theirs.Traits, added) // trait added on disk
	out, cs := mustMerge(t, base, mine, theirs)
	if len(cs) != 0 || out.Title != "new title" || out.Site.Soil != "clay" || out.Traits[0].Decimals != 3 || out.Traits[0].Name != "Harvest weight" {
		t.Errorf("settings: %q %q %d %q, %d conflicts", out.Title, out.Site.Soil, out.Traits[0].Decimals, out.Traits[0].Name, len(cs))
	}
	if lt := out.Trait("lodg"); lt == nil || lt.Values[0] != 3 || !out.Modified.Equal(theirs.Modified) {
		t.Errorf("added trait %v, modified %v", lt, out.Modified)
	}
	if err := out.Validate(); err != nil {
		t.Errorf("merged trial invalid: %v", err)
	}
	// A trait removed on disk and unchanged here is removed.
	theirs2 := base.Clone()
	if err := theirs2.RemoveTrait("ht"); err != nil {
		t.Fatal(err)
	}
	mine2 := base.Clone()
	mine2.Traits[0].Values[0] = 99
	out, _ = mustMerge(t, base, mine2, theirs2)
	if out.Trait("ht") != nil || out.Traits[0].Values[0] != 99 {
		t.Error("removal on disk not merged")
	}
}

func TestMergeRefusals(t *testing.T) {
	t.Parallel()
	base := mergeBase(t)
	cases := []struct {
		name         string
		mine, theirs func(*Trial)
		want         string
	}{
		{"randomised again on disk", nil, func(tr *Trial) {
			tr.Plots[0].Treatment, tr.Plots[1].Treatment = tr.Plots[1].Treatment, tr.Plots[0].Treatment
		},
			"plots differ"},
		{"plots added", nil, func(tr *Trial) {
			tr.Plots = tr.Plots[:len(tr.Plots)-1]
			tr.Traits[0].Values = tr.Traits[0].Values[:len(tr.Plots)]
		},
			"different plots"},
		{"both changed the title", func(tr *Trial) { tr.Title = "A" }, func(tr *Trial) { tr.Title = "B" }, "the trial's title"},
		{"both changed a trait's unit", func(tr *Trial) { tr.Traits[2].Unit = "mm" }, func(tr *Trial) { tr.Traits[2].Unit = "m" }, `trait "ht"'s unit`},
		{"removed on disk, changed here", func(tr *Trial) { tr.Traits[2].Values[0] = 1 }, func(tr *Trial) { tr.RemoveTrait("ht") }, "removed in the version on disk"},
		{"removed here, changed on disk", func(tr *Trial) { tr.RemoveTrait("ht") }, func(tr *Trial) { tr.Traits[2].Values[0] = 1 }, "removed in your version"},
		{"added on both with other settings",
			func(tr *Trial) {
				tr.Traits = append(tr.Traits, Trait{Key: "x", Kind: Count, Values: make([]float64, len(tr.Plots))})
			},
			func(tr *Trial) {
				tr.Traits = append(tr.Traits, Trait{Key: "x", Kind: Score, Values: make([]float64, len(tr.Plots))})
			},
			`trait "x", with different settings`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			m, th := base.Clone(), base.Clone()
			if c.mine != nil {
				c.mine(m)
			}
			if c.theirs != nil {
				c.theirs(th)
			}
			_, _, err := MergeValues(base, m, th)
			if !errors.Is(err, ErrNotMergeable) || !strings.Contains(err.Error(), c.want) || !strings.Contains(err.Error(), "another name") {
				t.Errorf("got %v, want ErrNotMergeable about %q", err, c.want)
			}
		})
	}
}

func same3(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if !(a[i] == b[i] || math.IsNaN(a[i]) && math.IsNaN(b[i])) {
			return false
		}
	}
	return true
}
