// Command gen writes the demo trial: an invented spring wheat entry trial
// with nine fictional breeding lines and a fictional farm check in an RCBD
// with four blocks. Values come from a seeded generator so that the file is
// reproducible: a few entries differ clearly from the rest, most do not,
// block 1 sits on the better end of a fertility gradient, one plot is
// excluded (deer grazing) and one height reading is missing.
//
// With -series DIR it also writes the demo series (series.go): the same
// entries at five fictional sites in one season, one trial file per site.
package main

import (
	"flag"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"time"

	"furlong/trial"
	"furlong/trial/trialfile"
)

func main() {
	out := flag.String("o", "demo.furlong", "output file")
	seriesDir := flag.String("series", "", "also write the demo series' trial files into this folder")
	flag.Parse()
	if *seriesDir != "" {
		if err := writeSeries(*seriesDir); err != nil {
			fmt.Fprintln(os.Stderr, "gen:", err)
			os.Exit(1)
		}
	}
	t, err := build()
	if err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
	f, err := os.Create(*out)
	if err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
	if err := trialfile.Encode(f, t); err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
	if err := f.Close(); err != nil {
		fmt.Fprintln(os.Stderr, "gen:", err)
		os.Exit(1)
	}
}

// entry is a simulated entry: its true effects on the traits.
type entry struct {
	code, name string
	check      bool
	yield      float64 // t/ha at 13.5 % moisture
	moisture   float64 // %
	height     float64 // cm
}

var entries = []entry{
	{"CHK", "Hollowmere Standard", true, 6.60, 15.2, 88},
	{"HM01", "HM-2201", false, 7.45, 15.8, 84},
	{"HM02", "HM-2202", false, 6.75, 14.9, 91},
	{"HM03", "HM-2203", false, 6.50, 15.0, 86},
	{"HM04", "HM-2204", false, 5.85, 14.6, 97},
	{"HM05", "HM-2205", false, 6.90, 16.1, 83},
	{"HM06", "HM-2206", false, 6.65, 15.4, 89},
	{"HM07", "HM-2207", false, 7.10, 15.6, 79},
	{"HM08", "HM-2208", false, 6.45, 15.1, 102},
	{"HM09", "HM-2209", false, 6.80, 15.3, 87},
}

func ptr(v float64) *float64 { return &v }

func build() (*trial.Trial, error) {
	now := time.Date(2026, 3, 18, 9, 30, 0, 0, time.UTC)
	var trts []trial.Treatment
	for _, e := range entries {
		role := trial.RoleEntry
		if e.check {
			role = trial.RoleCheck
		}
		trts = append(trts, trial.Treatment{Code: e.code, Name: e.name, Role: role})
	}
	traits := []trial.Trait{
		{Key: "wt", Name: "Plot weight", Unit: "kg", Kind: trial.Continuous, Min: ptr(0), Max: ptr(30), Decimals: 2, HigherBetter: true},
		{Key: "mst", Name: "Grain moisture", Unit: "%", Kind: trial.Percent, Min: ptr(8), Max: ptr(30), Decimals: 1, HigherBetter: false},
		trial.AdjustedYieldTrait("yield", "wt", "mst", "wheat", trial.UnitTHa),
		{Key: "ht", Name: "Plant height", Unit: "cm", Kind: trial.Continuous, Min: ptr(30), Max: ptr(160), Decimals: 0, HigherBetter: false},
		{Key: "lodg", Name: "Lodging score", Unit: "1-9", Kind: trial.Score, Min: ptr(1), Max: ptr(9), Decimals: 0, HigherBetter: false},
	}
	t, err := trial.New(trial.NewOptions{
		Title:        "Spring wheat entry trial, Long Acre",
		Crop:         "wheat",
		Season:       "2026",
		Site:         trial.Site{Name: "Hollowmere Research Farm (fictional), Long Acre field", Soil: "silty clay loam", PreviousCrop: "oilseed rape"},
		Investigator: "Hollowmere trials team",
		Objective:    "Compare nine new spring wheat lines with the farm standard for yield, height and lodging.",
		Treatments:   trts,
		Design:       trial.Design{Kind: trial.RCBD, Reps: 4},
		Layout: trial.Layout{
			PlotLength: 10, PlotWidth: 1.5, HarvestLength: 8, HarvestWidth: 1.5, Alley: 1.5,
			PlotsPerRow: 5, Blocks: trial.BlocksSideBySide, Numbering: trial.NumberByBlock, Walk: trial.WalkSerpentine,
		},
		Traits: traits,
		Seed:   20260318,
		Now:    now,
	})
	if err != nil {
		return nil, err
	}
	t.Notes = "Sown 2 April at 350 seeds/m². Simulated demo data: the farm, the entries and the numbers are invented."

	rng := rand.New(rand.NewPCG(2026, 318))
	blockYield := []float64{0.35, 0.10, -0.10, -0.35} // fertility gradient across the field
	area := t.Layout.HarvestedArea()
	const ms = 13.5
	for i, p := range t.Plots {
		e := entries[t.TreatmentIndex(p.Treatment)]
		y := e.yield + blockYield[p.Block-1] + 0.38*rng.NormFloat64()
		m := e.moisture + 0.15*float64(p.Block-2) + 0.45*rng.NormFloat64()
		// plot weight at harvest moisture from the adjusted yield:
		// W = Y × A / 10 × (100 − Ms) / (100 − M)
		w := y * area / 10 * (100 - ms) / (100 - m)
		h := e.height - 1.5*float64(p.Block-1) + 3.2*rng.NormFloat64()
		l := math.Round(1 + (h-78)/5.5 + 0.9*rng.NormFloat64())
		l = math.Max(1, math.Min(9, l))
		set := func(key string, v float64) error { return t.SetValue(i, key, v) }
		for _, kv := range []struct {
			k string
			v float64
		}{{"wt", round(w, 2)}, {"mst", round(m, 1)}, {"ht", math.Round(h)}, {"lodg", l}} {
			if err := set(kv.k, kv.v); err != nil {
				return nil, err
			}
		}
	}
	// One height reading never made it off the data logger.
	if i := t.PlotIndexByNumber(206); i >= 0 {
		if err := t.SetValue(i, "ht", trial.Missing); err != nil {
			return nil, err
		}
		if err := t.SetNote(i, "height reading lost (logger battery)"); err != nil {
			return nil, err
		}
	}
	// One plot grazed by deer at heading: kept, but left out of the analysis.
	if i := t.PlotIndexByNumber(403); i >= 0 {
		if err := t.Exclude(i, "", "deer grazing at heading"); err != nil {
			return nil, err
		}
	}
	for k := range t.Traits {
		t.Traits[k].Assessed = time.Date(2026, 8, 21, 0, 0, 0, 0, time.UTC)
	}
	// The season's log: what the farm crew did, as they would record it.
	day := func(m time.Month, d int) time.Time { return time.Date(2026, m, d, 0, 0, 0, 0, time.UTC) }
	for _, op := range []trial.Operation{
		{Kind: trial.OpSowing, Date: day(time.April, 2), Equipment: "plot drill, 8 rows", Notes: "350 seeds/m², 3 cm deep, into a fine seedbed", Assessor: "Hollowmere trials team"},
		{Kind: trial.OpOther, Date: day(time.May, 6), Product: "granular nitrogen top-dressing (farm stock)", Rate: ptr(60), RateUnit: "kg N/ha",
			Equipment: "hand spreader", GrowthStage: "25", Scale: "BBCH", Notes: "whole trial, as the surrounding field"},
		{Kind: trial.OpAssessment, Date: day(time.July, 10), Traits: []string{"ht"}, GrowthStage: "69", Scale: "BBCH", Assessor: "Hollowmere trials team",
			Notes: "plot 206's reading lost (logger battery)"},
		{Kind: trial.OpAssessment, Date: day(time.August, 14), Traits: []string{"lodg"}, GrowthStage: "87", Scale: "BBCH", Assessor: "Hollowmere trials team",
			Notes: "plot 403 grazed by deer at heading"},
		{Kind: trial.OpHarvest, Date: day(time.August, 21), Traits: []string{"wt", "mst"}, Equipment: "plot combine with weigh bin and moisture meter",
			Notes: "12 m² harvested per plot"},
	} {
		if err := t.AddOperation(op); err != nil {
			return nil, err
		}
	}
	t.Modified = time.Date(2026, 8, 24, 16, 0, 0, 0, time.UTC)
	return t, t.Validate()
}

func round(v float64, d int) float64 {
	p := math.Pow(10, float64(d))
	return math.Round(v*p) / p
}
