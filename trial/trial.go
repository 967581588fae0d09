// Package trial is Furlong's domain model: a replicated field trial with its
// treatments, design, plot layout, randomisation, traits and plot data.
//
// The package knows nothing of windows, statistics or file formats; codecs live
// in trial/trialfile and trial/fieldbook, the bridge to the statistics engine in
// trial/analysis.
package trial

import (
	"math"
	"time"
)

// Trial is one replicated field trial: one site, one season.
type Trial struct {
	Title        string
	Crop         string // free text; CropDefaults keys ("maize", "wheat", ...) get moisture/bushel defaults
	Season       string // for example "2026" or "2026/27"
	Site         Site
	Investigator string
	Objective    string
	Notes        string
	Created      time.Time
	Modified     time.Time

	// Factors, when not empty, are the crossed treatment factors of a
	// factorial trial; Treatments are then their combinations (see
	// Combinations), each with its level codes. Empty: one list of
	// treatments.
	Factors    []Factor
	Treatments []Treatment
	Design     Design
	Layout     Layout
	Random     Randomization

	// Plots in walking order (the order a crew walks the field). Plot i's
	// values for trait j are Traits[j].Values[i].
	Plots  []Plot
	Traits []Trait

	// Analysis holds the analysis settings remembered with the trial.
	Analysis Analysis

	// Operations is the trial's log of what was done, in date order:
	// sowing, applications, assessments (operations.go).
	Operations []Operation
	// Economics are the user's prices for the margins over input cost
	// (economics.go).
	Economics Economics
}

// Analysis holds the settings of a trial's analysis that every view of it
// shares (the window's Compare and Report steps, `furlong report`), so that
// one choice gives one set of results.
type Analysis struct {
	// Method is the mean-separation method, by its stats/meansep name:
	// MethodLSD ("lsd") or MethodTukey ("tukey"); "" means MethodLSD.
	Method string
	// Contrasts are the trial's planned comparisons (contrast.go).
	Contrasts []Contrast
	// Response holds the settings of the response analysis of a rate trial.
	Response ResponseSettings
	// ContrastAdjust is how the saved contrasts' p-values are adjusted
	// together: "" or AdjustNone, "bonferroni", "holm" or "scheffe" (the
	// names stats gives them; AdjustProblem).
	ContrastAdjust string
}

// Adjustments of the contrasts' p-values a trial can remember.
const (
	AdjustNone       = "none"
	AdjustBonferroni = "bonferroni"
	AdjustHolm       = "holm"
	AdjustScheffe    = "scheffe"
)

// AdjustProblem says why name cannot be a trial's adjustment of its
// contrasts' p-values, "" when it can ("" itself stands for none).
func AdjustProblem(name string) string {
	switch name {
	case "", AdjustNone, AdjustBonferroni, AdjustHolm, AdjustScheffe:
		return ""
	}
	return "the adjustment " + quote(name) + " is not known; use none, bonferroni, holm or scheffe"
}

// ResponseSettings are the user's choices for the response analysis of a
// rate trial (treatments with rates): which treatments stay out of the
// trend and the price ratio of the economic optimum. Prices are the
// user's: nothing is built in.
type ResponseSettings struct {
	// LeaveOut are treatment codes left out of the trend, for example an
	// untreated control that is not part of the rate series.
	LeaveOut []string
	// PriceRatio is the price of one unit of input in units of produce
	// (response units per rate unit, e.g. 0.006 t of grain per kg of N);
	// 0 when none was given.
	PriceRatio float64
}

// ResponseProblem says, in plain words, why s cannot be t's response
// settings; "" when it can.
func (t *Trial) ResponseProblem(s ResponseSettings) string {
	if s.PriceRatio < 0 || s.PriceRatio != s.PriceRatio || s.PriceRatio > 1e12 {
		return "the price ratio must be a positive number (the price of a unit of input in units of produce), or 0 for none"
	}
	seen := map[string]bool{}
	for _, c := range s.LeaveOut {
		if t.Treatment(c) == nil {
			return "the trial has no treatment " + quote(c) + " to leave out of the trend"
		}
		if seen[c] {
			return "the treatment " + quote(c) + " is left out twice"
		}
		seen[c] = true
	}
	return ""
}

// Mean-separation methods a trial can remember (the names stats/meansep
// gives them, and the values of the CLI's --method flag).
const (
	MethodLSD   = "lsd"   // Fisher's protected least significant difference
	MethodTukey = "tukey" // Tukey's honestly significant difference
)

// MeanSeparation returns the trial's mean-separation method, MethodLSD when
// none was chosen.
func (t *Trial) MeanSeparation() string {
	if t.Analysis.Method == "" {
		return MethodLSD
	}
	return t.Analysis.Method
}

// Transformations a trait can be analysed under (the names stats gives
// them, and the values of the CLI's --transform flag). The values are
// transformed before the ANOVA and the means are shown back on the original
// scale.
const (
	TransformNone    = ""       // the values as recorded
	TransformLog     = "log"    // natural logarithm, for spread growing with the mean
	TransformSqrt    = "sqrt"   // square root, for counts
	TransformArcsine = "arcsin" // arcsine square root, for percentages
)

// Site is where the trial is sown.
type Site struct {
	Name         string
	Latitude     *float64 // decimal degrees, nil when unknown
	Longitude    *float64
	Soil         string
	PreviousCrop string
}

// Role says whether a treatment is a test entry or a check (the standard the
// others are compared with).
type Role string

const (
	// RoleEntry is a test entry; an empty Role means the same.
	RoleEntry Role = "entry"
	// RoleCheck is a check, the standard entries are compared with.
	RoleCheck Role = "check"
)

// Treatment is one entry of the trial: a variety, a rate, a programme.
type Treatment struct {
	Code        string // short and unique within the trial, for example "T01" or "CHK"
	Name        string
	Role        Role
	Description string
	Rate        *float64 // optional application or seeding rate
	RateUnit    string   // for example "kg N/ha", "seeds/m²"
	// Levels holds, in a factorial trial, the treatment's level code of
	// every factor (aligned with Trial.Factors); nil otherwise.
	Levels []string
}

// DesignKind names an experimental design.
type DesignKind string

const (
	CRD   DesignKind = "crd"   // completely randomised design
	RCBD  DesignKind = "rcbd"  // randomised complete block design
	Latin DesignKind = "latin" // Latin square: rows and columns both blocked
	// SplitPlot is a split plot in randomised complete blocks: one factor
	// on main plots randomised within each block, the next on subplots
	// randomised within each main plot and, with three factors (a
	// split-split plot), the third on sub-subplots randomised within each
	// subplot.
	SplitPlot DesignKind = "split-plot"
	// StripPlot is a strip plot (strip block) in randomised complete
	// blocks: one factor in horizontal strips across each block (each
	// strip a field row of the block), the other in vertical strips (each
	// a field column of the block), both randomised independently in
	// every block.
	StripPlot DesignKind = "strip-plot"
)

// Design is the experimental design of the trial.
type Design struct {
	Kind DesignKind
	// Reps is the number of replicates. For an RCBD it is the number of
	// blocks; for a Latin square it equals the number of treatments.
	Reps int
	// MainFactor is the key of the factor on the main plots of a split
	// plot, or in the horizontal strips of a strip plot; "" means the
	// first factor. Empty for the other designs.
	MainFactor string
	// SubFactor is the key of the factor on the subplots of a split-split
	// plot (the remaining factor goes on the sub-subplots); "" means the
	// first factor that is not MainFactor. Empty for the other designs.
	SubFactor string
}

// BlockArrangement says how blocks sit in the field.
type BlockArrangement string

const (
	BlocksSideBySide BlockArrangement = "side-by-side" // blocks next to each other along the field rows
	BlocksStacked    BlockArrangement = "stacked"      // blocks one behind the other
)

// Numbering says how plots are numbered.
type Numbering string

const (
	// NumberByBlock numbers plots block×100+position (block×1000 when a
	// block has 100 or more plots): 101, 102, ..., 201, ...
	NumberByBlock Numbering = "by-block"
	// NumberSequential numbers plots 1, 2, 3, ... in walking order.
	NumberSequential Numbering = "sequential"
)

// Walk is the order in which the crew walks the plots.
type Walk string

const (
	WalkSerpentine Walk = "serpentine" // every other field row is walked backwards
	WalkStraight   Walk = "straight"   // every field row starts at column 1
)

// Layout is the plot geometry and the field arrangement. Lengths are metres.
type Layout struct {
	PlotLength    float64
	PlotWidth     float64
	HarvestLength float64 // harvested part of the plot (0: the whole plot)
	HarvestWidth  float64
	Alley         float64 // alley between blocks or ranges

	// PlotsPerRow is the number of plots in one field row (range) of a
	// block; 0 means the whole block in one row. Ignored for a Latin
	// square, whose rows and columns are the field rows and columns.
	PlotsPerRow int
	Blocks      BlockArrangement
	Numbering   Numbering
	Walk        Walk

	// Orientation says how the map sits on the ground; the zero value
	// means it was never given.
	Orientation Orientation
}

// Edge is one edge of the field map as printed: row 1 along the bottom,
// column 1 at the left.
type Edge string

// The edges of the field map.
const (
	EdgeTop    Edge = "top"
	EdgeBottom Edge = "bottom"
	EdgeLeft   Edge = "left"
	EdgeRight  Edge = "right"
)

// Edges lists the map edges in the order a form offers them.
var Edges = []Edge{EdgeTop, EdgeRight, EdgeBottom, EdgeLeft}

// Valid reports whether e is one of the four edges.
func (e Edge) Valid() bool {
	switch e {
	case EdgeTop, EdgeBottom, EdgeLeft, EdgeRight:
		return true
	}
	return false
}

// Orientation ties the field map to the ground, so that a crew holding
// the printed map turns it the right way: the map edge that faces north,
// and a landmark along the bottom edge (row 1), for example "farm track"
// or "hedge". Either may be empty.
type Orientation struct {
	North    Edge   // "" when not known
	Landmark string // what lies along the row-1 edge; free text
}

// IsZero reports whether no orientation was given.
func (o Orientation) IsZero() bool { return o.North == "" && o.Landmark == "" }

// Randomization records how the plots were randomised, so that a layout can
// be reproduced from the file alone.
type Randomization struct {
	Seed   uint64
	Method string    // generator and algorithm, for example "pcg-fisher-yates-v1"
	Done   time.Time // zero when the trial was never randomised
}

// Plot is one plot in the field.
type Plot struct {
	Number    int    // plot number as printed on the stake
	Block     int    // replicate/block, 1-based (for a Latin square: the square's row)
	Row       int    // field row (range), 1-based
	Column    int    // field column, 1-based
	Treatment string // treatment code
	// MainPlot is, in a split plot, the number of the plot's main plot
	// within its block (1, 2, ... across the block) and, in a strip plot,
	// the number of its horizontal strip within its block; 0 in the other
	// designs.
	MainPlot int
	// SubPlot is, in a split-split plot, the number of the plot's subplot
	// within its main plot; 0 otherwise.
	SubPlot int
	// Strip is, in a strip plot, the number of the plot's vertical strip
	// within its block; 0 otherwise.
	Strip int
	Note  string
	// Exclusions keep a plot's values but leave them out of the analysis.
	Exclusions []Exclusion
}

// Exclusion leaves a plot out of the analysis of one trait, or of all traits
// when Trait is empty, without deleting its values.
type Exclusion struct {
	Trait  string // trait key, "" for every trait
	Reason string // for example "hail", "flooding", "planter skip"
}

// TraitKind is the kind of a measurement.
type TraitKind string

const (
	Continuous TraitKind = "continuous" // a measurement on a continuous scale, for example plot weight
	Count      TraitKind = "count"      // a whole number of 0 or more, for example plants per plot
	Percent    TraitKind = "percent"    // a percentage, 0 to 100
	Score      TraitKind = "score"      // ordinal score on a scale, for example lodging 1–9
)

// Trait is one measurement taken on every plot.
type Trait struct {
	Key          string // short and unique, used in file headers: "yield", "ht"
	Name         string
	Unit         string
	Kind         TraitKind
	Min, Max     *float64 // valid range; nil for no bound
	Decimals     int
	Assessed     time.Time // date assessed, zero when not yet
	HigherBetter bool

	// Values holds one value per plot, aligned with Trial.Plots; NaN is
	// missing. A derived trait has no stored values (Values is nil).
	Values []float64
	// Derived, when set, computes the trait from other traits.
	Derived *Derivation

	// Transform is the scale the trait is analysed on: TransformNone,
	// TransformLog, TransformSqrt or TransformArcsine (percent traits only).
	Transform string
	// PercentOfCheck says whether reports show each entry's mean of this
	// trait as a percentage of the check mean. nil leaves it to the default
	// (the trial's yield trait only; see Trial.ShowsPercentOfCheck).
	PercentOfCheck *bool

	// Assessment, when set, makes the trait one assessment of a series
	// of the same trait over time (see assessment.go).
	Assessment *Assessment
	// PreCountOf, when set, marks the trait as the pre-treatment count of
	// the trait or series with that key (for Henderson–Tilton efficacy).
	PreCountOf string
	// Covariate, when set, is the key of another trait measured on the same
	// plots (a stand count, a pre-treatment count) that this trait's
	// analysis is adjusted for (analysis of covariance), in every view.
	Covariate string
}

// Missing is the value stored for a missing observation.
var Missing = math.NaN()

// IsMissing reports whether v is a missing value.
func IsMissing(v float64) bool { return math.IsNaN(v) }

// DerivationKind names a formula for a derived trait.
type DerivationKind string

const (
	// AdjustedYield is yield in t/ha (or bu/ac) adjusted to a standard
	// moisture from harvested plot weight, moisture and harvested area.
	AdjustedYield DerivationKind = "adjusted-yield"
)

// Derivation describes how a derived trait is computed.
type Derivation struct {
	Kind             DerivationKind
	WeightTrait      string  // key of the harvested plot weight trait (kg)
	MoistureTrait    string  // key of the grain moisture trait (%)
	StandardMoisture float64 // moisture basis, %
	// Output unit: "t/ha" or "bu/ac"; for bu/ac BushelWeightLb is used.
	OutputUnit     string
	BushelWeightLb float64
	// Series is the key of the assessment series an AUDPC trait is
	// computed from.
	Series string
}
