package trial

import "fmt"

// PlannedErrorDF returns the error degrees of freedom of a complete layout
// of the design with the given numbers of treatments and replicates, as the
// planning calculations need them before any plot exists:
//
//	completely randomised:          t(r - 1)
//	randomised complete block:      (t - 1)(r - 1)
//	Latin square (r = t):           (t - 1)(t - 2)
//
// (the error lines of the classic ANOVA tables; Cochran & Cox 1957, ch. 4).
// The numbers must be within the limits the design allows.
func PlannedErrorDF(kind DesignKind, treatments, reps int) (int, error) {
	if treatments < 2 {
		return 0, fmt.Errorf("a comparison needs at least 2 treatments, not %d", treatments)
	}
	switch kind {
	case CRD, RCBD:
		if reps < MinReps || reps > MaxReps {
			return 0, fmt.Errorf("the number of replicates must be between %d and %d, not %d", MinReps, MaxReps, reps)
		}
		if kind == CRD {
			return treatments * (reps - 1), nil
		}
		return (treatments - 1) * (reps - 1), nil
	case Latin:
		if treatments < MinLatin || treatments > MaxLatin {
			return 0, fmt.Errorf("a Latin square needs between %d and %d treatments, not %d", MinLatin, MaxLatin, treatments)
		}
		if reps != treatments {
			return 0, fmt.Errorf("a Latin square of %d treatments has %d replicates, not %d", treatments, treatments, reps)
		}
		return (treatments - 1) * (treatments - 2), nil
	}
	return 0, fmt.Errorf("the design %q is not one Furlong can plan; choose crd, rcbd or latin", string(kind))
}
