package dist

import (
	"testing"
	"time"
)

func TestScratchCost(t *testing.T) {
	for _, c := range [][3]float64{{3, 20, 3.5}, {300, 880, 5.7}, {1000, 1, 9.6}, {2, 1, 1.4}, {10, 10000, 4.5}, {100, 5, 6}} {
		cnt := 0
		pR := func(k, y float64) float64 { cnt++; return rangeDensity(k, y) }
		st := time.Now()
		r := studRangeTail(c[0], c[1], c[2], pR, true, false)
		t.Logf("k=%v nu=%v q=%v sf=%.6g evals=%d time=%v", c[0], c[1], c[2], r.v, cnt, time.Since(st))
	}
}
