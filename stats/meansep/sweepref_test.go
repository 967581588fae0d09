package meansep

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// sweepReference is the direct form of the sweeping step of Piepho (2004)
// (the implementation before the bitset bookkeeping of sweep): a k × k
// matrix of shared-column counts updated on every deletion. Tests check
// sweep against it.
func sweepReference(k int, cols []bitset) []bitset {
	sortColumns(cols)
	members := make([][]int32, len(cols))
	for c, col := range cols {
		m := make([]int32, 0, col.count())
		col.each(func(t int) { m = append(m, int32(t)) })
		members[c] = m
	}
	// shared[i*k+j]: number of columns holding both i and j.
	shared := make([]uint16, k*k)
	for _, m := range members {
		for _, i := range m {
			row := shared[int(i)*k : int(i)*k+k]
			for _, j := range m {
				row[j]++
			}
		}
	}
	stride := k
	for c, col := range cols {
		m := members[c]
		for p := 0; p < len(m); {
			i := int(m[p])
			row := shared[i*stride : i*stride+k]
			removable := row[i] >= 2
			for _, j := range m {
				if removable && int(j) != i && row[j] < 2 {
					removable = false
					break
				}
			}
			if !removable {
				p++
				continue
			}
			col.clear(i)
			m = append(m[:p], m[p+1:]...)
			row[i]--
			for _, j := range m {
				row[j]--
				shared[int(j)*stride+i]--
			}
		}
		members[c] = m
	}
	return slices.DeleteFunc(cols, func(c bitset) bool { return c.first() < 0 })
}

// TestSweepMatchesReference checks sweep against the direct matrix form
// of Piepho's (2004) sweeping step (sweepReference, above) on the columns
// of many seeded patterns: significance growing with the distance of the
// means (columns that are runs of ranks, as in real trials), the same with
// unequal standard errors, and arbitrary random patterns (columns with
// many gaps). The columns kept must be the same, in the same order.
func TestSweepMatchesReference(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(5, 9))
	for trial := range 150 {
		k := 2 + rng.IntN(80)
		sig := make([]bitset, k)
		for i := range sig {
			sig[i] = newBitset(k)
		}
		means := make([]float64, k)
		for i := range means {
			means[i] = rng.NormFloat64()
		}
		slices.SortFunc(means, func(a, b float64) int { return cmpFloat(b, a) })
		kind := trial % 3
		limit := 0.2 + rng.Float64()
		for i := range k {
			for j := i + 1; j < k; j++ {
				var s bool
				switch kind {
				case 0:
					s = means[i]-means[j] > limit
				case 1:
					s = means[i]-means[j] > limit*(0.7+0.6*rng.Float64())
				default:
					s = rng.Float64() < 0.15
				}
				if s {
					sig[i].set(j)
					sig[j].set(i)
				}
			}
		}
		if kind == 2 && k > 40 {
			k = 40 // random patterns need exponentially many columns
			for i := range sig[:k] {
				sig[i] = sig[i][:1]
				sig[i][0] &= 1<<40 - 1
			}
			sig = sig[:k]
		}
		cols, err := insertAbsorb(k, sig, MaxLetterColumns)
		if err != nil {
			continue
		}
		a := make([]bitset, len(cols))
		b := make([]bitset, len(cols))
		for i := range cols {
			a[i], b[i] = slices.Clone(cols[i]), slices.Clone(cols[i])
		}
		got, want := sweep(k, a), sweepReference(k, b)
		if len(got) != len(want) {
			t.Fatalf("pattern %d (k %d): %d columns after the sweep, reference %d", trial, k, len(got), len(want))
		}
		for c := range got {
			if !got[c].equal(want[c]) {
				t.Fatalf("pattern %d (k %d): column %d differs from the reference", trial, k, c)
			}
		}
	}
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}
