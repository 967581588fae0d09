package analysis

import (
	"fmt"

	"furlong/trial"
)

// Progress is an assessment series over time: each treatment's mean at
// every assessment (the arithmetic mean of the plots assessed, excluded
// plots left out), for the chart of severity or counts over the season.
type Progress struct {
	Series string
	Unit   string // the assessments' unit
	// Axis says what the times are: "days after the first assessment",
	// "days after treatment" or "days after sowing".
	Axis   string
	Points []trial.SeriesPoint // the assessments, in time order
	Rows   []ProgressRow       // one per treatment, in treatment order
	// Untreated is the untreated check's code ("" for none).
	Untreated string
}

// ProgressRow is one treatment's means at the assessments (NaN where no
// plot of it was assessed).
type ProgressRow struct {
	Treatment, Name string
	Means           []float64
	N               []int
}

// ProgressOf returns the progress of assessment series key over time.
func ProgressOf(t *trial.Trial, key string) (*Progress, error) {
	pts, err := t.Series(key)
	if err != nil {
		return nil, err
	}
	p := &Progress{Series: key, Points: pts, Untreated: t.Untreated(), Axis: "days after the first assessment"}
	dated := true
	for _, pt := range pts {
		dated = dated && !t.Trait(pt.Trait).Assessed.IsZero()
	}
	if !dated {
		switch pts[0].From {
		case trial.DaysAfterTreatment:
			p.Axis = "days after treatment"
		case trial.DaysAfterSowing:
			p.Axis = "days after sowing"
		}
	}
	if tr := t.Trait(pts[0].Trait); tr != nil {
		p.Unit = tr.Unit
	}
	idx := make(map[string]int, len(t.Treatments))
	for i, tm := range t.Treatments {
		idx[tm.Code] = i
		p.Rows = append(p.Rows, ProgressRow{Treatment: tm.Code, Name: tm.Name, Means: make([]float64, len(pts)), N: make([]int, len(pts))})
	}
	for j, pt := range pts {
		vals, err := t.TraitValues(pt.Trait)
		if err != nil {
			return nil, fmt.Errorf("assessment %s of series %s: %w", pt.Trait, key, err)
		}
		sums := make([]float64, len(t.Treatments))
		for i, pl := range t.Plots {
			ti, ok := idx[pl.Treatment]
			if !ok || trial.IsMissing(vals[i]) {
				continue
			}
			if ex, _ := t.Excluded(i, pt.Trait); ex {
				continue
			}
			sums[ti] += vals[i]
			p.Rows[ti].N[j]++
		}
		for ti := range p.Rows {
			if n := p.Rows[ti].N[j]; n > 0 {
				p.Rows[ti].Means[j] = sums[ti] / float64(n)
			} else {
				p.Rows[ti].Means[j] = trial.Missing
			}
		}
	}
	return p, nil
}
