package stats

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// Covariance is what an analysis of covariance adds to its ANOVA: the
// common within-treatment regression of the response on the covariate,
// the test that the slopes are the same in every treatment, and the test
// of the covariate itself on the treatments.
type Covariance struct {
	// Slope of the response on the covariate (pooled within treatments and
	// nuisance levels), its standard error, t = Slope/SE and the two-sided
	// P, on the error df of the ANOVA.
	Slope, SE, T, P float64
	// Mean of the covariate over the observations fitted: the adjusted
	// means are the responses expected at this value.
	Mean float64
	// HasHomogeneity is false when separate slopes per treatment cannot be
	// fitted (too few observations, or a treatment whose covariate does not
	// vary); the fields below are then 0.
	HasHomogeneity bool
	// HomogeneityF tests separate slopes per treatment against the common
	// slope, on HomogeneityDF1 = levels−1 and HomogeneityDF2 = the error df
	// of the separate-slopes model.
	HomogeneityF                   float64
	HomogeneityP                   float64
	HomogeneityDF1, HomogeneityDF2 int
	// OnTreatment is the analysis of variance of the covariate itself with
	// the same model: a significant treatment line means the treatments
	// changed the covariate, which must then not be used to adjust the
	// response (the adjustment would remove part of the treatment effect).
	OnTreatment *ANOVA
	// Unadjusted is the analysis of the response without the covariate.
	Unadjusted *ANOVA
}

// FitCovariate fits the analysis of covariance y = mean + treatment +
// nuisance factors + β·x + error, with x a covariate measured on the same
// observations (Snedecor & Cochran 1989, Statistical Methods, 8th ed.,
// ch. 18; Steel & Torrie 1980, ch. 17). The ANOVA lines are the treatment
// and each nuisance factor adjusted for everything else (the covariate
// included), the covariate adjusted for the factors (one df), error
// (n − levels − nuisance df − 1) and total, so they do not add up. Means
// are adjusted means: least-squares means at the covariate's mean (what
// R's emmeans reports for lm(y ~ x + ...)), with SEs from the fitted model
// and PairSE for every pair. It is fitted by dense least squares (QR), so
// it suits trials of up to a few hundred treatments.
//
// m.Origin is honoured as in Fit. Besides the errors of Fit, a covariate that does not vary once the
// factors are taken out is reported as an *InputError of kind Confounded.
func FitCovariate(m Model, x []float64) (*ANOVA, *Covariance, error) {
	n := len(m.Response)
	if len(x) != n {
		panic(fmt.Sprintf("stats: FitCovariate with %d responses and %d covariate values", n, len(x)))
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, nil, &InputError{Kind: NonFiniteValue, Level: -1, Obs: i,
				Reason: fmt.Sprintf("covariate value number %d is not a finite number; leave such plots out", i+1)}
		}
	}
	plain, err := Fit(m)
	if err != nil {
		return nil, nil, err
	}
	cov := &Covariance{Unadjusted: plain}
	xm := m
	xm.Response, xm.Origin = x, 0
	if onT, err := Fit(xm); err == nil {
		cov.OnTreatment = onT
	}
	xbar := 0.0
	for _, v := range x {
		xbar += v
	}
	xbar /= float64(n)
	cov.Mean = xbar
	// The response centred on its own mean (m.Origin, the part the caller
	// took away, is added back to means and fitted values).
	ybar := 0.0
	for _, v := range m.Response {
		ybar += v
	}
	ybar /= float64(n)
	// The covariate centred and scaled to unit spread, the response
	// centred: the slope is scaled back at the end.
	xs := 0.0
	for _, v := range x {
		xs += (v - xbar) * (v - xbar)
	}
	xs = math.Sqrt(xs / float64(n))
	if !(xs > 0) {
		return nil, nil, &InputError{Kind: Confounded, Level: -1, Obs: -1,
			Reason: "the covariate has the same value on every plot, so it cannot adjust anything"}
	}
	xc := make([]float64, n)
	yc := make([]float64, n)
	for i := range x {
		xc[i] = (x[i] - xbar) / xs
		yc[i] = m.Response[i] - ybar
	}

	// Columns: intercept, treatment levels 1.., each nuisance factor's
	// levels 1.., the covariate.
	k := m.Treatment.Levels
	type block struct{ from, to int }
	trtCols := block{1, k}
	p := k
	nuisCols := make([]block, len(m.Nuisance))
	for f, nf := range m.Nuisance {
		nuisCols[f] = block{p, p + nf.Levels - 1}
		p += nf.Levels - 1
	}
	covCol := p
	p++
	X := mat.NewDense(n, p, nil)
	for i := 0; i < n; i++ {
		X.Set(i, 0, 1)
		if l := m.Treatment.Index[i]; l > 0 {
			X.Set(i, l, 1)
		}
		for f, nf := range m.Nuisance {
			if l := nf.Index[i]; l > 0 {
				X.Set(i, nuisCols[f].from+l-1, 1)
			}
		}
		X.Set(i, covCol, xc[i])
	}
	dfe := n - p
	if dfe <= 0 {
		return nil, nil, &InputError{Kind: NoErrorDF, Level: -1, Obs: -1,
			Reason: "there are too few observations to estimate the experimental error once the covariate is in the model"}
	}
	full, ok := lsFit(X, yc)
	if !ok {
		return nil, nil, &InputError{Kind: Confounded, Level: -1, Obs: -1,
			Reason: "the covariate does not vary within treatments (and blocks, rows or columns), so it cannot adjust this trait"}
	}
	sst := 0.0
	for _, v := range yc {
		sst += v * v
	}
	if !(full.sse > 1e-24*sst) {
		return nil, nil, &InputError{Kind: ZeroErrorVariance, Level: -1, Obs: -1,
			Reason: "the treatments, the design and the covariate explain the values exactly, so there is no error to test against"}
	}
	mse := full.sse / float64(dfe)
	without := func(b block) float64 {
		r, _ := lsFit(dropCols(X, b.from, b.to), yc)
		return r.sse - full.sse
	}
	line := func(name string, role Role, df int, ss float64) Source {
		ss = math.Max(ss, 0)
		ms := ss / float64(df)
		f := ms / mse
		return Source{Name: name, Role: role, DF: df, SS: ss, MS: ms, HasTest: true, F: f, P: fSurvival(f, df, dfe)}
	}
	src := Table{line(nameOr(m.Treatment.Name, "treatment"), RoleTreatment, k-1, without(trtCols))}
	for f, nf := range m.Nuisance {
		role := nf.Role
		if role == RoleNone {
			role = nuisanceRole(f, len(m.Nuisance))
		}
		src = append(src, line(nameOr(nf.Name, defaultNuisanceName(f, len(m.Nuisance))), role, nf.Levels-1, without(nuisCols[f])))
	}
	src = append(src, line("covariate", RoleCovariate, 1, without(block{covCol, covCol + 1})),
		Source{Name: "error", Role: RoleError, DF: dfe, SS: full.sse, MS: mse},
		Source{Name: "total", Role: RoleTotal, DF: n - 1, SS: sst})

	// Adjusted means: L_t·β with L_t the intercept, treatment t, the
	// nuisance levels weighted equally and the covariate at its mean (0).
	Ls := make([][]float64, k)
	for t := range Ls {
		L := make([]float64, p)
		L[0] = 1
		if t > 0 {
			L[t] = 1
		}
		for f, nf := range m.Nuisance {
			for c := nuisCols[f].from; c < nuisCols[f].to; c++ {
				L[c] = 1 / float64(nf.Levels)
			}
		}
		Ls[t] = L
	}
	quad := func(v []float64) float64 {
		// vᵀ(XᵀX)⁻¹v = |R⁻ᵀv|².
		w := full.rInvT(v)
		return dot(w, w)
	}
	a := &ANOVA{
		Sources: src, N: n, GrandMean: m.Origin + ybar, MSE: mse, RootMSE: math.Sqrt(mse), DFError: dfe,
		RSquared: 1 - full.sse/sst, Balanced: plain.Balanced, Adjusted: true,
	}
	if a.GrandMean != 0 {
		a.CVPercent = 100 * math.Sqrt(mse) / a.GrandMean
	}
	a.Means = make([]LevelMean, k)
	for t := range a.Means {
		a.Means[t] = LevelMean{N: plain.Means[t].N, RawMean: plain.Means[t].RawMean,
			Mean: m.Origin + ybar + dot(Ls[t], full.beta), SE: math.Sqrt(mse * quad(Ls[t]))}
	}
	a.pairSE = func(i, j int) float64 {
		if i < 0 || i >= k || j < 0 || j >= k {
			panic(fmt.Sprintf("stats: PairSE(%d, %d) outside 0..%d", i, j, k-1))
		}
		if i == j {
			return 0
		}
		d := make([]float64, p)
		for c := range d {
			d[c] = Ls[i][c] - Ls[j][c]
		}
		return math.Sqrt(mse * quad(d))
	}
	a.Fitted = make([]float64, n)
	a.Residuals = make([]float64, n)
	a.Leverage = make([]float64, n)
	row := make([]float64, p)
	for i := 0; i < n; i++ {
		mat.Row(row, i, X)
		f := dot(row, full.beta)
		a.Fitted[i] = m.Origin + ybar + f
		a.Residuals[i] = yc[i] - f
		a.Leverage[i] = math.Min(quad(row), 1)
	}

	cov.Slope = full.beta[covCol] / xs
	cov.SE = math.Sqrt(mse*quad(unit(p, covCol))) / xs
	cov.T = cov.Slope / cov.SE
	cov.P = 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(dfe)}.Survival(math.Abs(cov.T))

	// Separate slopes: the covariate times each treatment level 1.. added.
	if dfh := dfe - (k - 1); dfh > 0 && k > 1 {
		H := mat.NewDense(n, p+k-1, nil)
		H.Slice(0, n, 0, p).(*mat.Dense).Copy(X)
		for i := 0; i < n; i++ {
			if l := m.Treatment.Index[i]; l > 0 {
				H.Set(i, p+l-1, xc[i])
			}
		}
		if het, ok := lsFit(H, yc); ok && het.sse > 1e-24*sst {
			f := ((full.sse - het.sse) / float64(k-1)) / (het.sse / float64(dfh))
			f = math.Max(f, 0)
			cov.HasHomogeneity = true
			cov.HomogeneityF, cov.HomogeneityP = f, fSurvival(f, k-1, dfh)
			cov.HomogeneityDF1, cov.HomogeneityDF2 = k-1, dfh
		}
	}
	return a, cov, nil
}

func nameOr(s, def string) string {
	if s == "" {
		return def
	}
	return s
}

func unit(p, j int) []float64 {
	v := make([]float64, p)
	v[j] = 1
	return v
}

// denseFit is a least-squares fit by QR.
type denseFit struct {
	beta []float64
	sse  float64
	r    *mat.TriDense // the R factor, p×p upper triangular
}

// rInvT solves Rᵀw = v.
func (d denseFit) rInvT(v []float64) []float64 {
	var w mat.VecDense
	if err := w.SolveVec(d.r.T(), mat.NewVecDense(len(v), append([]float64(nil), v...))); err != nil {
		return make([]float64, len(v))
	}
	return w.RawVector().Data
}

// lsFit fits y on the columns of X; ok is false when X is rank deficient
// (a column is, to rounding, a combination of the others).
func lsFit(X *mat.Dense, y []float64) (denseFit, bool) {
	n, p := X.Dims()
	var qr mat.QR
	qr.Factorize(X)
	var rd mat.Dense
	qr.RTo(&rd)
	r := mat.NewTriDense(p, mat.Upper, nil)
	for i := 0; i < p; i++ {
		for j := i; j < p; j++ {
			r.SetTri(i, j, rd.At(i, j))
		}
	}
	// Column norms set the scale of what counts as zero on R's diagonal.
	maxNorm := 0.0
	for j := 0; j < p; j++ {
		maxNorm = math.Max(maxNorm, mat.Norm(X.ColView(j), 2))
	}
	for j := 0; j < p; j++ {
		if math.Abs(r.At(j, j)) <= 1e-9*maxNorm {
			return denseFit{}, false
		}
	}
	var b mat.VecDense
	if err := qr.SolveVecTo(&b, false, mat.NewVecDense(n, y)); err != nil {
		return denseFit{}, false
	}
	beta := b.RawVector().Data
	sse := 0.0
	row := make([]float64, p)
	for i := 0; i < n; i++ {
		mat.Row(row, i, X)
		e := y[i] - dot(row, beta)
		sse += e * e
	}
	return denseFit{beta: beta, sse: sse, r: r}, true
}

// dropCols returns X without columns from..to−1.
func dropCols(X *mat.Dense, from, to int) *mat.Dense {
	n, p := X.Dims()
	out := mat.NewDense(n, p-(to-from), nil)
	for i := 0; i < n; i++ {
		c := 0
		for j := 0; j < p; j++ {
			if j >= from && j < to {
				continue
			}
			out.Set(i, c, X.At(i, j))
			c++
		}
	}
	return out
}
