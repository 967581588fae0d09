package stats

import (
	"errors"
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// Response to a quantitative treatment factor (a rate): the treatment sum
// of squares split into polynomial trends, and response models fitted to
// the treatment means.

// TrendLine is one line of a polynomial trend analysis: the part of the
// treatment sum of squares carried by the linear or quadratic trend on the
// rates, or what is left (lack of fit), with its F test on the design's
// error mean square.
type TrendLine struct {
	Source string // "linear", "quadratic" or "lack_of_fit"
	DF     int
	SS, MS float64
	F, P   float64
}

// PolynomialTrend splits the variation among treatment means into linear,
// quadratic and remaining (lack-of-fit) polynomial trends on the scores
// (the actual rates, unequal spacing allowed), each tested with an F test
// against mse on dfError degrees of freedom.
//
// means are the treatment (least-squares) means and cov their covariance
// matrix divided by the error variance, row by row (t × t values) (for means of r_i plots of a
// balanced design, the diagonal 1/r_i). Each line's sum of squares is the
// Wald quadratic form of its polynomial contrasts, taken sequentially
// (linear, then quadratic given linear, then the rest), so the lines add up
// to the treatment sum of squares adjusted for the other terms of the model;
// with balanced data they are the classic orthogonal-polynomial sums of
// squares (Gomez & Gomez 1984, Statistical Procedures for Agricultural
// Research, §5.2.3; R's contr.poly with scores).
func PolynomialTrend(means, cov, scores []float64, mse float64, dfError int) ([]TrendLine, error) {
	t := len(means)
	if t < 2 || len(scores) != t || len(cov) != t*t {
		panic("stats: PolynomialTrend needs matching means, scores and covariance, at least 2")
	}
	if !(mse > 0) || dfError < 1 {
		return nil, &ValueError{Reason: "the trend needs an error mean square greater than 0 with at least one degree of freedom"}
	}
	distinct := map[float64]bool{}
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, x := range scores {
		if math.IsNaN(x) || math.IsInf(x, 0) || math.IsNaN(means[i]) || math.IsInf(means[i], 0) {
			return nil, &ValueError{Reason: "every rate and mean must be a number"}
		}
		distinct[x] = true
		lo, hi = math.Min(lo, x), math.Max(hi, x)
	}
	if len(distinct) != t {
		return nil, &ValueError{Reason: "two treatments have the same rate: give each rate once (combine them or leave one out of the trend)"}
	}
	// Scale the scores to [-1, 1] before forming powers, so the contrast
	// rows stay well conditioned for rates in the hundreds.
	mid, half := (lo+hi)/2, (hi-lo)/2
	z := make([]float64, t)
	for i, x := range scores {
		z[i] = (x - mid) / half
	}
	// rows[k] is the centred power z^(k+1): the first k rows span the
	// polynomial contrasts of degree ≤ k.
	rows := make([][]float64, t-1)
	for k := range rows {
		r := make([]float64, t)
		var m float64
		for i := range r {
			r[i] = math.Pow(z[i], float64(k+1))
			m += r[i]
		}
		m /= float64(t)
		for i := range r {
			r[i] -= m
		}
		rows[k] = r
	}
	wald := func(q int) (float64, error) {
		if q == 0 {
			return 0, nil
		}
		c := mat.NewDense(q, t, nil)
		for k := 0; k < q; k++ {
			c.SetRow(k, rows[k])
		}
		var cv, cvc mat.Dense
		cv.Mul(c, mat.NewDense(t, t, cov))
		cvc.Mul(&cv, c.T())
		sym := mat.NewSymDense(q, nil)
		for i := 0; i < q; i++ {
			for j := i; j < q; j++ {
				sym.SetSym(i, j, (cvc.At(i, j)+cvc.At(j, i))/2)
			}
		}
		var ch mat.Cholesky
		if !ch.Factorize(sym) {
			return 0, errors.New("stats: the trend contrasts are not estimable")
		}
		est := mat.NewVecDense(q, nil)
		est.MulVec(c, mat.NewVecDense(t, means))
		var sol mat.VecDense
		if err := ch.SolveVecTo(&sol, est); err != nil {
			return 0, err
		}
		return mat.Dot(est, &sol), nil
	}
	f := distuv.F{D1: 1, D2: float64(dfError)}
	line := func(src string, df int, ss float64) TrendLine {
		ss = math.Max(ss, 0)
		ms := ss / float64(df)
		fv := ms / mse
		f.D1 = float64(df)
		return TrendLine{Source: src, DF: df, SS: ss, MS: ms, F: fv, P: f.Survival(fv)}
	}
	var out []TrendLine
	prev := 0.0
	for q, src := range []string{"linear", "quadratic"} {
		if q+1 > t-1 {
			break
		}
		w, err := wald(q + 1)
		if err != nil {
			return nil, err
		}
		out = append(out, line(src, 1, w-prev))
		prev = w
	}
	if t-1 > 2 {
		w, err := wald(t - 1)
		if err != nil {
			return nil, err
		}
		out = append(out, line("lack_of_fit", t-3, w-prev))
	}
	return out, nil
}

// Response model names.
const (
	LinearModel           = "linear"
	QuadraticModel        = "quadratic"
	LinearPlateauModel    = "linear-plateau"
	QuadraticPlateauModel = "quadratic-plateau"
)

// ResponseModel is a response curve fitted by least squares to treatment
// means y at rates x:
//
//	linear             y = a + b·x
//	quadratic          y = a + b·x + c·x²
//	linear-plateau     y = a + b·min(x, x0)
//	quadratic-plateau  y = a + b·x + c·x² for x < x0 = -b/(2c), the plateau after
//
// Plateau models are fitted by exact least squares with the join point x0
// profiled: for a fixed x0 the model is linear in its other parameters, and
// the residual sum of squares is minimised over x0 within the tested rates
// (a dense scan of each interval between rates, then golden-section
// refinement). Standard errors are the usual asymptotic ones, s²(J'J)⁻¹
// with J the Jacobian of the fitted curve in its parameters (for the
// plateau models the join point's SE follows by the delta method), as in
// nonlinear least squares; Cerrato & Blackmer (1990), Agron. J. 82,
// 138–143, compare these four models in this way.
type ResponseModel struct {
	Model string
	// Coef holds a, b and (quadratic models) c of y = a + b·x + c·x².
	Coef []float64
	SE   []float64 // nil when there are no residual degrees of freedom
	// Join and Plateau are the join point and the plateau yield of the
	// plateau models (nil otherwise); JoinSE its standard error.
	Join, JoinSE, Plateau *float64
	RSS                   float64
	DF                    int      // residual degrees of freedom
	RSquared              float64  // 1 − RSS/TSS
	RMSE                  *float64 // √(RSS/DF); nil when DF = 0
	AIC                   float64  // −2 log L + 2(p+1), Gaussian likelihood (as R's AIC)
	// Low and High are the smallest and largest rate fitted: the models
	// say nothing outside them.
	Low, High float64
}

// Predict returns the fitted response at rate x.
func (m ResponseModel) Predict(x float64) float64 {
	a, b := m.Coef[0], m.Coef[1]
	switch m.Model {
	case LinearModel:
		return a + b*x
	case QuadraticModel:
		return a + b*x + m.Coef[2]*x*x
	case LinearPlateauModel:
		return a + b*math.Min(x, *m.Join)
	case QuadraticPlateauModel:
		x = math.Min(x, *m.Join)
		return a + b*x + m.Coef[2]*x*x
	}
	panic("stats: unknown response model " + m.Model)
}

// Slope returns the fitted response's derivative at rate x.
func (m ResponseModel) Slope(x float64) float64 {
	b := m.Coef[1]
	switch m.Model {
	case LinearModel:
		return b
	case QuadraticModel:
		return b + 2*m.Coef[2]*x
	case LinearPlateauModel:
		if x < *m.Join {
			return b
		}
		return 0
	case QuadraticPlateauModel:
		if x < *m.Join {
			return b + 2*m.Coef[2]*x
		}
		return 0
	}
	panic("stats: unknown response model " + m.Model)
}

// AgronomicOptimum returns the rate of the highest fitted response within
// the tested rates: the join point of a plateau model, the vertex of a
// quadratic that turns down, and false for a straight line or a quadratic
// that does not turn down within the rates.
func (m ResponseModel) AgronomicOptimum() (float64, bool) {
	switch m.Model {
	case LinearPlateauModel, QuadraticPlateauModel:
		return *m.Join, true
	case QuadraticModel:
		if c := m.Coef[2]; c < 0 {
			if v := -m.Coef[1] / (2 * c); v >= m.Low && v <= m.High {
				return v, true
			}
		}
	}
	return 0, false
}

// EconomicOptimum returns the rate, within the tested rates, that maximises
// the margin y(x) − ratio·x, where ratio is the price of a unit of input in
// units of produce (both per the units of the response and the rate): where
// the fitted slope equals the ratio (x* = (ratio − b)/(2c) for the quadratic
// models, capped at the join point of a plateau), or an end of the tested
// range when the slope never falls to the ratio there. atEdge reports that.
func (m ResponseModel) EconomicOptimum(ratio float64) (rate float64, atEdge bool) {
	margin := func(x float64) float64 { return m.Predict(x) - ratio*x }
	best := func(xs ...float64) float64 {
		b := xs[0]
		for _, x := range xs[1:] {
			if margin(x) > margin(b) {
				b = x
			}
		}
		return b
	}
	candidates := []float64{m.Low, m.High}
	switch m.Model {
	case QuadraticModel, QuadraticPlateauModel:
		if c := m.Coef[2]; c < 0 {
			x := (ratio - m.Coef[1]) / (2 * c)
			if m.Join != nil {
				x = math.Min(x, *m.Join)
			}
			if x > m.Low && x < m.High {
				candidates = append(candidates, x)
			}
		}
	case LinearPlateauModel:
		if *m.Join > m.Low && *m.Join < m.High {
			candidates = append(candidates, *m.Join)
		}
	}
	rate = best(candidates...)
	return rate, rate == m.Low || rate == m.High
}

// FitResponse fits the four response models to treatment means y at rates
// x (at least 3 distinct rates; the quadratic and plateau models need 4 for
// residual degrees of freedom and are left out below that). Models that do
// not describe a rise to a plateau within the rates (a plateau model whose
// best join point lies outside the tested rates, or whose curve does not
// rise) are left out; notes says which and why.
func FitResponse(x, y []float64) (models []ResponseModel, notes []string, err error) {
	n := len(x)
	if len(y) != n {
		panic("stats: FitResponse needs as many means as rates")
	}
	seen := map[float64]bool{}
	for i := range x {
		if math.IsNaN(x[i]) || math.IsInf(x[i], 0) || math.IsNaN(y[i]) || math.IsInf(y[i], 0) {
			return nil, nil, &ValueError{Reason: "every rate and mean must be a number"}
		}
		seen[x[i]] = true
	}
	if len(seen) < 3 || len(seen) != n {
		return nil, nil, &ValueError{Reason: fmt.Sprintf("a response curve needs at least 3 different rates, each once (there are %d different rates among %d means)", len(seen), n)}
	}
	var ybar float64
	for _, v := range y {
		ybar += v
	}
	ybar /= float64(n)
	var tss float64
	for _, v := range y {
		tss += (v - ybar) * (v - ybar)
	}
	lo, hi := x[0], x[0]
	for _, v := range x {
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	finish := func(m ResponseModel, p int, jac *mat.Dense) ResponseModel {
		m.Low, m.High = lo, hi
		m.RSS = 0
		for i := range x {
			r := y[i] - m.Predict(x[i])
			m.RSS += r * r
		}
		m.DF = n - p
		if tss > 0 {
			m.RSquared = 1 - m.RSS/tss
		}
		nf := float64(n)
		rss := math.Max(m.RSS, 1e-300*math.Max(tss, 1))
		m.AIC = nf*(math.Log(2*math.Pi)+math.Log(rss/nf)+1) + 2*float64(p+1)
		if m.DF > 0 {
			s2 := m.RSS / float64(m.DF)
			rmse := math.Sqrt(s2)
			m.RMSE = &rmse
			if cov, ok := jtjInverse(jac); ok {
				m.SE = make([]float64, len(m.Coef))
				for i := range m.SE {
					m.SE[i] = math.Sqrt(s2 * cov.At(i, i))
				}
				if m.Model == QuadraticPlateauModel {
					// x0 = -b/(2c): gradient (0, -1/(2c), b/(2c²)).
					b, c := m.Coef[1], m.Coef[2]
					g := []float64{0, -1 / (2 * c), b / (2 * c * c)}
					var v float64
					for i := range g {
						for j := range g {
							v += g[i] * g[j] * cov.At(i, j)
						}
					}
					se := math.Sqrt(s2 * v)
					m.JoinSE = &se
				}
				if m.Model == LinearPlateauModel {
					se := math.Sqrt(s2 * cov.At(2, 2))
					m.JoinSE = &se
					m.SE = m.SE[:2]
				}
			}
		}
		return m
	}
	design := func(cols ...func(float64) float64) *mat.Dense {
		d := mat.NewDense(n, len(cols), nil)
		for i := range x {
			for j, f := range cols {
				d.Set(i, j, f(x[i]))
			}
		}
		return d
	}
	one := func(float64) float64 { return 1 }
	id := func(v float64) float64 { return v }
	sq := func(v float64) float64 { return v * v }

	// Linear and quadratic: ordinary least squares on the means.
	if c, ok := olsFit(design(one, id), y); ok {
		models = append(models, finish(ResponseModel{Model: LinearModel, Coef: c}, 2, design(one, id)))
	}
	if n >= 4 {
		if c, ok := olsFit(design(one, id, sq), y); ok {
			models = append(models, finish(ResponseModel{Model: QuadraticModel, Coef: c}, 3, design(one, id, sq)))
		}
	} else {
		notes = append(notes, "The quadratic and plateau models need at least 4 rates; they were not fitted.")
		return models, notes, nil
	}

	// Linear-plateau: y = A + b·min(x, x0), b > 0.
	lp := func(x0 float64) (float64, []float64, bool) {
		c, ok := olsFit(design(one, func(v float64) float64 { return math.Min(v, x0) }), y)
		if !ok || !(c[1] > 0) {
			return math.Inf(1), nil, false
		}
		return rssOf(x, y, func(v float64) float64 { return c[0] + c[1]*math.Min(v, x0) }), c, true
	}
	if x0, ok := profileJoin(x, lo, hi, func(x0 float64) float64 { r, _, _ := lp(x0); return r }); ok {
		_, c, _ := lp(x0)
		join, plateau := x0, c[0]+c[1]*x0
		m := ResponseModel{Model: LinearPlateauModel, Coef: c, Join: &join, Plateau: &plateau}
		b := c[1]
		jac := mat.NewDense(n, 3, nil)
		for i, v := range x {
			jac.Set(i, 0, 1)
			jac.Set(i, 1, math.Min(v, x0))
			if v > x0 {
				jac.Set(i, 2, b)
			}
		}
		models = append(models, finish(m, 3, jac))
	} else {
		notes = append(notes, "The linear-plateau model was left out: the means do not rise to a plateau within the tested rates.")
	}

	// Quadratic-plateau: y = P + c·(min(x, x0) − x0)², c < 0, with
	// a = P + c·x0², b = −2c·x0.
	qp := func(x0 float64) (float64, []float64, bool) {
		d, ok := olsFit(design(one, func(v float64) float64 { u := math.Min(v, x0) - x0; return u * u }), y)
		if !ok || !(d[1] < 0) {
			return math.Inf(1), nil, false
		}
		p, c := d[0], d[1]
		coef := []float64{p + c*x0*x0, -2 * c * x0, c}
		return rssOf(x, y, func(v float64) float64 { u := math.Min(v, x0) - x0; return p + c*u*u }), coef, true
	}
	if x0, ok := profileJoin(x, lo, hi, func(x0 float64) float64 { r, _, _ := qp(x0); return r }); ok {
		_, coef, _ := qp(x0)
		join := x0
		plateau := coef[0] + coef[1]*x0 + coef[2]*x0*x0
		m := ResponseModel{Model: QuadraticPlateauModel, Coef: coef, Join: &join, Plateau: &plateau}
		jac := mat.NewDense(n, 3, nil)
		for i, v := range x {
			u := math.Min(v, x0)
			jac.Set(i, 0, 1)
			jac.Set(i, 1, u)
			jac.Set(i, 2, u*u)
		}
		models = append(models, finish(m, 3, jac))
	} else {
		notes = append(notes, "The quadratic-plateau model was left out: the means do not rise to a plateau within the tested rates.")
	}
	return models, notes, nil
}

// profileJoin minimises rss(x0) over join points strictly inside the tested
// rates: a dense scan of each interval between consecutive rates, then
// golden-section refinement around the best scanned point. It reports false
// when no interior join point gives a finite fit, or when the best fit puts
// the join at the highest rate (no plateau was reached).
func profileJoin(x []float64, lo, hi float64, rss func(float64) float64) (float64, bool) {
	xs := append([]float64(nil), x...)
	sort.Float64s(xs)
	const scan = 64
	bestX, bestR := math.NaN(), math.Inf(1)
	step := 0.0
	for k := 1; k < len(xs); k++ {
		a, b := xs[k-1], xs[k]
		h := (b - a) / scan
		for j := 1; j <= scan; j++ {
			x0 := a + float64(j)*h
			if x0 >= hi {
				continue
			}
			if r := rss(x0); r < bestR {
				bestX, bestR, step = x0, r, h
			}
		}
	}
	if math.IsNaN(bestX) {
		return 0, false
	}
	// Golden-section search on [bestX − step, bestX + step] ∩ (lo, hi).
	a, b := math.Max(bestX-step, lo), math.Min(bestX+step, hi)
	const g = 0.6180339887498949
	c, d := b-g*(b-a), a+g*(b-a)
	fc, fd := rss(c), rss(d)
	for i := 0; i < 200 && b-a > 1e-12*math.Max(1, math.Abs(hi-lo)); i++ {
		if fc < fd {
			b, d, fd = d, c, fc
			c = b - g*(b-a)
			fc = rss(c)
		} else {
			a, c, fc = c, d, fd
			d = a + g*(b-a)
			fd = rss(d)
		}
	}
	x0 := (a + b) / 2
	if r := rss(x0); !(r <= bestR) {
		x0 = bestX
	}
	if x0 >= hi-1e-9*(hi-lo) || x0 <= lo {
		return 0, false
	}
	return x0, true
}

func rssOf(x, y []float64, f func(float64) float64) float64 {
	var s float64
	for i := range x {
		r := y[i] - f(x[i])
		s += r * r
	}
	return s
}

// olsFit returns the least-squares coefficients of y on the columns of d.
func olsFit(d *mat.Dense, y []float64) ([]float64, bool) {
	var qr mat.QR
	qr.Factorize(d)
	_, p := d.Dims()
	var b mat.Dense
	if err := qr.SolveTo(&b, false, mat.NewDense(len(y), 1, append([]float64(nil), y...))); err != nil {
		return nil, false
	}
	out := make([]float64, p)
	for i := range out {
		out[i] = b.At(i, 0)
		if math.IsNaN(out[i]) || math.IsInf(out[i], 0) {
			return nil, false
		}
	}
	return out, true
}

// jtjInverse returns (J'J)⁻¹.
func jtjInverse(j *mat.Dense) (*mat.SymDense, bool) {
	_, p := j.Dims()
	var jtj mat.SymDense
	jtj.SymOuterK(1, j.T())
	var ch mat.Cholesky
	if !ch.Factorize(&jtj) {
		return nil, false
	}
	inv := mat.NewSymDense(p, nil)
	if err := ch.InverseTo(inv); err != nil {
		return nil, false
	}
	return inv, true
}
