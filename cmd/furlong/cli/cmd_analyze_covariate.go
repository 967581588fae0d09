package cli

import (
	"fmt"
	"io"
	"strconv"

	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// covariateKeys checks --covariate against the trial and leaves the
// covariate trait out of the traits analysed (it adjusts them; it is not
// adjusted itself).
func covariateKeys(t *trial.Trial, keys []string, trait, cov string) ([]string, error) {
	if cov == "" || cov == analysis.NoCovariate {
		return keys, nil
	}
	if t.Trait(cov) == nil {
		return nil, usagef("analyze: the trial has no trait %q to use as the covariate (it has %s)", cov, traitKeys(t))
	}
	if trait == cov {
		return nil, usagef("analyze: a trait cannot be its own covariate; name another trait with --covariate")
	}
	if len(keys) > 0 {
		return keys, nil
	}
	for _, tr := range t.Traits {
		if tr.Key != cov {
			keys = append(keys, tr.Key)
		}
	}
	return keys, nil
}

// writeCovariateText prints the covariate's slope and its checks under the
// ANOVA of an analysis of covariance.
func writeCovariateText(w io.Writer, r *analysis.Result) {
	c := r.Covariate
	if c == nil {
		return
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 5, 64) }
	fmt.Fprintf(w, "Covariate %s: means adjusted to its mean %s; slope %s (SE %s, p %s)", c.Key, g(c.Mean), g(c.Slope), g(c.SE), stats.FormatP(c.P))
	if c.HomogeneityP != nil {
		fmt.Fprintf(w, "; equal slopes across treatments: F %.2f on %d and %d df, p %s", *c.HomogeneityF, c.HomogeneityDF1, c.HomogeneityDF2, stats.FormatP(*c.HomogeneityP))
	}
	fmt.Fprintln(w)
	if c.OnTreatmentP != nil {
		verdict := "does not differ significantly between treatments"
		if c.Responds {
			verdict = "DIFFERS between treatments: do not adjust for it"
		}
		fmt.Fprintf(w, "The covariate itself %s (F %.2f, p %s).\n", verdict, *c.OnTreatmentF, stats.FormatP(*c.OnTreatmentP))
	}
}
