package cli

import (
	"fmt"

	"furlong/trial"
)

// seriesNote says how an AUDPC trait is computed, or what a pre-count
// trait precedes; "" for other traits (their state is their entry count).
func seriesNote(t *trial.Trial, tr *trial.Trait) string {
	if d := tr.Derived; d != nil && (d.Kind == trial.AUDPC || d.Kind == trial.AUDPCStandard) {
		pts, err := t.Series(d.Series)
		if err != nil {
			return "cannot be computed: " + err.Error()
		}
		what := "area under the curve of"
		if d.Kind == trial.AUDPCStandard {
			what = "area ÷ duration of"
		}
		return fmt.Sprintf("%s series %s (%d assessments over %g days)", what, d.Series, len(pts), pts[len(pts)-1].Time-pts[0].Time)
	}
	if tr.PreCountOf != "" {
		s := t.Summary()
		for i := range t.Traits {
			if t.Traits[i].Key == tr.Key && i < len(s.Traits) {
				return fmt.Sprintf("count before treatment of %s; %d of %d plots entered", tr.PreCountOf, s.Traits[i].Entered, s.Plots)
			}
		}
	}
	return ""
}
