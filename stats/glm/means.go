package glm

import (
	"fmt"
	"math"
	"strings"

	"furlong/stats/dist"
	"furlong/stats/meansep"
)

// effects fills the estimated marginal means, comparisons, SED kinds and
// slices of every treatment term.
func effects(d *design, mx *matrix, in *inference, m *Model, trt []term, res *Result) error {
	for _, t := range trt {
		eff, fam := effectMeans(d, mx, in, t)
		if l, ok := res.Line(eff.Name); ok && l.HasTest {
			eff.HasTest, eff.P = true, l.P
		}
		if fam != nil {
			all := make([]int, len(eff.Means))
			for i := range all {
				all[i] = i
			}
			eff.Comparison = compare(fam, all, eff.Means, eff.HasTest, eff.P, res.Alpha, m.LowerIsBetter)
			res.SEDs = append(res.SEDs, sedKinds(d, m.Structure, t, eff.Means, fam)...)
		}
		if len(t) > 1 && eff.HasTest && eff.P < res.Alpha {
			eff.Significant = true
			eff.Note = interactionNote(d, t, eff.P, res.Alpha)
		}
		res.Effects = append(res.Effects, eff)
		if fam != nil && len(t) > 1 && (eff.Significant || m.AllSlices) {
			res.Slices = append(res.Slices, slices(d, t, eff, fam, res.Alpha, m.LowerIsBetter)...)
		}
	}
	return nil
}

// levelGrid lists every combination of the levels of the factors of t,
// the first factor varying slowest.
func levelGrid(d *design, t term) [][]int {
	grid := [][]int{{}}
	for _, f := range t {
		var next [][]int
		for _, g := range grid {
			for l := range d.nlev[f] {
				next = append(next, append(append([]int(nil), g...), l))
			}
		}
		grid = next
	}
	return grid
}

// effectMeans computes the estimated marginal means of term t: the row
// L of each combination is the model row averaged with equal weights over
// the levels of every other factor and over the blocks (for each term,
// the product of the per-factor averages of its coding).
func effectMeans(d *design, mx *matrix, in *inference, t term) (Effect, *family) {
	eff := Effect{Name: termName(t, d.names), Factors: append([]int(nil), t...)}
	grid := levelGrid(d, t)
	rows := make([][]float64, len(grid))
	estimableAll := true
	counts := make([]int, len(grid))
	sums := make([]float64, len(grid))
	pos := make(map[int]int, len(grid))
	for gi, g := range grid {
		key := 0
		for a, f := range t {
			key = key*d.nlev[f] + g[a]
		}
		pos[key] = gi
	}
	for i := range d.n {
		key := 0
		for _, f := range t {
			key = key*d.nlev[f] + d.lev[f][i]
		}
		gi := pos[key]
		counts[gi]++
		sums[gi] += d.y[i]
	}
	for gi, g := range grid {
		r := make([]float64, mx.p)
		r[0] = 1
		lev := func(f int) int {
			for a, tf := range t {
				if tf == f {
					return g[a]
				}
			}
			return -1
		}
		for k, u := range mx.terms {
			a, b := mx.termRange(k)
			d.termRow(u, lev, r[a:b])
		}
		rows[gi] = r
		mean := Mean{Levels: g, N: counts[gi], Estimable: estimable(r, in.null)}
		if counts[gi] > 0 {
			mean.RawMean = sums[gi] / float64(counts[gi])
		}
		if !mean.Estimable {
			estimableAll = false
		}
		eff.Means = append(eff.Means, mean)
	}
	fam := in.family(rows)
	for gi := range eff.Means {
		mn := &eff.Means[gi]
		if !mn.Estimable {
			continue
		}
		w := make([]float64, len(grid))
		w[gi] = 1
		v, df := fam.contrast(w)
		mn.Mean = fam.est[gi] + d.ybar
		mn.SE = math.Sqrt(math.Max(v, 0))
		mn.DF = df
	}
	if !estimableAll {
		return eff, nil
	}
	for gi := range fam.est {
		fam.est[gi] += d.ybar
	}
	return eff, fam
}

// maxTukeyDF caps the df given to the studentised range: beyond it the
// distribution is the same as with infinite df to many digits.
const maxTukeyDF = 100000

// compare makes every pairwise comparison of the means at positions idx
// of a family. LSD p-values use each pair's own (Satterthwaite) df;
// Tukey–Kramer p-values (Kramer 1956, Biometrics 12, 307–310) use one df
// for the set, the smallest df of its pairs rounded down, which is
// conservative when strata mix and exact otherwise. Letters come from
// meansep.Letters; LSD letters are protected by the F test (meansep.Protect).
func compare(fam *family, idx []int, means []Mean, hasTest bool, pTest, alpha float64, lowerBetter bool) *Comparison {
	k := len(idx)
	if k < 2 {
		return nil
	}
	c := &Comparison{EqualSED: true}
	est := make([]float64, k)
	for a, i := range idx {
		est[a] = fam.est[i]
	}
	se := make([]float64, k*k)
	minDF := math.Inf(1)

	for a := range k {
		for b := a + 1; b < k; b++ {
			v, df := fam.pair(idx[a], idx[b])
			s := math.Sqrt(math.Max(v, 0))
			se[a*k+b], se[b*k+a] = s, s
			diff := est[a] - est[b]
			pr := Pair{I: a, J: b, Diff: diff, SE: s, DF: df}
			if s > 0 {
				pr.T = diff / s
				pr.PLSD = tSurvival2(pr.T, df)
			}
			if len(c.Pairs) == 0 {
				c.SED, c.DF = s, df
			} else if math.Abs(s-c.SED) > 1e-9*c.SED || math.Abs(df-c.DF) > 1e-6*math.Max(1, c.DF) {
				c.EqualSED = false
			}
			minDF = math.Min(minDF, df)
			c.Pairs = append(c.Pairs, pr)
		}
	}
	if !c.EqualSED {
		c.SED, c.DF = 0, 0
	}
	tdf := maxTukeyDF
	if minDF < maxTukeyDF {
		tdf = int(math.Floor(minDF + 1e-9))
	}
	if tdf < 1 {
		tdf = 1
	}
	c.TukeyDF = tdf
	opt := meansep.LetterOptions{LowerIsBetter: lowerBetter}
	tab := dist.CachedSurvivalTable(k, tdf)
	for n := range c.Pairs {
		c.Pairs[n].PTukey = tukeyP(tab, c.Pairs[n].T)
	}
	if c.EqualSED {
		c.LSD = tQuantile(1-alpha/2, c.DF) * c.SED
		c.HSD = tab.Quantile(1-alpha) * c.SED / math.Sqrt2
	}
	sigT := func(i, j int) bool {
		if i > j {
			i, j = j, i
		}
		return c.Pairs[pairIndex(k, i, j)].PTukey < alpha
	}
	if l, err := meansep.Letters(est, sigT, opt); err == nil {
		c.LettersTukey = l
	} else {
		c.NoteTukey = err.Error()
	}
	if !hasTest {
		c.NoteLSD = "there is no F test to protect the LSD, so no LSD letters are given"
		return c
	}
	if ok, note := meansep.Protect(pTest, alpha); !ok {
		// The effect's (or slice's) own F test protects its letters, not
		// "the treatment F test" of a one-list analysis.
		c.NoteLSD = strings.Replace(note, "the treatment F test", "its F test", 1)
		return c
	}
	sig := func(i, j int) bool {
		if i > j {
			i, j = j, i
		}
		return c.Pairs[pairIndex(k, i, j)].PLSD < alpha
	}
	if l, err := meansep.Letters(est, sig, opt); err == nil {
		c.LettersLSD = l
	} else {
		c.NoteLSD = err.Error()
	}
	return c
}

func pairIndex(k, i, j int) int { return i*(2*k-i-1)/2 + j - i - 1 }

func interactionNote(d *design, t term, p, alpha float64) string {
	names := make([]string, len(t))
	for i, f := range t {
		names[i] = d.names[f]
	}
	return fmt.Sprintf("the %s interaction is significant at %s (p = %.3g): the effect of each factor depends on the level of the other%s, so compare levels within each level of the other (slices) rather than the main-effect means",
		strings.Join(names, " × "), pct(alpha), p, plural(len(t) > 2))
}

func plural(b bool) string {
	if b {
		return "s"
	}
	return ""
}

func pct(a float64) string { return fmt.Sprintf("%g%%", 100*a) }

// slices compares the levels of each factor of interaction t within each
// combination of the levels of its other factors.
func slices(d *design, t term, eff Effect, fam *family, alpha float64, lowerBetter bool) []Slice {
	var out []Slice
	for fi, f := range t {
		var others term
		for _, g := range t {
			if g != f {
				others = append(others, g)
			}
		}
		for _, at := range levelGrid(d, others) {
			var idx []int
			for gi, mn := range eff.Means {
				match := true
				oi := 0
				for a := range t {
					if a == fi {
						continue
					}
					if mn.Levels[a] != at[oi] {
						match = false
						break
					}
					oi++
				}
				if match {
					idx = append(idx, gi)
				}
			}
			s := Slice{Effect: eff.Name, Factor: f, At: make([]int, len(t))}
			oi := 0
			var parts []string
			for a, g := range t {
				if a == fi {
					s.At[a] = -1
					continue
				}
				s.At[a] = at[oi]
				parts = append(parts, d.names[g]+" = "+levelName(d, g, at[oi]))
				oi++
			}
			s.Name = d.names[f] + " at " + strings.Join(parts, ", ")
			for _, gi := range idx {
				s.Means = append(s.Means, eff.Means[gi])
			}
			w := make([][]float64, len(idx)-1)
			for r := range w {
				w[r] = make([]float64, len(eff.Means))
				w[r][idx[0]] = 1
				w[r][idx[r+1]] = -1
			}
			ft := fam.ftest(w)
			if ft.ok {
				s.HasTest, s.F, s.P, s.DF, s.DFDen = true, ft.f, ft.p, ft.df, ft.dfDen
			}
			s.Comparison = compare(fam, idx, s.Means, s.HasTest, s.P, alpha, lowerBetter)
			out = append(out, s)
		}
	}
	return out
}

// levelNames are kept by the design for slice names.
func levelName(d *design, f, l int) string {
	if f < len(d.levelNames) && l < len(d.levelNames[f]) {
		return d.levelNames[f][l]
	}
	return fmt.Sprint(l + 1)
}

// sedKinds summarises the SEDs of the pairs of means of term t by the
// factors in which the two means differ.
func sedKinds(d *design, s Structure, t term, means []Mean, fam *family) []SEDKind {
	nt := len(t)
	type acc struct {
		sum, df, lo, hi float64
		n               int
	}
	accs := make([]acc, 1<<nt)
	k := len(means)
	for i := range k {
		for j := i + 1; j < k; j++ {
			mask := 0
			for a := range nt {
				if means[i].Levels[a] != means[j].Levels[a] {
					mask |= 1 << a
				}
			}
			v, df := fam.pair(i, j)
			se := math.Sqrt(math.Max(v, 0))
			ac := &accs[mask]
			if ac.n == 0 || se < ac.lo {
				ac.lo = se
			}
			if se > ac.hi {
				ac.hi = se
			}
			ac.sum += se
			ac.df += df
			ac.n++
		}
	}
	var out []SEDKind
	for mask := 1; mask < 1<<nt; mask++ {
		ac := accs[mask]
		if ac.n == 0 {
			continue
		}
		var differ, same []int
		for a := range nt {
			if mask&(1<<a) != 0 {
				differ = append(differ, t[a])
			} else {
				same = append(same, t[a])
			}
		}
		sk := SEDKind{Effect: termName(t, d.names), Differ: differ, SED: ac.sum / float64(ac.n), Min: ac.lo, Max: ac.hi, DF: ac.df / float64(ac.n), Pairs: ac.n}
		sk.Key = classicKey(s, t, differ)
		if sk.Key == "" {
			sk.Key = sk.Effect + "/" + termName(differ, d.names)
		}
		sk.Label = sedLabel(d, differ, same)
		out = append(out, sk)
	}
	return out
}

func sedLabel(d *design, differ, same []int) string {
	dn := make([]string, len(differ))
	for i, f := range differ {
		dn[i] = d.names[f]
	}
	var lab string
	if len(differ) == 1 {
		lab = "two " + dn[0] + " levels"
	} else {
		lab = "two combinations differing in " + strings.Join(dn, " and ")
	}
	if len(same) > 0 {
		sn := make([]string, len(same))
		for i, f := range same {
			sn[i] = d.names[f]
		}
		lab += " at the same " + strings.Join(sn, " and ") + " level"
	}
	return lab
}

// classicKey names the textbook kinds of comparison of split and strip
// plots (Gomez & Gomez 1984, tables 3.8, 3.12 and 4.x).
func classicKey(s Structure, t, differ term) string {
	key := fmt.Sprint(t) + fmt.Sprint(differ)
	switch s {
	case SplitPlot:
		switch key {
		case "[0][0]":
			return "main"
		case "[1][1]":
			return "sub"
		case "[0 1][1]":
			return "sub_within_main"
		case "[0 1][0]":
			return "main_within_sub"
		case "[0 1][0 1]":
			return "main_and_sub"
		case "[2][2]":
			return "subsub"
		case "[0 2][2]":
			return "subsub_within_main"
		case "[1 2][2]":
			return "subsub_within_sub"
		case "[0 1 2][2]":
			return "subsub_within_main_sub"
		}
	case StripPlot:
		switch key {
		case "[0][0]":
			return "horizontal"
		case "[1][1]":
			return "vertical"
		case "[0 1][1]":
			return "vertical_within_horizontal"
		case "[0 1][0]":
			return "horizontal_within_vertical"
		case "[0 1][0 1]":
			return "horizontal_and_vertical"
		}
	case Factorial:
	}
	return ""
}
