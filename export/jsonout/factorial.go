package jsonout

import (
	"furlong/stats"
	"furlong/trial/analysis"
)

// writeFactorialANOVA writes "anova" of crossed treatment factors: source,
// df, ss, ms, f, p, df_den and error (the line a test is against). REML
// lines have df (numerator), df_den, f and p and no sums of squares; ms
// is null for the total, f, p and df_den null for a line without a test.
func writeFactorialANOVA(w *Writer, fr *analysis.Factorial) {
	w.Key("anova")
	w.BeginArray()
	for _, l := range fr.Lines {
		w.BeginCompactObject()
		w.StringField("source", l.Source)
		w.IntField("df", l.DF)
		if l.SS != nil {
			w.NumberField("ss", *l.SS)
			w.Key("ms")
			if l.Role != stats.RoleTotal && l.MS != nil {
				w.Number(*l.MS)
			} else {
				w.Null()
			}
		}
		w.NullableNumberField("f", l.F)
		w.NullableNumberField("p", l.P)
		w.NullableNumberField("df_den", l.DFDen)
		if l.ErrorTerm != "" {
			w.StringField("error", l.ErrorTerm)
		}
		w.EndObject()
	}
	w.EndArray()
}

// writeFactorial writes the members that belong to crossed treatment
// factors: fit_method, factors, variance_components (when any), effects,
// sed, sed_kinds and slices (when any). See the README ("JSON output").
func writeFactorial(w *Writer, r *analysis.Result) {
	fr := r.Factorial
	w.StringField("fit_method", fr.Method)
	w.Key("factors")
	w.BeginArray()
	for _, f := range fr.Factors {
		w.BeginCompactObject()
		w.StringField("key", f.Key)
		w.StringField("name", f.Label())
		w.Key("levels")
		w.Strings(f.Levels)
		w.EndObject()
	}
	w.EndArray()
	if len(fr.Components) > 0 {
		w.Key("variance_components")
		w.BeginCompactObject()
		for _, c := range fr.Components {
			w.NumberField(c.Name, c.Variance)
		}
		w.EndObject()
	}
	w.Key("effects")
	w.BeginArray()
	for i := range fr.Effects {
		e := &fr.Effects[i]
		w.BeginObject()
		w.StringField("effect", e.Name)
		w.NullableNumberField("p", e.P)
		writeEffectMeans(w, e.Factors, e.Means, e.LettersGiven, r.Transform != stats.NoTransform)
		w.NullableNumberField("sed", e.SED)
		w.NullableNumberField("df", e.DF)
		if e.SEDRange != nil {
			w.Key("sed_range")
			w.BeginCompactArray()
			w.Number(e.SEDRange.Min)
			w.Number(e.SEDRange.Max)
			w.EndArray()
		}
		w.NullableNumberField("lsd", e.LSD)
		w.NullableNumberField("hsd", e.HSD)
		if len(e.Factors) > 1 {
			w.BoolField("significant", e.Significant)
		}
		if e.Note != "" {
			w.StringField("note", e.Note)
		}
		w.EndObject()
	}
	w.EndArray()
	w.Key("sed")
	w.BeginCompactObject()
	for _, s := range fr.SEDs {
		w.NumberField(s.Key, s.SED)
	}
	w.EndObject()
	w.Key("sed_kinds")
	w.BeginArray()
	for _, s := range fr.SEDs {
		w.BeginCompactObject()
		w.StringField("key", s.Key)
		w.StringField("effect", s.Effect)
		w.Key("differ")
		w.Strings(s.Differ)
		w.StringField("label", s.Label)
		w.NumberField("sed", s.SED)
		w.NumberField("min", s.Min)
		w.NumberField("max", s.Max)
		w.NumberField("df", s.DF)
		w.IntField("pairs", s.Pairs)
		w.EndObject()
	}
	w.EndArray()
	if len(fr.Slices) > 0 {
		w.Key("slices")
		w.BeginArray()
		for i := range fr.Slices {
			s := &fr.Slices[i]
			w.BeginObject()
			w.StringField("effect", s.Effect)
			w.StringField("factor", s.Factor)
			w.Key("at")
			w.BeginCompactObject()
			for _, f := range fr.Factors {
				if v, ok := s.At[f.Key]; ok {
					w.StringField(f.Key, v)
				}
			}
			w.EndObject()
			w.StringField("name", s.Name)
			w.NullableNumberField("f", s.F)
			w.IntField("df", s.DF)
			w.NullableNumberField("df_den", s.DFDen)
			w.NullableNumberField("p", s.P)
			given := false
			for _, m := range s.Means {
				given = given || m.LettersLSD != ""
			}
			writeEffectMeans(w, []string{s.Factor}, s.Means, given, r.Transform != stats.NoTransform)
			w.NullableNumberField("sed", s.SED)
			w.NullableNumberField("sed_df", s.SEDDF)
			if s.SEDRange != nil {
				w.Key("sed_range")
				w.BeginCompactArray()
				w.Number(s.SEDRange.Min)
				w.Number(s.SEDRange.Max)
				w.EndArray()
			}
			w.EndObject()
		}
		w.EndArray()
	}
}

// writeEffectMeans writes "means" of an effect or slice: levels (factor
// key to level code), n, mean, se, df (null when the mean is not
// estimable), raw_mean, back_transformed_mean, letters_lsd (null when
// withheld) and letters_tukey.
func writeEffectMeans(w *Writer, factors []string, means []analysis.EffectMean, lettersGiven, transformed bool) {
	w.Key("means")
	w.BeginArray()
	for _, m := range means {
		w.BeginCompactObject()
		w.Key("levels")
		w.BeginCompactObject()
		for k, f := range factors {
			if k < len(m.Levels) {
				w.StringField(f, m.Levels[k])
			}
		}
		w.EndObject()
		w.IntField("n", m.N)
		w.NullableNumberField("mean", m.Mean)
		w.NullableNumberField("se", m.SE)
		w.NullableNumberField("df", m.DF)
		w.NullableNumberField("raw_mean", m.RawMean)
		if transformed {
			w.NullableNumberField("back_transformed_mean", m.BackMean)
		}
		w.Key("letters_lsd")
		if lettersGiven {
			w.String(m.LettersLSD)
		} else {
			w.Null()
		}
		w.StringField("letters_tukey", m.LettersTukey)
		w.EndObject()
	}
	w.EndArray()
}
