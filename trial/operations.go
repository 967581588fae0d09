package trial

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"
	"time"
)

// OperationKind is what was done on a trial on one day.
type OperationKind string

// The kinds of operation a trial's log records.
const (
	OpSowing      OperationKind = "sowing"
	OpApplication OperationKind = "application" // a product applied to some or all treatments
	OpAssessment  OperationKind = "assessment"  // traits scored or counted
	OpHarvest     OperationKind = "harvest"
	OpOther       OperationKind = "other" // fertiliser, cultivation, irrigation...
)

// OperationKinds lists the kinds in the order a season runs.
var OperationKinds = []OperationKind{OpSowing, OpApplication, OpAssessment, OpHarvest, OpOther}

// Title is the kind as a heading word: "Sowing", "Application"...
func (k OperationKind) Title() string {
	if k == "" {
		return ""
	}
	return strings.ToUpper(string(k[:1])) + string(k[1:])
}

// Operation is one entry of a trial's log of operations: what was done, on
// which day, to which treatments, with what, and in which weather. Furlong
// records what the user did and typed; it never suggests a product or a
// rate. Numbers not recorded are nil.
type Operation struct {
	Kind OperationKind
	Date time.Time // the day (UTC midnight)
	// Treatments are the codes of the treatments the operation was applied
	// to; empty for the whole trial.
	Treatments []string
	// Product is the product's name as the user typed it (an application,
	// or a fertiliser under "other"); Rate and RateUnit its rate as typed
	// (for example 1.25 "L/ha").
	Product  string
	Rate     *float64
	RateUnit string
	// WaterVolume is the spray volume in L/ha.
	WaterVolume *float64
	Equipment   string
	// Weather at the operation: air temperature in °C, wind speed in km/h
	// and its direction as typed ("SW"), relative humidity in %.
	Temperature   *float64
	Wind          *float64
	WindDirection string
	Humidity      *float64
	// GrowthStage is the crop's stage as typed ("31"), on the scale the
	// user names (Scale, for example "BBCH").
	GrowthStage string
	Scale       string
	// Assessor is who assessed or applied; Traits the keys of the traits
	// assessed (an assessment).
	Assessor string
	Traits   []string
	Notes    string
}

// Clone returns a copy of o that shares no memory with it.
func (o Operation) Clone() Operation {
	o.Treatments = slices.Clone(o.Treatments)
	o.Traits = slices.Clone(o.Traits)
	o.Rate = clonePtr(o.Rate)
	o.WaterVolume = clonePtr(o.WaterVolume)
	o.Temperature = clonePtr(o.Temperature)
	o.Wind = clonePtr(o.Wind)
	o.Humidity = clonePtr(o.Humidity)
	return o
}

func cloneOperations(ops []Operation) []Operation {
	if ops == nil {
		return nil
	}
	out := make([]Operation, len(ops))
	for i, o := range ops {
		out[i] = o.Clone()
	}
	return out
}

// CheckOperation checks an operation against the trial: a known kind, a
// date, treatments and traits the trial has, numbers in their ranges, and
// a product for an application. The errors are plain sentences.
func (t *Trial) CheckOperation(o Operation) error {
	if !slices.Contains(OperationKinds, o.Kind) {
		var ks []string
		for _, k := range OperationKinds {
			ks = append(ks, string(k))
		}
		return fmt.Errorf("%q is not a kind of operation; use %s", o.Kind, strings.Join(ks, ", "))
	}
	if o.Date.IsZero() {
		return fmt.Errorf("the %s needs its date", o.Kind)
	}
	if o.Kind == OpApplication && strings.TrimSpace(o.Product) == "" {
		return fmt.Errorf("an application needs the name of the product applied, as on its label")
	}
	codes := t.TreatmentCodes()
	for _, c := range o.Treatments {
		if !slices.Contains(codes, c) {
			return fmt.Errorf("there is no treatment %q (the treatments are %s)", c, strings.Join(codes, ", "))
		}
	}
	for _, k := range o.Traits {
		if t.Trait(k) == nil {
			var keys []string
			for _, tr := range t.Traits {
				keys = append(keys, tr.Key)
			}
			return fmt.Errorf("there is no trait %q (the traits are %s)", k, strings.Join(keys, ", "))
		}
	}
	num := func(what string, v *float64, lo, hi float64) error {
		if v == nil {
			return nil
		}
		if math.IsNaN(*v) || *v < lo || *v > hi {
			return fmt.Errorf("the %s %g is out of range (%g to %g)", what, *v, lo, hi)
		}
		return nil
	}
	for _, c := range []error{
		num("rate", o.Rate, 0, math.MaxFloat64),
		num("water volume (L/ha)", o.WaterVolume, 0, 100000),
		num("temperature (°C)", o.Temperature, -60, 60),
		num("wind speed (km/h)", o.Wind, 0, 300),
		num("relative humidity (%)", o.Humidity, 0, 100),
	} {
		if c != nil {
			return c
		}
	}
	if o.Rate != nil && strings.TrimSpace(o.RateUnit) == "" {
		return fmt.Errorf("say the unit of the rate, as on the label (for example L/ha or kg/ha)")
	}
	return nil
}

// AddOperation checks o and adds it to the log, which stays in date order
// (operations of one day in the order they were added).
func (t *Trial) AddOperation(o Operation) error {
	o.Date = Day(o.Date)
	if err := t.CheckOperation(o); err != nil {
		return err
	}
	t.Operations = append(t.Operations, o.Clone())
	t.SortOperations()
	return nil
}

// RemoveOperation removes entry i (0-based, in date order) of the log.
func (t *Trial) RemoveOperation(i int) error {
	if i < 0 || i >= len(t.Operations) {
		if len(t.Operations) == 0 {
			return fmt.Errorf("the trial's log of operations is empty")
		}
		return fmt.Errorf("there is no operation %d: the log has %d (numbered from 1)", i+1, len(t.Operations))
	}
	t.Operations = slices.Delete(t.Operations, i, i+1)
	return nil
}

// SortOperations puts the log in date order, keeping the order of entries
// of the same day.
func (t *Trial) SortOperations() {
	sort.SliceStable(t.Operations, func(i, j int) bool { return t.Operations[i].Date.Before(t.Operations[j].Date) })
}

// Day is the calendar day of tm as UTC midnight: operations are by day.
func Day(tm time.Time) time.Time {
	if tm.IsZero() {
		return tm
	}
	y, m, d := tm.Date()
	return time.Date(y, m, d, 0, 0, 0, 0, time.UTC)
}

// TreatmentsText is the operation's treatments for a table: the codes, or
// "all plots".
func (o Operation) TreatmentsText() string {
	if len(o.Treatments) == 0 {
		return "all plots"
	}
	return strings.Join(o.Treatments, ", ")
}

// RateText is the rate with its unit as typed, "" when none.
func (o Operation) RateText() string {
	if o.Rate == nil {
		return ""
	}
	return strings.TrimSpace(formatNum(*o.Rate) + " " + o.RateUnit)
}

// WeatherText is the weather at the operation in one phrase, "" when none
// was recorded: "14 °C, wind 8 km/h SW, RH 65 %".
func (o Operation) WeatherText() string {
	var parts []string
	if o.Temperature != nil {
		parts = append(parts, formatNum(*o.Temperature)+" °C")
	}
	if o.Wind != nil || o.WindDirection != "" {
		w := "wind"
		if o.Wind != nil {
			w += " " + formatNum(*o.Wind) + " km/h"
		}
		if d := strings.TrimSpace(o.WindDirection); d != "" {
			w += " " + d
		}
		parts = append(parts, w)
	}
	if o.Humidity != nil {
		parts = append(parts, "RH "+formatNum(*o.Humidity)+" %")
	}
	return strings.Join(parts, ", ")
}

// StageText is the growth stage with its scale, "" when none: "BBCH 31".
func (o Operation) StageText() string {
	return strings.TrimSpace(strings.TrimSpace(o.Scale) + " " + strings.TrimSpace(o.GrowthStage))
}

func formatNum(v float64) string {
	return strings.TrimSuffix(strings.TrimRight(fmt.Sprintf("%.3f", v), "0"), ".")
}
