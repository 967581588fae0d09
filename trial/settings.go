package trial

import "strings"

// YieldTrait returns the index in traits of the trial's yield: the first
// derived adjusted-yield trait, else the first trait keyed or named "yield"
// (case-insensitively), else −1. It is the trait that shows a percentage of
// the check when the user has not chosen (see Trial.ShowsPercentOfCheck).
func YieldTrait(traits []Trait) int {
	for i, tr := range traits {
		if tr.Derived != nil && tr.Derived.Kind == AdjustedYield {
			return i
		}
	}
	for i, tr := range traits {
		if strings.EqualFold(strings.TrimSpace(tr.Key), "yield") || strings.EqualFold(strings.TrimSpace(tr.Name), "yield") {
			return i
		}
	}
	return -1
}

// ShowsPercentOfCheck reports whether the means of the trait with key are
// shown as percentages of the check mean: the trait's own PercentOfCheck
// when set, else true for the trial's yield trait only (YieldTrait). It is
// false for a key the trial does not have.
func (t *Trial) ShowsPercentOfCheck(key string) bool {
	i := t.TraitIndex(key)
	if i < 0 {
		return false
	}
	if p := t.Traits[i].PercentOfCheck; p != nil {
		return *p
	}
	return YieldTrait(t.Traits) == i
}

// TransformProblem says why name cannot be the transformation of a trait
// of kind k, as a sentence; "" when it can. The arcsine square root maps
// a percentage onto an angle and applies to percent traits only (common
// practice: Gomez & Gomez 1984, chapter 7).
func TransformProblem(name string, k TraitKind) string {
	switch name {
	case TransformNone, TransformLog, TransformSqrt:
		return ""
	case TransformArcsine:
		if k != Percent {
			return "the arcsine transformation is for percentages; make the trait a percent trait or choose log or square root"
		}
		return ""
	}
	return "the transformation " + quote(name) + " is not known; use none, log, sqrt or arcsin"
}

// MethodProblem says why name cannot be a trial's mean-separation method,
// "" when it can ("" itself stands for MethodLSD).
func MethodProblem(name string) string {
	switch name {
	case "", MethodLSD, MethodTukey:
		return ""
	}
	return "the mean-separation method " + quote(name) + " is not known; use lsd or tukey"
}

func quote(s string) string { return `"` + s + `"` }
