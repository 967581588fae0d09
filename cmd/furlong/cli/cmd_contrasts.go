package cli

import (
	"context"
	"flag"
	"fmt"
	"os"
	"strings"

	"furlong/trial"
	"furlong/trial/trialfile"
)

func init() {
	register(&command{
		name:    "contrasts",
		summary: "list, add or remove the planned comparisons saved in a trial",
		usage:   `furlong contrasts TRIAL [--add "NAME=A,B vs C"]... [--remove NAME]... [--adjust none|bonferroni|holm|scheffe]`,
		details: `Lists the contrasts (planned comparisons) saved in a trial file, after adding or removing any
given. --add "NAME=A,B vs C" saves the comparison of the mean of A and B with the mean of C;
--add "NAME=A:1,B:1,C:-2" saves coefficients (the others 0; they must add up to 0); an --add of a
name already saved replaces it. --remove NAME removes one. The treatments named must be the
trial's. --adjust saves how their p-values are adjusted together (none, bonferroni, holm, or
scheffe for contrasts chosen after looking at the data). Saved contrasts are estimated by 'furlong
analyze', in the season report and in the window's Compare step, for every trait, with the saved
adjustment unless --adjust there says otherwise. The trial file is changed under its lock (as 'furlong
import' does), and the previous file is kept as TRIAL.bak.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := contrastsOptions{env: env}
			fs := flag.NewFlagSet("contrasts", flag.ContinueOnError)
			fs.Var(&o.add, "add", "save a contrast: \"NAME=A,B vs C\" or \"NAME=A:1,B:1,C:-2\" (repeatable)")
			fs.Var(&o.remove, "remove", "remove the saved contrast of this `name` (repeatable)")
			fs.StringVar(&o.adjust, "adjust", "", "save the adjustment of the contrasts' p-values: none, bonferroni, holm or scheffe")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("contrasts: give one trial file")
				}
				o.trial = args[0]
				return runContrasts(ctx, o)
			}
		},
	})
}

type contrastsOptions struct {
	env         Env
	trial       string
	add, remove stringList
	adjust      string
}

// runContrasts changes the saved contrasts of o.trial (when asked) and
// lists them.
func runContrasts(ctx context.Context, o contrastsOptions) error {
	add, err := parseContrastValues("contrasts", "--add", o.add)
	if err != nil {
		return err
	}
	if msg := trial.AdjustProblem(strings.ToLower(o.adjust)); msg != "" {
		return usagef("contrasts: --adjust: %s", msg)
	}
	var saved []trial.Contrast
	adjust := ""
	if len(add) == 0 && len(o.remove) == 0 && o.adjust == "" {
		t, err := trialfile.Load(o.trial)
		if err != nil {
			return err
		}
		saved, adjust = t.Analysis.Contrasts, t.Analysis.ContrastAdjust
	} else {
		if _, err := os.Stat(o.trial); err != nil {
			return err
		}
		warnOpen(o.env, o.trial)
		err = trialfile.Update(ctx, o.trial, func(t *trial.Trial) error {
			for _, name := range o.remove {
				if err := t.RemoveContrast(name); err != nil {
					return &ExitError{Code: ExitFailure, Msg: "nothing was changed: " + err.Error()}
				}
			}
			for _, c := range add {
				if err := t.SetContrast(c); err != nil {
					return &ExitError{Code: ExitFailure, Msg: "nothing was changed: " + err.Error()}
				}
			}
			if o.adjust != "" {
				t.Analysis.ContrastAdjust = strings.ToLower(o.adjust)
			}
			touch(t)
			saved, adjust = t.Analysis.Contrasts, t.Analysis.ContrastAdjust
			return nil
		})
		if err != nil {
			return err
		}
		fmt.Fprintf(o.env.Stdout, "saved %s (the previous file is kept as %s.bak)\n", o.trial, o.trial)
	}
	if len(saved) == 0 {
		fmt.Fprintln(o.env.Stdout, "the trial has no saved contrasts; add one with --add \"NAME=A,B vs C\"")
		return nil
	}
	if len(saved) == 1 {
		fmt.Fprintln(o.env.Stdout, "1 saved contrast:")
	} else {
		fmt.Fprintf(o.env.Stdout, "%d saved contrasts:\n", len(saved))
	}
	for _, c := range saved {
		fmt.Fprintf(o.env.Stdout, "  %s\n", c.String())
	}
	if adjust != "" && adjust != trial.AdjustNone {
		fmt.Fprintf(o.env.Stdout, "p-values adjusted together: %s\n", adjust)
	}
	return nil
}
