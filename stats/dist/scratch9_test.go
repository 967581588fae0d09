package dist

import (
	"math"
	"math/rand/v2"
	"testing"
	"time"
)

func TestScratchTable(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	for _, k := range []float64{2, 10, 300, 1000} {
		for _, nu := range []float64{1, 5, 880, math.Inf(1)} {
			st := time.Now()
			tb := NewSurvivalTable(k, nu)
			bt := time.Since(st)
			d := StudentizedRange{k, nu}
			maxe := 0.0
			qm := d.Quantile(0.5)
			for i := 0; i < 15; i++ {
				p := rng.Float64()
				q := d.Quantile(p)
				if i%3 == 0 {
					q = qm * math.Exp(rng.NormFloat64())
				}
				e := math.Abs(tb.Survival(q) - d.Survival(q))
				if e > maxe {
					maxe = e
				}
			}
			t.Logf("k=%v nu=%v build=%v pieces=%d [%.3g,%.3g] maxerr=%.3g", k, nu, bt, tb.s.pieces(), math.Exp(tb.tlo), math.Exp(tb.thi), maxe)
		}
	}
}
