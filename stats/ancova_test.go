package stats

import (
	"math"
	"testing"
)

// fiber is the analysis-of-covariance example of Montgomery, Design and
// Analysis of Experiments (5th ed., section 15.3, also emmeans's `fiber`
// data): breaking strength y of monofilament fibre from three machines,
// adjusted for the fibre's diameter x. Data and results from memory;
// the results are also worked out by hand below.
var fiberY = []float64{36, 41, 39, 42, 49, 40, 48, 39, 45, 44, 35, 37, 42, 34, 32}
var fiberX = []float64{20, 25, 24, 25, 32, 22, 28, 22, 30, 28, 21, 23, 26, 21, 15}

func fiberModel() Model {
	idx := make([]int, 15)
	for i := range idx {
		idx[i] = i / 5
	}
	return Model{Response: fiberY, Treatment: Factor{Name: "machine", Levels: 3, Index: idx}}
}

func TestFitCovariateFiberPublished(t *testing.T) {
	t.Parallel()
	a, c, err := FitCovariate(fiberModel(), fiberX)
	if err != nil {
		t.Fatal(err)
	}
	// Montgomery's table of the example (from memory): β = 0.954, SSE =
	// 27.99 on 11 df, adjusted SS of machines 13.28 (F = 2.61), adjusted
	// means 40.38, 41.42, 38.80; emmeans's printed SEs of those means
	// 0.724, 0.744, 0.788 (from memory).
	checkAbs(t, "slope", c.Slope, 0.954, 0.0005)
	checkAbs(t, "SSE", a.Sources[len(a.Sources)-2].SS, 27.99, 0.02)
	if a.DFError != 11 {
		t.Errorf("error df %d, want 11", a.DFError)
	}
	trt, _ := a.Treatment()
	checkAbs(t, "machines SS", trt.SS, 13.28, 0.02)
	checkAbs(t, "machines F", trt.F, 2.61, 0.005)
	for i, w := range []struct{ mean, se float64 }{{40.38, 0.724}, {41.42, 0.744}, {38.80, 0.788}} {
		checkAbs(t, "adjusted mean", a.Means[i].Mean, w.mean, 0.005)
		checkAbs(t, "adjusted mean SE", a.Means[i].SE, w.se, 0.0005)
	}
	checkAbs(t, "covariate mean", c.Mean, 362.0/15, 1e-12)
}

// TestFitCovariateByHand checks the fit against the classical
// computation of an analysis of covariance from the error and
// treatment+error sums of squares and products (Snedecor & Cochran 1989,
// ch. 18; Steel & Torrie 1980, ch. 17): b = Exy/Exx, adjusted treatment SS
// = [S'yy − S'xy²/S'xx] − [Eyy − Exy²/Exx] with S' = T + E, adjusted mean
// ȳᵢ − b(x̄ᵢ − x̄), its variance MSE(1/r + (x̄ᵢ − x̄)²/Exx), a difference's
// MSE(2/r + (x̄ᵢ − x̄ⱼ)²/Exx). The sums of products come from the design's
// own ANOVA (Fit, checked against R elsewhere) of x, y and x + y:
// SP = (SS(x+y) − SS(x) − SS(y))/2. Designs: the fibre CRD; the barley
// RCBD of Immer et al. (1934) with the yield of the same variety at the
// next site as covariate; the orchard-sprays Latin square (Finney 1947)
// with the value in the transposed cell as covariate (the pairings only
// supply a covariate outside the model: the check is of the arithmetic).
func TestFitCovariateByHand(t *testing.T) {
	t.Parallel()
	type cs struct {
		name string
		m    Model
		x    []float64
	}
	var cases []cs
	cases = append(cases, cs{"fiber CRD", fiberModel(), fiberX})
	{
		m, _ := loadRef(t, "barley-1931-rcbd", "yield", "variety", "site")
		// Next site's yield of the same variety.
		x := make([]float64, len(m.Response))
		site := m.Nuisance[0]
		for i := range x {
			for j := range x {
				if m.Treatment.Index[j] == m.Treatment.Index[i] && site.Index[j] == (site.Index[i]+1)%site.Levels {
					x[i] = m.Response[j]
				}
			}
		}
		cases = append(cases, cs{"barley RCBD", m, x})
	}
	{
		m, _ := loadRef(t, "orchard-sprays-latin", "decrease", "treatment", "row", "col")
		x := make([]float64, len(m.Response))
		r, c := m.Nuisance[0], m.Nuisance[1]
		for i := range x {
			for j := range x {
				if r.Index[j] == c.Index[i] && c.Index[j] == r.Index[i] {
					x[i] = math.Sqrt(m.Response[j])
				}
			}
		}
		cases = append(cases, cs{"orchard Latin", m, x})
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			m, x := tc.m, tc.x
			n := len(x)
			ss := func(v []float64, withTrt bool) (float64, float64) {
				mm := m
				mm.Response = v
				a, err := Fit(mm)
				if err != nil {
					t.Fatal(err)
				}
				e, _ := a.Error()
				tr, _ := a.Treatment()
				return e.SS, tr.SS
			}
			xy := make([]float64, n)
			for i := range xy {
				xy[i] = x[i] + m.Response[i]
			}
			Exx, Txx := ss(x, true)
			Eyy, Tyy := ss(m.Response, true)
			Es, Ts := ss(xy, true)
			Exy, Txy := (Es-Exx-Eyy)/2, (Ts-Txx-Tyy)/2
			b := Exy / Exx
			sse := Eyy - Exy*Exy/Exx
			Sxx, Syy, Sxy := Txx+Exx, Tyy+Eyy, Txy+Exy
			ssT := (Syy - Sxy*Sxy/Sxx) - sse

			a, c, err := FitCovariate(m, x)
			if err != nil {
				t.Fatal(err)
			}
			mse := sse / float64(a.DFError)
			checkRel(t, "slope", c.Slope, b, 1e-9)
			checkRel(t, "slope SE", c.SE, math.Sqrt(mse/Exx), 1e-9)
			e, _ := a.Error()
			checkRel(t, "SSE", e.SS, sse, 1e-9)
			tr, _ := a.Treatment()
			checkRel(t, "adjusted treatment SS", tr.SS, ssT, 1e-8)
			cv, _ := a.Line(RoleCovariate)
			checkRel(t, "covariate SS", cv.SS, Exy*Exy/Exx, 1e-9)
			k := m.Treatment.Levels
			ym, xm, cnt := make([]float64, k), make([]float64, k), make([]float64, k)
			xbar := 0.0
			for i, l := range m.Treatment.Index {
				ym[l] += m.Response[i]
				xm[l] += x[i]
				cnt[l]++
				xbar += x[i]
			}
			xbar /= float64(n)
			for l := 0; l < k; l++ {
				ym[l] /= cnt[l]
				xm[l] /= cnt[l]
				checkRel(t, "adjusted mean", a.Means[l].Mean, ym[l]-b*(xm[l]-xbar), 1e-10)
				checkRel(t, "adjusted SE", a.Means[l].SE, math.Sqrt(mse*(1/cnt[l]+(xm[l]-xbar)*(xm[l]-xbar)/Exx)), 1e-9)
			}
			d := xm[0] - xm[k-1]
			checkRel(t, "pair SE", a.PairSE(0, k-1), math.Sqrt(mse*(1/cnt[0]+1/cnt[k-1]+d*d/Exx)), 1e-9)
			checkRel(t, "slope p", c.P, cv.P, 1e-9) // t² = F (common practice)
			checkLeverage(t, a, m)
		})
	}
}

// TestFitCovariateHomogeneity: separate slopes per machine by hand, each
// machine's own regression (Snedecor & Cochran 1989, section 18.3): the
// residual SS of separate lines Σ(Eyyᵢ − Exyᵢ²/Exxᵢ) on n − 2k df, tested
// against the common slope's SSE on (k − 1) df.
func TestFitCovariateHomogeneity(t *testing.T) {
	t.Parallel()
	_, c, err := FitCovariate(fiberModel(), fiberX)
	if err != nil {
		t.Fatal(err)
	}
	var sep, Exx, Exy, Eyy float64
	for g := 0; g < 3; g++ {
		ys, xs := fiberY[5*g:5*g+5], fiberX[5*g:5*g+5]
		var my, mx float64
		for i := range ys {
			my += ys[i] / 5
			mx += xs[i] / 5
		}
		var sxx, sxy, syy float64
		for i := range ys {
			sxx += (xs[i] - mx) * (xs[i] - mx)
			sxy += (xs[i] - mx) * (ys[i] - my)
			syy += (ys[i] - my) * (ys[i] - my)
		}
		sep += syy - sxy*sxy/sxx
		Exx, Exy, Eyy = Exx+sxx, Exy+sxy, Eyy+syy
	}
	common := Eyy - Exy*Exy/Exx
	f := ((common - sep) / 2) / (sep / 9)
	if !c.HasHomogeneity || c.HomogeneityDF1 != 2 || c.HomogeneityDF2 != 9 {
		t.Fatalf("homogeneity %+v, want a test on 2 and 9 df", c)
	}
	checkRel(t, "homogeneity F", c.HomogeneityF, f, 1e-9)
	checkRel(t, "homogeneity P", c.HomogeneityP, fSurvival(f, 2, 9), 1e-9)
}

// TestFitCovariateOnTreatment: the covariate's own ANOVA is the one-way
// ANOVA of the diameters (Montgomery's Txx = 66.13 and Exx = 195.60, from
// memory; with Exy = 186.60 and Eyy = 206.00 they give his SSE 27.99).
func TestFitCovariateOnTreatment(t *testing.T) {
	t.Parallel()
	_, c, err := FitCovariate(fiberModel(), fiberX)
	if err != nil {
		t.Fatal(err)
	}
	tr, _ := c.OnTreatment.Treatment()
	checkAbs(t, "Txx", tr.SS, 66.13, 0.01)
	e, _ := c.OnTreatment.Error()
	checkAbs(t, "Exx", e.SS, 195.60, 0.01)
}

func TestFitCovariateErrors(t *testing.T) {
	t.Parallel()
	m := fiberModel()
	constant := make([]float64, 15)
	for i := range constant {
		constant[i] = 3
	}
	if _, _, err := FitCovariate(m, constant); err == nil {
		t.Error("a constant covariate was accepted")
	}
	// A covariate that only differs between machines is confounded with them.
	byMachine := make([]float64, 15)
	for i := range byMachine {
		byMachine[i] = float64(i / 5)
	}
	if _, _, err := FitCovariate(m, byMachine); err == nil {
		t.Error("a covariate confounded with the treatments was accepted")
	}
	bad := append([]float64(nil), fiberX...)
	bad[3] = math.NaN()
	if _, _, err := FitCovariate(m, bad); err == nil {
		t.Error("a NaN covariate was accepted")
	}
}

func checkAbs(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if !(math.Abs(got-want) <= tol) {
		t.Errorf("%s = %.6g, want %.6g ± %g", what, got, want, tol)
	}
}

// TestFitCovariateOrigin: values given as Origin + Response give the same
// analysis as the whole values (common practice: a shift of the response
// moves the means, not the sums of squares).
func TestFitCovariateOrigin(t *testing.T) {
	t.Parallel()
	m := fiberModel()
	a0, _, err := FitCovariate(m, fiberX)
	if err != nil {
		t.Fatal(err)
	}
	shifted := make([]float64, len(fiberY))
	for i, v := range fiberY {
		shifted[i] = v - 30
	}
	m.Response, m.Origin = shifted, 30
	a1, c1, err := FitCovariate(m, fiberX)
	if err != nil {
		t.Fatal(err)
	}
	checkRel(t, "grand mean", a1.GrandMean, a0.GrandMean, 1e-12)
	checkRel(t, "slope", c1.Slope, 0.954, 1e-3) // Montgomery, from memory
	for i := range a0.Means {
		checkRel(t, "mean", a1.Means[i].Mean, a0.Means[i].Mean, 1e-12)
		checkRel(t, "fitted", a1.Fitted[i], a0.Fitted[i], 1e-12)
	}
	tr, _ := c1.OnTreatment.Treatment()
	checkAbs(t, "Txx", tr.SS, 66.13, 0.01)
}
