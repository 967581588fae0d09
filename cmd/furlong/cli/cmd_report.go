package cli

import (
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"math"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot"

	"furlong/export"
	"furlong/export/chart"
	"furlong/export/pdf"
	"furlong/export/xlsx"
	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

func init() {
	register(&command{
		name:    "report",
		summary: "write the season report (xlsx workbook or PDF)",
		usage: `furlong report TRIAL -o REPORT.xlsx|REPORT.pdf [--alpha 0.05] [--method lsd|tukey] [--traits K1,K2] [--paper a4|letter] [--no-charts]
                [--vs-check=false] [--check CODE] [--contrast "NAME=A,B vs C"]... [--adjust none|bonferroni|holm|scheffe]
                [--price-ratio R]`,
		details: `Writes the season report as one workbook: a cover sheet with the trial's details and cautions,
a summary sheet (every treatment's mean and letters for each trait, grand mean, CV%, LSD or HSD,
the treatment p-value, and yield as a percentage of the check), one sheet per trait (ANOVA,
means with letters, statistics, diagnostics in plain words, a chart of the means), the plot data,
and the field map. Numbers are stored at full precision and shown with each trait's decimals.
With -o REPORT.pdf the same report is written as a PDF document for printing and mailing: the
cover with the cautions, the summary, a page per trait with its tables and chart, the plot data
and the field map with its dimensions, on A4 or US Letter (--paper), with page numbers.

When the trial has a check (or --check CODE names one), every entry is compared with it by
Dunnett's comparisons: a "vs check" column on the summary (better, worse or ns) and, on each trait's
sheet or page, the differences with their simultaneous intervals, adjusted p-values and a chart;
--vs-check=false leaves this out. The trial's saved contrasts, and any given with --contrast (as in
'furlong analyze'), get a table on each trait's sheet or page, with --adjust for their p-values. A
crop-protection trial with an untreated check shows percent efficacy beside the means. A rate trial
(treatments with rates) gets its response on each trait's sheet or page, as 'furlong response' gives it:
trends on the rates, the four response models with a chart and, with a price ratio (the trial's saved
one, or --price-ratio), the economic optimum and its sensitivity to the ratio.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := reportOptions{env: env}
			fs := flag.NewFlagSet("report", flag.ContinueOnError)
			fs.StringVar(&o.out, "o", "", "write the report to this `file` (.xlsx or .pdf; required)")
			fs.Float64Var(&o.alpha, "alpha", analysis.DefaultAlpha, "significance level of letters and LSD/HSD")
			fs.StringVar(&o.method, "method", "", "letters shown: lsd or tukey (default: the trial's remembered method)")
			fs.StringVar(&o.traits, "traits", "", "report only these trait `keys`, comma-separated, in this order")
			fs.StringVar(&o.paper, "paper", "a4", "paper size, a4 or letter")
			fs.BoolVar(&o.noCharts, "no-charts", false, "leave the charts out")
			fs.BoolVar(&o.vsCheck, "vs-check", true, "compare each entry with the check (Dunnett) on the summary and the trait sheets; --vs-check=false leaves it out")
			fs.StringVar(&o.check, "check", "", "compare with this treatment `code` (default: the trial's check)")
			fs.Var(&o.contrasts, "contrast", "estimate a contrast: \"NAME=A,B vs C\" or \"NAME=A:1,B:1,C:-2\" (repeatable; the trial's saved ones are estimated too)")
			fs.StringVar(&o.adjust, "adjust", "", "adjust the contrasts' p-values: none, bonferroni, holm or scheffe (default: the trial's saved choice, else none)")
			fs.Float64Var(&o.priceRatio, "price-ratio", 0, "rate trials: the price of a unit of input in units of produce (default: the trial's saved ratio)")
			fs.BoolVar(&o.force, "force", false, "replace the output file if it exists")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("report: give one trial file")
				}
				o.trial = args[0]
				return runReport(ctx, o)
			}
		},
	})
	register(&command{
		name:    "chart",
		summary: "draw a chart of one trait (means, spread, field heat map, residuals, Q-Q)",
		usage:   "furlong chart TRIAL --trait KEY --kind means|spread|fieldmap|residuals|qq -o OUT.png|svg|pdf [--method lsd|tukey] [--alpha 0.05]",
		details: `Draws one chart of a trait:
  means      treatment means with ± 1 SE error bars and letters above the bars
  spread     every plot's value per treatment (dot plot)
  fieldmap   the trait over the field grid, showing gradients and bad patches
  residuals  residuals against fitted values
  qq         normal Q-Q plot of the residuals
The format follows the file name's ending. Charts are sized for an A4 landscape page.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := chartOptions{env: env}
			fs := flag.NewFlagSet("chart", flag.ContinueOnError)
			fs.StringVar(&o.out, "o", "", "write the chart to this `file` (.png, .svg or .pdf; required)")
			fs.StringVar(&o.trait, "trait", "", "the trait `key` (required)")
			fs.StringVar(&o.kind, "kind", "means", "chart kind: means, spread, fieldmap, residuals, qq or response (a rate trial's curves)")
			fs.StringVar(&o.method, "method", "", "letters on a means chart: lsd, tukey or none (default: the trial's remembered method)")
			fs.Float64Var(&o.alpha, "alpha", analysis.DefaultAlpha, "significance level of the letters")
			fs.StringVar(&o.order, "order", "mean", "treatment order: mean or code")
			fs.BoolVar(&o.force, "force", false, "replace the output file if it exists")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("chart: give one trial file")
				}
				o.trial = args[0]
				return runChart(ctx, o)
			}
		},
	})
	register(&command{
		name:    "map",
		summary: "draw the printable field map (plot numbers and treatments)",
		usage:   "furlong map TRIAL -o MAP.png|svg|pdf [--colour-by FACTOR] [--paper a4|letter]",
		details: `Draws the field map for the crew: every plot with its number and treatment code, a colour per
treatment, block outlines, the grid's orientation and a key of treatments, on an A4 landscape page.
A split plot's main plots are outlined too; --colour-by KEY colours a factorial trial's plots by
their level of that factor, with a key of its levels. A PDF map is a printable page with the
dimensions on the ground under the map: plot and harvested sizes, alleys and the whole trial in
metres, and where north lies.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := mapOptions{env: env}
			fs := flag.NewFlagSet("map", flag.ContinueOnError)
			fs.StringVar(&o.out, "o", "", "write the map to this `file` (.png, .svg or .pdf; required)")
			fs.BoolVar(&o.force, "force", false, "replace the output file if it exists")
			fs.StringVar(&o.colourBy, "colour-by", "", "colour the plots by their level of the factor of this `key`")
			fs.StringVar(&o.paper, "paper", "a4", "paper size of a PDF map, a4 or letter")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("map: give one trial file")
				}
				o.trial = args[0]
				return runMap(ctx, o)
			}
		},
	})
}

// reportOptions are the choices of 'furlong report'.
type reportOptions struct {
	env                               Env
	trial, out, method, traits, paper string
	check, adjust                     string
	contrasts                         stringList
	alpha                             float64
	noCharts, force, vsCheck          bool
	priceRatio                        float64
}

// runReport writes the season report workbook of o.trial to o.out.
func runReport(ctx context.Context, o reportOptions) error {
	ext := strings.ToLower(filepath.Ext(o.out))
	if o.out == "" || (ext != ".xlsx" && ext != ".pdf") {
		return usagef("report: say where to write the report with -o REPORT.xlsx or -o REPORT.pdf")
	}
	m, err := parseMethod(o.method)
	if err != nil {
		return err
	}
	if !(o.alpha > 0 && o.alpha < 1) {
		return usagef("report: --alpha must be between 0 and 1, for example 0.05")
	}
	p, err := parsePaper(o.paper)
	if err != nil {
		return err
	}
	adj, err := stats.ParseAdjustment(o.adjust)
	if err != nil {
		return usagef("report: --adjust: %s", err)
	}
	given, err := parseContrastFlags("report", o.contrasts)
	if err != nil {
		return err
	}
	if o.check != "" && !o.vsCheck {
		return usagef("report: --check goes with the comparison with the check; leave out --vs-check=false")
	}
	if o.priceRatio < 0 || math.IsInf(o.priceRatio, 0) || math.IsNaN(o.priceRatio) {
		return usagef("report: --price-ratio must be a positive number")
	}
	t, err := trialfile.Load(o.trial)
	if err != nil {
		return err
	}
	if o.priceRatio > 0 {
		t.Analysis.Response.PriceRatio = o.priceRatio // this report only; the file is not changed
	}
	if o.adjust == "" {
		adj = analysis.SavedAdjustment(t)
	}
	keys, err := traitList(t, o.traits)
	if err != nil {
		return err
	}
	// One loop, the trial's settings: each trait on its own scale, the
	// trial's method unless --method says otherwise.
	results, err := analysis.AnalyzeAll(ctx, t, keys, analysis.Options{Alpha: o.alpha, Method: m})
	if err != nil {
		return err
	}
	if err := analysis.AddExtras(results, t.Analysis.Contrasts, analysis.Extras{VsCheck: o.vsCheck, Check: o.check,
		Contrasts: given, Adjust: adj}); err != nil {
		return err
	}
	var buf bytes.Buffer
	if ext == ".pdf" {
		err = pdf.WriteReport(ctx, &buf, t, results, pdf.ReportOptions{
			Method: m, Alpha: o.alpha, Traits: keys, Version: o.env.Version,
			Charts: !o.noCharts, Paper: pdfPaper(p),
		})
	} else {
		err = xlsx.WriteReport(ctx, &buf, t, results, xlsx.ReportOptions{
			Method: m, Alpha: o.alpha, Traits: keys, Version: o.env.Version,
			Charts: !o.noCharts, Paper: p,
		})
	}
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	if err := writeFileNew(o.out, buf.Bytes(), o.force); err != nil {
		return err
	}
	fmt.Fprintf(o.env.Stdout, "wrote the report for %d traits to %s\n", len(results), o.out)
	for _, r := range results {
		if r.Err != nil {
			fmt.Fprintf(o.env.Stdout, "  %s was not analysed: %s\n", r.Key, export.Reason(r))
		}
	}
	return nil
}

// chartOptions are the choices of 'furlong chart'.
type chartOptions struct {
	env                                    Env
	trial, out, trait, kind, method, order string
	alpha                                  float64
	force                                  bool
}

// runChart draws one chart of one trait of o.trial to o.out.
func runChart(ctx context.Context, o chartOptions) error {
	if o.trait == "" {
		return usagef("chart: say which trait with --trait KEY")
	}
	if !(o.alpha > 0 && o.alpha < 1) {
		return usagef("chart: --alpha must be between 0 and 1, for example 0.05")
	}
	format, err := imageFormat(o.out)
	if err != nil {
		return err
	}
	ord := chart.ByMean
	switch o.order {
	case "mean":
	case "code":
		ord = chart.ByCode
	default:
		return usagef("chart: --order must be mean or code")
	}
	var letters meansep.Method
	switch o.kind {
	case "means":
		if o.method != "none" {
			if letters, err = parseMethod(o.method); err != nil {
				return err
			}
		}
	case "spread", "fieldmap", "residuals", "qq", "response":
	default:
		return usagef("chart: --kind must be means, spread, fieldmap, residuals, qq or response")
	}
	t, err := trialfile.Load(o.trial)
	if err != nil {
		return err
	}
	if t.Trait(o.trait) == nil {
		return fmt.Errorf("the trial has no trait %q (it has %s)", o.trait, traitKeys(t))
	}
	if o.kind == "means" && o.method == "" {
		letters = meansep.Method(t.MeanSeparation())
	}
	var p *plot.Plot
	analyse := func() (*analysis.Result, error) {
		return analysis.Analyze(t, o.trait, analysis.Options{Alpha: o.alpha})
	}
	switch o.kind {
	case "means":
		r, err := analyse()
		if err != nil {
			return err
		}
		p, err = chart.Means(t, r, chart.MeansOptions{Letters: letters, Order: ord})
		if err != nil {
			return err
		}
	case "spread":
		p, err = chart.Spread(t, o.trait, chart.SpreadOptions{Kind: chart.DotPlot, Order: ord, Seed: t.Random.Seed})
	case "fieldmap":
		p, err = chart.HeatMap(t, o.trait, chart.HeatMapOptions{PlotNumbers: true})
	case "response":
		r, err := analyse()
		if err != nil {
			return err
		}
		resp, err := export.ResponseFor(t, r)
		if err != nil {
			return err
		}
		if resp == nil {
			_, err := analysis.RatesOf(t, t.Analysis.Response.LeaveOut)
			if err == nil {
				err = errors.New("the response chart is for a trait with one list of treatments")
			}
			return fmt.Errorf("%s: no response chart: %w", o.trial, err)
		}
		if p, err = chart.RateResponse(t, resp); err != nil {
			return err
		}
	case "residuals", "qq":
		r, err := analyse()
		if err != nil {
			return err
		}
		if o.kind == "qq" {
			p, err = chart.QQ(t, r)
		} else {
			p, err = chart.Residuals(t, r)
		}
		if err != nil {
			return err
		}
	}
	if err != nil {
		return err
	}
	return saveChart(ctx, o.env, p, o.out, format, o.force)
}

// mapOptions are the choices of 'furlong map'.
type mapOptions struct {
	env                         Env
	trial, out, colourBy, paper string
	force                       bool
}

// runMap draws the printable field map of o.trial to o.out.
func runMap(ctx context.Context, o mapOptions) error {
	format, err := imageFormat(o.out)
	if err != nil {
		return err
	}
	t, err := trialfile.Load(o.trial)
	if err != nil {
		return err
	}
	if format == "pdf" {
		// The printable page: the map and its dimensions on the ground.
		paper, err := parsePaper(o.paper)
		if err != nil {
			return err
		}
		var buf bytes.Buffer
		if err := pdf.WriteMap(&buf, t, pdf.MapOptions{Paper: pdfPaper(paper), ColourBy: o.colourBy}); err != nil {
			return err
		}
		if err := writeFileNew(o.out, buf.Bytes(), o.force); err != nil {
			return err
		}
		fmt.Fprintf(o.env.Stdout, "wrote %s\n", o.out)
		return nil
	}
	p, err := chart.FieldMap(t, chart.FieldMapOptions{ColourBy: o.colourBy})
	if err != nil {
		return err
	}
	return saveChart(ctx, o.env, p, o.out, format, o.force)
}

func saveChart(ctx context.Context, env Env, p *plot.Plot, out, format string, force bool) error {
	var buf bytes.Buffer
	if err := chart.SaveA4(p, &buf, format); err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	if err := writeFileNew(out, buf.Bytes(), force); err != nil {
		return err
	}
	fmt.Fprintf(env.Stdout, "wrote %s\n", out)
	return nil
}

func imageFormat(out string) (string, error) {
	if out == "" {
		return "", usagef("say where to write the picture with -o FILE.png, .svg or .pdf")
	}
	switch f := strings.ToLower(strings.TrimPrefix(filepath.Ext(out), ".")); f {
	case "png", "svg", "pdf":
		return f, nil
	}
	return "", usagef("the output must end in .png, .svg or .pdf")
}

// parseMethod reads --method; "" (not given) stays "", the trial's
// remembered method.
func parseMethod(s string) (meansep.Method, error) {
	switch strings.ToLower(s) {
	case "":
		return "", nil
	case "lsd":
		return meansep.LSD, nil
	case "tukey", "hsd":
		return meansep.Tukey, nil
	}
	return "", usagef("--method must be lsd or tukey, not %q", s)
}

// traitList checks a comma-separated list of trait keys against the trial.
func traitList(t *trial.Trial, s string) ([]string, error) {
	if strings.TrimSpace(s) == "" {
		return nil, nil
	}
	var keys []string
	for _, k := range strings.Split(s, ",") {
		k = strings.TrimSpace(k)
		if k == "" {
			continue
		}
		if t.Trait(k) == nil {
			return nil, fmt.Errorf("the trial has no trait %q (it has %s)", k, traitKeys(t))
		}
		keys = append(keys, k)
	}
	return keys, nil
}

// pdfPaper is the PDF paper size of a --paper choice.
func pdfPaper(p xlsx.Paper) pdf.Paper {
	if p == xlsx.Letter {
		return pdf.Letter
	}
	return pdf.A4
}
