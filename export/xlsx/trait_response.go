package xlsx

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"
	"gonum.org/v1/plot"

	"furlong/export"
	"furlong/export/chart"
	"furlong/trial"
	"furlong/trial/analysis"
)

// writeResponse writes a rate trial's response analysis of the trait
// (export.ResponseFor: the trends on the rates, the four models, the
// economic optimum at the trial's price ratio and its sensitivity) at row,
// with its chart under it, and returns the next free row. Nothing is
// written for a trait without one.
func (s *sheet) writeResponse(f *excelize.File, t *trial.Trial, a *analysis.Result, row, dec int, charts bool) int {
	resp, err := export.ResponseFor(t, a)
	if resp == nil {
		return row
	}
	title := "Response to rate"
	if resp.RateUnit != "" {
		title += " (" + resp.RateUnit + ")"
	}
	s.textNoWidth(1, row, title, sectionStyle)
	row++
	s.textNoWidth(1, row, export.ResponseNote(resp, a.ANOVA.DFError), noteStyle)
	row++
	for _, n := range resp.Notes {
		s.textNoWidth(1, row, n, noteStyle)
		row++
	}
	if err != nil {
		s.textNoWidth(1, row, "The curves cannot be fitted: "+err.Error(), noteStyle)
		row++
	}
	if len(resp.Trends) > 0 {
		for i, h := range []string{"Trend", "df", "SS", "MS", "F", "p"} {
			k := headNumStyle
			if i == 0 {
				k = headStyle
			}
			s.text(1+i, row, h, k)
		}
		row++
		for _, l := range resp.Trends {
			s.text(1, row, strings.ReplaceAll(l.Source, "_", " "), styleKey{})
			s.integer(2, row, l.DF, styleKey{})
			s.num(3, row, l.SS, numStyle(4))
			s.num(4, row, l.MS, numStyle(4))
			s.numOrDash(5, row, l.F, numStyle(2))
			s.numOrDash(6, row, l.P, pStyle)
			row++
		}
		row++
	}
	if len(resp.Models) > 0 {
		heads := []string{"Model", "a", "b", "c", "R²", "Residual SD", "AIC", "Join point", "Plateau", "Maximum at"}
		if resp.PriceRatio > 0 {
			heads = append(heads, "Economic optimum", "Response there")
		}
		for i, h := range heads {
			k := headNumStyle
			if i == 0 {
				k = headStyle
			}
			s.text(1+i, row, h, k)
		}
		row++
		edge := false
		for _, m := range resp.Models {
			name := m.Model
			if m.Model == resp.Best {
				name += " (lowest AIC)"
			}
			s.text(1, row, name, styleKey{})
			for i, c := range m.Coef {
				s.num(2+i, row, c, styleKey{})
			}
			if len(m.Coef) < 3 {
				s.text(4, row, dash, dashStyle)
			}
			s.num(5, row, m.RSquared, numStyle(4))
			s.optNum(6, row, m.RMSE, numStyle(dec+1))
			s.num(7, row, m.AIC, numStyle(2))
			s.optNum(8, row, m.Join, numStyle(1))
			s.optNum(9, row, m.Plateau, numStyle(dec))
			s.optNum(10, row, m.Optimum, numStyle(1))
			if resp.PriceRatio > 0 {
				s.optNum(11, row, m.Econ, numStyle(1))
				s.optNum(12, row, m.EconYield, numStyle(dec))
				if m.AtEdge {
					s.text(13, row, "*", styleKey{})
					edge = true
				}
			}
			row++
		}
		s.textNoWidth(1, row, "y = a + b·x + c·x², x the rate; the plateau models are flat beyond the join point. Lowest AIC fits best for its number of parameters.", noteStyle)
		row++
		if edge {
			s.textNoWidth(1, row, export.EdgeNote, noteStyle)
			row++
		}
		row++
	}
	if resp.PriceRatio > 0 && len(resp.Sensitivity) > 0 {
		s.textNoWidth(1, row, fmt.Sprintf("Economic optimum rate at price ratios around %s (price of a unit of input in units of produce)", strconv.FormatFloat(resp.PriceRatio, 'g', -1, 64)), labelStyle)
		row++
		s.text(1, row, "Model", headStyle)
		for i, k := range analysis.SensitivityFactors {
			s.num(2+i, row, resp.PriceRatio*k, styleKey{bold: true, halign: "right", border: [4]int{0, 0, 0, 1}})
		}
		row++
		col, cur := 0, ""
		for _, x := range resp.Sensitivity {
			if x.Model != cur {
				if cur != "" {
					row++
				}
				cur, col = x.Model, 2
				s.text(1, row, x.Model, styleKey{})
			}
			s.num(col, row, x.Rate, numStyle(1))
			col++
		}
		row += 2
		s.textNoWidth(1, row, "Caution: "+export.EconomicCautionText(), noteStyle)
		row += 2
	}
	if !charts || s.err != nil {
		return row
	}
	return s.chartBelow(f, row, "response chart", "Chart of the response of "+a.TraitName+" to rate", chartWidthPt,
		func() (*plot.Plot, error) { return chart.RateResponse(t, resp) })
}

// optNum writes an optional number, a dash when there is none.
func (s *sheet) optNum(col, row int, v *float64, k styleKey) {
	if v == nil {
		s.text(col, row, dash, dashStyle)
		return
	}
	s.num(col, row, *v, k)
}
