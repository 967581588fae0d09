package analysis

import (
	"context"

	"furlong/stats"
	"furlong/trial"
)

// PlanPoint is the difference a design detects with a number of
// replicates: the smallest true difference between two treatment means,
// as percent of the mean, that the two-sided t test on the design's error
// degrees of freedom detects (stats.DetectableDifference).
type PlanPoint struct {
	Reps       int
	DFError    int
	Detectable float64
}

// PlanCurve is the detectable difference by number of replicates for a
// design of the given kind and treatments, at a CV (percent), level alpha
// and power: from the design's smallest number of replicates to a few past
// reps (at least 8, at most trial.MaxReps); a Latin square has only its
// own number. Replicates the design cannot have are left out.
func PlanCurve(ctx context.Context, kind trial.DesignKind, treatments, reps int, cv, alpha, power float64) ([]PlanPoint, error) {
	lo, hi := trial.MinReps, max(reps+4, 8)
	if kind == trial.Latin {
		lo, hi = reps, reps
	}
	hi = min(hi, trial.MaxReps)
	var out []PlanPoint
	for r := lo; r <= hi; r++ {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		df, err := trial.PlannedErrorDF(kind, treatments, r)
		if err != nil || df <= 0 {
			continue
		}
		d, err := stats.DetectableDifference(stats.PowerInput{Reps: r, DFError: float64(df), CV: cv, Alpha: alpha}, power)
		if err != nil {
			return nil, err
		}
		out = append(out, PlanPoint{Reps: r, DFError: df, Detectable: d})
	}
	return out, nil
}
