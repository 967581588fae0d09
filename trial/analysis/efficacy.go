package analysis

import (
	"fmt"

	"furlong/stats"
	"furlong/trial"
)

// Efficacy is the percent efficacy of every treatment against the
// untreated check: Abbott's formula on the treatment means and, when the
// trait has pre-treatment counts, Henderson–Tilton's on the mean counts
// before and after (stats.Abbott, stats.HendersonTilton).
type Efficacy struct {
	Untreated     string  // the untreated check's code
	UntreatedMean float64 // its mean on the original scale
	// PreCount is the key of the pre-treatment count trait, "" when there
	// is none (then no row has HendersonTilton).
	PreCount string
	Rows     []EfficacyRow // one per treatment other than the untreated, in treatment order
}

// EfficacyRow is one treatment's percent efficacy; nil where it cannot be
// worked out (a missing mean, or a mean of the untreated check that is 0).
type EfficacyRow struct {
	Treatment string
	Abbott    *float64
	// HendersonTilton uses the arithmetic means of the plots with both a
	// count before and a count after.
	HendersonTilton *float64
}

// Row returns the efficacy row of a treatment code, nil when it has none.
func (e *Efficacy) Row(code string) *EfficacyRow {
	if e == nil {
		return nil
	}
	for i := range e.Rows {
		if e.Rows[i].Treatment == code {
			return &e.Rows[i]
		}
	}
	return nil
}

// preCounts fills d.PreCount from the trait marked as the pre-treatment
// count of d's trait (or of its series).
func preCounts(t *trial.Trial, d *Data) error {
	key := t.PreCount(d.TraitKey)
	if key == "" || d.Untreated == "" {
		return nil
	}
	vals, err := t.TraitValues(key)
	if err != nil {
		return &Error{Trait: d.TraitKey, Msg: fmt.Sprintf("its pre-treatment counts (trait %q) cannot be read: %v", key, err), Err: err}
	}
	d.PreCount = make([]float64, len(d.Values))
	for i, pi := range d.PlotIndex {
		d.PreCount[i] = vals[pi]
	}
	d.preCountKey = key
	return nil
}

// efficacy sets r.Efficacy when d names an untreated check that is among
// the means and lower values of the trait are better.
func efficacy(r *Result, d *Data) {
	if d.Untreated == "" || d.HigherBetter {
		return
	}
	ui := -1
	for i, m := range r.Means {
		if m.Treatment == d.Untreated {
			ui = i
		}
	}
	if ui < 0 {
		return
	}
	e := &Efficacy{Untreated: d.Untreated, UntreatedMean: r.Means[ui].BackMean}
	var before, after []float64
	if d.PreCount != nil {
		e.PreCount = d.preCountKey
		k := len(d.Treatments)
		sb, sa, n := make([]float64, k), make([]float64, k), make([]int, k)
		for i, v := range d.Values {
			b := d.PreCount[i]
			if trial.IsMissing(v) || trial.IsMissing(b) {
				continue
			}
			sb[d.Treatment[i]] += b
			sa[d.Treatment[i]] += v
			n[d.Treatment[i]]++
		}
		before, after = make([]float64, k), make([]float64, k)
		for j := range before {
			before[j], after[j] = trial.Missing, trial.Missing
			if n[j] > 0 {
				before[j], after[j] = sb[j]/float64(n[j]), sa[j]/float64(n[j])
			}
		}
	}
	for i, m := range r.Means {
		if i == ui {
			continue
		}
		row := EfficacyRow{Treatment: m.Treatment}
		if v, err := stats.Abbott(m.BackMean, e.UntreatedMean); err == nil {
			row.Abbott = &v
		}
		if before != nil {
			if v, err := stats.HendersonTilton(before[i], after[i], before[ui], after[ui]); err == nil {
				row.HendersonTilton = &v
			}
		}
		e.Rows = append(e.Rows, row)
	}
	r.Efficacy = e
}
