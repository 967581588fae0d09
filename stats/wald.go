package stats

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// EqualityTest is the F test that k estimates are all equal, given their
// covariance: the Wald statistic F = (Lθ)ᵀ(LVLᵀ)⁻¹(Lθ)/(k−1), with L the
// k−1 successive differences θᵢ − θᵢ₊₁ and V (k×k, row-major) the
// estimated covariance of θ, on k−1 and df degrees of freedom (df, the
// error degrees of freedom V was estimated with). When θ are the
// least-squares means of a linear model and V their covariance, F is the
// model's F test of the treatment term (common practice; Searle 1971, Linear Models,
// ch. 5, from memory), so shifted estimates such as margins (a price times
// each mean less each treatment's cost) get the test their letters need.
func EqualityTest(theta, cov []float64, df int) (f float64, df1 int, p float64, err error) {
	k := len(theta)
	if k < 2 {
		return math.NaN(), 0, math.NaN(), errors.New("at least two estimates are needed to test that they are equal")
	}
	if len(cov) != k*k {
		return math.NaN(), 0, math.NaN(), errors.New("the covariance matrix does not match the estimates")
	}
	if df < 1 {
		return math.NaN(), 0, math.NaN(), errors.New("the test needs error degrees of freedom, and there are none")
	}
	m := k - 1
	d := make([]float64, m)
	for i := 0; i < m; i++ {
		d[i] = theta[i] - theta[i+1]
	}
	// (LVLᵀ)ᵢⱼ = V[i,j] − V[i,j+1] − V[i+1,j] + V[i+1,j+1].
	v := func(i, j int) float64 { return cov[i*k+j] }
	s := mat.NewSymDense(m, nil)
	for i := 0; i < m; i++ {
		for j := i; j < m; j++ {
			s.SetSym(i, j, v(i, j)-v(i, j+1)-v(i+1, j)+v(i+1, j+1))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(s) {
		return math.NaN(), 0, math.NaN(), errors.New("the estimates' covariance is singular, so their equality cannot be tested")
	}
	x := mat.NewVecDense(m, nil)
	if err := ch.SolveVecTo(x, mat.NewVecDense(m, d)); err != nil {
		return math.NaN(), 0, math.NaN(), errors.New("the estimates' covariance is singular, so their equality cannot be tested")
	}
	q := mat.Dot(mat.NewVecDense(m, d), x)
	f = q / float64(m)
	p = distuv.F{D1: float64(m), D2: float64(df)}.Survival(f)
	return f, m, p, nil
}
