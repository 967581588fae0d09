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

// SeriesOf is the assessment series a trait belongs to: its own series
// for an assessment, the series it is computed from for an AUDPC trait; ""
// otherwise. The window shows the series over the season beside any such
// trait.
func SeriesOf(t *trial.Trial, key string) string {
	tr := t.Trait(key)
	switch {
	case tr == nil:
		return ""
	case tr.Assessment != nil && tr.Assessment.Series != "":
		return tr.Assessment.Series
	case tr.Derived != nil && (tr.Derived.Kind == trial.AUDPC || tr.Derived.Kind == trial.AUDPCStandard):
		return tr.Derived.Series
	}
	return ""
}

// ProgressSheetSeries is the series whose chart over the season a report
// puts on the sheet or page of trait key, "" for none: once per series,
// on its first AUDPC trait among the reported ones (keys), else on its
// last reported assessment.
func ProgressSheetSeries(t *trial.Trial, key string, keys []string) string {
	s := SeriesOf(t, key)
	if s == "" {
		return ""
	}
	var audpc, last string
	for _, k := range keys {
		if SeriesOf(t, k) != s {
			continue
		}
		if tr := t.Trait(k); tr.Derived != nil && audpc == "" {
			audpc = k
		}
		if tr := t.Trait(k); tr.Assessment != nil {
			last = k
		}
	}
	if audpc == key || (audpc == "" && last == key) {
		return s
	}
	return ""
}
