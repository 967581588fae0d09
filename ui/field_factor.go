package ui

import (
	"slices"
	"strings"

	"furlong/trial"
)

// colourByFactor starts the label of a colour choice by factor.
const colourByFactor = "Colour by "

// colourChoices offers colouring by treatment, by block and, in a
// factorial trial, by each factor ("Colour by Nitrogen (N)"), keeping the
// choice when it is still offered.
func (f *fieldStep) colourChoices(t *trial.Trial) {
	opts := []string{"Colour by treatment", "Colour by block"}
	for i := range t.Factors {
		opts = append(opts, colourByFactor+factorLabel(&t.Factors[i]))
	}
	if slices.Equal(opts, f.colorBy.Options) {
		return
	}
	sel := f.colorBy.Selected
	f.colorBy.Options = opts
	if !slices.Contains(opts, sel) {
		sel = opts[0]
	}
	f.colorBy.Selected = sel
	f.colorBy.Refresh()
}

// colourFactor is the factor the map is coloured by, −1 for none.
func (f *fieldStep) colourFactor(t *trial.Trial) int {
	for i := range t.Factors {
		if f.colorBy.Selected == colourByFactor+factorLabel(&t.Factors[i]) {
			return i
		}
	}
	return -1
}

// factorLabel names a factor with its key: "Nitrogen (N)", or the key.
func factorLabel(fac *trial.Factor) string {
	if fac.Name != "" && fac.Name != fac.Key {
		return fac.Name + " (" + fac.Key + ")"
	}
	return fac.Key
}

// mapUnit is the main plot the map outlines a plot in: its main plot in a
// split plot, none otherwise (a strip plot's strips are its rows and
// columns).
func mapUnit(t *trial.Trial, p trial.Plot) int {
	if t.Design.Kind == trial.SplitPlot {
		return p.MainPlot
	}
	return 0
}

// levelLines lists a combination's levels, one factor a line:
// "Nitrogen (N): N60  60 kg N/ha".
func levelLines(t *trial.Trial, tr *trial.Treatment) string {
	var b strings.Builder
	for i, code := range tr.Levels {
		if i >= len(t.Factors) {
			break
		}
		fac := &t.Factors[i]
		b.WriteString(factorLabel(fac) + ": " + code)
		if k := fac.LevelIndex(code); k >= 0 && fac.Levels[k].Name != "" && fac.Levels[k].Name != code {
			b.WriteString("  " + fac.Levels[k].Name)
		}
		b.WriteString("\n")
	}
	return b.String()
}
