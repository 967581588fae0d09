package export

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// ResponseFor is the response analysis of a rate trial's trait as the
// season report shows it (analysis.ResponseOf with the trial's saved
// settings: the treatments left out of the trend and the price ratio), the
// same the window's Response view shows. It returns nil without an error
// when there is nothing to show: no trial, not a rate trial (fewer than 3
// treatments with a rate), a factorial result, or no result.
func ResponseFor(t *trial.Trial, r *analysis.Result) (*analysis.Response, error) {
	if t == nil || r == nil || r.IsFactorial() || r.ANOVA == nil {
		return nil, nil
	}
	rates, err := analysis.RatesOf(t, t.Analysis.Response.LeaveOut)
	if err != nil {
		return nil, nil
	}
	return analysis.ResponseOf(r, rates, t.Analysis.Response.PriceRatio)
}

// TextTable is a table as text: its column heads and rows, and a
// footnote to print under it ("" for none).
type TextTable struct {
	Head []string
	Rows [][]string
	Foot string
}

// EdgeNote explains the mark of an economic optimum at an end of the
// tested rates.
const EdgeNote = "* at an end of the tested rates: the curve says nothing beyond them, and the optimum may lie there."

// ResponseTables are the three tables of a response analysis as the
// window and the PDF report show them: the trends on the rates, the four
// models (with the economic optimum when there is a price ratio) and each
// model's optimum at other price ratios (empty without one). dec is the
// decimals of the trait's means.
func ResponseTables(r *analysis.Response, dec int) (trends, models, sensitivity TextTable) {
	if len(r.Trends) > 0 {
		trends.Head = []string{"Trend", "df", "SS", "MS", "F", "P"}
		for _, l := range r.Trends {
			trends.Rows = append(trends.Rows, []string{strings.ReplaceAll(l.Source, "_", " "), strconv.Itoa(l.DF),
				sig5(l.SS), sig5(l.MS), Fixed(l.F, 2), stats.FormatP(l.P)})
		}
	}
	if len(r.Models) > 0 {
		models.Head = []string{"Model", "a", "b", "c", "R²", "Resid. SD", "AIC", "Join", "Plateau", "Max. at"}
		if r.PriceRatio > 0 {
			models.Head = append(models.Head, "Economic optimum", "Response there")
		}
		for _, m := range r.Models {
			name := m.Model
			if m.Model == r.Best {
				name += " (lowest AIC)"
			}
			c := "–"
			if len(m.Coef) > 2 {
				c = sig5(m.Coef[2])
			}
			row := []string{name, sig5(m.Coef[0]), sig5(m.Coef[1]), c, Fixed(m.RSquared, 4), OptFixed(m.RMSE, dec+1),
				Fixed(m.AIC, 2), OptFixed(m.Join, 1), OptFixed(m.Plateau, dec), OptFixed(m.Optimum, 1)}
			if r.PriceRatio > 0 {
				econ := OptFixed(m.Econ, 1)
				if m.AtEdge {
					econ += "*"
					models.Foot = EdgeNote
				}
				row = append(row, econ, OptFixed(m.EconYield, dec))
			}
			models.Rows = append(models.Rows, row)
		}
	}
	if len(r.Sensitivity) > 0 {
		sensitivity.Head = []string{"Model"}
		for _, k := range analysis.SensitivityFactors {
			sensitivity.Head = append(sensitivity.Head, "ratio "+strconv.FormatFloat(r.PriceRatio*k, 'g', 4, 64))
		}
		for _, s := range r.Sensitivity {
			if n := len(sensitivity.Rows); n == 0 || sensitivity.Rows[n-1][0] != s.Model {
				sensitivity.Rows = append(sensitivity.Rows, []string{s.Model})
			}
			last := &sensitivity.Rows[len(sensitivity.Rows)-1]
			*last = append(*last, Fixed(s.Rate, 1))
		}
	}
	return trends, models, sensitivity
}

// ResponseNote says what the response analysis shows, in a sentence or
// two, for the note above its tables.
func ResponseNote(r *analysis.Response, dfError int) string {
	var pts []string
	for _, p := range r.Points {
		pts = append(pts, p.Treatment+" "+strconv.FormatFloat(p.Rate, 'f', -1, 64))
	}
	s := fmt.Sprintf("The treatment means at their %d rates (%s), fitted with four models; the trends split the treatment sum of squares on the actual rates and are tested on the %d error df of the design.",
		len(r.Points), strings.Join(pts, ", "), dfError)
	if len(r.LeftOut) > 0 {
		s += " Left out of the trend: " + strings.Join(r.LeftOut, ", ") + "."
	}
	return s
}

func sig5(v float64) string { return strconv.FormatFloat(v, 'g', 5, 64) }

// Fixed formats v with dec decimals for a table, a dash when it is not a
// number; a negative value that rounds to zero is shown as 0. The window's
// tables and the shared text tables here use it.
func Fixed(v float64, dec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "–"
	}
	s := strconv.FormatFloat(v, 'f', max(dec, 0), 64)
	if strings.HasPrefix(s, "-") && strings.Trim(s, "-0.") == "" {
		return s[1:]
	}
	return s
}

// OptFixed is Fixed for an optional value, a dash when there is none.
func OptFixed(v *float64, dec int) string {
	if v == nil {
		return "–"
	}
	return Fixed(*v, dec)
}

// MarginsFor is the margins over input cost of r's trait as the season
// report and the window show them (analysis.MarginsOf with the trial's
// economics): nil without an error when there is nothing to show (no
// produce price, or r is not the trait the margins are worked out from).
func MarginsFor(t *trial.Trial, r *analysis.Result) (*analysis.Margins, error) {
	if t == nil || r == nil || !(t.Economics.ProducePrice > 0) || r.TraitKey != t.EconomicsTrait() {
		return nil, nil
	}
	return analysis.MarginsOf(t, r)
}

// MarginsTable is the table of margins as text (the window and the PDF
// report): per treatment its mean, gross return, costs, margin with its SE
// and letters, and where its cost came from. dec is the decimals of the
// trait's means; amounts have 2.
func MarginsTable(m *analysis.Margins, dec int) TextTable {
	cur := ""
	if m.Currency != "" {
		cur = " (" + m.Currency + ")"
	}
	tt := TextTable{Head: []string{"Treatment", "Mean", "Gross return" + cur, "Product", "Application", "Margin" + cur, "SE", "Letters", "Cost"}}
	for _, r := range m.Rows {
		tt.Rows = append(tt.Rows, []string{r.Treatment, Fixed(r.Mean, dec), Fixed(r.Gross, 2), Fixed(r.Product, 2),
			Fixed(r.Application, 2), Fixed(r.Margin, 2), Fixed(r.MarginSE, 2), r.Letters, r.CostFrom})
	}
	return tt
}

// MarginsNote says how the margins were worked out, for the note above
// their table.
func MarginsNote(m *analysis.Margins) string {
	cur := m.Currency
	if cur == "" {
		cur = "money units"
	}
	per := m.Unit
	if a, _, ok := strings.Cut(per, "/"); ok && a != "" {
		per = a
	}
	s := fmt.Sprintf("Gross return = %s × the mean at %s %s per %s; margin = gross return − product cost − application cost, per unit area. The margin's SE is the price times the mean's SE (the costs are fixed amounts); F test of equal margins: F = %s on %d and %d df, p %s.",
		m.TraitName, strconv.FormatFloat(m.Price, 'g', -1, 64), cur, per, Fixed(m.F, 2), m.DF1, m.DF, stats.FormatP(m.P))
	if m.InputPrice > 0 {
		s += fmt.Sprintf(" Rate treatments without a product cost are costed at %s %s per %s of input (the price ratio %s × the produce price).",
			strconv.FormatFloat(m.InputPrice, 'g', 4, 64), cur, rateUnitOf(m.RateUnit), strconv.FormatFloat(m.PriceRatio, 'g', -1, 64))
	}
	return s
}

// rateUnitOf is the unit of input of a rate unit: "kg N" for "kg N/ha".
func rateUnitOf(u string) string {
	if a, _, ok := strings.Cut(u, "/"); ok && a != "" {
		return a
	}
	if u == "" {
		return "unit"
	}
	return u
}
