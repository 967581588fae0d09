package cli

import (
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"

	"furlong/export"
	"furlong/trial/analysis"
)

// writeEfficacyText prints the percent efficacy of every treatment against
// the untreated check, with the crop-protection cautions.
func writeEfficacyText(w io.Writer, r *analysis.Result) {
	e := r.Efficacy
	if e == nil {
		return
	}
	pct := func(v *float64) string {
		if v == nil {
			return "–"
		}
		return strconv.FormatFloat(*v, 'f', 1, 64)
	}
	fmt.Fprintf(w, "\nPercent efficacy against the untreated check %s (mean %s):\n", e.Untreated, strconv.FormatFloat(e.UntreatedMean, 'f', analysis.MeanDecimals(r.Decimals), 64))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	if e.PreCount != "" {
		fmt.Fprintln(tw, "treatment\tAbbott %\tHenderson–Tilton %\t")
	} else {
		fmt.Fprintln(tw, "treatment\tAbbott %\t")
	}
	for _, row := range e.Rows {
		if e.PreCount != "" {
			fmt.Fprintf(tw, "%s\t%s\t%s\t\n", row.Treatment, pct(row.Abbott), pct(row.HendersonTilton))
		} else {
			fmt.Fprintf(tw, "%s\t%s\t\n", row.Treatment, pct(row.Abbott))
		}
	}
	tw.Flush()
	fmt.Fprintf(w, "Abbott: (untreated − treatment)/untreated × 100 on the means.")
	if e.PreCount != "" {
		fmt.Fprintf(w, " Henderson–Tilton: (1 − Ta·Cb/(Tb·Ca)) × 100 with the counts before (trait %s) and after.", e.PreCount)
	}
	fmt.Fprintf(w, "\nCaution: %s\n", export.ProtectionCautionText())
}
