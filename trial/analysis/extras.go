package analysis

import (
	"furlong/stats"
	"furlong/trial"
)

// The comparisons that go beyond the ANOVA and the letters — each entry
// against the check, the user's contrasts — are asked for by the command
// line's analyze and report and by the window's Compare and Report steps.
// The two functions below are the one rule for all of them: which check,
// which contrasts, and when a failure is an error rather than a warning.

// CompareAllWithCheck adds the comparison with the check (Dunnett,
// CompareWithCheck) to every result of outcomes: with the check given, or
// else the trial's one check of each result. lowerBetter, when true, says
// that lower values are better for every trait (for a table without the
// traits' own directions). A check the user gave that a trait cannot be
// compared with is an error; a trial's own check that cannot be used
// becomes a warning of that trait. Factorial results are left alone: their
// treatments are combinations of factor levels, compared in the Effects.
func CompareAllWithCheck(outcomes []Outcome, check string, lowerBetter bool) error {
	for _, oc := range outcomes {
		r := oc.Result
		if r == nil {
			continue
		}
		if lowerBetter {
			r.HigherBetter = false
		}
		code := check
		if code == "" {
			if r.IsFactorial() {
				continue
			}
			code = CheckOf(r)
		}
		if code == "" {
			continue
		}
		vc, err := CompareWithCheck(r, code)
		if err != nil {
			if check != "" {
				return err
			}
			r.Warnings = append(r.Warnings, "No comparison with the check: "+reason(err))
			continue
		}
		r.VsCheck = vc
	}
	return nil
}

// ContrastsFor is the list of contrasts to estimate: the trial's saved ones
// (nil for a table without a trial) with those given for this run (given)
// replacing saved ones of the same name, saved first.
func ContrastsFor(saved, given []trial.Contrast) []trial.Contrast {
	var cs []trial.Contrast
	isGiven := map[string]bool{}
	for _, c := range given {
		isGiven[c.Name] = true
	}
	for _, c := range saved {
		if !isGiven[c.Name] {
			cs = append(cs, c)
		}
	}
	return append(cs, given...)
}

// EstimateAllContrasts estimates the contrasts ContrastsFor(saved, given)
// on every result of outcomes, adjusting their p-values together by adj. A
// contrast the user gave for this run that cannot be estimated is an error;
// a saved one becomes a warning of that trait.
func EstimateAllContrasts(outcomes []Outcome, saved, given []trial.Contrast, adj stats.Adjustment) error {
	cs := ContrastsFor(saved, given)
	if len(cs) == 0 {
		return nil
	}
	for _, oc := range outcomes {
		r := oc.Result
		if r == nil {
			continue
		}
		set, err := EstimateContrasts(r, cs, adj)
		if err != nil {
			if len(given) > 0 {
				return err
			}
			r.Warnings = append(r.Warnings, "No contrasts: "+reason(err))
			continue
		}
		r.Contrasts = set
	}
	return nil
}

// reason is an error's plain message without the trait it belongs to (the
// warning is listed under that trait already).
func reason(err error) string {
	if e, ok := err.(*Error); ok {
		return e.Msg
	}
	return err.Error()
}

// Extras are the comparisons beyond the ANOVA and the letters that a view
// asks for (AddExtras).
type Extras struct {
	// VsCheck compares every entry with the check: Check when given, else
	// the trial's one check of each trait (CompareAllWithCheck).
	VsCheck bool
	Check   string
	// LowerBetter says that lower values are better for every trait (a
	// table without the traits' own directions).
	LowerBetter bool
	// Contrasts are contrasts given for this run, on top of the trial's
	// saved ones; Adjust adjusts their p-values together.
	Contrasts []trial.Contrast
	Adjust    stats.Adjustment
}

// AddExtras adds to every result the comparisons e asks for and the
// trial's saved contrasts (saved; nil for a table without a trial): the
// one step after AnalyzeAll shared by the command line's analyze and
// report and by the window's Compare and Report steps, so that each shows
// the same comparisons by the same rules.
func AddExtras(outcomes []Outcome, saved []trial.Contrast, e Extras) error {
	if e.VsCheck || e.Check != "" {
		if err := CompareAllWithCheck(outcomes, e.Check, e.LowerBetter); err != nil {
			return err
		}
	}
	return EstimateAllContrasts(outcomes, saved, e.Contrasts, e.Adjust)
}

// SavedAdjustment is the trial's remembered adjustment of its contrasts'
// p-values (the window's Contrasts tab), none when it has none: the
// default of every view that estimates the saved contrasts.
func SavedAdjustment(t *trial.Trial) stats.Adjustment {
	if a, err := stats.ParseAdjustment(t.Analysis.ContrastAdjust); err == nil {
		return a
	}
	return stats.AdjustNone
}
