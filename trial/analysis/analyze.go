package analysis

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sort"
	"strconv"
	"strings"

	"furlong/stats"
	"furlong/stats/diag"
	"furlong/stats/meansep"
	"furlong/trial"
)

// Data is one response classified by the factors of a design: the input of
// AnalyzeData. Analyze builds it from a trial; the CLI builds it from a CSV
// file. Observations with a NaN value are counted as missing and left out.
type Data struct {
	TraitKey     string
	TraitName    string
	Unit         string
	Decimals     int
	HigherBetter bool
	Kind         trial.TraitKind
	// Transform is the scale the trait is analysed on (the trait's setting
	// in the trial); Options.Transform, when set, overrides it.
	Transform stats.Transform
	// PercentOfCheck asks for each mean as a percentage of the mean of the
	// check entries (Checks).
	PercentOfCheck bool

	Design trial.DesignKind
	// Treatments are the treatment labels in report order; Names and
	// Checks (optional, same length) describe them.
	Treatments []string
	Names      []string
	Checks     []bool
	// Per observation: treatment index, value, and the plot label used in
	// messages (the plot number, or the input line).
	Treatment []int
	Values    []float64
	Plot      []int
	// Blocks for an RCBD (Blocks levels, Block[i] in [0, Blocks)); rows and
	// columns for a Latin square.
	Block       []int
	Blocks      int
	BlockLabels []string // optional, for messages
	Row, Column []int
	Rows, Cols  int
	// Excluded plots (already left out of the slices above).
	Excluded []Excluded
	// Lines is true when Plot holds input line numbers (a CSV table)
	// rather than plot numbers; messages then say "line".
	Lines bool
	// PlotIndex[i], when set, is the index of observation i in the trial's
	// plots (Result.PlotIndex keeps the fitted ones).
	PlotIndex []int
	// Factors, when set, are the crossed treatment factors in design order
	// (a split plot's main-plot factor first); Treatments are then their
	// combinations and Design CRD, RCBD, SplitPlot or StripPlot.
	Factors []FactorData
	// Untreated is the code of the untreated check ("" for none) and
	// PreCount, when set, the pre-treatment count of every observation
	// (aligned with Values, NaN when missing): see Result.Efficacy.
	Untreated string
	PreCount  []float64

	preCountKey string

	// Covariate, when set, holds a covariate's value per observation (NaN
	// missing): the trait is then analysed by analysis of covariance
	// (Result.Covariate). CovariateKey and CovariateName name it.
	Covariate     []float64
	CovariateKey  string
	CovariateName string
}

// Error is a trait that could not be analysed, with the reason in plain words.
type Error struct {
	Trait string // the trait's key, "" when not known
	Msg   string // the reason, in plain words
	Err   error  // the underlying cause, for errors.Is
}

// Error returns the reason, led by the trait when it is known.
func (e *Error) Error() string {
	if e.Trait == "" {
		return e.Msg
	}
	return e.Trait + ": " + e.Msg
}

// Unwrap returns the underlying cause.
func (e *Error) Unwrap() error { return e.Err }

// ErrNoTrait is returned for a trait key the trial does not have.
var ErrNoTrait = errors.New("the trial has no trait with that key")

// ErrUnknownDesign is returned for a trial whose design kind Furlong does
// not know: it is never analysed as another design.
var ErrUnknownDesign = errors.New("the design is not one Furlong knows")

// DefaultAlpha is the significance level used when Options.Alpha is zero.
const DefaultAlpha = 0.05

// Analyze analyses one trait of a trial with the ANOVA of its design, on
// the trait's own scale (unless o.Transform says otherwise) and read with
// the trial's mean-separation method (unless o.Method says otherwise).
func Analyze(t *trial.Trial, key string, o Options) (*Result, error) {
	d, err := FromTrial(t, key)
	if err != nil {
		return nil, err
	}
	// The covariate: the one asked for, else the trait's own (saved with
	// it); NoCovariate asks for none. The covariate trait itself is
	// analysed as it is.
	cov := o.Covariate
	if cov == "" {
		if tr := t.Trait(key); tr != nil {
			cov = tr.Covariate
		}
	}
	if cov != "" && cov != NoCovariate && cov != key {
		if err := attachCovariate(t, d, cov); err != nil {
			return nil, err
		}
	}
	if o.Method == "" {
		o.Method = meansep.Method(t.MeanSeparation())
	}
	if err := preCounts(t, d); err != nil {
		return nil, err
	}
	r, err := AnalyzeData(d, o)
	if err == nil {
		efficacy(r, d)
	}
	return r, err
}

// Outcome is the analysis of one trait: a result or the reason there is none.
type Outcome struct {
	Key    string
	Result *Result
	Err    error
}

// AnalyzeAll analyses every trait of the trial (or those named in keys) and
// returns the outcomes in that order. It is the one loop behind every view
// of a trial's results (the command line's report, the window's Compare
// and Report steps); each trait is analysed as Analyze does. A trait that cannot be analysed gets
// its error in the outcome; the others are unaffected. Traits are analysed
// concurrently, one worker per processor; t must not change meanwhile. It
// stops early when ctx is cancelled and returns ctx's error.
func AnalyzeAll(ctx context.Context, t *trial.Trial, keys []string, o Options) ([]Outcome, error) {
	if len(keys) == 0 {
		for _, tr := range t.Traits {
			keys = append(keys, tr.Key)
		}
	}
	out := make([]Outcome, len(keys))
	next := make(chan int)
	// A panic in a worker is raised again here, on the caller's goroutine,
	// where the program's crash handler sees it.
	var workers trial.Workers
	for w := 0; w < min(runtime.GOMAXPROCS(0), len(keys)); w++ {
		workers.Go(func() {
			defer func() {
				// Keep the feeder from blocking on a worker that died.
				for range next {
				}
			}()
			for i := range next {
				r, err := Analyze(t, keys[i], o)
				out[i] = Outcome{Key: keys[i], Result: r, Err: err}
			}
		})
	}
	var err error
feed:
	for i := range keys {
		select {
		case next <- i:
		case <-ctx.Done():
			err = ctx.Err()
			break feed
		}
	}
	close(next)
	workers.Wait()
	if err != nil {
		return nil, err
	}
	return out, nil
}

// FromTrial classifies one trait's values by the trial's design, leaving out
// missing values and excluded plots.
func FromTrial(t *trial.Trial, key string) (*Data, error) {
	tr := t.Trait(key)
	if tr == nil {
		return nil, &Error{Trait: key, Msg: "the trial has no trait with this key", Err: ErrNoTrait}
	}
	vals, err := t.TraitValues(key)
	if err != nil {
		return nil, &Error{Trait: key, Msg: err.Error(), Err: err}
	}
	d := &Data{
		TraitKey: tr.Key, TraitName: tr.Name, Unit: tr.Unit, Decimals: tr.Decimals,
		HigherBetter: tr.HigherBetter, Kind: tr.Kind, Design: t.Design.Kind,
		Transform: stats.Transform(tr.Transform), PercentOfCheck: t.ShowsPercentOfCheck(key),
		Untreated: t.Untreated(),
	}
	for _, trt := range t.Treatments {
		d.Treatments = append(d.Treatments, trt.Code)
		d.Names = append(d.Names, trt.Name)
		d.Checks = append(d.Checks, trt.Role == trial.RoleCheck)
	}
	// Blocks, rows and columns become factor levels 0, 1, ... in the order
	// of their numbers, whatever the numbers are (blocks 1, 2, 3 and 9 are
	// four blocks, named by their numbers in messages).
	var blockLevel, rowLevel, colLevel map[int]int
	switch t.Design.Kind {
	case trial.CRD:
	case trial.RCBD:
		var nums []int
		blockLevel, nums = levelsOf(t.Plots, func(p trial.Plot) int { return p.Block })
		d.Blocks = len(nums)
		for _, b := range nums {
			d.BlockLabels = append(d.BlockLabels, fmt.Sprintf("block %d", b))
		}
	case trial.Latin:
		var rows, cols []int
		rowLevel, rows = levelsOf(t.Plots, func(p trial.Plot) int { return p.Row })
		colLevel, cols = levelsOf(t.Plots, func(p trial.Plot) int { return p.Column })
		d.Rows, d.Cols = len(rows), len(cols)
	case trial.SplitPlot, trial.StripPlot:
		// Analysing such a trial as one list of treatments would test the
		// main-plot factor against the wrong error, so it needs factors.
		if !t.Factorial() {
			return nil, &Error{Trait: key, Msg: fmt.Sprintf("this trial is a %s but has no treatment factors; give it its factors and levels", t.Design.Kind.Name()), Err: ErrUnknownDesign}
		}
		var nums []int
		blockLevel, nums = levelsOf(t.Plots, func(p trial.Plot) int { return p.Block })
		d.Blocks = len(nums)
		for _, b := range nums {
			d.BlockLabels = append(d.BlockLabels, fmt.Sprintf("block %d", b))
		}
	default:
		return nil, &Error{Trait: key, Msg: fmt.Sprintf("the design kind %q is not one Furlong knows, so the trial cannot be analysed; it may come from a newer Furlong", string(t.Design.Kind)), Err: ErrUnknownDesign}
	}
	var plotLevels [][]int
	if t.Factorial() {
		plotLevels = factorsFromTrial(t, d)
	}
	for i, p := range t.Plots {
		if ex, reason := t.Excluded(i, key); ex {
			d.Excluded = append(d.Excluded, Excluded{Plot: p.Number, Reason: reason})
			continue
		}
		ti := t.TreatmentIndex(p.Treatment)
		if ti < 0 {
			return nil, &Error{Trait: key, Msg: fmt.Sprintf("plot %d has treatment %q, which the trial does not list", p.Number, p.Treatment)}
		}
		d.Treatment = append(d.Treatment, ti)
		d.Values = append(d.Values, vals[i])
		d.Plot = append(d.Plot, p.Number)
		d.PlotIndex = append(d.PlotIndex, i)
		for f := range plotLevels {
			d.Factors[f].Index = append(d.Factors[f].Index, plotLevels[f][i])
		}
		switch t.Design.Kind {
		case trial.RCBD, trial.SplitPlot, trial.StripPlot:
			d.Block = append(d.Block, blockLevel[p.Block])
		case trial.Latin:
			d.Row = append(d.Row, rowLevel[p.Row])
			d.Column = append(d.Column, colLevel[p.Column])
		}
	}
	return d, nil
}

// levelsOf maps the distinct numbers key gives the plots to 0, 1, ... in
// increasing order, and returns the numbers in that order.
func levelsOf(plots []trial.Plot, key func(trial.Plot) int) (map[int]int, []int) {
	level := map[int]int{}
	var nums []int
	for _, p := range plots {
		if _, ok := level[key(p)]; !ok {
			level[key(p)] = 0
			nums = append(nums, key(p))
		}
	}
	slices.Sort(nums)
	for i, n := range nums {
		level[n] = i
	}
	return level, nums
}

// AnalyzeData fits the design's model to d and separates the means.
func AnalyzeData(d *Data, o Options) (*Result, error) {
	if o.Alpha == 0 {
		o.Alpha = DefaultAlpha
	}
	if !(o.Alpha > 0 && o.Alpha < 1) {
		return nil, &Error{Trait: d.TraitKey, Msg: fmt.Sprintf("the significance level must be between 0 and 1, not %g", o.Alpha)}
	}
	if o.Transform == stats.NoTransform {
		o.Transform = d.Transform
	}
	switch o.Method {
	case "":
		o.Method = meansep.LSD
	case meansep.LSD, meansep.Tukey:
	default:
		return nil, &Error{Trait: d.TraitKey, Msg: fmt.Sprintf("the mean-separation method %q is not known; use lsd or tukey", string(o.Method))}
	}
	k := len(d.Treatments)
	r := &Result{
		TraitKey: d.TraitKey, TraitName: d.TraitName, Unit: d.Unit, Decimals: d.Decimals,
		HigherBetter: d.HigherBetter, Design: d.Design, Alpha: o.Alpha, Method: o.Method, Transform: o.Transform,
		Excluded: d.Excluded, Untreated: d.Untreated,
	}
	if len(d.Factors) > 0 {
		return analyzeFactorial(d, o, r)
	}
	var x []float64
	covLeft := 0
	// Keep the observations with values.
	var y []float64
	var trt, blk, row, col, plots, pidx []int
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
		switch d.Design {
		case trial.RCBD:
			blk = append(blk, d.Block[i])
		case trial.Latin:
			row = append(row, d.Row[i])
			col = append(col, d.Column[i])
		}
	}
	r.N = len(y)
	r.PlotIndex = pidx
	fail := func(msg string, err error) (*Result, error) {
		return nil, &Error{Trait: d.TraitKey, Msg: msg, Err: err}
	}
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

	ty, offset, err := stats.ApplyTransform(o.Transform, y)
	if err != nil {
		return fail(describeStatsError(d, err, plots), err)
	}
	m := stats.Model{Response: ty, Treatment: stats.Factor{Name: "treatment", Levels: k, Index: trt}}
	if o.Transform == stats.NoTransform {
		// Values that share many leading digits are analysed as exact
		// decimal differences from one of them, so none of their digits
		// is lost to float64 rounding (trial.SharedDigits).
		if origin, rest, ok := trial.SharedDigits(ty); ok {
			m.Response, m.Origin = rest, origin
		}
	}
	switch d.Design {
	case trial.RCBD:
		m.Nuisance = []stats.Factor{{Name: "block", Role: stats.RoleBlock, Levels: d.Blocks, Index: blk}}
	case trial.Latin:
		m.Nuisance = []stats.Factor{
			{Name: "row", Role: stats.RoleRow, Levels: d.Rows, Index: row},
			{Name: "column", Role: stats.RoleColumn, Levels: d.Cols, Index: col},
		}
	}
	var a *stats.ANOVA
	if d.Covariate != nil {
		a, err = fitCovariate(r, d, m, x, o)
		if err == nil {
			r.Covariate.Left = covLeft
		}
	} else {
		a, err = stats.Fit(m)
	}
	if err != nil {
		return fail(describeStatsError(d, err, plots), err)
	}
	r.ANOVA = a
	r.Offset = offset

	r.Means = make([]Mean, k)
	lsm := make([]float64, k)
	for i := range r.Means {
		lm := a.Means[i]
		mn := Mean{
			Treatment: d.Treatments[i], N: lm.N, Mean: lm.Mean, RawMean: lm.RawMean, SE: lm.SE,
			BackMean: stats.BackTransform(o.Transform, lm.Mean, offset),
		}
		if d.Names != nil {
			mn.Name = d.Names[i]
		}
		if d.Checks != nil {
			mn.Check = d.Checks[i]
		}
		r.Means[i] = mn
		lsm[i] = lm.Mean
	}
	tcrit, err := separate(r, a, lsm, o)
	if err != nil {
		return fail(err.Error(), err)
	}
	for i := range r.Means {
		mn := &r.Means[i]
		if tcrit > 0 && finite(mn.SE) {
			lo, hi := backLimits(o.Transform, mn.Mean-tcrit*mn.SE, mn.Mean+tcrit*mn.SE, offset)
			mn.Lower, mn.Upper = &lo, &hi
		}
	}
	if d.PercentOfCheck {
		percentOfCheck(r)
	}
	diagnose(r, d, a, ty, y, trt, blk, plots)
	notes(r, d, a)
	return r, nil
}

// backLimits maps confidence limits on the analysis scale back to the
// original scale. Limits outside the transformation's range are first
// brought to its edge (a negative square root to 0, an angle to 0–90°):
// common practice, since squaring a negative limit would turn it into a
// positive one.
func backLimits(t stats.Transform, lo, hi, offset float64) (float64, float64) {
	switch t {
	case stats.Sqrt:
		lo, hi = math.Max(lo, 0), math.Max(hi, 0)
	case stats.ArcsineSqrt:
		lo, hi = math.Min(math.Max(lo, 0), 90), math.Min(math.Max(hi, 0), 90)
	}
	return stats.BackTransform(t, lo, offset), stats.BackTransform(t, hi, offset)
}

// percentOfCheck sets each mean as a percentage of the mean of the check
// entries (the plain average of their back-transformed means, common
// practice in variety trial reports), when there are checks and their mean
// is above 0.
func percentOfCheck(r *Result) {
	var sum float64
	var n int
	for _, m := range r.Means {
		if m.Check && finite(m.BackMean) {
			sum += m.BackMean
			n++
		}
	}
	if n == 0 || !(sum > 0) {
		return
	}
	cm := sum / float64(n)
	r.CheckMean = &cm
	for i := range r.Means {
		if b := r.Means[i].BackMean; finite(b) {
			p := 100 * b / cm
			r.Means[i].PercentOfCheck = &p
		}
	}
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// describeStatsError puts a stats input error in the trial's words.
func describeStatsError(d *Data, err error, plots []int) string {
	var ie *stats.InputError
	if !errors.As(err, &ie) {
		return err.Error()
	}
	switch {
	case ie.Kind == stats.EmptyLevel && ie.Factor == "treatment" && ie.Level >= 0 && ie.Level < len(d.Treatments):
		return fmt.Sprintf("treatment %s has no values to analyse", d.Treatments[ie.Level])
	case ie.Kind == stats.EmptyLevel && ie.Factor == "block" && ie.Level >= 0:
		name := fmt.Sprintf("block %d", ie.Level+1)
		if ie.Level < len(d.BlockLabels) {
			name = d.BlockLabels[ie.Level]
		}
		return fmt.Sprintf("%s has no values at all: a block needs at least one plot with a value", name)
	case ie.Kind == stats.EmptyLevel && (ie.Factor == "row" || ie.Factor == "column") && ie.Level >= 0:
		return fmt.Sprintf("Latin square %s %d has no values at all: every row and column of the square needs at least one plot with a value", ie.Factor, ie.Level+1)
	case ie.Obs >= 0 && ie.Obs < len(plots):
		return fmt.Sprintf("%s: %s", d.label(plots[ie.Obs]), ie.Reason)
	}
	return ie.Reason
}

// diagnose runs the diagnostics on the analysed values ty (y before any
// transformation) and reads them in words (diag.Readings, at
// diag.CheckAlpha). The variance tests group by treatment: the values of a
// one-way layout, the residuals of a blocked design (its values also
// differ by block and row or column, which the residuals have taken out).
func diagnose(r *Result, d *Data, a *stats.ANOVA, ty, y []float64, trt, blk, plots []int) {
	dg := &r.Diagnostics
	sum := diag.Summary{HasCV: true, CVPercent: a.CVPercent}
	if sw, err := diag.ShapiroWilk(a.Residuals); err == nil {
		dg.ShapiroW, dg.ShapiroP = ptr(sw.W), ptr(sw.P)
		sum.HasNormality, sum.NormalityW, sum.NormalityP = true, sw.W, sw.P
	}
	grouped, on := ty, "values"
	if d.Design != trial.CRD {
		grouped, on = a.Residuals, "residuals"
	}
	if lv, err := diag.Levene(grouped, trt, len(d.Treatments), diag.Median); err == nil && finite(lv.F) && finite(lv.P) {
		dg.LeveneF, dg.LeveneP, dg.VarianceOn = ptr(lv.F), ptr(lv.P), on
		sum.HasEqualVariance, sum.LeveneF, sum.EqualVarianceP, sum.VarianceOn = true, lv.F, lv.P, on
	}
	if bt, err := diag.Bartlett(grouped, trt, len(d.Treatments)); err == nil && finite(bt.ChiSquare) && finite(bt.P) {
		dg.BartlettK2, dg.BartlettP, dg.VarianceOn = ptr(bt.ChiSquare), ptr(bt.P), on
		sum.HasBartlett, sum.BartlettK2, sum.BartlettP, sum.VarianceOn = true, bt.ChiSquare, bt.P, on
	}
	if d.Design == trial.RCBD && a.Balanced && d.Covariate == nil {
		if na, err := diag.TukeyNonAdditivity(ty, blk, trt, d.Blocks, len(d.Treatments)); err == nil {
			dg.NonAdditivityF, dg.NonAdditivityP = ptr(na.F), ptr(na.P)
			sum.HasNonAdditivity, sum.NonAdditivityF, sum.NonAdditivityP = true, na.F, na.P
		}
	}
	// Residuals in units of √MSE (RootMSE keeps its digits where MSE, the
	// square of very small data, does not), so the standardised residuals
	// are the same in any unit of the data.
	inRoot := make([]float64, len(a.Residuals))
	for i, e := range a.Residuals {
		inRoot[i] = e / a.RootMSE
	}
	if std, err := diag.StandardisedResiduals(inRoot, a.Leverage, 1); a.RootMSE > 0 && err == nil {
		dg.StandardizedResiduals = std
		outs := diag.Outliers(std, 0)
		for i := range outs {
			o := &outs[i]
			lbl := d.label(plots[o.Index])
			o.Plot = fmt.Sprintf("%s%s (%s, value %s)", strings.ToUpper(lbl[:1]), lbl[1:], d.Treatments[trt[o.Index]],
				strconv.FormatFloat(y[o.Index], 'f', max(d.Decimals, 0), 64))
			dg.Outliers = append(dg.Outliers, Outlier{
				Plot: plots[o.Index], Treatment: d.Treatments[trt[o.Index]],
				Value: y[o.Index], Residual: a.Residuals[o.Index], StdResidual: o.Std,
			})
		}
		sum.Outliers = outs
	}
	dg.Readings = diag.Readings(sum)
}

// notes puts the counts of missing and excluded plots, the adjusted-SS and
// transformation notes before the diagnostic readings.
func notes(r *Result, d *Data, a *stats.ANOVA) {
	var w []string
	if r.Missing > 0 {
		w = append(w, fmt.Sprintf("%s without a value left out of the analysis.", plural(r.Missing, "plot", "plots")))
	}
	if len(r.Excluded) > 0 {
		var parts []string
		for _, e := range r.Excluded {
			parts = append(parts, fmt.Sprintf("plot %d (%s)", e.Plot, e.Reason))
		}
		sort.Strings(parts)
		w = append(w, fmt.Sprintf("Excluded from the analysis: %s.", strings.Join(parts, ", ")))
	}
	// A factorial's model says it in its own words (type II, glm's notes).
	if a.Adjusted && r.Covariate == nil && !r.IsFactorial() {
		w = append(w, "Some plots are missing, so each sum of squares is adjusted for the other terms of the model and the lines no longer add up to the total; means are least-squares means.")
	}
	if r.Transform != stats.NoTransform {
		note := fmt.Sprintf("Analysed on the %s scale: LS means, raw means, standard errors, LSD and HSD are on that scale; the back-transformed means and their %s confidence limits are on the original scale (the limits are not symmetric about the mean).", r.Transform.Scale(), percentText(1-r.Alpha))
		if r.Offset != 0 {
			note += fmt.Sprintf(" Because some values are 0, %g was added to every value before transforming (and taken off again after back-transforming).", r.Offset)
		}
		w = append(w, note)
	}
	if r.Covariate != nil {
		w = append(w, covariateNotes(r)...)
	}
	r.Notes = append(w, r.Notes...)
	r.Warnings = append([]string(nil), r.Notes...)
	for _, rd := range r.Diagnostics.Readings {
		if rd.Flagged {
			r.Warnings = append(r.Warnings, rd.Text)
		}
	}
}

// label names an observation in messages: "plot 103" or "line 14".
func (d *Data) label(n int) string {
	if d.Lines {
		return fmt.Sprintf("line %d", n)
	}
	return fmt.Sprintf("plot %d", n)
}

func plural(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return fmt.Sprintf("%d %s", n, many)
}

func ptr(v float64) *float64 { return &v }

// percentText writes a level as a percentage: 0.95 → "95%".
func percentText(v float64) string { return strconv.FormatFloat(100*v, 'g', 4, 64) + "%" }
