package trial

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Limits checked by Validate.
const (
	MaxCodeLen     = 12 // longest treatment code, in characters
	MinReps        = 2  // fewest replicates of a CRD or RCBD
	MaxReps        = 50 // most replicates of a CRD or RCBD
	MinLatin       = 3  // smallest Latin square: 2 × 2 leaves no error degrees of freedom
	MaxLatin       = 16 // largest Latin square
	MaxTraitKeyLen = 32 // longest trait key, in characters
	MaxDecimals    = 6  // most decimals a trait is recorded with
)

// maxValueProblems caps the number of per-value or per-plot problems reported
// for one trait or for the plots, so a broken file gives a readable list.
const maxValueProblems = 10

// Validate checks the whole trial: treatments, design, layout, traits, plots
// and recorded values. It returns nil or a ValidationErrors listing every
// problem found (capped at a few per trait and for the plots).
func (t *Trial) Validate() error {
	var p problems
	p.checkPlan(t.Factors, t.Treatments, t.Design)
	p.checkLayout(t.Layout)
	p.checkFactorKeys(t)
	p.checkTraits(t)
	p.checkPlots(t)
	if msg := MethodProblem(t.Analysis.Method); msg != "" {
		p.add("Analysis.Method", "%s", msg)
	}
	return p.err()
}

// ValidateDesign checks a treatment list and a design on their own, as a
// planning form needs before any plot exists: at least 2 treatments, valid
// and distinct codes, a known design and a replicate count that fits it. It
// returns nil or a ValidationErrors.
func ValidateDesign(treatments []Treatment, d Design) error {
	return ValidatePlan(nil, treatments, d)
}

// ValidatePlan is ValidateDesign for a trial that may have treatment
// factors: with factors, the treatments must be their combinations (see
// Combinations) and the design one that fits them (a split plot needs 2
// or 3 factors, a strip plot exactly 2). It returns nil or a
// ValidationErrors.
func ValidatePlan(factors []Factor, treatments []Treatment, d Design) error {
	var p problems
	p.checkPlan(factors, treatments, d)
	return p.err()
}

// checkPlan checks the factors, the treatments and the design together.
func (p *problems) checkPlan(fs []Factor, ts []Treatment, d Design) {
	n := len(p.list)
	p.checkFactors(fs)
	factorsOK := len(p.list) == n
	maxLen := MaxCodeLen
	if len(fs) > 0 {
		maxLen = MaxCombinationCodeLen
	}
	p.checkTreatmentsN(ts, maxLen)
	if factorsOK {
		p.checkCombinations(fs, ts)
	}
	p.checkDesign(ts, d)
	p.checkFactorDesign(fs, d, factorsOK)
}

// ValidateLayout checks the plot geometry and field arrangement settings. It
// returns nil or a ValidationErrors.
func ValidateLayout(l Layout) error {
	var p problems
	p.checkLayout(l)
	return p.err()
}

// CheckCode returns nil if code can be a treatment code (not empty, at most
// MaxCodeLen characters, no spaces, commas, quotation marks or control
// characters), or a *ValidationError saying what is wrong. It does not check
// uniqueness.
func CheckCode(code string) error {
	if msg := codeProblem(code); msg != "" {
		return &ValidationError{Field: "Code", Msg: msg}
	}
	return nil
}

func codeProblem(code string) string { return codeProblemN(code, MaxCodeLen) }

// codeProblemN is codeProblem with maxLen characters allowed.
func codeProblemN(code string, maxLen int) string {
	if code == "" {
		return "a treatment needs a code, for example T01 or CHK"
	}
	if n := utf8.RuneCountInString(code); n > maxLen {
		return fmt.Sprintf("treatment code %q is %d characters long; use at most %d", code, n, maxLen)
	}
	if !utf8.ValidString(code) {
		return fmt.Sprintf("treatment code %q is not valid text", code)
	}
	for _, r := range code {
		switch {
		case unicode.IsSpace(r):
			return fmt.Sprintf("treatment code %q contains a space; codes cannot contain spaces or commas", code)
		case r == ',':
			return fmt.Sprintf("treatment code %q contains a comma; codes cannot contain spaces or commas", code)
		case r == '"':
			return fmt.Sprintf("treatment code %q contains a quotation mark, which would break exported tables", code)
		case unicode.IsControl(r):
			return fmt.Sprintf("treatment code %q contains an invisible control character", code)
		}
	}
	return ""
}

// CheckTraitKey returns nil if key can be a trait key (1 to MaxTraitKeyLen
// characters, only ASCII letters, digits, _ and -, so that it is safe as a
// column header), or a *ValidationError. It does not check uniqueness.
func CheckTraitKey(key string) error {
	if msg := traitKeyProblem(key); msg != "" {
		return &ValidationError{Field: "Key", Msg: msg}
	}
	return nil
}

func traitKeyProblem(key string) string {
	if key == "" {
		return "a trait needs a short key, for example yield or ht"
	}
	if len(key) > MaxTraitKeyLen {
		return fmt.Sprintf("trait key %q is %d characters long; use at most %d", key, len(key), MaxTraitKeyLen)
	}
	for _, r := range key {
		if !(r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z' || r >= '0' && r <= '9' || r == '_' || r == '-') {
			return fmt.Sprintf("trait key %q can hold only letters, digits, _ and - (no spaces or accents), so that it is safe as a column header", key)
		}
	}
	return ""
}

func (p *problems) checkTreatments(ts []Treatment) { p.checkTreatmentsN(ts, MaxCodeLen) }

// checkTreatmentsN is checkTreatments with codes of up to maxLen
// characters.
func (p *problems) checkTreatmentsN(ts []Treatment, maxLen int) {
	if len(ts) < 2 {
		p.add("Treatments", "a trial needs at least 2 treatments to compare; it has %d", len(ts))
	}
	seen := make(map[string]int, len(ts))
	for i, tr := range ts {
		f := "Treatments[" + strconv.Itoa(i) + "]"
		if msg := codeProblemN(tr.Code, maxLen); msg != "" {
			if tr.Code == "" {
				msg = fmt.Sprintf("treatment %d has no code; give it a short code, for example T01 or CHK", i+1)
			}
			p.add(f+".Code", "%s", msg)
		} else {
			k := strings.ToLower(tr.Code)
			if j, dup := seen[k]; dup {
				if ts[j].Code == tr.Code {
					p.add(f+".Code", "treatment code %q is used twice (treatments %d and %d); each treatment needs its own code", tr.Code, j+1, i+1)
				} else {
					p.add(f+".Code", "treatment codes %q and %q differ only in capitals; make them clearly different", ts[j].Code, tr.Code)
				}
			} else {
				seen[k] = i
			}
		}
		switch tr.Role {
		case "", RoleEntry, RoleCheck, RoleUntreated:
		default:
			p.add(f+".Role", "treatment %q has role %q; a treatment is an entry, a check or the untreated check", tr.Code, tr.Role)
		}
		if tr.Rate != nil && (math.IsNaN(*tr.Rate) || math.IsInf(*tr.Rate, 0)) {
			p.add(f+".Rate", "treatment %q has no usable rate; enter a number or leave the rate empty", tr.Code)
		}
	}
}

// designName is the name of a design kind in running text, with its
// article ("a Latin square").
func designName(k DesignKind) string {
	if !k.Known() {
		return k.Name()
	}
	return "a " + k.Name()
}

func (p *problems) checkDesign(ts []Treatment, d Design) {
	nt := len(ts)
	switch d.Kind {
	case CRD, RCBD, SplitPlot, StripPlot:
		if d.Reps < MinReps || d.Reps > MaxReps {
			p.add("Design.Reps", "%s needs %d to %d replicates, not %d", designName(d.Kind), MinReps, MaxReps, d.Reps)
		}
	case Latin:
		switch {
		case nt < MinLatin:
			p.add("Design.Kind", "a Latin square needs at least %d treatments: with %d there are no degrees of freedom left to estimate the error", MinLatin, nt)
		case nt > MaxLatin:
			p.add("Design.Kind", "a Latin square of %d treatments would need %d × %d = %d plots; use a Latin square for at most %d treatments, or a randomised complete block design", nt, nt, nt, nt*nt, MaxLatin)
		case d.Reps != nt:
			p.add("Design.Reps", "a Latin square needs as many rows and columns as treatments: %d treatments need a %d × %d square, not %d replicates", nt, nt, nt, d.Reps)
		}
	case "":
		p.add("Design.Kind", "choose a design: a completely randomised design, a randomised complete block design, a Latin square, a split plot or a strip plot")
	default:
		p.add("Design.Kind", "the design %q is not one Furlong knows; choose a completely randomised design, a randomised complete block design, a Latin square, a split plot or a strip plot", string(d.Kind))
	}
}

func (p *problems) checkArrangement(l Layout) {
	if l.PlotsPerRow < 0 {
		p.add("Layout.PlotsPerRow", "the number of plots per field row cannot be negative (%d); use 0 to put each block in one row", l.PlotsPerRow)
	}
	switch l.Blocks {
	case "", BlocksSideBySide, BlocksStacked:
	default:
		p.add("Layout.Blocks", "blocks are either side by side or stacked, not %q", string(l.Blocks))
	}
	switch l.Numbering {
	case "", NumberByBlock, NumberSequential:
	default:
		p.add("Layout.Numbering", "plots are numbered either by block or in sequence, not %q", string(l.Numbering))
	}
	switch l.Walk {
	case "", WalkSerpentine, WalkStraight:
	default:
		p.add("Layout.Walk", "the walking order is either serpentine or straight, not %q", string(l.Walk))
	}
}

func (p *problems) checkLayout(l Layout) {
	if n := l.Orientation.North; n != "" && !n.Valid() {
		p.add("Layout.Orientation.North", "the map edge facing north must be top, right, bottom or left, not %q", string(n))
	}
	positive := func(field, what string, v float64) {
		if !(v > 0) || math.IsInf(v, 0) {
			p.add(field, "the %s must be more than 0 m, not %g m", what, v)
		}
	}
	positive("Layout.PlotLength", "plot length", l.PlotLength)
	positive("Layout.PlotWidth", "plot width", l.PlotWidth)
	harvest := func(field, what string, v, plot float64) {
		switch {
		case !(v >= 0) || math.IsInf(v, 0):
			p.add(field, "the harvested %s must be 0 m (the whole plot) or more, not %g m", what, v)
		case v > plot && plot > 0:
			p.add(field, "the harvested %s (%g m) cannot be more than the plot %s (%g m)", what, v, what, plot)
		}
	}
	harvest("Layout.HarvestLength", "length", l.HarvestLength, l.PlotLength)
	harvest("Layout.HarvestWidth", "width", l.HarvestWidth, l.PlotWidth)
	if !(l.Alley >= 0) || math.IsInf(l.Alley, 0) {
		p.add("Layout.Alley", "the alley width must be 0 m or more, not %g m", l.Alley)
	}
	p.checkArrangement(l)
}

func (p *problems) checkTraits(t *Trial) {
	seen := make(map[string]int, len(t.Traits))
	for i := range t.Traits {
		p.checkTrait(t, i, seen)
	}
}

// checkTrait checks trait i; seen maps the lower-case keys of the traits
// checked before it to their indices and gets trait i's key added.
func (p *problems) checkTrait(t *Trial, i int, seen map[string]int) {
	{
		tr := &t.Traits[i]
		f := fmt.Sprintf("Traits[%d]", i)
		if msg := traitKeyProblem(tr.Key); msg != "" {
			if tr.Key == "" {
				msg = fmt.Sprintf("trait %d has no key; give it a short key, for example yield or ht", i+1)
			}
			p.add(f+".Key", "%s", msg)
		} else {
			k := strings.ToLower(tr.Key)
			if j, dup := seen[k]; dup {
				p.add(f+".Key", "trait key %q is used twice (traits %d and %d); each trait needs its own key", tr.Key, j+1, i+1)
			} else {
				seen[k] = i
			}
		}
		switch tr.Kind {
		case "", Continuous, Count, Percent, Score:
		default:
			p.add(f+".Kind", "trait %q has kind %q; use continuous, count, percent or score", tr.Key, string(tr.Kind))
		}
		bad := func(v *float64) bool { return v != nil && (math.IsNaN(*v) || math.IsInf(*v, 0)) }
		if bad(tr.Min) || bad(tr.Max) {
			p.add(f+".Min", "trait %q has a range limit that is not a number; enter a number or leave it empty", tr.Key)
		} else if tr.Min != nil && tr.Max != nil && *tr.Min > *tr.Max {
			p.add(f+".Min", "trait %q has its minimum (%g) above its maximum (%g)", tr.Key, *tr.Min, *tr.Max)
		}
		if c := tr.Covariate; c != "" {
			switch j := t.TraitIndex(c); {
			case c == tr.Key:
				p.add(f+".Covariate", "trait %q cannot be adjusted for itself; choose another trait measured on the same plots", tr.Key)
			case j < 0:
				p.add(f+".Covariate", "trait %q is adjusted for the covariate %q, which the trial does not have", tr.Key, c)
			}
		}
		if tr.Decimals < 0 || tr.Decimals > MaxDecimals {
			p.add(f+".Decimals", "trait %q is set to %d decimals; use 0 to %d", tr.Key, tr.Decimals, MaxDecimals)
		}
		if msg := TransformProblem(tr.Transform, tr.Kind); msg != "" {
			p.add(f+".Transform", "trait %q: %s", tr.Key, msg)
		}
		p.checkAssessment(t, i)
		if tr.Derived != nil {
			p.checkDerived(t, i)
			return
		}
		if len(tr.Values) != len(t.Plots) {
			p.add(f+".Values", "trait %q has %d values for %d plots", tr.Key, len(tr.Values), len(t.Plots))
			return
		}
		n := 0
		for pi, v := range tr.Values {
			msg := valueProblem(tr, v)
			if msg == "" {
				continue
			}
			if n < maxValueProblems {
				p.add(fmt.Sprintf("%s.Values[%d]", f, pi), "plot %d: %s", t.Plots[pi].Number, msg)
			}
			n++
		}
		if n > maxValueProblems {
			p.add(f+".Values", "trait %q has %d more values with problems", tr.Key, n-maxValueProblems)
		}
	}
}

// Problem says why v cannot be a value of a trait of kind k, as a phrase
// to follow the value ("2.5 is not a count (a whole number, 0 or more)"),
// or returns "" when it can. This is the one rule of what a value may be:
// a finite number; for a count a whole number of 0 or more, for a
// percentage 0 to 100. A value outside a trait's valid range is not a
// problem of its kind: such values are kept as data (see RangeNote).
// Missing values (NaN) are not checked.
func (k TraitKind) Problem(v float64) string {
	if math.IsInf(v, 0) {
		return "is not a finite number"
	}
	switch k {
	case Count:
		if v < 0 || v != math.Trunc(v) {
			return "is not a count (a whole number, 0 or more)"
		}
	case Percent:
		if v < 0 || v > 100 {
			return "is not a percentage (between 0 and 100)"
		}
	}
	return ""
}

// valueProblem says what is wrong with a recorded value of tr, or "", in
// a sentence for the person entering it.
func valueProblem(tr *Trait, v float64) string {
	if IsMissing(v) || tr.Kind.Problem(v) == "" {
		return ""
	}
	switch {
	case math.IsInf(v, 0):
		return fmt.Sprintf("the %s value is infinite", tr.label())
	case tr.Kind == Count:
		return fmt.Sprintf("%s is a count, so %g is not possible; enter a whole number of 0 or more", tr.label(), v)
	default: // Percent
		return fmt.Sprintf("%s is a percentage, so %g is not possible; enter 0 to 100", tr.label(), v)
	}
}

// RangeNote says, for a value outside the trait's valid range, that it is:
// "Plant height 900 is outside its valid range 20 to 400; check it". It is
// "" for values in range and for missing values. Such a value is kept as
// data (a measurement may really be unusual) and flagged where it is shown.
func (tr *Trait) RangeNote(v float64) string {
	if IsMissing(v) || !(tr.Min != nil && v < *tr.Min || tr.Max != nil && v > *tr.Max) {
		return ""
	}
	return fmt.Sprintf("%s %g is outside its valid range %s; check it", tr.label(), v, tr.rangeText())
}

// label is the trait's name for messages.
func (tr *Trait) label() string {
	if tr.Name != "" {
		return tr.Name
	}
	return tr.Key
}

// rangeText writes the trait's valid range.
func (tr *Trait) rangeText() string {
	switch {
	case tr.Min != nil && tr.Max != nil:
		return fmt.Sprintf("%g to %g", *tr.Min, *tr.Max)
	case tr.Min != nil:
		return fmt.Sprintf("of at least %g", *tr.Min)
	case tr.Max != nil:
		return fmt.Sprintf("of at most %g", *tr.Max)
	}
	return "(none)"
}

func (p *problems) checkDerived(t *Trial, i int) {
	tr := &t.Traits[i]
	d := tr.Derived
	f := fmt.Sprintf("Traits[%d].Derived", i)
	if tr.Values != nil {
		p.add(fmt.Sprintf("Traits[%d].Values", i), "trait %q is computed, so it cannot hold recorded values", tr.Key)
	}
	if d.Kind == AUDPC || d.Kind == AUDPCStandard {
		p.checkAUDPC(t, i)
		return
	}
	if d.Kind != AdjustedYield {
		p.add(f+".Kind", "trait %q uses a formula Furlong does not know (%q)", tr.Key, string(d.Kind))
		return
	}
	source := func(field, what, key string) bool {
		j := t.TraitIndex(key)
		switch {
		case key == "":
			p.add(f+"."+field, "trait %q needs a %s trait to be computed from", tr.Key, what)
		case j < 0:
			p.add(f+"."+field, "trait %q is computed from %s trait %q, which is not in the trial", tr.Key, what, key)
		case t.Traits[j].Derived != nil:
			p.add(f+"."+field, "trait %q is computed from %s trait %q, which is itself computed; choose a recorded trait", tr.Key, what, key)
		case len(t.Traits[j].Values) != len(t.Plots):
			// Reported for the source trait itself.
			return false
		default:
			return true
		}
		return false
	}
	okW := source("WeightTrait", "plot weight", d.WeightTrait)
	okM := source("MoistureTrait", "moisture", d.MoistureTrait)
	if okW && okM && d.WeightTrait == d.MoistureTrait {
		p.add(f+".MoistureTrait", "trait %q uses trait %q for both the plot weight and the moisture", tr.Key, d.WeightTrait)
		okW = false
	}
	if !(d.StandardMoisture >= 0 && d.StandardMoisture < 100) {
		p.add(f+".StandardMoisture", "trait %q has a standard moisture of %g %%; it must be at least 0 and below 100", tr.Key, d.StandardMoisture)
	}
	switch d.OutputUnit {
	case "", UnitTHa:
	case UnitBuAc:
		if !(d.BushelWeightLb >= 0) || math.IsInf(d.BushelWeightLb, 0) {
			p.add(f+".BushelWeightLb", "trait %q has a bushel weight of %g lb; it must be more than 0", tr.Key, d.BushelWeightLb)
		} else if _, ok := t.bushelWeight(d); !ok {
			p.add(f+".BushelWeightLb", "trait %q is in bu/ac, so it needs a bushel weight (crop %q has no default)", tr.Key, t.Crop)
		}
	default:
		p.add(f+".OutputUnit", "trait %q has output unit %q; use t/ha or bu/ac", tr.Key, d.OutputUnit)
	}
	if t.Layout.HarvestedArea() <= 0 {
		p.add("Layout.HarvestLength", "trait %q needs the harvested area: set the plot or harvested length and width", tr.Key)
	}
	if !okW || !okM {
		return
	}
	w := t.Traits[t.TraitIndex(d.WeightTrait)].Values
	m := t.Traits[t.TraitIndex(d.MoistureTrait)].Values
	n := 0
	for pi := range t.Plots {
		var msg string
		switch {
		case !IsMissing(w[pi]) && w[pi] < 0:
			msg = fmt.Sprintf("a plot weight of %g kg is not possible, so %q has no value there", w[pi], tr.Key)
		case !IsMissing(m[pi]) && (m[pi] < 0 || m[pi] >= 100):
			msg = fmt.Sprintf("a grain moisture of %g %% is not possible, so %q has no value there", m[pi], tr.Key)
		default:
			continue
		}
		if n < maxValueProblems {
			p.add(f, "plot %d: %s", t.Plots[pi].Number, msg)
		}
		n++
	}
	if n > maxValueProblems {
		p.add(f, "trait %q has %d more plots with impossible weight or moisture", tr.Key, n-maxValueProblems)
	}
}

// plotField returns a function writing the Field of plot i's problems, so
// that the string is only built when there is a problem.
func plotField(i int) func(string) string {
	return func(sub string) string { return fmt.Sprintf("Plots[%d]%s", i, sub) }
}

func (p *problems) checkPlots(t *Trial) {
	if len(t.Plots) == 0 {
		return
	}
	n := 0
	report := func(field, format string, args ...any) {
		if n < maxValueProblems {
			p.add(field, format, args...)
		}
		n++
	}
	codes := make(map[string]bool, len(t.Treatments))
	for _, tr := range t.Treatments {
		codes[tr.Code] = true
	}
	traits := make(map[string]bool, len(t.Traits))
	for _, tr := range t.Traits {
		traits[tr.Key] = true
	}
	type cell struct{ r, c int }
	numbers := make(map[int]int, len(t.Plots))
	cells := make(map[cell]int, len(t.Plots))
	allKnown := true
	for i, pl := range t.Plots {
		f := plotField(i)
		if pl.Number <= 0 {
			report(f(".Number"), "plot %d in walking order has number %d; plot numbers must be 1 or more", i+1, pl.Number)
		} else if j, dup := numbers[pl.Number]; dup {
			report(f(".Number"), "plot number %d is used twice (places %d and %d in walking order)", pl.Number, j+1, i+1)
		} else {
			numbers[pl.Number] = i
		}
		if pl.Block < 1 || pl.Row < 1 || pl.Column < 1 {
			report(f(".Block"), "plot %d has block %d, row %d, column %d; all must be 1 or more", pl.Number, pl.Block, pl.Row, pl.Column)
		} else if j, dup := cells[cell{pl.Row, pl.Column}]; dup {
			report(f(".Row"), "plots %d and %d are both at field row %d, column %d", t.Plots[j].Number, pl.Number, pl.Row, pl.Column)
		} else {
			cells[cell{pl.Row, pl.Column}] = i
		}
		if !codes[pl.Treatment] {
			allKnown = false
			report(f(".Treatment"), "plot %d has treatment %q, which is not in the treatment list", pl.Number, pl.Treatment)
		}
		for _, e := range pl.Exclusions {
			if e.Trait != "" && !traits[e.Trait] {
				report(f(".Exclusions"), "plot %d is left out of trait %q, which is not in the trial", pl.Number, e.Trait)
			}
		}
	}
	if allKnown && n == 0 {
		p.checkPlotDesign(t, report)
	}
	if n > maxValueProblems {
		p.add("Plots", "and %d more problems with the plots", n-maxValueProblems)
	}
}

// checkPlotDesign checks that the plots carry out the design: the right
// number of plots, and each treatment the right number of times in each
// block, or in each row and column of a Latin square.
func (p *problems) checkPlotDesign(t *Trial, report func(field, format string, args ...any)) {
	var dp problems
	dp.checkPlan(t.Factors, t.Treatments, t.Design)
	if len(dp.list) > 0 || len(t.Treatments) < 2 {
		return // reported already
	}
	nt := len(t.Treatments)
	s := shape(nt, t.Design)
	if want := s.blocks * s.size; len(t.Plots) != want {
		report("Plots", "the trial has %d plots but %s of %d treatments and %d replicates needs %d", len(t.Plots), designName(t.Design.Kind), nt, t.Design.Reps, want)
		return
	}
	type key struct {
		group int
		code  string
	}
	count := func(group func(Plot) int, max int, what string, want int) {
		c := make(map[key]int)
		for _, pl := range t.Plots {
			g := group(pl)
			if g > max {
				report("Plots", "plot %d is in %s %d, but the design has only %d", pl.Number, what, g, max)
				return
			}
			c[key{g, pl.Treatment}]++
		}
		for g := 1; g <= max; g++ {
			for _, tr := range t.Treatments {
				got := c[key{g, tr.Code}]
				switch {
				case got == want:
				case what == "":
					report("Plots", "treatment %q is on %d plots; with %d replicates it needs exactly %d", tr.Code, got, t.Design.Reps, want)
				case got == 0:
					report("Plots", "%s %d has no plot of treatment %q; in %s every treatment appears once in each %s", what, g, tr.Code, designName(t.Design.Kind), what)
				default:
					report("Plots", "%s %d holds treatment %q %d times; in %s every treatment appears once in each %s", what, g, tr.Code, got, designName(t.Design.Kind), what)
				}
			}
		}
	}
	switch t.Design.Kind {
	case CRD:
		count(func(Plot) int { return 1 }, 1, "", t.Design.Reps)
	case RCBD:
		count(func(pl Plot) int { return pl.Block }, t.Design.Reps, "block", 1)
	case Latin:
		count(func(pl Plot) int { return pl.Row }, nt, "field row", 1)
		count(func(pl Plot) int { return pl.Column }, nt, "field column", 1)
	case SplitPlot, StripPlot:
		count(func(pl Plot) int { return pl.Block }, t.Design.Reps, "block", 1)
		p.checkPlotStrata(t, report)
	}
}
