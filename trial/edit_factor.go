package trial

import (
	"fmt"
)

// errFactorialList is returned by the edits of a treatment list on a
// factorial trial, whose treatments come from its factors.
var errFactorialList = &ValidationError{Field: "Treatments", Msg: "the treatments of this trial are the combinations of its factors; add, remove or reorder levels of a factor instead"}

// SetPlan changes the treatment structure and the design together: with
// factors, the treatments become their combinations (see Combinations),
// keeping the name, role, description and rate of every combination whose
// code was already a treatment; with no factors (nil), the trial goes back
// to one list and keeps its treatments as they are, without levels. The
// plan is checked as ValidatePlan checks it and refused with a
// ValidationErrors, nothing changed, when it does not fit. A trial holding
// data is refused (ErrHasData); a laid-out trial is laid out again
// unrandomised and must be randomised again.
func (t *Trial) SetPlan(factors []Factor, d Design) error {
	fs := cloneFactors(factors)
	if len(fs) == 0 {
		fs = nil
	}
	var ts []Treatment
	if fs == nil {
		ts = cloneTreatments(t.Treatments)
		if t.Factorial() {
			for i := range ts {
				ts[i].Levels = nil
			}
		}
	} else {
		if err := ValidateFactors(fs); err != nil {
			return err
		}
		ts = Combinations(fs)
		for i := range ts {
			if old := t.Treatment(ts[i].Code); old != nil && old.Levels != nil {
				ts[i].Name, ts[i].Role, ts[i].Description = old.Name, old.Role, old.Description
				ts[i].Rate, ts[i].RateUnit = clonePtr(old.Rate), old.RateUnit
			}
		}
	}
	if err := ValidatePlan(fs, ts, d); err != nil {
		return err
	}
	if equalPlan(t.Factors, fs) && d == t.Design {
		return nil
	}
	if t.HasData() {
		return errEditHasData
	}
	for _, f := range fs {
		for _, tr := range t.Traits {
			if equalFoldKey(f.Key, tr.Key) {
				return &ValidationError{Field: "Factors", Msg: fmt.Sprintf("factor key %q is also the key of a trait; the field book needs a column for each, so give the factor another key", f.Key)}
			}
		}
	}
	t.Factors, t.Treatments, t.Design = fs, ts, d
	t.relayOut()
	return nil
}

// SetFactors is SetPlan with the trial's design, adjusted to the new
// factors: a main-plot or subplot factor that is no longer among them is
// cleared (so the first factors take those places).
func (t *Trial) SetFactors(factors []Factor) error {
	d := t.Design
	if factorIndex(factors, d.MainFactor) < 0 {
		d.MainFactor = ""
	}
	if factorIndex(factors, d.SubFactor) < 0 {
		d.SubFactor = ""
	}
	return t.SetPlan(factors, d)
}

func equalFoldKey(a, b string) bool {
	return len(a) == len(b) && (a == b || lowerASCII(a) == lowerASCII(b))
}

func lowerASCII(s string) string {
	b := []byte(s)
	for i, c := range b {
		if c >= 'A' && c <= 'Z' {
			b[i] = c + 'a' - 'A'
		}
	}
	return string(b)
}

// equalPlan reports whether two factor lists are the same in every field.
func equalPlan(a, b []Factor) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Key != b[i].Key || a[i].Name != b[i].Name || len(a[i].Levels) != len(b[i].Levels) {
			return false
		}
		for k, l := range a[i].Levels {
			m := b[i].Levels[k]
			sameValue := l.Value == nil && m.Value == nil || l.Value != nil && m.Value != nil && *l.Value == *m.Value
			if l.Code != m.Code || l.Name != m.Name || l.Unit != m.Unit || !sameValue {
				return false
			}
		}
	}
	return true
}
