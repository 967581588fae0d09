package cli

import (
	"context"
	"flag"
	"fmt"
	"os"
	"strconv"
	"strings"

	"furlong/sampledata"
	"furlong/trial"
	"furlong/trial/trialfile"
)

// newOptions are the choices of 'furlong new'.
type newOptions struct {
	env                                                                   Env
	out, design, treatments, traits, title, crop, season, site, yieldFrom string
	reps                                                                  int
	seed                                                                  string
	demo, force                                                           bool
	layout                                                                trial.Layout
	blocks, numbering, walk                                               string
	rates, rateUnit                                                       string
	factors                                                               factorFlags
	mainPlot, subPlot                                                     string
	untreated                                                             string      // cmd_new_assess.go
	assess, preCount                                                      assessFlags // cmd_new_assess.go
}

func init() {
	register(&command{
		name:    "new",
		summary: "create and randomise a trial file",
		usage: `furlong new -o FILE --design crd|rcbd|latin --treatments N|CODE,CODE,... [--reps N] [--seed N] [--traits KEY[:UNIT],...] [--title TEXT] [layout flags]
furlong new -o FILE --design crd|rcbd|split-plot|strip-plot --factor "KEY=LEVEL,..." --factor ... [--main-plot KEY] --reps N [--seed N] ...
furlong new --demo -o FILE`,
		details: `Creates a trial, lays out and randomises its plots, and writes it to FILE (a .furlong trial file).

--treatments is either a number (treatments T01, T02, ... are made) or a list of codes.
A code may carry a name after '=' and a trailing '*' marks a check: "A=Line A,B,STD*=Farm standard".
For a Latin square --reps may be left out: it equals the number of treatments, and the
square's rows and columns are the field rows and columns.
The seed makes the randomisation reproducible; without --seed a fresh seed is drawn and printed.
--yield-from WEIGHT,MOISTURE adds a derived trait "yield": moisture-adjusted yield in t/ha
from those two traits (plot weight in kg, moisture in %), at the crop's standard moisture.
--rates gives each treatment its rate, in the order of --treatments ("0,50,100,150,200"; leave a
place empty for a treatment without a rate, such as an untreated control: "0,40,,80"), with
--rate-unit naming the unit ("kg N/ha"); 'furlong response' then fits the response to the rate.
An existing FILE is not replaced unless --force is given.` + newFactorHelp + newAssessHelp,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := &newOptions{env: env}
			fs := flag.NewFlagSet("new", flag.ContinueOnError)
			d := trial.DefaultLayout()
			fs.StringVar(&o.out, "o", "", "write the trial to this `file` (required)")
			fs.StringVar(&o.design, "design", "rcbd", "design: "+designChoices())
			fs.StringVar(&o.treatments, "treatments", "", "number of treatments, or a comma-separated `list` of codes")
			fs.IntVar(&o.reps, "reps", 0, "replicates (blocks), 2 to 50; for latin, the number of treatments")
			fs.StringVar(&o.seed, "seed", "", "randomisation seed, a whole `number` (default: a fresh one)")
			fs.StringVar(&o.traits, "traits", "", "traits to record, comma-separated `KEY[:UNIT]`")
			fs.StringVar(&o.yieldFrom, "yield-from", "", "add derived moisture-adjusted yield from `WEIGHT,MOISTURE` trait keys")
			fs.StringVar(&o.rates, "rates", "", "each treatment's rate, comma-separated `list` in treatment order")
			fs.StringVar(&o.rateUnit, "rate-unit", "", "unit of the rates, for example \"kg N/ha\"")
			fs.Var(&o.factors, "factor", "a treatment factor `KEY[:NAME]=LEVEL,...` (repeat for each factor)")
			fs.StringVar(&o.mainPlot, "main-plot", "", "`KEY` of the factor on main plots (split plot) or horizontal strips (strip plot)")
			fs.StringVar(&o.subPlot, "sub-plot", "", "`KEY` of the factor on subplots of a split-split plot")
			fs.StringVar(&o.untreated, "untreated", "", "`CODE` of the untreated check (percent efficacy is worked out against it)")
			fs.Var(&o.assess, "assess", "a trait assessed on several dates `KEY[:UNIT]=WHEN,...` (repeat for each series)")
			fs.Var(&o.preCount, "pre-count", "`KEY=TARGET`: trait KEY is the count before treatment of trait or series TARGET")
			fs.StringVar(&o.title, "title", "", "trial title")
			fs.StringVar(&o.crop, "crop", "", "crop (maize, soybean, wheat, barley, oats get moisture defaults)")
			fs.StringVar(&o.season, "season", "", "season, for example 2026")
			fs.StringVar(&o.site, "site", "", "site name")
			fs.Float64Var(&o.layout.PlotLength, "plot-length", d.PlotLength, "plot length, m")
			fs.Float64Var(&o.layout.PlotWidth, "plot-width", d.PlotWidth, "plot width, m")
			fs.Float64Var(&o.layout.HarvestLength, "harvest-length", d.HarvestLength, "harvested length, m")
			fs.Float64Var(&o.layout.HarvestWidth, "harvest-width", d.HarvestWidth, "harvested width, m")
			fs.Float64Var(&o.layout.Alley, "alley", d.Alley, "alley width, m")
			fs.IntVar(&o.layout.PlotsPerRow, "plots-per-row", d.PlotsPerRow, "plots per field row within a block (0: the whole block in one row)")
			fs.StringVar(&o.blocks, "blocks", string(d.Blocks), "blocks side-by-side or stacked")
			fs.StringVar(&o.numbering, "numbering", string(d.Numbering), "plot numbers by-block (101, 102, ...) or sequential")
			fs.StringVar(&o.walk, "walk", string(d.Walk), "walking order serpentine or straight")
			fs.BoolVar(&o.demo, "demo", false, "write the built-in demo trial")
			fs.BoolVar(&o.force, "force", false, "replace FILE if it exists")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) > 0 {
					return usagef("new: unexpected argument %q", args[0])
				}
				return runNew(ctx, *o)
			}
		},
	})
}

// runNew creates, randomises and saves a new trial (or the demo trial).
func runNew(ctx context.Context, o newOptions) error {
	env := o.env
	if o.out == "" {
		return usagef("new: say where to write the trial with -o FILE")
	}
	if !o.force {
		if _, err := os.Stat(o.out); err == nil {
			return fmt.Errorf("%s already exists; choose another name or add --force to replace it", o.out)
		}
	}
	if o.demo {
		t, err := sampledata.Trial()
		if err != nil {
			return err
		}
		if err := trialfile.Save(o.out, t); err != nil {
			return err
		}
		fmt.Fprintf(env.Stdout, "wrote the demo trial %q to %s\n", t.Title, o.out)
		return nil
	}
	t, err := buildNew(&o)
	if err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	if err := trialfile.Save(o.out, t); err != nil {
		return err
	}
	s := t.Summary()
	fmt.Fprintf(env.Stdout, "wrote %s: %s, %d treatments, %d plots, seed %d\n",
		o.out, t.Design.Describe(), s.Treatments, s.Plots, t.Random.Seed)
	return nil
}

func buildNew(o *newOptions) (*trial.Trial, error) {
	kind, ok := trial.ParseDesignKind(o.design)
	if !ok {
		return nil, usagef("new: --design must be %s, not %q", designChoices(), o.design)
	}
	factors, design, err := factorPlan(o, kind)
	if err != nil {
		return nil, err
	}
	var trts []trial.Treatment
	if factors == nil {
		if o.treatments == "" {
			return nil, usagef("new: say which treatments with --treatments N or --treatments A,B,C (or give factors with --factor)")
		}
		trts, err = parseTreatments(o.treatments)
		if err != nil {
			return nil, err
		}
		if err := applyRates(trts, o.rates, o.rateUnit); err != nil {
			return nil, err
		}
	}
	if o.reps == 0 && kind != trial.Latin {
		return nil, usagef("new: say how many replicates with --reps N")
	}
	var seed uint64
	if o.seed == "" {
		seed = trial.NewSeed()
	} else {
		seed, err = strconv.ParseUint(o.seed, 10, 64)
		if err != nil {
			return nil, usagef("new: --seed must be a whole number, not %q", o.seed)
		}
	}
	traits, err := parseTraits(o.traits)
	if err != nil {
		return nil, err
	}
	if traits, err = applyCropProtection(o, trts, traits); err != nil {
		return nil, err
	}
	if o.yieldFrom != "" {
		parts := strings.Split(o.yieldFrom, ",")
		if len(parts) != 2 {
			return nil, usagef("new: --yield-from needs two trait keys, WEIGHT,MOISTURE")
		}
		w, m := strings.TrimSpace(parts[0]), strings.TrimSpace(parts[1])
		for _, k := range []string{w, m} {
			if !hasTrait(traits, k) {
				return nil, usagef("new: --yield-from names %q, which is not in --traits", k)
			}
		}
		if hasTrait(traits, "yield") {
			return nil, usagef("new: --yield-from adds a trait named yield; --traits has one already")
		}
		y := trial.AdjustedYieldTrait("yield", w, m, o.crop, trial.UnitTHa)
		if _, ok := trial.LookupCrop(o.crop); !ok {
			return nil, usagef("new: --yield-from needs a crop with a standard moisture (maize, soybean, wheat, barley, oats); give --crop")
		}
		traits = append(traits, y)
	}
	l := o.layout
	l.Blocks = trial.BlockArrangement(o.blocks)
	l.Numbering = trial.Numbering(o.numbering)
	l.Walk = trial.Walk(o.walk)
	title := o.title
	if title == "" {
		title = "New trial"
	}
	return trial.New(trial.NewOptions{
		Title:      title,
		Crop:       o.crop,
		Season:     o.season,
		Site:       trial.Site{Name: o.site},
		Treatments: trts,
		Factors:    factors,
		Design:     design,
		Layout:     l,
		Traits:     traits,
		Seed:       seed,
	})
}

func hasTrait(ts []trial.Trait, key string) bool {
	for _, t := range ts {
		if t.Key == key {
			return true
		}
	}
	return false
}

// parseTreatments reads "N" or "CODE[=NAME][*],...".
func parseTreatments(s string) ([]trial.Treatment, error) {
	if n, err := strconv.Atoi(strings.TrimSpace(s)); err == nil {
		if n < 2 || n > 2000 {
			return nil, usagef("new: --treatments must be between 2 and 2000, not %d", n)
		}
		width := len(strconv.Itoa(n))
		if width < 2 {
			width = 2
		}
		out := make([]trial.Treatment, n)
		for i := range out {
			out[i] = trial.Treatment{
				Code: fmt.Sprintf("T%0*d", width, i+1),
				Name: fmt.Sprintf("Treatment %d", i+1),
				Role: trial.RoleEntry,
			}
		}
		return out, nil
	}
	var out []trial.Treatment
	for _, part := range strings.Split(s, ",") {
		part = strings.TrimSpace(part)
		if part == "" {
			continue
		}
		tr := trial.Treatment{Role: trial.RoleEntry}
		code, name, hasName := strings.Cut(part, "=")
		code = strings.TrimSpace(code)
		if strings.HasSuffix(code, "*") {
			tr.Role = trial.RoleCheck
			code = strings.TrimSuffix(code, "*")
		}
		if hasName {
			name = strings.TrimSpace(name)
			if strings.HasSuffix(name, "*") {
				tr.Role = trial.RoleCheck
				name = strings.TrimSpace(strings.TrimSuffix(name, "*"))
			}
		} else {
			name = code
		}
		if err := trial.CheckCode(code); err != nil {
			return nil, usagef("new: %v", err)
		}
		tr.Code, tr.Name = code, name
		out = append(out, tr)
	}
	return out, nil
}

// parseTraits reads "KEY[:UNIT],...".
func parseTraits(s string) ([]trial.Trait, error) {
	var out []trial.Trait
	for _, part := range strings.Split(s, ",") {
		part = strings.TrimSpace(part)
		if part == "" {
			continue
		}
		key, unit, _ := strings.Cut(part, ":")
		key = strings.TrimSpace(key)
		if err := trial.CheckTraitKey(key); err != nil {
			return nil, usagef("new: %v", err)
		}
		out = append(out, trial.Trait{
			Key: key, Name: key, Unit: strings.TrimSpace(unit),
			Kind: trial.Continuous, Decimals: 2, HigherBetter: true,
		})
	}
	return out, nil
}

// designChoices lists the --design values: "crd, rcbd or latin".
func designChoices() string {
	ks := trial.DesignKinds()
	names := make([]string, len(ks))
	for i, k := range ks {
		names[i] = k.CLIName()
	}
	return strings.Join(names[:len(names)-1], ", ") + " or " + names[len(names)-1]
}

// applyRates sets the treatments' rates from "--rates 0,50,,100" (an empty
// place: no rate) and their unit from --rate-unit.
func applyRates(trts []trial.Treatment, list, unit string) error {
	if list == "" {
		if unit != "" {
			return usagef("new: --rate-unit needs --rates")
		}
		return nil
	}
	parts := strings.Split(list, ",")
	if len(parts) != len(trts) {
		return usagef("new: --rates needs one place per treatment (%d), not %d", len(trts), len(parts))
	}
	for i, p := range parts {
		p = strings.TrimSpace(p)
		if p == "" {
			continue
		}
		v, err := trial.ParseNumber(p, trial.PointOnly) // the list is comma-separated
		if err != nil {
			return usagef("new: --rates: the rate of %s must be a number, not %q", trts[i].Code, p)
		}
		if v < 0 {
			return usagef("new: --rates: the rate of %s is negative (%s)", trts[i].Code, p)
		}
		trts[i].Rate = &v
		trts[i].RateUnit = strings.TrimSpace(unit)
	}
	return nil
}
