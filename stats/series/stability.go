package series

import (
	"errors"
	"math"
	"sort"
)

// Stability describes how an entry's performance follows the sites.
type Stability struct {
	// Slope of the Finlay–Wilkinson regression of the entry's site means on
	// the site index (1 = average response to better sites), its SE and
	// the deviation mean square (residual of the regression); nil where
	// the entry was at too few sites (2 for a slope, 3 for its SE).
	Slope, SlopeSE, DeviationMS *float64
	// Ecovalence is Wricke's ecovalence: the entry's sum of squares of
	// entry × site residuals of the additive model on the site means.
	Ecovalence float64
	// Ranks of the entry at each site (1 = best, ties averaged), NaN
	// where it was not tested.
	Ranks []float64
}

// SiteIndex returns the site index of each site: the site's least-squares
// mean under the additive model site + entry fitted to cells (for a
// complete table, the mean of all entries at the site).
func SiteIndex(cells [][]float64) ([]float64, error) {
	ix, _, err := additive(cells)
	return ix, err
}

// additive returns the site indices and the entry × site residuals of the
// unweighted additive fit of cells (see SiteIndex). At the least-squares
// solution a site's effect is the mean of (mean − entry effect) over the
// entries at that site, so the indices follow from the entries' LS means.
func additive(cells [][]float64) (index []float64, resid [][]float64, err error) {
	r, err := TwoStage(cells, nil)
	if err != nil {
		return nil, nil, err
	}
	var mbar float64
	for _, m := range r.Means {
		mbar += m.Mean
	}
	mbar /= float64(len(r.Means))
	index = make([]float64, len(cells))
	for j, row := range cells {
		var sum float64
		var k int
		for i, v := range row {
			if !math.IsNaN(v) {
				sum += v - r.Means[i].Mean
				k++
			}
		}
		index[j] = sum/float64(k) + mbar
	}
	resid = make([][]float64, len(cells))
	for j, row := range cells {
		resid[j] = make([]float64, len(row))
		for i, v := range row {
			if math.IsNaN(v) {
				resid[j][i] = math.NaN()
				continue
			}
			resid[j][i] = v - r.Means[i].Mean - index[j] + mbar
		}
	}
	return index, resid, nil
}

// StabilityOf returns each entry's Finlay–Wilkinson regression, Wricke's
// ecovalence and ranks from the site × entry table of means cells
// (cells[site][entry], NaN where not tested). lowerIsBetter ranks the
// lowest mean first.
func StabilityOf(cells [][]float64, lowerIsBetter bool) ([]Stability, error) {
	index, resid, err := additive(cells)
	if err != nil {
		return nil, err
	}
	if len(cells) < 2 {
		return nil, errors.New("stability needs at least two sites")
	}
	e := len(cells[0])
	out := make([]Stability, e)
	for i := 0; i < e; i++ {
		var xs, ys []float64
		var w float64
		for j := range cells {
			if v := cells[j][i]; !math.IsNaN(v) {
				xs = append(xs, index[j])
				ys = append(ys, v)
				w += sq(resid[j][i])
			}
		}
		st := Stability{Ecovalence: w}
		if len(xs) >= 2 {
			mx, my := meanOf(xs), meanOf(ys)
			var sxx, sxy float64
			for k := range xs {
				sxx += sq(xs[k] - mx)
				sxy += (xs[k] - mx) * (ys[k] - my)
			}
			if sxx > 0 {
				b := sxy / sxx
				st.Slope = &b
				if len(xs) >= 3 {
					var rss float64
					for k := range xs {
						rss += sq(ys[k] - my - b*(xs[k]-mx))
					}
					dev := rss / float64(len(xs)-2)
					se := math.Sqrt(dev / sxx)
					st.DeviationMS, st.SlopeSE = &dev, &se
				}
			}
		}
		out[i] = st
	}
	for i := range out {
		out[i].Ranks = make([]float64, len(cells))
	}
	for j, row := range cells {
		rk := ranks(row, lowerIsBetter)
		for i := range out {
			out[i].Ranks[j] = rk[i]
		}
	}
	return out, nil
}

// ranks gives 1 to the best finite value (ties share the average rank)
// and NaN to missing ones.
func ranks(v []float64, lowerIsBetter bool) []float64 {
	idx := make([]int, 0, len(v))
	for i, x := range v {
		if !math.IsNaN(x) {
			idx = append(idx, i)
		}
	}
	better := func(a, b float64) bool {
		if lowerIsBetter {
			return a < b
		}
		return a > b
	}
	sort.SliceStable(idx, func(a, b int) bool { return better(v[idx[a]], v[idx[b]]) })
	out := make([]float64, len(v))
	for i := range out {
		out[i] = math.NaN()
	}
	for a := 0; a < len(idx); {
		b := a
		for b+1 < len(idx) && v[idx[b+1]] == v[idx[a]] {
			b++
		}
		r := float64(a+b)/2 + 1
		for k := a; k <= b; k++ {
			out[idx[k]] = r
		}
		a = b + 1
	}
	return out
}

func meanOf(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v
	}
	return s / float64(len(x))
}

// HeadToHead compares two entries over the sites where both were tested.
type HeadToHead struct {
	Sites         int     // sites with both entries
	Higher, Lower int     // sites where the first entry's mean was higher / lower
	Ties          int     // sites with equal means
	MeanDiff      float64 // mean over those sites of first − second
	// SE, T, DF and P of the paired t test of the differences over sites;
	// nil with fewer than two sites or when every difference is equal.
	SE, T, P *float64
	DF       int
}

// Compare2 compares entries a and b of cells (see StabilityOf) site by
// site: counts, the mean difference and a paired t test over sites.
func Compare2(cells [][]float64, a, b int) HeadToHead {
	var d []float64
	var h HeadToHead
	for _, row := range cells {
		x, y := row[a], row[b]
		if math.IsNaN(x) || math.IsNaN(y) {
			continue
		}
		d = append(d, x-y)
		switch {
		case x > y:
			h.Higher++
		case x < y:
			h.Lower++
		default:
			h.Ties++
		}
	}
	h.Sites = len(d)
	if h.Sites == 0 {
		return h
	}
	h.MeanDiff = meanOf(d)
	if h.Sites < 2 {
		return h
	}
	var ss float64
	for _, v := range d {
		ss += sq(v - h.MeanDiff)
	}
	h.DF = h.Sites - 1
	se := math.Sqrt(ss / float64(h.DF) / float64(h.Sites))
	if !(se > 0) {
		return h
	}
	t := h.MeanDiff / se
	p := tTwoSided(t, h.DF)
	h.SE, h.T, h.P = &se, &t, &p
	return h
}

// PercentOf returns 100·v/ref, nil when either is missing or ref is 0.
func PercentOf(v, ref float64) *float64 {
	if math.IsNaN(v) || math.IsNaN(ref) || ref == 0 {
		return nil
	}
	p := 100 * v / ref
	return &p
}
