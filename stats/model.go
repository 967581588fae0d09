// Package stats fits the linear models of replicated field trials (one-way,
// blocked, Latin square) and returns their analysis of variance.
//
// It knows nothing of trials: inputs are responses and factor level indices,
// outputs are tables. It imports only gonum.
package stats

// Factor assigns each observation to one level of a classification.
type Factor struct {
	Name   string // "treatment", "block", "row", "column"
	Levels int    // number of levels; level indices are 0..Levels-1
	Index  []int  // Index[i] is the level of observation i
	// Role of a nuisance factor's ANOVA line (RoleBlock, RoleRow,
	// RoleColumn or RoleNuisance). RoleNone lets Fit choose from the number
	// of nuisance factors: one is a block, two are a row and a column. The
	// treatment factor's line is always RoleTreatment.
	Role Role
}

// Model is a linear model y = mean + treatment + nuisance factors + error.
// Treatment may have many levels (hundreds of entries); the nuisance factors
// (blocks, or the rows and columns of a Latin square) are expected to be few.
type Model struct {
	Response  []float64 // finite values only; drop missing observations before fitting
	Treatment Factor
	Nuisance  []Factor // none: one-way; one (block): RCBD; two (row, column): Latin square
	// Origin, when not 0, is the common part of the values that the caller
	// has already taken away: the values are Origin + Response[i]. A caller
	// holding the values as decimal numbers can subtract their shared
	// leading digits exactly (1000000000000.4 − 1000000000000 = 0.4, which
	// float64 holds far better than the whole value), so that no digit of
	// the differences is lost to rounding. Means, the grand mean, fitted
	// values and CV% are reported on the values' own scale, Origin included;
	// sums of squares, SEs and residuals do not depend on it.
	Origin float64
}

// Source is one line of an analysis of variance table.
type Source struct {
	Name string // "treatment", a nuisance factor's name, "error" or "total"
	Role Role   // what the line stands for; find lines with Table.Line
	DF   int
	SS   float64
	MS   float64 // 0 for the total line
	// HasTest is false for the error and total lines, which have no F test;
	// F and P are then 0 and must not be shown.
	HasTest bool
	F       float64
	P       float64
}

// LevelMean is the estimated mean of one treatment level.
type LevelMean struct {
	N       int     // observations used
	Mean    float64 // least-squares mean (equals RawMean in balanced data)
	RawMean float64 // arithmetic mean of the observations
	SE      float64 // standard error of the least-squares mean
}

// Transform is a transformation of the responses applied before fitting.
type Transform string

// The transformations ApplyTransform knows (see its documentation for the
// handling of zeros and of the domain of each).
const (
	NoTransform Transform = ""
	Log         Transform = "log"    // natural log; log(y+1) when any value is 0
	Sqrt        Transform = "sqrt"   // square root; √(y+0.5) for counts with zeros
	ArcsineSqrt Transform = "arcsin" // arcsine square root of a percentage/100, in degrees
)
