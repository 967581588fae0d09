package ui

import (
	"fmt"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/widget"
	"gonum.org/v1/plot"

	"furlong/export/chart"
	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial/analysis"
)

// effectsView is Compare's "Effects" tab for a trial of crossed treatment
// factors: pick a main effect, an interaction or the slices of an
// interaction; a main effect shows its means with letters, a two-factor
// interaction the two-way table of means with the main-effect means in
// the margins, slices one factor's levels compared within each level of
// the other; an interaction chart (one line per level, with an SED bar)
// stands beside the table.
type effectsView struct {
	c        *compareStep
	item     *container.TabItem
	sel      *widget.Select
	note     *widget.Label
	table    *textTable
	chartBox *fyne.Container

	// choices are the select's options; chosen is the label picked.
	choices []effectChoice
	chosen  string
	res     *analysis.Result
}

// effectChoice is one option of the effect select.
type effectChoice struct {
	label  string
	effect string // "A", "A:B"
	slices bool   // the slices of the interaction
}

func newEffectsView(c *compareStep) *effectsView {
	v := &effectsView{c: c, note: widget.NewLabel(""), table: newTextTable(), chartBox: container.NewStack()}
	v.note.Wrapping = fyne.TextWrapWord
	v.sel = widget.NewSelect(nil, func(s string) {
		if s == v.chosen {
			return
		}
		v.chosen = s
		v.display()
	})
	top := container.NewVBox(container.NewHBox(widget.NewLabel("Effect"), container.NewGridWrap(fyne.NewSize(320, v.sel.MinSize().Height), v.sel)), v.note)
	split := container.NewHSplit(container.New(&widthFloor{width: v.table.width}, v.table), v.chartBox)
	split.Offset = 0
	v.item = container.NewTabItem("Effects", container.NewBorder(top, nil, nil, nil, split))
	return v
}

func (v *effectsView) tab() *container.TabItem { return v.item }

func (v *effectsView) show(s *resultSet, tr *traitResult) {
	if msg := resultProblem(s, tr); msg != "" {
		v.clear(msg)
		return
	}
	if !tr.res.IsFactorial() {
		v.clear("This trait's treatments are one list. Effects, two-way tables and slices are for trials whose treatments are the combinations of two or three factors (set them up in Setup, Treatments).")
		return
	}
	v.res = tr.res
	v.choices = effectChoices(tr.res)
	labels := make([]string, len(v.choices))
	for i, ch := range v.choices {
		labels[i] = ch.label
	}
	if indexOf(labels, v.chosen) < 0 {
		v.chosen = defaultEffect(tr.res, v.choices)
	}
	v.sel.Options = labels
	v.sel.SetSelected(v.chosen)
	v.sel.Refresh()
	v.display()
}

// clear shows msg and no effect.
func (v *effectsView) clear(msg string) {
	v.res = nil
	v.note.SetText(msg)
	v.sel.Options = nil
	v.sel.ClearSelected()
	v.table.set(nil, nil)
	v.chartBox.Objects = nil
	v.chartBox.Refresh()
}

// display shows the chosen effect of v.res.
func (v *effectsView) display() {
	if v.res == nil {
		return
	}
	var ch effectChoice
	for _, c := range v.choices {
		if c.label == v.chosen {
			ch = c
		}
	}
	head, rows, note := effectTable(v.res, ch, v.c.method)
	v.note.SetText(note)
	v.table.set(head, rows)
	v.chartBox.Objects = nil
	if e := v.res.Factorial.Effect(ch.effect); e != nil && len(e.Factors) == 2 {
		if p, err := safePlot(func() (*plot.Plot, error) {
			return chart.Interaction(v.res, chart.InteractionOptions{Effect: ch.effect})
		}); err == nil {
			v.chartBox.Objects = []fyne.CanvasObject{newChartView(p)}
		}
	}
	v.chartBox.Refresh()
}

// effectChoices lists every effect of r, and the slices of each
// interaction that has them.
func effectChoices(r *analysis.Result) []effectChoice {
	var out []effectChoice
	fr := r.Factorial
	for _, e := range fr.Effects {
		words := strings.ReplaceAll(e.Name, ":", " × ")
		if len(e.Factors) == 1 {
			out = append(out, effectChoice{label: "Main effect of " + effectFactorLabel(fr, e.Name), effect: e.Name})
			continue
		}
		out = append(out, effectChoice{label: "Interaction " + words, effect: e.Name})
	}
	for _, e := range fr.Effects {
		for _, s := range fr.Slices {
			if s.Effect == e.Name {
				out = append(out, effectChoice{label: "Slices of " + strings.ReplaceAll(e.Name, ":", " × "), effect: e.Name, slices: true})
				break
			}
		}
	}
	return out
}

// defaultEffect is what the tab shows first: the slices of a significant
// interaction (its main effects can mislead), else the first two-factor
// interaction, else the first effect.
func defaultEffect(r *analysis.Result, choices []effectChoice) string {
	for _, ch := range choices {
		if e := r.Factorial.Effect(ch.effect); ch.slices && e != nil && e.Significant {
			return ch.label
		}
	}
	for _, ch := range choices {
		if e := r.Factorial.Effect(ch.effect); !ch.slices && e != nil && len(e.Factors) == 2 {
			return ch.label
		}
	}
	if len(choices) > 0 {
		return choices[0].label
	}
	return ""
}

func effectFactorLabel(fr *analysis.Factorial, key string) string {
	if f := fr.Factor(key); f != nil {
		return f.Label()
	}
	return key
}

// effectLetters are a mean's letters by method ("" when withheld).
func effectLetters(m analysis.EffectMean, given bool, method meansep.Method) string {
	if method == meansep.Tukey {
		return m.LettersTukey
	}
	if !given {
		return ""
	}
	return m.LettersLSD
}

// effectTable is the table of the chosen effect of r with a note on how to
// read it.
func effectTable(r *analysis.Result, ch effectChoice, method meansep.Method) (head []string, rows [][]string, note string) {
	fr := r.Factorial
	e := fr.Effect(ch.effect)
	if e == nil {
		return nil, nil, "Pick an effect."
	}
	dec := analysis.MeanDecimals(r.Decimals)
	if r.Transform != stats.NoTransform {
		dec = analysis.TransformedDecimals
	}
	mean := func(m analysis.EffectMean, given bool) string {
		if m.Mean == nil {
			return "–"
		}
		return strings.TrimSpace(fixed(*m.Mean, dec) + " " + effectLetters(m, given, method))
	}
	level := func(key, code string) string {
		if f := fr.Factor(key); f != nil {
			for i, c := range f.Levels {
				if c == code && f.LevelNames[i] != c {
					return code + " " + f.LevelNames[i]
				}
			}
		}
		return code
	}
	var parts []string
	if e.P != nil {
		parts = append(parts, fmt.Sprintf("%s: P %s.", strings.ReplaceAll(e.Name, ":", " × "), stats.FormatP(*e.P)))
	}
	switch {
	case ch.slices:
		head = []string{"Slice", "F", "df", "P", "Means (letters)", "SED"}
		for _, s := range fr.Slices {
			if s.Effect != e.Name {
				continue
			}
			f, df, p := "–", "–", "–"
			if s.F != nil {
				f, df, p = fixed(*s.F, 2), fmt.Sprintf("%d, %s", s.DF, fixed(*s.DFDen, 1)), stats.FormatP(*s.P)
			}
			given := method == meansep.Tukey
			for _, m := range s.Means {
				given = given || m.LettersLSD != ""
			}
			var ms []string
			for _, m := range s.Means {
				ms = append(ms, strings.Join(m.Levels, "")+" "+mean(m, given))
			}
			sed := "–"
			switch {
			case s.SED != nil:
				sed = fixed(*s.SED, dec)
			case s.SEDRange != nil:
				sed = fixed(s.SEDRange.Min, dec) + "–" + fixed(s.SEDRange.Max, dec)
			}
			rows = append(rows, []string{s.Name, f, df, p, strings.Join(ms, ";  "), sed})
		}
		parts = append(parts, "Each row compares one factor's levels with the other factor held at one level: its F test, and letters within the row (levels sharing a letter do not differ).")
	case len(e.Factors) == 2:
		rf, cf := fr.Factor(e.Factors[0]), fr.Factor(e.Factors[1])
		rm, cm := fr.Effect(e.Factors[0]), fr.Effect(e.Factors[1])
		head = []string{rf.Label() + " \\ " + cf.Label()}
		for _, c := range cf.Levels {
			head = append(head, level(cf.Key, c))
		}
		head = append(head, "Mean")
		nc := len(cf.Levels)
		for ri, rc := range rf.Levels {
			row := []string{level(rf.Key, rc)}
			for ci := range cf.Levels {
				row = append(row, mean(e.Means[ri*nc+ci], e.LettersGiven))
			}
			if rm != nil {
				row = append(row, mean(rm.Means[ri], rm.LettersGiven))
			}
			rows = append(rows, row)
		}
		margin := []string{"Mean"}
		if cm != nil {
			for ci := range cf.Levels {
				margin = append(margin, mean(cm.Means[ci], cm.LettersGiven))
			}
		}
		if r.ANOVA != nil {
			margin = append(margin, fixed(r.ANOVA.GrandMean, dec))
		}
		rows = append(rows, margin)
		if e.Significant && e.Note != "" {
			parts = append(parts, e.Note)
		}
		parts = append(parts, "Cells: the means of the combinations with their letters (among all cells); margins: the main-effect means with their own letters.")
	default:
		for _, f := range e.Factors {
			head = append(head, effectFactorLabel(fr, f))
		}
		head = append(head, "Plots", "Mean", "SE")
		for _, m := range e.Means {
			var row []string
			for k, l := range m.Levels {
				row = append(row, level(e.Factors[k], l))
			}
			se := "–"
			if m.SE != nil {
				se = fixed(*m.SE, dec)
			}
			rows = append(rows, append(row, strconv.Itoa(m.N), mean(m, e.LettersGiven), se))
		}
		if e.Significant && e.Note != "" {
			parts = append(parts, e.Note)
		}
	}
	if !ch.slices {
		switch {
		case e.SED != nil:
			parts = append(parts, fmt.Sprintf("SED %s (df %s).", fixed(*e.SED, dec), fixed(*e.DF, 1)))
		case e.SEDRange != nil:
			parts = append(parts, fmt.Sprintf("SED %s–%s by pair.", fixed(e.SEDRange.Min, dec), fixed(e.SEDRange.Max, dec)))
		}
		if method == meansep.LSD && !e.LettersGiven {
			parts = append(parts, "The F test of this effect is not significant, so the protected LSD gives no letters; Tukey's HSD can still be read.")
		}
	}
	parts = append(parts, fmt.Sprintf("Letters by %s at %g.", methodLabel(method), r.Alpha))
	return head, rows, strings.Join(parts, " ")
}

// showFactorialANOVA fills the Compare step's analysis of variance with
// the lines of crossed factors: each stratum's error named (a), (b), ...,
// and for REML the F tests with their denominator df in the SS column's
// place (no sums of squares).
func (c *compareStep) showFactorialANOVA(r *analysis.Result) {
	reml := r.Factorial.Method == "REML"
	for _, l := range r.Factorial.Lines {
		c.anova.Add(compactCell(factorialSourceName(l), false))
		c.anova.Add(compactCell(strconv.Itoa(l.DF), false))
		ss, ms, f, p := "", "", "", ""
		if l.SS != nil {
			ss = num(*l.SS, 5)
		}
		if l.MS != nil && l.Role != stats.RoleTotal {
			ms = num(*l.MS, 5)
		}
		if reml && l.DFDen != nil {
			ss = "df den " + fixed(*l.DFDen, 1)
		}
		if l.F != nil {
			f, p = fixed(*l.F, 2), stats.FormatP(*l.P)
		}
		c.anova.Add(compactCell(ss, false))
		c.anova.Add(compactCell(ms, false))
		c.anova.Add(compactCell(f, false))
		c.anova.Add(compactCell(p, false))
	}
}

// factorialSourceName names a line of crossed factors on screen.
func factorialSourceName(l analysis.Line) string {
	switch l.Role {
	case stats.RoleBlock:
		return "Blocks"
	case stats.RoleTotal:
		return "Total"
	case stats.RoleError, stats.RoleErrorStratum:
		if k, ok := strings.CutPrefix(l.Source, "error_"); ok {
			return "Error (" + k + ")"
		}
		return "Error"
	}
	return strings.ReplaceAll(l.Source, ":", " × ")
}
