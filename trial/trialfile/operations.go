package trialfile

import (
	"fmt"
	"time"

	"furlong/trial"
)

// operationV5 is one entry of the trial's log of operations (version 5).
// Numbers not recorded are absent; the date is a calendar day, YYYY-MM-DD.
type operationV5 struct {
	Kind          string   `json:"kind"`
	Date          string   `json:"date"`
	Treatments    []string `json:"treatments,omitempty"`
	Product       string   `json:"product,omitempty"`
	Rate          *float64 `json:"rate,omitempty"`
	RateUnit      string   `json:"rate_unit,omitempty"`
	WaterVolume   *float64 `json:"water_l_per_ha,omitempty"`
	Equipment     string   `json:"equipment,omitempty"`
	Temperature   *float64 `json:"temperature_c,omitempty"`
	Wind          *float64 `json:"wind_km_per_h,omitempty"`
	WindDirection string   `json:"wind_direction,omitempty"`
	Humidity      *float64 `json:"humidity_percent,omitempty"`
	GrowthStage   string   `json:"growth_stage,omitempty"`
	Scale         string   `json:"growth_scale,omitempty"`
	Assessor      string   `json:"assessor,omitempty"`
	Traits        []string `json:"traits,omitempty"`
	Notes         string   `json:"notes,omitempty"`
}

const dayLayout = "2006-01-02"

// encodeOperations maps the trial's log to the file.
func encodeOperations(ops []trial.Operation) []operationV5 {
	if len(ops) == 0 {
		return nil
	}
	out := make([]operationV5, len(ops))
	for i, o := range ops {
		out[i] = operationV5{
			Kind: string(o.Kind), Date: o.Date.Format(dayLayout), Treatments: o.Treatments,
			Product: o.Product, Rate: o.Rate, RateUnit: o.RateUnit, WaterVolume: o.WaterVolume, Equipment: o.Equipment,
			Temperature: o.Temperature, Wind: o.Wind, WindDirection: o.WindDirection, Humidity: o.Humidity,
			GrowthStage: o.GrowthStage, Scale: o.Scale, Assessor: o.Assessor, Traits: o.Traits, Notes: o.Notes,
		}
	}
	return out
}

// decodeOperations maps the file's log to the trial. A date that is not a
// day is a damaged file (with its path); the rest is checked when an entry
// is added (trial.CheckOperation), so that a hand-edited log does not stop
// the trial from opening.
func decodeOperations(ops []operationV5) ([]trial.Operation, *fieldError) {
	if len(ops) == 0 {
		return nil, nil
	}
	out := make([]trial.Operation, len(ops))
	for i, o := range ops {
		d, err := time.Parse(dayLayout, o.Date)
		if err != nil {
			return nil, &fieldError{fmt.Sprintf("trial.operations[%d].date", i),
				errorf(ErrWrongType, "%q is not a date; write it as YYYY-MM-DD", o.Date)}
		}
		out[i] = trial.Operation{
			Kind: trial.OperationKind(o.Kind), Date: d, Treatments: o.Treatments,
			Product: o.Product, Rate: o.Rate, RateUnit: o.RateUnit, WaterVolume: o.WaterVolume, Equipment: o.Equipment,
			Temperature: o.Temperature, Wind: o.Wind, WindDirection: o.WindDirection, Humidity: o.Humidity,
			GrowthStage: o.GrowthStage, Scale: o.Scale, Assessor: o.Assessor, Traits: o.Traits, Notes: o.Notes,
		}
	}
	return out, nil
}
