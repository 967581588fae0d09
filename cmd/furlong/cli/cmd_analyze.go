package cli

import (
	"context"
	"encoding/csv"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"

	"furlong/export/jsonout"
	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/fieldbook"
	"furlong/trial/trialfile"
)

// analyzeOptions are the choices of 'furlong analyze'.
type analyzeOptions struct {
	env                                                             Env
	path                                                            string // the trial or CSV file
	trait, treatment, block, row, column, format, method, transform string
	responses                                                       stringList
	alpha                                                           float64
	unprotected, decimalComma                                       bool
	check                                                           string
	lowerBetter                                                     bool
	covariate                                                       string
	contrasts                                                       stringList
	adjust                                                          string
	factorial                                                       factorialFlags // cmd_analyze_factorial.go
}

type stringList []string

func (s *stringList) String() string     { return strings.Join(*s, ",") }
func (s *stringList) Set(v string) error { *s = append(*s, v); return nil }

func init() {
	register(&command{
		name:    "analyze",
		summary: "analyse traits: ANOVA, means with LSD and Tukey letters, diagnostics",
		usage: `furlong analyze TRIAL.furlong [--trait KEY] [--alpha 0.05] [--format text|json|csv] [--transform log|sqrt|arcsin] [--unprotected]
                [--check CODE] [--contrast "NAME=A,B vs C"]... [--adjust none|bonferroni|holm|scheffe]
furlong analyze DATA.csv --treatment COL [--block COL | --row COL --column COL] [--response COL]... [--covariate COL] [flags]
furlong analyze DATA.csv --factor COL --factor COL [--factor COL] [--block COL] [--main-plot COL | --strip-plot] [--response COL]... [--covariate COL] [flags]`,
		details: `Analyses every trait of a trial (or the one named by --trait) with the ANOVA that fits its design:
one-way for a completely randomised design, treatment + block for an RCBD, treatment + row + column
for a Latin square. With missing plots the model is fitted by least squares, each sum of squares is
adjusted for the other terms, and means are least-squares means.

A CSV file (comma, semicolon or tab separated, header row first) can be analysed too: name the
treatment column, and a block column for an RCBD or row and column columns for a Latin square.
Without --response every numeric column that is not a factor is analysed. Empty cells, NA, N/A
and "." are missing. The file is read as 'furlong import' reads a field book: UTF-8, UTF-16 or
Windows-1252 text, any line endings, a "sep=;" first line; blank lines are skipped. In a
comma-separated file a comma inside a number is refused as ambiguous unless --decimal-comma is
given; semicolon- and tab-separated files may use decimal commas.

--covariate KEY|COL adjusts each trait for a covariate measured on the same plots (a stand count, a
count before treatment, a soil value): analysis of covariance in a CRD, RCBD or Latin square, and
with crossed factors in a factorial CRD or RCBD (the covariate a term of the factorial model; not in
a split or strip plot), with means adjusted to the covariate's mean, the test of its slope and of
equal slopes across the treatments, and a warning when the covariate itself differs between
treatments (it must then not be used).

` + factorialHelp + `
` + contrastHelp + `
Output: text (aligned tables for a terminal), json (every number at full precision; see the README
for the fields) or csv (one row per treatment mean).`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := &analyzeOptions{env: env}
			fs := analyzeFlags(o)
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("analyze: give one input file (a .furlong trial or a .csv table)")
				}
				o.path = args[0]
				return runAnalyze(ctx, *o)
			}
		},
	})
}

// analyzeFlags defines the flags of 'furlong analyze' on o.
func analyzeFlags(o *analyzeOptions) *flag.FlagSet {
	fs := flag.NewFlagSet("analyze", flag.ContinueOnError)
	fs.StringVar(&o.trait, "trait", "", "analyse only this trait `key` (trial files)")
	fs.StringVar(&o.treatment, "treatment", "", "CSV: the treatment `column`")
	fs.StringVar(&o.block, "block", "", "CSV: the block `column` (gives an RCBD)")
	fs.StringVar(&o.row, "row", "", "CSV: the `column` that holds the Latin square's row")
	fs.StringVar(&o.column, "column", "", "CSV: the `column` that holds the Latin square's column (with --row)")
	fs.Var(&o.responses, "response", "CSV: a response `column` to analyse (repeatable)")
	fs.Float64Var(&o.alpha, "alpha", analysis.DefaultAlpha, "significance level")
	fs.StringVar(&o.format, "format", "text", "output format: text, json or csv")
	fs.StringVar(&o.transform, "transform", "", "analyse transformed values: log, sqrt or arcsin")
	fs.BoolVar(&o.unprotected, "unprotected", false, "give LSD letters even when the treatment F test is not significant")
	fs.StringVar(&o.check, "check", "", "compare every treatment with this check `code` (Dunnett); default: the trial's one check")
	fs.StringVar(&o.covariate, "covariate", "", "adjust for this covariate: a trait `key` of the trial or a CSV column (analysis of covariance); default: each trait's saved covariate; none: no adjustment")
	fs.BoolVar(&o.lowerBetter, "lower-is-better", false, "CSV: lower values are better (for the one-sided comparison with the check)")
	fs.Var(&o.contrasts, "contrast", "estimate a contrast: \"NAME=A,B vs C\" or \"NAME=A:1,B:1,C:-2\" (repeatable)")
	fs.StringVar(&o.adjust, "adjust", "", "adjust the contrasts' p-values: none, bonferroni, holm or scheffe (default: the trial's saved choice, else none)")
	fs.BoolVar(&o.decimalComma, "decimal-comma", false, "CSV: the comma-separated file has decimal commas in quoted cells (\"5,23\")")
	o.factorial.define(fs)
	return fs
}

// runAnalyze analyses a trial file's traits or a CSV table's response columns
// and prints the results in o.format.
func runAnalyze(ctx context.Context, o analyzeOptions) error {
	path, env := o.path, o.env
	switch o.format {
	case "text", "json", "csv":
	default:
		return usagef("analyze: --format must be text, json or csv, not %q", o.format)
	}
	if !(o.alpha > 0 && o.alpha < 1) {
		return usagef("analyze: --alpha must be between 0 and 1, for example 0.05")
	}
	if o.lowerBetter && !isCSV(path) {
		return usagef("analyze: --lower-is-better is for CSV tables; a trial's trait says which way is better")
	}
	tf, err := parseTransform(o.transform)
	if err != nil {
		return err
	}
	adj, err := stats.ParseAdjustment(o.adjust)
	if err != nil {
		return usagef("analyze: --adjust: %s", err)
	}
	given, err := parseContrastFlags("analyze", o.contrasts)
	if err != nil {
		return err
	}
	var saved []trial.Contrast
	opts := analysis.Options{Alpha: o.alpha, Unprotected: o.unprotected, Transform: tf, Covariate: o.covariate}
	var outcomes []analysis.Outcome
	if isCSV(path) {
		outcomes, err = analyzeCSV(ctx, o, path, opts)
	} else {
		if o.treatment != "" || o.block != "" || o.row != "" || o.column != "" || len(o.responses) > 0 || o.factorial.given() {
			return usagef("analyze: --treatment, --factor, --block, --main-plot, --strip-plot, --row, --column and --response are for CSV input; a trial file knows its design")
		}
		var t *trial.Trial
		t, err = trialfile.Load(path)
		if err != nil {
			return err
		}
		var keys []string
		if o.trait != "" {
			if t.Trait(o.trait) == nil {
				return fmt.Errorf("the trial has no trait %q (it has %s)", o.trait, traitKeys(t))
			}
			keys = []string{o.trait}
		}
		if keys, err = covariateKeys(t, keys, o.trait, o.covariate); err != nil {
			return err
		}
		outcomes, err = analysis.AnalyzeAll(ctx, t, keys, opts)
		saved = t.Analysis.Contrasts
		if o.adjust == "" {
			adj = analysis.SavedAdjustment(t)
		}
	}
	if err != nil {
		return err
	}
	if err := analysis.AddExtras(outcomes, saved, analysis.Extras{VsCheck: true, Check: o.check,
		LowerBetter: o.lowerBetter && isCSV(path), Contrasts: given, Adjust: adj}); err != nil {
		return err
	}
	switch o.format {
	case "json":
		err = writeAnalysisJSON(env.Stdout, outcomes)
	case "csv":
		err = writeAnalysisCSV(env.Stdout, outcomes)
	default:
		err = writeAnalysisText(env.Stdout, outcomes)
	}
	if err != nil {
		return err
	}
	failed := 0
	for _, oc := range outcomes {
		if oc.Err != nil {
			failed++
			if o.format != "text" {
				fmt.Fprintf(env.Stderr, "furlong: %s\n", oc.Err)
			}
		}
	}
	if failed == len(outcomes) {
		return &ExitError{Code: ExitFailure, Msg: "no trait could be analysed"}
	}
	return nil
}

func parseTransform(s string) (stats.Transform, error) {
	switch strings.ToLower(s) {
	case "", "none":
		return stats.NoTransform, nil
	case "log":
		return stats.Log, nil
	case "sqrt":
		return stats.Sqrt, nil
	case "arcsin", "arcsine":
		return stats.ArcsineSqrt, nil
	}
	return "", usagef("--transform must be log, sqrt or arcsin, not %q", s)
}

// analyzeCSVTables reads a CSV table from r as compact columns, one Data per
// response (see analysis.ReadTable).
func analyzeCSVTables(ctx context.Context, o analyzeOptions, r io.Reader) ([]*analysis.Data, error) {
	rd, err := fieldbook.NewReader(r, fieldbook.ReadOptions{DecimalComma: o.decimalComma})
	if err != nil {
		return nil, err
	}
	tab, err := analysis.ReadTable(ctx, rd, rd.Mark(), analysis.TableColumns{
		Treatment: o.treatment, Block: o.block, Row: o.row, Column: o.column, Responses: o.responses,
		Factors: o.factorial.factors, MainPlot: o.factorial.mainPlot, Strip: o.factorial.strip,
		Covariate: o.covariate,
	})
	if err != nil {
		if msg := decimalCommaHint(err, rd); msg != "" {
			return nil, fmt.Errorf("%w%s", err, msg)
		}
		return nil, err
	}
	return tab, nil
}

// decimalCommaHint adds, to a refused comma in a comma-separated file, how
// to say that the file uses decimal commas.
func decimalCommaHint(err error, rd *fieldbook.Reader) string {
	var ne *trial.NumberError
	if rd.Mark() == trial.PointOnly && errors.As(err, &ne) || strings.Contains(err.Error(), "ambiguous in a comma-separated file") {
		return " (if the whole file uses decimal commas, add --decimal-comma)"
	}
	return ""
}

func isCSV(path string) bool {
	l := strings.ToLower(path)
	return strings.HasSuffix(l, ".csv") || strings.HasSuffix(l, ".tsv") || strings.HasSuffix(l, ".txt")
}

func traitKeys(t *trial.Trial) string {
	var ks []string
	for _, tr := range t.Traits {
		ks = append(ks, tr.Key)
	}
	if len(ks) == 0 {
		return "no traits"
	}
	return strings.Join(ks, ", ")
}

// analyzeCSV reads a table and analyses each response column.
func analyzeCSV(ctx context.Context, o analyzeOptions, path string, opts analysis.Options) ([]analysis.Outcome, error) {
	if o.trait != "" {
		return nil, usagef("analyze: --trait is for trial files; use --response for a CSV column")
	}
	if err := o.factorial.check(o); err != nil {
		return nil, err
	}
	if o.treatment == "" && !o.factorial.given() {
		return nil, usagef("analyze: say which column holds the treatments with --treatment COL (or the factors with --factor COL, once per factor)")
	}
	if (o.row == "") != (o.column == "") {
		return nil, usagef("analyze: a Latin square needs both --row and --column")
	}
	if o.block != "" && o.row != "" {
		return nil, usagef("analyze: give --block (RCBD) or --row and --column (Latin square), not both")
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	tab, err := analyzeCSVTables(ctx, o, f)
	if err != nil {
		if ctx.Err() != nil {
			return nil, ctx.Err()
		}
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	var out []analysis.Outcome
	for _, d := range tab {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		r, err := analysis.AnalyzeData(d, opts)
		out = append(out, analysis.Outcome{Key: d.TraitKey, Result: r, Err: err})
	}
	return out, nil
}

// ---- output ----

// writeAnalysisJSON writes the outcomes as the JSON document of --format
// json, streamed (export/jsonout holds the mapping of a result to its keys).
func writeAnalysisJSON(w io.Writer, outcomes []analysis.Outcome) error {
	return jsonout.WriteAnalysis(w, outcomes)
}

func writeAnalysisCSV(w io.Writer, outcomes []analysis.Outcome) error {
	cw := csv.NewWriter(w)
	_ = cw.Write([]string{"trait", "treatment", "n", "mean", "raw_mean", "se", "letters_lsd", "letters_tukey",
		"grand_mean", "cv_percent", "df_error", "mse", "p_treatment", "lsd", "hsd"})
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }
	gp := func(v *float64) string {
		if v == nil {
			return ""
		}
		return g(*v)
	}
	for _, oc := range outcomes {
		if oc.Err != nil {
			continue
		}
		r := oc.Result
		a := r.ANOVA
		pTrt := ""
		if trt, ok := a.Treatment(); ok && trt.HasTest {
			pTrt = g(trt.P) // crossed factors have no one treatment line: empty
		}
		for _, m := range r.Means {
			_ = cw.Write([]string{r.TraitKey, m.Treatment, strconv.Itoa(m.N), g(m.Mean), g(m.RawMean), g(m.SE),
				m.LettersLSD, m.LettersTukey, g(a.GrandMean), g(a.CVPercent), strconv.Itoa(a.DFError), g(a.MSE),
				pTrt, gp(r.LSD), gp(r.HSD)})
		}
	}
	cw.Flush()
	return cw.Error()
}

func writeAnalysisText(w io.Writer, outcomes []analysis.Outcome) error {
	for n, oc := range outcomes {
		if n > 0 {
			fmt.Fprintln(w)
		}
		if oc.Err != nil {
			fmt.Fprintf(w, "%s\n%s\nNot analysed: %s\n", oc.Key, strings.Repeat("-", len(oc.Key)), strings.TrimPrefix(oc.Err.Error(), oc.Key+": "))
			continue
		}
		writeResultText(w, oc.Result)
	}
	return nil
}

// writeResultText prints one trait's analysis as aligned text tables, with
// the padding the tables leave at the ends of lines taken off.
func writeResultText(w io.Writer, r *analysis.Result) {
	var buf strings.Builder
	writeResultTables(&buf, r)
	lines := strings.SplitAfter(buf.String(), "\n")
	for i, l := range lines {
		if strings.HasSuffix(l, "\n") {
			lines[i] = strings.TrimRight(l[:len(l)-1], " ") + "\n"
		}
	}
	io.WriteString(w, strings.Join(lines, ""))
}

func writeResultTables(w io.Writer, r *analysis.Result) {
	if r.IsFactorial() {
		writeFactorialTables(w, r)
		return
	}
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
	// Means one decimal finer than the data; the analysis scale of a
	// transformation at its own fixed decimals (analysis.MeanDecimals).
	back := analysis.MeanDecimals(r.Decimals)
	dec := back
	if r.Transform != stats.NoTransform {
		dec = analysis.TransformedDecimals
	}
	num := func(v float64, d int) string { return strconv.FormatFloat(v, 'f', d, 64) }
	fmt.Fprintf(w, "%s, %d observations", r.Design.Title(), r.N)
	if r.Missing > 0 {
		fmt.Fprintf(w, ", %d missing", r.Missing)
	}
	if len(r.Excluded) > 0 {
		fmt.Fprintf(w, ", %d excluded", len(r.Excluded))
	}
	if r.Transform != stats.NoTransform {
		fmt.Fprintf(w, ", analysed as %s", r.Transform)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "Source\tdf\tSS\tMS\tF\tp\t")
	for _, s := range a.Sources {
		ms, f, p := "", "", ""
		if s.Role != stats.RoleTotal {
			ms = num(s.MS, 4)
		}
		if s.HasTest {
			f, p = num(s.F, 2), stats.FormatP(s.P)
		}
		fmt.Fprintf(tw, "%s\t%d\t%s\t%s\t%s\t%s\t\n", s.Name, s.DF, num(s.SS, 4), ms, f, p)
	}
	tw.Flush()
	fmt.Fprintln(w)
	fmt.Fprintf(w, "Grand mean %s   CV %.1f%%   R² %.3f   error df %d   MSE %s\n",
		num(a.GrandMean, dec), a.CVPercent, a.RSquared, a.DFError, num(a.MSE, 4))
	var line []string
	if a.SEMean != nil && a.SED != nil {
		line = append(line, "SE of a mean "+num(*a.SEMean, dec), "SED "+num(*a.SED, dec))
	}
	if r.LSD != nil {
		line = append(line, fmt.Sprintf("LSD(%g) %s", r.Alpha, num(*r.LSD, dec)))
	}
	if r.HSD != nil {
		line = append(line, fmt.Sprintf("HSD(%g) %s", r.Alpha, num(*r.HSD, dec)))
	}
	if r.LSD == nil && r.HSD == nil {
		if r.LSDRange != nil && r.HSDRange != nil {
			why := "unequal n"
			if r.Covariate != nil {
				why = "adjusted means"
			}
			line = append(line, fmt.Sprintf("%s: LSD(%g) %s–%s, HSD(%g) %s–%s by pair", why, r.Alpha, num(r.LSDRange.Min, dec), num(r.LSDRange.Max, dec),
				r.Alpha, num(r.HSDRange.Min, dec), num(r.HSDRange.Max, dec)))
		} else {
			line = append(line, "replication is unequal: each pair has its own standard error")
		}
	}
	if a.RelativeEfficiency != nil {
		line = append(line, fmt.Sprintf("blocking efficiency vs CRD %.2f", *a.RelativeEfficiency))
	}
	fmt.Fprintln(w, strings.Join(line, "   "))
	writeCovariateText(w, r)
	fmt.Fprintln(w)

	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	hdr := "Treatment\tn\tMean\tRaw mean\tSE\tLSD\tTukey\t"
	if r.Covariate != nil {
		hdr = "Treatment\tn\tAdjusted mean\tRaw mean\tSE\tLSD\tTukey\t"
	}
	if r.Transform != stats.NoTransform {
		hdr = "Treatment\tn\tBack-transformed\tLower\tUpper\tMean\tRaw mean\tSE\tLSD\tTukey\t"
	}
	fmt.Fprintln(tw, hdr)
	order := meanOrder(r)
	for _, i := range order {
		m := r.Means[i]
		code := m.Treatment
		if m.Check {
			code += " (check)"
		}
		lsd := m.LettersLSD
		if !r.LSDLettersGiven {
			lsd = "-"
		}
		if r.Transform != stats.NoTransform {
			lo, hi := "-", "-"
			if m.Lower != nil && m.Upper != nil {
				lo, hi = num(*m.Lower, back), num(*m.Upper, back)
			}
			fmt.Fprintf(tw, "%s\t%d\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t\n", code, m.N, num(m.BackMean, back), lo, hi, num(m.Mean, dec), num(m.RawMean, dec), num(m.SE, dec), lsd, m.LettersTukey)
		} else {
			fmt.Fprintf(tw, "%s\t%d\t%s\t%s\t%s\t%s\t%s\t\n", code, m.N, num(m.Mean, dec), num(m.RawMean, dec), num(m.SE, dec), lsd, m.LettersTukey)
		}
	}
	tw.Flush()
	fmt.Fprintf(w, "Means sharing a letter do not differ at the %g level.\n", r.Alpha)
	if r.Transform != stats.NoTransform {
		fmt.Fprintf(w, "Back-transformed means with their %g%% confidence limits are on the original scale; Mean, Raw mean and SE on the %s scale.\n", 100*(1-r.Alpha), r.Transform.Scale())
	}
	if d := r.Diagnostics; d.ShapiroW != nil || d.LeveneF != nil || d.NonAdditivityF != nil {
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
		if d.NonAdditivityF != nil {
			parts = append(parts, fmt.Sprintf("non-additivity F %.3f, p %s", *d.NonAdditivityF, stats.FormatP(*d.NonAdditivityP)))
		}
		fmt.Fprintf(w, "Diagnostics: %s\n", strings.Join(parts, "; "))
	}
	if vc := r.VsCheck; vc != nil {
		better := "higher"
		if !vc.HigherBetter {
			better = "lower"
		}
		fmt.Fprintf(w, "\nAgainst the check %s (Dunnett, single-step; %g%% simultaneous intervals; better = %s):\n", vc.Check, 100*(1-vc.Alpha), better)
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "treatment\tdifference\tSE\tlower\tupper\tp (two-sided)\tp (better)\t\t")
		for _, row := range vc.Rows {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%s\t%s\t%s\t%s\t%s\t\n", row.Treatment, num(row.Diff, dec), num(row.SE, dec), num(row.Lower, dec), num(row.Upper, dec),
				stats.FormatP(row.PTwoSided), stats.FormatP(row.PBetter), row.Verdict)
		}
		tw.Flush()
	}
	writeEfficacyText(w, r) // cmd_analyze_efficacy.go
	writeContrastsText(w, r, dec)
	for _, s := range r.Warnings {
		fmt.Fprintf(w, "Note: %s\n", s)
	}
}

// meanOrder lists treatments best first (highest mean first, or lowest
// when lower is better).
func meanOrder(r *analysis.Result) []int {
	idx := make([]int, len(r.Means))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool {
		ma, mb := r.Means[idx[a]].Mean, r.Means[idx[b]].Mean
		if r.HigherBetter {
			return ma > mb
		}
		return ma < mb
	})
	return idx
}
