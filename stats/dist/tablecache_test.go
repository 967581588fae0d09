package dist

import (
	"math"
	"testing"
)

func TestCachedSurvivalTableQuantile(t *testing.T) {
	t.Parallel()
	// The table's quantile inverts its survival function, agrees with the
	// direct StudentizedRange.Quantile (itself checked against scipy in
	// srange_test.go) within the table's 1e-9 accuracy, and the cache hands
	// back the same table.
	tab := CachedSurvivalTable(5, 20)
	if CachedSurvivalTable(5, 20) != tab {
		t.Error("the cache built the table twice")
	}
	direct := StudentizedRange{K: 5, Nu: 20}
	for _, p := range []float64{0.5, 0.9, 0.95, 0.99} {
		q := tab.Quantile(p)
		if s := tab.Survival(q); math.Abs(s-(1-p)) > 1e-12 {
			t.Errorf("Survival(Quantile(%g)) = %.15g", p, s)
		}
		if w := direct.Quantile(p); math.Abs(q-w) > 1e-6*w {
			t.Errorf("Quantile(%g) = %.10g, direct %.10g", p, q, w)
		}
	}
}
