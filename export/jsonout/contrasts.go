package jsonout

import "furlong/trial/analysis"

// writeContrasts writes "contrasts" (one compact object per contrast: name,
// definition, estimate, se, df, t, p, p_adjusted) and "contrasts_adjust"
// (none, bonferroni, holm or scheffe); both left out when no contrast was
// estimated.
func writeContrasts(w *Writer, set *analysis.ContrastSet) {
	if set == nil || len(set.Rows) == 0 {
		return
	}
	w.Key("contrasts")
	w.BeginArray()
	for _, r := range set.Rows {
		w.BeginCompactObject()
		w.StringField("name", r.Name)
		w.StringField("definition", r.Definition)
		w.NumberField("estimate", r.Estimate)
		w.NumberField("se", r.SE)
		w.NumberField("df", float64(r.DF))
		w.NumberField("t", r.T)
		w.NumberField("p", r.P)
		w.NumberField("p_adjusted", r.PAdjusted)
		w.EndObject()
	}
	w.EndArray()
	w.StringField("contrasts_adjust", string(set.Adjust))
}
