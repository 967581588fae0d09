package pdf

import (
	"strconv"
	"strings"

	"furlong/export/chart"
	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial/analysis"
)

// writeFactorial prints a factorial trait's effects as the workbook's sheet
// has them: a two-way table of means with letters and margins for each
// two-factor interaction, the other effects' means, the standard errors of
// differences of every kind and, with charts, the interaction chart.
func writeFactorial(d *doc, a *analysis.Result, dec int, method meansep.Method, charts bool) error {
	fr := a.Factorial
	letters := func(m analysis.EffectMean, given bool) string {
		if method == meansep.Tukey {
			return m.LettersTukey
		}
		if !given {
			return ""
		}
		return m.LettersLSD
	}
	cell := func(m analysis.EffectMean, given bool) string {
		if m.Mean == nil {
			return "–"
		}
		return strings.TrimSpace(num(*m.Mean, dec) + " " + letters(m, given))
	}
	wrote := map[string]bool{}
	for i := range fr.Effects {
		e := &fr.Effects[i]
		if len(e.Factors) != 2 {
			continue
		}
		rf, cf := fr.Factor(e.Factors[0]), fr.Factor(e.Factors[1])
		rm, cm := fr.Effect(e.Factors[0]), fr.Effect(e.Factors[1])
		wrote[rf.Key], wrote[cf.Key] = true, true
		title := "Means of " + rf.Label() + " × " + cf.Label()
		if e.P != nil {
			title += " (interaction p " + stats.FormatP(*e.P) + ")"
		}
		d.section(title, 25)
		tb := table{heads: []string{rf.Label() + " \\ " + cf.Label()}, right: []bool{false}}
		for _, n := range cf.LevelNames {
			tb.heads, tb.right = append(tb.heads, n), append(tb.right, true)
		}
		tb.heads, tb.right = append(tb.heads, "Mean"), append(tb.right, true)
		nc := len(cf.Levels)
		for ri, name := range rf.LevelNames {
			row := []string{name}
			for ci := range cf.Levels {
				row = append(row, cell(e.Means[ri*nc+ci], e.LettersGiven))
			}
			if rm != nil {
				row = append(row, cell(rm.Means[ri], rm.LettersGiven))
			}
			tb.rows = append(tb.rows, row)
		}
		last := []string{"Mean"}
		if cm != nil {
			for ci := range cf.Levels {
				last = append(last, cell(cm.Means[ci], cm.LettersGiven))
			}
		}
		if a.ANOVA != nil {
			last = append(last, num(a.ANOVA.GrandMean, dec))
		}
		tb.rows = append(tb.rows, last)
		tb.bold = make([]bool, len(tb.rows))
		tb.bold[len(tb.rows)-1] = true
		d.table(tb)
		if e.Significant && e.Note != "" {
			d.para(e.Note, false, bodyPt)
		}
	}
	for i := range fr.Effects {
		e := &fr.Effects[i]
		if len(e.Factors) == 2 || len(e.Factors) == 1 && wrote[e.Factors[0]] {
			continue
		}
		title := "Means of " + strings.ReplaceAll(e.Name, ":", " × ")
		if e.P != nil {
			title += " (p " + stats.FormatP(*e.P) + ")"
		}
		d.section(title, 20)
		tb := table{}
		for _, f := range e.Factors {
			tb.heads, tb.right = append(tb.heads, fr.Factor(f).Label()), append(tb.right, false)
		}
		tb.heads = append(tb.heads, "n", "Mean", "SE", "Letters")
		tb.right = append(tb.right, true, true, true, false)
		for _, m := range e.Means {
			row := append([]string(nil), m.Levels...)
			mean, se := "–", "–"
			if m.Mean != nil {
				mean, se = num(*m.Mean, dec), num(*m.SE, dec)
			}
			row = append(row, strconv.Itoa(m.N), mean, se, letters(m, e.LettersGiven))
			tb.rows = append(tb.rows, row)
		}
		d.table(tb)
	}
	if method == meansep.Tukey {
		d.note("Means of one effect sharing a letter do not differ by Tukey's HSD at the report's level.")
	} else {
		d.note("Means of one effect sharing a letter do not differ by the LSD at the report's level (letters only when the effect's F test is significant).")
	}
	if len(fr.SEDs) > 0 {
		d.section("Standard errors of differences", 20)
		tb := table{heads: []string{"Comparison", "SED", "df", "Smallest", "Largest"}, right: []bool{false, true, true, true, true}, maxCol: 90}
		for _, sd := range fr.SEDs {
			tb.rows = append(tb.rows, []string{sd.Label, num(sd.SED, dec+1), num(sd.DF, 1), num(sd.Min, dec+1), num(sd.Max, dec+1)})
		}
		d.table(tb)
		d.note("Degrees of freedom of comparisons that mix strata are Satterthwaite's.")
	}
	if !charts {
		return nil
	}
	p, err := chart.Interaction(a, chart.InteractionOptions{})
	if err != nil {
		if err != chart.ErrNoInteraction {
			d.note("The interaction chart could not be drawn: " + err.Error())
		}
		return nil
	}
	return placeChart(d, p)
}
