package cli

import (
	"strings"

	"furlong/trial"
)

// newAssessHelp is the part of 'furlong help new' about the untreated
// check, assessments over time and pre-treatment counts.
const newAssessHelp = `
Crop-protection trials:
  --untreated CODE      marks treatment CODE as the untreated check; traits where lower is
                        better (assessments, AUDPC) then get each treatment's percent efficacy
  --assess "KEY[:UNIT]=WHEN,WHEN,..."   a trait assessed on several dates (repeat for more series);
                        each WHEN is a date (2026-06-01), a day count after treatment or sowing
                        (7DAT, 35DAS), or both (2026-06-08/7DAT). It makes one trait per date,
                        KEY_1, KEY_2, ..., linked as series KEY (lower is better; a unit of %
                        makes them percentages), and two derived traits: KEY_audpc, the area
                        under the progress curve by the trapezoidal rule over the assessment
                        dates (Shaner & Finney 1977), and KEY_saudpc, that area divided by the
                        duration of the series (on the scale of the assessments).
  --pre-count "KEY=TARGET"   trait KEY (from --traits) is the count before treatment of trait or
                        series TARGET: Henderson–Tilton efficacy is then given beside Abbott's.
Percent efficacy (on treatment means, against the untreated check):
  Abbott (1925):          E = (C − T)/C × 100, C the untreated mean, T the treatment's
  Henderson–Tilton (1955): E = (1 − Ta·Cb/(Tb·Ca)) × 100, T treated and C untreated means,
                          b before and a after treatment
The label is the law; efficacy in one trial is not a recommendation. Furlong records what was
done and never suggests a product or rate.`

// assessFlags collects repeated --assess values.
type assessFlags []string

func (f *assessFlags) String() string { return strings.Join(*f, "; ") }

// Set adds one --assess value.
func (f *assessFlags) Set(s string) error {
	*f = append(*f, s)
	return nil
}

// parseAssess reads one --assess value, KEY[:UNIT]=WHEN,WHEN,..., into
// the assessment traits of the series and its two AUDPC traits
// (trial.AssessmentSeries, the rule the window uses too).
func parseAssess(s string) ([]trial.Trait, error) {
	head, whens, ok := strings.Cut(s, "=")
	if !ok {
		return nil, usagef("new: --assess needs KEY=WHEN,WHEN,..., for example \"sev:%%=2026-06-01,2026-06-15\"; got %q", s)
	}
	key, unit, _ := strings.Cut(head, ":")
	ts, err := trial.AssessmentSeries(strings.TrimSpace(key), strings.TrimSpace(unit), whens)
	if err != nil {
		return nil, usagef("new: --assess: %v", err)
	}
	return ts, nil
}

// applyCropProtection applies --untreated, --assess and --pre-count to the
// treatments and traits of a new trial.
func applyCropProtection(o *newOptions, trts []trial.Treatment, traits []trial.Trait) ([]trial.Trait, error) {
	if o.untreated != "" {
		found := false
		for i := range trts {
			if trts[i].Code == o.untreated {
				trts[i].Role, found = trial.RoleUntreated, true
			}
		}
		if !found {
			return nil, usagef("new: --untreated %q is not one of the treatments", o.untreated)
		}
	}
	for _, a := range o.assess {
		ts, err := parseAssess(a)
		if err != nil {
			return nil, err
		}
		for _, tr := range ts {
			if hasTrait(traits, tr.Key) {
				return nil, usagef("new: --assess makes a trait %q, which --traits has already", tr.Key)
			}
			traits = append(traits, tr)
		}
	}
	for _, pc := range o.preCount {
		k, target, ok := strings.Cut(pc, "=")
		k, target = strings.TrimSpace(k), strings.TrimSpace(target)
		if !ok || k == "" || target == "" {
			return nil, usagef("new: --pre-count needs KEY=TARGET, the count trait and the trait or series it precedes; got %q", pc)
		}
		j := -1
		for i := range traits {
			if traits[i].Key == k {
				j = i
			}
		}
		if j < 0 {
			return nil, usagef("new: --pre-count names %q, which is not in --traits", k)
		}
		traits[j].PreCountOf = target
		traits[j].Kind, traits[j].Decimals, traits[j].HigherBetter = trial.Count, 0, false
		traits[j].Name = k + " (before treatment)"
		// The count it precedes is of pests: fewer is better.
		for i := range traits {
			if traits[i].Key == target && traits[i].Derived == nil && traits[i].Assessment == nil {
				traits[i].Kind, traits[i].Decimals, traits[i].HigherBetter = trial.Count, 0, false
			}
		}
	}
	return traits, nil
}
