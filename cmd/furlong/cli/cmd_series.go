package cli

import (
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"furlong/export/jsonout"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/series"
	"furlong/trial/trialfile"
)

// seriesOptions are the flags of "furlong series".
type seriesOptions struct {
	env       Env
	paths     []string
	trait     string
	check     string
	sites     string
	weighted  bool
	method    string
	alpha     float64
	format    string
	out       string
	save      string
	versus    stringList // "A,B": entry A head to head with entry B
	formatSet bool       // --format was given
	site      string     // CSV: the site column
	block     string     // CSV: the block column ("" = site means)
	treatment string     // CSV: the treatment column
	responses stringList
}

func init() {
	register(&command{
		name:    "series",
		summary: "combine trials of the same entries at several sites or seasons",
		usage: `furlong series TRIAL.furlong TRIAL.furlong ... [--trait KEY] [--check CODE] [--sites random|fixed] [--weighted] [--method lsd|tukey] [--format text|json|csv] [-o FILE.xlsx] [--save NAME.furlong-series]
furlong series NAME.furlong-series [flags as above]
furlong series FILE.csv --site COL [--block COL] --treatment COL [--response COL] [flags as above]`,
		details: `Combines trials of the same entries (matched by treatment code) at several sites or seasons, one trait
at a time (without --trait: every trait all the trials have, matched by key and unit). Each site is
analysed on its own first (n, mean, CV%, MSE, error df, p of the treatment test, LSD), the site error
variances are compared (Bartlett), then the entries are compared across sites:

  combined    every entry at every site with the same number of blocks: one ANOVA of the plots (site,
              blocks within site, entry, entry × site, pooled error)
  two-stage   otherwise (or for site means): each site's means, then an additive entry + site model on
              them, whose residual is the entry × site interaction

Sites are random by default: entries are tested against entry × site, so the comparison speaks for
sites like these. --sites fixed tests them against the pooled error (for these sites only).
--weighted weights the two-stage analysis by each site's precision. Also given: stability
(Finlay–Wilkinson slope, deviation MS, Wricke's ecovalence), percent of the check per site and across
sites, and each entry head to head with the check (sites higher and lower, mean difference, paired t);
--versus A,B adds entry A against entry B (any two entries; repeatable).

A CSV table holds plot data of many sites (--site, --block, --treatment and response columns); without
--block its rows are site means. --save writes a series file listing the trials (the window reopens
it); a series file given as the argument brings back its trials and options.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := seriesOptions{env: env}
			fs := flag.NewFlagSet("series", flag.ContinueOnError)
			fs.StringVar(&o.trait, "trait", "", "analyse only this trait `key` (default: every trait all trials have)")
			fs.StringVar(&o.check, "check", "", "the check entry's `code` (default: the trials' one check)")
			fs.StringVar(&o.sites, "sites", "", "sites random (default: entries tested against entry × site) or fixed")
			fs.BoolVar(&o.weighted, "weighted", false, "weight the two-stage analysis by each site's precision")
			fs.StringVar(&o.method, "method", "lsd", "letters by lsd or tukey")
			fs.Float64Var(&o.alpha, "alpha", 0.05, "significance level")
			fs.StringVar(&o.format, "format", "text", "output format: text, json or csv")
			fs.StringVar(&o.out, "o", "", "write the series workbook to this `file` (.xlsx); with --format the analysis is printed too")
			fs.StringVar(&o.save, "save", "", "write a series `file` (.furlong-series) listing the trials and options")
			fs.Var(&o.versus, "versus", "also compare two entries head to head: \"A,B\" (repeatable)")
			fs.StringVar(&o.site, "site", "", "CSV: the site `column`")
			fs.StringVar(&o.block, "block", "", "CSV: the block `column` (without it the rows are site means)")
			fs.StringVar(&o.treatment, "treatment", "", "CSV: the treatment `column`")
			fs.Var(&o.responses, "response", "CSV: a response `column` to analyse (repeatable; default: every numeric column)")
			return fs, func(ctx context.Context, args []string) error {
				o.paths = args
				fs.Visit(func(f *flag.Flag) { o.formatSet = o.formatSet || f.Name == "format" })
				return runSeries(ctx, o)
			}
		},
	})
}

// seriesInput is what the command analyses: one or more traits, each
// with its sites, and the trials behind them (nil for a table).
type seriesInput struct {
	name   string // series name
	traits []series.TableTrait
	trials []*trial.Trial
	paths  []string
}

// runSeries analyses a series and prints it in o.format.
func runSeries(ctx context.Context, o seriesOptions) error {
	switch o.format {
	case "text", "json", "csv":
	default:
		return usagef("series: --format must be text, json or csv, not %q", o.format)
	}
	if !(o.alpha > 0 && o.alpha < 1) {
		return usagef("series: --alpha must be between 0 and 1, for example 0.05")
	}
	method, ok := meansep.ParseMethod(o.method)
	if !ok {
		return usagef("series: --method must be lsd or tukey, not %q", o.method)
	}
	if o.out != "" && !strings.EqualFold(filepath.Ext(o.out), ".xlsx") {
		return usagef("series: -o writes a workbook, so its name must end in .xlsx (not %q)", o.out)
	}
	if o.save != "" && filepath.Ext(o.save) != series.FileExt {
		return usagef("series: --save writes a series file, so its name must end in %s (not %q)", series.FileExt, o.save)
	}
	if _, err := series.ParseSites(o.sites); err != nil {
		return usagef("series: --sites must be random or fixed, not %q", o.sites)
	}
	if len(o.paths) == 0 {
		return usagef("series: give two or more trial files, a series file (%s) or one CSV table", series.FileExt)
	}
	csvInput := len(o.paths) == 1 && isCSV(o.paths[0])
	if !csvInput && (o.site != "" || o.block != "" || o.treatment != "" || len(o.responses) > 0) {
		return usagef("series: --site, --block, --treatment and --response are for a CSV table; trial files know their sites, blocks and treatments")
	}
	if csvInput && o.save != "" {
		return usagef("series: --save lists trial files; a CSV table is already one file")
	}
	var in *seriesInput
	var err error
	switch {
	case csvInput:
		in, err = seriesFromTable(o)
	case len(o.paths) == 1 && filepath.Ext(o.paths[0]) == series.FileExt:
		in, err = seriesFromFile(&o)
	default:
		for _, p := range o.paths {
			if isCSV(p) {
				return usagef("series: give either one CSV table or trial files, not both")
			}
		}
		in, err = seriesFromTrials(o, o.paths)
	}
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	sites, err := series.ParseSites(o.sites)
	if err != nil { // from a series file
		return fmt.Errorf("the series file's sites option must be random or fixed, not %q", o.sites)
	}
	opts := series.Options{Check: o.check, Sites: sites, Weighted: o.weighted, Alpha: o.alpha, Method: method}
	results := make([]*series.Result, 0, len(in.traits))
	for _, tt := range in.traits {
		if err := ctx.Err(); err != nil {
			return err
		}
		res, err := series.Analyze(tt.Trait, tt.Sites, opts)
		if err != nil {
			if len(in.traits) > 1 {
				return fmt.Errorf("trait %q: %w", tt.Trait.Key, err)
			}
			return err
		}
		for _, v := range o.versus {
			a, b, ok := strings.Cut(v, ",")
			a, b = strings.TrimSpace(a), strings.TrimSpace(b)
			if !ok || a == "" || b == "" || a == b {
				return usagef("series: --versus %q: name two different entries, A,B", v)
			}
			h, err := res.Pair(a, b)
			if err != nil {
				return usagef("series: --versus %q: %s", v, err)
			}
			res.HeadToHead = append(res.HeadToHead, h)
		}
		results = append(results, res)
	}
	if o.save != "" {
		if err := saveSeries(o, in); err != nil {
			return err
		}
	}
	if o.out != "" {
		if err := writeSeriesXLSX(o, in.name, results); err != nil {
			return err
		}
		if !o.formatSet {
			// The workbook is what was asked for; --format prints the
			// analysis as well.
			fmt.Fprintf(o.env.Stdout, "wrote the series workbook for %d %s to %s\n", len(results), map[bool]string{true: "trait", false: "traits"}[len(results) == 1], o.out)
			return nil
		}
	}
	w := o.env.Stdout
	switch o.format {
	case "json":
		return jsonout.WriteSeries(w, results)
	case "csv":
		return writeSeriesCSV(w, results)
	default:
		return writeSeriesText(w, in.name, results)
	}
}

// seriesFromTable reads a CSV table of many sites.
func seriesFromTable(o seriesOptions) (*seriesInput, error) {
	if o.site == "" || o.treatment == "" {
		return nil, usagef("series: a CSV table needs --site COL and --treatment COL (and --block COL for plot data)")
	}
	if o.trait != "" && len(o.responses) == 0 {
		o.responses = stringList{o.trait}
	}
	b, err := os.ReadFile(o.paths[0])
	if err != nil {
		return nil, err
	}
	tts, err := series.ReadTable(bytes.NewReader(b), series.TableColumns{Site: o.site, Block: o.block, Treatment: o.treatment, Responses: o.responses})
	if err != nil {
		return nil, fmt.Errorf("%s: %w", filepath.Base(o.paths[0]), err)
	}
	name := strings.TrimSuffix(filepath.Base(o.paths[0]), filepath.Ext(o.paths[0]))
	return &seriesInput{name: name, traits: tts}, nil
}

// seriesFromFile reads a series file and its trials; its options are the
// defaults of the flags not given.
func seriesFromFile(o *seriesOptions) (*seriesInput, error) {
	path := o.paths[0]
	s, problems, err := series.Load(path)
	if err != nil {
		return nil, err
	}
	for _, p := range problems {
		if p.Missing {
			return nil, fmt.Errorf("%s: %s", filepath.Base(path), p.Msg)
		}
		fmt.Fprintf(o.env.Stderr, "furlong: note: %s\n", p.Msg)
	}
	if o.trait == "" {
		o.trait = s.Options.Trait
	}
	if o.check == "" {
		o.check = s.Options.Check
	}
	if o.sites == "" {
		o.sites = s.Options.Sites
	}
	if !o.weighted && s.Options.Weighting == "stage-1" {
		o.weighted = true
	}
	paths := make([]string, len(s.Trials))
	for i, ref := range s.Trials {
		paths[i] = series.Resolve(path, ref)
	}
	in, err := seriesFromTrials(*o, paths)
	if err != nil {
		return nil, err
	}
	if s.Name != "" {
		in.name = s.Name
	}
	return in, nil
}

// seriesFromTrials loads the trial files and matches their traits.
func seriesFromTrials(o seriesOptions, paths []string) (*seriesInput, error) {
	if len(paths) < 2 {
		return nil, usagef("series: a series needs at least two trial files (sites or seasons); one trial is analysed by 'furlong analyze'")
	}
	in := &seriesInput{name: "Trial series", paths: paths}
	for _, p := range paths {
		t, err := trialfile.Load(p)
		if err != nil {
			return nil, err
		}
		in.trials = append(in.trials, t)
	}
	keys := []string{o.trait}
	if o.trait == "" {
		keys = series.CommonTraits(in.trials)
		if len(keys) == 0 {
			return nil, errors.New("the trials have no trait in common (a series matches traits by key): give the same trait key in every trial, or pick one with --trait")
		}
	}
	for _, k := range keys {
		tr, sites, err := series.FromTrials(in.trials, paths, k)
		if err != nil {
			return nil, err
		}
		in.traits = append(in.traits, series.TableTrait{Trait: tr, Sites: sites})
	}
	return in, nil
}

// saveSeries writes the series file of o.save.
func saveSeries(o seriesOptions, in *seriesInput) error {
	name := strings.TrimSuffix(filepath.Base(o.save), series.FileExt)
	if in.name != "" && in.name != "Trial series" {
		name = in.name
	}
	s := &series.Series{Name: name}
	for _, p := range in.paths {
		ref, err := series.Ref(o.save, p)
		if err != nil {
			return err
		}
		s.Trials = append(s.Trials, ref)
	}
	s.Options = series.FileOptions{Trait: o.trait, Check: o.check, Sites: o.sites, Weighting: "none"}
	if o.weighted {
		s.Options.Weighting = "stage-1"
	}
	return series.Save(o.save, s)
}
