package diag

import (
	"encoding/csv"
	"encoding/json"
	"errors"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/refdata"
)

// fixture is the part of a testdata/*.expected.json file these tests use.
type fixture struct {
	Response  string  `json:"response"`
	Treatment string  `json:"treatment"`
	Block     *string `json:"block"`
	Shapiro   struct {
		W float64 `json:"w"`
		P float64 `json:"p"`
	} `json:"shapiro_residuals"`
	LeveneMedian *struct {
		F   float64 `json:"f"`
		DF1 int     `json:"df1"`
		DF2 int     `json:"df2"`
		P   float64 `json:"p"`
	} `json:"levene_median"`
	LeveneMean *struct {
		F   float64 `json:"f"`
		DF1 int     `json:"df1"`
		DF2 int     `json:"df2"`
		P   float64 `json:"p"`
	} `json:"levene_mean"`
	Bartlett *struct {
		K2 float64 `json:"k2"`
		DF int     `json:"df"`
		P  float64 `json:"p"`
	} `json:"bartlett"`
}

// dataset is a fixture's CSV as values and level indices (levels numbered
// in order of first appearance).
type dataset struct {
	y          []float64
	trt, block []int
	nt, nb     int
}

func load(t *testing.T, name string) (fixture, dataset) {
	t.Helper()
	var fx fixture
	b, err := refdata.ReadFile(name + ".expected.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &fx); err != nil {
		t.Fatal(err)
	}
	f, err := refdata.Open(name + ".csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	col := func(name string) int {
		i := slices.Index(rows[0], name)
		if i < 0 {
			t.Fatalf("column %q missing", name)
		}
		return i
	}
	yi, ti := col(fx.Response), col(fx.Treatment)
	bi := -1
	if fx.Block != nil {
		bi = col(*fx.Block)
	}
	var d dataset
	tl, bl := map[string]int{}, map[string]int{}
	level := func(m map[string]int, s string) int {
		if v, ok := m[s]; ok {
			return v
		}
		m[s] = len(m)
		return m[s]
	}
	for _, r := range rows[1:] {
		if r[yi] == "NA" { // missing plot
			continue
		}
		v, err := strconv.ParseFloat(r[yi], 64)
		if err != nil {
			t.Fatal(err)
		}
		d.y = append(d.y, v)
		d.trt = append(d.trt, level(tl, r[ti]))
		if bi >= 0 {
			d.block = append(d.block, level(bl, r[bi]))
		}
	}
	d.nt, d.nb = len(tl), len(bl)
	return fx, d
}

// residuals of the one-way model (y − treatment mean) or of the additive
// two-way model fitted by least squares. For complete tables this is
// y − row mean − column mean + grand mean; with missing plots the test
// fits the additive model by alternating (Gauss–Seidel) updates of the
// treatment and block effects until they settle, which converges to the
// least-squares fit.
func residuals(d dataset) []float64 {
	n := len(d.y)
	te := make([]float64, d.nt)
	be := make([]float64, d.nb)
	fit := func(eff []float64, idx []int, other func(i int) float64) float64 {
		sum := make([]float64, len(eff))
		cnt := make([]float64, len(eff))
		for i := range n {
			sum[idx[i]] += d.y[i] - other(i)
			cnt[idx[i]]++
		}
		var change float64
		for j := range eff {
			v := sum[j] / cnt[j]
			change = math.Max(change, math.Abs(v-eff[j]))
			eff[j] = v
		}
		return change
	}
	if d.block == nil {
		fit(te, d.trt, func(int) float64 { return 0 })
	} else {
		for range 10000 {
			c1 := fit(te, d.trt, func(i int) float64 { return be[d.block[i]] })
			c2 := fit(be, d.block, func(i int) float64 { return te[d.trt[i]] })
			if math.Max(c1, c2) < 1e-14 {
				break
			}
		}
	}
	r := make([]float64, n)
	for i := range n {
		r[i] = d.y[i] - te[d.trt[i]]
		if d.block != nil {
			r[i] -= be[d.block[i]]
		}
	}
	return r
}

func closeRel(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(math.Abs(want), 1e-300)
}

var fixtures = []string{"plant-growth", "insect-sprays", "insect-sprays-sqrt", "barley-1931-rcbd", "barley-1931-rcbd-missing"}

// Shapiro–Wilk W and p against R 4.2.2 shapiro.test on the residuals
// (testdata/*.expected.json, shapiro_residuals). R implements the same
// algorithm (AS R94), so agreement is expected to rounding.
func TestShapiroWilkR(t *testing.T) {
	t.Parallel()
	for _, name := range fixtures {
		fx, d := load(t, name)
		got, err := ShapiroWilk(residuals(d))
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if !closeRel(got.W, fx.Shapiro.W, 1e-11) || !closeRel(got.P, fx.Shapiro.P, 1e-11) {
			t.Errorf("%s: W = %.15g, p = %.15g; R gives W = %.15g, p = %.15g", name, got.W, got.P, fx.Shapiro.W, fx.Shapiro.P)
		}
	}
}

// Shapiro & Wilk (1965), Biometrika 52, 591–611, worked example: weights
// of 11 men (pounds) 148 154 158 160 161 162 166 170 182 195 236, W = 0.79
// with the exact coefficients (paper's table: a = 0.5601, 0.3315, 0.2260,
// 0.1429, 0.0695), from memory. Royston's approximate coefficients must
// agree with that table to the 3 decimals an approximation of this kind
// gives (from memory), and W with 0.79 to the 2 decimals printed.
func TestShapiroWilkTextbook(t *testing.T) {
	t.Parallel()
	x := []float64{148, 154, 158, 160, 161, 162, 166, 170, 182, 195, 236}
	table := []float64{0.5601, 0.3315, 0.2260, 0.1429, 0.0695}
	a := swCoefficients(len(x))
	for i, want := range table {
		if math.Abs(a[i]-want) > 1e-3 {
			t.Errorf("a[%d] = %.5f, Shapiro & Wilk's table gives %.4f", i+1, a[i], want)
		}
	}
	got, err := ShapiroWilk(x)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(got.W-0.79) > 0.005 {
		t.Errorf("W = %.5f, Shapiro & Wilk print 0.79", got.W)
	}
	// The paper judges these weights clearly non-normal (W below the 1%
	// point 0.792 for n = 11, from memory).
	if got.P >= 0.02 {
		t.Errorf("p = %.5f, want clearly significant", got.P)
	}
	// W computed directly from its definition with the same coefficients:
	// W = (Σ a_i (x_(n+1−i) − x_(i)))² / Σ (x − x̄)².
	var num, m, ss float64
	for i := range a {
		num += a[i] * (x[len(x)-1-i] - x[i])
	}
	for _, v := range x {
		m += v / float64(len(x))
	}
	for _, v := range x {
		ss += (v - m) * (v - m)
	}
	var sa2 float64
	for _, v := range a {
		sa2 += 2 * v * v
	}
	if w := num * num / ss / sa2; !closeRel(got.W, w, 1e-12) {
		t.Errorf("W = %.15g, definition gives %.15g", got.W, w)
	}
}

// For n = 3 the coefficients are exact (±1/√2) and so is the p-value,
// P = (6/π)(asin √W − π/3) (Shapiro & Wilk 1965). Hand-computed: for
// 1, 2, 4 the mean is 7/3, Σ(x − x̄)² = 42/9 and (x₃ − x₁)²/2 = 9/2, so
// W = (9/2)/(42/9) = 27/28.
func TestShapiroWilkThree(t *testing.T) {
	t.Parallel()
	got, err := ShapiroWilk([]float64{4, 1, 2})
	if err != nil {
		t.Fatal(err)
	}
	w := 27.0 / 28
	p := 6 / math.Pi * (math.Asin(math.Sqrt(w)) - math.Pi/3)
	if !closeRel(got.W, w, 1e-11) || !closeRel(got.P, p, 1e-12) {
		t.Errorf("W, p = %.15g, %.15g; want %.15g, %.15g", got.W, got.P, w, p)
	}
	// Equally spaced values are as normal as 3 values can be: W = 1, p = 1.
	got, _ = ShapiroWilk([]float64{1, 2, 3})
	if !closeRel(got.W, 1, 1e-11) || !closeRel(got.P, 1, 1e-12) {
		t.Errorf("equally spaced: W, p = %v, %v; want 1, 1", got.W, got.P)
	}
}

// Invariance (a property of W, Shapiro & Wilk 1965): W does not change
// under location and scale changes, and does not depend on input order.
func TestShapiroWilkInvariance(t *testing.T) {
	t.Parallel()
	x := []float64{3.1, -0.4, 2.2, 5.9, 1.1, 0.3, -2.5, 4.4, 1.7, 2.0, 0.9, 3.3, -1.2, 6.5}
	a, _ := ShapiroWilk(x)
	y := make([]float64, len(x))
	for i, v := range x {
		y[len(x)-1-i] = 1000 + 37*v
	}
	b, _ := ShapiroWilk(y)
	if !closeRel(a.W, b.W, 1e-12) || !closeRel(a.P, b.P, 1e-10) {
		t.Errorf("W, p changed under a linear map: %v %v vs %v %v", a.W, a.P, b.W, b.P)
	}
	if x[0] != 3.1 {
		t.Error("input modified")
	}
}

func TestShapiroWilkErrors(t *testing.T) {
	t.Parallel()
	for _, x := range [][]float64{{1, 2}, {2, 2, 2, 2}, {1, math.NaN(), 3}, make([]float64, 5001)} {
		_, err := ShapiroWilk(x)
		var na *NotApplicableError
		if !errors.As(err, &na) || !errors.Is(err, ErrNotApplicable) || na.Test != "normality" {
			t.Errorf("len %d: err = %v, want a normality NotApplicableError", len(x), err)
		}
	}
}

// Levene (median and mean centring) against R 4.2.2 car::leveneTest and
// Bartlett against bartlett.test (testdata/*.expected.json).
func TestVarianceTestsR(t *testing.T) {
	t.Parallel()
	n := 0
	for _, name := range fixtures {
		fx, d := load(t, name)
		if fx.LeveneMedian == nil {
			continue
		}
		n++
		lm, err := Levene(d.y, d.trt, d.nt, Median)
		if err != nil {
			t.Fatal(err)
		}
		if !closeRel(lm.F, fx.LeveneMedian.F, 1e-11) || !closeRel(lm.P, fx.LeveneMedian.P, 1e-11) ||
			lm.DF1 != fx.LeveneMedian.DF1 || lm.DF2 != fx.LeveneMedian.DF2 {
			t.Errorf("%s Levene median: %+v, R: %+v", name, lm, *fx.LeveneMedian)
		}
		la, err := Levene(d.y, d.trt, d.nt, Mean)
		if err != nil {
			t.Fatal(err)
		}
		if !closeRel(la.F, fx.LeveneMean.F, 1e-9) || !closeRel(la.P, fx.LeveneMean.P, 1e-9) {
			t.Errorf("%s Levene mean: %+v, R: %+v", name, la, *fx.LeveneMean)
		}
		b, err := Bartlett(d.y, d.trt, d.nt)
		if err != nil {
			t.Fatal(err)
		}
		if !closeRel(b.ChiSquare, fx.Bartlett.K2, 1e-11) || !closeRel(b.P, fx.Bartlett.P, 1e-11) || b.DF != fx.Bartlett.DF {
			t.Errorf("%s Bartlett: %+v, R: %+v", name, b, *fx.Bartlett)
		}
	}
	if n != 3 {
		t.Errorf("%d fixtures with variance tests, want 3", n)
	}
}

func TestVarianceTestsErrors(t *testing.T) {
	t.Parallel()
	// One group only; a constant group for Bartlett; single plots.
	if _, err := Levene([]float64{1, 2, 3}, []int{0, 0, 0}, 2, Median); !errors.Is(err, ErrNotApplicable) {
		t.Errorf("one group: %v", err)
	}
	if _, err := Bartlett([]float64{1, 1, 2, 3}, []int{0, 0, 1, 1}, 2); !errors.Is(err, ErrNotApplicable) {
		t.Errorf("constant group: %v", err)
	}
	if _, err := Bartlett([]float64{1, 2, 3}, []int{0, 0, 1}, 2); !errors.Is(err, ErrNotApplicable) {
		t.Errorf("single plot: %v", err)
	}
	// An empty group is ignored: same as the two-group test.
	y := []float64{1, 2, 4, 3, 5, 9}
	a, err1 := Levene(y, []int{0, 0, 0, 2, 2, 2}, 3, Median)
	b, err2 := Levene(y, []int{0, 0, 0, 1, 1, 1}, 2, Median)
	if err1 != nil || err2 != nil || a != b {
		t.Errorf("empty group changed the test: %+v %+v (%v %v)", a, b, err1, err2)
	}
}

// Tukey's one degree of freedom, hand-computed on a 3 × 3 table (exact
// fractions), blocks as rows:
//
//	10 12 14
//	11 14 18
//	12 16 22
//
// grand mean 43/3; block effects −7/3, 0, 7/3; treatment effects −10/3,
// −1/3, 11/3; Σ y·a·b = 448/9; Σa² = 98/9; Σb² = 74/3;
// SS_nonadd = (448/9)² / (98/9 · 74/3) = 1024/111; SS_error = 28/3;
// remainder = 28/3 − 1024/111 = 4/37 on 3 df; F = (1024/111)/((4/37)/3) = 256.
// The p-value of F(1, 3) = 256 equals P(|t₃| > 16), and for 3 df
// P(|t| > x) = 1 − (2/π)[atan(x/√3) + (x/√3)/(1 + x²/3)]
// (closed form of the t distribution with 3 df, e.g. Johnson, Kotz &
// Balakrishnan, Continuous Univariate Distributions, from memory).
func TestTukeyNonAdditivityHand(t *testing.T) {
	t.Parallel()
	tab := [][]float64{{10, 12, 14}, {11, 14, 18}, {12, 16, 22}}
	var y []float64
	var bl, tr []int
	// Shuffled input order must not matter.
	for _, c := range [][2]int{{2, 1}, {0, 0}, {1, 2}, {0, 2}, {2, 0}, {1, 0}, {0, 1}, {2, 2}, {1, 1}} {
		y = append(y, tab[c[0]][c[1]])
		bl = append(bl, c[0])
		tr = append(tr, c[1])
	}
	got, err := TukeyNonAdditivity(y, bl, tr, 3, 3)
	if err != nil {
		t.Fatal(err)
	}
	x := 16 / math.Sqrt(3)
	p := 1 - 2/math.Pi*(math.Atan(x)+x/(1+x*x))
	if !closeRel(got.SS, 1024.0/111, 1e-12) || !closeRel(got.Remainder, 4.0/37, 1e-10) ||
		!closeRel(got.F, 256, 1e-10) || got.DF1 != 1 || got.DF2 != 3 || !closeRel(got.P, p, 1e-9) {
		t.Errorf("got %+v, want SS 1024/111, remainder 4/37, F 256 on (1, 3), p %.12g", got, p)
	}
}

// Tukey's test is the extra sum of squares from adding the single
// regressor a_i·b_j (product of estimated block and treatment effects) to
// the additive model (Tukey 1949). Check on the barley RCBD by fitting that
// regression independently: the regressor is orthogonal to the additive
// model's columns, so its SS is (Σ r·ab)² / Σ (ab)², with r the additive
// residuals computed by the test's own least-squares fit.
func TestTukeyNonAdditivityRegression(t *testing.T) {
	t.Parallel()
	_, d := load(t, "barley-1931-rcbd")
	got, err := TukeyNonAdditivity(d.y, d.block, d.trt, d.nb, d.nt)
	if err != nil {
		t.Fatal(err)
	}
	r := residuals(d)
	// effects as fitted values minus grand mean, by cell means
	bm := make([]float64, d.nb)
	tm := make([]float64, d.nt)
	var g float64
	for i, v := range d.y {
		bm[d.block[i]] += v / float64(d.nt)
		tm[d.trt[i]] += v / float64(d.nb)
		g += v / float64(len(d.y))
	}
	var num, den, sse float64
	for i := range d.y {
		z := (bm[d.block[i]] - g) * (tm[d.trt[i]] - g)
		num += r[i] * z
		den += z * z
		sse += r[i] * r[i]
	}
	ss := num * num / den
	df2 := (d.nb-1)*(d.nt-1) - 1
	f := ss / ((sse - ss) / float64(df2))
	if !closeRel(got.SS, ss, 1e-9) || !closeRel(got.F, f, 1e-9) || got.DF2 != 44 {
		t.Errorf("got SS %.12g F %.12g df2 %d; regression gives SS %.12g F %.12g df2 44", got.SS, got.F, got.DF2, ss, f)
	}
	if !(got.P > 0 && got.P < 1) {
		t.Errorf("p = %v", got.P)
	}
}

func TestTukeyNonAdditivityNotApplicable(t *testing.T) {
	t.Parallel()
	_, d := load(t, "barley-1931-rcbd-missing")
	_, err := TukeyNonAdditivity(d.y, d.block, d.trt, d.nb, d.nt)
	var na *NotApplicableError
	if !errors.As(err, &na) || !strings.Contains(na.Reason, "missing") {
		t.Errorf("missing plots: err = %v", err)
	}
	// Replicated cell.
	_, err = TukeyNonAdditivity([]float64{1, 2, 3, 4, 5, 6, 7}, []int{0, 0, 0, 1, 1, 1, 0}, []int{0, 1, 2, 0, 1, 2, 0}, 2, 3)
	if !errors.Is(err, ErrNotApplicable) {
		t.Errorf("replicated cell: err = %v", err)
	}
	// Exactly additive table: nothing to test against.
	_, err = TukeyNonAdditivity([]float64{1, 2, 3, 2, 3, 4, 5, 6, 7}, []int{0, 0, 0, 1, 1, 1, 2, 2, 2}, []int{0, 1, 2, 0, 1, 2, 0, 1, 2}, 3, 3)
	if !errors.Is(err, ErrNotApplicable) {
		t.Errorf("additive table: err = %v", err)
	}
}

// Standardised residual r/√(MSE(1−h)) (the internally studentised residual
// of any regression text, common practice): hand-computed values.
func TestStandardisedResiduals(t *testing.T) {
	t.Parallel()
	std, err := StandardisedResiduals([]float64{2, -3, 0.5, 0}, []float64{0.5, 0.75, 0, 1}, 2)
	if err != nil {
		t.Fatal(err)
	}
	// 2/√(2·0.5) = 2; −3/√(2·0.25) = −3√2; 0.5/√2; leverage 1 → 0.
	want := []float64{2, -3 * math.Sqrt2, 0.5 / math.Sqrt2, 0}
	for i := range want {
		if !closeRel(std[i], want[i], 1e-14) && !(want[i] == 0 && std[i] == 0) {
			t.Errorf("std[%d] = %v, want %v", i, std[i], want[i])
		}
	}
	out := Outliers(std, 0) // common practice: |std| > 3
	if len(out) != 1 || out[0].Index != 1 {
		t.Errorf("outliers %+v, want plot index 1 only", out)
	}
	if _, err := StandardisedResiduals([]float64{0}, []float64{0.5}, 0); !errors.Is(err, ErrNotApplicable) {
		t.Errorf("zero MSE: %v", err)
	}
}

// Readings: one level (CheckAlpha, common practice) for every test, stated
// in each sentence; the CV levels are common practice too.
func TestReadings(t *testing.T) {
	t.Parallel()
	clean := Readings(Summary{HasCV: true, CVPercent: 12, HasNormality: true, NormalityW: 0.97, NormalityP: 0.2})
	if len(clean) != 1 || clean[0].Flagged || !strings.Contains(clean[0].Text, "W = 0.970, p = 0.200 (not p < 0.05): no evidence") {
		t.Errorf("clean trial gave %+v", clean)
	}
	w := Readings(Summary{
		HasCV: true, CVPercent: 28.2,
		HasNormality: true, NormalityW: 0.91, NormalityP: 0.04, // flagged at 0.05 (it was not at the old 0.01)
		VarianceOn: "residuals", HasEqualVariance: true, LeveneF: 3.2, EqualVarianceP: 0.0004,
		HasBartlett: true, BartlettK2: 4.1, BartlettP: 0.39,
		HasNonAdditivity: true, NonAdditivityF: 5.1, NonAdditivityP: 0.03,
		Outliers: []Outlier{{Index: 11, Std: 3.44}, {Index: 3, Plot: "Plot 104 (T2, value 8.1)", Std: -3.1}},
	})
	want := []struct {
		check, text string
		flagged     bool
	}{
		{"cv", "CV is 28%, high for a yield trial (above 20%)", true},
		{"normality", "W = 0.910, p = 0.040 (p < 0.05): the residuals depart", true},
		{"levene", "on the residuals of the fitted model, grouped by treatment): F = 3.200, p < 0.001 (p < 0.05)", true},
		{"bartlett", "K² = 4.100, p = 0.390 (not p < 0.05): no evidence", false},
		{"additivity", "F = 5.100, p = 0.030 (p < 0.05): treatment differences change", true},
		{"outlier", "Plot 12 lies far from its expected value (standardised residual 3.44, beyond ±3)", true},
		{"outlier", "Plot 104 (T2, value 8.1) lies far from its expected value (standardised residual -3.10", true},
	}
	if len(w) != len(want) {
		t.Fatalf("got %d readings %+v, want %d", len(w), w, len(want))
	}
	for i, c := range want {
		if w[i].Check != c.check || w[i].Flagged != c.flagged || !strings.Contains(w[i].Text, c.text) {
			t.Errorf("reading %d = %+v, want %s %v containing %q", i, w[i], c.check, c.flagged, c.text)
		}
	}
	if w := Readings(Summary{HasCV: true, CVPercent: 41.3}); len(w) != 1 || !strings.HasPrefix(w[0].Text, "CV is 41%, very high") {
		t.Errorf("CV 41%%: %+v", w)
	}
	// Values without their Has flag are ignored; a p-value that is not a
	// number gives no sentence (never "NaN").
	if w := Readings(Summary{CVPercent: 50, NormalityP: 0, HasBartlett: true, BartlettP: math.NaN()}); w != nil {
		t.Errorf("unflagged values gave %+v", w)
	}
}

func benchShapiro(b *testing.B, n int) {
	x := make([]float64, n)
	s := uint64(1)
	for i := range x { // simple LCG + Box–Muller-free sum of uniforms
		var v float64
		for range 12 {
			s = s*6364136223846793005 + 1442695040888963407
			v += float64(s>>11) / (1 << 53)
		}
		x[i] = v - 6
	}
	b.ResetTimer()
	for b.Loop() {
		if _, err := ShapiroWilk(x); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkShapiroWilk1200(b *testing.B) { benchShapiro(b, 1200) }
func BenchmarkShapiroWilk5000(b *testing.B) { benchShapiro(b, 5000) }

// TestBartlettVariances checks Bartlett's statistic from variances and
// their df against a hand computation and against Bartlett on the values
// themselves (same statistic, Snedecor & Cochran's formula).
func TestBartlettVariances(t *testing.T) {
	// By hand: s² = 4 and 1, 10 df each: pooled 2.5,
	// num = 20·ln 2.5 − 10·ln 4 = 4.462871026, C = 1 + (0.2 − 0.05)/3 = 1.05.
	got, err := BartlettVariances([]float64{4, 1}, []int{10, 10})
	if err != nil {
		t.Fatal(err)
	}
	want := (20*math.Log(2.5) - 10*math.Log(4)) / 1.05
	if math.Abs(got.ChiSquare-want) > 1e-12 || got.DF != 1 {
		t.Fatalf("K² = %v (df %d), want %v (df 1)", got.ChiSquare, got.DF, want)
	}
	values := []float64{1, 3, 2, 7, 4, 4.5, 2, 9, 1, 1.5, 3, 8}
	group := []int{0, 0, 0, 0, 1, 1, 1, 1, 2, 2, 2, 2}
	direct, err := Bartlett(values, group, 3)
	if err != nil {
		t.Fatal(err)
	}
	vars := make([]float64, 3)
	for g := 0; g < 3; g++ {
		s := values[4*g : 4*g+4]
		m := (s[0] + s[1] + s[2] + s[3]) / 4
		for _, v := range s {
			vars[g] += (v - m) * (v - m) / 3
		}
	}
	fromVars, err := BartlettVariances(vars, []int{3, 3, 3})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(direct.ChiSquare-fromVars.ChiSquare) > 1e-12 || math.Abs(direct.P-fromVars.P) > 1e-12 {
		t.Fatalf("from variances %+v, from values %+v", fromVars, direct)
	}
	if _, err := BartlettVariances([]float64{1}, []int{3}); err == nil {
		t.Fatal("one variance: want an error")
	}
}
