package cli

import (
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"

	"furlong/export"
	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// contrastHelp is the part of 'furlong help analyze' on contrasts.
const contrastHelp = `Contrasts (planned comparisons): --contrast "NAME=A,B vs C" compares the mean of treatments A and B
with the mean of C (each side's treatments weighted equally); --contrast "NAME=A:1,B:1,C:-2" gives a
coefficient to each treatment named (the others 0; the coefficients must add up to 0). Repeat the
flag for several contrasts. A trial's saved contrasts ('furlong contrasts TRIAL --add ...', or the
window's Compare step) are estimated too; a
--contrast of the same name replaces a saved one. Each contrast has its estimate, standard error
(from the model, so missing plots count), t test on the error df and p; --adjust bonferroni or holm
adjusts the p-values for the number of contrasts, --adjust scheffe protects contrasts chosen after
looking at the data (against every possible contrast). Contrasts are on the analysis scale of a
transformed trait. Split and strip plots are not supported yet.
`

// parseContrastFlags reads the --contrast values of command cmd.
func parseContrastFlags(cmd string, vals []string) ([]trial.Contrast, error) {
	return parseContrastValues(cmd, "--contrast", vals)
}

// parseContrastValues reads contrasts given with flag name of command cmd.
func parseContrastValues(cmd, name string, vals []string) ([]trial.Contrast, error) {
	var out []trial.Contrast
	for _, v := range vals {
		c, err := trial.ParseContrast(v)
		if err != nil {
			return nil, usagef("%s: %s: %s", cmd, name, err)
		}
		out = append(out, c)
	}
	return out, nil
}

// writeContrastsText prints the contrasts table of a result.
func writeContrastsText(w io.Writer, r *analysis.Result, dec int) {
	set := r.Contrasts
	if set == nil || len(set.Rows) == 0 {
		return
	}
	adj := export.AdjustmentText(set.Adjust)
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
