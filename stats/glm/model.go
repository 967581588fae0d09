package glm

import (
	"fmt"
	"math"
	"sort"
	"strings"
)

// Structure is the error structure of a trial: how its plots were
// randomised, which decides the error strata.
type Structure int

const (
	// Factorial is a factorial in a completely randomised design (no
	// Block) or in randomised complete blocks (with Block): one error.
	Factorial Structure = iota
	// SplitPlot has Factors[0] on main plots randomised within blocks and
	// Factors[1] on subplots randomised within each main plot; an optional
	// Factors[2] on sub-subplots makes it a split-split plot. Errors (a),
	// (b) and, for a split-split plot, (c).
	SplitPlot
	// StripPlot has Factors[0] in strips one way across each block (the
	// horizontal factor) and Factors[1] in strips the other way (the
	// vertical factor), both randomised per block. Errors (a), (b), (c).
	StripPlot
)

// String names the structure as the JSON output does.
func (s Structure) String() string {
	switch s {
	case Factorial:
		return "factorial"
	case SplitPlot:
		return "split-plot"
	case StripPlot:
		return "strip-plot"
	}
	return fmt.Sprintf("Structure(%d)", int(s))
}

// Factor is a classification of the observations: a treatment factor
// (nitrogen rate, variety) or the blocks.
type Factor struct {
	Name   string   // key used in term names ("N", "variety", "block")
	Levels []string // level names, in level order
	Index  []int    // Index[i] is the level of observation i, 0..len(Levels)-1
}

// Model describes one response of a trial and how to analyse it.
type Model struct {
	// Response holds one value per plot; NaN marks a missing plot.
	Response []float64
	// Missing, when not nil, marks further plots as missing (true) in
	// addition to NaN responses, for example excluded outliers.
	Missing []bool
	// Factors are the 1 to 3 crossed treatment factors.
	Factors []Factor
	// Block is the blocking factor (replicates). Nil means a completely
	// randomised design, allowed only for Factorial.
	Block *Factor
	// Structure is the error structure.
	Structure Structure
	// Terms are the treatment terms, each a set of indices into Factors
	// ({0}, {1}, {0, 1}, ...). Nil means the full factorial: every main
	// effect and every interaction. Split and strip plots need the full
	// factorial (their strata are built from it).
	Terms [][]int
	// Alpha is the significance level of letters and of the interaction
	// tests that decide slices; 0 means 0.05.
	Alpha float64
	// LowerIsBetter gives letter a to the lowest mean.
	LowerIsBetter bool
	// AllSlices computes the slices of every interaction, not only of the
	// significant ones.
	AllSlices bool
	// Origin, when not 0, is the common part of the responses that the
	// caller has already taken away: the values are Origin + Response[i]
	// (as stats.Model.Origin: a caller holding decimal numbers subtracts
	// their shared leading digits exactly, so no digit of the differences
	// is lost to float64 rounding). Means, the grand mean, fitted values and
	// CV% are reported on the values' own scale, Origin included; sums of
	// squares, SEs, residuals and variance components do not depend on it.
	// The covariate is not shifted.
	Origin float64
	// Covariate, when not nil, holds a covariate measured on the same
	// plots (a stand count, a count before treatment, a soil value), one
	// value per plot; NaN marks a plot without one, which is then left
	// out (Result.Covariate.Left counts those that had a response). The
	// response is then analysed by analysis of covariance (see the package
	// documentation). Only for Structure Factorial.
	Covariate []float64
}

// CovariateLine is the source of the covariate's line in the analysis of
// variance.
const CovariateLine = "covariate"

// covariateLeft counts the plots with a response that are left out
// because their covariate is missing.
func (m *Model) covariateLeft() int {
	if m.Covariate == nil {
		return 0
	}
	left := 0
	for i, y := range m.Response {
		if !math.IsNaN(y) && (m.Missing == nil || !m.Missing[i]) && math.IsNaN(m.Covariate[i]) {
			left++
		}
	}
	return left
}

// ErrorKind classifies the problems with the input that stop an analysis.
type ErrorKind int

// The kinds of Error.
const (
	BadModel     ErrorKind = iota + 1 // the description of the model does not fit the data
	NoData                            // no observations, or too few for the model
	EmptyLevel                        // a factor level has no observations
	NoErrorDF                         // nothing left to estimate the error
	ZeroError                         // the model fits exactly: no error variance
	NotEstimable                      // the plots present cannot separate the effects asked for
)

// Error is a problem with the input that the trial manager can correct.
// Its message is a plain sentence saying what is wrong and what to do.
type Error struct {
	Kind   ErrorKind
	Factor string // the factor concerned, "" when none
	Level  int    // the level concerned, -1 when none
	Reason string
}

// Error returns the plain-language reason.
func (e *Error) Error() string { return e.Reason }

func errorf(kind ErrorKind, factor string, level int, format string, a ...any) *Error {
	return &Error{Kind: kind, Factor: factor, Level: level, Reason: fmt.Sprintf(format, a...)}
}

// term is one set of factor indices (into the combined factor list, where
// index nf is the block and indices above it are error units).
type term []int

func (t term) contains(u term) bool {
	for _, f := range u {
		found := false
		for _, g := range t {
			if g == f {
				found = true
				break
			}
		}
		if !found {
			return false
		}
	}
	return true
}

func (t term) equal(u term) bool { return len(t) == len(u) && t.contains(u) }

// termName joins factor names with ":" in factor order.
func termName(t term, names []string) string {
	s := make([]string, len(t))
	for i, f := range t {
		s[i] = names[f]
	}
	return strings.Join(s, ":")
}

// allTerms returns every non-empty subset of 0..nf-1, by size then
// lexicographically: A, B, C, A:B, A:C, B:C, A:B:C.
func allTerms(nf int) []term {
	var out []term
	for mask := 1; mask < 1<<nf; mask++ {
		var t term
		for f := range nf {
			if mask&(1<<f) != 0 {
				t = append(t, f)
			}
		}
		out = append(out, t)
	}
	sort.SliceStable(out, func(i, j int) bool { return len(out[i]) < len(out[j]) })
	return out
}

// check validates the model and returns the observations used.
func (m *Model) check() (used []int, err error) {
	n := len(m.Response)
	nf := len(m.Factors)
	if nf < 1 || nf > 3 {
		return nil, errorf(BadModel, "", -1, "give one, two or three treatment factors (there are %d)", nf)
	}
	if m.Missing != nil && len(m.Missing) != n {
		return nil, errorf(BadModel, "", -1, "the missing-plot mask has %d entries for %d plots; give one per plot", len(m.Missing), n)
	}
	if m.Covariate != nil {
		if len(m.Covariate) != n {
			return nil, errorf(BadModel, "", -1, "the covariate has %d values for %d plots; give one per plot (NaN where it is missing)", len(m.Covariate), n)
		}
		if m.Structure == SplitPlot || m.Structure == StripPlot {
			return nil, errorf(BadModel, "", -1, "a covariate can be used in a factorial in a completely randomised design or in randomised complete blocks, not in a %s; analyse this trait without the covariate", m.Structure)
		}
		for i, v := range m.Covariate {
			if math.IsInf(v, 0) {
				return nil, errorf(BadModel, "", -1, "plot %d has an infinite covariate value; correct or remove it", i+1)
			}
		}
	}
	names := map[string]bool{}
	all := append([]Factor(nil), m.Factors...)
	if m.Block != nil {
		all = append(all, *m.Block)
	}
	for _, f := range all {
		if f.Name == "" || strings.Contains(f.Name, ":") {
			return nil, errorf(BadModel, f.Name, -1, "factor name %q is empty or contains a colon; give each factor a short name without colons", f.Name)
		}
		if names[f.Name] {
			return nil, errorf(BadModel, f.Name, -1, "two factors are both called %q; give each factor its own name", f.Name)
		}
		if m.Covariate != nil && f.Name == CovariateLine {
			return nil, errorf(BadModel, f.Name, -1, "a factor is called %q, the name of the covariate's line; give the factor another name", f.Name)
		}
		names[f.Name] = true
		if len(f.Index) != n {
			return nil, errorf(BadModel, f.Name, -1, "factor %s has %d level entries for %d plots; give one per plot", f.Name, len(f.Index), n)
		}
		if len(f.Levels) < 2 {
			return nil, errorf(BadModel, f.Name, -1, "factor %s has fewer than two levels, so there is nothing to compare; give it at least two levels", f.Name)
		}
		for i, l := range f.Index {
			if l < 0 || l >= len(f.Levels) {
				return nil, errorf(BadModel, f.Name, -1, "plot %d has level number %d of factor %s, which has only %d levels", i+1, l+1, f.Name, len(f.Levels))
			}
		}
	}
	switch m.Structure {
	case Factorial:
	case SplitPlot:
		if nf < 2 {
			return nil, errorf(BadModel, "", -1, "a split plot needs a main-plot factor and a subplot factor (and optionally a sub-subplot factor)")
		}
	case StripPlot:
		if nf != 2 {
			return nil, errorf(BadModel, "", -1, "a strip plot needs exactly two factors, one in each direction (there are %d)", nf)
		}
	default:
		return nil, errorf(BadModel, "", -1, "the error structure is not one this analysis knows")
	}
	if m.Structure != Factorial {
		if m.Block == nil {
			return nil, errorf(BadModel, "", -1, "a %s needs its blocks: give the block of each plot", m.Structure)
		}
		if m.Terms != nil && len(m.Terms) != (1<<nf)-1 {
			return nil, errorf(BadModel, "", -1, "a %s is analysed with all main effects and interactions; leave the terms empty", m.Structure)
		}
	}
	if m.Terms != nil {
		seen := map[string]bool{}
		for _, t := range m.Terms {
			tt := append(term(nil), t...)
			sort.Ints(tt)
			if len(tt) == 0 {
				return nil, errorf(BadModel, "", -1, "a model term has no factors; list the factors of each term")
			}
			for k, f := range tt {
				if f < 0 || f >= nf || (k > 0 && tt[k-1] == f) {
					return nil, errorf(BadModel, "", -1, "a model term refers to a factor that is not there or twice; use factor numbers 1 to %d once each", nf)
				}
			}
			key := fmt.Sprint(tt)
			if seen[key] {
				return nil, errorf(BadModel, "", -1, "a model term is listed twice; list each once")
			}
			seen[key] = true
		}
		// Hierarchy: every interaction needs its marginal terms, so the
		// type II adjustments and the LS means are well defined.
		for _, t := range m.Terms {
			for _, sub := range allTerms(len(t)) {
				if len(sub) == len(t) {
					continue
				}
				st := make([]int, len(sub))
				for k, s := range sub {
					st[k] = t[s]
				}
				sort.Ints(st)
				if !seen[fmt.Sprint(st)] {
					return nil, errorf(BadModel, "", -1, "the model has an interaction without one of its main effects or lower interactions; include them")
				}
			}
		}
	}
	if m.Alpha != 0 && !(m.Alpha > 0 && m.Alpha < 1) {
		return nil, errorf(BadModel, "", -1, "the significance level must be between 0 and 1 (for example 0.05 for 5%%)")
	}
	for i, y := range m.Response {
		if math.IsInf(y, 0) {
			return nil, errorf(BadModel, "", -1, "plot %d has an infinite value; correct or remove it", i+1)
		}
		if math.IsNaN(y) || (m.Missing != nil && m.Missing[i]) || (m.Covariate != nil && math.IsNaN(m.Covariate[i])) {
			continue
		}
		used = append(used, i)
	}
	if len(used) == 0 {
		return nil, errorf(NoData, "", -1, "there are no observations to analyse")
	}
	for _, f := range all {
		cnt := make([]int, len(f.Levels))
		for _, i := range used {
			cnt[f.Index[i]]++
		}
		for l, c := range cnt {
			if c == 0 {
				what := "level " + f.Levels[l] + " of " + f.Name
				if m.Block != nil && f.Name == m.Block.Name {
					what = "block " + f.Levels[l]
				}
				return nil, errorf(EmptyLevel, f.Name, l, "%s has no observations; record data for it or leave it out of the analysis", what)
			}
		}
	}
	if m.Structure != Factorial {
		// Each block × treatment combination is one plot.
		seen := map[int]int{}
		for i := range n {
			key := m.Block.Index[i]
			for _, f := range m.Factors {
				key = key*len(f.Levels) + f.Index[i]
			}
			seen[key]++
			if seen[key] > 1 {
				return nil, errorf(BadModel, "", -1, "plot %d repeats a treatment combination within its block; a %s has each combination once per block", i+1, m.Structure)
			}
		}
	}
	return used, nil
}
