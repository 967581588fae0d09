package glm

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// The analysis of covariance of factorials is checked against an
// independent dense least-squares computation written here: explicit
// sum-to-zero dummy columns (bruteforce_test.go's dense type; the engine
// uses treatment coding and Cholesky on the normal equations) plus the raw
// covariate column, fitted with gonum's QR. Type II sums of squares are
// differences of residual sums of squares of full and reduced models (the
// definition: each term after every term that does not contain it and
// the covariate; the covariate after everything), estimated marginal
// means are X̄β with X̄ the model row averaged over the full grid of the
// other factors and the blocks and the covariate at its mean (the
// definition of Searle, Speed & Milliken 1980, Am. Stat. 34, 216–221, as
// emmeans computes it for lm(y ~ x + A*B)), the separate-slopes test
// adds the covariate times an indicator of every treatment combination
// but one (Snedecor & Cochran 1989, section 18.4).
//
// Data: Tippett's warp breaks (R datasets::warpbreaks, testdata/
// warpbreaks-factorial.csv) as a 2 × 3 CRD, complete and with plots
// missing; Yates's oats (R MASS::oats, testdata/oats-split.csv) analysed
// as a 3 × 4 factorial in 6 randomised complete blocks with three plots
// missing; a seeded random 2 × 3 × 2 factorial in blocks. None of them has
// a covariate, so one is constructed deterministically from the plot
// number (ancovaX): the check is of the arithmetic, not of the agronomy.

// ancovaX is the constructed covariate of plot i (0-based): a number
// with no relation to the layout's factors.
func ancovaX(i int) float64 {
	p := i + 1
	return 10 + float64((37*p)%17) + 0.25*float64(p%5)
}

type ancovaCase struct {
	name string
	m    Model
}

func ancovaCases(t *testing.T) []ancovaCase {
	withX := func(m Model, leftOut ...int) Model {
		m.Covariate = make([]float64, len(m.Response))
		for i := range m.Covariate {
			m.Covariate[i] = ancovaX(i)
		}
		for _, i := range leftOut {
			m.Covariate[i] = math.NaN()
		}
		return m
	}
	drop := func(m Model, plots ...int) Model {
		m.Response = append([]float64(nil), m.Response...)
		for _, i := range plots {
			m.Response[i] = math.NaN()
		}
		return m
	}
	wb := loadCSV(t, "warpbreaks-factorial.csv", []string{"wool", "tension"}, "", "breaks")
	oats := loadCSV(t, "oats-split.csv", []string{"variety", "nitrogen"}, "block", "yield")
	return []ancovaCase{
		{"warpbreaks balanced CRD", withX(wb)},
		{"warpbreaks unbalanced CRD", withX(drop(wb, 2, 16, 29, 43), 49)},
		{"oats factorial RCBD, plots 3, 40, 61 missing", withX(drop(oats, 2, 39, 60))},
		{"random 2x3x2 in blocks", withX(randomFactorial(7, []int{2, 3, 2}, 3, 1, 0.1), 5)},
	}
}

// ancovaDense is the independent computation for one case.
type ancovaDense struct {
	dense
	x     []float64 // raw covariate, per used plot
	xbar  float64
	terms [][]int // block first, then the treatment terms
}

func newAncovaDense(m Model) *ancovaDense {
	a := &ancovaDense{dense: dense{m: m, facts: append([]Factor(nil), m.Factors...)}}
	for i, y := range m.Response {
		if !math.IsNaN(y) && !math.IsNaN(m.Covariate[i]) {
			a.used = append(a.used, i)
			a.x = append(a.x, m.Covariate[i])
			a.xbar += m.Covariate[i]
		}
	}
	a.xbar /= float64(len(a.x))
	nf := len(m.Factors)
	if m.Block != nil {
		a.facts = append(a.facts, *m.Block)
		a.terms = append(a.terms, []int{nf})
	}
	for _, tt := range allTerms(nf) {
		a.terms = append(a.terms, tt)
	}
	return a
}

// design returns the dense matrix of the terms, then the covariate when
// withX, then the extra columns of each plot.
func (a *ancovaDense) design(terms [][]int, withX bool, extra func(k int) []float64) *mat.Dense {
	var rows [][]float64
	for k, i := range a.used {
		r := a.row(terms, func(f int) int { return a.facts[f].Index[i] })
		if withX {
			r = append(r, a.x[k])
		}
		if extra != nil {
			r = append(r, extra(k)...)
		}
		rows = append(rows, r)
	}
	x := mat.NewDense(len(rows), len(rows[0]), nil)
	for i, r := range rows {
		x.SetRow(i, r)
	}
	return x
}

func (a *ancovaDense) response(y []float64) *mat.VecDense {
	v := make([]float64, len(a.used))
	for k, i := range a.used {
		v[k] = y[i]
	}
	return mat.NewVecDense(len(v), v)
}

// qrFit fits y on x by QR: coefficients and residual sum of squares.
func qrFit(t *testing.T, x *mat.Dense, y *mat.VecDense) (*mat.VecDense, float64) {
	t.Helper()
	var qr mat.QR
	qr.Factorize(x)
	var b mat.VecDense
	if err := qr.SolveVecTo(&b, false, y); err != nil {
		t.Fatal(err)
	}
	var f mat.VecDense
	f.MulVec(x, &b)
	f.SubVec(y, &f)
	return &b, mat.Dot(&f, &f)
}

func (a *ancovaDense) rss(t *testing.T, terms [][]int, withX bool, y []float64) float64 {
	_, r := qrFit(t, a.design(terms, withX, nil), a.response(y))
	return r
}

// meanRow is the model row of a mean of effect e at the given levels:
// averaged over the full grid of the other factors and the blocks, the
// covariate at its mean.
func (a *ancovaDense) meanRow(e []int, levels []int) []float64 {
	var avg []float64
	cnt := 0
	var rec func(f int, lev []int)
	rec = func(f int, lev []int) {
		if f == len(a.facts) {
			r := append(a.row(a.terms, func(g int) int { return lev[g] }), a.xbar)
			if avg == nil {
				avg = make([]float64, len(r))
			}
			for j := range r {
				avg[j] += r[j]
			}
			cnt++
			return
		}
		for k, g := range e {
			if g == f {
				rec(f+1, append(append([]int(nil), lev...), levels[k]))
				return
			}
		}
		for l := range a.facts[f].Levels {
			rec(f+1, append(append([]int(nil), lev...), l))
		}
	}
	rec(0, nil)
	for j := range avg {
		avg[j] /= float64(cnt)
	}
	return avg
}

func TestCovariateFactorialDense(t *testing.T) {
	t.Parallel()
	for _, tc := range ancovaCases(t) {
		t.Run(tc.name, func(t *testing.T) {
			m := tc.m
			r, err := Fit(m)
			if err != nil {
				t.Fatal(err)
			}
			a := newAncovaDense(m)
			n := len(a.used)
			y := m.Response
			names := make([]string, len(a.facts))
			for f, fa := range a.facts {
				names[f] = fa.Name
			}
			// Counts: plots analysed, plots missing, plots left out for
			// want of a covariate.
			left, missing := 0, 0
			for i, v := range y {
				switch {
				case math.IsNaN(v):
					missing++
				case math.IsNaN(m.Covariate[i]):
					left++
				}
			}
			if r.N != n || r.Missing != missing || r.Covariate == nil || r.Covariate.Left != left {
				t.Fatalf("N %d missing %d covariate %+v, want %d %d left %d", r.N, r.Missing, r.Covariate, n, missing, left)
			}
			// Error: the full model with the covariate.
			x := a.design(a.terms, true, nil)
			_, p := x.Dims()
			beta, rssFull := qrFit(t, x, a.response(y))
			dfe := n - p
			mse := rssFull / float64(dfe)
			el, _ := r.Line("error")
			if el.DF != dfe || !near(el.SS, rssFull, 1e-9) {
				t.Errorf("error %d %.10g, want %d %.10g", el.DF, el.SS, dfe, rssFull)
			}
			// Type II lines, each adjusted for the covariate too.
			for k, tt := range a.terms {
				var red [][]int
				for j, u := range a.terms {
					if j != k && !containsAll(u, tt) {
						red = append(red, u)
					}
				}
				ss := a.rss(t, red, true, y) - a.rss(t, append(append([][]int(nil), red...), tt), true, y)
				name := termName(tt, names)
				l, ok := r.Line(name)
				if !ok || !near(l.SS, ss, 1e-8) {
					t.Errorf("%s SS %.10g, want %.10g", name, l.SS, ss)
				}
				if f := (ss / float64(l.DF)) / mse; !near(l.F, f, 1e-8) || l.DFDen != float64(dfe) {
					t.Errorf("%s F %.10g on %g, want %.10g on %d", name, l.F, l.DFDen, f, dfe)
				}
			}
			// The covariate's line: after all terms.
			ssx := a.rss(t, a.terms, false, y) - rssFull
			cl, ok := r.Line(CovariateLine)
			if !ok || cl.Role != RoleCovariate || cl.DF != 1 || !near(cl.SS, ssx, 1e-8) || !near(cl.F, ssx/mse, 1e-8) {
				t.Errorf("covariate line %+v, want SS %.10g F %.10g", cl, ssx, ssx/mse)
			}
			// The common slope, its SE and p (t on the error df).
			var xtx, xtxi mat.Dense
			xtx.Mul(x.T(), x)
			if err := xtxi.Inverse(&xtx); err != nil {
				t.Fatal(err)
			}
			slope := beta.AtVec(p - 1)
			se := math.Sqrt(mse * xtxi.At(p-1, p-1))
			pt := 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(dfe)}.Survival(math.Abs(slope/se))
			cv := r.Covariate
			if !near(cv.Slope, slope, 1e-9) || !near(cv.SE, se, 1e-8) || !near(cv.P, pt, 1e-7) || cv.DF != dfe || !near(cv.Mean, a.xbar, 1e-12) {
				t.Errorf("slope %.10g ± %.10g p %.6g mean %.10g, want %.10g ± %.10g p %.6g mean %.10g", cv.Slope, cv.SE, cv.P, cv.Mean, slope, se, pt, a.xbar)
			}
			// t² of the slope is the covariate line's F (one df).
			if !near(cv.T*cv.T, cl.F, 1e-8) {
				t.Errorf("slope t² %.10g, covariate F %.10g", cv.T*cv.T, cl.F)
			}
			// Estimated marginal means at the covariate's mean, their SEs
			// and every pair's SED.
			for _, e := range r.Effects {
				rows := make([][]float64, len(e.Means))
				for i, mn := range e.Means {
					rows[i] = a.meanRow(e.Factors, mn.Levels)
					rv := mat.NewVecDense(p, rows[i])
					want := mat.Dot(rv, beta)
					wse := math.Sqrt(mse * mat.Inner(rv, &xtxi, rv))
					if !mn.Estimable || !near(mn.Mean, want, 1e-9) || !near(mn.SE, wse, 1e-8) || mn.DF != float64(dfe) {
						t.Errorf("%s %v: %.10g ± %.10g, want %.10g ± %.10g", e.Name, mn.Levels, mn.Mean, mn.SE, want, wse)
					}
				}
				if e.Comparison == nil {
					t.Fatalf("%s: no comparison", e.Name)
				}
				for _, pr := range e.Comparison.Pairs {
					dv := make([]float64, p)
					for j := range dv {
						dv[j] = rows[pr.I][j] - rows[pr.J][j]
					}
					v := mat.NewVecDense(p, dv)
					sed := math.Sqrt(mse * mat.Inner(v, &xtxi, v))
					diff := mat.Dot(v, beta)
					plsd := 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(dfe)}.Survival(math.Abs(diff/sed))
					if !near(pr.SE, sed, 1e-8) || !near(pr.Diff, diff, 1e-9) || !near(pr.PLSD, plsd, 1e-7) {
						t.Errorf("%s pair %d,%d: %.10g SED %.10g p %.6g, want %.10g %.10g %.6g", e.Name, pr.I, pr.J, pr.Diff, pr.SE, pr.PLSD, diff, sed, plsd)
					}
				}
			}
			// Separate slopes per treatment combination.
			nf := len(m.Factors)
			combo := func(k int) int {
				c := 0
				for f := range nf {
					c = c*len(a.facts[f].Levels) + a.facts[f].Index[a.used[k]]
				}
				return c
			}
			present := map[int]bool{}
			first := math.MaxInt
			for k := range a.used {
				present[combo(k)] = true
				first = min(first, combo(k))
			}
			var others []int
			for c := range present {
				if c != first {
					others = append(others, c)
				}
			}
			xh := a.design(a.terms, true, func(k int) []float64 {
				out := make([]float64, len(others))
				for j, c := range others {
					if combo(k) == c {
						out[j] = a.x[k]
					}
				}
				return out
			})
			_, rssSep := qrFit(t, xh, a.response(y))
			df1 := len(others)
			df2 := dfe - df1
			fh := ((rssFull - rssSep) / float64(df1)) / (rssSep / float64(df2))
			ph := distuv.F{D1: float64(df1), D2: float64(df2)}.Survival(fh)
			if !cv.HasHomogeneity || cv.HomogeneityDF1 != df1 || cv.HomogeneityDF2 != df2 || !near(cv.HomogeneityF, fh, 1e-7) || !near(cv.HomogeneityP, ph, 1e-7) {
				t.Errorf("homogeneity %v F %.10g (%d, %d) p %.6g, want F %.10g (%d, %d) p %.6g", cv.HasHomogeneity, cv.HomogeneityF, cv.HomogeneityDF1, cv.HomogeneityDF2, cv.HomogeneityP, fh, df1, df2, ph)
			}
			// The covariate on the treatments: all treatment terms together,
			// after the blocks, on the same plots.
			var blockOnly [][]int
			if m.Block != nil {
				blockOnly = [][]int{{nf}}
			}
			rssX := a.rss(t, a.terms, false, m.Covariate)
			ssT := a.rss(t, blockOnly, false, m.Covariate) - rssX
			blockCols := 0
			if m.Block != nil {
				blockCols = len(m.Block.Levels) - 1
			}
			dfT := p - 2 - blockCols // the treatment columns
			dfeX := n - (p - 1)
			fT := (ssT / float64(dfT)) / (rssX / float64(dfeX))
			ot := cv.OnTreatmentTest
			if !cv.HasOnTreatment || ot.DF != dfT || ot.DFDen != float64(dfeX) || !near(ot.F, fT, 1e-8) {
				t.Errorf("on treatment %v %+v, want F %.10g on %d and %d", cv.HasOnTreatment, ot, fT, dfT, dfeX)
			}
			// The companions are fitted on the same plots.
			if cv.OnTreatment == nil || cv.OnTreatment.N != n || cv.Unadjusted == nil || cv.Unadjusted.N != n {
				t.Fatalf("companion fits missing or on other plots")
			}
			if el, _ := cv.Unadjusted.Line("error"); !near(el.SS, a.rss(t, a.terms, false, y), 1e-9) {
				t.Errorf("unadjusted error SS %.10g", el.SS)
			}
		})
	}
}

// TestCovariateRefusals: the inputs a covariance analysis of a factorial
// cannot use are refused with plain errors, never a panic or a number.
func TestCovariateRefusals(t *testing.T) {
	t.Parallel()
	base := loadCSV(t, "oats-split.csv", []string{"variety", "nitrogen"}, "block", "yield")
	withX := func(f func(i int) float64) Model {
		m := base
		m.Covariate = make([]float64, len(m.Response))
		for i := range m.Covariate {
			m.Covariate[i] = f(i)
		}
		return m
	}
	split := withX(ancovaX)
	split.Structure = SplitPlot
	short := withX(ancovaX)
	short.Covariate = short.Covariate[:10]
	inf := withX(ancovaX)
	inf.Covariate[4] = math.Inf(1)
	for _, c := range []struct {
		name string
		m    Model
		kind ErrorKind
	}{
		{"split plot", split, BadModel},
		{"strip plot", func() Model { m := split; m.Structure = StripPlot; return m }(), BadModel},
		{"too short", short, BadModel},
		{"infinite", inf, BadModel},
		{"constant", withX(func(int) float64 { return 3 }), NotEstimable},
		// The covariate is the nitrogen level: confounded with a factor.
		{"confounded", withX(func(i int) float64 { return float64(base.Factors[1].Index[i]) }), NotEstimable},
	} {
		_, err := Fit(c.m)
		var ge *Error
		if !errors.As(err, &ge) || ge.Kind != c.kind || ge.Reason == "" {
			t.Errorf("%s: %v, want a %d error", c.name, err, c.kind)
		}
	}
}
