package stats

import (
	"errors"
	"math"
	"testing"
)

// Abbott (1925, J. Econ. Entomol. 18, 265–267): corrected % = (C − T)/C × 100.
// Henderson & Tilton (1955, J. Econ. Entomol. 48, 157–161):
// corrected % = (1 − Ta·Cb/(Tb·Ca)) × 100. The values are worked by hand.
func TestEfficacyHandWorked(t *testing.T) {
	t.Parallel()
	abbott := []struct{ treated, untreated, want float64 }{
		// (40 − 10)/40 × 100 = 30/40 × 100 = 75
		{10, 40, 75},
		// (25 − 25)/25 × 100 = 0: no effect
		{25, 25, 0},
		// (8 − 0)/8 × 100 = 100: complete control
		{0, 8, 100},
		// (20 − 30)/20 × 100 = −50: worse than untreated
		{30, 20, -50},
		// (12.5 − 3.75)/12.5 × 100 = 8.75/12.5 × 100 = 70
		{3.75, 12.5, 70},
	}
	for _, c := range abbott {
		got, err := Abbott(c.treated, c.untreated)
		if err != nil || math.Abs(got-c.want) > 1e-12 {
			t.Errorf("Abbott(%g, %g) = %g, %v; want %g", c.treated, c.untreated, got, err, c.want)
		}
	}
	ht := []struct{ tb, ta, cb, ca, want float64 }{
		// 1 − (10·40)/(50·80) = 1 − 400/4000 = 0.9 → 90
		{50, 10, 40, 80, 90},
		// equal populations before: 1 − (10·40)/(40·80) = 1 − 0.125 → 87.5,
		// which is Abbott's (80 − 10)/80 × 100 = 87.5
		{40, 10, 40, 80, 87.5},
		// 1 − (30·20)/(60·60) = 1 − 600/3600 = 1 − 1/6 → 83.333…
		{60, 30, 20, 60, 100 * (1 - 600.0/3600)},
		// no change relative to the untreated: 1 − (20·10)/(10·20) = 0
		{10, 20, 10, 20, 0},
	}
	for _, c := range ht {
		got, err := HendersonTilton(c.tb, c.ta, c.cb, c.ca)
		if err != nil || math.Abs(got-c.want) > 1e-12 {
			t.Errorf("HendersonTilton(%g, %g, %g, %g) = %g, %v; want %g", c.tb, c.ta, c.cb, c.ca, got, err, c.want)
		}
	}
	if v, err := Abbott(10, 40); err != nil || v != 75 {
		t.Fatal("Abbott(10, 40) should be exactly 75")
	}
	// Not possible: the untreated check with nothing to control, a missing mean.
	for _, c := range [][2]float64{{5, 0}, {math.NaN(), 10}, {3, math.Inf(1)}, {-1, 10}} {
		if _, err := Abbott(c[0], c[1]); !errors.Is(err, ErrNoEfficacy) {
			t.Errorf("Abbott(%g, %g): err = %v, want ErrNoEfficacy", c[0], c[1], err)
		}
	}
	if _, err := HendersonTilton(0, 5, 10, 20); !errors.Is(err, ErrNoEfficacy) {
		t.Errorf("HendersonTilton with no insects before in the treated plots: err = %v", err)
	}
}
