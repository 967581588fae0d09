package cli

import (
	"fmt"
	"io"
	"strings"

	"furlong/trial"
)

// designLine describes the design, with the factors' places in a split
// or strip plot: "split plot in randomised complete blocks, 3 blocks; N
// on main plots, V on subplots".
func designLine(t *trial.Trial) string {
	s := t.Design.Describe()
	if !t.Factorial() {
		return s
	}
	order := t.Design.FactorOrder(t.Factors)
	key := func(k int) string { return t.Factors[order[k]].Key }
	switch t.Design.Kind {
	case trial.SplitPlot:
		s += fmt.Sprintf("; %s on main plots, %s on subplots", key(0), key(1))
		if len(order) == 3 {
			s += fmt.Sprintf(", %s on sub-subplots", key(2))
		}
	case trial.StripPlot:
		s += fmt.Sprintf("; %s in horizontal strips (field rows), %s in vertical strips (field columns)", key(0), key(1))
	default:
		keys := make([]string, len(t.Factors))
		for i, f := range t.Factors {
			keys[i] = f.Key
		}
		s = "factorial (" + strings.Join(keys, " × ") + ") in a " + s
	}
	return s
}

// writeFactors lists a factorial trial's factors and their levels.
func writeFactors(w io.Writer, t *trial.Trial) {
	if !t.Factorial() {
		return
	}
	fmt.Fprintf(w, "\nFactors (%d):\n", len(t.Factors))
	for _, f := range t.Factors {
		levels := make([]string, len(f.Levels))
		for i, l := range f.Levels {
			levels[i] = l.Code
			if l.Name != "" && l.Name != l.Code {
				levels[i] += " (" + l.Name + ")"
			}
		}
		fmt.Fprintf(w, "  %-10s %-20s %s\n", f.Key, f.Label(), strings.Join(levels, ", "))
	}
}

// cellSep returns the separator printed left of cell (r, c) of the text
// map: "‖" between two plots of different main plots of a split plot, "|"
// otherwise.
func cellSep(t *trial.Trial, cell map[[2]int]trial.Plot, r, c int) string {
	if t.Design.Kind != trial.SplitPlot {
		return "|"
	}
	p, ok1 := cell[[2]int{r, c}]
	q, ok2 := cell[[2]int{r, c - 1}]
	if ok1 && ok2 && (p.Block != q.Block || p.MainPlot != q.MainPlot) {
		return "‖"
	}
	return "|"
}
