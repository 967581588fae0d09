package series

import (
	"errors"
	"fmt"
	"path/filepath"
	"strings"

	"furlong/trial"
	"furlong/trial/analysis"
)

// Label is a trial's label in a series: its site and season ("North field
// 2026"), the file name when the trial names neither.
func Label(t *trial.Trial, path string) string {
	parts := []string{}
	if s := strings.TrimSpace(t.Site.Name); s != "" {
		parts = append(parts, s)
	}
	if s := strings.TrimSpace(t.Season); s != "" {
		parts = append(parts, s)
	}
	if len(parts) == 0 {
		if path != "" {
			return strings.TrimSuffix(filepath.Base(path), filepath.Ext(path))
		}
		if t.Title != "" {
			return t.Title
		}
		return "trial"
	}
	return strings.Join(parts, " ")
}

// CommonTraits returns the keys of the traits every trial has, in the
// order of the first trial.
func CommonTraits(trials []*trial.Trial) []string {
	if len(trials) == 0 {
		return nil
	}
	var out []string
	for _, tr := range trials[0].Traits {
		all := true
		for _, t := range trials[1:] {
			if t.Trait(tr.Key) == nil {
				all = false
				break
			}
		}
		if all {
			out = append(out, tr.Key)
		}
	}
	return out
}

// FromTrials gives the sites of a series for the trait with key: each
// trial's plot data (analysis.FromTrial), labelled by site and season
// (paths[i], optional, is trial i's file, named in messages and used when
// a trial has neither). The trait must exist in every trial with the same
// unit; a trial whose labels clash gets its file name added.
func FromTrials(trials []*trial.Trial, paths []string, key string) (Trait, []Site, error) {
	if len(trials) < 2 {
		return Trait{}, nil, errors.New("a series needs at least two trials (sites or seasons)")
	}
	path := func(i int) string {
		if i < len(paths) {
			return paths[i]
		}
		return ""
	}
	name := func(i int) string {
		if p := path(i); p != "" {
			return filepath.Base(p)
		}
		return fmt.Sprintf("trial %d", i+1)
	}
	var tr Trait
	var unitFrom int
	sites := make([]Site, len(trials))
	for i, t := range trials {
		x := t.Trait(key)
		if x == nil {
			var keys []string
			for _, k := range t.Traits {
				keys = append(keys, k.Key)
			}
			return Trait{}, nil, fmt.Errorf("%s has no trait %q (its traits are %s); a series matches traits by key", name(i), key, strings.Join(keys, ", "))
		}
		if i == 0 {
			tr = Trait{Key: x.Key, Name: x.Name, Unit: x.Unit, Decimals: x.Decimals, HigherBetter: x.HigherBetter}
		} else if u := strings.TrimSpace(x.Unit); u != "" {
			if tu := strings.TrimSpace(tr.Unit); tu == "" {
				tr.Unit, unitFrom = x.Unit, i
			} else if !strings.EqualFold(u, tu) {
				return Trait{}, nil, fmt.Errorf("the trait %q is in %s in %s but in %s in %s; the series cannot combine values in different units: convert one trial's values (or correct its unit) first", key, tr.Unit, name(unitFrom), x.Unit, name(i))
			}
		}
		d, err := analysis.FromTrial(t, key)
		if err != nil {
			return Trait{}, nil, fmt.Errorf("%s: %w", name(i), err)
		}
		sites[i] = Site{Label: Label(t, path(i)), Site: t.Site.Name, Season: t.Season, Path: path(i), Data: d}
		if x.Decimals > tr.Decimals {
			tr.Decimals = x.Decimals
		}
	}
	// Make clashing labels unique by adding the file name.
	count := map[string]int{}
	for _, s := range sites {
		count[s.Label]++
	}
	for i := range sites {
		if count[sites[i].Label] > 1 {
			sites[i].Label += " (" + name(i) + ")"
		}
	}
	return tr, sites, nil
}
