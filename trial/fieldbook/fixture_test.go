package fieldbook

import (
	"encoding/csv"
	"fmt"
	"math"
	"strconv"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial"
)

func fp(v float64) *float64 { return &v }

// barley builds an RCBD trial from stats/refdata/barley-1931-rcbd-missing.csv:
// sites as blocks 1–6, varieties as treatments V01–V10, plots numbered
// block×100+position. It also returns the yield cells as printed in the
// dataset ("" where the dataset has NA). Two invented traits, a count and
// a percentage, and a derived trait complete the trial.
func barley(t testing.TB) (*trial.Trial, []string) {
	t.Helper()
	f, err := refdata.Open("barley-1931-rcbd-missing.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	tr := &trial.Trial{Title: "Barley varieties, six sites", Design: trial.Design{Kind: trial.RCBD, Reps: 6}}
	sites, varieties := map[string]int{}, map[string]string{}
	var printed []string
	yield := &trial.Trait{Key: "yield", Name: "Yield", Unit: "bu/ac", Kind: trial.Continuous, Min: fp(20), Max: fp(60)}
	for _, r := range recs[1:] {
		site, variety, y := r[0], r[1], r[2]
		if _, ok := sites[site]; !ok {
			sites[site] = len(sites) + 1
		}
		if _, ok := varieties[variety]; !ok {
			code := fmt.Sprintf("V%02d", len(varieties)+1)
			varieties[variety] = code
			tr.Treatments = append(tr.Treatments, trial.Treatment{Code: code, Name: variety, Role: trial.RoleEntry})
		}
		b := sites[site]
		pos := 1
		for _, p := range tr.Plots {
			if p.Block == b {
				pos++
			}
		}
		tr.Plots = append(tr.Plots, trial.Plot{Number: b*100 + pos, Block: b, Row: b, Column: pos, Treatment: varieties[variety]})
		v := trial.Missing
		if y != "NA" {
			if v, err = strconv.ParseFloat(y, 64); err != nil {
				t.Fatal(err)
			}
		} else {
			y = ""
		}
		printed = append(printed, y)
		yield.Values = append(yield.Values, v)
	}
	n := len(tr.Plots)
	count := trial.Trait{Key: "spikes", Kind: trial.Count, Min: fp(0), Values: make([]float64, n)}
	cover := trial.Trait{Key: "cover", Kind: trial.Percent, Min: fp(0), Max: fp(100), Values: make([]float64, n)}
	for i := range n {
		count.Values[i] = float64(400 + 3*i)
		cover.Values[i] = math.Mod(float64(i)*7.3, 100)
	}
	count.Values[5], cover.Values[9] = trial.Missing, trial.Missing
	cover.Values[10] = 1e-7
	tr.Traits = []trial.Trait{*yield, count, cover,
		{Key: "adj", Kind: trial.Continuous, Derived: &trial.Derivation{Kind: trial.AdjustedYield, WeightTrait: "yield", MoistureTrait: "cover", StandardMoisture: 14, OutputUnit: "t/ha"}}}
	return tr, printed
}

// clone deep-copies the value slices of tr.
func clone(tr *trial.Trial) *trial.Trial {
	c := *tr
	c.Plots = append([]trial.Plot(nil), tr.Plots...)
	c.Traits = append([]trial.Trait(nil), tr.Traits...)
	for j := range c.Traits {
		if c.Traits[j].Values != nil {
			c.Traits[j].Values = append([]float64(nil), c.Traits[j].Values...)
		}
	}
	return &c
}

// cleared is a copy of tr with every stored value missing.
func cleared(tr *trial.Trial) *trial.Trial {
	c := clone(tr)
	for j := range c.Traits {
		for i := range c.Traits[j].Values {
			c.Traits[j].Values[i] = trial.Missing
		}
	}
	return c
}

// sameValues reports the first value that differs bit for bit ("" if none).
func sameValues(a, b *trial.Trial) string {
	for j := range a.Traits {
		va, vb := a.Traits[j].Values, b.Traits[j].Values
		if len(va) != len(vb) {
			return fmt.Sprintf("trait %s: %d and %d values", a.Traits[j].Key, len(va), len(vb))
		}
		for i := range va {
			if math.IsNaN(va[i]) != math.IsNaN(vb[i]) || (!math.IsNaN(va[i]) && math.Float64bits(va[i]) != math.Float64bits(vb[i])) {
				return fmt.Sprintf("trait %s plot %d: %v / %v", a.Traits[j].Key, a.Plots[i].Number, va[i], vb[i])
			}
		}
	}
	return ""
}
