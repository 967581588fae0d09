package meansep

import (
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/refdata"
)

type fixture struct {
	Anova []struct {
		Source string   `json:"source"`
		P      *float64 `json:"p"`
	} `json:"anova"`
	Treatment string `json:"treatment"`
	DFError   int    `json:"df_error"`
	Means     []struct {
		Treatment string  `json:"treatment"`
		LSMean    float64 `json:"ls_mean"`
	} `json:"means"`
	Pairs []struct {
		Contrast    string  `json:"contrast"`
		Diff        float64 `json:"diff"`
		SE          float64 `json:"se"`
		PLSD        float64 `json:"p_lsd"`
		PTukeyExact float64 `json:"p_tukey_exact"`
	} `json:"pairs"`
	TCrit   float64           `json:"t_crit_975"`
	QCrit   float64           `json:"q_crit_95"`
	LSD     *float64          `json:"lsd_05"`
	HSD     *float64          `json:"hsd_05"`
	Letters map[string]string `json:"letters_tukey_example"`
}

// loaded is a fixture as plain inputs: LS means in level order, a pair SE
// lookup, and the F test p of the treatment.
type loaded struct {
	fx    fixture
	names []string
	means []float64
	se    map[[2]int]float64
	index map[[2]int]int // pair → position in fx.Pairs
	fp    float64
}

func loadFixture(t *testing.T, name string) loaded {
	t.Helper()
	b, err := refdata.ReadFile(name + ".expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var l loaded
	if err := json.Unmarshal(b, &l.fx); err != nil {
		t.Fatal(err)
	}
	pos := map[string]int{}
	for i, m := range l.fx.Means {
		l.names = append(l.names, m.Treatment)
		l.means = append(l.means, m.LSMean)
		pos[m.Treatment] = i
	}
	l.se = map[[2]int]float64{}
	l.index = map[[2]int]int{}
	for n, p := range l.fx.Pairs {
		a, b, ok := strings.Cut(p.Contrast, " - ")
		i, ok1 := pos[a]
		j, ok2 := pos[b]
		if !ok || !ok1 || !ok2 || i >= j {
			t.Fatalf("%s: contrast %q", name, p.Contrast)
		}
		l.se[[2]int{i, j}] = p.SE
		l.index[[2]int{i, j}] = n
	}
	for _, s := range l.fx.Anova {
		if s.Source == l.fx.Treatment {
			l.fp = *s.P
		}
	}
	return l
}

func (l loaded) pairSE(i, j int) float64 {
	if i > j {
		i, j = j, i
	}
	return l.se[[2]int{i, j}]
}

func relErr(got, want float64) float64 {
	if got == want {
		return 0
	}
	return math.Abs(got-want) / math.Abs(want)
}

var fixtureNames = []string{"plant-growth", "insect-sprays", "insect-sprays-sqrt", "barley-1931-rcbd", "barley-1931-rcbd-missing"}

// mpmathTukey reads testdata/srange-mpmath.json: Tukey p-values below 1e-4
// of the fixture pairs by 30-digit quadrature (mpmath 1.3.0, script
// testdata/srange_mpmath.py), keyed by "fixture contrast".
func mpmathTukey(t *testing.T) map[string]float64 {
	b, err := os.ReadFile(filepath.Join("testdata", "srange-mpmath.json"))
	if err != nil {
		t.Fatal(err)
	}
	var rows []struct {
		Fixture, Contrast, P string
	}
	if err := json.Unmarshal(b, &rows); err != nil {
		t.Fatal(err)
	}
	m := map[string]float64{}
	for _, r := range rows {
		v, err := strconv.ParseFloat(r.P, 64)
		if err != nil {
			t.Fatal(err)
		}
		m[r.Fixture+" "+r.Contrast] = v
	}
	return m
}

// Pairwise comparisons against the R/emmeans reference results
// (testdata/*.expected.json): Diff, SE, p_lsd (R pt) to 1e-9 relative;
// Tukey p against p_tukey_exact (scipy studentized_range) to 1e-9
// relative (small p-values: see below); t and q critical values, LSD and
// HSD to 1e-9.
func TestCompareFixtures(t *testing.T) {
	t.Parallel()
	hp := mpmathTukey(t)
	nhp := 0
	defer func() {
		if nhp != len(hp) || nhp < 3 {
			t.Errorf("checked %d of %d 30-digit references", nhp, len(hp))
		}
	}()
	for _, name := range fixtureNames {
		l := loadFixture(t, name)
		r, err := Compare(l.means, PairSEFunc(l.pairSE), l.fx.DFError, 0.05)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if len(r.Pairs) != len(l.fx.Pairs) {
			t.Fatalf("%s: %d pairs, want %d", name, len(r.Pairs), len(l.fx.Pairs))
		}
		for _, p := range r.Pairs {
			w := l.fx.Pairs[l.index[[2]int{p.I, p.J}]]
			for _, c := range []struct {
				what      string
				got, want float64
			}{{"diff", p.Diff, w.Diff}, {"se", p.SE, w.SE}, {"p_lsd", p.PLSD, w.PLSD}} {
				if e := relErr(c.got, c.want); e > 1e-9 {
					t.Errorf("%s %s: %s = %.15g, reference %.15g (rel. error %.1e)", name, w.Contrast, c.what, c.got, c.want, e)
				}
			}
			// Tukey p: scipy to 1e-9 relative where p ≥ 1e-4. Below, the
			// scipy values carry an absolute error of about 1.2e-14 (shown
			// by the 30-digit quadrature in srange-mpmath.json), so they
			// are checked to 2e-14 absolute, and the pairs with a 30-digit
			// value to 1e-9 relative.
			if w.PTukeyExact >= 1e-4 {
				if e := relErr(p.PTukey, w.PTukeyExact); e > 1e-9 {
					t.Errorf("%s %s: p_tukey = %.15g, scipy %.15g (rel. error %.1e)", name, w.Contrast, p.PTukey, w.PTukeyExact, e)
				}
			} else {
				if d := math.Abs(p.PTukey - w.PTukeyExact); d > 2e-14 {
					t.Errorf("%s %s: p_tukey = %.15g, scipy %.15g (abs. error %.1e)", name, w.Contrast, p.PTukey, w.PTukeyExact, d)
				}
				if mp, ok := hp[name+" "+w.Contrast]; ok {
					if e := relErr(p.PTukey, mp); e > 1e-9 {
						t.Errorf("%s %s: p_tukey = %.15g, mpmath %.15g (rel. error %.1e)", name, w.Contrast, p.PTukey, mp, e)
					}
					nhp++
				}
			}
			if e := relErr(p.Upper-p.Lower, 2*r.TCrit*w.SE); e > 1e-12 {
				t.Errorf("%s: CI width", name)
			}
		}
		if e := relErr(r.TCrit, l.fx.TCrit); e > 1e-9 {
			t.Errorf("%s: t crit %.15g, R %.15g", name, r.TCrit, l.fx.TCrit)
		}
		if e := relErr(r.QCrit, l.fx.QCrit); e > 1e-9 {
			t.Errorf("%s: q crit %.15g, scipy %.15g", name, r.QCrit, l.fx.QCrit)
		}
		balanced := l.fx.HSD != nil
		if r.EqualSE != balanced {
			t.Errorf("%s: EqualSE = %v, want %v", name, r.EqualSE, balanced)
		}
		if balanced {
			if r.HSD == nil || r.LSD == nil || r.SED == nil {
				t.Fatalf("%s: balanced but HSD %v LSD %v SED %v", name, r.HSD, r.LSD, r.SED)
			}
			if e := relErr(*r.HSD, *l.fx.HSD); e > 1e-9 {
				t.Errorf("%s: HSD %.15g, scipy-based %.15g", name, *r.HSD, *l.fx.HSD)
			}
			if e := relErr(*r.LSD, *l.fx.LSD); e > 1e-9 {
				t.Errorf("%s: LSD %.15g, R %.15g", name, *r.LSD, *l.fx.LSD)
			}
		} else if r.HSD != nil || r.LSD != nil || r.SED != nil {
			t.Errorf("%s: unbalanced but HSD %v LSD %v SED %v", name, r.HSD, r.LSD, r.SED)
		}
	}
}

// Letters against letters_tukey_example (one valid lettering from R):
// the same pairs must share a letter. Also the LSD letters must be a valid
// display of p_lsd < 0.05.
func TestLettersFixtures(t *testing.T) {
	t.Parallel()
	for _, name := range fixtureNames {
		l := loadFixture(t, name)
		r, err := Compare(l.means, PairSEFunc(l.pairSE), l.fx.DFError, 0.05)
		if err != nil {
			t.Fatal(err)
		}
		tl, err := r.TukeyLetters(LetterOptions{})
		if err != nil {
			t.Fatal(err)
		}
		for i := range l.names {
			for j := i + 1; j < len(l.names); j++ {
				want := strings.ContainsAny(l.fx.Letters[l.names[i]], l.fx.Letters[l.names[j]])
				got := strings.ContainsAny(tl.Letters[i], tl.Letters[j])
				if got != want {
					t.Errorf("%s: %s (%s) and %s (%s) share a letter: %v; R example: %v", name, l.names[i], tl.Letters[i], l.names[j], tl.Letters[j], got, want)
				}
			}
		}
		best := 0
		for i, m := range l.means {
			if m > l.means[best] {
				best = i
			}
		}
		if !strings.Contains(tl.Letters[best], "a") {
			t.Errorf("%s: highest mean has letters %q, want an a", name, tl.Letters[best])
		}
		ll, err := r.LSDLetters(l.fp, false, LetterOptions{})
		if err != nil || ll.Withheld {
			t.Fatalf("%s: F p = %v: %+v %v", name, l.fp, ll, err)
		}
		cols, _ := letterColumns(r.Means, r.Significant(LSD), LetterOptions{})
		checkDisplay(t, r.K, func(i, j int) bool { return l.fx.Pairs[l.index[[2]int{i, j}]].PLSD < 0.05 }, cols)
		cols, _ = letterColumns(r.Means, r.Significant(Tukey), LetterOptions{})
		checkDisplay(t, r.K, func(i, j int) bool { return l.fx.Pairs[l.index[[2]int{i, j}]].PTukeyExact < 0.05 }, cols)
	}
}

// Protected LSD: Fisher's protection (common practice): no letters when
// the treatment F test is not significant, unless unprotected.
func TestProtectedLSD(t *testing.T) {
	t.Parallel()
	l := loadFixture(t, "plant-growth")
	r, _ := Compare(l.means, PairSEFunc(l.pairSE), l.fx.DFError, 0.05)
	got, err := r.LSDLetters(0.2, false, LetterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !got.Withheld || got.Letters != nil || got.Note != "the treatment F test is not significant at 5%: no LSD letters (means do not differ detectably)" {
		t.Errorf("got %+v", got)
	}
	got, err = r.LSDLetters(0.2, true, LetterOptions{})
	if err != nil || got.Withheld || len(got.Letters) != 3 {
		t.Errorf("unprotected: %+v %v", got, err)
	}
	if _, note := Protect(0.03, 0.01); !strings.Contains(note, "at 1%:") {
		t.Errorf("1%% note: %q", note)
	}
	// p_lsd for plant-growth: trt1–trt2 0.0045 only is below 5%, so
	// LSD letters: ctrl ab, trt1 a, trt2 b (by hand from the fixture's
	// p_lsd; ctrl is the middle mean).
	got, _ = r.LSDLetters(l.fp, false, LetterOptions{})
	if !slices.Equal(got.Letters, []string{"ab", "b", "a"}) {
		t.Errorf("LSD letters %q, want [ab b a] (trt2 highest gets a)", got.Letters)
	}
}

func TestCompareErrors(t *testing.T) {
	t.Parallel()
	one := PairSEFunc(func(i, j int) float64 { return 1 })
	for _, c := range []struct {
		means []float64
		se    PairSEer
		df    int
		alpha float64
		want  error
	}{
		{[]float64{1}, one, 10, 0.05, ErrTooFewMeans},
		{[]float64{1, 2}, one, 0, 0.05, ErrNoErrorDF},
		{[]float64{1, 2}, one, 10, 0, ErrBadAlpha},
		{[]float64{1, 2}, one, 10, 5, ErrBadAlpha},
		{[]float64{1, math.Inf(1)}, one, 10, 0.05, ErrBadMean},
		{[]float64{1, 2}, PairSEFunc(func(i, j int) float64 { return 0 }), 10, 0.05, ErrBadSE},
		{[]float64{1, 2}, PairSEFunc(func(i, j int) float64 { return math.NaN() }), 10, 0.05, ErrBadSE},
	} {
		if _, err := Compare(c.means, c.se, c.df, c.alpha); !errors.Is(err, c.want) {
			t.Errorf("%v df %d alpha %v: err %v, want %v", c.means, c.df, c.alpha, err, c.want)
		}
	}
}

func TestPairIndex(t *testing.T) {
	t.Parallel()
	r, err := Compare([]float64{5, 3, 2, 8}, PairSEFunc(func(i, j int) float64 { return 1 }), 12, 0.05)
	if err != nil {
		t.Fatal(err)
	}
	for i := range 4 {
		for j := range 4 {
			if i == j {
				continue
			}
			p := r.Pair(i, j)
			if p.I != min(i, j) || p.J != max(i, j) || p.Diff != r.Means[p.I]-r.Means[p.J] {
				t.Errorf("Pair(%d,%d) = %+v", i, j, p)
			}
		}
	}
}

func benchMeans(k int) ([]float64, PairSEer) {
	rng := rand.New(rand.NewPCG(3, uint64(k)))
	means := make([]float64, k)
	for i := range means {
		means[i] = 50 + 5*rng.NormFloat64()
	}
	return means, PairSEFunc(func(i, j int) float64 { return 2.5 })
}

// k = 300 entries in 4 replicates: error df (300−1)(4−1) = 897; the
// project's speed target of 880 error df (some missing plots) is used.
func BenchmarkCompare300(b *testing.B) {
	means, se := benchMeans(300)
	for b.Loop() {
		r, err := Compare(means, se, 880, 0.05)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := r.TukeyLetters(LetterOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkCompare1000(b *testing.B) {
	means, se := benchMeans(1000)
	for b.Loop() {
		r, err := Compare(means, se, 2997, 0.05)
		if err != nil {
			b.Fatal(err)
		}
		if _, err := r.TukeyLetters(LetterOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}
