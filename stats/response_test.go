package stats

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"sort"
	"strconv"
	"testing"

	"furlong/stats/refdata"
)

// nitrogenData reads stats/refdata/nitrogen-rates.csv: per rate the
// treatment mean, and the RCBD error mean square and df computed from the
// definitions (block and treatment sums of squares of a balanced table).
func nitrogenData(t *testing.T) (rates, means []float64, reps int, mse float64, dfe int) {
	t.Helper()
	f, err := refdata.Open("nitrogen-rates.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	byRate := map[float64][]float64{}
	byBlock := map[string][]float64{}
	var all []float64
	for _, r := range rows[1:] {
		x, _ := strconv.ParseFloat(r[2], 64)
		y, _ := strconv.ParseFloat(r[3], 64)
		byRate[x] = append(byRate[x], y)
		byBlock[r[1]] = append(byBlock[r[1]], y)
		all = append(all, y)
	}
	for x := range byRate {
		rates = append(rates, x)
	}
	sort.Float64s(rates)
	gm := mean(all)
	var sst, sstrt, ssb float64
	for _, y := range all {
		sst += (y - gm) * (y - gm)
	}
	for _, x := range rates {
		m := mean(byRate[x])
		means = append(means, m)
		sstrt += float64(len(byRate[x])) * (m - gm) * (m - gm)
	}
	for _, ys := range byBlock {
		m := mean(ys)
		ssb += float64(len(ys)) * (m - gm) * (m - gm)
	}
	reps = len(byBlock)
	dfe = (len(rates) - 1) * (reps - 1)
	mse = (sst - sstrt - ssb) / float64(dfe)
	return
}

type nitrogenExpected struct {
	Contrasts []struct {
		Source string  `json:"source"`
		DF     int     `json:"df"`
		SS     float64 `json:"ss"`
		F      float64 `json:"f"`
		P      float64 `json:"p"`
	} `json:"contrasts"`
	Quadratic struct {
		Coefficients []float64 `json:"coefficients"`
		Optimum      float64   `json:"economic_optimum_rate"`
	} `json:"quadratic"`
	QuadraticPlateau struct {
		Coefficients []float64 `json:"coefficients"`
		Join         float64   `json:"join_point"`
		Optimum      float64   `json:"economic_optimum_rate"`
	} `json:"quadratic_plateau"`
}

func loadNitrogenExpected(t *testing.T) nitrogenExpected {
	t.Helper()
	b, err := refdata.ReadFile("nitrogen-rates.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var e nitrogenExpected
	if err := json.Unmarshal(b, &e); err != nil {
		t.Fatal(err)
	}
	return e
}

func relClose(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Max(math.Abs(b), 1e-300) }

func TestPolynomialTrendAgainstR(t *testing.T) {
	t.Parallel()
	// Reference: R 4.2.2 aov with contr.poly(scores = rates)
	// (stats/refdata/nitrogen-rates.expected.json).
	rates, means, reps, mse, dfe := nitrogenData(t)
	cov := make([]float64, len(rates)*len(rates))
	for i := range rates {
		cov[i*len(rates)+i] = 1 / float64(reps)
	}
	got, err := PolynomialTrend(means, cov, rates, mse, dfe)
	if err != nil {
		t.Fatal(err)
	}
	want := loadNitrogenExpected(t).Contrasts
	if len(got) != len(want) {
		t.Fatalf("%d lines, want %d", len(got), len(want))
	}
	for i, w := range want {
		g := got[i]
		if g.Source != w.Source || g.DF != w.DF || !relClose(g.SS, w.SS, 1e-10) || !relClose(g.F, w.F, 1e-9) || !relClose(g.P, w.P, 1e-7) {
			t.Errorf("%s: got df %d ss %.12g F %.12g p %.6g; R %d %.12g %.12g %.6g", w.Source, g.DF, g.SS, g.F, g.P, w.DF, w.SS, w.F, w.P)
		}
	}
}

func TestPolynomialTrendUnequalSpacingAddsUp(t *testing.T) {
	t.Parallel()
	// With balanced data the trend lines add up to the treatment sum of
	// squares r·Σ(ȳ_i − ȳ)² (the partition of Gomez & Gomez 1984, §5.2.3),
	// also for unequally spaced rates, and the linear SS is the classic
	// (Σ c_i ȳ_i)² r / Σ c_i² with c_i = x_i − x̄.
	rates := []float64{0, 30, 60, 120, 240, 250}
	means := []float64{3.1, 4.6, 5.2, 6.4, 6.1, 6.3}
	const r = 3
	cov := make([]float64, len(rates)*len(rates))
	for i := range rates {
		cov[i*len(rates)+i] = 1.0 / r
	}
	lines, err := PolynomialTrend(means, cov, rates, 0.2, 15)
	if err != nil {
		t.Fatal(err)
	}
	var sum, sstrt float64
	for _, l := range lines {
		sum += l.SS
	}
	gm, xbar := mean(means), mean(rates)
	var num, den float64
	for i := range means {
		sstrt += r * (means[i] - gm) * (means[i] - gm)
		num += (rates[i] - xbar) * means[i]
		den += (rates[i] - xbar) * (rates[i] - xbar)
	}
	if !relClose(sum, sstrt, 1e-12) {
		t.Errorf("lines add to %.15g, treatment SS %.15g", sum, sstrt)
	}
	if lin := num * num * r / den; !relClose(lines[0].SS, lin, 1e-12) {
		t.Errorf("linear SS %.15g, classic %.15g", lines[0].SS, lin)
	}
	if lines[2].DF != 3 {
		t.Errorf("lack of fit df %d", lines[2].DF)
	}
}

func TestFitResponseAgainstR(t *testing.T) {
	t.Parallel()
	// Reference: R 4.2.2 lm on the means and the profiled quadratic-plateau
	// (stats/refdata/nitrogen-rates.expected.json); price ratio 0.008 t
	// grain per kg N. The quadratic's economic optimum is also checked by
	// hand: x* = (R − b)/(2c).
	rates, means, _, _, _ := nitrogenData(t)
	e := loadNitrogenExpected(t)
	models, notes, err := FitResponse(rates, means)
	if err != nil {
		t.Fatal(err)
	}
	byName := map[string]ResponseModel{}
	for _, m := range models {
		byName[m.Model] = m
	}
	q, ok := byName[QuadraticModel]
	if !ok {
		t.Fatalf("no quadratic; notes %v", notes)
	}
	for i, w := range e.Quadratic.Coefficients {
		if !relClose(q.Coef[i], w, 1e-9) {
			t.Errorf("quadratic coef %d = %.12g, R %.12g", i, q.Coef[i], w)
		}
	}
	const ratio = 0.008
	opt, edge := q.EconomicOptimum(ratio)
	hand := (ratio - q.Coef[1]) / (2 * q.Coef[2])
	if edge || !relClose(opt, e.Quadratic.Optimum, 1e-9) || !relClose(opt, hand, 1e-12) {
		t.Errorf("quadratic economic optimum %.12g (edge %v), R %.12g, by hand %.12g", opt, edge, e.Quadratic.Optimum, hand)
	}
	qp, ok := byName[QuadraticPlateauModel]
	if !ok {
		t.Fatalf("no quadratic-plateau; notes %v", notes)
	}
	for i, w := range e.QuadraticPlateau.Coefficients {
		if !relClose(qp.Coef[i], w, 1e-6) {
			t.Errorf("quadratic-plateau coef %d = %.12g, R %.12g", i, qp.Coef[i], w)
		}
	}
	if !relClose(*qp.Join, e.QuadraticPlateau.Join, 1e-7) {
		t.Errorf("join %.12g, R %.12g", *qp.Join, e.QuadraticPlateau.Join)
	}
	opt, _ = qp.EconomicOptimum(ratio)
	if !relClose(opt, e.QuadraticPlateau.Optimum, 1e-6) {
		t.Errorf("quadratic-plateau economic optimum %.12g, R %.12g", opt, e.QuadraticPlateau.Optimum)
	}
	if _, ok := byName[LinearModel]; !ok {
		t.Error("no linear model")
	}
	for _, m := range models {
		if m.RSquared < 0 || m.RSquared > 1 || math.IsNaN(m.AIC) {
			t.Errorf("%s: R² %g AIC %g", m.Model, m.RSquared, m.AIC)
		}
	}
}

func TestFitResponseLinearPlateauExact(t *testing.T) {
	t.Parallel()
	// Means lying exactly on y = 2 + 0.03·min(x, 110): the profiled fit
	// recovers the line, the join point and a zero residual (a check by
	// construction: the least-squares solution of exact data is the data's
	// own curve).
	rates := []float64{0, 40, 80, 120, 160, 200}
	means := make([]float64, len(rates))
	for i, x := range rates {
		means[i] = 2 + 0.03*math.Min(x, 110)
	}
	models, _, err := FitResponse(rates, means)
	if err != nil {
		t.Fatal(err)
	}
	var lp *ResponseModel
	for i := range models {
		if models[i].Model == LinearPlateauModel {
			lp = &models[i]
		}
	}
	if lp == nil {
		t.Fatal("no linear-plateau model")
	}
	if math.Abs(*lp.Join-110) > 1e-6 || math.Abs(lp.Coef[1]-0.03) > 1e-9 || lp.RSS > 1e-18 || math.Abs(*lp.Plateau-5.3) > 1e-9 {
		t.Errorf("join %g slope %g plateau %g rss %g", *lp.Join, lp.Coef[1], *lp.Plateau, lp.RSS)
	}
	// The economic optimum of a linear-plateau is the join point while the
	// slope exceeds the price ratio, and the lowest rate once it does not.
	if x, _ := lp.EconomicOptimum(0.01); math.Abs(x-110) > 1e-6 {
		t.Errorf("economic optimum at ratio 0.01: %g, want 110", x)
	}
	if x, edge := lp.EconomicOptimum(0.05); x != 0 || !edge {
		t.Errorf("economic optimum at ratio 0.05: %g (edge %v), want 0 at the edge", x, edge)
	}
}

func TestFitResponseRefusesTooFewRates(t *testing.T) {
	t.Parallel()
	if _, _, err := FitResponse([]float64{0, 50}, []float64{1, 2}); err == nil {
		t.Error("two rates: no error")
	}
	if _, _, err := FitResponse([]float64{0, 50, 50}, []float64{1, 2, 3}); err == nil {
		t.Error("repeated rate: no error")
	}
	models, notes, err := FitResponse([]float64{0, 50, 100}, []float64{1, 2, 2.5})
	if err != nil || len(models) != 1 || len(notes) == 0 {
		t.Errorf("three rates: %d models, notes %v, %v; want the linear model and a note", len(models), notes, err)
	}
}
