package glm

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// remlDense is the restricted log-likelihood of a variance-components
// model computed by brute force from its definition with dense n × n
// matrices (Patterson & Thompson 1971, Biometrika 58, 545–554):
// −2ℓ_R = log|V| + log|X'V⁻¹X| + y'Py, V = σ²_e I + Σ σ²_j Z_jZ_j'.
type remlDense struct {
	x  *mat.Dense
	y  *mat.VecDense
	zs [][]int // unit of each plot, per random term
}

func (r *remlDense) v(phi []float64) *mat.SymDense {
	n := r.y.Len()
	v := mat.NewSymDense(n, nil)
	k := len(r.zs)
	for i := range n {
		for j := i; j < n; j++ {
			s := 0.0
			if i == j {
				s = phi[k]
			}
			for t, z := range r.zs {
				if z[i] == z[j] {
					s += phi[t]
				}
			}
			v.SetSym(i, j, s)
		}
	}
	return v
}

// fit returns −2ℓ_R, the GLS estimate and its covariance at phi.
func (r *remlDense) fit(phi []float64) (float64, *mat.VecDense, *mat.Dense) {
	var ch mat.Cholesky
	if !ch.Factorize(r.v(phi)) {
		return math.Inf(1), nil, nil
	}
	var vix mat.Dense
	if err := ch.SolveTo(&vix, r.x); err != nil {
		panic(err)
	}
	var viy mat.VecDense
	if err := ch.SolveVecTo(&viy, r.y); err != nil {
		panic(err)
	}
	var xvx mat.Dense
	xvx.Mul(r.x.T(), &vix)
	var cov mat.Dense
	if err := cov.Inverse(&xvx); err != nil {
		panic(err)
	}
	var xvy mat.VecDense
	xvy.MulVec(r.x.T(), &viy)
	var beta mat.VecDense
	beta.MulVec(&cov, &xvy)
	// y'Py = y'V⁻¹y − β̂'X'V⁻¹y
	ypy := mat.Dot(r.y, &viy) - mat.Dot(&beta, &xvy)
	ldx, _ := mat.LogDet(&xvx)
	return ch.LogDet() + ldx + ypy, &beta, &cov
}

// TestREMLDenseStripPlot checks the REML fit of a strip plot with missing
// plots (there is no R reference for this layout) against the dense
// definition: the estimates are a stationary point and a local minimum of
// −2ℓ_R, and the marginal means, their SEs and the F statistics (Wald
// tests of the type II hypotheses, which do not depend on the coding) are
// those of the dense generalised least squares fit.
func TestREMLDenseStripPlot(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		s     Structure
		sizes []int
		seed  uint64
	}{
		{StripPlot, []int{3, 4}, 41},
		{SplitPlot, []int{2, 3, 2}, 42},
	} {
		m := simulated(tc.seed, tc.sizes, 4, tc.s, 3)
		r, err := Fit(m)
		if err != nil {
			t.Fatal(err)
		}
		if r.Method != REML {
			t.Fatalf("method %v", r.Method)
		}
		d := &dense{m: m, facts: append(append([]Factor(nil), m.Factors...), *m.Block)}
		for i, y := range m.Response {
			if !math.IsNaN(y) {
				d.used = append(d.used, i)
			}
		}
		nf := len(m.Factors)
		terms := [][]int{{nf}}
		terms = append(terms, allTermsInts(nf)...)
		x, y := d.matrix(terms)
		rd := &remlDense{x: x, y: y}
		var units [][]int
		if tc.s == StripPlot {
			units = [][]int{{0, nf}, {1, nf}}
		} else {
			units = [][]int{{0, nf}, {0, 1, nf}}
		}
		for _, u := range units {
			z := make([]int, len(d.used))
			for k, i := range d.used {
				key := 0
				for _, f := range u {
					key = key*10 + d.facts[f].Index[i]
				}
				z[k] = key
			}
			rd.zs = append(rd.zs, z)
		}
		phi := make([]float64, len(r.VarianceComponents))
		for j, c := range r.VarianceComponents {
			phi[j] = c.Variance
		}
		f0, beta, cov := rd.fit(phi)
		for j := range phi {
			if phi[j] <= 0 {
				t.Fatalf("%v: choose data with positive components", tc.s)
			}
			h := 1e-4 * phi[j]
			up := append([]float64(nil), phi...)
			dn := append([]float64(nil), phi...)
			up[j] += h
			dn[j] -= h
			fu, _, _ := rd.fit(up)
			fd, _, _ := rd.fit(dn)
			if g := (fu - fd) / (2 * h) * phi[j]; math.Abs(g) > 1e-5 {
				t.Errorf("%v: scaled gradient %g for %s", tc.s, g, r.VarianceComponents[j].Name)
			}
			up[j] = 1.05 * phi[j]
			dn[j] = 0.95 * phi[j]
			fu, _, _ = rd.fit(up)
			fd, _, _ = rd.fit(dn)
			if fu < f0 || fd < f0 {
				t.Errorf("%v: not a minimum in %s", tc.s, r.VarianceComponents[j].Name)
			}
		}
		// Marginal means: average of the GLS fit over the full grid.
		p := x.RawMatrix().Cols
		for _, e := range r.Effects {
			for _, mn := range e.Means {
				avg := make([]float64, p)
				cnt := 0
				var rec func(f int, lev []int)
				rec = func(f int, lev []int) {
					if f == len(d.facts) {
						rr := d.row(terms, func(g int) int { return lev[g] })
						for j := range avg {
							avg[j] += rr[j]
						}
						cnt++
						return
					}
					for a, g := range e.Factors {
						if g == f {
							rec(f+1, append(lev, mn.Levels[a]))
							return
						}
					}
					for l := range d.facts[f].Levels {
						rec(f+1, append(append([]int(nil), lev...), l))
					}
				}
				rec(0, nil)
				lv := mat.NewVecDense(p, avg)
				lv.ScaleVec(1/float64(cnt), lv)
				want := mat.Dot(lv, beta)
				se := math.Sqrt(mat.Inner(lv, cov, lv))
				if !near(mn.Mean, want, 1e-8) || !near(mn.SE, se, 1e-7) {
					t.Errorf("%v %s %v: %.10g ± %.10g, want %.10g ± %.10g", tc.s, e.Name, mn.Levels, mn.Mean, mn.SE, want, se)
				}
			}
		}
		// Type II Wald F: L = X₁'(I − P₀)X in the dense coding.
		starts := []int{1}
		for _, tt := range terms {
			starts = append(starts, starts[len(starts)-1]+len(d.columns(tt, func(int) int { return 0 })))
		}
		names := []string{}
		for _, f := range d.facts {
			names = append(names, f.Name)
		}
		for k := 1; k < len(terms); k++ {
			var c0 []int
			c0 = append(c0, 0)
			for j := range terms {
				if j != k && !containsAll(terms[j], terms[k]) {
					for c := starts[j]; c < starts[j+1]; c++ {
						c0 = append(c0, c)
					}
				}
			}
			n := y.Len()
			x0 := mat.NewDense(n, len(c0), nil)
			for a, c := range c0 {
				x0.SetCol(a, mat.Col(nil, c, x))
			}
			q := starts[k+1] - starts[k]
			x1 := mat.NewDense(n, q, nil)
			for a := range q {
				x1.SetCol(a, mat.Col(nil, starts[k]+a, x))
			}
			var qr mat.QR
			qr.Factorize(x0)
			var coef mat.Dense
			if err := qr.SolveTo(&coef, false, x1); err != nil {
				t.Fatal(err)
			}
			var res mat.Dense
			res.Mul(x0, &coef)
			res.Sub(x1, &res)
			var l mat.Dense
			l.Mul(res.T(), x)
			var lb mat.VecDense
			lb.MulVec(&l, beta)
			var lcl mat.Dense
			lcl.Product(&l, cov, l.T())
			var inv mat.Dense
			if err := inv.Inverse(&lcl); err != nil {
				t.Fatal(err)
			}
			f := mat.Inner(&lb, &inv, &lb) / float64(q)
			name := termName(terms[k], names)
			line, ok := r.Line(name)
			if !ok || !near(line.F, f, 1e-7) || line.DF != q {
				t.Errorf("%v %s: F %.10g on %d, want %.10g on %d", tc.s, name, line.F, line.DF, f, q)
			}
		}
	}
}

func allTermsInts(nf int) [][]int {
	var out [][]int
	for _, t := range allTerms(nf) {
		out = append(out, t)
	}
	return out
}
