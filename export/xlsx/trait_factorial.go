package xlsx

import (
	"fmt"
	"strings"

	"github.com/xuri/excelize/v2"

	"furlong/export/chart"
	"furlong/stats"
	"furlong/stats/diag"
	"furlong/trial/analysis"
)

// writeFactorialANOVA writes the analysis of variance of crossed treatment
// factors from row on: the strata lines with the error each is tested
// against (sums of squares), or the REML tests with their denominator df.
// It returns the next free row.
func (s *sheet) writeFactorialANOVA(a *analysis.Result, row int) int {
	fr := a.Factorial
	reml := fr.Method == "REML"
	heads := []string{"Source", "df", "SS", "MS", "F", "p", "Tested against"}
	if reml {
		heads = []string{"Source", "df", "df (denominator)", "F", "p"}
	}
	for i, h := range heads {
		k := headStyle
		if i > 0 {
			k = headNumStyle
		}
		s.text(1+i, row, h, k)
	}
	row++
	for _, l := range fr.Lines {
		s.text(1, row, lineName(l), styleKey{bold: l.Role == stats.RoleErrorStratum || l.Role == stats.RoleError})
		s.integer(2, row, l.DF, styleKey{})
		if reml {
			if l.DFDen != nil {
				s.num(3, row, *l.DFDen, numStyle(1))
			}
			if l.F != nil {
				s.numOrDash(4, row, *l.F, numStyle(2))
				s.numOrDash(5, row, *l.P, pStyle)
			}
			row++
			continue
		}
		if l.SS != nil {
			s.numOrDash(3, row, *l.SS, numStyle(3))
		}
		if l.MS != nil {
			s.numOrDash(4, row, *l.MS, numStyle(3))
		}
		if l.F != nil {
			s.numOrDash(5, row, *l.F, numStyle(2))
			s.numOrDash(6, row, *l.P, pStyle)
		}
		if l.ErrorTerm != "" {
			s.text(7, row, errorName(l.ErrorTerm), styleKey{})
		}
		row++
	}
	var notes []string
	if reml {
		notes = append(notes, "Fitted by REML (plots are missing): F tests with Satterthwaite denominator degrees of freedom; no sums of squares.")
	} else if a.ANOVA != nil && a.ANOVA.Adjusted {
		notes = append(notes, "Unbalanced data: each sum of squares is adjusted for the terms that do not contain it (type II), so they do not add up to the total.")
	}
	if len(fr.Components) > 0 {
		var parts []string
		for _, c := range fr.Components {
			parts = append(parts, fmt.Sprintf("%s %s", strings.ReplaceAll(c.Name, "_", " "), fmtG(c.Variance)))
		}
		notes = append(notes, "Variance components: "+strings.Join(parts, ", ")+".")
	}
	for _, l := range fr.Lines {
		if l.Role.IsError() && l.CVPercent != nil {
			notes = append(notes, fmt.Sprintf("CV of %s: %.1f%%.", errorName(l.Source), *l.CVPercent))
		}
	}
	for _, n := range notes {
		s.textNoWidth(1, row, n, noteStyle)
		row++
	}
	return row
}

// lineName is the name of an ANOVA line on the sheet.
func lineName(l analysis.Line) string {
	switch l.Role {
	case stats.RoleBlock:
		return "Blocks"
	case stats.RoleTotal:
		return "Total"
	case stats.RoleError, stats.RoleErrorStratum:
		return errorName(l.Source)
	}
	return strings.ReplaceAll(l.Source, ":", " × ")
}

// errorName is "Error", "Error (a)", ...
func errorName(src string) string {
	if k, ok := strings.CutPrefix(src, "error_"); ok {
		return "Error (" + k + ")"
	}
	return "Error"
}

func fmtG(v float64) string { return fmt.Sprintf("%.4g", v) }

// writeFactorialMeans writes, from row on, the two-way table of means of
// every two-factor interaction with its letters and the main-effect means
// in its margins, the means of a three-factor interaction as a list, the
// SEDs of every kind and the slices. It returns the next free row and the
// row of the first two-way table (for the interaction chart).
func (s *sheet) writeFactorialMeans(a *analysis.Result, row, dec int, method string) (int, int) {
	fr := a.Factorial
	letters := func(m analysis.EffectMean, given bool) string {
		if method == "tukey" {
			return m.LettersTukey
		}
		if !given {
			return ""
		}
		return m.LettersLSD
	}
	chartRow := 0
	wrote := map[string]bool{}
	for i := range fr.Effects {
		e := &fr.Effects[i]
		if len(e.Factors) != 2 {
			continue
		}
		rf, cf := fr.Factor(e.Factors[0]), fr.Factor(e.Factors[1])
		rm, cm := fr.Effect(e.Factors[0]), fr.Effect(e.Factors[1])
		wrote[rf.Key], wrote[cf.Key] = true, true
		title := fmt.Sprintf("Means of %s × %s", rf.Label(), cf.Label())
		if e.P != nil {
			title += " (interaction p " + stats.FormatP(*e.P) + ")"
		}
		s.textNoWidth(1, row, title, sectionStyle)
		if chartRow == 0 {
			chartRow = row
		}
		row++
		s.text(1, row, rf.Label()+" \\ "+cf.Label(), headStyle)
		for c, name := range cf.LevelNames {
			s.text(2+2*c, row, name, headNumStyle)
		}
		s.text(2+2*len(cf.Levels), row, "Mean", headNumStyle)
		row++
		nc := len(cf.Levels)
		for ri, name := range rf.LevelNames {
			s.text(1, row, name, styleKey{})
			for ci := range cf.Levels {
				m := e.Means[ri*nc+ci]
				if m.Mean != nil {
					s.num(2+2*ci, row, *m.Mean, numStyle(dec))
				} else {
					s.text(2+2*ci, row, dash, dashStyle)
				}
				s.text(3+2*ci, row, letters(m, e.LettersGiven), styleKey{halign: "center"})
			}
			if rm != nil && rm.Means[ri].Mean != nil {
				s.num(2+2*nc, row, *rm.Means[ri].Mean, numStyle(dec))
				s.text(3+2*nc, row, letters(rm.Means[ri], rm.LettersGiven), styleKey{halign: "center"})
			}
			row++
		}
		s.text(1, row, "Mean", styleKey{bold: true})
		if cm != nil {
			for ci := range cf.Levels {
				if m := cm.Means[ci]; m.Mean != nil {
					s.num(2+2*ci, row, *m.Mean, withBold(numStyle(dec), true))
					s.text(3+2*ci, row, letters(m, cm.LettersGiven), styleKey{halign: "center"})
				}
			}
		}
		if a.ANOVA != nil {
			s.num(2+2*nc, row, a.ANOVA.GrandMean, withBold(numStyle(dec), true))
		}
		row++
		if e.Significant && e.Note != "" {
			s.textNoWidth(1, row, e.Note, proseStyle)
			row++
		}
		row++
	}
	// Effects not shown in a two-way table: a factor alone, or three
	// factors together.
	for i := range fr.Effects {
		e := &fr.Effects[i]
		if len(e.Factors) == 2 || len(e.Factors) == 1 && wrote[e.Factors[0]] {
			continue
		}
		title := "Means of " + strings.ReplaceAll(e.Name, ":", " × ")
		if e.P != nil {
			title += " (p " + stats.FormatP(*e.P) + ")"
		}
		s.textNoWidth(1, row, title, sectionStyle)
		row++
		for k, f := range e.Factors {
			s.text(1+k, row, fr.Factor(f).Label(), headStyle)
		}
		nf := len(e.Factors)
		s.text(1+nf, row, "n", headNumStyle)
		s.text(2+nf, row, "Mean", headNumStyle)
		s.text(3+nf, row, "SE", headNumStyle)
		s.text(4+nf, row, "Letters", styleKey{bold: true, halign: "center"})
		row++
		for _, m := range e.Means {
			for k, l := range m.Levels {
				s.text(1+k, row, l, styleKey{})
			}
			s.integer(1+nf, row, m.N, styleKey{})
			if m.Mean != nil {
				s.num(2+nf, row, *m.Mean, numStyle(dec))
				s.num(3+nf, row, *m.SE, numStyle(dec))
			}
			s.text(4+nf, row, letters(m, e.LettersGiven), styleKey{halign: "center"})
			row++
		}
		row++
	}
	if method == "tukey" {
		s.textNoWidth(1, row, "Means of one effect sharing a letter do not differ by Tukey's HSD at the report's level.", noteStyle)
	} else {
		s.textNoWidth(1, row, "Means of one effect sharing a letter do not differ by the LSD at the report's level (letters only when the effect's F test is significant).", noteStyle)
	}
	row += 2

	if len(fr.SEDs) > 0 {
		s.textNoWidth(1, row, "Standard errors of differences", sectionStyle)
		row++
		for i, h := range []string{"Comparison", "SED", "df", "Smallest", "Largest"} {
			k := headStyle
			if i > 0 {
				k = headNumStyle
			}
			s.text(1+i, row, h, k)
		}
		row++
		for _, sd := range fr.SEDs {
			s.text(1, row, sd.Label, styleKey{})
			s.num(2, row, sd.SED, numStyle(dec+1))
			s.num(3, row, sd.DF, numStyle(1))
			s.num(4, row, sd.Min, numStyle(dec+1))
			s.num(5, row, sd.Max, numStyle(dec+1))
			row++
		}
		s.textNoWidth(1, row, "Degrees of freedom of comparisons that mix strata are Satterthwaite's.", noteStyle)
		row += 2
	}
	if len(fr.Slices) > 0 {
		s.textNoWidth(1, row, "Slices: the levels of one factor compared within each level of the other", sectionStyle)
		row++
		for i, h := range []string{"Slice", "F", "df", "df (denominator)", "p", "Means (letters)"} {
			k := headStyle
			if i > 0 && i < 5 {
				k = headNumStyle
			}
			s.text(1+i, row, h, k)
		}
		row++
		for _, sl := range fr.Slices {
			s.text(1, row, sl.Name, styleKey{})
			if sl.F != nil {
				s.num(2, row, *sl.F, numStyle(2))
				s.integer(3, row, sl.DF, styleKey{})
				s.num(4, row, *sl.DFDen, numStyle(1))
				s.numOrDash(5, row, *sl.P, pStyle)
			}
			given := false
			for _, m := range sl.Means {
				given = given || m.LettersLSD != ""
			}
			var parts []string
			for _, m := range sl.Means {
				v := dash
				if m.Mean != nil {
					v = fmt.Sprintf("%.*f", dec, *m.Mean)
				}
				parts = append(parts, strings.TrimSpace(fmt.Sprintf("%s %s %s", strings.Join(m.Levels, ""), v, letters(m, given))))
			}
			s.textNoWidth(6, row, strings.Join(parts, "; "), styleKey{})
			row++
		}
		row++
	}
	if sr := fr.StratumResiduals; len(sr) > 0 {
		for _, u := range sr {
			if u.ShapiroW != nil {
				s.textNoWidth(1, row, fmt.Sprintf("Residuals of %s (one per unit): Shapiro–Wilk W %.4f, p %s (read at the %g level).",
					strings.ToLower(errorName(u.Stratum)), *u.ShapiroW, stats.FormatP(*u.ShapiroP), diag.CheckAlpha), noteStyle)
				row++
			}
		}
		row++
	}
	return row, chartRow
}

// interactionChartPNG draws the interaction chart of a factorial result.
func interactionChartPNG(a *analysis.Result) ([]byte, error) {
	p, err := chart.Interaction(a, chart.InteractionOptions{})
	if err != nil {
		return nil, err
	}
	return plotPNG(p, chartWidthPt)
}

// addInteractionChart puts the interaction chart right of the two-way
// table at row, or a note when it cannot be drawn.
func (s *sheet) addInteractionChart(f *excelize.File, name string, a *analysis.Result, row int, title string) {
	if row == 0 {
		return
	}
	png, err := interactionChartPNG(a)
	if err != nil {
		s.textNoWidth(chartCol+4, row, "The interaction chart could not be drawn: "+err.Error(), noteStyle)
		return
	}
	yes := true
	s.fail(f.AddPictureFromBytes(name, cellName(chartCol+4, row), &excelize.Picture{
		Extension: ".png", File: png,
		Format: &excelize.GraphicOptions{AltText: "Interaction chart of " + title, PrintObject: &yes, LockAspectRatio: true},
	}))
}
