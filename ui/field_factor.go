package ui

import (
	"slices"
	"strings"

	"furlong/trial"
)

// colourChoices offers colouring by treatment, by block and, in a
// factorial trial, by each factor (named by its label, "Nitrogen (N)",
// short enough for the row of choices above the map), keeping the choice
// when it is still offered.
func (f *fieldStep) colourChoices(t *trial.Trial) {
	opts := []string{"Colour by treatment", "Colour by block"}
	for i := range t.Factors {
		opts = append(opts, factorLabel(&t.Factors[i]))
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
		if f.colorBy.Selected == factorLabel(&t.Factors[i]) {
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

// mapColourFactor is the key of the factor the Field step's map is
// coloured by, "" when it is coloured by treatment or block (the printed
// map then colours by treatment).
func (u *App) mapColourFactor() string {
	f, ok := u.steps[stepField].(*fieldStep)
	if !ok || f == nil || f.colorBy == nil {
		return ""
	}
	t := u.doc.t
	if i := f.colourFactor(t); i >= 0 {
		return t.Factors[i].Key
	}
	return ""
}

// mapSub is the subplot the map outlines a plot in: its subplot in a
// split-split plot, none otherwise.
func mapSub(t *trial.Trial, p trial.Plot) int {
	if t.SplitSplit() {
		return p.SubPlot
	}
	return 0
}
