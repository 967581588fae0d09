package trialfile

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"
	"time"

	"furlong/trial"
)

// Decode reads a trial file. Files of an older format version are migrated
// to the current model; files of a newer version are refused with
// ErrNewerVersion. Problems with the file's content are reported as
// *ParseError values that name the place (JSON path, line and column) and
// wrap one of the package's sentinel errors.
func Decode(r io.Reader) (*trial.Trial, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	return decode(data)
}

func decode(data []byte) (*trial.Trial, error) {
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	if len(bytes.TrimSpace(data)) == 0 {
		return nil, &ParseError{Err: errorf(ErrTruncated, "the file is empty")}
	}
	var head struct {
		Format  json.RawMessage `json:"format"`
		Version json.RawMessage `json:"version"`
	}
	if err := json.Unmarshal(data, &head); err != nil {
		var se *json.SyntaxError
		if errors.As(err, &se) {
			if !looksLikeJSON(data) {
				// A workbook, a CSV or a picture given where a trial belongs.
				return nil, errorf(ErrNotTrialFile, "not a Furlong trial file")
			}
			return nil, syntaxError(data, se)
		}
		var te *json.UnmarshalTypeError
		if errors.As(err, &te) {
			return nil, errorf(ErrNotTrialFile, "not a Furlong trial file")
		}
		return nil, &ParseError{Err: errorf(ErrSyntax, "the file is damaged: %v", err)}
	}
	var format string
	if head.Format == nil || json.Unmarshal(head.Format, &format) != nil || format != Format {
		return nil, errorf(ErrNotTrialFile, "not a Furlong trial file")
	}
	if pe := duplicateKey(data); pe != nil {
		return nil, pe
	}
	if head.Version == nil {
		return nil, at(data, "format", errorf(ErrWrongType, "the file does not say which format version it has"))
	}
	v, err := strconv.ParseInt(string(head.Version), 10, 64)
	if err != nil || v < 0 {
		return nil, at(data, "version", errorf(ErrWrongType, "%s is not a file format version", head.Version))
	}
	switch {
	case v > Version:
		return nil, newerVersionError(v)
	case v == 0:
		return decodeV0(data)
	default:
		return decodeV1(data, int(v))
	}
}

// looksLikeJSON reports whether data starts, after blanks and a byte order
// mark, with a JSON object: a trial file always does.
func looksLikeJSON(data []byte) bool {
	rest := strings.TrimLeft(strings.TrimPrefix(string(data[:min(len(data), 64)]), "\ufeff"), " \t\r\n")
	return strings.HasPrefix(rest, "{")
}

// unmarshal decodes data into dst, translating errors.
func unmarshal(data []byte, dst any) error {
	err := json.Unmarshal(data, dst)
	if err == nil {
		return nil
	}
	var te *json.UnmarshalTypeError
	if errors.As(err, &te) {
		return typeError(data, te)
	}
	var se *json.SyntaxError
	if errors.As(err, &se) {
		return syntaxError(data, se)
	}
	return &ParseError{Err: errorf(ErrSyntax, "the file is damaged: %v", err)}
}

// fieldError is a problem found while converting, with its path.
type fieldError struct {
	path string
	err  error
}

// decodeV1 reads a file of version 1 to 6. Versions 1 to 5 had no response
// settings and no economics: such members in them are ignored. Versions 1 to 4 had no log of
// operations: such a member in them is ignored. Versions 1 to 3 had no saved
// contrasts: such a member in them is ignored, as unknown members are. Versions 1 and 2 had no
// treatment factors: members of version 3 in such a file are ignored, as
// unknown members are. Version 1 had no analysis
// settings: members of that name in a version 1 file are ignored, as
// unknown members are, and the trial gets the defaults (the values as
// recorded, LSD, percent of check for the yield trait).
func decodeV1(data []byte, version int) (*trial.Trial, error) {
	var f fileV1
	if err := unmarshal(data, &f); err != nil {
		return nil, err
	}
	if f.Trial == nil {
		return nil, at(data, "trial", errorf(ErrWrongType, "the file holds no trial"))
	}
	if version < 6 {
		if f.Trial.Analysis != nil {
			f.Trial.Analysis.Response = nil
			f.Trial.Analysis.ContrastAdjust = ""
		}
		f.Trial.Economics = nil
		for i := range f.Trial.Traits {
			f.Trial.Traits[i].Covariate = ""
		}
	}
	if version < 5 {
		f.Trial.Operations = nil
	}
	if version < 4 && f.Trial.Analysis != nil {
		f.Trial.Analysis.Contrasts = nil
	}
	if version < 3 {
		f.Trial.Factors = nil
		f.Trial.Design.MainFactor, f.Trial.Design.SubFactor = "", ""
		for i := range f.Trial.Treatments {
			f.Trial.Treatments[i].Levels = nil
		}
		for i := range f.Trial.Plots {
			p := &f.Trial.Plots[i]
			p.MainPlot, p.SubPlot, p.Strip = 0, 0, 0
		}
	}
	if version < 2 {
		f.Trial.Analysis = nil
		for i := range f.Trial.Traits {
			f.Trial.Traits[i].Transform = ""
			f.Trial.Traits[i].PercentOfCheck = nil
		}
	}
	t, fe := fromV1(f.Trial)
	if fe != nil {
		return nil, at(data, fe.path, fe.err)
	}
	if p := check(t); p != nil {
		return nil, at(data, p.path, p.err)
	}
	return t, nil
}

func fromV1(ft *trialV1) (*trial.Trial, *fieldError) {
	var fe *fieldError
	tm := func(path string, s *string) time.Time {
		v, err := parseTime(s)
		if err != nil && fe == nil {
			fe = &fieldError{path, err}
		}
		return v
	}
	t := &trial.Trial{
		Title:        ft.Title,
		Crop:         ft.Crop,
		Season:       ft.Season,
		Investigator: ft.Investigator,
		Objective:    ft.Objective,
		Notes:        ft.Notes,
		Site: trial.Site{
			Name:         ft.Site.Name,
			Latitude:     ft.Site.Latitude,
			Longitude:    ft.Site.Longitude,
			Soil:         ft.Site.Soil,
			PreviousCrop: ft.Site.PreviousCrop,
		},
		Created:  tm("trial.created", ft.Created),
		Modified: tm("trial.modified", ft.Modified),
		Design:   trial.Design{Kind: trial.DesignKind(ft.Design.Kind), Reps: ft.Design.Reps, MainFactor: ft.Design.MainFactor, SubFactor: ft.Design.SubFactor},
		Layout: trial.Layout{
			PlotLength:    ft.Layout.PlotLength,
			PlotWidth:     ft.Layout.PlotWidth,
			HarvestLength: ft.Layout.HarvestLength,
			HarvestWidth:  ft.Layout.HarvestWidth,
			Alley:         ft.Layout.Alley,
			PlotsPerRow:   ft.Layout.PlotsPerRow,
			Blocks:        trial.BlockArrangement(ft.Layout.Blocks),
			Numbering:     trial.Numbering(ft.Layout.Numbering),
			Walk:          trial.Walk(ft.Layout.Walk),
			Orientation:   trial.Orientation{North: trial.Edge(ft.Layout.North), Landmark: ft.Layout.Landmark},
		},
		Random: trial.Randomization{
			Method: ft.Randomization.Method,
			Done:   tm("trial.randomization.done", ft.Randomization.Done),
		},
	}
	seed, err := parseSeed(ft.Randomization.Seed)
	if err != nil && fe == nil {
		fe = &fieldError{"trial.randomization.seed", err}
	}
	t.Random.Seed = seed
	// Absent settings (a version 1 file) take the defaults, written out.
	t.Analysis.Method = trial.MethodLSD
	if ft.Analysis != nil && ft.Analysis.MeanSeparation != "" {
		t.Analysis.Method = ft.Analysis.MeanSeparation
	}
	if ft.Analysis != nil {
		t.Analysis.Contrasts = decodeContrasts(ft.Analysis.Contrasts)
		if msg := trial.AdjustProblem(ft.Analysis.ContrastAdjust); msg != "" && fe == nil {
			fe = &fieldError{"trial.analysis.contrast_adjust", errorf(ErrWrongType, "%s", msg)}
		} else if ft.Analysis.ContrastAdjust != trial.AdjustNone {
			t.Analysis.ContrastAdjust = ft.Analysis.ContrastAdjust
		}
		if r := ft.Analysis.Response; r != nil {
			if fe == nil && (r.PriceRatio < 0 || math.IsInf(r.PriceRatio, 0)) {
				fe = &fieldError{"trial.analysis.response.price_ratio", errorf(ErrOutOfRange, "the price ratio must be a positive number, not %g", r.PriceRatio)}
			}
			t.Analysis.Response = trial.ResponseSettings{LeaveOut: slices.Clone(r.LeaveOut), PriceRatio: r.PriceRatio}
		}
	}
	if e, ee := decodeEconomics(ft.Economics); ee != nil {
		if fe == nil {
			fe = ee
		}
	} else {
		t.Economics = e
	}
	if ops, oe := decodeOperations(ft.Operations); oe != nil {
		if fe == nil {
			fe = oe
		}
	} else {
		t.Operations = ops
	}
	if len(ft.Treatments) > 0 {
		t.Treatments = make([]trial.Treatment, len(ft.Treatments))
	}
	for i, tr := range ft.Treatments {
		t.Treatments[i] = trial.Treatment{Code: tr.Code, Name: tr.Name, Role: trial.Role(tr.Role), Description: tr.Description, Rate: tr.Rate, RateUnit: tr.RateUnit}
		if len(tr.Levels) > 0 { // an empty list is stored as nil
			t.Treatments[i].Levels = tr.Levels
		}
	}
	t.Factors = fromFactorsV3(ft.Factors)
	if len(ft.Plots) > 0 {
		t.Plots = make([]trial.Plot, len(ft.Plots))
	}
	for i, p := range ft.Plots {
		tp := trial.Plot{Number: p.Number, Block: p.Block, Row: p.Row, Column: p.Column, Treatment: p.Treatment, Note: p.Note,
			MainPlot: p.MainPlot, SubPlot: p.SubPlot, Strip: p.Strip}
		if len(p.Exclusions) > 0 {
			tp.Exclusions = make([]trial.Exclusion, len(p.Exclusions))
			for k, e := range p.Exclusions {
				tp.Exclusions[k] = trial.Exclusion{Trait: e.Trait, Reason: e.Reason}
			}
		}
		t.Plots[i] = tp
	}
	if len(ft.Traits) > 0 {
		t.Traits = make([]trial.Trait, len(ft.Traits))
	}
	for j, tr := range ft.Traits {
		path := fmt.Sprintf("trial.traits[%d]", j)
		tt := trial.Trait{
			Key: tr.Key, Name: tr.Name, Unit: tr.Unit, Kind: trial.TraitKind(tr.Kind),
			Min: tr.Min, Max: tr.Max, Decimals: tr.Decimals,
			Assessed:       tm(path+".assessed", tr.Assessed),
			HigherBetter:   tr.HigherBetter,
			Transform:      tr.Transform,
			PercentOfCheck: tr.PercentOfCheck,
			Covariate:      tr.Covariate,
		}
		if tt.Transform == transformNone {
			tt.Transform = trial.TransformNone
		}
		if d := tr.Derived; d != nil {
			tt.Derived = &trial.Derivation{Kind: trial.DerivationKind(d.Kind), WeightTrait: d.WeightTrait, MoistureTrait: d.MoistureTrait,
				StandardMoisture: d.StandardMoisture, OutputUnit: d.OutputUnit, BushelWeightLb: d.BushelWeightLb, Series: d.Series}
		}
		if a := tr.Assessment; a != nil {
			tt.Assessment = &trial.Assessment{Series: a.Series, Days: a.Days, From: trial.DaysFrom(a.From)}
		}
		tt.PreCountOf = tr.PreCountOf
		vs, idx, err := parseValues(tr.Values)
		if err != nil && fe == nil {
			p := path + ".values"
			if idx >= 0 {
				p += fmt.Sprintf("[%d]", idx)
			}
			fe = &fieldError{p, err}
		}
		if len(vs) > 0 { // an empty list is stored as nil
			tt.Values = vs
		}
		t.Traits[j] = tt
	}
	return t, fe
}

// parseTime reads RFC 3339 text; nil or "" is the zero time.
func parseTime(s *string) (time.Time, error) {
	if s == nil || *s == "" {
		return time.Time{}, nil
	}
	v, err := time.Parse(time.RFC3339Nano, *s)
	if err != nil {
		return time.Time{}, errorf(ErrWrongType, "%q is not a date and time in the form 2026-04-01T08:30:00Z", *s)
	}
	if v.IsZero() {
		return time.Time{}, nil
	}
	return v, nil
}

// parseSeed reads a seed given as a decimal string or a JSON integer;
// absent or null is 0.
func parseSeed(raw json.RawMessage) (uint64, error) {
	s := string(bytes.TrimSpace(raw))
	if s == "" || s == "null" {
		return 0, nil
	}
	text := s
	if strings.HasPrefix(s, `"`) {
		if json.Unmarshal(raw, &text) != nil {
			return 0, errorf(ErrWrongType, "the randomisation seed %s is not a whole number", s)
		}
	}
	v, err := strconv.ParseUint(text, 10, 64)
	if err != nil {
		return 0, errorf(ErrWrongType, "the randomisation seed %s is not a whole number from 0 to 18446744073709551615", s)
	}
	return v, nil
}

// parseValues reads a JSON list of numbers and nulls (null: missing). An
// absent or null list gives nil. On error it returns the index of the bad
// element (-1 when the list itself is wrong).
func parseValues(raw json.RawMessage) ([]float64, int, error) {
	i := skipWS(raw, 0)
	if i >= len(raw) {
		return nil, -1, nil
	}
	if bytes.HasPrefix(raw[i:], []byte("null")) {
		return nil, -1, nil
	}
	if raw[i] != '[' {
		return nil, -1, errorf(ErrWrongType, "expected a list of values, one per plot")
	}
	vs := make([]float64, 0, bytes.Count(raw, []byte(","))+1)
	i++
	for {
		i = skipWS(raw, i)
		if i >= len(raw) {
			return nil, -1, errorf(ErrSyntax, "the list of values is not closed")
		}
		switch c := raw[i]; {
		case c == ']':
			return vs, -1, nil
		case c == ',':
			i++
			continue
		case c == 'n' && bytes.HasPrefix(raw[i:], []byte("null")):
			vs = append(vs, trial.Missing)
			i += 4
		case c == '-' || (c >= '0' && c <= '9'):
			j := i
			for j < len(raw) && strings.IndexByte("+-.eE0123456789", raw[j]) >= 0 {
				j++
			}
			v, err := strconv.ParseFloat(string(raw[i:j]), 64)
			if err != nil && !errors.Is(err, strconv.ErrRange) {
				return nil, len(vs), errorf(ErrWrongType, "%s is not a number", raw[i:j])
			}
			if math.IsInf(v, 0) {
				return nil, len(vs), errorf(ErrValueKind, "the number %s is too large to store", raw[i:j])
			}
			vs = append(vs, v)
			i = j
		default:
			return nil, len(vs), errorf(ErrWrongType, "expected a number or null (missing), found %s", describe(raw[i]))
		}
	}
}

func describe(c byte) string {
	switch c {
	case '"':
		return "text"
	case 't', 'f':
		return "true or false"
	case '[':
		return "a list"
	case '{':
		return "an object"
	}
	return "something else"
}

func skipWS(b []byte, i int) int {
	for i < len(b) && (b[i] == ' ' || b[i] == '\t' || b[i] == '\r' || b[i] == '\n') {
		i++
	}
	return i
}

func decodeV0(data []byte) (*trial.Trial, error) {
	var f fileV0
	if err := unmarshal(data, &f); err != nil {
		return nil, err
	}
	if f.Trial == nil {
		return nil, at(data, "trial", errorf(ErrWrongType, "the file holds no trial"))
	}
	ft := f.Trial
	var fe *fieldError
	tm := func(path string, s *string) time.Time {
		v, err := parseTime(s)
		if err != nil && fe == nil {
			fe = &fieldError{path, err}
		}
		return v
	}
	t := &trial.Trial{
		Title:        ft.Title,
		Crop:         ft.Crop,
		Season:       ft.Season,
		Site:         trial.Site{Name: ft.Site},
		Investigator: ft.Investigator,
		Notes:        ft.Notes,
		Created:      tm("trial.created", ft.Created),
		Design:       trial.Design{Kind: trial.DesignKind(ft.Design), Reps: ft.Reps},
		Layout: trial.Layout{
			PlotLength:  ft.PlotLength,
			PlotWidth:   ft.PlotWidth,
			PlotsPerRow: ft.PlotsPerRow,
			Walk:        trial.WalkStraight,
		},
		Random:   trial.Randomization{Done: tm("trial.randomized", ft.Randomized)},
		Analysis: trial.Analysis{Method: trial.MethodLSD},
	}
	if ft.Serpentine {
		t.Layout.Walk = trial.WalkSerpentine
	}
	seed, err := parseSeed(ft.Seed)
	if err != nil && fe == nil {
		fe = &fieldError{"trial.seed", err}
	}
	t.Random.Seed = seed
	for _, tr := range ft.Treatments {
		role := trial.RoleEntry
		if tr.Check {
			role = trial.RoleCheck
		}
		t.Treatments = append(t.Treatments, trial.Treatment{Code: tr.Code, Name: tr.Name, Role: role, Rate: tr.Rate, RateUnit: tr.RateUnit})
	}
	keys := make(map[string]int, len(ft.Traits))
	for j, tr := range ft.Traits {
		if _, dup := keys[tr.Key]; !dup {
			keys[tr.Key] = j
		}
		var vs []float64
		if len(ft.Plots) > 0 {
			vs = make([]float64, len(ft.Plots))
		}
		for i := range vs {
			vs[i] = trial.Missing
		}
		t.Traits = append(t.Traits, trial.Trait{
			Key: tr.Key, Name: tr.Name, Unit: tr.Unit, Kind: trial.TraitKind(tr.Kind),
			Min: tr.Min, Max: tr.Max, Decimals: tr.Decimals, HigherBetter: tr.HigherBetter,
			Values: vs,
		})
	}
	for i, p := range ft.Plots {
		t.Plots = append(t.Plots, trial.Plot{Number: p.Plot, Block: p.Block, Row: p.Row, Column: p.Column, Treatment: p.Treatment, Note: p.Note})
		names := make([]string, 0, len(p.Values))
		for k := range p.Values {
			names = append(names, k)
		}
		sort.Strings(names)
		for _, k := range names {
			path := fmt.Sprintf("trial.plots[%d].values.%s", i, k)
			j, ok := keys[k]
			if !ok {
				if fe == nil {
					fe = &fieldError{path, errorf(ErrUnknownTrait, "plot %d has a value for trait %q, which the trial does not have", p.Plot, k)}
				}
				continue
			}
			raw := bytes.TrimSpace(p.Values[k])
			if string(raw) == "null" {
				continue
			}
			vs, _, err := parseValues(append(append([]byte{'['}, raw...), ']'))
			if err == nil && len(vs) != 1 {
				err = errorf(ErrWrongType, "expected one number or null (missing)")
			}
			if err != nil {
				if fe == nil {
					fe = &fieldError{path, err}
				}
				continue
			}
			t.Traits[j].Values[i] = vs[0]
		}
	}
	if fe != nil {
		return nil, at(data, fe.path, fe.err)
	}
	if p := check(t); p != nil {
		return nil, at(data, v0Path(p.path, t), p.err)
	}
	return t, nil
}

// v0Path translates a path of the version 1 shape into the version 0 shape.
func v0Path(p string, t *trial.Trial) string {
	var j, i int
	if n, _ := fmt.Sscanf(p, "trial.traits[%d].values[%d]", &j, &i); n == 2 && j < len(t.Traits) {
		return fmt.Sprintf("trial.plots[%d].values.%s", i, t.Traits[j].Key)
	}
	var rest string
	if n, _ := fmt.Sscanf(p, "trial.plots[%d].%s", &i, &rest); n == 2 && rest == "number" {
		return fmt.Sprintf("trial.plots[%d].plot", i)
	}
	return p
}
