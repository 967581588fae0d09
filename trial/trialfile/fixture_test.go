package trialfile

import (
	"fmt"
	"math"
	"reflect"
	"time"

	"furlong/trial"
)

func fp(v float64) *float64 { return &v }

// richTrial returns an invented trial with every field filled: an RCBD of
// four treatments in three blocks on a fictional farm.
func richTrial() *trial.Trial {
	awst := time.FixedZone("", 8*3600)
	t := &trial.Trial{
		Title:        "Wheat nitrogen rates, Windmill Paddock",
		Crop:         "wheat",
		Season:       "2026",
		Site:         trial.Site{Name: "Windmill Paddock, Gumleaf Downs", Latitude: fp(-31.6174), Longitude: fp(117.4382), Soil: "sandy loam \"duplex\"", PreviousCrop: "canola"},
		Investigator: "Gumleaf Downs trials team (fictional)",
		Objective:    "Compare four nitrogen rates.\nSecond line with ünïcode and a tab\t.",
		Notes:        "Sown late after rain.",
		Created:      time.Date(2026, 5, 2, 9, 15, 0, 0, awst),
		Modified:     time.Date(2026, 11, 20, 17, 2, 11, 500000000, time.UTC),
		Treatments: []trial.Treatment{
			{Code: "N0", Name: "No nitrogen", Role: trial.RoleCheck, Description: "untreated check", Rate: fp(0), RateUnit: "kg N/ha"},
			{Code: "N40", Name: "40 N", Role: trial.RoleEntry, Rate: fp(40), RateUnit: "kg N/ha"},
			{Code: "N80", Name: "80 N", Role: trial.RoleEntry, Rate: fp(80), RateUnit: "kg N/ha"},
			{Code: "N120", Name: "120 N split", Role: trial.RoleEntry, Description: "half at sowing, half at stem elongation", Rate: fp(120.5), RateUnit: "kg N/ha"},
		},
		Design: trial.Design{Kind: trial.RCBD, Reps: 3},
		Layout: trial.Layout{PlotLength: 12, PlotWidth: 1.8, HarvestLength: 10.5, HarvestWidth: 1.44, Alley: 2.5,
			PlotsPerRow: 4, Blocks: trial.BlocksSideBySide, Numbering: trial.NumberByBlock, Walk: trial.WalkSerpentine},
		Random:   trial.Randomization{Seed: math.MaxUint64 - 6, Method: "pcg-fisher-yates-v1", Done: time.Date(2026, 4, 28, 14, 0, 0, 123456789, awst)},
		Analysis: trial.Analysis{Method: trial.MethodTukey},
	}
	order := [][]string{{"N40", "N0", "N120", "N80"}, {"N0", "N80", "N40", "N120"}, {"N120", "N40", "N80", "N0"}}
	for b, codes := range order {
		for k, c := range codes {
			col := k + 1
			if b%2 == 1 {
				col = 4 - k
			}
			t.Plots = append(t.Plots, trial.Plot{Number: (b+1)*100 + k + 1, Block: b + 1, Row: b + 1, Column: col, Treatment: c})
		}
	}
	t.Plots[2].Note = "wheel track at the east end"
	t.Plots[5].Exclusions = []trial.Exclusion{{Trait: "", Reason: "flooding"}}
	t.Plots[7].Exclusions = []trial.Exclusion{{Trait: "wt", Reason: "header jam"}, {Trait: "mst", Reason: "sample lost"}}
	n := len(t.Plots)
	wt := make([]float64, n)
	mst := make([]float64, n)
	heads := make([]float64, n)
	lodg := make([]float64, n)
	cover := make([]float64, n)
	for i := range n {
		wt[i] = 4.2 + 0.137*float64(i) + 1e-9
		mst[i] = 12.1 + 0.1*float64(i%5)
		heads[i] = float64(300 + 7*i)
		lodg[i] = 1 + float64(i%9)/2
		cover[i] = 100 * float64(i) / float64(n)
	}
	wt[3], mst[4], heads[0], cover[11] = trial.Missing, trial.Missing, trial.Missing, trial.Missing
	wt[6] = 1.0 / 3
	mst[8] = 1e-7
	heads[9] = 1 << 52
	yes, no := true, false
	t.Traits = []trial.Trait{
		{Key: "wt", Name: "Harvested plot weight", Unit: "kg", Kind: trial.Continuous, Min: fp(0), Max: fp(30), Decimals: 2,
			Assessed: time.Date(2026, 12, 1, 0, 0, 0, 0, time.UTC), HigherBetter: true, Values: wt},
		{Key: "mst", Name: "Grain moisture", Unit: "%", Kind: trial.Percent, Min: fp(5), Max: fp(40), Decimals: 1, Values: mst},
		{Key: "heads", Name: "Heads per m²", Unit: "/m²", Kind: trial.Count, Min: fp(0), Values: heads, Transform: trial.TransformSqrt, PercentOfCheck: &yes},
		{Key: "lodg", Name: "Lodging", Unit: "1-9", Kind: trial.Score, Min: fp(1), Max: fp(9), Values: lodg},
		{Key: "cover", Name: "Ground cover", Unit: "%", Kind: trial.Percent, Min: fp(0), Max: fp(100), Values: cover, Transform: trial.TransformArcsine},
		{Key: "yield", Name: "Grain yield at 12.5 %", Unit: "t/ha", Kind: trial.Continuous, Decimals: 2, HigherBetter: true, PercentOfCheck: &no, Transform: trial.TransformLog,
			Derived: &trial.Derivation{Kind: trial.AdjustedYield, WeightTrait: "wt", MoistureTrait: "mst", StandardMoisture: 12.5, OutputUnit: "t/ha", BushelWeightLb: 60}},
	}
	return t
}

// bigTrial returns an invented trial of plots×traits values, every 17th
// value missing, tagged by title.
func bigTrial(title string, plots, traits int, offset float64) *trial.Trial {
	t := &trial.Trial{Title: title, Design: trial.Design{Kind: trial.CRD, Reps: plots / 10}, Analysis: trial.Analysis{Method: trial.MethodLSD}}
	for k := range 10 {
		t.Treatments = append(t.Treatments, trial.Treatment{Code: fmt.Sprintf("E%02d", k+1), Role: trial.RoleEntry})
	}
	t.Plots = make([]trial.Plot, plots)
	for i := range t.Plots {
		t.Plots[i] = trial.Plot{Number: i + 1, Block: 1 + i/10, Row: 1 + i/50, Column: 1 + i%50, Treatment: t.Treatments[(i*7)%10].Code}
	}
	for j := range traits {
		vs := make([]float64, plots)
		for i := range vs {
			if (i+j)%17 == 0 {
				vs[i] = trial.Missing
			} else {
				vs[i] = offset + float64(i)*0.731 + float64(j)/7
			}
		}
		t.Traits = append(t.Traits, trial.Trait{Key: fmt.Sprintf("t%d", j), Kind: trial.Continuous, Values: vs})
	}
	return t
}

// diff describes the first difference between a and b, "" when they are
// equal: times compare as instants with the same printed offset, values
// compare with NaN equal to NaN, nil and empty slices are equal.
func diff(a, b *trial.Trial) string {
	sameTime := func(x, y time.Time) bool {
		return x.Equal(y) && x.Format(time.RFC3339Nano) == y.Format(time.RFC3339Nano)
	}
	if !sameTime(a.Created, b.Created) || !sameTime(a.Modified, b.Modified) || !sameTime(a.Random.Done, b.Random.Done) {
		return fmt.Sprintf("times differ: %v %v %v / %v %v %v", a.Created, a.Modified, a.Random.Done, b.Created, b.Modified, b.Random.Done)
	}
	if len(a.Traits) != len(b.Traits) || len(a.Plots) != len(b.Plots) || len(a.Treatments) != len(b.Treatments) {
		return "lengths differ"
	}
	ca, cb := *a, *b
	ca.Created, ca.Modified, ca.Random.Done = time.Time{}, time.Time{}, time.Time{}
	cb.Created, cb.Modified, cb.Random.Done = time.Time{}, time.Time{}, time.Time{}
	ca.Traits, cb.Traits = nil, nil
	ca.Plots, cb.Plots = nil, nil
	if len(ca.Treatments) == 0 {
		ca.Treatments, cb.Treatments = nil, nil
	}
	if !reflect.DeepEqual(ca, cb) {
		return fmt.Sprintf("trial fields differ:\n%#v\n%#v", ca, cb)
	}
	for i := range a.Plots {
		pa, pb := a.Plots[i], b.Plots[i]
		if len(pa.Exclusions) == 0 && len(pb.Exclusions) == 0 {
			pa.Exclusions, pb.Exclusions = nil, nil
		}
		if !reflect.DeepEqual(pa, pb) {
			return fmt.Sprintf("plot %d differs: %#v / %#v", i, pa, pb)
		}
	}
	for j := range a.Traits {
		ta, tb := a.Traits[j], b.Traits[j]
		if !sameTime(ta.Assessed, tb.Assessed) {
			return fmt.Sprintf("trait %d assessed differs", j)
		}
		if len(ta.Values) != len(tb.Values) {
			return fmt.Sprintf("trait %d has %d and %d values", j, len(ta.Values), len(tb.Values))
		}
		for i := range ta.Values {
			x, y := ta.Values[i], tb.Values[i]
			if math.IsNaN(x) != math.IsNaN(y) || (!math.IsNaN(x) && math.Float64bits(x) != math.Float64bits(y)) {
				return fmt.Sprintf("trait %d value %d: %v / %v", j, i, x, y)
			}
		}
		ta.Values, tb.Values = nil, nil
		ta.Assessed, tb.Assessed = time.Time{}, time.Time{}
		if !reflect.DeepEqual(ta, tb) {
			return fmt.Sprintf("trait %d differs:\n%#v\n%#v", j, ta, tb)
		}
	}
	return ""
}
