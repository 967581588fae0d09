package stats

import "fmt"

// ErrorKind classifies the problems with input data that stop a fit or a
// transformation. Programming errors (slices of different lengths, level
// indices out of range) are not reported this way: they panic.
type ErrorKind int

const (
	// NoData means there are no observations at all.
	NoData ErrorKind = iota + 1
	// TooFewTreatments means fewer than two treatment levels have data.
	TooFewTreatments
	// TooFewLevels means a nuisance factor (block, row, column) has fewer than
	// two levels, so there is nothing to separate.
	TooFewLevels
	// EmptyLevel means a level of a factor has no observations (a treatment with
	// no data, a block whose plots are all missing, an empty row or column
	// of a Latin square).
	EmptyLevel
	// NoErrorDF means the data leave no degrees of freedom for error.
	NoErrorDF
	// ZeroErrorVariance means the model fits the data exactly (or all values are
	// equal), so there is no error variance to test against.
	ZeroErrorVariance
	// NonFiniteValue means a response is NaN or infinite.
	NonFiniteValue
	// Confounded means the effects of two factors cannot be told apart with the
	// observations present (the design matrix is rank deficient).
	Confounded
	// BadValue means a value is outside the domain of the chosen transformation
	// (a negative value for log or square root, a percentage outside 0–100).
	BadValue
	// UnknownTransform means the transformation is not one this package knows.
	UnknownTransform
)

// String returns a short identifier for the kind.
func (k ErrorKind) String() string {
	switch k {
	case NoData:
		return "no data"
	case TooFewTreatments:
		return "too few treatments"
	case TooFewLevels:
		return "too few levels"
	case EmptyLevel:
		return "empty level"
	case NoErrorDF:
		return "no error degrees of freedom"
	case ZeroErrorVariance:
		return "zero error variance"
	case NonFiniteValue:
		return "non-finite value"
	case Confounded:
		return "confounded"
	case BadValue:
		return "value outside transformation domain"
	case UnknownTransform:
		return "unknown transformation"
	}
	return fmt.Sprintf("ErrorKind(%d)", int(k))
}

// InputError is a problem with the data given to Fit or ApplyTransform that
// the trial manager can correct. Its message is a plain sentence.
//
// Factor and Level locate the problem when it concerns one factor level
// (Level is the 0-based level index, -1 when not applicable); Obs is the
// 0-based observation index for problems with one value (-1 otherwise).
// The caller can map these to its own treatment codes and plot numbers.
type InputError struct {
	Kind   ErrorKind
	Factor string // factor name from the Model, "" when not applicable
	Level  int
	Obs    int
	Reason string // plain-language sentence
}

// Error returns the plain-language reason.
func (e *InputError) Error() string { return e.Reason }

// Is reports whether target is an *InputError of the same Kind, so that
// errors.Is(err, stats.ErrEmptyLevel) works whatever the factor or level.
func (e *InputError) Is(target error) bool {
	t, ok := target.(*InputError)
	return ok && t.Kind == e.Kind
}

// Sentinels for errors.Is; the errors returned carry more detail.
var (
	ErrNoData            = &InputError{Kind: NoData, Level: -1, Obs: -1, Reason: "there are no observations to analyse"}
	ErrTooFewTreatments  = &InputError{Kind: TooFewTreatments, Level: -1, Obs: -1, Reason: "only one treatment has data: at least two are needed to compare"}
	ErrTooFewLevels      = &InputError{Kind: TooFewLevels, Level: -1, Obs: -1, Reason: "a blocking factor has only one level"}
	ErrEmptyLevel        = &InputError{Kind: EmptyLevel, Level: -1, Obs: -1, Reason: "a factor level has no observations"}
	ErrNoErrorDF         = &InputError{Kind: NoErrorDF, Level: -1, Obs: -1, Reason: "there are too few observations to estimate the experimental error"}
	ErrZeroErrorVariance = &InputError{Kind: ZeroErrorVariance, Level: -1, Obs: -1, Reason: "the model fits the data exactly, so there is no experimental error to test against"}
	ErrNonFiniteValue    = &InputError{Kind: NonFiniteValue, Level: -1, Obs: -1, Reason: "a value is not a finite number"}
	ErrConfounded        = &InputError{Kind: Confounded, Level: -1, Obs: -1, Reason: "the effects of two factors cannot be separated with the plots that have data"}
	ErrBadValue          = &InputError{Kind: BadValue, Level: -1, Obs: -1, Reason: "a value is outside the range the transformation accepts"}
	ErrUnknownTransform  = &InputError{Kind: UnknownTransform, Level: -1, Obs: -1, Reason: "the transformation is not known"}
)

// levelNoun is the word used for a level of a factor in messages.
func levelNoun(factor string) string {
	switch factor {
	case "":
		return "level"
	case "treatment", "block", "row", "column", "site", "replicate":
		return factor
	}
	return factor + " level"
}
