package xlsx

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"

	"furlong/export"
	"furlong/stats"
	"furlong/stats/diag"
	"furlong/trial"
	"furlong/trial/analysis"
)

// Columns of the means table on a trait sheet.
const (
	meansFirstCol = 1
	chartCol      = 10 // column J: the chart sits right of the tables
)

func (r *report) writeTrait(name string, tr trial.Trait) error {
	s := newSheet(r.f, r.st, name)
	title := traitLabel(nonEmpty(tr.Name, tr.Key), tr.Unit)
	s.textNoWidth(1, 1, title, titleStyle)
	res, ok := export.LookupOutcome(r.res, tr.Key)
	reason := export.Reason(res)
	if !ok {
		reason = "this trait was not analysed"
	}
	if reason != "" {
		s.textNoWidth(1, 3, "No analysis: "+reason+".", styleKey{bold: true})
		// Advice that fits the reason: no data at all, or data that cannot
		// be analysed as it stands.
		advice := "Check this trait's values on the data sheet, then run the report again."
		if !ok || res.Err == nil || errors.Is(res.Err, stats.ErrNoData) {
			advice = "Record values for this trait in the field book, then run the report again."
		}
		s.textNoWidth(1, 4, advice, noteStyle)
		s.widths[1] = 12
		s.fitColumns(8, 40)
		s.printSetup(r.opts.Paper, true, r.t.Title+": "+title)
		return s.err
	}
	a := res.Result
	dec := tr.Decimals
	s.textNoWidth(1, 2, fmt.Sprintf("%s; key %q; %d plots analysed, %d missing, %d excluded.",
		a.Design.Title(), tr.Key, a.N, a.Missing, len(a.Excluded)), noteStyle)
	row := 3
	if a.Transform != stats.NoTransform {
		s.textNoWidth(1, row, "Analysed on the "+a.Transform.Scale()+" scale (the trait's setting in the trial); means are shown back on the original scale.", noteStyle)
		row++
	}
	row++

	// Analysis of variance.
	s.textNoWidth(1, row, "Analysis of variance", sectionStyle)
	row++
	if a.IsFactorial() {
		row = s.writeFactorialANOVA(a, row) // trait_factorial.go
	}
	for i, h := range []string{"Source", "df", "SS", "MS", "F", "p"} {
		if a.IsFactorial() {
			break
		}
		k := headStyle
		if i > 0 {
			k = headNumStyle // over right-aligned numbers
		}
		s.text(1+i, row, h, k)
	}
	if !a.IsFactorial() {
		row++
	}
	if a.ANOVA != nil && !a.IsFactorial() {
		for _, src := range a.ANOVA.Sources {
			s.text(1, row, export.SourceName(src), styleKey{})
			s.integer(2, row, src.DF, styleKey{})
			s.numOrDash(3, row, src.SS, numStyle(3))
			if src.Role != stats.RoleTotal {
				s.numOrDash(4, row, src.MS, numStyle(3))
			}
			if src.HasTest {
				s.numOrDash(5, row, src.F, numStyle(2))
				s.numOrDash(6, row, src.P, pStyle)
			}
			row++
		}
		if a.ANOVA.Adjusted {
			s.textNoWidth(1, row, "Unbalanced data: each sum of squares is adjusted for the other terms, so they do not add up to the total.", noteStyle)
			row++
		}
	}
	row++

	// Means, on the original scale with their confidence limits; after a
	// transformation the analysis-scale LS mean and SE follow at the right.
	transformed := a.Transform != stats.NoTransform
	meanDec := analysis.MeanDecimals(dec)
	scaleDec := meanDec
	if transformed {
		scaleDec = analysis.TransformedDecimals
	}
	level := strconv.FormatFloat(100*(1-a.Alpha), 'f', -1, 64) + "%"
	s.textNoWidth(1, row, "Treatment means", sectionStyle)
	row++
	s.textNoWidth(1, row, r.methodNote(), noteStyle)
	row++
	if transformed {
		s.textNoWidth(1, row, "Means and their "+level+" confidence limits are back-transformed to the original scale; the limits are not symmetric about the mean.", noteStyle)
		row++
	}
	heads := []string{"Treatment", "Name", "n", "Mean", "Lower " + level, "Upper " + level, "Letters"}
	if !transformed {
		heads = append(heads, "Raw mean", "SE")
	}
	if a.CheckMean != nil {
		heads = append(heads, "% of check")
	}
	eff := a.Efficacy
	if eff != nil {
		heads = append(heads, "% efficacy (Abbott)")
		if eff.PreCount != "" {
			heads = append(heads, "% efficacy (Henderson–Tilton)")
		}
	}
	if transformed {
		sc := a.Transform.Scale()
		heads = append(heads, "LS mean ("+sc+")", "Raw mean ("+sc+")", "SE ("+sc+")")
	}
	for i, h := range heads {
		k := headStyle
		switch {
		case h == "Letters":
			k.halign = "center"
		case i >= 2:
			k = headNumStyle // over right-aligned numbers
		}
		s.text(meansFirstCol+i, row, h, k)
	}
	meansHead := row
	row++
	for _, m := range a.Means {
		label := m.Name
		if m.Check {
			label = strings.TrimSpace(label + " (check)")
		}
		s.text(1, row, m.Treatment, styleKey{})
		s.text(2, row, label, styleKey{bold: m.Check})
		s.integer(3, row, m.N, styleKey{})
		s.numOrDash(4, row, m.BackMean, numStyle(meanDec))
		limit := func(col int, v *float64) {
			if v == nil {
				s.text(col, row, dash, dashStyle)
				return
			}
			s.numOrDash(col, row, *v, numStyle(meanDec))
		}
		limit(5, m.Lower)
		limit(6, m.Upper)
		s.text(7, row, export.Letters(m, r.opts.Method), styleKey{halign: "center"})
		c := 8
		if !transformed {
			s.numOrDash(c, row, m.RawMean, numStyle(meanDec))
			s.numOrDash(c+1, row, m.SE, numStyle(meanDec))
			c += 2
		}
		if a.CheckMean != nil {
			if m.PercentOfCheck != nil {
				s.num(c, row, *m.PercentOfCheck, styleKey{numFmt: percentFormat})
			} else {
				s.text(c, row, dash, dashStyle)
			}
			c++
		}
		if eff != nil {
			pct := func(v *float64) {
				if v == nil {
					s.text(c, row, dash, dashStyle)
				} else {
					s.num(c, row, *v, styleKey{numFmt: percentFormat})
				}
				c++
			}
			if er := eff.Row(m.Treatment); er != nil {
				pct(er.Abbott)
				if eff.PreCount != "" {
					pct(er.HendersonTilton)
				}
			} else {
				// The untreated check itself.
				s.text(c, row, "untreated", styleKey{halign: "center", italic: true})
				c++
				if eff.PreCount != "" {
					s.setStyle(c, row, styleKey{})
					c++
				}
			}
		}
		if transformed {
			s.numOrDash(c, row, m.Mean, numStyle(scaleDec))
			s.numOrDash(c+1, row, m.RawMean, numStyle(scaleDec))
			s.numOrDash(c+2, row, m.SE, numStyle(scaleDec))
		}
		row++
	}
	if a.CheckMean != nil {
		s.textNoWidth(1, row, fmt.Sprintf("%% of check: each mean as a percentage of the mean of the check entries (%s).",
			strconv.FormatFloat(*a.CheckMean, 'f', meanDec, 64)), noteStyle)
		row++
	}
	if eff != nil {
		note := fmt.Sprintf("%% efficacy against the untreated check %s (mean %s): Abbott, (untreated − treatment)/untreated × 100 on the means.",
			eff.Untreated, strconv.FormatFloat(eff.UntreatedMean, 'f', meanDec, 64))
		if eff.PreCount != "" {
			note += " Henderson–Tilton: (1 − Ta·Cb/(Tb·Ca)) × 100 with the counts before (trait " + eff.PreCount + ") and after."
		}
		s.textNoWidth(1, row, note, noteStyle)
		row++
		s.textNoWidth(1, row, "Caution: "+export.ProtectionCautionText(), noteStyle)
		row++
	}
	meansChartCol := max(chartCol, meansFirstCol+len(heads)+1)
	row++
	row = s.writeVsCheck(r.f, r.t, a, row, scaleDec, r.opts.Charts)
	row = s.writeContrasts(a, row, scaleDec)
	row = s.writeProgress(r.f, r, tr.Key, row)
	row = s.writeResponse(r.f, r.t, a, row, scaleDec, r.opts.Charts)
	row = s.writeMargins(r.t, a, row, meanDec)
	interactionRow := 0
	if a.IsFactorial() {
		row, interactionRow = s.writeFactorialMeans(a, row, scaleDec, string(r.opts.Method))
	}

	// Statistics.
	s.textNoWidth(1, row, "Statistics", sectionStyle)
	row++
	if transformed {
		s.textNoWidth(1, row, "On the "+a.Transform.Scale()+" scale, except the grand mean.", noteStyle)
		row++
	}
	stat := func(label string, v float64, ok bool, k styleKey, note string) {
		s.text(1, row, label, labelStyle)
		switch {
		case ok && finiteF(v):
			s.num(2, row, v, k)
		case note != "":
			s.textNoWidth(2, row, note, noteStyle)
		default:
			s.text(2, row, dash, dashStyle)
		}
		row++
	}
	if an := a.ANOVA; an != nil {
		stat("Grand mean", an.GrandMean, true, numStyle(scaleDec), "")
		stat("CV%", an.CVPercent, true, numStyle(1), "")
		stat("R²", an.RSquared, true, numStyle(3), "")
		stat("SE of a mean", deref(an.SEMean), an.SEMean != nil, numStyle(scaleDec), "unequal n: see the SE of each mean")
		stat("SED", deref(an.SED), an.SED != nil, numStyle(scaleDec), "unequal n: each pair has its own SED")
	}
	msd := export.MSD(a, r.opts.Method)
	rangeNote := ""
	if rng := export.MSDRange(a, r.opts.Method); rng != nil {
		rangeNote = export.MSDText(nil, rng, scaleDec) + ": each pair of means has its own; smallest–largest"
	}
	stat(export.MSDLabel(r.opts.Method, r.opts.Alpha), deref(msd), msd != nil, numStyle(scaleDec), rangeNote)
	if a.ANOVA != nil {
		stat("Relative efficiency of blocking", deref(a.ANOVA.RelativeEfficiency), a.ANOVA.RelativeEfficiency != nil, numStyle(2), "not applicable")
	}
	row++

	if len(a.Notes) > 0 {
		s.textNoWidth(1, row, "Notes", sectionStyle)
		row++
		for _, n := range a.Notes {
			s.textNoWidth(1, row, n, proseStyle)
			row++
		}
		row++
	}
	if len(a.Diagnostics.Readings) > 0 {
		s.textNoWidth(1, row, "Model checks", sectionStyle)
		row++
		s.textNoWidth(1, row, fmt.Sprintf("Each check is read at the %s level (p < %s flags it).",
			strconv.FormatFloat(100*diag.CheckAlpha, 'f', -1, 64)+"%", strconv.FormatFloat(diag.CheckAlpha, 'f', -1, 64)), noteStyle)
		row++
		for _, rd := range a.Diagnostics.Readings {
			s.textNoWidth(1, row, rd.Text, styleKey{bold: rd.Flagged})
			row++
		}
	}

	s.widths[1] = maxF(s.widths[1], 10)
	s.freeze(0, 0)
	s.fitColumns(6, 40)
	s.placeLater()
	if r.opts.Charts && s.err == nil {
		var c chartPNG
		if ch, ok := r.charts[tr.Key]; ok {
			c = <-ch
			if c.panic != nil {
				panic(c.panic)
			}
		} else {
			c.png, c.err = meansChartPNG(r.t, a, r.opts)
		}
		png, err := c.png, c.err
		if err != nil {
			// A chart that cannot be drawn leaves a note, not a failed report.
			s.textNoWidth(meansChartCol, meansHead, err.Error(), noteStyle)
		} else {
			yes := true
			s.fail(r.f.AddPictureFromBytes(name, cellName(meansChartCol, meansHead), &excelize.Picture{
				Extension: ".png", File: png,
				Format: &excelize.GraphicOptions{AltText: "Chart of the means of " + title, PrintObject: &yes, LockAspectRatio: true},
			}))
		}
	}
	if r.opts.Charts && a.IsFactorial() && s.err == nil {
		s.addInteractionChart(r.f, name, a, interactionRow, title)
	}
	s.printSetup(r.opts.Paper, true, r.t.Title+": "+title)
	return s.err
}

func nonEmpty(a, b string) string {
	if strings.TrimSpace(a) != "" {
		return a
	}
	return b
}

func deref(p *float64) float64 {
	if p == nil {
		return 0
	}
	return *p
}

func maxF(a, b float64) float64 {
	if a > b {
		return a
	}
	return b
}
