package jsonout

import (
	"io"
	"math"

	"furlong/export"
	"furlong/trial/series"
)

// WriteSeries writes the results of a trial series ("furlong series
// --format json"): {"traits": [...], "cautions": [...]}. The keys are part
// of the CLI's contract and listed in the README; values that do not apply
// are null.
func WriteSeries(out io.Writer, results []*series.Result) error {
	w := New(out)
	w.BeginObject()
	w.Key("traits")
	w.BeginArray()
	for _, r := range results {
		seriesTrait(w, r)
	}
	w.EndArray()
	w.Key("cautions")
	w.Strings(export.SeriesCautions)
	w.EndObject()
	return w.Flush()
}

func finite(v float64) *float64 {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return nil
	}
	return &v
}

func seriesTrait(w *Writer, r *series.Result) {
	w.BeginObject()
	w.StringField("trait", r.Trait.Key)
	w.StringField("name", r.Trait.Name)
	w.StringField("unit", r.Trait.Unit)
	w.StringField("method", r.Method)
	w.StringField("method_reason", r.MethodReason)
	w.StringField("sites_effect", r.Sites.String())
	w.BoolField("weighted", r.Weighted)
	w.NumberField("alpha", r.Alpha)
	w.StringField("separation", string(r.Separation))
	w.Key("check")
	if r.Check >= 0 {
		w.String(r.Entries[r.Check].Code)
	} else {
		w.Null()
	}

	w.Key("sites")
	w.BeginArray()
	for _, s := range r.SiteStats {
		w.BeginCompactObject()
		w.StringField("site", s.Site)
		w.StringField("season", s.Season)
		w.StringField("label", s.Label)
		w.IntField("entries", s.Entries)
		w.IntField("n", s.N)
		w.NumberField("grand_mean", s.GrandMean)
		w.NullableNumberField("mse", s.MSE)
		w.IntField("df_error", s.DFError)
		w.NullableNumberField("cv_percent", s.CVPercent)
		w.NullableNumberField("p_treatment", s.PTreatment)
		w.NullableNumberField("lsd", s.LSD)
		w.BoolField("lsd_varies", s.LSDVaries)
		w.EndObject()
	}
	w.EndArray()

	w.Key("bartlett")
	if b := r.Bartlett; b != nil {
		w.BeginObject()
		w.NumberField("k2", b.K2)
		w.IntField("df", b.DF)
		w.NumberField("p", b.P)
		w.NumberField("mse_ratio", b.MSERatio)
		w.StringField("largest", b.Largest)
		w.StringField("smallest", b.Smallest)
		w.BoolField("flagged", b.Flagged)
		w.StringField("reading", b.Reading)
		w.EndObject()
	} else {
		w.Null()
	}

	w.Key("anova")
	w.BeginArray()
	for _, s := range r.ANOVA {
		writeSource(w, s, finite(s.MS))
	}
	w.EndArray()
	w.IntField("df_error", r.DFError)
	w.NumberField("ms_error", r.MSError)
	w.NullableNumberField("p_treatment", r.PTreatment)
	w.NullableNumberField("lsd", r.LSD)
	w.NullableNumberField("hsd", r.HSD)
	w.BoolField("letters_withheld", r.LettersWithheld)

	w.Key("means")
	w.BeginArray()
	for i, m := range r.Means {
		w.BeginCompactObject()
		w.StringField("treatment", m.Treatment)
		w.StringField("name", r.Entries[i].Name)
		w.BoolField("check", r.Entries[i].Check)
		w.NumberField("mean", m.Mean)
		w.NumberField("se", m.SE)
		w.IntField("n_sites", m.NSites)
		w.StringField("letters", m.Letters)
		w.StringField("letters_lsd", m.LettersLSD)
		w.StringField("letters_tukey", m.LettersTukey)
		w.NullableNumberField("percent_of_check", m.PercentOfCheck)
		w.EndObject()
	}
	w.EndArray()

	w.Key("site_means")
	w.BeginArray()
	for j, s := range r.SiteStats {
		w.BeginObject()
		w.StringField("site", s.Label)
		w.Key("means")
		w.BeginCompactArray()
		for i := range r.Entries {
			v, ok := r.Cell(j, i)
			if ok {
				w.Number(v)
			} else {
				w.Null()
			}
		}
		w.EndArray()
		w.Key("percent_of_check")
		w.BeginCompactArray()
		for i := range r.Entries {
			if j < len(r.PercentOfCheck) && i < len(r.PercentOfCheck[j]) {
				w.NullableNumber(r.PercentOfCheck[j][i])
			} else {
				w.Null()
			}
		}
		w.EndArray()
		w.EndObject()
	}
	w.EndArray()

	w.Key("stability")
	w.BeginArray()
	for _, s := range r.Stability {
		w.BeginCompactObject()
		w.StringField("treatment", s.Treatment)
		w.NullableNumberField("slope", s.Slope)
		w.NullableNumberField("slope_se", s.SlopeSE)
		w.NullableNumberField("deviation_ms", s.DeviationMS)
		w.NumberField("ecovalence", s.Ecovalence)
		w.Key("ranks")
		w.BeginCompactArray()
		for _, rk := range s.Ranks {
			if rk == 0 {
				w.Null()
			} else {
				w.Number(rk)
			}
		}
		w.EndArray()
		w.EndObject()
	}
	w.EndArray()

	w.Key("head_to_head")
	w.BeginArray()
	for _, h := range r.HeadToHead {
		w.BeginCompactObject()
		w.StringField("treatment", h.A)
		w.StringField("versus", h.B)
		w.IntField("sites", h.Sites)
		w.IntField("higher", h.Higher)
		w.IntField("lower", h.Lower)
		w.IntField("ties", h.Ties)
		w.NumberField("mean_diff", h.MeanDiff)
		w.NullableNumberField("se", h.SE)
		w.NullableNumberField("t", h.T)
		w.IntField("df", h.DF)
		w.NullableNumberField("p", h.P)
		w.NullableNumberField("percent_of_check", h.PercentOfB)
		w.EndObject()
	}
	w.EndArray()

	w.Key("missing")
	w.BeginArray()
	for _, m := range r.Missing {
		w.BeginCompactObject()
		w.StringField("treatment", m.Treatment)
		w.Key("sites")
		w.Strings(m.Sites)
		w.EndObject()
	}
	w.EndArray()
	w.Key("warnings")
	w.Strings(r.Warnings)
	w.Key("notes")
	w.Strings(r.Notes)
	w.EndObject()
}
