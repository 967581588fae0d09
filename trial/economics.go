package trial

import (
	"fmt"
	"math"
	"slices"
)

// Economics are the user's prices for the margin over input cost of each
// treatment: the price of the produce and each treatment's costs. Prices
// are the user's, never built in; a trial without a produce price has no
// margins.
type Economics struct {
	// Currency is a label for the money amounts, for example "EUR" or "$"
	// (free text, shown beside the amounts).
	Currency string
	// ProducePrice is the price of one unit of the trait's unit's produce:
	// per t for a yield in t/ha, per bu for bu/ac. 0: no margins.
	ProducePrice float64
	// Trait is the key of the trait the gross return is worked out from;
	// "" means the trial's yield trait (YieldTrait).
	Trait string
	// Costs are the treatments' input costs per unit area, in the order
	// given; a treatment without an entry has none given.
	Costs []TreatmentCost
}

// TreatmentCost is one treatment's input cost per unit area (per ha when
// the yield is per ha): the product (seed, fertiliser, crop-protection
// product) and its application. Product nil means not given: a rate
// treatment then costs its rate at the input price that the price ratio
// implies (see Analysis.Response.PriceRatio).
type TreatmentCost struct {
	Treatment   string
	Product     *float64
	Application float64
}

// EconomicsTrait returns the key of the trait the margins are worked out
// from: e.Trait when set, else the trial's yield trait, "" when there is
// none.
func (t *Trial) EconomicsTrait() string {
	if t.Economics.Trait != "" {
		return t.Economics.Trait
	}
	if i := YieldTrait(t.Traits); i >= 0 {
		return t.Traits[i].Key
	}
	return ""
}

// Cost returns the saved cost of the treatment with code (nil when none).
func (e Economics) Cost(code string) *TreatmentCost {
	for i := range e.Costs {
		if e.Costs[i].Treatment == code {
			return &e.Costs[i]
		}
	}
	return nil
}

// Clone returns a deep copy of e.
func (e Economics) Clone() Economics {
	e.Costs = slices.Clone(e.Costs)
	for i, c := range e.Costs {
		if c.Product != nil {
			v := *c.Product
			e.Costs[i].Product = &v
		}
	}
	return e
}

// EconomicsProblem says, in plain words, why e cannot be t's economics; ""
// when it can.
func (t *Trial) EconomicsProblem(e Economics) string {
	ok := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) && v >= 0 }
	if !ok(e.ProducePrice) {
		return "the price of the produce must be a positive number, or 0 for none"
	}
	if e.Trait != "" && t.Trait(e.Trait) == nil {
		return fmt.Sprintf("the trial has no trait %q to work the margins out from", e.Trait)
	}
	seen := map[string]bool{}
	for _, c := range e.Costs {
		if t.Treatment(c.Treatment) == nil {
			return fmt.Sprintf("the trial has no treatment %q to give a cost", c.Treatment)
		}
		if seen[c.Treatment] {
			return fmt.Sprintf("the treatment %q has two costs", c.Treatment)
		}
		seen[c.Treatment] = true
		if (c.Product != nil && !ok(*c.Product)) || !ok(c.Application) {
			return fmt.Sprintf("the costs of %q must be positive numbers or 0", c.Treatment)
		}
	}
	return ""
}
