package fieldbook

import (
	"strconv"
	"strings"

	"furlong/trial"
)

// Columns of a field book of a split or strip plot, after the factor
// columns (see DesignColumns).
const (
	// ColMainPlot holds a plot's main plot within its block (a strip
	// plot: its horizontal strip).
	ColMainPlot = "main_plot"
	// ColSubPlot holds a split-split plot's subplot within its main plot.
	ColSubPlot = "sub_plot"
	// ColStrip holds a strip plot's vertical strip within its block.
	ColStrip = "strip"
)

// DesignColumns returns the columns a trial's field book has between
// treatment_name and the traits: for a factorial trial one column per
// factor, headed by its key and holding the plot's level code; then, for
// a split or strip plot, main_plot; for a split-split plot sub_plot; for a
// strip plot strip. A trial with one list of treatments has none, so its
// book keeps the header it always had.
func DesignColumns(t *trial.Trial) []string {
	var out []string
	for _, f := range t.Factors {
		out = append(out, f.Key)
	}
	return append(out, unitColumns(t)...)
}

// unitColumns are the main-plot, subplot and strip columns of t's design.
func unitColumns(t *trial.Trial) []string {
	switch {
	case t.Design.Kind == trial.SplitPlot && t.SplitSplit():
		return []string{ColMainPlot, ColSubPlot}
	case t.Design.Kind == trial.SplitPlot:
		return []string{ColMainPlot}
	case t.Design.Kind == trial.StripPlot:
		return []string{ColMainPlot, ColStrip}
	}
	return nil
}

// unitNumber is plot p's number in a unit column.
func unitNumber(p trial.Plot, col string) int {
	switch col {
	case ColMainPlot:
		return p.MainPlot
	case ColSubPlot:
		return p.SubPlot
	case ColStrip:
		return p.Strip
	}
	return 0
}

// DesignCells returns plot p's cells of DesignColumns: its level code of
// every factor, then its main plot (subplot, strip) number.
func DesignCells(t *trial.Trial, p trial.Plot) []string {
	var out []string
	if len(t.Factors) > 0 {
		tr := t.Treatment(p.Treatment)
		for f := range t.Factors {
			code := ""
			if tr != nil && f < len(tr.Levels) {
				code = tr.Levels[f]
			}
			out = append(out, code)
		}
	}
	for _, c := range unitColumns(t) {
		out = append(out, strconv.Itoa(unitNumber(p, c)))
	}
	return out
}

// designColumn finds the factor a heading names (its key, in any case),
// or reports that it is a main-plot, subplot or strip column of t's
// design: factor −1 and the column name.
func designColumn(t *trial.Trial, name string) (factor int, unit string, ok bool) {
	for i, f := range t.Factors {
		if strings.EqualFold(f.Key, name) {
			return i, "", true
		}
	}
	lower := strings.ToLower(name)
	for _, c := range unitColumns(t) {
		if c == lower {
			return -1, c, true
		}
	}
	return -1, "", false
}
