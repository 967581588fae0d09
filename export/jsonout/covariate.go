package jsonout

import "furlong/trial/analysis"

// writeCovariate writes "covariate" for an analysis of covariance (left
// out without one): the key, the slope with its SE and p, the test of
// equal slopes (homogeneity_p null when it could not be fitted), the
// covariate's mean the means are adjusted to, and the F test of the
// covariate on the treatments with "responds" true when it is significant
// (the covariate must then not be used).
func writeCovariate(w *Writer, c *analysis.Covariate) {
	if c == nil {
		return
	}
	w.Key("covariate")
	w.BeginCompactObject()
	w.StringField("key", c.Key)
	w.NumberField("slope", c.Slope)
	w.NumberField("se", c.SE)
	w.NumberField("p", c.P)
	w.NullableNumberField("homogeneity_p", c.HomogeneityP)
	w.NullableNumberField("homogeneity_f", c.HomogeneityF)
	w.IntField("homogeneity_df1", c.HomogeneityDF1)
	w.IntField("homogeneity_df2", c.HomogeneityDF2)
	w.NumberField("mean", c.Mean)
	w.NullableNumberField("on_treatment_f", c.OnTreatmentF)
	w.NullableNumberField("on_treatment_p", c.OnTreatmentP)
	w.BoolField("responds", c.Responds)
	w.IntField("left_out", c.Left)
	w.EndObject()
}
