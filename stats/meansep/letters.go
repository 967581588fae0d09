package meansep

import (
	"errors"
	"math"
	"math/bits"
	"slices"
	"strings"
)

// MaxLetterColumns bounds the number of letter columns the letter display
// may hold while it is being built. Realistic trials need at most about as
// many letters as treatments; some artificial patterns of significance need
// exponentially many, and are refused with ErrTooManyLetters rather than
// shown approximately.
const MaxLetterColumns = 1 << 14

// ErrTooManyLetters is returned when the pattern of significant differences
// would need more than MaxLetterColumns letters.
var ErrTooManyLetters = errors.New("the pattern of significant differences is too intricate for a letter display; use the table of pairwise comparisons instead")

// ErrBadMean is returned when a mean given for ordering the letters is not
// a finite number.
var ErrBadMean = errors.New("a treatment mean is missing or not a number, so letters cannot be assigned")

// LetterOptions controls the order of the letters.
type LetterOptions struct {
	// LowerIsBetter gives the letter a to the lowest mean (days to
	// flowering, disease scores) instead of the highest (yield).
	LowerIsBetter bool
}

// Letters returns a compact letter display of all pairwise comparisons of
// k = len(means) treatments: two treatments share a letter exactly when
// sig reports their difference as not significant. sig is called only with
// i < j and must be a fixed predicate. The result has one string per
// treatment, in level order, with its letters in alphabetical order.
//
// The letters are built with the insert-and-absorb algorithm of Piepho
// (2004), "An algorithm for a letter-based representation of all-pairwise
// comparisons", J. Comput. Graph. Stat. 13(2), 456–466, followed by his
// sweeping step, which removes every letter that is not needed to connect
// some non-significant pair; so every letter of the result is necessary.
// Insert-and-absorb yields the maximal sets of mutually non-significant
// treatments; here the significant pairs are inserted one treatment at a
// time in order of the means, which keeps the work proportional to the
// number of letters for the usual patterns (significance growing with the
// difference of the means).
//
// The letters are ordered so that the column holding the best mean (the
// highest, or the lowest with LowerIsBetter) is a, the next column in
// order of its best member b, and so on. After a–z come A–Z, then pairs of
// characters aa, ab, …, aZ, ba, … (and triples after ZZ). When any letter
// has two or more characters, the letters of a treatment are separated by
// spaces ("a Z aa") so they can be read apart.
//
// Working memory is O(k²) (significance bitsets and the pair counts of the
// sweep) plus the columns, of which there are never more than
// MaxLetterColumns: patterns that would need more at any stage of the
// construction return ErrTooManyLetters (the display is never
// approximated). Non-finite means return ErrBadMean.
func Letters(means []float64, sig func(i, j int) bool, opt LetterOptions) ([]string, error) {
	cols, err := letterColumns(means, sig, opt)
	if err != nil {
		return nil, err
	}
	return formatLetters(len(means), cols), nil
}

// letterColumns returns the letter columns in label order, each as a sorted
// list of treatment indices.
func letterColumns(means []float64, sig func(i, j int) bool, opt LetterOptions) ([][]int, error) {
	k := len(means)
	if k == 0 {
		return nil, nil
	}
	for _, m := range means {
		if math.IsNaN(m) || math.IsInf(m, 0) {
			return nil, ErrBadMean
		}
	}
	// Work in rank space: rank 0 is the best mean.
	order := make([]int, k)
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int {
		x, y := means[a], means[b]
		if opt.LowerIsBetter {
			x, y = y, x
		}
		switch {
		case x > y:
			return -1
		case x < y:
			return 1
		}
		return 0
	})
	rank := make([]int, k)
	for r, i := range order {
		rank[i] = r
	}
	sigSet := make([]bitset, k)
	for r := range sigSet {
		sigSet[r] = newBitset(k)
	}
	// Pairs in level order (i < j), the order a caller stores them in.
	for i := range k {
		a := rank[i]
		for j := i + 1; j < k; j++ {
			if sig(i, j) {
				b := rank[j]
				sigSet[a].set(b)
				sigSet[b].set(a)
			}
		}
	}
	cols, err := insertAbsorb(k, sigSet, MaxLetterColumns)
	if err != nil {
		return nil, err
	}
	cols = sweep(k, cols)
	sortColumns(cols)
	out := make([][]int, len(cols))
	for c, col := range cols {
		col.each(func(r int) { out[c] = append(out[c], order[r]) })
		slices.Sort(out[c])
	}
	return out, nil
}

// absorber holds the current letter columns with, for each treatment, the
// set of columns it belongs to, so that "is this set contained in some
// column" is answered from the columns of its rarest member.
type absorber struct {
	k      int
	cols   []bitset // by column id; nil for a free id
	free   []int
	colsOf []bitset // treatment → set of column ids
	count  []int    // treatment → number of columns
	live   int

	scratch bitset
}

func (a *absorber) add(b bitset) {
	var id int
	if n := len(a.free); n > 0 {
		id = a.free[n-1]
		a.free = a.free[:n-1]
		a.cols[id] = b
	} else {
		id = len(a.cols)
		a.cols = append(a.cols, b)
		if id >= 64*len(a.colsOf[0]) {
			for t := range a.colsOf {
				a.colsOf[t] = append(a.colsOf[t], make(bitset, len(a.colsOf[t]))...)
			}
		}
	}
	b.each(func(t int) {
		a.colsOf[t].set(id)
		a.count[t]++
	})
	a.live++
}

func (a *absorber) remove(id int) bitset {
	b := a.cols[id]
	b.each(func(t int) {
		a.colsOf[t].clear(id)
		a.count[t]--
	})
	a.cols[id] = nil
	a.free = append(a.free, id)
	a.live--
	return b
}

// absorbed reports whether b is contained in a current column. It either
// tests b against each column of its rarest member, or intersects the
// column sets of all its members, whichever takes fewer word operations.
func (a *absorber) absorbed(b bitset) bool {
	rare, best, size := -1, math.MaxInt, 0
	for wi, w := range b {
		for w != 0 {
			t := wi<<6 | bits.TrailingZeros64(w)
			w &= w - 1
			size++
			if c := a.count[t]; c < best {
				rare, best = t, c
			}
		}
	}
	if rare < 0 || best == 0 {
		return false
	}
	cw := len(a.colsOf[rare])
	if best*len(b) <= size*cw {
		for wi, w := range a.colsOf[rare] {
			for w != 0 {
				id := wi<<6 | bits.TrailingZeros64(w)
				w &= w - 1
				if b.subsetOf(a.cols[id]) {
					return true
				}
			}
		}
		return false
	}
	if cap(a.scratch) < cw {
		a.scratch = make(bitset, cw)
	}
	x := a.scratch[:cw]
	copy(x, a.colsOf[rare])
	for wi, w := range b {
		for w != 0 {
			t := wi<<6 | bits.TrailingZeros64(w)
			w &= w - 1
			var any uint64
			for i, v := range a.colsOf[t] {
				x[i] &= v
				any |= x[i]
			}
			if any == 0 {
				return false
			}
		}
	}
	return true
}

// insertAbsorb is the insert-and-absorb step of Piepho (2004). It starts
// from one column holding every treatment. Inserting the significant pair
// (t, s) splits each column holding both into a copy without t and a copy
// without s; a new column contained in another column is absorbed
// (dropped). Here all significant pairs of treatment t are inserted
// together — the columns holding t and some partner s of t are each split
// into K∖{t} and K∖S(t), S(t) the partners of t — which gives the same
// columns as inserting the pairs one by one. The columns are then the
// maximal sets of treatments without a significant pair among them. More
// than limit columns at any time return ErrTooManyLetters.
func insertAbsorb(k int, sigSet []bitset, limit int) ([]bitset, error) {
	a := &absorber{k: k, colsOf: make([]bitset, k), count: make([]int, k)}
	for t := range a.colsOf {
		a.colsOf[t] = make(bitset, 1)
	}
	all := newBitset(k)
	for t := range k {
		all.set(t)
	}
	a.add(all)

	var hit []int
	type sized struct {
		b bitset
		n int
	}
	var cand []sized
	for t := range k {
		s := sigSet[t]
		hit = hit[:0]
		a.colsOf[t].each(func(id int) {
			if a.cols[id].meets(s) {
				hit = append(hit, id)
			}
		})
		if len(hit) == 0 {
			continue
		}
		removed := make([]bitset, len(hit))
		for i, id := range hit {
			removed[i] = a.remove(id)
		}
		// Candidates K∖{t} and K∖S(t). A candidate can only be contained
		// in an unchanged column or in a larger (or equal) copy without
		// S(t) — never in a copy without t — so checking the candidates
		// from the largest down, and adding each survivor at once, absorbs
		// exactly the non-maximal ones (and all but the first of equal
		// ones).
		cand = cand[:0]
		for _, col := range removed {
			b := slices.Clone(col)
			for w := range b {
				b[w] &^= s[w]
			}
			col.clear(t) // K∖{t}, reusing the removed column's storage
			cand = append(cand, sized{col, col.count()}, sized{b, b.count()})
		}
		slices.SortFunc(cand, func(x, y sized) int { return y.n - x.n })
		for _, c := range cand {
			if c.n > 0 && !a.absorbed(c.b) {
				a.add(c.b)
				if a.live > limit {
					return nil, ErrTooManyLetters
				}
			}
		}
	}
	var cols []bitset
	for _, c := range a.cols {
		if c != nil {
			cols = append(cols, c)
		}
	}
	return cols, nil
}

// sweep is the sweeping step of Piepho (2004): visiting the columns in
// display order and the treatments of each column from the best mean down,
// it deletes a treatment's letter when the treatment keeps another letter
// and shares another letter with every other treatment of the column; the
// display stays valid and no remaining letter can be deleted. Columns left
// empty are dropped.
func sweep(k int, cols []bitset) []bitset {
	sortColumns(cols)
	members := make([][]int32, len(cols))
	for c, col := range cols {
		m := make([]int32, 0, col.count())
		col.each(func(t int) { m = append(m, int32(t)) })
		members[c] = m
	}
	shared, stride := sharedCounts(k, members)
	// low[i] holds the j ≠ i that share at most one column with i: a
	// letter of i in column c can go exactly when i has two or more
	// letters and no other member of c is in low[i]. Counts only fall, so
	// low only grows.
	low := make([]bitset, k)
	count := make([]int, k)
	for i := range k {
		low[i] = newBitset(k)
		row := shared[i*stride : i*stride+k]
		for j, n := range row {
			if n <= 1 && j != i {
				low[i].set(j)
			}
		}
		count[i] = int(row[i])
	}
	for c, col := range cols {
		m := members[c]
		for p := 0; p < len(m); {
			i := int(m[p])
			if count[i] < 2 || col.meetsExcept(low[i], i) {
				p++
				continue
			}
			col.clear(i)
			m = append(m[:p], m[p+1:]...)
			count[i]--
			row := shared[i*stride : i*stride+k]
			row[i]--
			for _, j := range m {
				row[j]--
				shared[int(j)*stride+i]--
				if row[j] <= 1 {
					low[i].set(int(j))
					low[int(j)].set(i)
				}
			}
		}
		members[c] = m
	}
	return slices.DeleteFunc(cols, func(c bitset) bool { return c.first() < 0 })
}

// sharedCounts returns, for columns given by their sorted members, the
// number of columns holding both i and j at shared[i*stride+j] (i == j:
// the number of columns holding i), stride = k+1. Each column is taken as
// its runs of consecutive members: a pair of runs adds 1 to a rectangle of
// the matrix, which a two-dimensional difference array records in four
// cells, so the work is the squared number of runs per column plus k², not
// the squared number of members (the columns of a large trial are long
// runs of neighbouring ranks). The counts are kept modulo 2¹⁶, which is
// exact because no count exceeds MaxLetterColumns.
func sharedCounts(k int, members [][]int32) ([]uint16, int) {
	stride := k + 1
	d := make([]uint16, stride*stride)
	var runs [][2]int
	for _, m := range members {
		runs = runs[:0]
		for p := 0; p < len(m); {
			q := p
			for q+1 < len(m) && m[q+1] == m[q]+1 {
				q++
			}
			runs = append(runs, [2]int{int(m[p]), int(m[q])})
			p = q + 1
		}
		for _, a := range runs {
			r0, r1 := a[0]*stride, (a[1]+1)*stride
			for _, b := range runs {
				c0, c1 := b[0], b[1]+1
				d[r0+c0]++
				d[r0+c1]--
				d[r1+c0]--
				d[r1+c1]++
			}
		}
	}
	// Prefix sums along rows, then down columns.
	for i := range stride {
		row := d[i*stride : i*stride+stride]
		for j := 1; j < stride; j++ {
			row[j] += row[j-1]
		}
	}
	for i := 1; i < stride; i++ {
		row, prev := d[i*stride:i*stride+stride], d[(i-1)*stride:i*stride]
		for j := range row {
			row[j] += prev[j]
		}
	}
	return d, stride
}

// sortColumns orders columns (sets of ranks) lexicographically by their
// members from the best rank: the column holding rank 0 first, and so on.
func sortColumns(cols []bitset) {
	slices.SortStableFunc(cols, func(x, y bitset) int {
		for w := range x {
			if d := x[w] ^ y[w]; d != 0 {
				low := d & -d
				if x[w]&low != 0 {
					return -1
				}
				return 1
			}
		}
		return 0
	})
}

// letterLabel returns the label of the n-th letter column: a–z, A–Z, then
// two characters aa … ZZ, then three, and so on.
func letterLabel(n int) string {
	const alphabet = "abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ"
	const base = len(alphabet)
	width, span := 1, base
	for n >= span {
		n -= span
		width++
		span *= base
	}
	b := make([]byte, width)
	for i := width - 1; i >= 0; i-- {
		b[i] = alphabet[n%base]
		n /= base
	}
	return string(b)
}

// formatLetters joins the labels of each treatment's columns.
func formatLetters(k int, cols [][]int) []string {
	sep := ""
	if len(cols) > 52 {
		sep = " "
	}
	var sb = make([]strings.Builder, k)
	for c, col := range cols {
		l := letterLabel(c)
		for _, t := range col {
			if sb[t].Len() > 0 {
				sb[t].WriteString(sep)
			}
			sb[t].WriteString(l)
		}
	}
	out := make([]string, k)
	for t := range out {
		out[t] = sb[t].String()
	}
	return out
}
