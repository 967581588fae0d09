package dist

import (
	"math"
	"math/rand/v2"
	"sync"
	"testing"
)

// TestSurvivalTableAgainstDirect checks the table against the direct double
// integral StudentizedRange.Survival (itself checked against scipy in
// TestScipyFixture) at random points spread over the whole distribution, for
// k in {2, 3, 10, 300, 1000} and ν in {1, 2, 5, 20, 880, ∞}. The design
// bound is 1e-9 absolute (requirement of the mean-separation code).
func TestSurvivalTableAgainstDirect(t *testing.T) {
	t.Parallel()
	ks := []float64{2, 3, 10, 300, 1000}
	nus := []float64{1, 2, 5, 20, 880, math.Inf(1)}
	points := 12
	if testing.Short() {
		ks = []float64{2, 10, 300}
		nus = []float64{1, 20, math.Inf(1)}
		points = 5
	}
	rng := rand.New(rand.NewPCG(20240601, 7))
	var mu sync.Mutex
	worst := 0.0
	var wg sync.WaitGroup
	sem := make(chan struct{}, 2)
	for _, k := range ks {
		for _, nu := range nus {
			// Probabilities for the test points, drawn here so that the
			// sequence does not depend on goroutine scheduling.
			ps := make([]float64, points)
			for i := range ps {
				// Half uniform, half in the far upper tail
				// (survival 1e-3 … 1e-12).
				if i%2 == 0 {
					ps[i] = rng.Float64()
				} else {
					ps[i] = 1 - math.Pow(10, -3-9*rng.Float64())
				}
			}
			jitter := make([]float64, points)
			for i := range jitter {
				jitter[i] = 1 + 0.01*rng.NormFloat64()
			}
			wg.Add(1)
			go func(k, nu float64, ps, jitter []float64) {
				defer wg.Done()
				sem <- struct{}{}
				defer func() { <-sem }()
				tb := NewSurvivalTable(k, nu)
				d := StudentizedRange{K: k, Nu: nu}
				for i, p := range ps {
					q := d.Quantile(p) * jitter[i]
					want := d.Survival(q)
					got := tb.Survival(q)
					e := math.Abs(got - want)
					mu.Lock()
					worst = math.Max(worst, e)
					mu.Unlock()
					if e > 1e-9 {
						t.Errorf("k=%v nu=%v: table Survival(%v) = %.17g, direct %.17g (diff %.3g)", k, nu, q, got, want, e)
					}
				}
			}(k, nu, ps, jitter)
		}
	}
	wg.Wait()
	t.Logf("max |table - direct| = %.3g", worst)
}

// TestSurvivalTableEnds checks the behaviour outside the tabulated range
// (common practice for a survival function): 1 at and below 0, within
// 1e-13 of 1 below the lower end, non-increasing and within 1e-12 of the
// direct value in the far tail, 0 at +Inf, NaN for NaN.
func TestSurvivalTableEnds(t *testing.T) {
	t.Parallel()
	for _, c := range [][2]float64{{3, 1}, {10, 20}, {5, math.Inf(1)}} {
		tb := NewSurvivalTable(c[0], c[1])
		d := StudentizedRange{K: c[0], Nu: c[1]}
		if tb.Survival(0) != 1 || tb.Survival(-1) != 1 || tb.Survival(math.Inf(1)) != 0 || !math.IsNaN(tb.Survival(math.NaN())) {
			t.Errorf("k=%v nu=%v: bad end values", c[0], c[1])
		}
		if s := tb.Survival(1e-6); math.Abs(s-d.Survival(1e-6)) > 1e-12 {
			t.Errorf("k=%v nu=%v: Survival(1e-6) = %v, direct %v", c[0], c[1], s, d.Survival(1e-6))
		}
		prev := 1.0
		for q := 0.05; q < 1e7; q *= 1.7 {
			s := tb.Survival(q)
			if s > prev+1e-15 {
				t.Errorf("k=%v nu=%v: table survival increases at %v", c[0], c[1], q)
			}
			prev = s
			if math.Abs(s-d.Survival(q)) > 1e-9 {
				t.Errorf("k=%v nu=%v: Survival(%v) = %v, direct %v", c[0], c[1], q, s, d.Survival(q))
			}
			if q > 1e4 {
				q *= 10
			}
		}
		if tb.K() != c[0] || tb.Nu() != c[1] {
			t.Errorf("K, Nu = %v, %v", tb.K(), tb.Nu())
		}
	}
}

// TestSurvivalTableConcurrent evaluates one table from several goroutines
// (the table is documented as safe for concurrent use) and compares with
// sequential evaluation (a property test: no outside values involved).
func TestSurvivalTableConcurrent(t *testing.T) {
	t.Parallel()
	tb := NewSurvivalTable(30, 200)
	want := make([]float64, 1000)
	for i := range want {
		want[i] = tb.Survival(0.01 * float64(i))
	}
	var wg sync.WaitGroup
	for g := 0; g < 4; g++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range want {
				if got := tb.Survival(0.01 * float64(i)); got != want[i] {
					t.Errorf("concurrent Survival differs at %v", 0.01*float64(i))
					return
				}
			}
		}()
	}
	wg.Wait()
}
