package trialfile

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"time"

	"furlong/trial"
)

// Encode writes t to w as an indented trial file of the current version.
// It refuses, writing nothing, a trial that Decode would refuse: duplicate
// plot numbers, unknown treatments, value lists not aligned with the plots,
// values impossible for their trait kind, non-finite numbers.
func Encode(w io.Writer, t *trial.Trial) error {
	b, err := marshal(t)
	if err != nil {
		return err
	}
	_, err = w.Write(b)
	return err
}

// marshal returns the encoded file.
func marshal(t *trial.Trial) ([]byte, error) {
	if t == nil {
		return nil, errors.New("there is no trial to save")
	}
	if p := check(t); p != nil {
		return nil, p.err
	}
	ft, err := toV1(t)
	if err != nil {
		return nil, err
	}
	b, err := json.MarshalIndent(fileV1{Format: Format, Version: Version, Trial: ft}, "", "  ")
	if err != nil {
		return nil, fmt.Errorf("the trial could not be written: %w", err)
	}
	return append(b, '\n'), nil
}

func toV1(t *trial.Trial) (*trialV1, error) {
	var err error
	tm := func(what string, v time.Time) *string {
		s, e := formatTime(v)
		if e != nil && err == nil {
			err = fmt.Errorf("the %s date cannot be saved: %w", what, e)
		}
		return s
	}
	ft := &trialV1{
		Title:        t.Title,
		Crop:         t.Crop,
		Season:       t.Season,
		Investigator: t.Investigator,
		Objective:    t.Objective,
		Notes:        t.Notes,
		Site: siteV1{
			Name:         t.Site.Name,
			Latitude:     t.Site.Latitude,
			Longitude:    t.Site.Longitude,
			Soil:         t.Site.Soil,
			PreviousCrop: t.Site.PreviousCrop,
		},
		Created:  tm("created", t.Created),
		Modified: tm("modified", t.Modified),
		Design:   designV1{Kind: string(t.Design.Kind), Reps: t.Design.Reps, MainFactor: t.Design.MainFactor, SubFactor: t.Design.SubFactor},
		Factors:  toFactorsV3(t.Factors),
		Layout: layoutV1{
			PlotLength:    t.Layout.PlotLength,
			PlotWidth:     t.Layout.PlotWidth,
			HarvestLength: t.Layout.HarvestLength,
			HarvestWidth:  t.Layout.HarvestWidth,
			Alley:         t.Layout.Alley,
			PlotsPerRow:   t.Layout.PlotsPerRow,
			Blocks:        string(t.Layout.Blocks),
			Numbering:     string(t.Layout.Numbering),
			Walk:          string(t.Layout.Walk),
			North:         string(t.Layout.Orientation.North),
			Landmark:      t.Layout.Orientation.Landmark,
		},
		Randomization: randomV1{
			Seed:   json.RawMessage(strconv.Quote(strconv.FormatUint(t.Random.Seed, 10))),
			Method: t.Random.Method,
			Done:   tm("randomisation", t.Random.Done),
		},
		Analysis:   &analysisV2{MeanSeparation: t.MeanSeparation(), Contrasts: encodeContrasts(t.Analysis.Contrasts), Response: encodeResponse(t.Analysis.Response), ContrastAdjust: encodeAdjust(t.Analysis.ContrastAdjust)},
		Treatments: make([]treatmentV1, len(t.Treatments)),
		Operations: encodeOperations(t.Operations),
		Economics:  encodeEconomics(t.Economics),
		Plots:      make([]plotV1, len(t.Plots)),
		Traits:     make([]traitV1, len(t.Traits)),
	}
	for i, tr := range t.Treatments {
		ft.Treatments[i] = treatmentV1{Code: tr.Code, Name: tr.Name, Role: string(tr.Role), Description: tr.Description, Rate: tr.Rate, RateUnit: tr.RateUnit, Levels: tr.Levels}
	}
	for i, p := range t.Plots {
		fp := plotV1{Number: p.Number, Block: p.Block, Row: p.Row, Column: p.Column, Treatment: p.Treatment, Note: p.Note,
			MainPlot: p.MainPlot, SubPlot: p.SubPlot, Strip: p.Strip}
		for _, e := range p.Exclusions {
			fp.Exclusions = append(fp.Exclusions, exclusionV1{Trait: e.Trait, Reason: e.Reason})
		}
		ft.Plots[i] = fp
	}
	for j, tr := range t.Traits {
		fr := traitV1{
			Key: tr.Key, Name: tr.Name, Unit: tr.Unit, Kind: string(tr.Kind),
			Min: tr.Min, Max: tr.Max, Decimals: tr.Decimals,
			Assessed:       tm("assessment", tr.Assessed),
			HigherBetter:   tr.HigherBetter,
			Transform:      tr.Transform,
			PercentOfCheck: tr.PercentOfCheck,
			Covariate:      tr.Covariate,
		}
		if fr.Transform == trial.TransformNone {
			fr.Transform = transformNone
		}
		if d := tr.Derived; d != nil {
			fr.Derived = &derivedV1{Kind: string(d.Kind), WeightTrait: d.WeightTrait, MoistureTrait: d.MoistureTrait,
				StandardMoisture: d.StandardMoisture, OutputUnit: d.OutputUnit, BushelWeightLb: d.BushelWeightLb, Series: d.Series}
		} else {
			fr.Values = appendValues(make([]byte, 0, 2+len(tr.Values)*8), tr.Values)
		}
		if a := tr.Assessment; a != nil {
			fr.Assessment = &assessmentV3{Series: a.Series, Days: a.Days, From: string(a.From)}
		}
		fr.PreCountOf = tr.PreCountOf
		ft.Traits[j] = fr
	}
	if err != nil {
		return nil, err
	}
	return ft, nil
}

// transformNone is the file's name for "no transformation".
const transformNone = "none"

// appendValues appends vs as a JSON list, null for missing values.
func appendValues(b []byte, vs []float64) []byte {
	b = append(b, '[')
	for i, v := range vs {
		if i > 0 {
			b = append(b, ',')
		}
		if trial.IsMissing(v) {
			b = append(b, "null"...)
			continue
		}
		b = appendFloat(b, v)
	}
	return append(b, ']')
}

// appendFloat appends v in the shortest form that reads back to the same
// float64, spelled the way encoding/json spells float64 values (plain
// decimals, exponent form below 1e-6 and from 1e21).
func appendFloat(b []byte, v float64) []byte {
	abs := math.Abs(v)
	f := byte('f')
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		f = 'e'
	}
	b = strconv.AppendFloat(b, v, f, -1, 64)
	if f == 'e' {
		// Shorten a two-digit negative exponent: 1e-07 → 1e-7.
		if n := len(b); n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
}

// formatTime returns v as RFC 3339 text, nil for the zero time. Offsets
// that are not whole minutes (historic local mean times) cannot be written
// in RFC 3339 and are converted to UTC.
func formatTime(v time.Time) (*string, error) {
	if v.IsZero() {
		return nil, nil
	}
	if _, off := v.Zone(); off%60 != 0 {
		v = v.UTC()
	}
	if y := v.Year(); y < 0 || y > 9999 {
		return nil, fmt.Errorf("the year %d is outside 0–9999", y)
	}
	s := v.Format(time.RFC3339Nano)
	return &s, nil
}

// encodeResponse writes a rate trial's response settings; nil (left out)
// when there are none.
func encodeResponse(r trial.ResponseSettings) *responseV6 {
	if len(r.LeaveOut) == 0 && r.PriceRatio == 0 {
		return nil
	}
	return &responseV6{LeaveOut: slices.Clone(r.LeaveOut), PriceRatio: r.PriceRatio}
}

// encodeAdjust leaves out "no adjustment".
func encodeAdjust(a string) string {
	if a == trial.AdjustNone {
		return ""
	}
	return a
}
