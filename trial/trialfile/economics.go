package trialfile

import (
	"fmt"
	"math"

	"furlong/trial"
)

// economicsV6 holds the user's prices for the margins over input cost
// (version 6); absent when none were given.
type economicsV6 struct {
	Currency     string   `json:"currency,omitempty"`
	ProducePrice float64  `json:"produce_price,omitempty"`
	Trait        string   `json:"trait,omitempty"`
	Costs        []costV6 `json:"costs,omitempty"`
}

// costV6 is one treatment's input cost per unit area: "product" absent
// when not given (a rate treatment is then costed from the price ratio).
type costV6 struct {
	Treatment   string   `json:"treatment"`
	Product     *float64 `json:"product,omitempty"`
	Application float64  `json:"application,omitempty"`
}

func encodeEconomics(e trial.Economics) *economicsV6 {
	if e.Currency == "" && e.ProducePrice == 0 && e.Trait == "" && len(e.Costs) == 0 {
		return nil
	}
	out := &economicsV6{Currency: e.Currency, ProducePrice: e.ProducePrice, Trait: e.Trait}
	for _, c := range e.Clone().Costs {
		out.Costs = append(out.Costs, costV6{Treatment: c.Treatment, Product: c.Product, Application: c.Application})
	}
	return out
}

// decodeEconomics reads the economics member; a negative or non-finite
// amount names its place.
func decodeEconomics(f *economicsV6) (trial.Economics, *fieldError) {
	if f == nil {
		return trial.Economics{}, nil
	}
	bad := func(v float64) bool { return v < 0 || math.IsInf(v, 0) || math.IsNaN(v) }
	if bad(f.ProducePrice) {
		return trial.Economics{}, &fieldError{"trial.economics.produce_price", errorf(ErrOutOfRange, "the price of the produce must be a positive number, not %g", f.ProducePrice)}
	}
	e := trial.Economics{Currency: f.Currency, ProducePrice: f.ProducePrice, Trait: f.Trait}
	for i, c := range f.Costs {
		if (c.Product != nil && bad(*c.Product)) || bad(c.Application) {
			return trial.Economics{}, &fieldError{fmt.Sprintf("trial.economics.costs[%d]", i), errorf(ErrOutOfRange, "the costs of %q must be positive numbers or 0", c.Treatment)}
		}
		e.Costs = append(e.Costs, trial.TreatmentCost{Treatment: c.Treatment, Product: c.Product, Application: c.Application})
	}
	return e.Clone(), nil
}
