package main

import (
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"time"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// seriesSite is one invented site of the demo series: how good its
// season was for wheat (added to every entry's yield, scaled by the
// entry's response), how noisy its plots are, and what was not sown.
type seriesSite struct {
	file, name string
	soil, prev string
	effect     float64 // t/ha above or below the entries' usual yield
	noise      float64 // plot-to-plot SD, t/ha
	missing    string  // an entry not sown at the site ("" for none)
	seed       uint64
}

// seriesSites are five fictional sites; the names are invented.
var seriesSites = []seriesSite{
	{"series-long-acre-2026.furlong", "Long Acre", "silty clay loam", "oilseed rape", 0.10, 0.34, "", 26001},
	{"series-brackenhythe-2026.furlong", "Brackenhythe", "sandy loam", "spring barley", -1.15, 0.30, "", 26002},
	{"series-quillon-rise-2026.furlong", "Quillon Rise", "chalky loam", "field beans", 0.85, 0.42, "HM08", 26003},
	{"series-tarnbeck-flats-2026.furlong", "Tarnbeck Flats", "clay", "winter oats", -0.35, 0.62, "", 26004},
	{"series-sallowmere-down-2026.furlong", "Sallowmere Down", "loam over chalk", "grass ley", 1.30, 0.36, "", 26005},
}

// response is each entry's sensitivity to the site (1 = follows the
// sites; below 1 steadier, above 1 gains more at good sites).
var response = map[string]float64{
	"CHK": 1.00, "HM01": 1.10, "HM02": 0.75, "HM03": 0.95, "HM04": 0.90,
	"HM05": 1.30, "HM06": 1.00, "HM07": 0.85, "HM08": 1.15, "HM09": 1.05,
}

// writeSeries writes one trial file per site of the demo series into dir.
func writeSeries(dir string) error {
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	for _, s := range seriesSites {
		t, err := buildSite(s)
		if err != nil {
			return fmt.Errorf("%s: %w", s.name, err)
		}
		f, err := os.Create(filepath.Join(dir, s.file))
		if err != nil {
			return err
		}
		if err := trialfile.Encode(f, t); err != nil {
			f.Close()
			return err
		}
		if err := f.Close(); err != nil {
			return err
		}
	}
	return nil
}

// buildSite simulates one site's trial: the demo trial's entries in an
// RCBD with four blocks, plot weight, moisture, adjusted yield and height.
func buildSite(s seriesSite) (*trial.Trial, error) {
	now := time.Date(2026, 3, 20, 9, 0, 0, 0, time.UTC)
	var trts []trial.Treatment
	for _, e := range entries {
		if e.code == s.missing {
			continue
		}
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
	}
	objective := "One site of the spring wheat series 2026: nine new lines and the farm standard, compared across five sites."
	if s.missing != "" {
		objective += " " + s.missing + " was not sown here (not enough seed)."
	}
	t, err := trial.New(trial.NewOptions{
		Title:        "Spring wheat series 2026, " + s.name + " (fictional site)",
		Crop:         "wheat",
		Season:       "2026",
		Site:         trial.Site{Name: s.name, Soil: s.soil, PreviousCrop: s.prev},
		Investigator: "Hollowmere trials team",
		Objective:    objective,
		Treatments:   trts,
		Design:       trial.Design{Kind: trial.RCBD, Reps: 4},
		Layout: trial.Layout{
			PlotLength: 10, PlotWidth: 1.5, HarvestLength: 8, HarvestWidth: 1.5, Alley: 1.5,
			PlotsPerRow: 5, Blocks: trial.BlocksSideBySide, Numbering: trial.NumberByBlock, Walk: trial.WalkSerpentine,
		},
		Traits: traits,
		Seed:   s.seed,
		Now:    now,
	})
	if err != nil {
		return nil, err
	}
	t.Notes = "Simulated demo data: the sites, the entries and the numbers are invented."

	rng := rand.New(rand.NewPCG(2026, s.seed))
	// Each entry's own departure at this site (the entry × site
	// interaction beyond its response), drawn once per entry.
	dev := map[string]float64{}
	for _, e := range entries {
		dev[e.code] = 0.18 * rng.NormFloat64()
	}
	blockYield := []float64{0.20, 0.05, -0.05, -0.20}
	area := t.Layout.HarvestedArea()
	const ms = 13.5
	for i, p := range t.Plots {
		var e entry
		for _, x := range entries {
			if x.code == p.Treatment {
				e = x
			}
		}
		y := e.yield + response[e.code]*s.effect + dev[e.code] + blockYield[p.Block-1] + s.noise*rng.NormFloat64()
		m := e.moisture + 0.4*s.effect + 0.45*rng.NormFloat64()
		w := y * area / 10 * (100 - ms) / (100 - m)
		h := e.height + 6*s.effect - 1.0*float64(p.Block-1) + 3.0*rng.NormFloat64()
		for _, kv := range []struct {
			k string
			v float64
		}{{"wt", round(w, 2)}, {"mst", round(m, 1)}, {"ht", math.Round(h)}} {
			if err := t.SetValue(i, kv.k, kv.v); err != nil {
				return nil, err
			}
		}
	}
	for k := range t.Traits {
		t.Traits[k].Assessed = time.Date(2026, 8, 24, 0, 0, 0, 0, time.UTC)
	}
	t.Modified = time.Date(2026, 8, 28, 16, 0, 0, 0, time.UTC)
	return t, t.Validate()
}
