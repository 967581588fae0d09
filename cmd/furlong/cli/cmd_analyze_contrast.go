package cli

import (
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"

	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// contrastHelp is the part of 'furlong help analyze' on contrasts.
const contrastHelp = `Contrasts (planned comparisons): --contrast "NAME=A,B vs C" compares the mean of treatments A and B
with the mean of C (each side's treatments weighted equally); --contrast "NAME=A:1,B:1,C:-2" gives a
coefficient to each treatment named (the others 0; the coefficients must add up to 0). Repeat the
flag for several contrasts. A trial's saved contrasts (in its file) are estimated too; a
--contrast of the same name replaces a saved one. Each contrast has its estimate, standard error
(from the model, so missing plots count), t test on the error df and p; --adjust bonferroni or holm
adjusts the p-values for the number of contrasts, --adjust scheffe protects contrasts chosen after
looking at the data (against every possible contrast). Contrasts are on the analysis scale of a
transformed trait. Split and strip plots are not supported yet.
`

// parseContrastFlags reads the --contrast values.
func parseContrastFlags(vals []string) ([]trial.Contrast, error) {
	var out []trial.Contrast
	for _, v := range vals {
		c, err := trial.ParseContrast(v)
		if err != nil {
			return nil, usagef("analyze: --contrast %s", err)
		}
		out = append(out, c)
	}
	return out, nil
}

// estimateContrasts adds the contrasts to every result: the trial's saved
// contrasts (saved, nil for a CSV table) with those given on the command
// line (given) replacing saved ones of the same name. A contrast given that
// cannot be estimated is an error; a saved one becomes a warning.
func estimateContrasts(outcomes []analysis.Outcome, saved, given []trial.Contrast, adj stats.Adjustment) error {
	var cs []trial.Contrast
	isGiven := map[string]bool{}
	for _, c := range given {
		isGiven[c.Name] = true
	}
	for _, c := range saved {
		if !isGiven[c.Name] {
			cs = append(cs, c)
		}
	}
	cs = append(cs, given...)
	if len(cs) == 0 {
		return nil
	}
	for _, oc := range outcomes {
		r := oc.Result
		if r == nil {
			continue
		}
		set, err := analysis.EstimateContrasts(r, cs, adj)
		if err != nil {
			if len(given) > 0 {
				return err
			}
			r.Warnings = append(r.Warnings, "No contrasts: "+Message(err))
			continue
		}
		r.Contrasts = set
	}
	return nil
}

// writeContrastsText prints the contrasts table of a result.
func writeContrastsText(w io.Writer, r *analysis.Result, dec int) {
	set := r.Contrasts
	if set == nil || len(set.Rows) == 0 {
		return
	}
	adj := "p not adjusted"
	switch set.Adjust {
	case stats.Bonferroni:
		adj = "p adjusted by Bonferroni"
	case stats.Holm:
		adj = "p adjusted by Holm"
	case stats.Scheffe:
		adj = "p adjusted by Scheffé"
	}
	fmt.Fprintf(w, "\nContrasts (t tests on %d error df; %s):\n", set.Rows[0].DF, adj)
	num := func(v float64) string { return strconv.FormatFloat(v, 'f', dec, 64) }
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	head := "contrast\tdefinition\testimate\tSE\tt\tp"
	if set.Adjust != stats.AdjustNone {
		head += "\tp adjusted"
	}
	fmt.Fprintln(tw, head+"\t")
	for _, row := range set.Rows {
		line := fmt.Sprintf("%s\t%s\t%s\t%s\t%.3f\t%s", row.Name, row.Definition, num(row.Estimate), num(row.SE), row.T, stats.FormatP(row.P))
		if set.Adjust != stats.AdjustNone {
			line += "\t" + stats.FormatP(row.PAdjusted)
		}
		fmt.Fprintln(tw, line+"\t")
	}
	tw.Flush()
}
