package dist

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"
)

func TestScratchScipy(t *testing.T) {
	f, _ := os.Open("/tmp/srfix.csv")
	sc := bufio.NewScanner(f)
	maxc, maxs := 0.0, 0.0
	start := time.Now()
	n := 0
	for sc.Scan() {
		l := sc.Text()
		if strings.HasPrefix(l, "#") || strings.HasPrefix(l, "k,") {
			continue
		}
		fs := strings.Split(l, ",")
		k, _ := strconv.ParseFloat(fs[0], 64)
		df, _ := strconv.ParseFloat(fs[1], 64)
		q, _ := strconv.ParseFloat(fs[2], 64)
		c, _ := strconv.ParseFloat(fs[3], 64)
		s, _ := strconv.ParseFloat(fs[4], 64)
		d := StudentizedRange{k, df}
		gc := d.CDF(q)
		gs := d.Survival(q)
		n++
		if e := math.Abs(gc - c); e > maxc {
			maxc = e
			t.Logf("cdf k=%v df=%v q=%v: %v vs %v err %.3g", k, df, q, gc, c, e)
		}
		if e := math.Abs(gs - s); e > maxs {
			maxs = e
			t.Logf("sf k=%v df=%v q=%v: %v vs %v err %.3g rel %.3g", k, df, q, gs, s, e, e/s)
		}
	}
	t.Logf("n=%d time %v", n, time.Since(start))
}
