package export

import (
	"strings"

	"furlong/trial"
)

// OperationDetails is one entry of a trial's log as a phrase for a table:
// the product and its rate, the water volume and equipment, the weather,
// the growth stage, the traits assessed, who, and the notes, each only when
// recorded ("Programme A product 1, 1.25 L/ha in 200 L/ha water; plot
// sprayer; 14 °C, wind 8 km/h SW, RH 65 %; BBCH 31; by crew 2").
func OperationDetails(o trial.Operation) string {
	var parts []string
	first := strings.TrimSpace(o.Product)
	if r := o.RateText(); r != "" {
		first = strings.TrimSpace(first + ", " + r)
		first = strings.TrimPrefix(first, ", ")
	}
	if o.WaterVolume != nil {
		water := trial.Operation{Rate: o.WaterVolume, RateUnit: "L/ha"}.RateText() + " water"
		if first != "" {
			first += " in " + water
		} else {
			first = water
		}
	}
	for _, s := range []string{first, strings.TrimSpace(o.Equipment), o.WeatherText(), o.StageText()} {
		if s != "" {
			parts = append(parts, s)
		}
	}
	if len(o.Traits) > 0 {
		parts = append(parts, "assessed "+strings.Join(o.Traits, ", "))
	}
	if a := strings.TrimSpace(o.Assessor); a != "" {
		parts = append(parts, "by "+a)
	}
	if n := strings.TrimSpace(o.Notes); n != "" {
		parts = append(parts, n)
	}
	return strings.Join(parts, "; ")
}

// OperationColumns are the heads of the log's table in the report, and
// OperationRow an entry's cells under them.
var OperationColumns = []string{"Date", "Operation", "Treatments", "Product", "Rate", "Water (L/ha)", "Equipment", "Weather", "Growth stage", "Traits assessed", "By", "Notes"}

// OperationRow is entry o's cells under OperationColumns (the water volume
// as a number is left to the caller: its cell here is its text).
func OperationRow(o trial.Operation) []string {
	water := ""
	if o.WaterVolume != nil {
		water = trial.Operation{Rate: o.WaterVolume}.RateText()
	}
	return []string{o.Date.Format("2006-01-02"), o.Kind.Title(), o.TreatmentsText(), o.Product, o.RateText(), water,
		o.Equipment, o.WeatherText(), o.StageText(), strings.Join(o.Traits, ", "), o.Assessor, o.Notes}
}

// HasApplication reports whether the log records an application of a
// product, which calls for the crop-protection cautions beside it.
func HasApplication(ops []trial.Operation) bool {
	for _, o := range ops {
		if o.Kind == trial.OpApplication {
			return true
		}
	}
	return false
}
