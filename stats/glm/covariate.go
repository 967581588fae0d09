package glm

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"
)

const noteCovariate = "the trait is adjusted for a covariate (analysis of covariance): each line's sum of squares is adjusted for the covariate and for all the terms that do not contain it, so the lines do not add up to the total, and the means are estimated at the covariate's mean"

// covariateLine is the covariate's line of the analysis of variance: its
// reduction in the residual sum of squares when it is added last, to the
// blocks and every treatment term (type II: no term contains it).
func covariateLine(mx *matrix, ne *normal, mse float64, dfe int) Line {
	cols := make([]int, 0, mx.p)
	for j := range mx.tp {
		cols = append(cols, j)
	}
	cols = append(cols, mx.cov)
	ss, df := ne.chol(cols).ssOf(len(cols)-1, len(cols))
	l := Line{Source: CovariateLine, Role: RoleCovariate, DF: df, HasSS: true, SS: ss, MS: ss,
		HasTest: true, ErrorTerm: "error", DFDen: float64(dfe)}
	l.F = l.MS / mse
	l.P = fSurvival(l.F, 1, float64(dfe))
	return l
}

// covariance reads the common slope off the full fit (c is the covariance
// of its estimates) and tests separate slopes per treatment combination.
func covariance(d *design, mx *matrix, ne *normal, full *olsFit, c *mat.SymDense, dfe int) *Covariance {
	cv := &Covariance{Mean: d.xbar, DF: dfe}
	cv.Slope = full.beta[mx.cov] / d.xs
	cv.SE = math.Sqrt(math.Max(c.At(mx.cov, mx.cov), 0)) / d.xs
	if cv.SE > 0 {
		cv.T = cv.Slope / cv.SE
		cv.P = tSurvival2(cv.T, float64(dfe))
	}
	homogeneity(d, mx, full, dfe, ne.yty, cv)
	return cv
}

// homogeneity adds to the common-slope model the covariate within every
// treatment combination but the first (a separate slope per combination)
// and tests the extra slopes against the error of that model: the
// classic test of parallel regressions (Snedecor & Cochran 1989,
// Statistical Methods, 8th ed., section 18.4), with its df the number of
// extra slopes the plots can estimate.
func homogeneity(d *design, mx *matrix, full *olsFit, dfe int, yty float64, cv *Covariance) {
	keys := make([]int, d.n)
	seen := map[int]bool{}
	for i := range d.n {
		k := 0
		for f := range d.nf {
			k = k*d.nlev[f] + d.lev[f][i]
		}
		keys[i] = k
		seen[k] = true
	}
	var combos []int
	for k := range seen {
		combos = append(combos, k)
	}
	sort.Ints(combos)
	if len(combos) < 2 {
		return
	}
	col := map[int]int{}
	for j, k := range combos[1:] {
		col[k] = mx.p + j
	}
	ext := &matrix{p: mx.p + len(combos) - 1}
	ext.x = make([]float64, d.n*ext.p)
	for i := range d.n {
		row := ext.x[i*ext.p : (i+1)*ext.p]
		copy(row, mx.x[i*mx.p:(i+1)*mx.p])
		if j, ok := col[keys[i]]; ok {
			row[j] = d.x[i]
		}
	}
	ene := ext.normal(d.y, d.ybar)
	all := make([]int, ext.p)
	for j := range all {
		all[j] = j
	}
	red, df1 := ene.chol(all).ssOf(mx.p, ext.p)
	df2 := dfe - df1
	rss := full.rss - red
	if df1 < 1 || df2 < 1 || !(rss > 1e-20*yty) {
		return
	}
	f := math.Max((red/float64(df1))/(rss/float64(df2)), 0)
	cv.HasHomogeneity = true
	cv.HomogeneityF, cv.HomogeneityP = f, fSurvival(f, float64(df1), float64(df2))
	cv.HomogeneityDF1, cv.HomogeneityDF2 = df1, df2
}

// covariateCompanions fits, on the plots of the covariance analysis, the
// response without the covariate and the covariate itself with the same
// model, and the F test of all treatment terms on the covariate. A fit
// that fails is left out (nil, HasOnTreatment false).
func covariateCompanions(m Model, used []int, cv *Covariance) {
	mask := make([]bool, len(m.Response))
	for i := range mask {
		mask[i] = true
	}
	for _, i := range used {
		mask[i] = false
	}
	plain := m
	plain.Covariate, plain.Missing, plain.AllSlices = nil, mask, false
	if r, err := Fit(plain); err == nil {
		cv.Unadjusted = r
	}
	onx := plain
	onx.Response, onx.Origin = m.Covariate, 0
	if r, err := Fit(onx); err == nil {
		cv.OnTreatment = r
	}
	cv.OnTreatmentTest, cv.HasOnTreatment = jointTreatmentTest(onx)
}

// treatmentTerms are the model's treatment terms, each sorted, by size.
func treatmentTerms(m *Model, nf int) []term {
	if m.Terms == nil {
		return allTerms(nf)
	}
	var trt []term
	for _, t := range m.Terms {
		tt := append(term(nil), t...)
		sort.Ints(tt)
		trt = append(trt, tt)
	}
	sort.SliceStable(trt, func(i, j int) bool { return len(trt[i]) < len(trt[j]) })
	return trt
}

// jointTreatmentTest is the F test of all treatment terms of a factorial
// together (the treatment combinations, after the blocks) against its
// error: the test of one list of treatments, for the combinations.
func jointTreatmentTest(m Model) (Line, bool) {
	used, err := m.check()
	if err != nil {
		return Line{}, false
	}
	d := newDesign(&m, used)
	var terms []term
	if d.hasBlock() {
		terms = append(terms, term{d.block()})
	}
	terms = append(terms, treatmentTerms(&m, d.nf)...)
	mx := d.build(terms)
	ne := mx.normal(d.y, d.ybar)
	all := make([]int, mx.p)
	for j := range all {
		all[j] = j
	}
	ch := ne.chol(all)
	from := 1
	if d.hasBlock() {
		_, from = mx.termRange(0)
	}
	ss, df := ch.ssOf(from, mx.p)
	fitted, _ := ch.ssOf(0, mx.p)
	dfe := d.n - ch.k
	rss := ne.yty - fitted
	if df < 1 || dfe < 1 || !(rss > 1e-20*ne.yty) {
		return Line{}, false
	}
	l := Line{Source: "treatments", Role: RoleTreatment, DF: df, HasSS: true, SS: ss, MS: ss / float64(df),
		HasTest: true, ErrorTerm: "error", DFDen: float64(dfe)}
	l.F = l.MS / (rss / float64(dfe))
	l.P = fSurvival(l.F, float64(df), float64(dfe))
	return l, true
}

func keptCol(kept []int, c int) bool {
	for _, k := range kept {
		if k == c {
			return true
		}
	}
	return false
}
