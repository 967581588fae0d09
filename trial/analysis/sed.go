package analysis

// SEDMatrix returns the standard errors of the differences of every pair of
// means, nt × nt row by row in the order of r.Means (0 on the diagonal and
// for a pair the analysis did not compare). Covariances of means follow
// from them: Cov(m_i − m_c, m_j − m_c) = (SED²_ic + SED²_jc − SED²_ij)/2.
func (r *Result) SEDMatrix() []float64 {
	nt := len(r.Means)
	index := make(map[string]int, nt)
	for i, m := range r.Means {
		index[m.Treatment] = i
	}
	sed := make([]float64, nt*nt)
	for _, p := range r.Pairs {
		a, aok := index[p.A]
		b, bok := index[p.B]
		if aok && bok {
			sed[a*nt+b], sed[b*nt+a] = p.SE, p.SE
		}
	}
	return sed
}
