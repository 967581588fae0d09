package dist

import (
	"testing"
)

func TestScratchShape(t *testing.T) {
	for _, c := range [][2]float64{{1000, 7.9}, {1000, 6}, {1000, 4}, {300, 7.18}, {10, 4.9}} {
		k, y := c[0], c[1]
		m := y / 2
		hm := rangeLogIntegrand(k, y, m)
		s := ""
		for tt := 0.0; tt < 6.7; tt += 0.25 {
			s += " " + ftoa(hm-rangeLogIntegrand(k, y, m+tt))
		}
		t.Logf("k=%v y=%v: %s", k, y, s)
	}
}
func ftoa(x float64) string { return fmtG(x) }
