package trial

import (
	"fmt"
	"strings"
)

// hasDataError is an ErrHasData with a message fitting the refused edit.
type hasDataError struct{ msg string }

func (e *hasDataError) Error() string        { return e.msg }
func (e *hasDataError) Is(target error) bool { return target == ErrHasData }

var errEditHasData = &hasDataError{"this trial already holds recorded data; changing its treatments, design or field arrangement would move treatments away from their values. Start a copy of the trial instead."}

// relayOut is called after a change to the treatments, the design or the
// field arrangement. A trial that has plots is laid out again in standard
// (unrandomised) order when the new settings allow it, or left without
// plots when they do not; either way its randomisation is cleared and it
// must be randomised again.
func (t *Trial) relayOut() {
	forgetPlotIndex(t.Plots)
	if len(t.Plots) == 0 && !t.Randomized() {
		return
	}
	t.Random = Randomization{}
	plots, err := LayOutPlan(t.Factors, t.Treatments, t.Design, t.Layout)
	if err != nil {
		plots = nil
	}
	t.setPlots(plots)
}

// editTreatments applies change to a copy of the treatment list, keeps a
// Latin square square, and lays the trial out again. It refuses a trial
// holding data.
func (t *Trial) editTreatments(change func([]Treatment) ([]Treatment, error)) error {
	if t.HasData() {
		return errEditHasData
	}
	if t.Factorial() {
		return errFactorialList
	}
	old := len(t.Treatments)
	ts, err := change(cloneTreatments(t.Treatments))
	if err != nil {
		return err
	}
	t.Treatments = ts
	if t.Design.Kind == Latin && t.Design.Reps == old {
		t.Design.Reps = len(ts)
	}
	t.relayOut()
	return nil
}

// checkNewCode checks a code for a treatment at index self (−1 for a new
// one) against the others.
func (t *Trial) checkNewCode(code string, self int) error {
	if err := CheckCode(code); err != nil {
		return err
	}
	for i, tr := range t.Treatments {
		if i != self && strings.EqualFold(tr.Code, code) {
			return &ValidationError{Field: "Code", Msg: fmt.Sprintf("treatment code %q is already used by treatment %d; each treatment needs its own code", code, i+1)}
		}
	}
	return nil
}

// AddTreatment appends a treatment. A trial holding data is refused
// (errors.Is(err, ErrHasData)); a laid-out trial is laid out again
// unrandomised and must be randomised again. A Latin square grows with its
// treatment list.
func (t *Trial) AddTreatment(tr Treatment) error {
	if t.Factorial() {
		return errFactorialList
	}
	if err := t.checkNewCode(tr.Code, -1); err != nil {
		return err
	}
	return t.editTreatments(func(ts []Treatment) ([]Treatment, error) {
		return append(ts, cloneTreatments([]Treatment{tr})...), nil
	})
}

// RemoveTreatment removes the treatment with code, with the same rules as
// AddTreatment.
func (t *Trial) RemoveTreatment(code string) error {
	i := t.TreatmentIndex(code)
	if i < 0 {
		return fmt.Errorf("the trial has no treatment %q", code)
	}
	return t.editTreatments(func(ts []Treatment) ([]Treatment, error) {
		return append(ts[:i], ts[i+1:]...), nil
	})
}

// MoveTreatment moves the treatment with code to index to of the list (0 is
// the first), with the same rules as AddTreatment: the treatment order is
// part of the randomisation.
func (t *Trial) MoveTreatment(code string, to int) error {
	i := t.TreatmentIndex(code)
	if i < 0 {
		return fmt.Errorf("the trial has no treatment %q", code)
	}
	if to < 0 || to >= len(t.Treatments) {
		return fmt.Errorf("a treatment can move to places 1 to %d, not %d", len(t.Treatments), to+1)
	}
	if i == to {
		return nil
	}
	return t.editTreatments(func(ts []Treatment) ([]Treatment, error) {
		tr := ts[i]
		ts = append(ts[:i], ts[i+1:]...)
		ts = append(ts[:to], append([]Treatment{tr}, ts[to:]...)...)
		return ts, nil
	})
}

// UpdateTreatment replaces the description of the treatment with code by tr
// (name, role, rate, ...). It is allowed at any time because it does not move
// plots; when tr.Code differs from code the treatment is renamed on every
// plot.
func (t *Trial) UpdateTreatment(code string, tr Treatment) error {
	i := t.TreatmentIndex(code)
	if i < 0 {
		return fmt.Errorf("the trial has no treatment %q", code)
	}
	if t.Factorial() {
		if tr.Code != code || !equalStrings(tr.Levels, t.Treatments[i].Levels) {
			return &ValidationError{Field: "Code", Msg: fmt.Sprintf("the code and levels of treatment %q come from its factors; change the factor levels instead", code)}
		}
	} else if err := t.checkNewCode(tr.Code, i); err != nil {
		return err
	}
	switch tr.Role {
	case "", RoleEntry, RoleCheck, RoleUntreated:
	default:
		return &ValidationError{Field: "Role", Msg: fmt.Sprintf("treatment %q has role %q; a treatment is an entry, a check or the untreated check", tr.Code, tr.Role)}
	}
	t.Treatments[i] = cloneTreatments([]Treatment{tr})[0]
	if tr.Code != code {
		for k := range t.Plots {
			if t.Plots[k].Treatment == code {
				t.Plots[k].Treatment = tr.Code
			}
		}
		for k, c := range t.Analysis.Response.LeaveOut {
			if c == code {
				t.Analysis.Response.LeaveOut[k] = tr.Code
			}
		}
		for k := range t.Economics.Costs {
			if t.Economics.Costs[k].Treatment == code {
				t.Economics.Costs[k].Treatment = tr.Code
			}
		}
	}
	return nil
}

// SetDesign changes the design. A trial holding data is refused (ErrHasData);
// a laid-out trial is laid out again unrandomised. An invalid design is
// refused with a ValidationErrors and nothing changes.
func (t *Trial) SetDesign(d Design) error {
	if d == t.Design {
		return nil
	}
	if err := ValidatePlan(t.Factors, t.Treatments, d); err != nil {
		return err
	}
	if t.HasData() {
		return errEditHasData
	}
	t.Design = d
	t.relayOut()
	return nil
}

// SetLayout changes the plot geometry and field arrangement. Geometry alone
// (lengths, widths, alley) can change at any time; a change to PlotsPerRow,
// Blocks, Numbering or Walk moves plots, so it is refused for a trial holding
// data (ErrHasData) and lays a trial out again unrandomised otherwise.
func (t *Trial) SetLayout(l Layout) error {
	if err := ValidateLayout(l); err != nil {
		return err
	}
	l = l.withDefaults()
	old := t.Layout.withDefaults()
	moves := l.Numbering != old.Numbering || l.Walk != old.Walk
	if t.Design.Kind != Latin && t.Design.Kind != StripPlot { // a Latin square and a strip plot ignore these two
		moves = moves || l.PlotsPerRow != old.PlotsPerRow || l.Blocks != old.Blocks
	}
	if moves && t.HasData() {
		return errEditHasData
	}
	t.Layout = l
	if moves {
		t.relayOut()
	}
	return nil
}

// AddTrait appends a trait. A recorded trait gets one missing value per plot,
// or keeps its Values when there is one per plot; a derived trait must have
// no Values. The trait is checked as Validate would check it (key, range,
// decimals, formula) and refused with a ValidationErrors if it has problems.
func (t *Trial) AddTrait(tr Trait) error {
	tr = cloneTrait(tr)
	switch {
	case tr.Derived != nil:
	case tr.Values == nil:
		tr.Values = missingValues(len(t.Plots))
	case len(tr.Values) != len(t.Plots):
		return &ValidationError{Field: "Values", Msg: fmt.Sprintf("trait %q has %d values for %d plots", tr.Key, len(tr.Values), len(t.Plots))}
	}
	seen := make(map[string]int, len(t.Traits))
	for j := range t.Traits {
		seen[strings.ToLower(t.Traits[j].Key)] = j
	}
	t.Traits = append(t.Traits, tr)
	var p problems
	p.checkTrait(t, len(t.Traits)-1, seen)
	if err := p.err(); err != nil {
		t.Traits = t.Traits[:len(t.Traits)-1]
		return err
	}
	return nil
}

// RemoveTrait removes the trait with key and its values, and the plots'
// exclusions for it. A trait another trait is computed from is refused.
func (t *Trial) RemoveTrait(key string) error {
	j := t.TraitIndex(key)
	if j < 0 {
		return fmt.Errorf("the trial has no trait %q", key)
	}
	for _, tr := range t.Traits {
		if d := tr.Derived; d != nil && (d.WeightTrait == key || d.MoistureTrait == key) {
			return fmt.Errorf("trait %q is used to compute trait %q; remove %q first", key, tr.Key, tr.Key)
		}
	}
	t.Traits = append(t.Traits[:j], t.Traits[j+1:]...)
	for i := range t.Plots {
		t.Plots[i].Exclusions = dropExclusions(t.Plots[i].Exclusions, key)
	}
	for i := range t.Traits {
		if t.Traits[i].Covariate == key {
			t.Traits[i].Covariate = "" // its covariate is gone (undo brings both back)
		}
	}
	if t.Economics.Trait == key {
		t.Economics.Trait = ""
	}
	return nil
}

// dropExclusions removes the exclusions for trait key.
func dropExclusions(es []Exclusion, key string) []Exclusion {
	out := es[:0]
	for _, e := range es {
		if e.Trait != key {
			out = append(out, e)
		}
	}
	if len(out) == 0 {
		return nil
	}
	return out
}

// errNoPlot is the error for a plot index out of range.
func (t *Trial) errNoPlot(plotIdx int) error {
	return fmt.Errorf("there is no plot %d in walking order; the trial has %d plots", plotIdx+1, len(t.Plots))
}

// Exclude leaves plot plotIdx out of the analysis of the trait with key, or
// of every trait when key is "", for reason (for example "hail"). The
// plot's values stay. Excluding again for the same key replaces the reason.
func (t *Trial) Exclude(plotIdx int, key, reason string) error {
	if plotIdx < 0 || plotIdx >= len(t.Plots) {
		return t.errNoPlot(plotIdx)
	}
	if key != "" && t.TraitIndex(key) < 0 {
		return fmt.Errorf("the trial has no trait %q", key)
	}
	reason = strings.TrimSpace(reason)
	p := &t.Plots[plotIdx]
	for i := range p.Exclusions {
		if p.Exclusions[i].Trait == key {
			p.Exclusions[i].Reason = reason
			return nil
		}
	}
	p.Exclusions = append(p.Exclusions, Exclusion{Trait: key, Reason: reason})
	return nil
}

// Include takes back the exclusion of plot plotIdx for the trait with key;
// key "" takes back every exclusion of the plot. Including a plot that is
// not excluded does nothing.
func (t *Trial) Include(plotIdx int, key string) error {
	if plotIdx < 0 || plotIdx >= len(t.Plots) {
		return t.errNoPlot(plotIdx)
	}
	p := &t.Plots[plotIdx]
	if key == "" {
		p.Exclusions = nil
		return nil
	}
	p.Exclusions = dropExclusions(p.Exclusions, key)
	return nil
}

// SetNote sets the note of plot plotIdx.
func (t *Trial) SetNote(plotIdx int, note string) error {
	if plotIdx < 0 || plotIdx >= len(t.Plots) {
		return t.errNoPlot(plotIdx)
	}
	t.Plots[plotIdx].Note = note
	return nil
}

// UpdateTrait replaces the description of the trait with key by tr: its
// name, unit, kind, valid range, decimals, date assessed, whether higher is
// better, and for a derived trait its formula's settings. The recorded
// values stay (tr.Values is ignored); a stored trait cannot become derived
// or the other way round. A new key is allowed when it is free: the plots'
// exclusions and derived traits follow the rename. The change is refused,
// leaving the trial as it was, when the trait would be invalid or an
// existing value impossible for the new kind (a count of 2.5).
func (t *Trial) UpdateTrait(key string, tr Trait) error {
	j := t.TraitIndex(key)
	if j < 0 {
		return fmt.Errorf("the trial has no trait %q", key)
	}
	old := t.Traits[j]
	if (old.Derived == nil) != (tr.Derived == nil) {
		if old.Derived != nil {
			return fmt.Errorf("trait %q is computed from other traits; remove it and add a recorded trait instead", key)
		}
		return fmt.Errorf("trait %q holds recorded values; add a new derived trait instead", key)
	}
	tr = cloneTrait(tr)
	tr.Values = old.Values
	saved := t.Clone()
	t.Traits[j] = tr
	if tr.Key != key {
		for i := range t.Traits {
			if d := t.Traits[i].Derived; d != nil && i != j {
				if d.WeightTrait == key {
					d.WeightTrait = tr.Key
				}
				if d.MoistureTrait == key {
					d.MoistureTrait = tr.Key
				}
			}
		}
		for i := range t.Plots {
			for e := range t.Plots[i].Exclusions {
				if t.Plots[i].Exclusions[e].Trait == key {
					t.Plots[i].Exclusions[e].Trait = tr.Key
				}
			}
		}
		if t.Economics.Trait == key {
			t.Economics.Trait = tr.Key
		}
		for i := range t.Traits {
			if t.Traits[i].Covariate == key {
				t.Traits[i].Covariate = tr.Key
			}
		}
	}
	var p problems
	p.checkTraits(t)
	if err := p.err(); err != nil {
		*t = *saved
		return err
	}
	return nil
}
