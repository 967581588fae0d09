package glm

// Role says what a line of the analysis of variance is. For package
// stats's roles: a treatment line with one factor is a factor main effect,
// with two or three an interaction; an error line other than "error" is
// the error of one stratum (Line.Stratum).
type Role int

// The roles of a Line.
const (
	RoleBlock     Role = iota + 1 // the blocks (replicates)
	RoleTreatment                 // a treatment main effect or interaction
	RoleError                     // an error stratum: "error", "error_a", ...
	RoleTotal                     // the total line
	// RoleCovariate is the regression on the covariate of an analysis of
	// covariance (one df), listed after the treatment terms and before
	// the error.
	RoleCovariate
)

// String names the role.
func (r Role) String() string {
	switch r {
	case RoleBlock:
		return "block"
	case RoleTreatment:
		return "treatment"
	case RoleError:
		return "error"
	case RoleTotal:
		return "total"
	case RoleCovariate:
		return "covariate"
	}
	return "role?"
}

// Method is how the model was fitted.
type Method int

// The fitting methods.
const (
	// SumsOfSquares is the classic analysis of variance: sequential sums of
	// squares for balanced data, type II for unbalanced factorials.
	SumsOfSquares Method = iota + 1
	// REML is restricted maximum likelihood for split and strip plots with
	// missing plots: Wald F tests with Satterthwaite denominator df.
	REML
)

// String names the method.
func (m Method) String() string {
	if m == REML {
		return "REML"
	}
	return "sums of squares"
}

// Line is one line of an analysis of variance. Values that do not apply
// are absent: SS and MS only when HasSS, F and P only when HasTest.
type Line struct {
	Source string // "block", "A", "A:B", "A:B:C", "error", "error_a", "error_b", "error_c", "total"
	Role   Role
	// Factors are the treatment factors of a treatment line (indices into
	// Model.Factors): one for a main effect, more for an interaction.
	Factors []int
	DF      int // degrees of freedom (numerator df for a test)
	HasSS   bool
	SS, MS  float64
	// HasTest is true for lines with an F test; DFDen is its denominator
	// df (whole for sums of squares, Satterthwaite for REML) and
	// ErrorTerm the line it is tested against ("" for REML).
	HasTest   bool
	F, P      float64
	DFDen     float64
	ErrorTerm string
	// CVPercent is 100·√MS/grand mean for error lines (HasCV).
	HasCV     bool
	CVPercent float64
}

// Interaction reports whether the line is an interaction of two or more
// treatment factors.
func (l Line) Interaction() bool { return l.Role == RoleTreatment && len(l.Factors) > 1 }

// Stratum reports whether the line is the error of one stratum of a split
// or strip plot ("error_a", ...), rather than the single error of a
// factorial.
func (l Line) Stratum() bool { return l.Role == RoleError && l.Source != "error" }

// Component is an estimated variance component.
type Component struct {
	Name     string  // "main_plot", "subplot", "horizontal_strip", "vertical_strip", "residual"
	Variance float64 // never negative (a negative moment estimate is shown as 0, with Truncated)
	// Truncated is true when the estimate from the mean squares was
	// negative and is reported as 0.
	Truncated bool
}

// Mean is an estimated marginal (least-squares) mean: the model's
// prediction averaged with equal weights over the levels of the factors
// not in the effect and over the blocks.
type Mean struct {
	Levels []int // level of each factor of the effect, in Effect.Factors order
	N      int   // plots with data in this combination
	// Estimable is false when the plots present cannot estimate this mean
	// (a combination with no data in a model with its interaction); Mean,
	// SE and DF are then absent.
	Estimable bool
	Mean, SE  float64
	DF        float64 // Satterthwaite df of SE
	RawMean   float64 // arithmetic mean of the plots (when N > 0)
}

// Pair compares means I < J of an effect or slice.
type Pair struct {
	I, J   int
	Diff   float64 // mean_I − mean_J
	SE     float64 // standard error of the difference (SED)
	DF     float64 // its degrees of freedom (Satterthwaite when strata mix)
	T      float64
	PLSD   float64 // two-sided t p-value (Fisher's LSD)
	PTukey float64 // Tukey–Kramer p-value (see Comparison)
}

// Interval returns the unadjusted t confidence interval of Diff at level
// 1−alpha (0 < alpha < 1).
func (p Pair) Interval(alpha float64) (lower, upper float64) {
	h := tQuantile(1-alpha/2, p.DF) * p.SE
	return p.Diff - h, p.Diff + h
}

// Comparison holds the pairwise comparisons of a set of means with their
// letters.
type Comparison struct {
	// Pairs lists every pair in the order (0,1), (0,2), …, (1,2), …
	Pairs []Pair
	// EqualSED is true when all pairs have the same SED and df (balanced
	// data within one stratum); SED, DF, LSD and HSD then apply.
	EqualSED bool
	SED, DF  float64
	LSD, HSD float64
	// TukeyDF is the df used for the studentised range: the smallest df
	// of the pairs, rounded down (conservative when strata mix).
	TukeyDF int
	// LettersLSD and LettersTukey have one entry per mean (nil when
	// withheld or not available; the notes then say why). LSD letters are
	// protected by the F test of the effect or slice.
	LettersLSD, LettersTukey []string
	NoteLSD, NoteTukey       string
}

// Effect is a main effect or interaction with its estimated marginal means.
type Effect struct {
	Name    string // "A", "A:B"
	Factors []int  // indices into Model.Factors
	Means   []Mean // every combination of levels, first factor slowest
	// HasTest and P are the effect's F test.
	HasTest bool
	P       float64
	// Comparison is nil when some mean is not estimable.
	Comparison *Comparison
	// Significant is true for an interaction whose F test has p < Alpha;
	// Note then says in plain words what that means.
	Significant bool
	Note        string
}

// Slice compares the levels of one factor with the other factors of an
// interaction held at fixed levels (simple effects).
type Slice struct {
	Effect string // the interaction, "A:B"
	Factor int    // index into Model.Factors of the factor compared
	// At gives the fixed level of each other factor of the effect, in
	// Effect.Factors order (the compared factor's entry is −1).
	At    []int
	Name  string // "A at B = b1"
	Means []Mean // the compared factor's levels, in level order
	// HasTest, F, DF, DFDen and P: the F test that the levels do not
	// differ within this slice.
	HasTest    bool
	F, P       float64
	DF         int
	DFDen      float64
	Comparison *Comparison
}

// SEDKind is the standard error of a difference for one kind of
// comparison: two means of Effect that differ in the factors Differ and
// agree in its other factors (as listed in Gomez & Gomez 1984, tables 3.8
// and 4.x for split and strip plots).
type SEDKind struct {
	// Key is the classic name when there is one ("main", "sub",
	// "sub_within_main", "main_within_sub" for a split plot, ...), else
	// Effect and the differing factors, such as "A:B/A".
	Key    string
	Effect string
	Differ []int  // indices into Model.Factors
	Label  string // "two B levels at the same A level"
	// SED is the mean over the pairs of this kind, Min and Max their
	// range (equal for balanced data), DF the mean Satterthwaite df.
	SED, Min, Max, DF float64
	Pairs             int
}

// Result is the analysis of one response.
type Result struct {
	Structure Structure
	Method    Method
	N         int // plots analysed
	Missing   int // plots without data
	Balanced  bool
	// Lines is the analysis of variance: for sums of squares block,
	// treatment terms and error strata in the classic order, then total;
	// for REML the treatment terms only (F tests, no sums of squares).
	Lines []Line
	// Notes are plain-language remarks for the report (unbalanced sums of
	// squares, truncated variance components, ...).
	Notes              []string
	VarianceComponents []Component
	GrandMean          float64
	Effects            []Effect
	Slices             []Slice
	SEDs               []SEDKind
	// Obs lists the input index of each plot analysed; Fitted and
	// Residuals follow it. Residuals are within the lowest stratum: the
	// response minus the fit of all fixed terms and of every error unit
	// (main plot, strip) as a fixed effect, so they are free of the
	// main-plot variation. ResidualDF is their degrees of freedom.
	Obs        []int
	Fitted     []float64
	Residuals  []float64
	ResidualDF int
	// UnitResiduals are the residuals of the higher error strata of split
	// and strip plots (main plots; sub-plots of a split-split plot;
	// strips), one per unit, for diagnostics of error (a), (b).
	UnitResiduals []UnitResiduals
	Alpha         float64
	// Covariate is what an analysis of covariance adds (nil without a
	// covariate): Lines, Effects, Slices and SEDs are then the adjusted
	// analysis.
	Covariate *Covariance
}

// Covariance is what a covariate adds to the analysis of a factorial: the
// common slope of the response on the covariate within the cells of the
// model, the test that the slope is the same in every treatment
// combination, the covariate's own analysis and the unadjusted one.
type Covariance struct {
	// Mean of the covariate over the plots analysed: every estimated
	// marginal mean is the response expected at this value.
	Mean float64
	// Left counts the plots with a response left out because their
	// covariate is missing.
	Left int
	// Slope of the response on the covariate, its standard error, t =
	// Slope/SE and the two-sided P on DF (the error df).
	Slope, SE, T, P float64
	DF              int
	// HasHomogeneity is false when separate slopes cannot be fitted (no
	// df left, or no combination whose covariate varies); the fields
	// below are then 0. HomogeneityF tests a separate slope for every
	// treatment combination (with the blocks, treatment terms and common
	// slope in the model) against the common slope, on HomogeneityDF1
	// (the extra slopes that can be estimated) and HomogeneityDF2 (the
	// error df of the separate-slopes model).
	HasHomogeneity                 bool
	HomogeneityF, HomogeneityP     float64
	HomogeneityDF1, HomogeneityDF2 int
	// OnTreatment is the analysis of the covariate itself with the same
	// model and plots (nil when it cannot be fitted, for example when the
	// treatments fix the covariate exactly), and OnTreatmentTest its F
	// test of all treatment terms together (the treatment combinations,
	// adjusted for the blocks), Source "treatments": significant means
	// the treatments changed the covariate, which must then not be used.
	OnTreatment     *Result
	HasOnTreatment  bool
	OnTreatmentTest Line
	// Unadjusted is the analysis of the response without the covariate,
	// on the same plots (nil when it cannot be fitted).
	Unadjusted *Result
}

// UnitResiduals are the residuals of one higher error stratum: the
// least-squares fit with the stratum's error terms as fixed effects minus
// the fit without them (Gomez & Gomez 1984, section 3.4: the block ×
// main-plot interaction effects of a split plot).
type UnitResiduals struct {
	Stratum string // "error_a", "error_b"
	// Unit numbers each plot analysed (following Result.Obs) with its
	// unit; Values holds one residual per unit.
	Unit   []int
	Values []float64
	DF     int // the stratum's degrees of freedom
}

// Line returns the line with the given source, if any.
func (r *Result) Line(source string) (Line, bool) {
	for _, l := range r.Lines {
		if l.Source == source {
			return l, true
		}
	}
	return Line{}, false
}

// Effect returns the effect with the given name ("A", "A:B"), if any.
func (r *Result) Effect(name string) (*Effect, bool) {
	for i := range r.Effects {
		if r.Effects[i].Name == name {
			return &r.Effects[i], true
		}
	}
	return nil, false
}

// SED returns the SED kind with the given key, if any.
func (r *Result) SED(key string) (SEDKind, bool) {
	for _, s := range r.SEDs {
		if s.Key == key {
			return s, true
		}
	}
	return SEDKind{}, false
}

// Component returns the variance component with the given name, if any.
func (r *Result) Component(name string) (Component, bool) {
	for _, c := range r.VarianceComponents {
		if c.Name == name {
			return c, true
		}
	}
	return Component{}, false
}
