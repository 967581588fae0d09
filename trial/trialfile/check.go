package trialfile

import (
	"fmt"
	"math"
	"strconv"

	"furlong/trial"
)

// problem is a semantic error with the JSON path (in the version 1 shape)
// of the value at fault.
type problem struct {
	path string
	err  error
}

func fmtNum(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// check finds the first semantic error of t: duplicate plot numbers,
// treatment codes or trait keys, plots of unknown treatments, value lists
// not aligned with the plots, values impossible for their trait kind and
// non-finite numbers. Both Encode and Decode run it, so that a file
// Furlong writes is a file Furlong reads.
func check(t *trial.Trial) *problem {
	if p := checkBounds(t); p != nil {
		return p
	}
	codes := make(map[string]int, len(t.Treatments))
	for i, tr := range t.Treatments {
		if j, ok := codes[tr.Code]; ok {
			return &problem{fmt.Sprintf("trial.treatments[%d].code", i),
				errorf(ErrDuplicateTreatment, "treatment code %q is used by treatments %d and %d", tr.Code, j+1, i+1)}
		}
		codes[tr.Code] = i
		if tr.Rate != nil && !finite(*tr.Rate) {
			return &problem{fmt.Sprintf("trial.treatments[%d].rate", i), errorf(ErrValueKind, "the rate of treatment %q is not a finite number", tr.Code)}
		}
	}
	numbers := make(map[int]int, len(t.Plots))
	for i, p := range t.Plots {
		if j, ok := numbers[p.Number]; ok {
			return &problem{fmt.Sprintf("trial.plots[%d].number", i),
				errorf(ErrDuplicatePlot, "plot number %d is used twice (plots %d and %d in walking order)", p.Number, j+1, i+1)}
		}
		numbers[p.Number] = i
		if _, ok := codes[p.Treatment]; !ok {
			return &problem{fmt.Sprintf("trial.plots[%d].treatment", i),
				errorf(ErrUnknownTreatment, "plot %d names treatment %q, which the trial does not have", p.Number, p.Treatment)}
		}
	}
	keys := make(map[string]int, len(t.Traits))
	for j, tr := range t.Traits {
		if k, ok := keys[tr.Key]; ok {
			return &problem{fmt.Sprintf("trial.traits[%d].key", j),
				errorf(ErrDuplicateTrait, "trait key %q is used by traits %d and %d", tr.Key, k+1, j+1)}
		}
		keys[tr.Key] = j
		for _, b := range []struct {
			name string
			v    *float64
		}{{"min", tr.Min}, {"max", tr.Max}} {
			if b.v != nil && !finite(*b.v) {
				return &problem{fmt.Sprintf("trial.traits[%d].%s", j, b.name), errorf(ErrValueKind, "the %s of trait %q is not a finite number", b.name, tr.Key)}
			}
		}
		if msg := trial.TransformProblem(tr.Transform, tr.Kind); msg != "" {
			return &problem{fmt.Sprintf("trial.traits[%d].transform", j), errorf(ErrWrongType, "trait %q: %s", tr.Key, msg)}
		}
		if tr.Derived != nil {
			if len(tr.Values) > 0 {
				return &problem{fmt.Sprintf("trial.traits[%d].values", j),
					errorf(ErrValueCount, "trait %q is computed from other traits and cannot store values", tr.Key)}
			}
			if !finite(tr.Derived.StandardMoisture) || !finite(tr.Derived.BushelWeightLb) {
				return &problem{fmt.Sprintf("trial.traits[%d].derived", j), errorf(ErrValueKind, "the formula of trait %q holds a number that is not finite", tr.Key)}
			}
			continue
		}
		if len(tr.Values) != len(t.Plots) {
			return &problem{fmt.Sprintf("trial.traits[%d].values", j),
				errorf(ErrValueCount, "trait %q has %d values for %d plots", tr.Key, len(tr.Values), len(t.Plots))}
		}
		for i, v := range tr.Values {
			if trial.IsMissing(v) {
				continue
			}
			if why := tr.Kind.Problem(v); why != "" {
				return &problem{fmt.Sprintf("trial.traits[%d].values[%d]", j, i),
					errorf(ErrValueKind, "the %s value %s of plot %d %s", tr.Key, fmtNum(v), t.Plots[i].Number, why)}
			}
		}
	}
	if msg := trial.MethodProblem(t.Analysis.Method); msg != "" {
		return &problem{"trial.analysis.mean_separation", errorf(ErrWrongType, "%s", msg)}
	}
	l := t.Layout
	if n := l.Orientation.North; n != "" && !n.Valid() {
		return &problem{"trial.layout.north", errorf(ErrWrongType, "the map edge facing north is %q; use top, right, bottom or left, or leave it out", string(n))}
	}
	for _, f := range []struct {
		name string
		v    float64
	}{{"plot_length", l.PlotLength}, {"plot_width", l.PlotWidth}, {"harvest_length", l.HarvestLength}, {"harvest_width", l.HarvestWidth}, {"alley", l.Alley}} {
		if !finite(f.v) {
			return &problem{"trial.layout." + f.name, errorf(ErrValueKind, "the layout's %s is not a finite number", f.name)}
		}
	}
	for _, f := range []struct {
		name string
		v    *float64
	}{{"latitude", t.Site.Latitude}, {"longitude", t.Site.Longitude}} {
		if f.v != nil && !finite(*f.v) {
			return &problem{"trial.site." + f.name, errorf(ErrValueKind, "the site's %s is not a finite number", f.name)}
		}
	}
	return nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
