package cli

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"strconv"
	"strings"

	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// planOptions are the flags of "furlong plan".
type planOptions struct {
	Out        io.Writer
	Design     string
	Treatments int
	Reps       int     // 0 when --difference is given instead
	Difference float64 // percent of the mean; 0 when --reps is given
	CV         float64 // percent; 0 when CVFrom is given
	CVFrom     string  // a trial file whose analysed CV% is used
	Trait      string  // the trait of CVFrom (default: the first with a result)
	Alpha      float64
	Power      float64
	Spread     string // expected treatment means, percent of the mean, for the F test's power
	Format     string
}

// planMaxReps is the most replicates "plan" looks at for --difference.
const planMaxReps = trial.MaxReps

func init() {
	register(&command{
		name:    "plan",
		summary: "replicates needed, or the difference a design can detect",
		usage:   `furlong plan --design crd|rcbd|latin --treatments N (--reps N | --difference PERCENT) (--cv PERCENT | --cv-from TRIAL [--trait KEY]) [--alpha A] [--power P] [--spread M,M,...] [--format text|json]`,
		details: `Plans the size of a trial from the variability expected (the CV%: error standard deviation as a
percent of the mean, typed with --cv or taken from the analysis of an existing trial with --cv-from).

With --reps: the smallest true difference between two treatment means, as percent of the mean, that a
two-sided t test at level --alpha on the design's error degrees of freedom detects with probability
--power (noncentral t, both tails).
With --difference: the fewest replicates (2 to 50) that detect that difference, and the detectable
difference they give.
--spread gives the expected treatment means as percent of the mean (for example 95,100,100,108; one per
treatment): the power of the ANOVA F test for that spread is added (noncentral F).

A plan rests on the CV guessed for next season; a CV from one site-year may not repeat.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := planOptions{Out: env.Stdout}
			fs := flag.NewFlagSet("plan", flag.ContinueOnError)
			fs.StringVar(&o.Design, "design", "rcbd", "design: crd, rcbd or latin")
			fs.IntVar(&o.Treatments, "treatments", 0, "number of treatments (required)")
			fs.IntVar(&o.Reps, "reps", 0, "replicates (blocks): give the detectable difference")
			fs.Float64Var(&o.Difference, "difference", 0, "difference to detect, `percent` of the mean: give the replicates needed")
			fs.Float64Var(&o.CV, "cv", 0, "expected coefficient of variation, `percent`")
			fs.StringVar(&o.CVFrom, "cv-from", "", "take the CV% from the analysis of this trial `file`")
			fs.StringVar(&o.Trait, "trait", "", "with --cv-from: the trait whose CV% is used (default: the first analysed)")
			fs.Float64Var(&o.Alpha, "alpha", 0.05, "significance level of the two-sided test")
			fs.Float64Var(&o.Power, "power", 0.8, "probability of detecting the difference")
			fs.StringVar(&o.Spread, "spread", "", "expected treatment means, percent of the mean, comma-separated `list`")
			fs.StringVar(&o.Format, "format", "text", "output: text or json")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 0 {
					return usagef("plan: takes no file arguments (use --cv-from for a trial's CV)")
				}
				return runPlan(ctx, o)
			}
		},
	})
}

// planResult is what "plan" reports; its JSON keys are part of the CLI's
// contract (README, "furlong plan").
type planResult struct {
	Design     string   `json:"design"`
	Treatments int      `json:"treatments"`
	Reps       int      `json:"reps"`
	CV         float64  `json:"cv_percent"`
	CVSource   string   `json:"cv_source"`
	Alpha      float64  `json:"alpha"`
	Power      float64  `json:"power"`
	DFError    int      `json:"df_error"`
	Detectable float64  `json:"detectable_percent"`
	Target     *float64 `json:"target_percent,omitempty"`
	RepsNeeded *int     `json:"reps_needed,omitempty"`
	// Curve is the detectable difference for each number of replicates
	// from 2 (or the design's fixed number) up to a few past the plan.
	Curve []planPoint `json:"by_reps"`
	F     *planF      `json:"f_test,omitempty"`
	Note  string      `json:"note"`
}

type planPoint struct {
	Reps       int     `json:"reps"`
	DFError    int     `json:"df_error"`
	Detectable float64 `json:"detectable_percent"`
}

type planF struct {
	Means  []float64 `json:"means_percent"`
	Lambda float64   `json:"noncentrality"`
	Power  float64   `json:"power"`
}

const planNote = "A plan rests on the CV expected next season; a CV from one site-year may not repeat."

func runPlan(ctx context.Context, o planOptions) error {
	kind := trial.DesignKind(strings.ToLower(strings.TrimSpace(o.Design)))
	switch kind {
	case trial.CRD, trial.RCBD, trial.Latin:
	default:
		return usagef("plan: --design must be crd, rcbd or latin, not %q", o.Design)
	}
	if o.Format != "text" && o.Format != "json" {
		return usagef("plan: --format must be text or json, not %q", o.Format)
	}
	if o.Treatments < 2 {
		return usagef("plan: give --treatments, 2 or more")
	}
	if kind == trial.Latin && o.Reps == 0 && o.Difference == 0 {
		o.Reps = o.Treatments
	}
	switch {
	case o.Reps != 0 && o.Difference != 0:
		return usagef("plan: give either --reps or --difference, not both")
	case o.Reps == 0 && o.Difference == 0:
		return usagef("plan: give --reps N (for the detectable difference) or --difference PERCENT (for the replicates needed)")
	case o.Difference < 0:
		return usagef("plan: --difference must be a percentage greater than 0")
	}
	if (o.CV != 0) == (o.CVFrom != "") {
		return usagef("plan: give either --cv PERCENT or --cv-from TRIAL")
	}
	res := planResult{Design: string(kind), Treatments: o.Treatments, Alpha: o.Alpha, Power: o.Power, Note: planNote}
	res.CV, res.CVSource = o.CV, "typed"
	if o.CVFrom != "" {
		cv, src, err := trialCV(ctx, o.CVFrom, o.Trait)
		if err != nil {
			return err
		}
		res.CV, res.CVSource = cv, src
	}
	dfOf := func(r int) float64 {
		df, err := trial.PlannedErrorDF(kind, o.Treatments, r)
		if err != nil {
			return 0
		}
		return float64(df)
	}
	reps := o.Reps
	if o.Difference > 0 {
		if kind == trial.Latin {
			return usagef("plan: a Latin square has as many replicates as treatments; use --reps with --design latin")
		}
		r, _, err := stats.RepsNeeded(o.Difference, res.CV, o.Alpha, o.Power, trial.MinReps, planMaxReps, dfOf)
		if errors.Is(err, stats.ErrTooManyReps) {
			return fmt.Errorf("%s replicates are not enough to detect %g%% with CV %.3g%%: %w", strconv.Itoa(planMaxReps), o.Difference, res.CV, err)
		}
		if err != nil {
			return err
		}
		reps = r
		target := o.Difference
		res.Target, res.RepsNeeded = &target, &r
	}
	df, err := trial.PlannedErrorDF(kind, o.Treatments, reps)
	if err != nil {
		return usagef("plan: %v", err)
	}
	in := stats.PowerInput{Reps: reps, DFError: float64(df), CV: res.CV, Alpha: o.Alpha}
	det, err := stats.DetectableDifference(in, o.Power)
	if err != nil {
		return err
	}
	res.Reps, res.DFError, res.Detectable = reps, df, det
	res.Curve, err = planCurve(ctx, kind, o.Treatments, reps, res.CV, o.Alpha, o.Power)
	if err != nil {
		return err
	}
	if o.Spread != "" {
		means, err := parseSpread(o.Spread, o.Treatments)
		if err != nil {
			return err
		}
		p, lambda, err := stats.FPower(means, reps, float64(df), res.CV, o.Alpha)
		if err != nil {
			return err
		}
		res.F = &planF{Means: means, Lambda: lambda, Power: p}
	}
	if o.Format == "json" {
		enc := json.NewEncoder(o.Out)
		enc.SetIndent("", "  ")
		return enc.Encode(res)
	}
	return writePlanText(o.Out, res)
}

// planCurve is the detectable difference by number of replicates, for the
// table (analysis.PlanCurve, which the window's chart draws too): from the
// design's smallest number to a few past the plan.
func planCurve(ctx context.Context, kind trial.DesignKind, treatments, reps int, cv, alpha, power float64) ([]planPoint, error) {
	pts, err := analysis.PlanCurve(ctx, kind, treatments, reps, cv, alpha, power)
	if err != nil {
		return nil, err
	}
	out := make([]planPoint, len(pts))
	for i, p := range pts {
		out[i] = planPoint{Reps: p.Reps, DFError: p.DFError, Detectable: p.Detectable}
	}
	return out, nil
}

func parseSpread(s string, treatments int) ([]float64, error) {
	parts := strings.Split(s, ",")
	if len(parts) != treatments {
		return nil, usagef("plan: --spread needs one expected mean per treatment (%d), not %d", treatments, len(parts))
	}
	out := make([]float64, len(parts))
	for i, p := range parts {
		v, err := trial.ParseNumber(p, trial.PointOnly) // the list is comma-separated
		if err != nil {
			return nil, usagef("plan: --spread value %q is not a number", strings.TrimSpace(p))
		}
		out[i] = v
	}
	return out, nil
}

// trialCV analyses a trial file's trait and returns its CV% with a
// description of where it came from.
func trialCV(ctx context.Context, path, key string) (float64, string, error) {
	t, err := trialfile.Load(path)
	if err != nil {
		return 0, "", err
	}
	var keys []string
	switch {
	case key != "":
		keys = []string{key}
	case t.Trait("yield") != nil:
		keys = []string{"yield"} // the trait a plan is usually made for
	}
	outcomes, err := analysis.AnalyzeAll(ctx, t, keys, analysis.Options{})
	if err != nil {
		return 0, "", err
	}
	var firstErr error
	for _, oc := range outcomes {
		if oc.Err != nil {
			if firstErr == nil {
				firstErr = oc.Err
			}
			continue
		}
		a := oc.Result.ANOVA
		if a == nil || !(a.CVPercent > 0) {
			continue
		}
		return a.CVPercent, fmt.Sprintf("trait %s of %s", oc.Key, path), nil
	}
	if firstErr != nil {
		return 0, "", fmt.Errorf("no CV%% can be taken from %s: %w", path, firstErr)
	}
	return 0, "", fmt.Errorf("no CV%% can be taken from %s: it has no analysed trait with data", path)
}

func writePlanText(w io.Writer, r planResult) error {
	fmt.Fprintf(w, "Plan: %d treatments, %s\n", r.Treatments, trial.Design{Kind: trial.DesignKind(r.Design), Reps: r.Reps}.Describe())
	fmt.Fprintf(w, "CV %.3g%% (%s), two-sided test at α = %g, power %g\n\n", r.CV, r.CVSource, r.Alpha, r.Power)
	if r.RepsNeeded != nil {
		fmt.Fprintf(w, "To detect %g%% of the mean: %d replicates (error df %d), which detect %.1f%%.\n", *r.Target, *r.RepsNeeded, r.DFError, r.Detectable)
	} else {
		fmt.Fprintf(w, "With %d replicates (error df %d): differences of %.1f%% of the mean or more are detected.\n", r.Reps, r.DFError, r.Detectable)
	}
	if r.F != nil {
		fmt.Fprintf(w, "F test of the expected means %s: power %.3f (noncentrality %.3g).\n", joinFloats(r.F.Means), r.F.Power, r.F.Lambda)
	}
	if len(r.Curve) > 1 {
		fmt.Fprintf(w, "\n%8s  %8s  %s\n", "reps", "error df", "detectable %")
		for _, p := range r.Curve {
			mark := ""
			if p.Reps == r.Reps {
				mark = "  <"
			}
			fmt.Fprintf(w, "%8d  %8d  %12.1f%s\n", p.Reps, p.DFError, p.Detectable, mark)
		}
	}
	_, err := fmt.Fprintf(w, "\n%s\n", r.Note)
	return err
}

func joinFloats(v []float64) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.FormatFloat(x, 'g', -1, 64)
	}
	return strings.Join(s, ", ")
}
