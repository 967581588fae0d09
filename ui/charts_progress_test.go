package ui

import (
	"context"
	"testing"
	"time"

	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// An assessment trait's charts in Compare include its series over the
// season; a trait outside any series has no such chart.
func TestCompareChartsOverTheSeason(t *testing.T) {
	tr := dunnettTrial(t)
	y := tr.Traits[0].Values
	for k, day := range []int{3, 17} {
		v := make([]float64, len(y))
		for i := range v {
			v[i] = y[i] * float64(k+1)
		}
		tr.Traits = append(tr.Traits, trial.Trait{Key: []string{"s1", "s2"}[k], Unit: "%", Kind: trial.Continuous, Decimals: 1, Values: v,
			Assessed: time.Date(2026, 6, day, 0, 0, 0, 0, time.UTC), Assessment: &trial.Assessment{Series: "sc"}})
	}
	outs, err := analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	titles := func(key string) map[string]bool {
		for _, o := range outs {
			if o.Key == key {
				got := map[string]bool{}
				for _, c := range drawCharts(tr, traitResult{key: key, res: o.Result}, meansep.LSD, 0) {
					got[c.title] = c.plot != nil && c.err == nil
				}
				return got
			}
		}
		t.Fatalf("no outcome for %s", key)
		return nil
	}
	if !titles("s2")["Over the season"] {
		t.Errorf("s2 charts %v: no chart over the season", titles("s2"))
	}
	if _, ok := titles("yield")["Over the season"]; ok {
		t.Error("a trait outside any series has a chart over the season")
	}
}
