package trial

import (
	"errors"
	"fmt"
	"reflect"
	"slices"
	"strings"
	"testing"
	"time"
)

// testFactors returns invented factors with the given numbers of levels,
// keyed A, B, C with level codes a1, a2, ..., b1, ...
func testFactors(levels ...int) []Factor {
	fs := make([]Factor, len(levels))
	for i, n := range levels {
		key := string(rune('A' + i))
		fs[i].Key = key
		for k := range n {
			fs[i].Levels = append(fs[i].Levels, Level{Code: fmt.Sprintf("%s%d", strings.ToLower(key), k+1)})
		}
	}
	return fs
}

// TestCombinations: the treatments are the Cartesian product of the
// levels (brute force: nested loops written here), in standard order with
// the first factor slowest, codes joined by LevelSep.
func TestCombinations(t *testing.T) {
	t.Parallel()
	fs := testFactors(2, 3, 2)
	var want []string
	for _, a := range fs[0].Levels {
		for _, b := range fs[1].Levels {
			for _, c := range fs[2].Levels {
				want = append(want, a.Code+"-"+b.Code+"-"+c.Code)
			}
		}
	}
	got := Combinations(fs)
	if len(got) != len(want) {
		t.Fatalf("%d combinations, want %d", len(got), len(want))
	}
	for i, tr := range got {
		if tr.Code != want[i] || CombinationCode(tr.Levels) != tr.Code || tr.Role != RoleEntry {
			t.Errorf("combination %d = %+v, want code %s", i, tr, want[i])
		}
	}
	if ValidatePlan(fs, got, Design{Kind: RCBD, Reps: 3}) != nil {
		t.Error("the combinations do not validate")
	}
	if Combinations(nil) != nil {
		t.Error("no factors gave treatments")
	}
}

// TestFactorValidation: each rule gives a plain sentence naming what is
// wrong (the design rules are common practice: a strip plot crosses two
// factors, a split plot two or three).
func TestFactorValidation(t *testing.T) {
	t.Parallel()
	two, three := testFactors(2, 3), testFactors(2, 2, 2)
	one := testFactors(3)
	dupLevel := testFactors(2, 3)
	dupLevel[1].Levels[2].Code = "B2"
	dash := testFactors(2, 2)
	dash[0].Levels[0].Code = "a-1"
	reserved := testFactors(2, 2)
	reserved[0].Key = "block"
	for _, c := range []struct {
		name string
		fs   []Factor
		d    Design
		want string
	}{
		{"strip with three", three, Design{Kind: StripPlot, Reps: 3}, "a strip plot needs exactly 2 factors"},
		{"strip with none", nil, Design{Kind: StripPlot, Reps: 3}, "a strip plot needs its treatments given as exactly 2 factors"},
		{"split with one", one, Design{Kind: SplitPlot, Reps: 3}, "a split plot needs 2 or 3 factors"},
		{"split with none", nil, Design{Kind: SplitPlot, Reps: 3}, "a split plot needs its treatments given as 2 or 3 factors"},
		{"four factors", testFactors(2, 2, 2, 2), Design{Kind: RCBD, Reps: 3}, "at most 3 factors"},
		{"duplicate level", dupLevel, Design{Kind: RCBD, Reps: 3}, `level code "B2" twice`},
		{"separator in code", dash, Design{Kind: RCBD, Reps: 3}, `contains "-"`},
		{"reserved key", reserved, Design{Kind: RCBD, Reps: 3}, "already a column of the field book"},
		{"one level", testFactors(1, 2), Design{Kind: RCBD, Reps: 3}, "at least 2 levels"},
		{"latin", two, Design{Kind: Latin, Reps: 6}, "Latin square of factor combinations is not offered"},
		{"unknown main", two, Design{Kind: SplitPlot, Reps: 3, MainFactor: "K"}, `main-plot factor "K" is not one of the trial's factors (A, B)`},
		{"main on rcbd", two, Design{Kind: RCBD, Reps: 3, MainFactor: "A"}, "only a split plot or a strip plot"},
		{"sub equals main", three, Design{Kind: SplitPlot, Reps: 3, MainFactor: "B", SubFactor: "B"}, "cannot be on both"},
		{"too few reps", two, Design{Kind: SplitPlot, Reps: 1}, "needs 2 to 50 replicates"},
	} {
		err := ValidatePlan(c.fs, Combinations(c.fs), c.d)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want a message with %q", c.name, err, c.want)
		}
	}
	// Treatments that are not the combinations are refused.
	ts := Combinations(two)
	if err := ValidatePlan(two, ts[:5], Design{Kind: RCBD, Reps: 2}); err == nil || !strings.Contains(err.Error(), "has no treatment") {
		t.Errorf("a missing combination: %v", err)
	}
	ts[0].Code = "X"
	if err := ValidatePlan(two, ts, Design{Kind: RCBD, Reps: 2}); err == nil || !strings.Contains(err.Error(), "its code must be") {
		t.Errorf("a wrong code: %v", err)
	}
	for _, d := range []Design{{Kind: CRD, Reps: 2}, {Kind: RCBD, Reps: 4}, {Kind: SplitPlot, Reps: 3, MainFactor: "B"}, {Kind: StripPlot, Reps: 3}} {
		if err := ValidatePlan(two, Combinations(two), d); err != nil {
			t.Errorf("%+v refused: %v", d, err)
		}
	}
	// The designs offered fit the factors.
	for nf := range 4 {
		for _, k := range DesignKindsFor(nf) {
			fs := testFactors([]int{2, 3, 2}[:nf]...)
			ts := Combinations(fs)
			if nf == 0 {
				ts = lettered(4)
			}
			reps := 3
			if k == Latin {
				reps = len(ts)
			}
			if err := ValidatePlan(fs, ts, Design{Kind: k, Reps: reps}); err != nil {
				t.Errorf("%d factors: offered %s, refused: %v", nf, k, err)
			}
		}
	}
}

// TestDesignNamesFactorial: the names of the designs in output, as the
// analysis JSON gives them.
func TestDesignNamesFactorial(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		k         DesignKind
		factorial bool
		want      string
	}{{CRD, false, "crd"}, {RCBD, false, "rcbd"}, {Latin, false, "latin"}, {CRD, true, "factorial-crd"}, {RCBD, true, "factorial-rcbd"}, {SplitPlot, true, "split-plot"}, {StripPlot, true, "strip-plot"}} {
		if got := DesignName(c.k, c.factorial); got != c.want {
			t.Errorf("DesignName(%s, %v) = %q, want %q", c.k, c.factorial, got, c.want)
		}
		if k, f, ok := ParseDesignName(strings.ToUpper(c.want)); !ok || k != c.k || f != c.factorial {
			t.Errorf("ParseDesignName(%q) = %s %v %v", c.want, k, f, ok)
		}
	}
}

// plan is a factorial test plan.
type plan struct {
	name string
	fs   []Factor
	d    Design
	l    Layout
}

func factorialPlans() []plan {
	side := DefaultLayout()
	side.Blocks = BlocksSideBySide
	rows := DefaultLayout()
	rows.PlotsPerRow = 6
	return []plan{
		{"factorial rcbd", testFactors(2, 3), Design{Kind: RCBD, Reps: 3}, DefaultLayout()},
		{"split", testFactors(3, 2), Design{Kind: SplitPlot, Reps: 3}, DefaultLayout()},
		{"split, main B", testFactors(2, 3), Design{Kind: SplitPlot, Reps: 4, MainFactor: "B"}, side},
		{"split, rows of 6", testFactors(3, 2), Design{Kind: SplitPlot, Reps: 2}, rows},
		{"split-split", testFactors(2, 3, 2), Design{Kind: SplitPlot, Reps: 2, MainFactor: "B", SubFactor: "C"}, DefaultLayout()},
		{"strip", testFactors(3, 4), Design{Kind: StripPlot, Reps: 3}, DefaultLayout()},
		{"strip, side by side, main B", testFactors(3, 4), Design{Kind: StripPlot, Reps: 2, MainFactor: "B"}, side},
	}
}

// restrictionsHold checks, by brute force over the plots, what the design
// promises (common practice; Gomez & Gomez 1984, ch. 3–4, for the split and
// strip plot layouts): each combination once per block; in a split plot
// each main plot holds one main-plot level and every combination of the
// other factors once, on neighbouring plots of one field row (each subplot
// of a split-split plot one subplot level and every sub-subplot level, on
// neighbouring plots); in a strip plot each horizontal strip is one field
// row of the block with one level of its factor, each vertical strip one
// field column spanning the block with one level of the other.
func restrictionsHold(t *testing.T, p plan, plots []Plot) {
	t.Helper()
	ts := Combinations(p.fs)
	order := p.d.FactorOrder(p.fs)
	lv := map[string][]string{}
	for _, tr := range ts {
		lv[tr.Code] = tr.Levels
	}
	type blockTrt struct {
		b int
		c string
	}
	seen := map[blockTrt]int{}
	for _, pl := range plots {
		seen[blockTrt{pl.Block, pl.Treatment}]++
	}
	for b := 1; b <= p.d.Reps; b++ {
		for _, tr := range ts {
			if seen[blockTrt{b, tr.Code}] != 1 {
				t.Fatalf("%s: block %d holds %s %d times", p.name, b, tr.Code, seen[blockTrt{b, tr.Code}])
			}
		}
	}
	group := func(what string, key func(Plot) string, factor int, size int, sameRow, sameCol bool) {
		g := map[string][]Plot{}
		for _, pl := range plots {
			g[key(pl)] = append(g[key(pl)], pl)
		}
		for k, ps := range g {
			if len(ps) != size {
				t.Fatalf("%s: %s %s holds %d plots, want %d", p.name, what, k, len(ps), size)
			}
			var cols, rowsSeen []int
			level := lv[ps[0].Treatment][factor]
			for _, pl := range ps {
				if lv[pl.Treatment][factor] != level {
					t.Fatalf("%s: %s %s holds two levels of %s", p.name, what, k, p.fs[factor].Key)
				}
				cols = append(cols, pl.Column)
				rowsSeen = append(rowsSeen, pl.Row)
			}
			slices.Sort(cols)
			slices.Sort(rowsSeen)
			if sameRow && (rowsSeen[0] != rowsSeen[len(rowsSeen)-1] || cols[len(cols)-1]-cols[0] != len(cols)-1) {
				t.Fatalf("%s: %s %s is not a run of neighbouring plots in one field row: rows %v columns %v", p.name, what, k, rowsSeen, cols)
			}
			if sameCol && (cols[0] != cols[len(cols)-1] || rowsSeen[len(rowsSeen)-1]-rowsSeen[0] != len(rowsSeen)-1) {
				t.Fatalf("%s: %s %s is not one field column spanning the block: rows %v columns %v", p.name, what, k, rowsSeen, cols)
			}
		}
	}
	n := func(k int) int { return len(p.fs[order[k]].Levels) }
	switch p.d.Kind {
	case SplitPlot:
		size := len(ts) / n(0)
		group("main plot", func(pl Plot) string { return fmt.Sprint(pl.Block, "/", pl.MainPlot) }, order[0], size, true, false)
		if len(order) == 3 {
			group("subplot", func(pl Plot) string { return fmt.Sprint(pl.Block, "/", pl.MainPlot, "/", pl.SubPlot) }, order[1], n(2), true, false)
		}
	case StripPlot:
		group("horizontal strip", func(pl Plot) string { return fmt.Sprint(pl.Block, "/", pl.MainPlot) }, order[0], n(1), true, false)
		group("vertical strip", func(pl Plot) string { return fmt.Sprint(pl.Block, "/", pl.Strip) }, order[1], n(0), false, true)
	}
}

// TestFactorialConstraintsManySeeds: the restrictions hold for many seeds,
// and the trial validates.
func TestFactorialConstraintsManySeeds(t *testing.T) {
	t.Parallel()
	seeds := 300
	if testing.Short() {
		seeds = 30
	}
	for _, p := range factorialPlans() {
		for seed := range seeds {
			plots, err := LayOutPlanRandomized(p.fs, Combinations(p.fs), p.d, p.l, uint64(seed)*7919+1)
			if err != nil {
				t.Fatalf("%s: %v", p.name, err)
			}
			restrictionsHold(t, p, plots)
		}
		tr, err := New(NewOptions{Factors: p.fs, Design: p.d, Layout: p.l, Seed: 5, Now: time.Unix(0, 0)})
		if err != nil {
			t.Fatalf("%s: New: %v", p.name, err)
		}
		if err := tr.CheckRandomization(); err != nil {
			t.Errorf("%s: %v", p.name, err)
		}
		if want := MethodFor(p.d.Kind); tr.Random.Method != want {
			t.Errorf("%s: method %q, want %q", p.name, tr.Random.Method, want)
		}
	}
}

// TestFactorialUniform: over many seeds, the level a unit receives is
// uniform (Pearson's chi-square at alpha = 0.001 against gonum's quantile,
// as the other uniformity tests): the main-plot level of each main plot of
// block 1 and of block 2 jointly (independent blocks), the subplot level of
// the first subplot of each main plot, the sub-subplot level of the first
// sub-subplot; a strip plot's levels of the first horizontal and vertical
// strips jointly (independent directions); and a factorial RCBD's
// combination on the first plot.
func TestFactorialUniform(t *testing.T) {
	t.Parallel()
	n := uniformSeeds(t)
	for _, p := range factorialPlans() {
		order := p.d.FactorOrder(p.fs)
		sizes := make([]int, len(order))
		for k, f := range order {
			sizes[k] = len(p.fs[f].Levels)
		}
		idx := func(code string, k int) int {
			return p.fs[order[k]].LevelIndex(strings.Split(code, LevelSep)[order[k]])
		}
		counts := map[string][]int{}
		add := func(name string, cells, v int) {
			if counts[name] == nil {
				counts[name] = make([]int, cells)
			}
			counts[name][v]++
		}
		ts := Combinations(p.fs)
		for seed := range n {
			plots, err := LayOutPlanRandomized(p.fs, ts, p.d, p.l, uint64(seed))
			if err != nil {
				t.Fatal(err)
			}
			switch p.d.Kind {
			case RCBD:
				add("first plot", len(ts), slices.IndexFunc(ts, func(tr Treatment) bool { return tr.Code == plots[0].Treatment }))
			case SplitPlot:
				first := map[[3]int]bool{}
				var b1, b2 int
				for _, pl := range plots {
					u := [3]int{pl.Block, pl.MainPlot}
					if first[u] {
						continue
					}
					first[u] = true
					m := idx(pl.Treatment, 0)
					add(fmt.Sprintf("main level of main plot %d/%d", pl.Block, pl.MainPlot), sizes[0], m)
					add(fmt.Sprintf("first subplot level of main plot %d/%d", pl.Block, pl.MainPlot), sizes[1], idx(pl.Treatment, 1))
					if len(order) == 3 {
						add(fmt.Sprintf("first sub-subplot level of main plot %d/%d", pl.Block, pl.MainPlot), sizes[2], idx(pl.Treatment, 2))
					}
					if pl.MainPlot == 1 && pl.Block == 1 {
						b1 = m
					}
					if pl.MainPlot == 1 && pl.Block == 2 {
						b2 = m
					}
				}
				add("main plot 1 of blocks 1 and 2 jointly", sizes[0]*sizes[0], b1*sizes[0]+b2)
			case StripPlot:
				var h, v int
				for _, pl := range plots {
					if pl.Block == 1 && pl.MainPlot == 1 && pl.Strip == 1 {
						h, v = idx(pl.Treatment, 0), idx(pl.Treatment, 1)
					}
				}
				add("first strips jointly", sizes[0]*sizes[1], h*sizes[1]+v)
			}
		}
		for name, c := range counts {
			if x, crit := chiSquare(c), chiSquareCritical(len(c)-1, uniformAlpha); x > crit {
				t.Errorf("%s, %s: not uniform, chi-square %.2f > %.2f (df %d, alpha %g)", p.name, name, x, crit, len(c)-1, uniformAlpha)
			}
		}
	}
}

// TestFactorialReproducible: the same plan and seed give the same plots;
// another seed gives another layout (common practice).
func TestFactorialReproducible(t *testing.T) {
	t.Parallel()
	for _, p := range factorialPlans() {
		ts := Combinations(p.fs)
		a, err := LayOutPlanRandomized(p.fs, ts, p.d, p.l, 42)
		if err != nil {
			t.Fatal(err)
		}
		b, _ := LayOutPlanRandomized(p.fs, ts, p.d, p.l, 42)
		c, _ := LayOutPlanRandomized(p.fs, ts, p.d, p.l, 43)
		if !reflect.DeepEqual(a, b) {
			t.Errorf("%s: the same seed gave two layouts", p.name)
		}
		if reflect.DeepEqual(a, c) {
			t.Errorf("%s: seeds 42 and 43 gave the same layout", p.name)
		}
	}
}

// TestSplitPlotRowsHoldWholeMainPlots: a field row that would cut a main
// plot in two is refused with a plain message.
func TestSplitPlotRowsHoldWholeMainPlots(t *testing.T) {
	t.Parallel()
	fs := testFactors(3, 4)
	l := DefaultLayout()
	l.PlotsPerRow = 6
	_, err := LayOutPlan(fs, Combinations(fs), Design{Kind: SplitPlot, Reps: 2}, l)
	if err == nil || !strings.Contains(err.Error(), "a multiple of 4") {
		t.Errorf("got %v", err)
	}
}

// TestSetPlan: the plan edits refuse a trial holding data, keep the roles
// of combinations that stay, and the list edits refuse a factorial trial.
func TestSetPlan(t *testing.T) {
	t.Parallel()
	tr, err := New(NewOptions{Treatments: lettered(4), Design: Design{Kind: RCBD, Reps: 3}, Traits: []Trait{{Key: "yield"}}, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	fs := testFactors(2, 3)
	if err := tr.SetPlan(fs, Design{Kind: StripPlot, Reps: 3}); err != nil {
		t.Fatal(err)
	}
	if len(tr.Treatments) != 6 || tr.Randomized() || len(tr.Plots) != 18 {
		t.Fatalf("after SetPlan: %d treatments, randomised %v, %d plots", len(tr.Treatments), tr.Randomized(), len(tr.Plots))
	}
	tr.Treatments[1].Role = RoleCheck
	fs[1].Levels = append(fs[1].Levels, Level{Code: "b4"})
	if err := tr.SetFactors(fs); err != nil {
		t.Fatal(err)
	}
	if len(tr.Treatments) != 8 || tr.Treatments[1].Role != RoleCheck {
		t.Errorf("after SetFactors: %d treatments, role %q", len(tr.Treatments), tr.Treatments[1].Role)
	}
	if err := tr.SetFactors(testFactors(2, 2, 2)); err == nil || !strings.Contains(err.Error(), "exactly 2 factors") {
		t.Errorf("a third factor on a strip plot: %v", err)
	}
	if err := tr.AddTreatment(Treatment{Code: "Z"}); err == nil {
		t.Error("AddTreatment changed a factorial trial")
	}
	if err := tr.Randomize(9); err != nil {
		t.Fatal(err)
	}
	if err := tr.SetValue(0, "yield", 3); err != nil {
		t.Fatal(err)
	}
	if err := tr.SetFactors(testFactors(2, 2)); !errors.Is(err, ErrHasData) {
		t.Errorf("a trial with data: %v", err)
	}
	c := tr.Clone()
	c.Factors[0].Levels[0].Code = "zz"
	c.Treatments[0].Levels[0] = "zz"
	if tr.Factors[0].Levels[0].Code == "zz" || tr.Treatments[0].Levels[0] == "zz" {
		t.Error("Clone shares factors or levels")
	}
}

// TestParseLevelsRoundTrip: FormatLevels writes what ParseLevels reads
// back to the same levels, for rates with a unit, named codes and plain
// codes (the one-line form documented in ParseLevels; common practice
// for rates: "0, 60, 120 kg N/ha").
func TestParseLevelsRoundTrip(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ key, in, out string }{
		{"N", "0,60,120 kg N/ha", "0,60,120 kg N/ha"},
		{"V", "V1=Amberline, V2 ,V3", "V1=Amberline,V2,V3"},
		{"D", "2.5,5", "2.5,5"},
		{"T", "CT=ploughed,NT", "CT=ploughed,NT"},
	} {
		ls, err := ParseLevels(c.key, c.in)
		if err != nil {
			t.Fatalf("%q: %v", c.in, err)
		}
		f := Factor{Key: c.key, Levels: ls}
		if got := FormatLevels(f); got != c.out {
			t.Errorf("FormatLevels(ParseLevels(%q)) = %q, want %q", c.in, got, c.out)
		}
		again, err := ParseLevels(c.key, FormatLevels(f))
		if err != nil || !reflect.DeepEqual(again, ls) {
			t.Errorf("%q does not read back: %+v %v", c.in, again, err)
		}
	}
	if ls, _ := ParseLevels("N", "0,60 kg N/ha"); ls[1].Code != "N60" || *ls[1].Value != 60 || ls[1].Unit != "kg N/ha" || ls[1].Name != "60 kg N/ha" {
		t.Errorf("rate level %+v", ls[1])
	}
	if _, err := ParseFactorSpec("V:Variety"); err == nil {
		t.Error("a factor without levels was read")
	}
}

// TestValidateStrata: a hand-edited split or strip plot whose plots break
// the design's restriction is reported in a plain sentence (the
// restrictions of Gomez & Gomez 1984, ch. 3–4: a main plot holds one level
// of the main-plot factor, a strip one level of its factor).
func TestValidateStrata(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		p      plan
		change func(tr *Trial)
		want   string
	}{
		{factorialPlans()[1], func(tr *Trial) {
			tr.Plots[0].MainPlot, tr.Plots[len(tr.Plots)/tr.Design.Reps-1].MainPlot = tr.Plots[len(tr.Plots)/tr.Design.Reps-1].MainPlot, tr.Plots[0].MainPlot
		}, "holds one level of it"},
		{factorialPlans()[1], func(tr *Trial) { tr.Plots[0].MainPlot = 9 }, "main plot number 9"},
		{factorialPlans()[4], func(tr *Trial) { tr.Plots[0].SubPlot = 0 }, "subplot number 0"},
		{factorialPlans()[5], func(tr *Trial) { tr.Plots[0].Strip = 0 }, "vertical strip number 0"},
	} {
		tr, err := New(NewOptions{Factors: c.p.fs, Design: c.p.d, Layout: c.p.l, Seed: 3})
		if err != nil {
			t.Fatal(err)
		}
		if err := tr.Validate(); err != nil {
			t.Fatalf("%s: %v", c.p.name, err)
		}
		c.change(tr)
		if err := tr.Validate(); err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: got %v, want %q", c.p.name, err, c.want)
		}
	}
}
