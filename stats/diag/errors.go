package diag

import "errors"

// NotApplicableError reports that a diagnostic cannot be computed for the
// data given (too few values, missing plots, no variation). Reason is a
// plain sentence a trial manager can act on.
type NotApplicableError struct {
	Test   string // "normality", "Levene", "Bartlett", "non-additivity", "residuals"
	Reason string
}

// Error returns the plain-language reason.
func (e *NotApplicableError) Error() string { return e.Reason }

// ErrNotApplicable is matched by every *NotApplicableError with errors.Is.
var ErrNotApplicable = errors.New("the diagnostic does not apply to these data")

// Is reports whether target is ErrNotApplicable.
func (e *NotApplicableError) Is(target error) bool { return target == ErrNotApplicable }

func notApplicable(test, reason string) error {
	return &NotApplicableError{Test: test, Reason: reason}
}
