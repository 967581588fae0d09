package ui

import (
	"fmt"

	"furlong/trial"
	"furlong/trial/fieldbook"
)

// colDesign is the kind of the grid's factor and main-plot columns (see
// recordStep.kind), after the fixed ones.
const colDesign = fixedCols + 1

// designHeader is the grid heading of a design column of the field book:
// a factor's label ("Nitrogen (N)"), or the main plot, subplot or strip.
func designHeader(t *trial.Trial, col string) string {
	if i := t.FactorIndex(col); i >= 0 {
		f := &t.Factors[i]
		if f.Name != "" && f.Name != f.Key {
			return f.Name + " (" + f.Key + ")"
		}
		return f.Key
	}
	switch col {
	case fieldbook.ColMainPlot:
		if t.Design.Kind == trial.StripPlot {
			return "Horizontal strip"
		}
		return "Main plot"
	case fieldbook.ColSubPlot:
		return "Subplot"
	case fieldbook.ColStrip:
		return "Vertical strip"
	}
	return col
}

// mainPlotWords places a plot of a split or strip plot in its block for
// a status line: " · main plot 2"; "" for the other designs.
func mainPlotWords(t *trial.Trial, p *trial.Plot) string {
	switch t.Design.Kind {
	case trial.SplitPlot:
		if p.SubPlot > 0 {
			return fmt.Sprintf(" · main plot %d, subplot %d", p.MainPlot, p.SubPlot)
		}
		return fmt.Sprintf(" · main plot %d", p.MainPlot)
	case trial.StripPlot:
		return fmt.Sprintf(" · horizontal strip %d, vertical strip %d", p.MainPlot, p.Strip)
	}
	return ""
}
