package stats

import "math"

// accum is a Kahan–Babuška–Neumaier compensated sum: the running error of
// each addition is kept in c, so the result is as accurate as if the sum had
// been formed in twice the working precision and then rounded.
type accum struct{ s, c float64 }

func (a *accum) add(x float64) {
	t := a.s + x
	if math.Abs(a.s) >= math.Abs(x) {
		a.c += (a.s - t) + x
	} else {
		a.c += (x - t) + a.s
	}
	a.s = t
}

func (a *accum) sum() float64 { return a.s + a.c }

// sumSq returns Σx² with compensated summation.
func sumSq(x []float64) float64 {
	var a accum
	for _, v := range x {
		a.add(v * v)
	}
	return a.sum()
}

// mean returns the arithmetic mean of y in two passes: a compensated sum
// divided by n, then the compensated mean of the deviations from it added as
// a correction.
func mean(y []float64) float64 {
	var a accum
	for _, v := range y {
		a.add(v)
	}
	m := a.sum() / float64(len(y))
	var c accum
	for _, v := range y {
		c.add(v - m)
	}
	return m + c.sum()/float64(len(y))
}

// levelMeans returns the mean of y within each level of idx, computed like
// mean. counts[l] is the number of observations at level l; levels with no
// observations get mean 0.
func levelMeans(y []float64, idx []int, counts []int) []float64 {
	L := len(counts)
	acc := make([]accum, L)
	for i, v := range y {
		acc[idx[i]].add(v)
	}
	m := make([]float64, L)
	for l := range m {
		if counts[l] > 0 {
			m[l] = acc[l].sum() / float64(counts[l])
		}
		acc[l] = accum{}
	}
	for i, v := range y {
		l := idx[i]
		acc[l].add(v - m[l])
	}
	for l := range m {
		if counts[l] > 0 {
			m[l] += acc[l].sum() / float64(counts[l])
		}
	}
	return m
}
