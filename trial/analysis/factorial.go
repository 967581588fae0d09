package analysis

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"

	"furlong/stats"
	"furlong/stats/diag"
	"furlong/stats/dist"
	"furlong/stats/glm"
	"furlong/trial"
)

// FactorData is one crossed treatment factor of a factorial, split-plot or
// strip-plot Data: its key, its levels and the level of every observation.
type FactorData struct {
	Key    string
	Name   string   // for display; "" means Key
	Levels []string // level codes, in level order
	// LevelNames (optional, as Levels) name the levels for display.
	LevelNames []string
	// Index[i] is the level of observation i (as Data.Values).
	Index []int
}

// Factorial is the part of a Result that belongs to crossed treatment
// factors: the analysis of variance with its strata, the means of every
// main effect and interaction with their comparisons, the standard errors
// of differences of every kind, variance components and slices. A Result
// of one list of treatments has none (Result.Factorial is nil); a
// factorial Result still fills Means, Pairs, LSD and HSD with the
// treatment combinations, so every view of one list works on it too.
type Factorial struct {
	// Design is the name the JSON output uses: "factorial-crd",
	// "factorial-rcbd", "split-plot" or "strip-plot".
	Design string
	// Method is "sums of squares" or "REML" (split and strip plots with
	// missing plots).
	Method string
	// Factors in design order: a split plot's main-plot factor first, a
	// strip plot's horizontal factor first.
	Factors  []FactorInfo
	Balanced bool
	// Lines is the analysis of variance: block, main effects and
	// interactions and the error of each stratum in the classic order,
	// then total. REML lines carry F tests with Satterthwaite denominator
	// df and no sums of squares.
	Lines []Line
	// Effects holds every main effect and interaction with its means.
	Effects []Effect
	// SEDs lists the standard error of a difference of each kind.
	SEDs []SED
	// Components are the variance components (split and strip plots).
	Components []Component
	// Slices compare one factor's levels within each level of another
	// factor of a significant interaction.
	Slices []Slice
	// StratumResiduals are the residuals of the higher error strata (one
	// per main plot or strip), with their Shapiro–Wilk test.
	StratumResiduals []StratumResiduals
}

// FactorInfo describes one treatment factor of a Factorial.
type FactorInfo struct {
	Key        string
	Name       string
	Levels     []string // codes
	LevelNames []string // as Levels; a code when the level has no name
}

// Label is the factor's name, or its key.
func (f FactorInfo) Label() string {
	if f.Name != "" {
		return f.Name
	}
	return f.Key
}

// Line is one line of a factorial analysis of variance. Values that do
// not apply are nil.
type Line struct {
	Source string // "block", "N", "N:V", "error", "error_a", "error_b", "error_c", "total"
	// Role is stats.RoleBlock, RoleFactor (a main effect), RoleInteraction,
	// RoleError (the one error of a factorial), RoleErrorStratum (the error
	// of one stratum of a split or strip plot) or RoleTotal.
	Role    stats.Role
	Factors []string // the factor keys of a treatment line
	DF      int      // numerator df of a test
	SS, MS  *float64
	F, P    *float64
	// DFDen is the denominator df of the F test (whole for sums of
	// squares, Satterthwaite for REML); ErrorTerm is the line it is tested
	// against ("" for REML).
	DFDen     *float64
	ErrorTerm string
	CVPercent *float64 // error lines
}

// Effect is one main effect or interaction with its estimated marginal
// means and their comparisons.
type Effect struct {
	Name    string   // "N", "N:V"
	Factors []string // keys, in the effect's order
	Means   []EffectMean
	P       *float64 // the effect's F test
	// SED and DF are the standard error of a difference and its df when
	// every pair has the same; SEDRange otherwise.
	SED, DF  *float64
	SEDRange *Range
	// LSD and HSD at Alpha when every pair has the same SED.
	LSD, HSD *float64
	// LettersGiven is false when the protected LSD letters were withheld
	// (the effect's F test was not significant); Note says why.
	LettersGiven bool
	// Significant is true for an interaction significant at Alpha; Note
	// then says in plain words what that means for reading the means.
	Significant bool
	Note        string
}

// EffectMean is the estimated marginal mean of one level combination of an
// effect or slice.
type EffectMean struct {
	Levels []string // level code of each factor of the effect
	N      int
	// Mean, SE and DF are nil when the plots present cannot estimate the
	// mean; BackMean is the mean on the original scale (a transformation).
	Mean, SE, DF *float64
	RawMean      *float64
	BackMean     *float64
	LettersLSD   string
	LettersTukey string
}

// SED is the standard error of a difference of one kind of comparison.
type SED struct {
	// Key: "main", "sub", "sub_within_main", "main_within_sub" (split
	// plot); "horizontal", "vertical", "horizontal_within_vertical",
	// "vertical_within_horizontal" (strip plot); else the effect and the
	// factors that differ, as "N:V/N".
	Key    string
	Effect string
	Differ []string // the factor keys that differ
	Label  string   // in words: "two V levels at the same N level"
	// SED is the mean over the pairs of this kind (all equal for
	// balanced data), Min and Max their range, DF the mean df.
	SED, Min, Max, DF float64
	Pairs             int
}

// Component is a variance component.
type Component struct {
	Name      string // "main_plot", "subplot", "horizontal_strip", "vertical_strip", "residual"
	Variance  float64
	Truncated bool // a negative estimate shown as 0
}

// Slice compares one factor's levels with the other factors of an
// interaction held at fixed levels.
type Slice struct {
	Effect string // "N:V"
	Factor string // the key of the factor compared
	// At gives the fixed level code of each other factor, by key.
	At    map[string]string
	Name  string // "N at V = V1"
	Means []EffectMean
	// F test of the slice; nil when not available.
	F, P  *float64
	DF    int
	DFDen *float64
	// SED and DF of a pair in the slice (equal pairs), or SEDRange.
	SED, SEDDF *float64
	SEDRange   *Range
}

// StratumResiduals are the residuals of one higher error stratum.
type StratumResiduals struct {
	Stratum            string // "error_a", ...
	Values             []float64
	DF                 int
	ShapiroW, ShapiroP *float64
}

// IsFactorial reports whether the result is of crossed treatment factors.
func (r *Result) IsFactorial() bool { return r != nil && r.Factorial != nil }

// Effect returns the effect with the given name, nil when there is none.
func (f *Factorial) Effect(name string) *Effect {
	if f == nil {
		return nil
	}
	for i := range f.Effects {
		if f.Effects[i].Name == name {
			return &f.Effects[i]
		}
	}
	return nil
}

// Line returns the line with the given source, nil when there is none.
func (f *Factorial) Line(source string) *Line {
	if f == nil {
		return nil
	}
	for i := range f.Lines {
		if f.Lines[i].Source == source {
			return &f.Lines[i]
		}
	}
	return nil
}

// Factor returns the factor with the given key, nil when there is none.
func (f *Factorial) Factor(key string) *FactorInfo {
	if f == nil {
		return nil
	}
	for i := range f.Factors {
		if f.Factors[i].Key == key {
			return &f.Factors[i]
		}
	}
	return nil
}

// structureOf is the error structure of a design with treatment factors.
func structureOf(k trial.DesignKind) (glm.Structure, error) {
	switch k {
	case trial.CRD, trial.RCBD:
		return glm.Factorial, nil
	case trial.SplitPlot:
		return glm.SplitPlot, nil
	case trial.StripPlot:
		return glm.StripPlot, nil
	}
	return 0, fmt.Errorf("a %s cannot hold crossed treatment factors; use a completely randomised design, randomised complete blocks, a split plot or a strip plot", k.Name())
}

// analyzeFactorial fits the model of crossed treatment factors to d (see
// package stats/glm) and fills r. r holds the options and counts already.
func analyzeFactorial(d *Data, o Options, r *Result) (*Result, error) {
	fail := func(msg string, err error) (*Result, error) {
		return nil, &Error{Trait: d.TraitKey, Msg: msg, Err: err}
	}
	structure, err := structureOf(d.Design)
	if err != nil {
		return fail(err.Error(), ErrUnknownDesign)
	}
	blocked := d.Design != trial.CRD
	if blocked && d.Block == nil {
		return fail(fmt.Sprintf("a %s needs the block of every plot", d.Design.Name()), stats.ErrNoData)
	}
	if d.Covariate != nil && structure != glm.Factorial {
		return fail(fmt.Sprintf("analysis of covariance can be used with crossed factors in a completely randomised design or in randomised complete blocks, not in a %s (its error strata would need a covariate term of their own); analyse this trait without the covariate", d.Design.Name()), nil)
	}
	k := len(d.Treatments)
	var y, x []float64
	var trt, plots, pidx, blk []int
	covLeft := 0
	lv := make([][]int, len(d.Factors))
	for i, v := range d.Values {
		if math.IsNaN(v) {
			r.Missing++
			continue
		}
		if dropMissingCovariate(d, i) {
			covLeft++
			continue
		}
		if d.Covariate != nil {
			x = append(x, d.Covariate[i])
		}
		y = append(y, v)
		trt = append(trt, d.Treatment[i])
		plots = append(plots, d.Plot[i])
		if d.PlotIndex != nil {
			pidx = append(pidx, d.PlotIndex[i])
		}
		if blocked {
			blk = append(blk, d.Block[i])
		}
		for f := range d.Factors {
			l := d.Factors[f].Index[i]
			if l < 0 || l >= len(d.Factors[f].Levels) {
				return fail(fmt.Sprintf("%s has no known level of factor %s; check its treatment", d.label(d.Plot[i]), d.Factors[f].Key), ErrUnknownDesign)
			}
			lv[f] = append(lv[f], l)
		}
	}
	r.N = len(y)
	r.PlotIndex = pidx
	if r.N == 0 {
		return fail("no values recorded for this trait yet", stats.ErrNoData)
	}
	counts := make([]int, k)
	for _, ti := range trt {
		counts[ti]++
	}
	for ti, c := range counts {
		if c == 0 {
			return fail(fmt.Sprintf("treatment %s has no values to analyse; enter its values or exclude it", d.Treatments[ti]), stats.ErrEmptyLevel)
		}
	}
	for i, v := range y {
		if math.IsInf(v, 0) {
			return fail(fmt.Sprintf("%s holds a value that is not a finite number", d.label(plots[i])), stats.ErrNonFiniteValue)
		}
	}
	if structure != glm.Factorial {
		// Each combination once per block: say which plots repeat one.
		seen := map[[2]int]int{}
		for i := range y {
			key := [2]int{blk[i], trt[i]}
			if j, ok := seen[key]; ok {
				return fail(fmt.Sprintf("%s and %s have the same treatment %s in the same block; a %s has each combination once per block", d.label(plots[j]), d.label(plots[i]), d.Treatments[trt[i]], d.Design.Name()), stats.ErrNoData)
			}
			seen[key] = i
		}
	}
	ty, offset, err := stats.ApplyTransform(o.Transform, y)
	if err != nil {
		return fail(describeStatsError(d, err, plots), err)
	}
	r.Offset = offset
	m := glm.Model{Response: ty, Structure: structure, Alpha: o.Alpha, LowerIsBetter: !d.HigherBetter, Covariate: x}
	if o.Transform == stats.NoTransform {
		// Values that share many leading digits are analysed as exact
		// decimal differences from one of them (trial.SharedDigits), as a
		// one-way layout's are.
		if origin, rest, ok := trial.SharedDigits(ty); ok {
			m.Response, m.Origin = rest, origin
		}
	}
	for f, fd := range d.Factors {
		m.Factors = append(m.Factors, glm.Factor{Name: fd.Key, Levels: fd.Levels, Index: lv[f]})
	}
	if blocked {
		labels := d.BlockLabels
		if len(labels) != d.Blocks {
			labels = make([]string, d.Blocks)
			for b := range labels {
				labels[b] = fmt.Sprintf("block %d", b+1)
			}
		}
		m.Block = &glm.Factor{Name: "block", Levels: labels, Index: blk}
	}
	g, err := glm.Fit(m)
	if err != nil {
		return fail(describeGLMError(d, err), err)
	}
	fr := &Factorial{Design: trial.DesignName(d.Design, true), Method: g.Method.String(), Balanced: g.Balanced}
	for _, fd := range d.Factors {
		fi := FactorInfo{Key: fd.Key, Name: fd.Name, Levels: fd.Levels}
		for l, c := range fd.Levels {
			name := c
			if l < len(fd.LevelNames) && fd.LevelNames[l] != "" {
				name = fd.LevelNames[l]
			}
			fi.LevelNames = append(fi.LevelNames, name)
		}
		fr.Factors = append(fr.Factors, fi)
	}
	r.Factorial = fr
	keys := func(idx []int) []string {
		out := make([]string, len(idx))
		for i, f := range idx {
			out[i] = d.Factors[f].Key
		}
		return out
	}
	back := func(v float64) float64 { return stats.BackTransform(o.Transform, v, offset) }
	for _, l := range g.Lines {
		ln := Line{Source: l.Source, DF: l.DF, ErrorTerm: l.ErrorTerm}
		switch {
		case l.Role == glm.RoleBlock:
			ln.Role = stats.RoleBlock
		case l.Role == glm.RoleTreatment && len(l.Factors) > 1:
			ln.Role, ln.Factors = stats.RoleInteraction, keys(l.Factors)
		case l.Role == glm.RoleTreatment:
			ln.Role, ln.Factors = stats.RoleFactor, keys(l.Factors)
		case l.Role == glm.RoleError && l.Stratum():
			ln.Role = stats.RoleErrorStratum
		case l.Role == glm.RoleError:
			ln.Role = stats.RoleError
		case l.Role == glm.RoleCovariate:
			ln.Role = stats.RoleCovariate
		default:
			ln.Role = stats.RoleTotal
		}
		if l.HasSS {
			ln.SS = ptr(l.SS)
			if ln.Role != stats.RoleTotal {
				ln.MS = ptr(l.MS)
			}
		}
		if l.HasTest {
			ln.F, ln.P, ln.DFDen = ptr(l.F), ptr(l.P), ptr(l.DFDen)
		}
		if l.HasCV {
			ln.CVPercent = ptr(l.CVPercent)
		}
		fr.Lines = append(fr.Lines, ln)
	}
	for _, c := range g.VarianceComponents {
		fr.Components = append(fr.Components, Component{Name: c.Name, Variance: c.Variance, Truncated: c.Truncated})
	}
	for _, s := range g.SEDs {
		fr.SEDs = append(fr.SEDs, SED{Key: s.Key, Effect: s.Effect, Differ: keys(s.Differ), Label: s.Label,
			SED: s.SED, Min: s.Min, Max: s.Max, DF: s.DF, Pairs: s.Pairs})
	}
	var lettersNotes []string
	for _, e := range g.Effects {
		fe := Effect{Name: e.Name, Factors: keys(e.Factors), Significant: e.Significant, Note: sentence(e.Note)}
		if e.HasTest {
			fe.P = ptr(e.P)
		}
		fe.Means = effectMeans(d, e.Factors, e.Means, e.Comparison, o.Transform != stats.NoTransform, back)
		if c := e.Comparison; c != nil {
			fe.LettersGiven = c.LettersLSD != nil
			sedStats(c, len(e.Means), &fe.SED, &fe.DF, &fe.SEDRange, &fe.LSD, &fe.HSD, o.Alpha)
			if c.LettersLSD == nil && c.NoteLSD != "" {
				lettersNotes = append(lettersNotes, fmt.Sprintf("%s: %s", e.Name, sentence(c.NoteLSD)))
			}
		}
		fr.Effects = append(fr.Effects, fe)
	}
	for _, s := range g.Slices {
		fs := Slice{Effect: s.Effect, Factor: d.Factors[s.Factor].Key, Name: s.Name, At: map[string]string{}, DF: s.DF}
		eff, _ := g.Effect(s.Effect)
		for k, f := range eff.Factors {
			if f != s.Factor && k < len(s.At) && s.At[k] >= 0 {
				fs.At[d.Factors[f].Key] = d.Factors[f].Levels[s.At[k]]
			}
		}
		if s.HasTest {
			fs.F, fs.P, fs.DFDen = ptr(s.F), ptr(s.P), ptr(s.DFDen)
		}
		fs.Means = effectMeans(d, nil, s.Means, s.Comparison, o.Transform != stats.NoTransform, back)
		for i := range fs.Means {
			// A slice's means are the compared factor's levels in order.
			fs.Means[i].Levels = []string{d.Factors[s.Factor].Levels[i]}
		}
		if s.Comparison != nil {
			var lsd, hsd *float64
			sedStats(s.Comparison, len(s.Means), &fs.SED, &fs.SEDDF, &fs.SEDRange, &lsd, &hsd, o.Alpha)
		}
		fr.Slices = append(fr.Slices, fs)
	}
	for _, u := range g.UnitResiduals {
		sr := StratumResiduals{Stratum: u.Stratum, Values: u.Values, DF: u.DF}
		if u.DF >= 3 {
			if sw, err := shapiro(u.Values); err == nil {
				sr.ShapiroW, sr.ShapiroP = ptr(sw[0]), ptr(sw[1])
			}
		}
		fr.StratumResiduals = append(fr.StratumResiduals, sr)
	}

	// The treatment combinations as one list: the means of the highest
	// interaction, in the order of d.Treatments.
	top := &g.Effects[len(g.Effects)-1]
	if len(top.Factors) != len(d.Factors) {
		return fail("the model has no term for the treatment combinations", stats.ErrNoData)
	}
	combo := func(ti int) int {
		// Observations of treatment ti share their levels; read them off
		// the first one.
		for i, t := range trt {
			if t == ti {
				idx := 0
				for f := range d.Factors {
					idx = idx*len(d.Factors[f].Levels) + lv[f][i]
				}
				return idx
			}
		}
		return -1
	}
	if err := comboMeans(r, d, top, combo, o, back); err != nil {
		return fail(err.Error(), err)
	}
	if g.Covariate != nil {
		if err := factorialCovariate(r, d, g, combo, covLeft, o); err != nil {
			return fail(err.Error(), err)
		}
	}
	r.ANOVA = factorialANOVA(g, r, m.Response, m.Origin)
	if d.PercentOfCheck {
		percentOfCheck(r)
	}
	factorialDiagnostics(r, d, g, ty, y, trt, plots)
	r.Notes = append(r.Notes, lettersNotes...)
	for _, e := range fr.Effects {
		if e.Significant && e.Note != "" {
			r.Notes = append(r.Notes, e.Note)
		}
	}
	if g.Covariate == nil {
		// With a covariate, covariateNotes says what glm's note says.
		for _, n := range g.Notes {
			r.Notes = append(r.Notes, sentence(n))
		}
	}
	notes(r, d, r.ANOVA)
	return r, nil
}

// comboMeans fills r.Means, r.Pairs, LSD and HSD from the effect of all
// factors (the treatment combinations).
func comboMeans(r *Result, d *Data, top *glm.Effect, combo func(int) int, o Options, back func(float64) float64) error {
	k := len(d.Treatments)
	at := make([]int, k) // combination index of each treatment
	pos := map[int]int{} // treatment of each combination index
	for ti := range k {
		at[ti] = combo(ti)
		if at[ti] < 0 || at[ti] >= len(top.Means) || !top.Means[at[ti]].Estimable {
			return fmt.Errorf("the mean of treatment %s cannot be estimated from the plots present", d.Treatments[ti])
		}
		pos[at[ti]] = ti
	}
	r.Means = make([]Mean, k)
	c := top.Comparison
	// One t quantile per df, with the df taken to 6 decimals (finer than
	// a Satterthwaite df is known: the REML optimum is good to about 1e-6):
	// pairs of a factorial share the error df, pairs of a REML fit share a
	// few values up to rounding, and each quantile costs more than all the
	// rest of a pair.
	tByDF := map[float64]float64{}
	tc := func(df float64) float64 {
		key := math.Round(df*1e6) / 1e6
		v, ok := tByDF[key]
		if !ok {
			v = tCrit(o.Alpha, df)
			tByDF[key] = v
		}
		return v
	}
	for ti := range k {
		gm := top.Means[at[ti]]
		mn := Mean{Treatment: d.Treatments[ti], N: gm.N, Mean: gm.Mean, RawMean: gm.RawMean, SE: gm.SE, BackMean: back(gm.Mean)}
		if d.Names != nil {
			mn.Name = d.Names[ti]
		}
		if d.Checks != nil {
			mn.Check = d.Checks[ti]
		}
		if gm.DF > 0 {
			t := tc(gm.DF)
			lo, hi := backLimits(o.Transform, gm.Mean-t*gm.SE, gm.Mean+t*gm.SE, r.Offset)
			mn.Lower, mn.Upper = &lo, &hi
		}
		if c != nil {
			if c.LettersLSD != nil {
				mn.LettersLSD = c.LettersLSD[at[ti]]
			}
			if c.LettersTukey != nil {
				mn.LettersTukey = c.LettersTukey[at[ti]]
			}
		}
		r.Means[ti] = mn
	}
	if c == nil {
		return fmt.Errorf("the treatment combinations cannot be compared with the plots present")
	}
	r.LSDLettersGiven = c.LettersLSD != nil
	q := 0.0
	if c.TukeyDF > 0 {
		q = dist.CachedSurvivalTable(len(top.Means), c.TukeyDF).Quantile(1 - o.Alpha)
	}
	var lsd, hsd Range
	for n, p := range c.Pairs {
		a, aok := pos[p.I]
		b, bok := pos[p.J]
		if !aok || !bok {
			continue
		}
		tc := tc(p.DF)
		pr := Pair{A: d.Treatments[a], B: d.Treatments[b], Diff: p.Diff, SE: p.SE, Lower: p.Diff - tc*p.SE, Upper: p.Diff + tc*p.SE,
			PLSD: p.PLSD, PTukey: p.PTukey, LSD: tc * p.SE, HSD: q * p.SE / math.Sqrt2}
		r.Pairs = append(r.Pairs, pr)
		if n == 0 || len(r.Pairs) == 1 {
			lsd, hsd = Range{pr.LSD, pr.LSD}, Range{pr.HSD, pr.HSD}
			continue
		}
		lsd = Range{math.Min(lsd.Min, pr.LSD), math.Max(lsd.Max, pr.LSD)}
		hsd = Range{math.Min(hsd.Min, pr.HSD), math.Max(hsd.Max, pr.HSD)}
	}
	if len(r.Pairs) > 0 && finite(lsd.Min) && finite(hsd.Max) {
		r.LSDRange, r.HSDRange = &lsd, &hsd
	}
	if c.EqualSED {
		r.LSD = ptr(c.LSD)
		r.HSD = ptr(c.HSD)
	}
	return nil
}

// effectMeans turns a glm effect's (or slice's) means into level codes.
func effectMeans(d *Data, factors []int, means []glm.Mean, c *glm.Comparison, transformed bool, back func(float64) float64) []EffectMean {
	out := make([]EffectMean, len(means))
	for i, gm := range means {
		em := EffectMean{N: gm.N}
		for k, f := range factors {
			if k < len(gm.Levels) {
				em.Levels = append(em.Levels, d.Factors[f].Levels[gm.Levels[k]])
			}
		}
		if gm.Estimable {
			em.Mean, em.SE = ptr(gm.Mean), ptr(gm.SE)
			if gm.DF > 0 {
				em.DF = ptr(gm.DF)
			}
			if transformed {
				em.BackMean = ptr(back(gm.Mean))
			}
		}
		if gm.N > 0 {
			em.RawMean = ptr(gm.RawMean)
		}
		if c != nil {
			if c.LettersLSD != nil {
				em.LettersLSD = c.LettersLSD[i]
			}
			if c.LettersTukey != nil {
				em.LettersTukey = c.LettersTukey[i]
			}
		}
		out[i] = em
	}
	return out
}

// sedStats reads a comparison's SED, df, LSD and HSD (equal pairs) or the
// range of its SEDs.
func sedStats(c *glm.Comparison, k int, sed, df **float64, rng **Range, lsd, hsd **float64, alpha float64) {
	if c.EqualSED {
		*sed, *df = ptr(c.SED), ptr(c.DF)
		if finite(c.LSD) && c.LSD > 0 {
			*lsd = ptr(c.LSD)
		}
		if finite(c.HSD) && c.HSD > 0 {
			*hsd = ptr(c.HSD)
		}
		return
	}
	if len(c.Pairs) == 0 {
		return
	}
	lo, hi := c.Pairs[0].SE, c.Pairs[0].SE
	for _, p := range c.Pairs {
		lo, hi = math.Min(lo, p.SE), math.Max(hi, p.SE)
	}
	*rng = &Range{lo, hi}
}

// factorialANOVA is the stats.ANOVA view of a factorial analysis, for
// the views that read one: the lines with their roles (no sums of squares
// for REML), the grand mean, the error of the lowest stratum, the
// residuals within it and the combination means.
// y are the responses as fitted (less origin, the part taken away exactly:
// glm.Model.Origin).
func factorialANOVA(g *glm.Result, r *Result, y []float64, origin float64) *stats.ANOVA {
	a := &stats.ANOVA{N: g.N, GrandMean: g.GrandMean, DFError: g.ResidualDF, Balanced: g.Balanced,
		Adjusted: g.Method == glm.SumsOfSquares && (!g.Balanced || g.Covariate != nil), Fitted: g.Fitted, Residuals: g.Residuals}
	for _, l := range r.Factorial.Lines {
		s := stats.Source{Name: l.Source, Role: l.Role, DF: l.DF}
		if l.SS != nil {
			s.SS = *l.SS
		}
		if l.MS != nil {
			s.MS = *l.MS
		}
		if l.F != nil {
			s.HasTest, s.F, s.P = true, *l.F, *l.P
		}
		a.Sources = append(a.Sources, s)
	}
	// The lowest stratum's error mean square: the last error line, or the
	// residual variance of REML.
	mse := math.NaN()
	for _, l := range r.Factorial.Lines {
		if l.Role.IsError() && l.MS != nil {
			mse = *l.MS
		}
	}
	if c, ok := g.Component("residual"); ok && math.IsNaN(mse) {
		mse = c.Variance
	}
	if finite(mse) && mse >= 0 {
		a.MSE, a.RootMSE = mse, math.Sqrt(mse)
		if g.GrandMean != 0 {
			a.CVPercent = 100 * a.RootMSE / math.Abs(g.GrandMean)
		}
	}
	var sse, sst float64
	for i, e := range g.Residuals {
		sse += e * e
		dv := y[g.Obs[i]] - (g.GrandMean - origin)
		sst += dv * dv
	}
	if sst > 0 {
		a.RSquared = 1 - sse/sst
	}
	for _, m := range r.Means {
		a.Means = append(a.Means, stats.LevelMean{N: m.N, Mean: m.Mean, RawMean: m.RawMean, SE: m.SE})
	}
	return a
}

// factorialDiagnostics runs the model checks on the residuals within the
// lowest stratum, grouped by treatment combination for the variance tests.
func factorialDiagnostics(r *Result, d *Data, g *glm.Result, ty, y []float64, trt, plots []int) {
	dg := &r.Diagnostics
	a := r.ANOVA
	sum := diag.Summary{HasCV: a.CVPercent > 0, CVPercent: a.CVPercent}
	res := g.Residuals
	if sw, err := shapiro(res); err == nil {
		dg.ShapiroW, dg.ShapiroP = ptr(sw[0]), ptr(sw[1])
		sum.HasNormality, sum.NormalityW, sum.NormalityP = true, sw[0], sw[1]
	}
	grp := make([]int, len(res))
	for i, o := range g.Obs {
		grp[i] = trt[o]
	}
	if lv, err := diag.Levene(res, grp, len(d.Treatments), diag.Median); err == nil && finite(lv.F) && finite(lv.P) {
		dg.LeveneF, dg.LeveneP, dg.VarianceOn = ptr(lv.F), ptr(lv.P), "residuals"
		sum.HasEqualVariance, sum.LeveneF, sum.EqualVarianceP, sum.VarianceOn = true, lv.F, lv.P, "residuals"
	}
	if bt, err := diag.Bartlett(res, grp, len(d.Treatments)); err == nil && finite(bt.ChiSquare) && finite(bt.P) {
		dg.BartlettK2, dg.BartlettP, dg.VarianceOn = ptr(bt.ChiSquare), ptr(bt.P), "residuals"
		sum.HasBartlett, sum.BartlettK2, sum.BartlettP, sum.VarianceOn = true, bt.ChiSquare, bt.P, "residuals"
	}
	// Standardised by the residual df: e/√(RSS/n) scaled by √(n/df), the
	// exact studentisation when every plot has the same leverage 1 − df/n
	// (balanced data), an approximation otherwise.
	n := len(res)
	if df := g.ResidualDF; df > 0 && n > 0 {
		var rss float64
		for _, e := range res {
			rss += e * e
		}
		s := math.Sqrt(rss / float64(df) * float64(df) / float64(n))
		if s > 0 {
			dg.StandardizedResiduals = make([]float64, n)
			for i, e := range res {
				dg.StandardizedResiduals[i] = e / s
			}
			outs := diag.Outliers(dg.StandardizedResiduals, 0)
			for i := range outs {
				ob := &outs[i]
				o := g.Obs[ob.Index]
				lbl := d.label(plots[o])
				ob.Plot = fmt.Sprintf("%s%s (%s, value %s)", strings.ToUpper(lbl[:1]), lbl[1:], d.Treatments[trt[o]],
					fmtValue(y[o], d.Decimals))
				dg.Outliers = append(dg.Outliers, Outlier{Plot: plots[o], Treatment: d.Treatments[trt[o]], Value: y[o], Residual: res[ob.Index], StdResidual: ob.Std})
			}
			sum.Outliers = outs
		}
	}
	dg.Readings = diag.Readings(sum)
	for _, sr := range r.Factorial.StratumResiduals {
		if sr.ShapiroW == nil {
			continue
		}
		flag := *sr.ShapiroP < diag.CheckAlpha
		word := "do not depart from a normal distribution"
		if flag {
			word = "depart from a normal distribution"
		}
		dg.Readings = append(dg.Readings, diag.Reading{Check: "normality", Flagged: flag,
			Text: fmt.Sprintf("The residuals of %s (one per unit) %s at the %g level (Shapiro–Wilk W %.4f, p %s).", strings.ReplaceAll(sr.Stratum, "_", " "), word, diag.CheckAlpha, *sr.ShapiroW, stats.FormatP(*sr.ShapiroP))})
	}
}

// describeGLMError puts an error of the factorial model in the trial's
// words.
func describeGLMError(d *Data, err error) string {
	if ge, ok := err.(*glm.Error); ok {
		return sentence(ge.Reason)
	}
	return err.Error()
}

// sentence starts s with a capital letter and ends it with a full stop.
func sentence(s string) string {
	s = strings.TrimSpace(s)
	if s == "" {
		return ""
	}
	r, n := utf8.DecodeRuneInString(s)
	s = string(unicode.ToUpper(r)) + s[n:]
	if !strings.HasSuffix(s, ".") {
		s += "."
	}
	return s
}

// tCrit is the two-sided critical t value at alpha with df degrees of
// freedom (the half-width of glm's interval for a unit standard error).
func tCrit(alpha, df float64) float64 {
	_, hi := glm.Pair{SE: 1, DF: df}.Interval(alpha)
	return hi
}

// shapiro is the Shapiro–Wilk W and p of v.
func shapiro(v []float64) ([2]float64, error) {
	sw, err := diag.ShapiroWilk(v)
	if err != nil {
		return [2]float64{}, err
	}
	return [2]float64{sw.W, sw.P}, nil
}

// fmtValue writes a recorded value with its trait's decimals.
func fmtValue(v float64, decimals int) string {
	return strconv.FormatFloat(v, 'f', max(decimals, 0), 64)
}

// factorsFromTrial sets d.Factors from the trial's factors in design
// order and returns each one's level for every plot of the trial.
func factorsFromTrial(t *trial.Trial, d *Data) [][]int {
	var out [][]int
	for _, f := range t.Design.FactorOrder(t.Factors) {
		tf := t.Factors[f]
		fd := FactorData{Key: tf.Key, Name: tf.Name}
		for _, l := range tf.Levels {
			fd.Levels = append(fd.Levels, l.Code)
			fd.LevelNames = append(fd.LevelNames, l.Name)
		}
		d.Factors = append(d.Factors, fd)
		out = append(out, t.PlotLevels(f))
	}
	return out
}
