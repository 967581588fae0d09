package jsonout

import (
	"io"
	"math"

	"furlong/stats"
	"furlong/trial/analysis"
)

// WriteAnalysis writes the JSON document of `furlong analyze --format json`
// for the outcomes, as a stream: {"traits": [one object per outcome]}. The
// keys, their order and which of them are null or left out are listed in
// the README ("JSON output"); this file is the one place that maps an
// analysis.Result to them. To add a key, add its call in the function of
// its object, in the place the key should appear; keep every existing key
// and its meaning, and write a value that does not apply as null (or leave
// the key out), never NaN.
func WriteAnalysis(out io.Writer, outcomes []analysis.Outcome) error {
	w := New(out)
	w.BeginObject()
	w.Key("traits")
	w.BeginArray()
	for _, oc := range outcomes {
		writeTrait(w, oc)
		if w.Err() != nil {
			break
		}
	}
	w.EndArray()
	w.EndObject()
	return w.Flush()
}

// writeTrait writes one trait's object. An outcome that failed keeps the
// shape of a result with its values null or empty and says why in "error".
func writeTrait(w *Writer, oc analysis.Outcome) {
	w.BeginObject()
	defer w.EndObject()
	w.StringField("trait", oc.Key)
	if oc.Err != nil || oc.Result == nil {
		msg := "not analysed"
		if oc.Err != nil {
			msg = oc.Err.Error()
		}
		w.StringField("error", msg)
		w.IntField("n", 0)
		w.IntField("missing", 0)
		w.IntField("excluded", 0)
		w.Key("anova")
		w.BeginArray()
		w.EndArray()
		for _, k := range []string{"grand_mean", "mse", "df_error", "cv_percent", "r_squared", "relative_efficiency"} {
			w.Key(k)
			w.Null()
		}
		w.Key("means")
		w.BeginArray()
		w.EndArray()
		w.Key("lsd")
		w.Null()
		w.Key("hsd")
		w.Null()
		w.Key("pairs")
		w.BeginArray()
		w.EndArray()
		w.Key("diagnostics")
		w.Null()
		w.Key("warnings")
		w.Strings(nil)
		return
	}
	r := oc.Result
	a := r.ANOVA
	if r.Factorial != nil {
		w.StringField("design", r.Factorial.Design)
	} else if r.Design != "" {
		w.StringField("design", string(r.Design))
	}
	if r.Transform != stats.NoTransform {
		w.StringField("transform", string(r.Transform))
	}
	w.IntField("n", r.N)
	w.IntField("missing", r.Missing)
	w.IntField("excluded", len(r.Excluded))
	if r.Factorial != nil {
		writeFactorialANOVA(w, r.Factorial)
	} else {
		writeANOVA(w, a)
	}
	w.NumberField("grand_mean", a.GrandMean)
	w.NumberField("mse", a.MSE)
	w.IntField("df_error", a.DFError)
	w.NumberField("cv_percent", a.CVPercent)
	w.NumberField("r_squared", a.RSquared)
	w.NullableNumberField("relative_efficiency", a.RelativeEfficiency)
	writeMeans(w, r)
	w.NullableNumberField("lsd", r.LSD)
	w.NullableNumberField("hsd", r.HSD)
	if r.LSDRange != nil && r.HSDRange != nil {
		// Smallest and largest pairwise LSD and HSD.
		w.Key("lsd_range")
		w.BeginCompactArray()
		w.Number(r.LSDRange.Min)
		w.Number(r.LSDRange.Max)
		w.EndArray()
		w.Key("hsd_range")
		w.BeginCompactArray()
		w.Number(r.HSDRange.Min)
		w.Number(r.HSDRange.Max)
		w.EndArray()
	}
	writePairs(w, r.Pairs)
	writeDiagnostics(w, &r.Diagnostics)
	writeVsCheck(w, r.VsCheck)
	writeEfficacy(w, r.Efficacy)   // efficacy.go
	writeCovariate(w, r.Covariate) // covariate.go
	writeContrasts(w, r.Contrasts) // contrasts.go
	if r.Factorial != nil {
		writeFactorial(w, r) // factorial.go
	}
	w.Key("warnings")
	w.Strings(r.Warnings)
}

// writeANOVA writes "anova": one compact object per line of the table; ms
// is null for the total, f and p are null for a line without a test.
func writeANOVA(w *Writer, a *stats.ANOVA) {
	w.Key("anova")
	w.BeginArray()
	for _, s := range a.Sources {
		var ms *float64
		if s.Role != stats.RoleTotal {
			ms = &s.MS
		}
		writeSource(w, s, ms)
	}
	w.EndArray()
}

// writeSource writes one ANOVA line as a compact object: source, df, ss,
// ms (null when ms is nil), and f and p (null for a line without a test).
func writeSource(w *Writer, s stats.Source, ms *float64) {
	w.BeginCompactObject()
	w.StringField("source", s.Name)
	w.IntField("df", s.DF)
	w.NumberField("ss", s.SS)
	w.NullableNumberField("ms", ms)
	if s.HasTest {
		w.NumberField("f", s.F)
		w.NumberField("p", s.P)
	} else {
		w.Key("f")
		w.Null()
		w.Key("p")
		w.Null()
	}
	w.EndObject()
}

// writeMeans writes "means", one compact object per treatment in the
// result's order.
func writeMeans(w *Writer, r *analysis.Result) {
	w.Key("means")
	w.BeginArray()
	for i := range r.Means {
		m := &r.Means[i]
		w.BeginCompactObject()
		w.StringField("treatment", m.Treatment)
		w.IntField("n", m.N)
		w.NumberField("mean", m.Mean)
		w.NumberField("raw_mean", m.RawMean)
		w.NumberField("se", m.SE)
		if r.Covariate != nil && i < len(r.Covariate.Unadjusted) {
			w.NumberField("unadjusted_mean", r.Covariate.Unadjusted[i])
		}
		if r.Transform != stats.NoTransform {
			w.NumberField("back_transformed_mean", m.BackMean)
		}
		// Confidence limits of the mean on the original scale.
		w.OptionalNumberField("lower", m.Lower)
		w.OptionalNumberField("upper", m.Upper)
		w.OptionalNumberField("percent_of_check", m.PercentOfCheck)
		w.Key("letters_lsd")
		if r.LSDLettersGiven {
			w.String(m.LettersLSD)
		} else {
			w.Null()
		}
		w.StringField("letters_tukey", m.LettersTukey)
		w.EndObject()
		w.maybeFlush()
	}
	w.EndArray()
}

// writePairs writes "pairs", one compact object per pair of treatments.
// Long lists are formatted in chunks on every processor and written in
// order (see writeElements); the bytes are those of one loop.
func writePairs(w *Writer, pairs []analysis.Pair) {
	w.Key("pairs")
	w.BeginArray()
	writeElements(w, len(pairs), func(sw *Writer, lo, hi int) {
		// Balanced data repeat the SE, LSD and HSD in every pair.
		var se, lsd, hsd NumberMemo
		for i := lo; i < hi; i++ {
			p := &pairs[i]
			sw.BeginCompactObject()
			sw.StringField("a", p.A)
			sw.StringField("b", p.B)
			sw.NumberField("diff", p.Diff)
			sw.NumberFieldMemo("se", p.SE, &se)
			sw.NumberField("p_lsd", p.PLSD)
			sw.NumberField("p_tukey", p.PTukey)
			sw.NumberFieldMemo("lsd", p.LSD, &lsd)
			sw.NumberFieldMemo("hsd", p.HSD, &hsd)
			sw.EndObject()
			if sw.Err() != nil {
				return
			}
			sw.maybeFlush()
		}
	})
	w.EndArray()
}

// writeDiagnostics writes "diagnostics": each test's statistic and p-value
// (null when the test was not made) and the outliers.
func writeDiagnostics(w *Writer, d *analysis.Diagnostics) {
	w.Key("diagnostics")
	w.BeginObject()
	w.NullableNumberField("shapiro_w", d.ShapiroW)
	w.NullableNumberField("shapiro_p", d.ShapiroP)
	w.NullableNumberField("levene_f", d.LeveneF)
	w.NullableNumberField("levene_p", d.LeveneP)
	w.NullableNumberField("bartlett_k2", d.BartlettK2)
	w.NullableNumberField("bartlett_p", d.BartlettP)
	w.NullableNumberField("nonadditivity_f", d.NonAdditivityF)
	w.NullableNumberField("nonadditivity_p", d.NonAdditivityP)
	w.Key("outliers")
	w.BeginArray()
	for _, o := range d.Outliers {
		w.BeginCompactObject()
		w.IntField("plot", o.Plot)
		w.StringField("treatment", o.Treatment)
		w.NumberField("value", o.Value)
		w.NumberField("residual", o.Residual)
		w.NumberField("std_residual", o.StdResidual)
		w.EndObject()
	}
	w.EndArray()
	w.EndObject()
}

// writeVsCheck writes "vs_check" (left out when there are no rows) and
// "vs_check_method" (left out when no comparison with a check was made).
func writeVsCheck(w *Writer, vc *analysis.CheckComparison) {
	if vc == nil {
		return
	}
	if len(vc.Rows) > 0 {
		w.Key("vs_check")
		w.BeginArray()
		for _, r := range vc.Rows {
			w.BeginCompactObject()
			w.StringField("treatment", r.Treatment)
			w.NumberField("diff", r.Diff)
			w.NumberField("se", r.SE)
			w.NumberField("lower", r.Lower)
			w.NumberField("upper", r.Upper)
			w.NumberField("p_two_sided", r.PTwoSided)
			w.NumberField("p_better", r.PBetter)
			w.StringField("verdict", r.Verdict)
			w.EndObject()
		}
		w.EndArray()
	}
	w.Key("vs_check_method")
	w.BeginObject()
	w.StringField("check", vc.Check)
	w.StringField("method", string(vc.Method))
	w.Key("error")
	if math.IsNaN(vc.Error) {
		w.Null() // the approximation has no error bound
	} else {
		w.Number(vc.Error)
	}
	w.NumberField("critical_t", vc.Critical)
	w.BoolField("higher_is_better", vc.HigherBetter)
	w.EndObject()
}
