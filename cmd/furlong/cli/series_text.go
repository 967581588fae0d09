package cli

import (
	"bufio"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"furlong/export"
	"furlong/export/xlsx"
	"furlong/stats"
	"furlong/trial/series"
)

// writeSeriesText prints every trait's series analysis in words and tables.
func writeSeriesText(out io.Writer, name string, results []*series.Result) error {
	bw := bufio.NewWriter(out)
	fmt.Fprintf(bw, "Series: %s\n", name)
	for _, r := range results {
		fmt.Fprintln(bw)
		writeSeriesResultText(bw, r)
	}
	fmt.Fprintln(bw)
	fmt.Fprintln(bw, "Cautions:")
	for _, c := range export.SeriesCautions {
		fmt.Fprintf(bw, "  - %s\n", c)
	}
	return bw.Flush()
}

func seriesNum(v float64, d int) string { return strconv.FormatFloat(v, 'f', d, 64) }

func seriesOpt(v *float64, d int) string {
	if v == nil {
		return "–"
	}
	return seriesNum(*v, d)
}

func seriesOptP(v *float64) string {
	if v == nil {
		return "–"
	}
	return stats.FormatP(*v)
}

func writeSeriesResultText(bw io.Writer, r *series.Result) {
	d := r.Trait.Decimals
	if d > 3 {
		d = 3 // enough to read; JSON and the workbook keep full precision
	}
	unit := ""
	if r.Trait.Unit != "" {
		unit = " (" + r.Trait.Unit + ")"
	}
	title := r.Trait.Key
	if r.Trait.Name != "" && r.Trait.Name != r.Trait.Key {
		title = r.Trait.Name + " [" + r.Trait.Key + "]"
	}
	fmt.Fprintf(bw, "== %s%s: %d sites, %d entries ==\n", title, unit, len(r.SiteStats), len(r.Entries))
	method := "one ANOVA of the plots of every site"
	if r.Method == "two-stage" {
		method = "each site's means first, then an entry + site model on them"
	}
	fmt.Fprintf(bw, "Method: %s (%s): %s.\n", r.Method, method, strings.TrimSuffix(r.MethodReason, "."))
	if r.Sites.String() == "fixed" {
		fmt.Fprintln(bw, "Sites fixed: entries tested against the pooled error; the comparison holds for these sites only.")
	} else {
		fmt.Fprintln(bw, "Sites random: entries tested against the entry × site interaction, so the comparison speaks for sites like these.")
	}
	if r.Method == "two-stage" {
		if r.Weighted {
			fmt.Fprintln(bw, "Weighting: site means weighted by their stage-1 precision.")
		} else {
			fmt.Fprintln(bw, "Weighting: none (every site mean counts the same).")
		}
	}

	fmt.Fprintln(bw, "\nSites:")
	tw := tabwriter.NewWriter(bw, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "site\tentries\tn\tmean\tCV%\tMSE\terror df\tp\tLSD\t")
	for _, s := range r.SiteStats {
		lsd := seriesOpt(s.LSD, d+1)
		if s.LSDVaries && s.LSD != nil {
			lsd = "≤" + lsd
		}
		df := "–"
		if s.MSE != nil {
			df = strconv.Itoa(s.DFError)
		}
		fmt.Fprintf(tw, "%s\t%d\t%d\t%s\t%s\t%s\t%s\t%s\t%s\t\n", s.Label, s.Entries, s.N, seriesNum(s.GrandMean, d+1),
			seriesOpt(s.CVPercent, 1), seriesOpt(s.MSE, 4), df, seriesOptP(s.PTreatment), lsd)
	}
	tw.Flush()
	if b := r.Bartlett; b != nil {
		fmt.Fprintf(bw, "Site error variances: Bartlett K² %.3f (df %d), p %s; largest/smallest MSE %.2f (%s / %s). %s\n",
			b.K2, b.DF, stats.FormatP(b.P), b.MSERatio, b.Largest, b.Smallest, b.Reading)
	} else {
		fmt.Fprintln(bw, "Site error variances: no Bartlett test (it needs an error MSE at two sites or more; site means have none).")
	}

	if len(r.ANOVA) > 0 {
		fmt.Fprintln(bw, "\nANOVA across sites:")
		tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "source\tdf\tSS\tMS\tF\tp\t")
		for _, s := range r.ANOVA {
			ms, f, p := "", "", ""
			if s.Name != "total" {
				ms = seriesNum(s.MS, 4)
			}
			if s.HasTest {
				f, p = seriesNum(s.F, 2), stats.FormatP(s.P)
			}
			fmt.Fprintf(tw, "%s\t%d\t%s\t%s\t%s\t%s\t\n", s.Name, s.DF, seriesNum(s.SS, 4), ms, f, p)
		}
		tw.Flush()
	}

	fmt.Fprintf(bw, "\nMeans across sites (letters by %s at α = %g", strings.ToUpper(string(r.Separation)), r.Alpha)
	if r.LSD != nil {
		fmt.Fprintf(bw, "; LSD %s", seriesNum(*r.LSD, d+1))
	}
	if r.HSD != nil {
		fmt.Fprintf(bw, "; HSD %s", seriesNum(*r.HSD, d+1))
	}
	fmt.Fprintf(bw, "; error df %d):\n", r.DFError)
	if r.LettersWithheld {
		fmt.Fprintln(bw, "Letters withheld: the entry test across sites is not significant.")
	}
	tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "entry\tmean\tSE\tsites\tletters\t% of check\t")
	for i, m := range r.Means {
		code := m.Treatment
		if r.Entries[i].Check {
			code += " (check)"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%d\t%s\t%s\t\n", code, seriesNum(m.Mean, d+1), seriesNum(m.SE, d+2), m.NSites, m.Letters, seriesOpt(m.PercentOfCheck, 1))
	}
	tw.Flush()

	if len(r.Stability) > 0 {
		fmt.Fprintln(bw, "\nStability (Finlay–Wilkinson slope on the site mean; Wricke's ecovalence):")
		tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "entry\tslope\tSE\tdeviation MS\tecovalence\t")
		for _, s := range r.Stability {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t\n", s.Treatment, seriesOpt(s.Slope, 3), seriesOpt(s.SlopeSE, 3), seriesOpt(s.DeviationMS, 4), seriesNum(s.Ecovalence, 4))
		}
		tw.Flush()
	}

	if len(r.HeadToHead) > 0 {
		if r.Check >= 0 {
			fmt.Fprintf(bw, "\nHead to head with the check %s (paired t over sites):\n", r.Entries[r.Check].Code)
		} else {
			fmt.Fprintln(bw, "\nHead to head (paired t over sites):")
		}
		tw = tabwriter.NewWriter(bw, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "entry\tversus\tsites\thigher\tlower\tmean diff\tp\t")
		for _, h := range r.HeadToHead {
			fmt.Fprintf(tw, "%s\t%s\t%d\t%d\t%d\t%s\t%s\t\n", h.A, h.B, h.Sites, h.Higher, h.Lower, seriesNum(h.MeanDiff, d+1), seriesOptP(h.P))
		}
		tw.Flush()
	}
	if len(r.Missing) > 0 {
		fmt.Fprintln(bw, "\nEntries not tested everywhere:")
		for _, m := range r.Missing {
			fmt.Fprintf(bw, "  %s: not at %s\n", m.Treatment, strings.Join(m.Sites, ", "))
		}
	}
	for _, w := range r.Warnings {
		fmt.Fprintf(bw, "Warning: %s\n", w)
	}
	for _, n := range r.Notes {
		fmt.Fprintf(bw, "Note: %s\n", n)
	}
}

// writeSeriesCSV writes one row per entry per trait.
func writeSeriesCSV(out io.Writer, results []*series.Result) error {
	cw := csv.NewWriter(out)
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	gp := func(v *float64) string {
		if v == nil || math.IsNaN(*v) {
			return ""
		}
		return g(*v)
	}
	cw.Write([]string{"trait", "entry", "mean", "se", "sites", "letters", "percent_of_check", "slope", "ecovalence"})
	for _, r := range results {
		for i, m := range r.Means {
			slope, eco := "", ""
			if i < len(r.Stability) {
				slope, eco = gp(r.Stability[i].Slope), g(r.Stability[i].Ecovalence)
			}
			cw.Write([]string{r.Trait.Key, m.Treatment, g(m.Mean), g(m.SE), strconv.Itoa(m.NSites), m.Letters, gp(m.PercentOfCheck), slope, eco})
		}
	}
	cw.Flush()
	return cw.Error()
}

// writeSeriesXLSX writes the series workbook of o.out (through a temporary
// file renamed into place).
func writeSeriesXLSX(o seriesOptions, name string, results []*series.Result) error {
	dir := filepath.Dir(o.out)
	tmp, err := os.CreateTemp(dir, ".fl-series-*.tmp")
	if err != nil {
		return err
	}
	defer os.Remove(tmp.Name())
	bw := bufio.NewWriter(tmp)
	err = xlsx.WriteSeries(bw, results, xlsx.SeriesOptions{Name: name, Version: o.env.Version, Now: time.Now(), Charts: true})
	if err == nil {
		err = bw.Flush()
	}
	if cerr := tmp.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return err
	}
	return os.Rename(tmp.Name(), o.out)
}
