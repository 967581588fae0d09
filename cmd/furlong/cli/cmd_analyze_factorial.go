package cli

import (
	"flag"
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"

	"furlong/stats"
	"furlong/trial/analysis"
)

// factorialFlags are the flags of 'furlong analyze' for a table of crossed
// treatment factors.
type factorialFlags struct {
	factors  stringList
	mainPlot string
	strip    bool
}

const factorialHelp = `A table of crossed treatment factors (a factorial) names each factor's column with --factor
(two or three times; the combinations of their levels are the treatments). With --block it is a
factorial in randomised complete blocks; with --main-plot COL (one of the factors, needs --block)
a split plot with that factor on main plots (a third factor is on sub-subplots); with --strip-plot
(two factors, needs --block) a strip plot with the first factor in strips one way and the second
the other way. The analysis gives the ANOVA of each stratum (errors a, b, c), the means of every
main effect and interaction with letters, the standard errors of differences of every kind and,
when an interaction is significant, the levels of each factor compared within each level of the
other (slices). Missing plots: type II sums of squares for a factorial; REML with Satterthwaite
degrees of freedom for a split or strip plot. A trial file is analysed with the design it has.
`

func (f *factorialFlags) define(fs *flag.FlagSet) {
	fs.Var(&f.factors, "factor", "CSV: a treatment factor `column` (repeat for each factor, 2 or 3)")
	fs.StringVar(&f.mainPlot, "main-plot", "", "CSV: the factor `column` on main plots (a split plot; with --block)")
	fs.BoolVar(&f.strip, "strip-plot", false, "CSV: the two factors are in strips across each block (a strip plot; with --block)")
}

// given reports whether any factorial flag was used.
func (f *factorialFlags) given() bool { return len(f.factors) > 0 || f.mainPlot != "" || f.strip }

// check refuses combinations of flags that do not make one design.
func (f *factorialFlags) check(o analyzeOptions) error {
	if !f.given() {
		return nil
	}
	switch {
	case len(f.factors) == 0:
		return usagef("analyze: --main-plot and --strip-plot need the factor columns: give --factor COL for each factor")
	case o.treatment != "":
		return usagef("analyze: give --treatment (one list of treatments) or --factor (crossed factors), not both")
	case len(f.factors) > 3:
		return usagef("analyze: give two or three --factor columns (there are %d)", len(f.factors))
	case o.row != "" || o.column != "":
		return usagef("analyze: crossed factors are analysed without blocks or in blocks (--block), not in a Latin square")
	case f.mainPlot != "" && f.strip:
		return usagef("analyze: give --main-plot (a split plot) or --strip-plot, not both")
	case (f.mainPlot != "" || f.strip) && o.block == "":
		return usagef("analyze: a split or strip plot needs its blocks: name the block column with --block")
	case f.strip && len(f.factors) != 2:
		return usagef("analyze: a strip plot needs exactly two --factor columns, one for each direction")
	case f.mainPlot != "" && len(f.factors) < 2:
		return usagef("analyze: a split plot needs a main-plot factor and a subplot factor: give two or three --factor columns")
	}
	return nil
}

// writeFactorialTables prints the analysis of crossed treatment factors:
// the strata ANOVA, variance components, the means of every effect with
// letters (a two-way table with margins for two-factor interactions), the
// SEDs of every kind, slices and the notes.
func writeFactorialTables(w io.Writer, r *analysis.Result) {
	fr := r.Factorial
	a := r.ANOVA
	title := r.TraitKey
	if r.TraitName != "" && r.TraitName != r.TraitKey {
		title += " — " + r.TraitName
	}
	if r.Unit != "" {
		title += " (" + r.Unit + ")"
	}
	fmt.Fprintln(w, title)
	fmt.Fprintln(w, strings.Repeat("-", len([]rune(title))))
	dec := analysis.MeanDecimals(r.Decimals)
	if r.Transform != stats.NoTransform {
		dec = analysis.TransformedDecimals
	}
	num := func(v float64, d int) string { return strconv.FormatFloat(v, 'f', d, 64) }
	numP := func(v *float64, d int) string {
		if v == nil {
			return "-"
		}
		return num(*v, d)
	}
	fmt.Fprintf(w, "%s, %d observations", designWords(r), r.N)
	if r.Missing > 0 {
		fmt.Fprintf(w, ", %d missing", r.Missing)
	}
	if len(r.Excluded) > 0 {
		fmt.Fprintf(w, ", %d excluded", len(r.Excluded))
	}
	if r.Transform != stats.NoTransform {
		fmt.Fprintf(w, ", analysed as %s", r.Transform)
	}
	fmt.Fprintf(w, "; fitted by %s\n\n", fr.Method)

	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	reml := fr.Method == "REML"
	if reml {
		fmt.Fprintln(tw, "Source\tdf\tdf den\tF\tp\t")
	} else {
		fmt.Fprintln(tw, "Source\tdf\tSS\tMS\tF\tp\ttested against\t")
	}
	for _, l := range fr.Lines {
		f, p := "", ""
		if l.F != nil {
			f, p = num(*l.F, 2), stats.FormatP(*l.P)
		}
		if reml {
			fmt.Fprintf(tw, "%s\t%d\t%s\t%s\t%s\t\n", l.Source, l.DF, numP(l.DFDen, 1), f, p)
			continue
		}
		ss, ms := "", ""
		if l.SS != nil {
			ss = num(*l.SS, 4)
		}
		if l.MS != nil {
			ms = num(*l.MS, 4)
		}
		fmt.Fprintf(tw, "%s\t%d\t%s\t%s\t%s\t%s\t%s\t\n", l.Source, l.DF, ss, ms, f, p, l.ErrorTerm)
	}
	tw.Flush()
	fmt.Fprintln(w)
	line := []string{"Grand mean " + num(a.GrandMean, dec)}
	for _, l := range fr.Lines {
		if l.Role.IsError() && l.CVPercent != nil {
			line = append(line, fmt.Sprintf("CV(%s) %.1f%%", strings.TrimPrefix(strings.TrimPrefix(l.Source, "error_"), "error"), *l.CVPercent))
		}
	}
	if len(line) == 1 && a.CVPercent > 0 {
		line = append(line, fmt.Sprintf("CV %.1f%%", a.CVPercent))
	}
	fmt.Fprintln(w, strings.ReplaceAll(strings.Join(line, "   "), "CV() ", "CV "))
	if len(fr.Components) > 0 {
		var parts []string
		for _, c := range fr.Components {
			s := fmt.Sprintf("%s %s", strings.ReplaceAll(c.Name, "_", " "), num(c.Variance, 4))
			if c.Truncated {
				s += " (negative estimate shown as 0)"
			}
			parts = append(parts, s)
		}
		fmt.Fprintf(w, "Variance components: %s\n", strings.Join(parts, ", "))
	}
	writeCovariateText(w, r) // cmd_analyze_covariate.go

	for i := range fr.Effects {
		e := &fr.Effects[i]
		fmt.Fprintln(w)
		writeEffectText(w, r, e, dec)
	}
	if len(fr.SEDs) > 0 {
		fmt.Fprintln(w)
		fmt.Fprintln(w, "Standard errors of differences")
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "comparison\tSED\tdf\t")
		for _, s := range fr.SEDs {
			sed := num(s.SED, dec)
			if s.Max-s.Min > 1e-9*s.Max {
				sed = fmt.Sprintf("%s (%s–%s)", sed, num(s.Min, dec), num(s.Max, dec))
			}
			fmt.Fprintf(tw, "%s\t%s\t%.1f\t\n", s.Label, sed, s.DF)
		}
		tw.Flush()
	}
	if len(fr.Slices) > 0 {
		fmt.Fprintln(w)
		fmt.Fprintln(w, "Slices: one factor's levels compared within each level of the other")
		for _, s := range fr.Slices {
			test := ""
			if s.F != nil {
				test = fmt.Sprintf(": F %.2f on %d and %.1f df, p %s", *s.F, s.DF, *s.DFDen, stats.FormatP(*s.P))
			}
			sed := ""
			if s.SED != nil {
				sed = fmt.Sprintf("; SED %s (df %.1f)", num(*s.SED, dec), *s.SEDDF)
			} else if s.SEDRange != nil {
				sed = fmt.Sprintf("; SED %s–%s", num(s.SEDRange.Min, dec), num(s.SEDRange.Max, dec))
			}
			var means []string
			for _, m := range s.Means {
				means = append(means, fmt.Sprintf("%s %s %s", strings.Join(m.Levels, ""), numP(m.Mean, dec), letterText(m)))
			}
			fmt.Fprintf(w, "  %s%s%s\n    %s\n", s.Name, test, sed, strings.Join(means, "   "))
		}
	}
	fmt.Fprintf(w, "\nMeans sharing a letter (LSD / Tukey) do not differ at the %g level.\n", r.Alpha)
	if d := r.Diagnostics; d.ShapiroW != nil || d.LeveneF != nil {
		var parts []string
		if d.ShapiroW != nil {
			parts = append(parts, fmt.Sprintf("Shapiro–Wilk W %.4f, p %s", *d.ShapiroW, stats.FormatP(*d.ShapiroP)))
		}
		if d.LeveneF != nil {
			parts = append(parts, fmt.Sprintf("Levene (median) F %.3f, p %s", *d.LeveneF, stats.FormatP(*d.LeveneP)))
		}
		if d.BartlettK2 != nil {
			parts = append(parts, fmt.Sprintf("Bartlett K² %.3f, p %s", *d.BartlettK2, stats.FormatP(*d.BartlettP)))
		}
		fmt.Fprintf(w, "Diagnostics (residuals within the lowest stratum): %s\n", strings.Join(parts, "; "))
	}
	cdec := analysis.MeanDecimals(r.Decimals)
	if r.Transform != stats.NoTransform {
		cdec = analysis.TransformedDecimals
	}
	writeContrastsText(w, r, cdec)
	for _, s := range r.Warnings {
		fmt.Fprintf(w, "Note: %s\n", s)
	}
}

// designWords names the design of a factorial result in words.
func designWords(r *analysis.Result) string {
	fr := r.Factorial
	keys := make([]string, len(fr.Factors))
	for i, f := range fr.Factors {
		keys[i] = f.Key
	}
	switch fr.Design {
	case "split-plot":
		s := fmt.Sprintf("Split plot: %s on main plots, %s on subplots", keys[0], keys[1])
		if len(keys) > 2 {
			s += ", " + keys[2] + " on sub-subplots"
		}
		return s
	case "strip-plot":
		return fmt.Sprintf("Strip plot: %s in strips one way, %s in strips the other way", keys[0], keys[1])
	case "factorial-rcbd":
		return fmt.Sprintf("Factorial %s in randomised complete blocks", strings.Join(keys, " × "))
	}
	return fmt.Sprintf("Factorial %s, completely randomised", strings.Join(keys, " × "))
}

// letterText is a mean's letters, LSD / Tukey.
func letterText(m analysis.EffectMean) string {
	l := m.LettersLSD
	if l == "" {
		l = "-"
	}
	return l + "/" + m.LettersTukey
}

// writeEffectText prints one effect's means: a list for a main effect or a
// three-factor interaction, a two-way table with the main-effect means in
// the margins for a two-factor interaction.
func writeEffectText(w io.Writer, r *analysis.Result, e *analysis.Effect, dec int) {
	fr := r.Factorial
	num := func(v *float64) string {
		if v == nil {
			return "-"
		}
		return strconv.FormatFloat(*v, 'f', dec, 64)
	}
	head := "Means of " + e.Name
	if e.P != nil {
		head += fmt.Sprintf(" (p %s)", stats.FormatP(*e.P))
	}
	fmt.Fprintln(w, head)
	if len(e.Factors) == 2 {
		rowF, colF := fr.Factor(e.Factors[0]), fr.Factor(e.Factors[1])
		rowM, colM := fr.Effect(e.Factors[0]), fr.Effect(e.Factors[1])
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintf(tw, "%s \\ %s\t", rowF.Key, colF.Key)
		for _, c := range colF.Levels {
			fmt.Fprintf(tw, "%s\t", c)
		}
		fmt.Fprintln(tw, "mean\t")
		nc := len(colF.Levels)
		for ri, rc := range rowF.Levels {
			fmt.Fprintf(tw, "%s\t", rc)
			for ci := range colF.Levels {
				m := e.Means[ri*nc+ci]
				fmt.Fprintf(tw, "%s %s\t", num(m.Mean), letterText(m))
			}
			if rowM != nil {
				fmt.Fprintf(tw, "%s %s\t", num(rowM.Means[ri].Mean), letterText(rowM.Means[ri]))
			}
			fmt.Fprintln(tw)
		}
		if colM != nil {
			fmt.Fprint(tw, "mean\t")
			for ci := range colF.Levels {
				fmt.Fprintf(tw, "%s %s\t", num(colM.Means[ci].Mean), letterText(colM.Means[ci]))
			}
			fmt.Fprintln(tw, num(&r.ANOVA.GrandMean)+"\t")
		}
		tw.Flush()
	} else {
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, strings.Join(e.Factors, "\t")+"\tn\tmean\tSE\tLSD\tTukey\t")
		order := make([]int, len(e.Means))
		for i := range order {
			order[i] = i
		}
		if len(e.Factors) == 1 {
			sort.SliceStable(order, func(a, b int) bool {
				ma, mb := e.Means[order[a]].Mean, e.Means[order[b]].Mean
				if ma == nil || mb == nil {
					return mb == nil && ma != nil
				}
				if r.HigherBetter {
					return *ma > *mb
				}
				return *ma < *mb
			})
		}
		for _, i := range order {
			m := e.Means[i]
			lsd := m.LettersLSD
			if !e.LettersGiven {
				lsd = "-"
			}
			fmt.Fprintf(tw, "%s\t%d\t%s\t%s\t%s\t%s\t\n", strings.Join(m.Levels, "\t"), m.N, num(m.Mean), num(m.SE), lsd, m.LettersTukey)
		}
		tw.Flush()
	}
	var parts []string
	if e.SED != nil {
		parts = append(parts, fmt.Sprintf("SED %s (df %.1f)", num(e.SED), *e.DF))
	} else if e.SEDRange != nil {
		parts = append(parts, fmt.Sprintf("SED %s–%s by pair", num(&e.SEDRange.Min), num(&e.SEDRange.Max)))
	}
	if e.LSD != nil {
		parts = append(parts, fmt.Sprintf("LSD(%g) %s", r.Alpha, num(e.LSD)))
	}
	if e.HSD != nil {
		parts = append(parts, fmt.Sprintf("HSD(%g) %s", r.Alpha, num(e.HSD)))
	}
	if len(parts) > 0 {
		fmt.Fprintln(w, strings.Join(parts, "   "))
	}
}
