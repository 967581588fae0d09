package cli

import (
	"context"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"strconv"
	"strings"
	"text/tabwriter"
	"time"

	"furlong/export"
	"furlong/trial"
	"furlong/trial/trialfile"
)

func init() {
	register(&command{
		name:    "log",
		summary: "list, add or remove entries of a trial's log of operations (sowing, applications, assessments)",
		usage: `furlong log TRIAL
furlong log TRIAL --add sowing|application|assessment|harvest|other --date YYYY-MM-DD [--treatments A,B]
                [--product NAME] [--rate R --rate-unit UNIT] [--water L/HA] [--equipment TEXT]
                [--temp C] [--wind KM/H] [--wind-dir DIR] [--humidity %] [--stage S] [--scale NAME]
                [--by NAME] [--traits K1,K2] [--notes TEXT]
furlong log TRIAL --remove N`,
		details: `A trial's log records what was done, day by day: sowing, each application (the treatments it
went on, the product's name as you type it, its rate and unit as on the label, the water volume in
L/ha, the equipment, and the weather at application: air temperature in °C, wind speed in km/h
and direction, relative humidity in %), each assessment (the traits assessed, the growth stage on
the scale you name, for example --stage 31 --scale BBCH, and who assessed), harvest and any other
operation. With no --treatments an entry applies to the whole trial. The log is kept in date order,
printed by this command with numbers (--remove N takes entry N out), and goes into the season
report on its own sheet or page. Furlong records what was done; it never suggests a product or a
rate. The trial file is changed under its lock, and the previous file is kept as TRIAL.bak.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := logOptions{env: env}
			fs := flag.NewFlagSet("log", flag.ContinueOnError)
			fs.StringVar(&o.add, "add", "", "add an entry of this `kind`: sowing, application, assessment, harvest or other")
			fs.IntVar(&o.remove, "remove", 0, "remove entry `N` of the log (as numbered in the listing)")
			fs.StringVar(&o.date, "date", "", "the day of the operation, `YYYY-MM-DD`")
			fs.StringVar(&o.treatments, "treatments", "", "the treatment `codes` it went on, comma-separated (default: the whole trial)")
			fs.StringVar(&o.product, "product", "", "the product's `name` as on its label")
			fs.StringVar(&o.rate, "rate", "", "the rate applied, a number (give --rate-unit)")
			fs.StringVar(&o.rateUnit, "rate-unit", "", "the rate's `unit` as on the label, for example L/ha")
			fs.StringVar(&o.water, "water", "", "the water volume in L/ha")
			fs.StringVar(&o.equipment, "equipment", "", "the equipment used")
			fs.StringVar(&o.temp, "temp", "", "air temperature in °C")
			fs.StringVar(&o.wind, "wind", "", "wind speed in km/h")
			fs.StringVar(&o.windDir, "wind-dir", "", "wind direction, for example SW")
			fs.StringVar(&o.humidity, "humidity", "", "relative humidity in %")
			fs.StringVar(&o.stage, "stage", "", "the crop's growth stage")
			fs.StringVar(&o.scale, "scale", "", "the `name` of the growth-stage scale, for example BBCH")
			fs.StringVar(&o.by, "by", "", "who applied or assessed")
			fs.StringVar(&o.traits, "traits", "", "the trait `keys` assessed, comma-separated")
			fs.StringVar(&o.notes, "notes", "", "notes")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("log: give one trial file")
				}
				o.trial = args[0]
				return runLog(ctx, o)
			}
		},
	})
}

type logOptions struct {
	env                                             Env
	trial, add, date, treatments, product, rate     string
	rateUnit, water, equipment, temp, wind, windDir string
	humidity, stage, scale, by, traits, notes       string
	remove                                          int
}

// operation reads the entry the flags describe.
func (o logOptions) operation() (trial.Operation, error) {
	op := trial.Operation{Kind: trial.OperationKind(strings.ToLower(strings.TrimSpace(o.add))),
		Product: strings.TrimSpace(o.product), RateUnit: strings.TrimSpace(o.rateUnit), Equipment: strings.TrimSpace(o.equipment),
		WindDirection: strings.TrimSpace(o.windDir), GrowthStage: strings.TrimSpace(o.stage), Scale: strings.TrimSpace(o.scale),
		Assessor: strings.TrimSpace(o.by), Notes: strings.TrimSpace(o.notes)}
	if o.date == "" {
		return op, usagef("log: give the day of the operation with --date YYYY-MM-DD")
	}
	d, err := time.Parse("2006-01-02", strings.TrimSpace(o.date))
	if err != nil {
		return op, usagef("log: --date %q is not a day; write it as YYYY-MM-DD, for example 2026-05-14", o.date)
	}
	op.Date = d
	op.Treatments = splitComma(o.treatments)
	op.Traits = splitComma(o.traits)
	for _, n := range []struct {
		flag, v string
		to      **float64
	}{{"--rate", o.rate, &op.Rate}, {"--water", o.water, &op.WaterVolume}, {"--temp", o.temp, &op.Temperature},
		{"--wind", o.wind, &op.Wind}, {"--humidity", o.humidity, &op.Humidity}} {
		if strings.TrimSpace(n.v) == "" {
			continue
		}
		v, err := strconv.ParseFloat(strings.TrimSpace(n.v), 64)
		if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
			return op, usagef("log: %s %q is not a number", n.flag, n.v)
		}
		*n.to = &v
	}
	return op, nil
}

func splitComma(s string) []string {
	var out []string
	for _, p := range strings.Split(s, ",") {
		if p = strings.TrimSpace(p); p != "" {
			out = append(out, p)
		}
	}
	return out
}

// runLog changes the log of o.trial when asked, and lists it.
func runLog(ctx context.Context, o logOptions) error {
	if o.add != "" && o.remove != 0 {
		return usagef("log: give --add or --remove, not both")
	}
	if o.add == "" && o.remove == 0 {
		for _, v := range []string{o.date, o.treatments, o.product, o.rate, o.rateUnit, o.water, o.equipment, o.temp, o.wind, o.windDir, o.humidity, o.stage, o.scale, o.by, o.traits, o.notes} {
			if v != "" {
				return usagef("log: the details of an entry go with --add KIND")
			}
		}
		t, err := trialfile.Load(o.trial)
		if err != nil {
			return err
		}
		writeLogText(o.env.Stdout, t)
		return nil
	}
	var op trial.Operation
	if o.add != "" {
		var err error
		if op, err = o.operation(); err != nil {
			return err
		}
	}
	if _, err := os.Stat(o.trial); err != nil {
		return err
	}
	warnOpen(o.env, o.trial)
	var t *trial.Trial
	err := trialfile.Update(ctx, o.trial, func(tr *trial.Trial) error {
		var err error
		if o.add != "" {
			err = tr.AddOperation(op)
		} else {
			err = tr.RemoveOperation(o.remove - 1)
		}
		if err != nil {
			return &ExitError{Code: ExitFailure, Msg: "nothing was changed: " + err.Error()}
		}
		touch(tr)
		t = tr
		return nil
	})
	if err != nil {
		return err
	}
	fmt.Fprintf(o.env.Stdout, "saved %s (the previous file is kept as %s.bak)\n", o.trial, o.trial)
	writeLogText(o.env.Stdout, t)
	return nil
}

// writeLogText prints the log, numbered, with the cautions when it holds
// an application.
func writeLogText(w io.Writer, t *trial.Trial) {
	if len(t.Operations) == 0 {
		fmt.Fprintln(w, "the trial's log of operations is empty; add an entry with --add KIND --date YYYY-MM-DD")
		return
	}
	fmt.Fprintf(w, "Log of operations (%d):\n", len(t.Operations))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "#\tdate\tkind\ttreatments\tdetails\t")
	sprayed := false
	for i, op := range t.Operations {
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\t\n", i+1, op.Date.Format("2006-01-02"), op.Kind, op.TreatmentsText(), export.OperationDetails(op))
		sprayed = sprayed || op.Kind == trial.OpApplication
	}
	tw.Flush()
	if sprayed {
		fmt.Fprintf(w, "Caution: %s\n", export.ProtectionCautionText())
	}
}
