package jsonout

import "furlong/trial/analysis"

// writeEfficacy writes "efficacy" (one compact object per treatment other
// than the untreated check: its percent efficacy by Abbott's formula and,
// with pre-treatment counts, by Henderson–Tilton's; null where it cannot
// be worked out) and "efficacy_untreated" (the untreated check's code, its
// mean and the pre-count trait, "" for none). Both are left out when the
// result has no efficacy.
func writeEfficacy(w *Writer, e *analysis.Efficacy) {
	if e == nil {
		return
	}
	w.Key("efficacy")
	w.BeginArray()
	for _, r := range e.Rows {
		w.BeginCompactObject()
		w.StringField("treatment", r.Treatment)
		w.NullableNumberField("abbott_percent", r.Abbott)
		w.NullableNumberField("henderson_tilton_percent", r.HendersonTilton)
		w.EndObject()
	}
	w.EndArray()
	w.Key("efficacy_untreated")
	w.BeginCompactObject()
	w.StringField("treatment", e.Untreated)
	w.NumberField("mean", e.UntreatedMean)
	w.StringField("pre_count_trait", e.PreCount)
	w.EndObject()
}
