package trial

import (
	"fmt"
	"strings"
)

// MaxCombinationCodeLen is the longest treatment code of a factorial
// trial: MaxFactors level codes joined by LevelSep.
const MaxCombinationCodeLen = MaxFactors*MaxLevelCodeLen + (MaxFactors-1)*len(LevelSep)

// strata maps level indices of the factors, in design order, to the
// treatments of a split or strip plot.
type strata struct {
	order []int          // indices into the factors, in design order
	sizes [3]int         // number of levels of each factor in design order (1 past the last)
	codes map[int]string // combination (mixed radix over sizes) → treatment code
}

// newStrata returns the strata of a valid split or strip plot plan, nil
// for the other designs.
func newStrata(fs []Factor, ts []Treatment, d Design) *strata {
	if d.Kind != SplitPlot && d.Kind != StripPlot {
		return nil
	}
	st := &strata{order: d.FactorOrder(fs), sizes: [3]int{1, 1, 1}, codes: make(map[int]string, len(ts))}
	for k, f := range st.order {
		st.sizes[k] = len(fs[f].Levels)
	}
	for _, tr := range ts {
		var lv [3]int
		for k, f := range st.order {
			lv[k] = fs[f].LevelIndex(tr.Levels[f])
		}
		st.codes[st.key(lv)] = tr.Code
	}
	return st
}

func (st *strata) key(lv [3]int) int { return (lv[0]*st.sizes[1]+lv[1])*st.sizes[2] + lv[2] }

func (st *strata) code(lv [3]int) string { return st.codes[st.key(lv)] }

// mainSize is the number of plots in one main plot of a split plot.
func (st *strata) mainSize() int { return st.sizes[1] * st.sizes[2] }

// splitLevels returns the standard-order levels of the plot at position
// pos (from 0) of a split-plot block.
func (st *strata) splitLevels(pos int) [3]int {
	m := st.mainSize()
	within := pos % m
	return [3]int{pos / m, within / st.sizes[2], within % st.sizes[2]}
}

// factorKeys lists the keys of factors for messages: "N, V".
func factorKeys(fs []Factor) string {
	ks := make([]string, len(fs))
	for i, f := range fs {
		ks[i] = f.Key
	}
	return strings.Join(ks, ", ")
}

// checkFactorDesign checks that the design fits the factors.
func (p *problems) checkFactorDesign(fs []Factor, d Design, factorsOK bool) {
	restricted := d.Kind == SplitPlot || d.Kind == StripPlot
	if !restricted && (d.MainFactor != "" || d.SubFactor != "") {
		p.add("Design.MainFactor", "only a split plot or a strip plot puts a factor on main plots or strips; leave the main-plot factor empty for %s", designName(d.Kind))
	}
	nf := len(fs)
	switch d.Kind {
	case Latin:
		if nf > 0 {
			p.add("Design.Kind", "a Latin square of factor combinations is not offered; choose a completely randomised design, a randomised complete block design, a split plot or a strip plot")
		}
		return
	case SplitPlot:
		switch {
		case nf == 0:
			p.add("Design.Kind", "a split plot needs its treatments given as 2 or 3 factors with levels (one on the main plots, one on the subplots); enter the treatments as factors, or choose a randomised complete block design")
			return
		case nf == 1:
			p.add("Design.Kind", "a split plot needs 2 or 3 factors (one on the main plots, one on the subplots); the trial has only factor %s", fs[0].Key)
			return
		case nf > MaxFactors:
			return // reported with the factors
		}
	case StripPlot:
		switch {
		case nf == 0:
			p.add("Design.Kind", "a strip plot needs its treatments given as exactly 2 factors with levels (one in horizontal strips, one in vertical strips); enter the treatments as factors, or choose a randomised complete block design")
			return
		case nf != 2:
			p.add("Design.Kind", "a strip plot needs exactly 2 factors, one in each direction; the trial has %d (%s). For 3 factors choose a split plot or a randomised complete block design", nf, factorKeys(fs))
			return
		}
		if d.SubFactor != "" {
			p.add("Design.SubFactor", "a strip plot has no subplot factor; leave it empty")
		}
	default:
		return
	}
	if !factorsOK {
		return
	}
	what := "main-plot factor"
	if d.Kind == StripPlot {
		what = "factor in horizontal strips"
	}
	if d.MainFactor != "" && factorIndex(fs, d.MainFactor) < 0 {
		p.add("Design.MainFactor", "the %s %q is not one of the trial's factors (%s)", what, d.MainFactor, factorKeys(fs))
	}
	if d.Kind == SplitPlot && d.SubFactor != "" {
		switch i := factorIndex(fs, d.SubFactor); {
		case i < 0:
			p.add("Design.SubFactor", "the subplot factor %q is not one of the trial's factors (%s)", d.SubFactor, factorKeys(fs))
		case d.SubFactor == d.MainFactor || d.MainFactor == "" && i == 0:
			p.add("Design.SubFactor", "factor %s cannot be on both the main plots and the subplots; choose another subplot factor", d.SubFactor)
		}
	}
}

// checkFactorKeys checks that no factor key is also a trait key.
func (p *problems) checkFactorKeys(t *Trial) {
	for i, f := range t.Factors {
		for _, tr := range t.Traits {
			if f.Key != "" && strings.EqualFold(f.Key, tr.Key) {
				p.add(fmt.Sprintf("Factors[%d].Key", i), "factor key %q is also the key of a trait; the field book needs a column for each, so give one of them another key", f.Key)
			}
		}
	}
}

// checkPlotStrata checks that the plots of a split or strip plot carry
// out its restrictions: in a split plot each main plot holds one level of
// the main-plot factor and every combination of the others once (and each
// subplot of a split-split plot one subplot level and every sub-subplot
// level once); in a strip plot each horizontal strip holds one level of its
// factor and each vertical strip one level of the other, every strip
// spanning the block.
func (p *problems) checkPlotStrata(t *Trial, report func(field, format string, args ...any)) {
	st := newStrata(t.Factors, t.Treatments, t.Design)
	levels := make(map[string][3]int, len(t.Treatments))
	for _, tr := range t.Treatments {
		var lv [3]int
		for k, f := range st.order {
			lv[k] = t.Factors[f].LevelIndex(tr.Levels[f])
		}
		levels[tr.Code] = lv
	}
	type unit struct{ block, a, b int }
	first := map[unit]int{} // unit → the level (in design position k) its first plot has
	count := map[unit]int{}
	check := func(pl Plot, u unit, num, k int, what string, max int) bool {
		lv := levels[pl.Treatment]
		if num < 1 || num > max {
			report("Plots", "plot %d has %s number %d; in this %s they are numbered 1 to %d", pl.Number, what, num, t.Design.Kind.Name(), max)
			return false
		}
		if l, ok := first[u]; ok && l != lv[k] {
			report("Plots", "plot %d is in %s %d of block %d with a different level of factor %s than the other plots there; a %s holds one level of it", pl.Number, what, num, pl.Block, t.Factors[st.order[k]].Key, what)
			return false
		}
		first[u] = lv[k]
		count[u]++
		return true
	}
	sizes := st.sizes
	for _, pl := range t.Plots {
		switch t.Design.Kind {
		case SplitPlot:
			if !check(pl, unit{pl.Block, pl.MainPlot, 0}, pl.MainPlot, 0, "main plot", sizes[0]) {
				return
			}
			if len(st.order) == 3 && !check(pl, unit{pl.Block, pl.MainPlot, pl.SubPlot}, pl.SubPlot, 1, "subplot", sizes[1]) {
				return
			}
		case StripPlot:
			if !check(pl, unit{pl.Block, pl.MainPlot, 0}, pl.MainPlot, 0, "horizontal strip", sizes[0]) ||
				!check(pl, unit{pl.Block, -pl.Strip, 0}, pl.Strip, 1, "vertical strip", sizes[1]) {
				return
			}
		}
	}
	// Each block has each combination once (checked by the caller), so
	// units holding one level each hold the right number of plots as soon
	// as every unit number is in range and each unit is homogeneous.
	for u, n := range count {
		want := sizes[1] * sizes[2]
		what := "main plot"
		switch {
		case t.Design.Kind == SplitPlot && u.b > 0:
			want, what = sizes[2], "subplot"
		case t.Design.Kind == StripPlot && u.a < 0:
			want, what = sizes[0], "vertical strip"
		case t.Design.Kind == StripPlot:
			want, what = sizes[1], "horizontal strip"
		}
		if n != want {
			report("Plots", "a %s of block %d holds %d plots; in this design it holds %d", what, u.block, n, want)
			return
		}
	}
}
