package cli

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"path/filepath"
	"strings"

	"gonum.org/v1/plot"

	"furlong/export"
	"furlong/export/chart"
	"furlong/export/xlsx"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

func init() {
	register(&command{
		name:    "report",
		summary: "write the season report workbook (xlsx)",
		usage:   "furlong report TRIAL -o REPORT.xlsx [--alpha 0.05] [--method lsd|tukey] [--traits K1,K2] [--paper a4|letter] [--no-charts]",
		details: `Writes the season report as one workbook: a cover sheet with the trial's details and cautions,
a summary sheet (every treatment's mean and letters for each trait, grand mean, CV%, LSD or HSD,
the treatment p-value, and yield as a percentage of the check), one sheet per trait (ANOVA,
means with letters, statistics, diagnostics in plain words, a chart of the means), the plot data,
and the field map. Numbers are stored at full precision and shown with each trait's decimals.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			fs := flag.NewFlagSet("report", flag.ContinueOnError)
			out := fs.String("o", "", "write the workbook to this `file` (.xlsx; required)")
			alpha := fs.Float64("alpha", analysis.DefaultAlpha, "significance level of letters and LSD/HSD")
			method := fs.String("method", "lsd", "letters shown: lsd or tukey")
			traits := fs.String("traits", "", "report only these trait `keys`, comma-separated, in this order")
			paper := fs.String("paper", "a4", "paper size, a4 or letter")
			noCharts := fs.Bool("no-charts", false, "leave the charts out")
			force := fs.Bool("force", false, "replace the output file if it exists")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("report: give one trial file")
				}
				if *out == "" || !strings.EqualFold(filepath.Ext(*out), ".xlsx") {
					return usagef("report: say where to write the workbook with -o REPORT.xlsx")
				}
				m, err := parseMethod(*method)
				if err != nil {
					return err
				}
				if !(*alpha > 0 && *alpha < 1) {
					return usagef("report: --alpha must be between 0 and 1, for example 0.05")
				}
				p, err := parsePaper(*paper)
				if err != nil {
					return err
				}
				t, err := trialfile.Load(args[0])
				if err != nil {
					return err
				}
				keys, err := traitList(t, *traits)
				if err != nil {
					return err
				}
				results, err := analysis.AnalyzeAll(ctx, t, keys, analysis.Options{Alpha: *alpha})
				if err != nil {
					return err
				}
				var buf bytes.Buffer
				err = xlsx.WriteReport(&buf, t, results, xlsx.ReportOptions{
					Method: m, Alpha: *alpha, Traits: keys, Version: env.Version,
					Charts: !*noCharts, Paper: p, Ctx: ctx,
				})
				if err != nil {
					return err
				}
				if err := writeFileNew(*out, buf.Bytes(), *force); err != nil {
					return err
				}
				fmt.Fprintf(env.Stdout, "wrote the report for %d traits to %s\n", len(results), *out)
				for _, r := range results {
					if r.Err != nil {
						fmt.Fprintf(env.Stdout, "  %s was not analysed: %s\n", r.Key, export.Reason(r))
					}
				}
				return nil
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
			fs := flag.NewFlagSet("chart", flag.ContinueOnError)
			out := fs.String("o", "", "write the chart to this `file` (.png, .svg or .pdf; required)")
			key := fs.String("trait", "", "the trait `key` (required)")
			kind := fs.String("kind", "means", "chart kind: means, spread, fieldmap, residuals or qq")
			method := fs.String("method", "lsd", "letters on a means chart: lsd, tukey or none")
			alpha := fs.Float64("alpha", analysis.DefaultAlpha, "significance level of the letters")
			order := fs.String("order", "mean", "treatment order: mean or code")
			force := fs.Bool("force", false, "replace the output file if it exists")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("chart: give one trial file")
				}
				if *key == "" {
					return usagef("chart: say which trait with --trait KEY")
				}
				if !(*alpha > 0 && *alpha < 1) {
					return usagef("chart: --alpha must be between 0 and 1, for example 0.05")
				}
				format, err := imageFormat(*out)
				if err != nil {
					return err
				}
				t, err := trialfile.Load(args[0])
				if err != nil {
					return err
				}
				if t.Trait(*key) == nil {
					return fmt.Errorf("the trial has no trait %q (it has %s)", *key, traitKeys(t))
				}
				ord := chart.ByMean
				switch *order {
				case "mean":
				case "code":
					ord = chart.ByCode
				default:
					return usagef("chart: --order must be mean or code")
				}
				var p *plot.Plot
				analyse := func() (*analysis.Result, error) {
					return analysis.Analyze(t, *key, analysis.Options{Alpha: *alpha})
				}
				switch *kind {
				case "means":
					var letters analysis.Method
					if *method != "none" {
						if letters, err = parseMethod(*method); err != nil {
							return err
						}
					}
					r, err := analyse()
					if err != nil {
						return err
					}
					p, err = chart.Means(t, r, chart.MeansOptions{Letters: letters, Order: ord})
					if err != nil {
						return err
					}
				case "spread":
					p, err = chart.Spread(t, *key, chart.SpreadOptions{Kind: chart.DotPlot, Order: ord, Seed: t.Random.Seed})
				case "fieldmap":
					p, err = chart.HeatMap(t, *key, chart.HeatMapOptions{PlotNumbers: true})
				case "residuals", "qq":
					r, err := analyse()
					if err != nil {
						return err
					}
					if *kind == "qq" {
						p, err = chart.QQ(t, r)
					} else {
						p, err = chart.Residuals(t, r)
					}
					if err != nil {
						return err
					}
				default:
					return usagef("chart: --kind must be means, spread, fieldmap, residuals or qq")
				}
				if err != nil {
					return err
				}
				return saveChart(env, p, *out, format, *force)
			}
		},
	})
	register(&command{
		name:    "map",
		summary: "draw the printable field map (plot numbers and treatments)",
		usage:   "furlong map TRIAL -o MAP.png|svg|pdf",
		details: `Draws the field map for the crew: every plot with its number and treatment code, a colour per
treatment, block outlines, the grid's orientation and a key of treatments, on an A4 landscape page.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			fs := flag.NewFlagSet("map", flag.ContinueOnError)
			out := fs.String("o", "", "write the map to this `file` (.png, .svg or .pdf; required)")
			force := fs.Bool("force", false, "replace the output file if it exists")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("map: give one trial file")
				}
				format, err := imageFormat(*out)
				if err != nil {
					return err
				}
				t, err := trialfile.Load(args[0])
				if err != nil {
					return err
				}
				p, err := chart.FieldMap(t, chart.FieldMapOptions{})
				if err != nil {
					return err
				}
				return saveChart(env, p, *out, format, *force)
			}
		},
	})
}

func saveChart(env Env, p *plot.Plot, out, format string, force bool) error {
	var buf bytes.Buffer
	if err := chart.SaveA4(p, &buf, format); err != nil {
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

func parseMethod(s string) (analysis.Method, error) {
	switch strings.ToLower(s) {
	case "lsd":
		return analysis.LSD, nil
	case "tukey", "hsd":
		return analysis.Tukey, nil
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
