package analysis

import (
	"fmt"
	"math"

	"furlong/stats"
	"furlong/stats/glm"
	"furlong/trial"
)

// Covariate is what an analysis of covariance adds to a Result. The
// Result's ANOVA, Means, Pairs and letters are then the adjusted analysis:
// the treatment line adjusted for the covariate, a covariate line, and
// treatment means adjusted to the covariate's mean.
type Covariate struct {
	Key  string // the covariate's trait key or column
	Name string
	Mean float64 // the covariate's mean over the plots analysed
	// Slope of the trait on the covariate within treatments (and blocks),
	// its standard error and two-sided P.
	Slope, SE, P float64
	// HomogeneityF and HomogeneityP test whether the slope differs between
	// treatments (separate slopes against the common one, on
	// HomogeneityDF1 and HomogeneityDF2 df); nil when it cannot be fitted.
	HomogeneityF, HomogeneityP     *float64
	HomogeneityDF1, HomogeneityDF2 int
	// OnTreatmentF and OnTreatmentP are the F test of the covariate itself
	// on the treatments (the same design's ANOVA; for crossed factors the
	// test of all treatment terms together, the combinations after the
	// blocks); nil when it could not be computed. Responds is true when that test is significant at Alpha:
	// the covariate must then not be used (see Warnings).
	OnTreatmentF, OnTreatmentP *float64
	Responds                   bool
	// Unadjusted are the treatment means before adjustment, in
	// treatment order (least-squares means of the same plots).
	Unadjusted []float64
	// Left is the number of plots left out because the covariate was
	// missing there (while the trait had a value).
	Left int
}

// attachCovariate puts the values of the trait cov of the trial on d's
// observations.
func attachCovariate(t *trial.Trial, d *Data, cov string) error {
	tr := t.Trait(cov)
	if tr == nil {
		return &Error{Trait: d.TraitKey, Msg: fmt.Sprintf("the trial has no trait %q to use as the covariate", cov), Err: ErrNoTrait}
	}
	if tr.Key == d.TraitKey {
		return &Error{Trait: d.TraitKey, Msg: "a trait cannot be its own covariate; choose another trait measured on the same plots"}
	}
	vals, err := t.TraitValues(tr.Key)
	if err != nil {
		return &Error{Trait: d.TraitKey, Msg: err.Error(), Err: err}
	}
	d.CovariateKey, d.CovariateName = tr.Key, tr.Name
	d.Covariate = make([]float64, len(d.Values))
	for i, pi := range d.PlotIndex {
		d.Covariate[i] = vals[pi]
	}
	return nil
}

// covariateNotes are the plain-language readings of a covariance
// analysis: always the adjustment itself, then the warnings.
func covariateNotes(r *Result) []string {
	c := r.Covariate
	name := c.Name
	if name == "" {
		name = c.Key
	}
	var w []string
	if r.IsFactorial() {
		w = append(w, fmt.Sprintf("Adjusted for the covariate %s (analysis of covariance): the means of every effect are the values expected at the covariate's mean, %s; each line's sum of squares is adjusted for the covariate and for the terms that do not contain it (so the lines do not add up to the total), and the covariate takes one degree of freedom from the error.", name, fmtG(c.Mean)))
	} else {
		w = append(w, fmt.Sprintf("Adjusted for the covariate %s (analysis of covariance): means are the values expected at the covariate's mean, %s; the treatment F test is adjusted for the covariate, which takes one degree of freedom from the error.", name, fmtG(c.Mean)))
	}
	if c.Left > 0 {
		w = append(w, fmt.Sprintf("%s without a value of %s left out of the analysis.", plural(c.Left, "plot", "plots"), name))
	}
	if c.Responds {
		w = append(w, fmt.Sprintf("The covariate %s itself differs between treatments (F test p = %s): the treatments seem to have changed it, so adjusting for it would take away part of the treatment effect. Do not use this covariate; use one measured before the treatments could act, or report the unadjusted analysis.", name, stats.FormatP(*c.OnTreatmentP)))
	}
	if c.HomogeneityP != nil && *c.HomogeneityP < r.Alpha {
		w = append(w, fmt.Sprintf("The slope on %s differs between treatments (test of equal slopes p = %s): one common adjustment does not fit every treatment, so the adjusted means compare the treatments only at the covariate's mean.", name, stats.FormatP(*c.HomogeneityP)))
	}
	if c.P >= r.Alpha {
		w = append(w, fmt.Sprintf("The slope on %s is not significant (p = %s): the adjustment changes little and costs a degree of freedom.", name, stats.FormatP(c.P)))
	}
	return w
}

func fmtG(v float64) string { return fmt.Sprintf("%.4g", v) }

// fitCovariate fits the analysis of covariance for AnalyzeData and fills
// r.Covariate.
func fitCovariate(r *Result, d *Data, m stats.Model, x []float64, o Options) (*stats.ANOVA, error) {
	a, c, err := stats.FitCovariate(m, x)
	if err != nil {
		return nil, err
	}
	rc := &Covariate{Key: d.CovariateKey, Name: d.CovariateName, Mean: c.Mean, Slope: c.Slope, SE: c.SE, P: c.P}
	if c.HasHomogeneity {
		rc.HomogeneityF, rc.HomogeneityP = ptr(c.HomogeneityF), ptr(c.HomogeneityP)
		rc.HomogeneityDF1, rc.HomogeneityDF2 = c.HomogeneityDF1, c.HomogeneityDF2
	}
	if c.OnTreatment != nil {
		if tl, ok := c.OnTreatment.Treatment(); ok && tl.HasTest && finite(tl.P) {
			rc.OnTreatmentF, rc.OnTreatmentP = ptr(tl.F), ptr(tl.P)
			rc.Responds = tl.P < o.Alpha
		}
	}
	for _, lm := range c.Unadjusted.Means {
		rc.Unadjusted = append(rc.Unadjusted, lm.Mean)
	}
	r.Covariate = rc
	return a, nil
}

// dropMissingCovariate is true for an observation whose covariate is
// missing.
func dropMissingCovariate(d *Data, i int) bool {
	return d.Covariate != nil && math.IsNaN(d.Covariate[i])
}

// factorialCovariate fills r.Covariate from the covariance analysis of
// crossed factors: the slope and its tests, the F test of all treatment
// terms on the covariate itself, and the unadjusted means of the
// treatment combinations (combo gives each treatment's combination).
func factorialCovariate(r *Result, d *Data, g *glm.Result, combo func(int) int, left int, o Options) error {
	c := g.Covariate
	rc := &Covariate{Key: d.CovariateKey, Name: d.CovariateName, Mean: c.Mean, Slope: c.Slope, SE: c.SE, P: c.P, Left: left}
	if c.HasHomogeneity {
		rc.HomogeneityF, rc.HomogeneityP = ptr(c.HomogeneityF), ptr(c.HomogeneityP)
		rc.HomogeneityDF1, rc.HomogeneityDF2 = c.HomogeneityDF1, c.HomogeneityDF2
	}
	if ot := c.OnTreatmentTest; c.HasOnTreatment && finite(ot.F) && finite(ot.P) {
		rc.OnTreatmentF, rc.OnTreatmentP = ptr(ot.F), ptr(ot.P)
		rc.Responds = ot.P < o.Alpha
	}
	if u := c.Unadjusted; u != nil && len(u.Effects) > 0 {
		top := u.Effects[len(u.Effects)-1]
		for ti := range d.Treatments {
			ci := combo(ti)
			if ci < 0 || ci >= len(top.Means) || !top.Means[ci].Estimable {
				return fmt.Errorf("the unadjusted mean of treatment %s cannot be estimated from the plots present", d.Treatments[ti])
			}
			rc.Unadjusted = append(rc.Unadjusted, top.Means[ci].Mean)
		}
	}
	r.Covariate = rc
	return nil
}

// NoCovariate, as Options.Covariate, analyses a trait without the
// covariate saved with it (the command line's --covariate none).
const NoCovariate = "none"
