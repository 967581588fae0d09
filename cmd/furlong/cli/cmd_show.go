package cli

import (
	"context"
	"flag"
	"fmt"
	"io"
	"sort"
	"strings"

	"furlong/trial"
	"furlong/trial/trialfile"
)

func init() {
	register(&command{
		name:    "show",
		summary: "print a trial's summary and field map as text",
		usage:   "furlong show TRIAL",
		details: `Prints the trial's details, treatments, traits with how much data is entered, excluded plots,
and the field map block by block: each cell is a plot number and its treatment code.
Field row 1 is printed at the bottom and column 1 at the left, as on the printed map.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			fs := flag.NewFlagSet("show", flag.ContinueOnError)
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("show: give one trial file")
				}
				return runShow(ctx, showOptions{env: env, trial: args[0]})
			}
		},
	})
}

// showOptions are the choices of 'furlong show'.
type showOptions struct {
	env   Env
	trial string
}

// runShow prints the summary and text field map of o.trial.
func runShow(ctx context.Context, o showOptions) error {
	t, err := trialfile.Load(o.trial)
	if err != nil {
		return err
	}
	return writeShow(ctx, o.env.Stdout, t)
}

func writeShow(ctx context.Context, w io.Writer, t *trial.Trial) error {
	s := t.Summary()
	fmt.Fprintln(w, t.Title)
	fmt.Fprintln(w, strings.Repeat("=", len([]rune(t.Title))))
	line := func(label, v string) {
		if v != "" {
			fmt.Fprintf(w, "%-14s %s\n", label+":", v)
		}
	}
	line("Crop", t.Crop)
	line("Season", t.Season)
	line("Site", t.Site.Name)
	if t.Site.Latitude != nil && t.Site.Longitude != nil {
		line("Coordinates", fmt.Sprintf("%.5f, %.5f", *t.Site.Latitude, *t.Site.Longitude))
	}
	line("Soil", t.Site.Soil)
	line("Previous crop", t.Site.PreviousCrop)
	line("Investigator", t.Investigator)
	line("Objective", t.Objective)
	line("Design", designLine(t))
	l := t.Layout
	line("Plot", fmt.Sprintf("%g × %g m, harvested %.4g m², alley %g m", l.PlotLength, l.PlotWidth, l.HarvestedArea(), l.Alley))
	var arrangement string
	switch t.Design.Kind {
	case trial.CRD:
		arrangement = "in one randomised group"
	case trial.Latin:
		arrangement = fmt.Sprintf("in %d rows × %d columns", len(t.Treatments), len(t.Treatments))
	default:
		arrangement = fmt.Sprintf("in %d blocks", s.Blocks)
	}
	line("Plots", fmt.Sprintf("%d %s, numbered %s, walked %s", s.Plots, arrangement, l.Numbering, l.Walk))
	if t.Randomized() {
		line("Randomised", fmt.Sprintf("seed %d (%s) on %s", t.Random.Seed, t.Random.Method, t.Random.Done.Format("2 Jan 2006")))
	} else {
		line("Randomised", "not yet")
	}
	line("Notes", t.Notes)
	if n := len(t.Operations); n > 0 {
		line("Log", fmt.Sprintf("%d operations, %s to %s ('furlong log' lists them)", n,
			t.Operations[0].Date.Format("2 Jan 2006"), t.Operations[n-1].Date.Format("2 Jan 2006")))
	}

	checks := "no check"
	switch {
	case s.Checks == 1:
		checks = "1 check"
	case s.Checks > 1:
		checks = fmt.Sprintf("%d checks", s.Checks)
	}
	writeFactors(w, t)
	fmt.Fprintf(w, "\nTreatments (%d, %s):\n", s.Treatments, checks)
	for _, tr := range t.Treatments {
		role := ""
		if tr.Role == trial.RoleCheck {
			role = "check"
		}
		if tr.Role == trial.RoleUntreated {
			role = "untreated check"
		}
		fmt.Fprintln(w, strings.TrimRight(fmt.Sprintf("  %-12s %-30s %s", tr.Code, tr.Name, role), " "))
	}

	if len(t.Traits) > 0 {
		fmt.Fprintf(w, "\nTraits (%.0f%% of recorded values entered):\n", s.PercentEntered)
		for i, tr := range t.Traits {
			unit := ""
			if tr.Unit != "" {
				unit = " (" + tr.Unit + ")"
			}
			state := ""
			if note := seriesNote(t, &tr); note != "" { // cmd_show_series.go
				state = note
			} else if tr.Derived != nil {
				state = "derived from " + tr.Derived.WeightTrait + " and " + tr.Derived.MoistureTrait
			} else if i < len(s.Traits) {
				ts := s.Traits[i]
				state = fmt.Sprintf("%d of %d plots entered", ts.Entered, s.Plots)
			}
			fmt.Fprintln(w, strings.TrimRight(fmt.Sprintf("  %-10s %-30s %s", tr.Key, tr.Name+unit, state), " "))
		}
	}
	var excl []string
	for _, p := range t.Plots {
		for _, e := range p.Exclusions {
			what := "all traits"
			if e.Trait != "" {
				what = e.Trait
			}
			excl = append(excl, fmt.Sprintf("  plot %d (%s): %s", p.Number, what, e.Reason))
		}
	}
	if len(excl) > 0 {
		fmt.Fprintln(w, "\nExcluded from analysis:")
		fmt.Fprintln(w, strings.Join(excl, "\n"))
	}
	fmt.Fprintln(w)
	return writeTextMap(ctx, w, t)
}

// writeTextMap prints each block's plots as a grid, field row 1 at the bottom.
// Blocks are printed in the order they lie in the field, the top of the field
// first and left before right, so that the whole map reads like the field.
//
// It stops when ctx is done (a huge grid takes long) and returns ctx's error.
func writeTextMap(ctx context.Context, w io.Writer, t *trial.Trial) error {
	byBlock := map[int][]trial.Plot{}
	width := 0
	maxCol := 0
	for _, p := range t.Plots {
		byBlock[p.Block] = append(byBlock[p.Block], p)
		width = max(width, len([]rune(fmt.Sprintf("%d %s", p.Number, p.Treatment))))
		maxCol = max(maxCol, p.Column)
	}
	// The column labels under the grid must fit in a cell too.
	width = max(width, len(fmt.Sprintf("col %d", maxCol)))
	blocks := make([]int, 0, len(byBlock))
	for b := range byBlock {
		blocks = append(blocks, b)
	}
	label := "Block"
	if t.Design.Kind == trial.Latin || t.Design.Kind == trial.CRD {
		// A Latin square or a CRD is one grid; its rows are the field rows.
		label = ""
		blocks = []int{0}
		byBlock = map[int][]trial.Plot{0: t.Plots}
	}
	top := func(b int) (maxRow, minCol int) {
		maxRow, minCol = byBlock[b][0].Row, byBlock[b][0].Column
		for _, p := range byBlock[b] {
			maxRow, minCol = max(maxRow, p.Row), min(minCol, p.Column)
		}
		return maxRow, minCol
	}
	sort.Slice(blocks, func(i, j int) bool {
		ri, ci := top(blocks[i])
		rj, cj := top(blocks[j])
		if ri != rj {
			return ri > rj
		}
		if ci != cj {
			return ci < cj
		}
		return blocks[i] < blocks[j]
	})
	fmt.Fprintln(w, "Field map (plot number and treatment; field row 1 at the bottom, column 1 at the left):")
	for _, b := range blocks {
		plots := byBlock[b]
		minR, maxR, minC, maxC := plots[0].Row, plots[0].Row, plots[0].Column, plots[0].Column
		cell := map[[2]int]trial.Plot{}
		for _, p := range plots {
			minR, maxR = min(minR, p.Row), max(maxR, p.Row)
			minC, maxC = min(minC, p.Column), max(maxC, p.Column)
			cell[[2]int{p.Row, p.Column}] = p
		}
		switch {
		case t.Design.Kind == trial.Latin:
			fmt.Fprintln(w, "\nSquare")
		case label != "":
			fmt.Fprintf(w, "\n%s %d\n", label, b)
		default:
			fmt.Fprintln(w)
		}
		for r := maxR; r >= minR; r-- {
			if err := ctx.Err(); err != nil {
				return err
			}
			fmt.Fprintf(w, "  row %3d ", r)
			for c := minC; c <= maxC; c++ {
				if (c-minC)%1024 == 1023 && ctx.Err() != nil {
					return ctx.Err()
				}
				p, ok := cell[[2]int{r, c}]
				txt := ""
				if ok {
					txt = fmt.Sprintf("%d %s", p.Number, p.Treatment)
				}
				fmt.Fprintf(w, "%s %-*s ", cellSep(t, cell, r, c), width, txt)
			}
			fmt.Fprintln(w, "|")
		}
		var cols strings.Builder
		fmt.Fprintf(&cols, "  %9s", "")
		for c := minC; c <= maxC; c++ {
			fmt.Fprintf(&cols, " %-*s  ", width, fmt.Sprintf("col %d", c))
		}
		fmt.Fprintln(w, strings.TrimRight(cols.String(), " "))
	}
	return nil
}
