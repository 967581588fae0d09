package analysis

import (
	"strings"

	"furlong/stats"
	"furlong/trial"
)

// ContrastSet is the user's contrasts of one trait's treatment means
// (trial.Contrast), each with its t test on the error of the model, and
// their p-values adjusted together.
type ContrastSet struct {
	Adjust stats.Adjustment
	Rows   []ContrastRow
}

// ContrastRow is one contrast estimated.
type ContrastRow struct {
	Name       string
	Definition string // as trial.ParseContrast reads it
	stats.ContrastRow
}

// EstimateContrasts estimates the contrasts cs on the treatment means of r
// (least-squares means, so missing plots are accounted for) with the
// standard errors of the model (Result.SEDMatrix) and the error degrees of
// freedom, adjusting the p-values by adj. For a transformed trait the
// contrast is on the analysis scale. One treatment list of any design and
// crossed factors in a factorial CRD or RCBD (contrasts among the
// treatment combinations, on the residual error) are supported; split and
// strip plots are not, because a contrast that mixes main-plot and subplot
// treatments has no single error stratum.
func EstimateContrasts(r *Result, cs []trial.Contrast, adj stats.Adjustment) (*ContrastSet, error) {
	if len(cs) == 0 {
		return nil, nil
	}
	if f := r.Factorial; f != nil && (f.Design == "split-plot" || f.Design == "strip-plot") {
		return nil, &Error{Trait: r.TraitKey, Msg: "contrasts of a " + strings.ReplaceAll(f.Design, "-", " ") + " are not supported yet (a contrast that mixes main-plot and subplot treatments has no single error); use the Effects and slices instead"}
	}
	a := r.ANOVA
	if a == nil || a.DFError < 1 || !(a.MSE > 0) {
		return nil, &Error{Trait: r.TraitKey, Msg: "contrasts need an error mean square with at least one degree of freedom"}
	}
	codes := make([]string, len(r.Means))
	means := make([]float64, len(r.Means))
	for i, m := range r.Means {
		codes[i], means[i] = m.Treatment, m.Mean
	}
	specs := make([]stats.ContrastSpec, len(cs))
	for i, c := range cs {
		w, err := c.Weights(codes)
		if err != nil {
			return nil, &Error{Trait: r.TraitKey, Msg: err.Error()}
		}
		specs[i] = stats.ContrastSpec{Name: c.Name, Coef: w}
	}
	rows, err := stats.Contrasts(means, r.SEDMatrix(), a.DFError, specs, adj)
	if err != nil {
		return nil, &Error{Trait: r.TraitKey, Msg: err.Error()}
	}
	out := &ContrastSet{Adjust: adj, Rows: make([]ContrastRow, len(rows))}
	if out.Adjust == "" {
		out.Adjust = stats.AdjustNone
	}
	for i, row := range rows {
		out.Rows[i] = ContrastRow{Name: cs[i].Name, Definition: cs[i].Definition(), ContrastRow: row}
	}
	return out, nil
}
