package analysis

import (
	"math"
	"testing"
)

// TestHandWorkedRCBD checks a small balanced RCBD against an analysis
// worked by hand with the usual computing formulas (Gomez & Gomez 1984,
// Statistical Procedures for Agricultural Research, section 2.2), so that
// every number the report shows is tied to arithmetic anyone can repeat.
//
// Hand-worked. Data, 4 treatments × 3 blocks:
//
//	        block 1  block 2  block 3   total  mean
//	A          10       12       14       36    12
//	B          14       15       19       48    16
//	C          12       14       13       39    13
//	D          16       19       22       57    19
//	total      52       60       68      180    15
//
//	CF        = 180²/12 = 2700
//	SS total  = Σy² − CF = 2832 − 2700 = 132                     (df 11)
//	SS trt    = (36²+48²+39²+57²)/3 − CF = 8370/3 − 2700 = 90    (df 3)
//	SS block  = (52²+60²+68²)/4 − CF = 10928/4 − 2700 = 32       (df 2)
//	SS error  = 132 − 90 − 32 = 10                               (df 6)
//	MS trt 30, MS block 16, MSE 10/6 = 5/3
//	F trt = 30/(5/3) = 18, F block = 16/(5/3) = 9.6
//	CV% = 100·√(5/3)/15 = 8.606629658…;  R² = 1 − 10/132 = 0.924242…
//	SE of a mean = √(MSE/3) = 0.745356…;  SED = √(2·MSE/3) = 1.054092…
//	LSD(0.05) = t(0.975; 6)·SED = 2.446911851·1.054093 = 2.579272
//	  (t by root-finding on the regularised incomplete beta, mpmath 1.3.0)
//	HSD(0.05) = q(0.95; 4, 6)·SE = 4.8956·0.745356 = 3.6490
//	  (q from scipy 1.10.1's studentized_range, 4 decimals, as in the
//	  reference table copied to stats/refdata/studentized-range-quantiles.csv:
//	  row "4,6,0.05,4.8956"; the printed tables give 4.90)
//	RE of blocking = [(r−1)·MSblock + r(t−1)·MSE] / [(rt−1)·MSE]
//	               = [2·16 + 9·(5/3)] / [11·(5/3)] = 47/18.333 = 2.563636
//	  with the small-df adjustment (error df < 20):
//	  k = [(r−1)(t−1)+1][t(r−1)+3] / ([(r−1)(t−1)+3][t(r−1)+1]) = 7·11/(9·9) = 77/81
//	  RE = 2.563636·77/81 = 2.437037
//	Tukey non-additivity: treatment effects −3, +1, −2, +4; block effects
//	  −2, 0, +2; Σ y·a·b = 30, Σa² = 30, Σb² = 8,
//	  SS(non-add.) = 30²/(30·8) = 3.75, remainder 10 − 3.75 = 6.25 on 5 df,
//	  F = 3.75/1.25 = 3
//	p values (upper tails, regularised incomplete beta at 30 digits with
//	  mpmath 1.3.0): F(3,6) > 18: 0.002103755863115797;
//	  F(2,6) > 9.6: 0.013497462477054314; |t(6)| > 4/SED (A vs B): 0.009023238111319360
//	Letters (highest mean first): LSD 2.58 separates D–B (3), B–C (3), B–A
//	  (4) but not C–A (1): D a, B b, C c, A c. HSD 3.65 separates D–C (6),
//	  D–A (7), B–A (4) only: D a, B ab, C bc, A c.
func TestHandWorkedRCBD(t *testing.T) {
	t.Parallel()
	rows := [][]string{
		{"trt", "blk", "y"},
		{"A", "1", "10"}, {"A", "2", "12"}, {"A", "3", "14"},
		{"B", "1", "14"}, {"B", "2", "15"}, {"B", "3", "19"},
		{"C", "1", "12"}, {"C", "2", "14"}, {"C", "3", "13"},
		{"D", "1", "16"}, {"D", "2", "19"}, {"D", "3", "22"},
	}
	ds, err := ParseTable(rows, TableColumns{Treatment: "trt", Block: "blk"})
	if err != nil {
		t.Fatal(err)
	}
	r, err := AnalyzeData(ds[0], Options{Alpha: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-12
	check := func(what string, got, want, tol float64) {
		t.Helper()
		if math.Abs(got-want) > tol*math.Max(1, math.Abs(want)) {
			t.Errorf("%s = %.15g, want %.15g (hand-worked)", what, got, want)
		}
	}
	want := map[string]struct {
		df        int
		ss, ms, f float64
		p         float64
	}{
		"treatment": {3, 90, 30, 18, 0.002103755863115797},
		"block":     {2, 32, 16, 9.6, 0.013497462477054314},
		"error":     {6, 10, 10.0 / 6, 0, 0},
		"total":     {11, 132, 0, 0, 0},
	}
	if len(r.ANOVA.Sources) != len(want) {
		t.Fatalf("%d ANOVA lines, want %d", len(r.ANOVA.Sources), len(want))
	}
	for _, s := range r.ANOVA.Sources {
		w, ok := want[s.Name]
		if !ok {
			t.Errorf("unexpected source %q", s.Name)
			continue
		}
		if s.DF != w.df {
			t.Errorf("%s df = %d, want %d (hand-worked)", s.Name, s.DF, w.df)
		}
		check(s.Name+" SS", s.SS, w.ss, tol)
		if s.Name != "total" {
			check(s.Name+" MS", s.MS, w.ms, tol)
		}
		if s.HasTest {
			check(s.Name+" F", s.F, w.f, tol)
			check(s.Name+" p", s.P, w.p, 1e-9) // mpmath reference
		}
	}
	a := r.ANOVA
	check("grand mean", a.GrandMean, 15, tol)
	check("MSE", a.MSE, 10.0/6, tol)
	check("CV%", a.CVPercent, 100*math.Sqrt(10.0/6)/15, tol)
	check("R²", a.RSquared, 1-10.0/132, tol)
	check("SE of a mean", deref(t, a.SEMean), math.Sqrt(10.0/6/3), tol)
	check("SED", deref(t, a.SED), math.Sqrt(2*10.0/6/3), tol)
	check("relative efficiency", deref(t, a.RelativeEfficiency), (2*16+9*(10.0/6))/(11*(10.0/6))*77/81, tol)
	if r.LSD == nil || r.HSD == nil {
		t.Fatal("balanced data: LSD and HSD must be given")
	}
	check("LSD", *r.LSD, 2.44691185114497*math.Sqrt(2*10.0/6/3), 1e-12) // mpmath t quantile
	// q is known to 4 decimals only: 0.00005/4.8956 ≈ 1e-5 relative.
	check("HSD", *r.HSD, 4.8956*math.Sqrt(10.0/6/3), 1.1e-5)
	if d := r.Diagnostics; d.NonAdditivityF == nil {
		t.Error("no non-additivity test for a balanced RCBD")
	} else {
		check("non-additivity F", *d.NonAdditivityF, 3, 1e-12)
	}
	mean := map[string]float64{"A": 12, "B": 16, "C": 13, "D": 19}
	lsd := map[string]string{"D": "a", "B": "b", "C": "c", "A": "c"}
	hsd := map[string]string{"D": "a", "B": "ab", "C": "bc", "A": "c"}
	for _, m := range r.Means {
		check(m.Treatment+" mean", m.Mean, mean[m.Treatment], tol)
		if m.LettersLSD != lsd[m.Treatment] || m.LettersTukey != hsd[m.Treatment] {
			t.Errorf("%s letters LSD %q Tukey %q, want %q and %q (hand-worked)", m.Treatment, m.LettersLSD, m.LettersTukey, lsd[m.Treatment], hsd[m.Treatment])
		}
	}
	for _, p := range r.Pairs {
		if p.A == "A" && p.B == "B" {
			check("A−B", p.Diff, -4, tol)
			check("A−B p (LSD)", p.PLSD, 0.009023238111319360, 1e-9)
		}
	}
}

// deref returns *p, failing the test when the value is absent.
func deref(t *testing.T, p *float64) float64 {
	t.Helper()
	if p == nil {
		t.Fatal("value absent, want one")
	}
	return *p
}
