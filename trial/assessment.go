package trial

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"time"
)

// RoleUntreated is the untreated check: the control that received no
// treatment, against which percent efficacy (Abbott, Henderson–Tilton) is
// worked out. It is also a check, the standard entries are compared with.
const RoleUntreated Role = "untreated"

// IsCheck reports whether the role is a check of either kind (RoleCheck
// or RoleUntreated).
func (r Role) IsCheck() bool { return r == RoleCheck || r == RoleUntreated }

// Untreated returns the code of the trial's untreated check, "" when no
// treatment has RoleUntreated or several have.
func (t *Trial) Untreated() string {
	code := ""
	for _, tr := range t.Treatments {
		if tr.Role == RoleUntreated {
			if code != "" {
				return ""
			}
			code = tr.Code
		}
	}
	return code
}

// DaysFrom says what an assessment's day count is counted from.
type DaysFrom string

const (
	DaysAfterTreatment DaysFrom = "treatment" // days after treatment (DAT)
	DaysAfterSowing    DaysFrom = "sowing"    // days after sowing (DAS)
)

// Abbrev is the usual short form: "DAT" or "DAS".
func (d DaysFrom) Abbrev() string {
	switch d {
	case DaysAfterTreatment:
		return "DAT"
	case DaysAfterSowing:
		return "DAS"
	}
	return ""
}

// Assessment links a trait to the other assessments of the same trait on
// other dates: each assessment is its own trait (with its own values and
// its date in Trait.Assessed), the series is the set of traits with the
// same Series key.
type Assessment struct {
	// Series is the key shared by every assessment of the series, for
	// example "sev" for sev_1, sev_2, ...
	Series string
	// Days is the assessment's day count after treatment or sowing, as From
	// says; From == "" when no day count was given.
	Days int
	From DaysFrom
}

// Derived trait kinds over an assessment series.
const (
	// AUDPC is the area under the disease progress curve of a series,
	// by the trapezoidal rule over its assessment times.
	AUDPC DerivationKind = "audpc"
	// AUDPCStandard is AUDPC divided by the duration of the series (last
	// minus first assessment time): the standardised AUDPC, on the scale
	// of the assessments.
	AUDPCStandard DerivationKind = "audpc-standardised"
)

// AreaUnderCurve returns the area under the progress curve through the
// points (times[i], values[i]) by the trapezoidal rule (Shaner & Finney
// 1977, Phytopathology 67, 1051–1056):
//
//	AUDPC = Σ_{i=1}^{n−1} (y_i + y_{i+1})/2 × (t_{i+1} − t_i)
//
// times must increase strictly; at least two points are needed. A missing
// value gives a missing area and no error: leaving an assessment out would
// bridge it with a straight line and change the area (common practice is
// to treat the plot as missing).
func AreaUnderCurve(times, values []float64) (float64, error) {
	if len(times) != len(values) {
		return Missing, fmt.Errorf("%d assessment times for %d values", len(times), len(values))
	}
	if len(times) < 2 {
		return Missing, fmt.Errorf("an area under the progress curve needs at least two assessments, not %d", len(times))
	}
	for i := 1; i < len(times); i++ {
		if !(times[i] > times[i-1]) {
			return Missing, fmt.Errorf("the assessment times must increase: %g comes after %g", times[i], times[i-1])
		}
	}
	var a float64
	for i, v := range values {
		if IsMissing(v) || math.IsInf(v, 0) {
			return Missing, nil
		}
		if i > 0 {
			a += (values[i-1] + v) / 2 * (times[i] - times[i-1])
		}
	}
	return a, nil
}

// SeriesKeys returns the keys of the assessment series of the trial in
// the order their first assessment appears.
func (t *Trial) SeriesKeys() []string {
	var out []string
	seen := map[string]bool{}
	for _, tr := range t.Traits {
		if a := tr.Assessment; a != nil && a.Series != "" && !seen[a.Series] {
			seen[a.Series] = true
			out = append(out, a.Series)
		}
	}
	return out
}

// SeriesPoint is one assessment of a series.
type SeriesPoint struct {
	Trait string  // the assessment's trait key
	Time  float64 // days: from the first assessment's date, or the day count
	Date  time.Time
	Days  int
	From  DaysFrom
}

// Series returns the assessments of the series key in time order. Times
// are days since the first assessment's date when every assessment has a
// date, otherwise the day counts after treatment or sowing when every
// assessment has one (on the same basis); any other mix is an error, as
// are two assessments at the same time.
func (t *Trial) Series(key string) ([]SeriesPoint, error) {
	var pts []SeriesPoint
	dated, counted := true, true
	var from DaysFrom
	for _, tr := range t.Traits {
		a := tr.Assessment
		if a == nil || a.Series != key {
			continue
		}
		pts = append(pts, SeriesPoint{Trait: tr.Key, Date: tr.Assessed, Days: a.Days, From: a.From})
		if tr.Assessed.IsZero() {
			dated = false
		}
		if a.From == "" || (from != "" && a.From != from) {
			counted = false
		} else {
			from = a.From
		}
	}
	if len(pts) == 0 {
		return nil, fmt.Errorf("the trial has no assessment series %q", key)
	}
	switch {
	case dated:
		first := pts[0].Date
		for _, p := range pts {
			if p.Date.Before(first) {
				first = p.Date
			}
		}
		for i := range pts {
			pts[i].Time = math.Round(pts[i].Date.Sub(first).Hours() / 24)
		}
	case counted:
		for i := range pts {
			pts[i].Time = float64(pts[i].Days)
		}
	default:
		return nil, fmt.Errorf("the assessments of series %q need a date each, or a day count after treatment or after sowing each", key)
	}
	sort.SliceStable(pts, func(i, j int) bool { return pts[i].Time < pts[j].Time })
	for i := 1; i < len(pts); i++ {
		if pts[i].Time == pts[i-1].Time {
			return nil, fmt.Errorf("assessments %q and %q of series %q are at the same time; give each its own date", pts[i-1].Trait, pts[i].Trait, key)
		}
	}
	return pts, nil
}

// AUDPCTrait returns a derived trait computing the area under the progress
// curve of the series (standardised: divided by the series' duration, so
// on the scale of the assessments). Lower is better, as for disease or
// pest assessments.
func AUDPCTrait(key, series, unit string, standardised bool) Trait {
	tr := Trait{Key: key, Kind: Continuous, Decimals: 1, Derived: &Derivation{Kind: AUDPC, Series: series}}
	tr.Name = "AUDPC of " + series
	tr.Unit = "days"
	if unit != "" {
		tr.Unit = unit + "·days"
	}
	if standardised {
		tr.Derived.Kind = AUDPCStandard
		tr.Name = "Standardised AUDPC of " + series
		tr.Unit = unit
		tr.Decimals = 2
	}
	return tr
}

// deriveAUDPC computes an AUDPC trait for every plot.
func (t *Trial) deriveAUDPC(tr *Trait) ([]float64, error) {
	d := tr.Derived
	pts, err := t.Series(d.Series)
	if err != nil {
		return nil, fmt.Errorf("trait %q cannot be computed: %w", tr.Key, err)
	}
	if len(pts) < 2 {
		return nil, fmt.Errorf("trait %q needs at least two assessments in series %q, not %d", tr.Key, d.Series, len(pts))
	}
	times := make([]float64, len(pts))
	cols := make([][]float64, len(pts))
	for i, p := range pts {
		times[i] = p.Time
		if cols[i], err = t.storedValues(p.Trait, tr.Key); err != nil {
			return nil, err
		}
	}
	span := times[len(times)-1] - times[0]
	out := make([]float64, len(t.Plots))
	y := make([]float64, len(pts))
	for k := range out {
		for i := range pts {
			y[i] = cols[i][k]
		}
		a, err := AreaUnderCurve(times, y)
		if err != nil {
			return nil, fmt.Errorf("trait %q cannot be computed: %w", tr.Key, err)
		}
		if d.Kind == AUDPCStandard && !IsMissing(a) {
			a /= span
		}
		out[k] = a
	}
	return out, nil
}

// PreCount returns the key of the trait marked as the pre-treatment count
// of the trait key (or of its series), "" when there is none.
func (t *Trial) PreCount(key string) string {
	tr := t.Trait(key)
	if tr == nil {
		return ""
	}
	for _, c := range t.Traits {
		if c.PreCountOf == "" || c.Key == key {
			continue
		}
		if c.PreCountOf == key || (tr.Assessment != nil && c.PreCountOf == tr.Assessment.Series) {
			return c.Key
		}
	}
	return ""
}

// checkAUDPC checks an AUDPC trait's series.
func (p *problems) checkAUDPC(t *Trial, i int) {
	tr := &t.Traits[i]
	f := fmt.Sprintf("Traits[%d].Derived.Series", i)
	pts, err := t.Series(tr.Derived.Series)
	switch {
	case tr.Derived.Series == "":
		p.add(f, "trait %q needs the assessment series it is computed from", tr.Key)
	case err != nil:
		p.add(f, "trait %q: %v", tr.Key, err)
	case len(pts) < 2:
		p.add(f, "trait %q needs at least two assessments in series %q; the series has one", tr.Key, tr.Derived.Series)
	}
}

// checkAssessment checks a trait's assessment and pre-count marks.
func (p *problems) checkAssessment(t *Trial, i int) {
	tr := &t.Traits[i]
	if a := tr.Assessment; a != nil {
		f := fmt.Sprintf("Traits[%d].Assessment", i)
		switch {
		case tr.Derived != nil:
			p.add(f, "trait %q is computed, so it cannot be an assessment of a series", tr.Key)
		case a.Series == "":
			p.add(f+".Series", "trait %q is an assessment but names no series", tr.Key)
		}
		switch a.From {
		case "", DaysAfterTreatment, DaysAfterSowing:
		default:
			p.add(f+".From", "trait %q counts its days from %q; use treatment or sowing", tr.Key, a.From)
		}
		if a.From != "" && a.Days < 0 {
			p.add(f+".Days", "trait %q is assessed %d days after %s; the count cannot be negative", tr.Key, a.Days, a.From)
		}
	}
	if tr.PreCountOf != "" {
		f := fmt.Sprintf("Traits[%d].PreCountOf", i)
		found := false
		for _, o := range t.Traits {
			if o.Key != tr.Key && (o.Key == tr.PreCountOf || (o.Assessment != nil && o.Assessment.Series == tr.PreCountOf)) {
				found = true
			}
		}
		if !found {
			p.add(f, "trait %q is the pre-treatment count of %q, which is neither a trait nor a series of the trial", tr.Key, tr.PreCountOf)
		}
	}
}

// AssessmentSeries makes the traits of an assessment series: one trait per
// assessment (key_1, key_2, ...) in the given unit ("%" makes percent
// traits with a 0–100 range), each assessed on a date (2026-06-01) or a day
// count after treatment or sowing (7DAT, 35DAS; "2026-06-01/7DAT" gives
// both), and the series' AUDPC and standardised AUDPC traits (key_audpc,
// key_saudpc). whens lists the assessments, comma-separated, in order; at
// least two are needed. The command line's --assess and the window's
// Traits tab both use it.
func AssessmentSeries(key, unit, whens string) ([]Trait, error) {
	if err := CheckTraitKey(key); err != nil {
		return nil, err
	}
	kind := Continuous
	if unit == "%" {
		kind = Percent
	}
	var out []Trait
	for i, w := range strings.Split(whens, ",") {
		w = strings.TrimSpace(w)
		if w == "" {
			continue
		}
		tr := Trait{
			Key: fmt.Sprintf("%s_%d", key, len(out)+1), Unit: unit, Kind: kind, Decimals: 1,
			Assessment: &Assessment{Series: key},
		}
		if kind == Percent {
			lo, hi := 0.0, 100.0
			tr.Min, tr.Max = &lo, &hi
		}
		var label []string
		for _, part := range strings.Split(w, "/") {
			part = strings.TrimSpace(part)
			up := strings.ToUpper(part)
			switch {
			case strings.HasSuffix(up, "DAT") || strings.HasSuffix(up, "DAS"):
				n, err := strconv.Atoi(strings.TrimSpace(up[:len(up)-3]))
				if err != nil || n < 0 {
					return nil, fmt.Errorf("series %s: %q is not a day count such as 7DAT or 35DAS", key, part)
				}
				tr.Assessment.Days, tr.Assessment.From = n, DaysAfterTreatment
				if strings.HasSuffix(up, "DAS") {
					tr.Assessment.From = DaysAfterSowing
				}
				label = append(label, fmt.Sprintf("%d %s", n, tr.Assessment.From.Abbrev()))
			default:
				d, err := time.Parse("2006-01-02", part)
				if err != nil {
					return nil, fmt.Errorf("series %s: assessment %d, %q, is neither a date (2026-06-01) nor a day count (7DAT, 35DAS)", key, i+1, part)
				}
				tr.Assessed = d
				label = append(label, part)
			}
		}
		tr.Name = key + ", " + strings.Join(label, ", ")
		out = append(out, tr)
	}
	if len(out) < 2 {
		return nil, fmt.Errorf("series %s needs at least two assessments to follow over time", key)
	}
	out = append(out, AUDPCTrait(key+"_audpc", key, unit, false), AUDPCTrait(key+"_saudpc", key, unit, true))
	return out, nil
}
