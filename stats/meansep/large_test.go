package meansep

import (
	"encoding/csv"
	"math"
	"math/rand/v2"
	"strconv"
	"testing"

	"furlong/stats/refdata"

	"gonum.org/v1/gonum/stat/distuv"
)

// qTable reads stats/refdata/studentized-range-quantiles.csv (scipy
// studentized_range.ppf, 4 decimals).
func qTable(t *testing.T) map[[3]string]float64 {
	f, err := refdata.Open("studentized-range-quantiles.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	m := map[[3]string]float64{}
	for _, r := range rows[1:] {
		v, err := strconv.ParseFloat(r[3], 64)
		if err != nil {
			t.Fatal(err)
		}
		m[[3]string{r[0], r[1], r[2]}] = v
	}
	return m
}

// Large trials use the precomputed survival table for the Tukey p-values
// and invert it for the critical value. Check the critical value against
// the scipy quantile table to its 4 printed decimals, HSD = q·SED/√2 (the
// definition of Tukey's HSD, common practice), and
// the per-pair p-values against the direct computation (gonum's t for the
// LSD p to 1e-9 relative; the direct studentised range for Tukey, at the
// table's design bound of 1e-9 absolute).
func TestCompareLarge(t *testing.T) {
	t.Parallel()
	q := qTable(t)
	for _, c := range []struct {
		k, df int
		alpha string
	}{{50, 60, "0.05"}, {100, 120, "0.05"}, {100, 60, "0.01"}} {
		want := q[[3]string{strconv.Itoa(c.k), strconv.Itoa(c.df), c.alpha}]
		if want == 0 {
			t.Fatalf("no table entry for %+v", c)
		}
		rng := rand.New(rand.NewPCG(uint64(c.k), uint64(c.df)))
		means := make([]float64, c.k)
		for i := range means {
			means[i] = 10 + 2*rng.NormFloat64()
		}
		alpha, _ := strconv.ParseFloat(c.alpha, 64)
		r, err := Compare(means, PairSEFunc(func(i, j int) float64 { return 0.8 }), c.df, alpha)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.QCrit-want) > 5.1e-5 {
			t.Errorf("k %d df %d alpha %s: q = %.6f, table %.4f", c.k, c.df, c.alpha, r.QCrit, want)
		}
		if !r.EqualSE || r.HSD == nil || r.SED == nil || math.Abs(*r.HSD-r.QCrit*0.8/math.Sqrt2) > 1e-12 || math.Abs(*r.SED-0.8) > 0 {
			t.Errorf("HSD %v SED %v EqualSE %v", r.HSD, r.SED, r.EqualSE)
		}
		td := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(c.df)}
		sr := exactRange(c.k, c.df)
		for n := 0; n < len(r.Pairs); n += len(r.Pairs) / 7 {
			p := r.Pairs[n]
			if w := 2 * td.Survival(math.Abs(p.T)); math.Abs(p.PLSD-w) > 1e-9*w {
				t.Errorf("pair %d,%d: PLSD %.15g, gonum %.15g", p.I, p.J, p.PLSD, w)
			}
			if w := sr(math.Abs(p.T) * math.Sqrt2); math.Abs(p.PTukey-w) > 1e-9 {
				t.Errorf("pair %d,%d: PTukey %.15g, direct %.15g", p.I, p.J, p.PTukey, w)
			}
		}
	}
}

// EqualSE: pair SEs equal to a relative 1e-9 count as equal (balanced).
func TestEqualSE(t *testing.T) {
	t.Parallel()
	means := []float64{1, 2, 3}
	for _, c := range []struct {
		eps  float64
		want bool
	}{{0, true}, {1e-12, true}, {1e-7, false}} {
		se := PairSEFunc(func(i, j int) float64 {
			if i == 1 && j == 2 {
				return 1 + c.eps
			}
			return 1
		})
		r, err := Compare(means, se, 10, 0.05)
		if err != nil {
			t.Fatal(err)
		}
		if r.EqualSE != c.want || (r.HSD != nil) != c.want || (r.LSD != nil) != c.want {
			t.Errorf("eps %v: EqualSE %v HSD %v LSD %v", c.eps, r.EqualSE, r.HSD, r.LSD)
		}
	}
}
