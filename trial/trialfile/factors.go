package trialfile

import (
	"errors"
	"fmt"
	"strings"

	"furlong/trial"
)

// ErrBadFactor is wrapped by the errors about a trial's treatment factors
// (version 3): a duplicate key or level code, a treatment whose levels do
// not match the factors, a design naming a factor the trial lacks.
var ErrBadFactor = errors.New("the treatment factors do not fit together")

func fromFactorsV3(fs []factorV3) []trial.Factor {
	if len(fs) == 0 {
		return nil
	}
	out := make([]trial.Factor, len(fs))
	for i, f := range fs {
		tf := trial.Factor{Key: f.Key, Name: f.Name}
		if len(f.Levels) > 0 {
			tf.Levels = make([]trial.Level, len(f.Levels))
			for k, l := range f.Levels {
				tf.Levels[k] = trial.Level{Code: l.Code, Name: l.Name, Value: l.Value, Unit: l.Unit}
			}
		}
		out[i] = tf
	}
	return out
}

func toFactorsV3(fs []trial.Factor) []factorV3 {
	if len(fs) == 0 {
		return nil
	}
	out := make([]factorV3, len(fs))
	for i, f := range fs {
		ff := factorV3{Key: f.Key, Name: f.Name, Levels: make([]levelV3, len(f.Levels))}
		for k, l := range f.Levels {
			ff.Levels[k] = levelV3{Code: l.Code, Name: l.Name, Value: l.Value, Unit: l.Unit}
		}
		out[i] = ff
	}
	return out
}

// checkFactorBounds checks the version 3 members: at most trial.MaxFactors
// factors of at most trial.MaxLevels levels, distinct factor keys and
// level codes, finite level values, every treatment of a factorial trial
// with one known level of each factor (and none in a trial without
// factors), a split or strip plot with factors, main and subplot factors
// that the trial has, and main-plot, subplot and strip numbers from 0 to
// MaxPosition.
func checkFactorBounds(t *trial.Trial) *problem {
	if len(t.Factors) > trial.MaxFactors {
		return &problem{"trial.factors", errorf(ErrOutOfRange, "the trial has %d treatment factors; Furlong crosses at most %d", len(t.Factors), trial.MaxFactors)}
	}
	keys := map[string]int{}
	for i, f := range t.Factors {
		path := fmt.Sprintf("trial.factors[%d]", i)
		if f.Key == "" {
			return &problem{path + ".key", errorf(ErrBadFactor, "factor %d has no key", i+1)}
		}
		if j, dup := keys[strings.ToLower(f.Key)]; dup {
			return &problem{path + ".key", errorf(ErrBadFactor, "factor key %q is used by factors %d and %d", f.Key, j+1, i+1)}
		}
		keys[strings.ToLower(f.Key)] = i
		if len(f.Levels) > trial.MaxLevels {
			return &problem{path + ".levels", errorf(ErrOutOfRange, "factor %s has %d levels; a factor has at most %d", f.Key, len(f.Levels), trial.MaxLevels)}
		}
		codes := map[string]int{}
		for k, l := range f.Levels {
			if j, dup := codes[l.Code]; dup {
				return &problem{fmt.Sprintf("%s.levels[%d].code", path, k), errorf(ErrBadFactor, "factor %s has level code %q at levels %d and %d", f.Key, l.Code, j+1, k+1)}
			}
			codes[l.Code] = k
			if l.Value != nil && !finite(*l.Value) {
				return &problem{fmt.Sprintf("%s.levels[%d].value", path, k), errorf(ErrValueKind, "the value of level %q of factor %s is not a finite number", l.Code, f.Key)}
			}
		}
	}
	for i, tr := range t.Treatments {
		path := fmt.Sprintf("trial.treatments[%d].levels", i)
		switch {
		case len(t.Factors) == 0 && len(tr.Levels) > 0:
			return &problem{path, errorf(ErrBadFactor, "treatment %q has factor levels, but the trial has no factors", tr.Code)}
		case len(t.Factors) > 0 && len(tr.Levels) != len(t.Factors):
			return &problem{path, errorf(ErrBadFactor, "treatment %q has %d factor levels for %d factors", tr.Code, len(tr.Levels), len(t.Factors))}
		}
		for k, code := range tr.Levels {
			if t.Factors[k].LevelIndex(code) < 0 {
				return &problem{fmt.Sprintf("%s[%d]", path, k), errorf(ErrBadFactor, "treatment %q has level %q of factor %s, which the factor does not have", tr.Code, code, t.Factors[k].Key)}
			}
		}
	}
	d := t.Design
	if d.Kind.Restricted() && len(t.Factors) < 2 {
		return &problem{"trial.design.kind", errorf(ErrBadFactor, "the trial is a %s but has %d treatment factors; it needs at least 2", d.Kind.Name(), len(t.Factors))}
	}
	for _, m := range []struct{ name, key string }{{"main_factor", d.MainFactor}, {"sub_factor", d.SubFactor}} {
		if m.key != "" && t.FactorIndex(m.key) < 0 {
			return &problem{"trial.design." + m.name, errorf(ErrBadFactor, "the design puts factor %q on its plots, but the trial has no factor of that key", m.key)}
		}
	}
	for i, p := range t.Plots {
		for _, f := range []struct {
			name string
			v    int
		}{{"main_plot", p.MainPlot}, {"sub_plot", p.SubPlot}, {"strip", p.Strip}} {
			if f.v < 0 || f.v > MaxPosition {
				return &problem{fmt.Sprintf("trial.plots[%d].%s", i, f.name), errorf(ErrOutOfRange, "plot %d has %s %d; it must be from 0 to %d", p.Number, strings.ReplaceAll(f.name, "_", " "), f.v, MaxPosition)}
			}
		}
	}
	return nil
}
