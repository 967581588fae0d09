package stats

import (
	"math"
	"strconv"
	"testing"
)

// TestFormatP: p-values to three decimals, below 0.001 as "<0.001" (common
// practice in trial reports); never "NaN".
func TestFormatP(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		p    float64
		want string
	}{
		{0, "<0.001"}, {1e-300, "<0.001"}, {0.0004, "<0.001"}, {0.000999, "<0.001"},
		{0.001, "0.001"}, {0.0234, "0.023"}, {0.04999, "0.050"}, {0.5, "0.500"}, {1, "1.000"},
		{math.NaN(), "–"}, {math.Inf(1), "–"}, {-0.1, "–"}, {1.5, "–"},
	} {
		if got := FormatP(c.p); got != c.want {
			t.Errorf("FormatP(%v) = %q, want %q", c.p, got, c.want)
		}
	}
	if v, err := strconv.ParseFloat(PFloorText, 64); err != nil || v != PFloor {
		t.Errorf("PFloorText %q does not spell PFloor %v", PFloorText, PFloor)
	}
}
