package trial

import (
	"fmt"
	"slices"
	"sync"
	"time"
	"weak"
)

// NewOptions are the ingredients of a new trial.
type NewOptions struct {
	Title        string
	Crop         string
	Season       string
	Site         Site
	Investigator string
	Objective    string

	Treatments []Treatment
	// Factors, when given, make a factorial trial: its treatments are
	// their combinations (Treatments, if given too, must be exactly those,
	// as Combinations returns them; empty Treatments get them).
	Factors []Factor
	// Design of the trial. For a Latin square, Reps 0 means as many as
	// there are treatments.
	Design Design
	// Layout; the zero Layout means DefaultLayout(), and empty Blocks,
	// Numbering and Walk take DefaultLayout's settings.
	Layout Layout
	// Traits to record. Recorded traits get one missing value per plot
	// (any Values given are ignored); derived traits keep Values nil.
	Traits []Trait
	// Seed for the randomisation; NewSeed gives a fresh one.
	Seed uint64
	// Now is the creation and randomisation time; zero means time.Now().
	Now time.Time
}

// New builds a trial from opts, lays it out and randomises it, and checks
// the result with Validate. The treatments and traits are copied.
func New(opts NewOptions) (*Trial, error) {
	now := opts.Now
	if now.IsZero() {
		now = time.Now()
	}
	l := opts.Layout
	if l == (Layout{}) {
		l = DefaultLayout()
	}
	l = l.withDefaults()
	d := opts.Design
	if d.Kind == Latin && d.Reps == 0 {
		d.Reps = len(opts.Treatments)
	}
	t := &Trial{
		Title:        opts.Title,
		Crop:         opts.Crop,
		Season:       opts.Season,
		Site:         cloneSite(opts.Site),
		Investigator: opts.Investigator,
		Objective:    opts.Objective,
		Created:      now,
		Modified:     now,
		Factors:      cloneFactors(opts.Factors),
		Treatments:   cloneTreatments(opts.Treatments),
		Design:       d,
		Layout:       l,
		Traits:       cloneTraits(opts.Traits),
	}
	for j := range t.Traits {
		t.Traits[j].Values = nil
	}
	if len(t.Factors) == 0 {
		t.Factors = nil
	} else if len(t.Treatments) == 0 && ValidateFactors(t.Factors) == nil {
		t.Treatments = Combinations(t.Factors)
	}
	var p problems
	p.checkPlan(t.Factors, t.Treatments, t.Design)
	p.checkLayout(t.Layout)
	if err := p.err(); err != nil {
		return nil, err
	}
	if err := t.RandomizeAt(opts.Seed, now); err != nil {
		return nil, err
	}
	if err := t.Validate(); err != nil {
		return nil, err
	}
	return t, nil
}

// TraitIndex returns the index in t.Traits of the trait with key, or −1.
func (t *Trial) TraitIndex(key string) int {
	for j := range t.Traits {
		if t.Traits[j].Key == key {
			return j
		}
	}
	return -1
}

// TreatmentIndex returns the index in t.Treatments of the treatment with
// code, or −1.
func (t *Trial) TreatmentIndex(code string) int {
	for i := range t.Treatments {
		if t.Treatments[i].Code == code {
			return i
		}
	}
	return -1
}

// Trait returns the trait with key, or nil.
func (t *Trial) Trait(key string) *Trait {
	if j := t.TraitIndex(key); j >= 0 {
		return &t.Traits[j]
	}
	return nil
}

// Treatment returns the treatment with code, or nil.
func (t *Trial) Treatment(code string) *Treatment {
	if i := t.TreatmentIndex(code); i >= 0 {
		return &t.Treatments[i]
	}
	return nil
}

// plotIndexCache remembers number → index maps for the last few plot
// slices looked up, keyed weakly by the slice's first element so that a
// trial's plots can still be collected. Hits are verified against the plots,
// misses fall back to a scan, so editing plot numbers in place never gives a
// wrong answer.
var plotIndexCache struct {
	sync.Mutex
	next    int
	entries [4]plotIndexEntry
}

type plotIndexEntry struct {
	first weak.Pointer[Plot]
	n     int
	index map[int]int
}

// plotIndex returns the number → index map for plots, building it if needed.
func plotIndex(plots []Plot) map[int]int {
	key := weak.Make(&plots[0])
	c := &plotIndexCache
	c.Lock()
	defer c.Unlock()
	for i := range c.entries {
		e := &c.entries[i]
		if e.index != nil && e.first == key && e.n == len(plots) {
			return e.index
		}
	}
	m := make(map[int]int, len(plots))
	for i := len(plots) - 1; i >= 0; i-- {
		m[plots[i].Number] = i // the first plot wins on a duplicate number
	}
	c.entries[c.next] = plotIndexEntry{first: key, n: len(plots), index: m}
	c.next = (c.next + 1) % len(c.entries)
	return m
}

// forgetPlotIndex drops any cached map for plots.
func forgetPlotIndex(plots []Plot) {
	if len(plots) == 0 {
		return
	}
	key := weak.Make(&plots[0])
	c := &plotIndexCache
	c.Lock()
	defer c.Unlock()
	for i := range c.entries {
		if c.entries[i].first == key {
			c.entries[i] = plotIndexEntry{}
		}
	}
}

// PlotIndexByNumber returns the index in t.Plots of the plot numbered num,
// or −1. Lookups use a cached map, so they stay fast on large trials; it is
// safe to call from several goroutines as long as none changes the plots.
func (t *Trial) PlotIndexByNumber(num int) int {
	n := len(t.Plots)
	if n == 0 {
		return -1
	}
	if n <= 32 {
		return t.scanPlot(num)
	}
	if i, ok := plotIndex(t.Plots)[num]; ok && i < n && t.Plots[i].Number == num {
		return i
	}
	// Not in the map, or the map is stale: make sure by scanning.
	i := t.scanPlot(num)
	if i >= 0 {
		forgetPlotIndex(t.Plots)
	}
	return i
}

func (t *Trial) scanPlot(num int) int {
	for i := range t.Plots {
		if t.Plots[i].Number == num {
			return i
		}
	}
	return -1
}

// TraitValues returns one value per plot for the trait with key, in plot
// order, missing values as NaN: a copy of the recorded values, or the values
// computed for a derived trait (see MoistureAdjustedYield; plots with missing or
// impossible inputs get a missing value). Exclusions are not applied.
func (t *Trial) TraitValues(key string) ([]float64, error) {
	j := t.TraitIndex(key)
	if j < 0 {
		return nil, fmt.Errorf("the trial has no trait %q", key)
	}
	tr := &t.Traits[j]
	if tr.Derived != nil {
		return t.derive(tr)
	}
	if len(tr.Values) != len(t.Plots) {
		return nil, fmt.Errorf("trait %q has %d values for %d plots", key, len(tr.Values), len(t.Plots))
	}
	return append([]float64(nil), tr.Values...), nil
}

// SetValue records v for plot plotIdx (an index into t.Plots) and the trait
// with key; Missing clears the value. An impossible value — a fractional or
// negative count, a percentage outside 0–100, an infinite value — is
// refused with a *ValidationError and nothing is stored. A value outside
// the trait's valid range is stored: it is data, flagged by RangeNote.
func (t *Trial) SetValue(plotIdx int, key string, v float64) error {
	j := t.TraitIndex(key)
	if j < 0 {
		return fmt.Errorf("the trial has no trait %q", key)
	}
	tr := &t.Traits[j]
	if tr.Derived != nil {
		return fmt.Errorf("trait %q is computed from other traits, so it cannot be entered", key)
	}
	if plotIdx < 0 || plotIdx >= len(t.Plots) {
		return fmt.Errorf("there is no plot %d in walking order; the trial has %d plots", plotIdx+1, len(t.Plots))
	}
	if len(tr.Values) != len(t.Plots) {
		return fmt.Errorf("trait %q has %d values for %d plots", key, len(tr.Values), len(t.Plots))
	}
	if msg := valueProblem(tr, v); msg != "" {
		return &ValidationError{
			Field: fmt.Sprintf("Traits[%d].Values[%d]", j, plotIdx),
			Msg:   fmt.Sprintf("plot %d: %s", t.Plots[plotIdx].Number, msg),
		}
	}
	if IsMissing(v) {
		v = Missing
	}
	tr.Values[plotIdx] = v
	return nil
}

// Excluded reports whether plot plotIdx is left out of the analysis of the
// trait with key, and why: when it carries an exclusion for that trait or
// for every trait, or, for a derived trait, for one of the traits it is
// computed from.
func (t *Trial) Excluded(plotIdx int, key string) (bool, string) {
	if plotIdx < 0 || plotIdx >= len(t.Plots) {
		return false, ""
	}
	keys := []string{key}
	if tr := t.Trait(key); tr != nil && tr.Derived != nil {
		keys = append(keys, tr.Derived.WeightTrait, tr.Derived.MoistureTrait)
	}
	for _, e := range t.Plots[plotIdx].Exclusions {
		if e.Trait == "" {
			return true, e.Reason
		}
		for _, k := range keys {
			if e.Trait == k {
				return true, e.Reason
			}
		}
	}
	return false, ""
}

// HasData reports whether any recorded trait holds a value.
func (t *Trial) HasData() bool {
	for j := range t.Traits {
		for _, v := range t.Traits[j].Values {
			if !IsMissing(v) {
				return true
			}
		}
	}
	return false
}

// Checks returns the check treatments, in treatment order.
func (t *Trial) Checks() []Treatment {
	var out []Treatment
	for _, tr := range t.Treatments {
		if tr.Role == RoleCheck {
			out = append(out, tr)
		}
	}
	return out
}

// Blocks returns the number of blocks of the laid-out trial (1 for a
// completely randomised design, the number of square rows for a Latin
// square), counted from the plots.
func (t *Trial) Blocks() int {
	b := 0
	for _, p := range t.Plots {
		b = max(b, p.Block)
	}
	return b
}

// Summary is a count of what a trial holds.
type Summary struct {
	Plots          int // plots laid out
	Treatments     int // treatments, checks included
	Checks         int // treatments with RoleCheck
	Blocks         int // see Trial.Blocks
	RecordedTraits int // traits entered on the plots
	DerivedTraits  int // traits computed from others

	// Entered is the number of recorded values; Cells is plots × recorded
	// traits; PercentEntered is 100 × Entered / Cells, and 0 when there is
	// nothing to enter.
	Entered        int
	Cells          int
	PercentEntered float64

	ExcludedPlots int // plots left out of at least one trait
	Exclusions    int // exclusions in all

	Traits []TraitSummary // one per trait, in trait order
}

// TraitSummary counts one trait's values.
type TraitSummary struct {
	Key      string // trait key
	Derived  bool   // computed from other traits
	Entered  int    // plots with a value (computed for a derived trait)
	Missing  int    // plots without a value
	Excluded int    // plots left out of this trait's analysis
}

// Summary counts the trial's plots, values and exclusions.
func (t *Trial) Summary() Summary {
	s := Summary{
		Plots:      len(t.Plots),
		Treatments: len(t.Treatments),
		Checks:     len(t.Checks()),
		Blocks:     t.Blocks(),
	}
	for _, p := range t.Plots {
		if len(p.Exclusions) > 0 {
			s.ExcludedPlots++
			s.Exclusions += len(p.Exclusions)
		}
	}
	for j := range t.Traits {
		tr := &t.Traits[j]
		ts := TraitSummary{Key: tr.Key, Derived: tr.Derived != nil}
		vals, err := t.TraitValues(tr.Key)
		if err != nil {
			vals = nil
		}
		for i := range t.Plots {
			if i < len(vals) && !IsMissing(vals[i]) {
				ts.Entered++
			} else {
				ts.Missing++
			}
			if ex, _ := t.Excluded(i, tr.Key); ex {
				ts.Excluded++
			}
		}
		if ts.Derived {
			s.DerivedTraits++
		} else {
			s.RecordedTraits++
			s.Entered += ts.Entered
			s.Cells += len(t.Plots)
		}
		s.Traits = append(s.Traits, ts)
	}
	if s.Cells > 0 {
		s.PercentEntered = 100 * float64(s.Entered) / float64(s.Cells)
	}
	return s
}

// Clone returns a deep copy of the trial.
func (t *Trial) Clone() *Trial {
	c := *t
	c.Site = cloneSite(t.Site)
	c.Factors = cloneFactors(t.Factors)
	c.Treatments = cloneTreatments(t.Treatments)
	c.Traits = cloneTraits(t.Traits)
	c.Operations = cloneOperations(t.Operations)
	c.Economics = t.Economics.Clone()
	c.Analysis.Contrasts = slices.Clone(t.Analysis.Contrasts)
	c.Analysis.Response.LeaveOut = slices.Clone(t.Analysis.Response.LeaveOut)
	c.Plots = make([]Plot, len(t.Plots))
	for i, p := range t.Plots {
		p.Exclusions = append([]Exclusion(nil), p.Exclusions...)
		c.Plots[i] = p
	}
	if t.Plots == nil {
		c.Plots = nil
	}
	return &c
}

// ClearData sets every recorded value to missing and removes every
// exclusion; notes stay. After ClearData a trial can be randomised again.
func (t *Trial) ClearData() {
	for j := range t.Traits {
		for i := range t.Traits[j].Values {
			t.Traits[j].Values[i] = Missing
		}
	}
	for i := range t.Plots {
		t.Plots[i].Exclusions = nil
	}
}

func clonePtr(p *float64) *float64 {
	if p == nil {
		return nil
	}
	v := *p
	return &v
}

func cloneSite(s Site) Site {
	s.Latitude = clonePtr(s.Latitude)
	s.Longitude = clonePtr(s.Longitude)
	return s
}

func cloneTreatments(ts []Treatment) []Treatment {
	if ts == nil {
		return nil
	}
	out := make([]Treatment, len(ts))
	for i, tr := range ts {
		tr.Rate = clonePtr(tr.Rate)
		if tr.Levels != nil {
			tr.Levels = append([]string(nil), tr.Levels...)
		}
		out[i] = tr
	}
	return out
}

func cloneTraits(ts []Trait) []Trait {
	if ts == nil {
		return nil
	}
	out := make([]Trait, len(ts))
	for i, tr := range ts {
		out[i] = cloneTrait(tr)
	}
	return out
}

func cloneTrait(tr Trait) Trait {
	tr.Min = clonePtr(tr.Min)
	tr.Max = clonePtr(tr.Max)
	if tr.Values != nil {
		tr.Values = append([]float64(nil), tr.Values...)
	}
	if tr.Derived != nil {
		d := *tr.Derived
		tr.Derived = &d
	}
	if tr.Assessment != nil {
		a := *tr.Assessment
		tr.Assessment = &a
	}
	return tr
}
