package stats

import (
	"math"
	"strings"
	"testing"
)

// plantGrowth is R's datasets::PlantGrowth (Dobson 1983, Table 7.1) as
// analysed by R 4.2.2 in stats/refdata/plant-growth.expected.json:
// the three means (ctrl, trt1, trt2), ten plants each, and the error mean
// square on 27 df.
var (
	pgMeans = []float64{5.032, 4.661, 5.526}
	pgMSE   = 0.388595925925926
	pgDF    = 27
)

func pgSED() []float64 {
	s := math.Sqrt(2 * pgMSE / 10)
	return []float64{0, s, s, s, 0, s, s, s, 0}
}

func TestContrastsPairsAgainstR(t *testing.T) {
	t.Parallel()
	// A pairwise contrast is R's pair: diff, se and the unadjusted p
	// ("p_lsd") of plant-growth.expected.json (R 4.2.2 emmeans pairs).
	rows, err := Contrasts(pgMeans, pgSED(), pgDF, []ContrastSpec{
		{"ctrl-trt1", []float64{1, -1, 0}},
		{"ctrl-trt2", []float64{1, 0, -1}},
		{"trt1-trt2", []float64{0, 1, -1}},
	}, Holm)
	if err != nil {
		t.Fatal(err)
	}
	want := []struct{ diff, se, p float64 }{
		{0.371, 0.278781608405549, 0.194387880054301},
		{-0.494, 0.27878160840555, 0.0876816750626833},
		{-0.865, 0.27878160840555, 0.00445923593820547},
	}
	for i, w := range want {
		r := rows[i]
		if math.Abs(r.Estimate-w.diff) > 1e-12 || math.Abs(r.SE-w.se) > 1e-12 || math.Abs(r.P-w.p) > 1e-10 || r.DF != 27 {
			t.Errorf("%s: %+v, R diff %g se %g p %g", r.Name, r, w.diff, w.se, w.p)
		}
	}
	// Holm by hand (Holm 1979) on R's p-values: sorted 0.004459 (×3),
	// 0.087682 (×2), 0.194388 (×1), each at least the one before.
	holm := []float64{math.Max(2*0.0876816750626833, 0.194387880054301), 2 * 0.0876816750626833, 3 * 0.00445923593820547}
	for i, w := range holm {
		if math.Abs(rows[i].PAdjusted-w) > 1e-10 {
			t.Errorf("%s Holm %.12g, by hand %.12g", rows[i].Name, rows[i].PAdjusted, w)
		}
	}
}

func TestContrastsGroupAgainstHand(t *testing.T) {
	t.Parallel()
	// ctrl against the mean of both treatments: coefficients 1, −½, −½.
	// By hand from R's means and MSE (plant-growth.expected.json):
	// estimate 5.032 − (4.661 + 5.526)/2 = −0.0615;
	// SE = √(MSE·(1 + ¼ + ¼)/10) = √(0.388595925925926 × 0.15).
	rows, err := Contrasts(pgMeans, pgSED(), pgDF, []ContrastSpec{{"ctrl vs treated", []float64{1, -0.5, -0.5}}, {"trt1 vs trt2", []float64{0, 1, -1}}}, Bonferroni)
	if err != nil {
		t.Fatal(err)
	}
	r := rows[0]
	se := math.Sqrt(pgMSE * 0.15)
	if math.Abs(r.Estimate+0.0615) > 1e-12 || math.Abs(r.SE-se) > 1e-12 || math.Abs(r.T+0.0615/se) > 1e-10 {
		t.Errorf("%+v, by hand estimate -0.0615 se %.12g", r, se)
	}
	// Bonferroni by hand: twice trt1 − trt2's R p_lsd 0.00445923593820547.
	if math.Abs(rows[1].PAdjusted-2*0.00445923593820547) > 1e-10 {
		t.Errorf("Bonferroni %.12g", rows[1].PAdjusted)
	}
	// The two contrasts are orthogonal (balanced data, Σ c_i d_i = 0), so
	// their sums of squares t²·MSE add up to the treatment sum of squares
	// of R's ANOVA, 3.76634 (Snedecor & Cochran, orthogonal partition of the
	// treatment SS: common practice).
	ss := (rows[0].T*rows[0].T + rows[1].T*rows[1].T) * pgMSE
	if math.Abs(ss-3.76634) > 1e-9 {
		t.Errorf("orthogonal SS %.10g, R's treatment SS 3.76634", ss)
	}
}

func TestContrastsScheffeMaximalIsF(t *testing.T) {
	t.Parallel()
	// Scheffé (1953): the contrast with coefficients m_i − m̄ (balanced)
	// has t²/(a) equal to the ANOVA F, so its Scheffé-adjusted p is the
	// treatment p of R's ANOVA: F 4.84608786238014 on 2 and 27 df,
	// p 0.0159099583256229 (plant-growth.expected.json).
	g := (pgMeans[0] + pgMeans[1] + pgMeans[2]) / 3
	c := []float64{pgMeans[0] - g, pgMeans[1] - g, pgMeans[2] - g}
	rows, err := Contrasts(pgMeans, pgSED(), pgDF, []ContrastSpec{{"max", c}}, Scheffe)
	if err != nil {
		t.Fatal(err)
	}
	if f := rows[0].T * rows[0].T / 2; math.Abs(f-4.84608786238014) > 1e-9 {
		t.Errorf("t²/2 = %.12g, R's F 4.84608786238014", f)
	}
	if math.Abs(rows[0].PAdjusted-0.0159099583256229) > 1e-10 {
		t.Errorf("Scheffé p %.12g, R's ANOVA p 0.0159099583256229", rows[0].PAdjusted)
	}
	if rows[0].PAdjusted <= rows[0].P {
		t.Errorf("Scheffé p %g not above the unadjusted %g", rows[0].PAdjusted, rows[0].P)
	}
}

func TestContrastsRefuses(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		coef []float64
		want string
	}{
		{[]float64{1, 1, -1}, "add up to 1"},
		{[]float64{0, 0, 0}, "no coefficient other than 0"},
		{[]float64{math.NaN(), 0, 0}, "not a number"},
	} {
		_, err := Contrasts(pgMeans, pgSED(), pgDF, []ContrastSpec{{"x", c.coef}}, AdjustNone)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: %v, want %q", c.coef, err, c.want)
		}
	}
	if _, err := ParseAdjustment("tukey"); err == nil {
		t.Error("tukey accepted as an adjustment")
	}
}
