package xlsx

import (
	"furlong/export"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// writeMargins writes the margins over input cost (export.MarginsFor: the
// trial's prices, the trait they are worked out from) at row and returns
// the next free row; nothing for another trait or without a price.
func (s *sheet) writeMargins(t *trial.Trial, a *analysis.Result, row, dec int) int {
	m, err := export.MarginsFor(t, a)
	if m == nil && err == nil {
		return row
	}
	s.textNoWidth(1, row, "Margin over input cost", sectionStyle)
	row++
	if err != nil {
		s.textNoWidth(1, row, "The margins cannot be worked out: "+err.Error(), noteStyle)
		return row + 2
	}
	s.textNoWidth(1, row, export.MarginsNote(m), noteStyle)
	row++
	method := "protected LSD"
	if m.Method == meansep.Tukey {
		method = "Tukey's HSD"
	}
	s.textNoWidth(1, row, "Letters: "+method+" on the margins, higher margins first; margins sharing a letter do not differ significantly.", noteStyle)
	row++
	cur := ""
	if m.Currency != "" {
		cur = " (" + m.Currency + ")"
	}
	for i, h := range []string{"Treatment", "Name", "Mean", "Gross return" + cur, "Product cost", "Application cost", "Cost", "Margin" + cur, "SE", "Letters", "Cost from"} {
		k := headNumStyle
		switch {
		case i == 9: // the letters, centred as on the means table
			k = headStyle
			k.halign = "center"
		case i < 2 || i > 9:
			k = headStyle
		}
		s.text(1+i, row, h, k)
	}
	row++
	for _, r := range m.Rows {
		s.text(1, row, r.Treatment, styleKey{})
		s.text(2, row, r.Name, styleKey{})
		s.num(3, row, r.Mean, numStyle(dec))
		s.num(4, row, r.Gross, numStyle(2))
		s.num(5, row, r.Product, numStyle(2))
		s.num(6, row, r.Application, numStyle(2))
		s.num(7, row, r.Cost, numStyle(2))
		s.num(8, row, r.Margin, numStyle(2))
		s.num(9, row, r.MarginSE, numStyle(2))
		s.text(10, row, r.Letters, styleKey{halign: "center"})
		s.text(11, row, r.CostFrom, styleKey{})
		row++
	}
	for _, n := range m.Notes {
		s.textNoWidth(1, row, n, noteStyle)
		row++
	}
	s.textNoWidth(1, row, "Caution: "+export.EconomicCautionText(), noteStyle)
	return row + 2
}
