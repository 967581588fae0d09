package series

import (
	"errors"
	"math"

	"gonum.org/v1/gonum/mat"

	"furlong/stats"
)

// twoStageWLS fits mean = entry + site by weighted least squares: the
// normal equations of the e entry parameters and the s−1 site contrasts
// (site 0 as reference) are formed directly (each observation touches two
// parameters) and solved by Cholesky; the scale σ² is the weighted
// residual mean square.
func twoStageWLS(y, w []float64, site, entry []int, s, e int) (*Result, error) {
	n := len(y)
	p := e + s - 1
	df := n - p
	if df < 1 {
		return nil, errors.New("the series has no degrees of freedom left for the entry × site interaction: it needs more sites or more entries in common")
	}
	// Centre on the weighted mean so that large offsets keep their digits.
	var sw, swy float64
	for k := range y {
		sw += w[k]
		swy += w[k] * y[k]
	}
	c := swy / sw
	d := make([]float64, n)
	for k := range y {
		d[k] = y[k] - c
	}
	xtx := mat.NewSymDense(p, nil)
	xty := mat.NewVecDense(p, nil)
	for k := range d {
		i, j := entry[k], site[k]
		xtx.SetSym(i, i, xtx.At(i, i)+w[k])
		xty.SetVec(i, xty.AtVec(i)+w[k]*d[k])
		if j > 0 {
			q := e + j - 1
			xtx.SetSym(q, q, xtx.At(q, q)+w[k])
			xtx.SetSym(i, q, xtx.At(i, q)+w[k])
			xty.SetVec(q, xty.AtVec(q)+w[k]*d[k])
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(xtx) {
		return nil, errors.New("the sites and entries of the series are not connected (some group of sites shares no entry with the others), so their means cannot be compared")
	}
	var beta mat.VecDense
	if err := ch.SolveVecTo(&beta, xty); err != nil {
		return nil, errors.New("the two-stage analysis could not be solved: the sites and entries are not connected")
	}
	var cov mat.SymDense
	if err := ch.InverseTo(&cov); err != nil {
		return nil, errors.New("the two-stage analysis could not be solved: the sites and entries are not connected")
	}
	fitted := func(k int) float64 {
		f := beta.AtVec(entry[k])
		if site[k] > 0 {
			f += beta.AtVec(e + site[k] - 1)
		}
		return f
	}
	var rss, tss float64
	for k := range d {
		rss += w[k] * sq(d[k]-fitted(k))
		tss += w[k] * sq(d[k])
	}
	rssSite := groupRSS(d, w, site, s)
	rssEntry := groupRSS(d, w, entry, e)
	sigma2 := rss / float64(df)

	siteL := line(SourceSite, stats.RoleNuisance, s-1, math.Max(rssEntry-rss, 0))
	entryL := line(SourceEntry, stats.RoleTreatment, e-1, math.Max(rssSite-rss, 0))
	intL := line(SourceEntryBySite, stats.RoleInteraction, df, rss)
	totL := stats.Source{Name: SourceTotal, Role: stats.RoleTotal, DF: n - 1, SS: tss}
	test(&entryL, intL)
	r := &Result{
		Method:     MethodTwoStage,
		Sites:      SitesRandom,
		Weighted:   true,
		ANOVA:      stats.Table{siteL, entryL, intL, totL},
		DF:         df,
		MS:         sigma2,
		PTreatment: entryL.P,
	}
	if !entryL.HasTest {
		r.PTreatment = math.NaN()
	}
	// Least-squares mean of entry i: β_i + (1/s)·Σ site contrasts.
	l := make([]float64, p)
	r.Means = make([]Mean, e)
	var siteAvg float64
	for j := 1; j < s; j++ {
		siteAvg += beta.AtVec(e+j-1) / float64(s)
	}
	for i := 0; i < e; i++ {
		for q := range l {
			l[q] = 0
		}
		l[i] = 1
		for j := 1; j < s; j++ {
			l[e+j-1] = 1 / float64(s)
		}
		lv := mat.NewVecDense(p, l)
		v := mat.Inner(lv, &cov, lv)
		r.Means[i] = Mean{Mean: c + beta.AtVec(i) + siteAvg, SE: math.Sqrt(sigma2 * v)}
	}
	r.pairSE = func(i, j int) float64 {
		return math.Sqrt(sigma2 * math.Max(cov.At(i, i)+cov.At(j, j)-2*cov.At(i, j), 0))
	}
	r.Notes = append(r.Notes,
		"two-stage analysis of the site means, each weighted by the inverse of its stage-1 variance; the weighted residual mean square scales the weights",
		"entries are tested against the entry × site interaction (sites as random)")
	return r, nil
}

// groupRSS is the weighted residual sum of squares of d about its
// weighted group means.
func groupRSS(d, w []float64, g []int, levels int) float64 {
	sw := make([]float64, levels)
	swd := make([]float64, levels)
	for k := range d {
		sw[g[k]] += w[k]
		swd[g[k]] += w[k] * d[k]
	}
	var rss float64
	for k := range d {
		rss += w[k] * sq(d[k]-swd[g[k]]/sw[g[k]])
	}
	return rss
}
