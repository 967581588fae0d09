package analysis

import (
	"errors"
	"fmt"
	"math"

	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
)

// Where a treatment's input cost comes from (MarginRow.CostFrom).
const (
	CostGiven    = "given"     // the user's product cost
	CostFromRate = "from rate" // rate × the input price the price ratio implies
	CostNone     = "none given"
)

// MarginRow is one treatment's margin over input cost.
type MarginRow struct {
	Treatment, Name string
	N               int
	Mean, SE        float64 // the trait's least-squares mean and its SE
	Gross           float64 // price × mean
	Product         float64 // product cost per unit area (0 when none given)
	Application     float64
	Cost            float64 // Product + Application
	CostFrom        string  // CostGiven, CostFromRate or CostNone
	Margin          float64 // Gross − Cost
	MarginSE        float64 // price × SE: the costs are fixed amounts
	Letters         string  // by the result's mean-separation method, higher margins first
}

// Margins are the margins over input cost of every treatment of one trait:
// the gross return (the produce price times the trait's mean, so in
// currency per unit area when the trait is per unit area) less the
// treatment's input cost, compared by the same letters machinery as the
// means. For a fixed cost a margin is a linear function of the mean, so its
// SE is the price times the mean's SE and the SE of a difference of two
// margins is the price times the SED of the means; the costs shift the
// differences, and so the letters and the F test (a Wald test that all
// margins are equal, stats.EqualityTest) differ from the means'.
type Margins struct {
	Trait, TraitName, Unit string
	Currency               string
	Price                  float64
	PriceRatio             float64 // the rate trial's price ratio used for CostFromRate (0: none)
	InputPrice             float64 // PriceRatio × Price, per rate unit (0: none)
	RateUnit               string
	Rows                   []MarginRow
	// F and P test that all margins are equal, on DF1 and DF error df;
	// they protect the LSD letters as the treatment F test protects the
	// means' letters.
	F, P     float64
	DF1, DF  int
	Method   meansep.Method
	Alpha    float64
	Withheld bool // the LSD letters are withheld: the F test is not significant
	Notes    []string
}

// ErrNoPrice: the margins need a produce price.
var ErrNoPrice = errors.New("the margins need the price of the produce: give it (a price per unit of the trait's unit, such as per t) first")

// MarginsOf works out the margins of r's treatments with the trial's
// economics (t.Economics) and, for rate treatments without a product cost,
// the input price the trial's price ratio implies. r is the analysis of the
// trait the return is worked out from (t.EconomicsTrait()); a factorial
// result is compared by its treatment combinations.
func MarginsOf(t *trial.Trial, r *Result) (*Margins, error) {
	e := t.Economics
	if !(e.ProducePrice > 0) {
		return nil, ErrNoPrice
	}
	if r == nil || r.ANOVA == nil || !(r.ANOVA.MSE > 0) || r.ANOVA.DFError < 1 {
		return nil, errors.New("the margins need an analysis with an error mean square, and this trait has none")
	}
	if r.Transform != stats.NoTransform {
		return nil, fmt.Errorf("the trait %s is analysed on the %s scale; the margins need its means on the scale it was recorded on, so analyse it without a transformation", r.TraitKey, r.Transform.Scale())
	}
	m := &Margins{Trait: r.TraitKey, TraitName: r.TraitName, Unit: r.Unit, Currency: e.Currency, Price: e.ProducePrice,
		Method: r.Method, Alpha: r.Alpha, DF: r.ANOVA.DFError}
	if pr := t.Analysis.Response.PriceRatio; pr > 0 {
		m.PriceRatio, m.InputPrice = pr, pr*e.ProducePrice
	}
	idx := make([]int, len(r.Means))
	theta := make([]float64, len(r.Means))
	for i, mean := range r.Means {
		idx[i] = i
		row := MarginRow{Treatment: mean.Treatment, Name: mean.Name, N: mean.N, Mean: mean.Mean, SE: mean.SE, CostFrom: CostNone}
		tr := t.Treatment(mean.Treatment)
		c := e.Cost(mean.Treatment)
		if c != nil {
			row.Application = c.Application
		}
		switch {
		case c != nil && c.Product != nil:
			row.Product, row.CostFrom = *c.Product, CostGiven
		case tr != nil && tr.Rate != nil && m.InputPrice > 0:
			row.Product, row.CostFrom = *tr.Rate*m.InputPrice, CostFromRate
			m.RateUnit = tr.RateUnit
		case c != nil:
			row.CostFrom = CostGiven // an application cost only (perhaps 0)
		}
		row.Cost = row.Product + row.Application
		row.Gross = e.ProducePrice * mean.Mean
		row.Margin = row.Gross - row.Cost
		row.MarginSE = e.ProducePrice * mean.SE
		theta[i] = row.Margin
		m.Rows = append(m.Rows, row)
	}
	cov, err := meansCovariance(r, idx)
	if err != nil {
		return nil, err
	}
	p2 := e.ProducePrice * e.ProducePrice * r.ANOVA.MSE
	for i := range cov {
		cov[i] *= p2
	}
	if m.F, m.DF1, m.P, err = stats.EqualityTest(theta, cov, m.DF); err != nil {
		return nil, err
	}
	sed := r.SEDMatrix()
	nt := len(r.Means)
	cmp, err := meansep.Compare(theta, meansep.PairSEFunc(func(i, j int) float64 { return e.ProducePrice * sed[i*nt+j] }), m.DF, r.Alpha)
	if err != nil {
		return nil, err
	}
	lo := meansep.LetterOptions{}
	var letters []string
	if r.Method == meansep.Tukey {
		l, err := cmp.TukeyLetters(lo)
		if err != nil {
			return nil, err
		}
		letters = l.Letters
	} else {
		l, err := cmp.LSDLetters(m.P, false, lo)
		if err != nil {
			return nil, err
		}
		m.Withheld = l.Withheld
		if l.Withheld {
			m.Notes = append(m.Notes, fmt.Sprintf("The F test that all margins are equal is not significant (p = %s at α = %g), so no LSD letters are given: the margins are not shown to differ.", stats.FormatP(m.P), r.Alpha))
		}
		letters = l.Letters
	}
	for i := range m.Rows {
		if i < len(letters) && !m.Withheld {
			m.Rows[i].Letters = letters[i]
		}
	}
	none := 0
	for _, row := range m.Rows {
		if row.CostFrom == CostNone {
			none++
		}
	}
	if none > 0 {
		m.Notes = append(m.Notes, fmt.Sprintf("%d of %d treatments have no cost given: their margin is the whole gross return.", none, len(m.Rows)))
	}
	if math.IsNaN(m.F) {
		m.Notes = append(m.Notes, "The margins could not be tested.")
	}
	return m, nil
}
