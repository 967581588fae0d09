package glm

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// Dense cross-checks written in the test: design matrices built here with
// sum-to-zero coding (the engine uses treatment coding and its own
// Cholesky), fitted with gonum's QR factorisation.

type dense struct {
	m     Model
	used  []int
	facts []Factor // treatment factors then block
	terms [][]int  // over facts
}

// columns returns the sum-to-zero coded columns of a term for plot i.
func (d *dense) columns(t []int, lev func(f int) int) []float64 {
	out := []float64{1}
	for _, f := range t {
		m := len(d.facts[f].Levels)
		l := lev(f)
		var next []float64
		for _, v := range out {
			for c := range m - 1 {
				x := 0.0
				switch {
				case l == c:
					x = 1
				case l == m-1:
					x = -1
				}
				next = append(next, v*x)
			}
		}
		out = next
	}
	return out
}

func (d *dense) row(terms [][]int, lev func(f int) int) []float64 {
	r := []float64{1}
	for _, t := range terms {
		r = append(r, d.columns(t, lev)...)
	}
	return r
}

func (d *dense) matrix(terms [][]int) (*mat.Dense, *mat.VecDense) {
	var rows [][]float64
	var y []float64
	for _, i := range d.used {
		rows = append(rows, d.row(terms, func(f int) int { return d.facts[f].Index[i] }))
		y = append(y, d.m.Response[i])
	}
	x := mat.NewDense(len(rows), len(rows[0]), nil)
	for i, r := range rows {
		x.SetRow(i, r)
	}
	return x, mat.NewVecDense(len(y), y)
}

// rss fits y on the terms by QR and returns the residual sum of squares.
func (d *dense) rss(terms [][]int) float64 {
	x, y := d.matrix(terms)
	var qr mat.QR
	qr.Factorize(x)
	var b mat.VecDense
	if err := qr.SolveVecTo(&b, false, y); err != nil {
		panic(err)
	}
	var f mat.VecDense
	f.MulVec(x, &b)
	f.SubVec(y, &f)
	return mat.Dot(&f, &f)
}

func containsAll(t, u []int) bool {
	for _, f := range u {
		ok := false
		for _, g := range t {
			ok = ok || g == f
		}
		if !ok {
			return false
		}
	}
	return true
}

func randomFactorial(seed uint64, sizes []int, blocks, reps int, drop float64) Model {
	rng := rand.New(rand.NewPCG(seed, 3))
	var m Model
	for f, k := range sizes {
		fa := Factor{Name: string(rune('A' + f))}
		for l := range k {
			fa.Levels = append(fa.Levels, fa.Name+string(rune('1'+l)))
		}
		m.Factors = append(m.Factors, fa)
	}
	var blk Factor
	if blocks > 0 {
		blk = Factor{Name: "block"}
		for b := range blocks {
			blk.Levels = append(blk.Levels, string(rune('I'+b)))
		}
	}
	nc := 1
	for _, k := range sizes {
		nc *= k
	}
	nb := max(blocks, 1)
	for b := range nb {
		for c := range nc {
			for range reps {
				r := c
				y := 20 + float64(b)
				for f := len(sizes) - 1; f >= 0; f-- {
					l := r % sizes[f]
					r /= sizes[f]
					m.Factors[f].Index = append(m.Factors[f].Index, l)
					y += float64(l*(f+1)) * 0.7
				}
				y += 2 * rng.NormFloat64()
				if rng.Float64() < drop {
					y = math.NaN()
				}
				if blocks > 0 {
					blk.Index = append(blk.Index, b)
				}
				m.Response = append(m.Response, y)
			}
		}
	}
	if blocks > 0 {
		m.Block = &blk
	}
	return m
}

// TestTypeIIBruteForce checks the type II sums of squares, error line,
// marginal means, their SEs and every SED of random unbalanced factorials
// against fits of full and reduced models by dense QR (the definition of
// type II: each term adjusted for all terms not containing it; means as
// the average of the fitted model over the full grid of the other factors
// and the blocks).
func TestTypeIIBruteForce(t *testing.T) {
	t.Parallel()
	cases := []struct {
		sizes        []int
		blocks, reps int
		drop         float64
		seed         uint64
	}{
		{[]int{2, 3}, 0, 3, 0.2, 1},
		{[]int{3, 3}, 4, 1, 0.12, 2},
		{[]int{2, 3, 2}, 3, 1, 0.1, 3},
		{[]int{3, 2, 2}, 0, 2, 0.15, 4},
		{[]int{4}, 3, 2, 0.2, 5},
	}
	for _, tc := range cases {
		m := randomFactorial(tc.seed, tc.sizes, tc.blocks, tc.reps, tc.drop)
		r, err := Fit(m)
		if err != nil {
			t.Fatalf("seed %d: %v", tc.seed, err)
		}
		d := &dense{m: m, facts: append([]Factor(nil), m.Factors...)}
		for i, y := range m.Response {
			if !math.IsNaN(y) {
				d.used = append(d.used, i)
			}
		}
		nf := len(m.Factors)
		var terms [][]int
		if m.Block != nil {
			d.facts = append(d.facts, *m.Block)
			terms = append(terms, []int{nf})
		}
		for _, tt := range allTerms(nf) {
			terms = append(terms, tt)
		}
		full := d.rss(terms)
		n := len(d.used)
		p := 1
		for _, tt := range terms {
			p += len(d.columns(tt, func(int) int { return 0 }))
		}
		dfe := n - p
		el, _ := r.Line("error")
		if el.DF != dfe || !near(el.SS, full, 1e-9) {
			t.Errorf("seed %d: error %d %.10g, want %d %.10g", tc.seed, el.DF, el.SS, dfe, full)
		}
		names := append([]string(nil), func() []string {
			var s []string
			for _, f := range d.facts {
				s = append(s, f.Name)
			}
			return s
		}()...)
		for k, tt := range terms {
			var red [][]int
			for j, u := range terms {
				if j != k && !containsAll(u, tt) {
					red = append(red, u)
				}
			}
			ss := d.rss(red) - d.rss(append(append([][]int(nil), red...), tt))
			name := termName(tt, names)
			l, ok := r.Line(name)
			if !ok || !near(l.SS, ss, 1e-8) {
				t.Errorf("seed %d: %s SS %.10g, want %.10g", tc.seed, name, l.SS, ss)
			}
			if f := (ss / float64(l.DF)) / (full / float64(dfe)); !near(l.F, f, 1e-8) {
				t.Errorf("seed %d: %s F %.10g, want %.10g", tc.seed, name, l.F, f)
			}
		}
		// Means and SEDs.
		x, y := d.matrix(terms)
		var qr mat.QR
		qr.Factorize(x)
		var b mat.VecDense
		if err := qr.SolveVecTo(&b, false, y); err != nil {
			t.Fatal(err)
		}
		var xtx, xtxi mat.Dense
		xtx.Mul(x.T(), x)
		if err := xtxi.Inverse(&xtx); err != nil {
			t.Fatal(err)
		}
		mse := full / float64(dfe)
		for _, e := range r.Effects {
			// average rows over the full grid of all other factors
			var rows [][]float64
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
				for j := range avg {
					avg[j] /= float64(cnt)
				}
				rows = append(rows, avg)
			}
			for i, mn := range e.Means {
				want := mat.Dot(mat.NewVecDense(p, rows[i]), &b)
				v := mat.Inner(mat.NewVecDense(p, rows[i]), &xtxi, mat.NewVecDense(p, rows[i])) * mse
				if !near(mn.Mean, want, 1e-9) || !near(mn.SE, math.Sqrt(v), 1e-8) {
					t.Errorf("seed %d: %s %v: %.10g ± %.10g, want %.10g ± %.10g", tc.seed, e.Name, mn.Levels, mn.Mean, mn.SE, want, math.Sqrt(v))
				}
			}
			for _, pr := range e.Comparison.Pairs {
				dv := make([]float64, p)
				for j := range dv {
					dv[j] = rows[pr.I][j] - rows[pr.J][j]
				}
				sed := math.Sqrt(mat.Inner(mat.NewVecDense(p, dv), &xtxi, mat.NewVecDense(p, dv)) * mse)
				if !near(pr.SE, sed, 1e-8) || pr.DF != float64(dfe) {
					t.Errorf("seed %d: %s pair %d,%d SED %.10g df %g, want %.10g %d", tc.seed, e.Name, pr.I, pr.J, pr.SE, pr.DF, sed, dfe)
				}
			}
		}
	}
}
