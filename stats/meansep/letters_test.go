package meansep

import (
	"errors"
	"math/bits"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"
)

// checkDisplay verifies the defining property of a letter display (Piepho
// 2004, section 2): treatments i and j share a column exactly when sig(i,
// j) is false; every treatment has a letter; and after sweeping no letter
// can be removed without breaking that property (so no column is
// redundant either).
func checkDisplay(t *testing.T, k int, sig func(i, j int) bool, cols [][]int) {
	t.Helper()
	in := make([][]bool, len(cols))
	for c, col := range cols {
		in[c] = make([]bool, k)
		if len(col) == 0 {
			t.Fatalf("column %d empty", c)
		}
		for _, i := range col {
			in[c][i] = true
		}
	}
	count := make([][]int, k)
	for i := range count {
		count[i] = make([]int, k)
	}
	for _, col := range cols {
		for _, i := range col {
			for _, j := range col {
				count[i][j]++
			}
		}
	}
	shared := func(i, j int) int { return count[i][j] }
	for i := range k {
		if shared(i, i) == 0 {
			t.Fatalf("treatment %d has no letter", i)
		}
		for j := i + 1; j < k; j++ {
			if (shared(i, j) > 0) == sig(i, j) {
				t.Fatalf("pair %d,%d: significant %v but shares %d letters", i, j, sig(i, j), shared(i, j))
			}
		}
	}
	for c, col := range cols {
		for _, i := range col {
			needed := shared(i, i) == 1
			for _, j := range col {
				if j != i && shared(i, j) == 1 {
					needed = true
				}
			}
			if !needed {
				t.Fatalf("letter %s of treatment %d is redundant", letterLabel(c), i)
			}
		}
	}
}

// maximalCliques enumerates the maximal sets of mutually non-significant
// treatments (k ≤ 64) by the Bron–Kerbosch algorithm with pivoting (Bron &
// Kerbosch 1973, Commun. ACM 16, 575–577; pivot rule of Tomita, Tanaka &
// Takahashi 2006, Theor. Comput. Sci. 363, 28–42), independently of the
// package. Insert-and-absorb yields exactly these sets: each column is a
// set without significant pairs, and absorption keeps only maximal ones.
func maximalCliques(k int, sig func(i, j int) bool) [][]int {
	adj := make([]uint64, k)
	for i := range k {
		for j := i + 1; j < k; j++ {
			if !sig(i, j) {
				adj[i] |= 1 << j
				adj[j] |= 1 << i
			}
		}
	}
	var out [][]int
	var bk func(r, p, x uint64)
	bk = func(r, p, x uint64) {
		if p == 0 && x == 0 {
			var c []int
			for v := range k {
				if r>>v&1 == 1 {
					c = append(c, v)
				}
			}
			out = append(out, c)
			return
		}
		pivot, best := -1, -1
		for u := range k {
			if (p|x)>>u&1 == 1 {
				if n := bits.OnesCount64(p & adj[u]); n > best {
					pivot, best = u, n
				}
			}
		}
		cand := p &^ adj[pivot]
		for v := range k {
			if cand>>v&1 == 0 {
				continue
			}
			bk(r|1<<v, p&adj[v], x&adj[v])
			p &^= 1 << v
			x |= 1 << v
		}
	}
	bk(0, 1<<k-1, 0)
	return out
}

func sortedSets(s [][]int) []string {
	var out []string
	for _, c := range s {
		var b strings.Builder
		for _, v := range c {
			b.WriteString(string(rune('A' + v)))
		}
		out = append(out, b.String())
	}
	slices.Sort(out)
	return out
}

func sigBits(k int, sig func(i, j int) bool) []bitset {
	sigSet := make([]bitset, k)
	for i := range sigSet {
		sigSet[i] = newBitset(k)
	}
	for i := range k {
		for j := i + 1; j < k; j++ {
			if sig(i, j) {
				sigSet[i].set(j)
				sigSet[j].set(i)
			}
		}
	}
	return sigSet
}

func preSweep(t *testing.T, means []float64, sig func(i, j int) bool) [][]int {
	k := len(means)
	cols, err := insertAbsorb(k, sigBits(k, sig), MaxLetterColumns)
	if err != nil {
		t.Fatal(err)
	}
	var out [][]int
	for _, c := range cols {
		var s []int
		c.each(func(i int) { s = append(s, i) })
		out = append(out, s)
	}
	return out
}

type pattern struct {
	means []float64
	sig   func(i, j int) bool
}

func randomSymmetric(rng *rand.Rand, k int, p float64) pattern {
	m := make([][]bool, k)
	for i := range m {
		m[i] = make([]bool, k)
		for j := i + 1; j < k; j++ {
			m[i][j] = rng.Float64() < p
		}
	}
	means := make([]float64, k)
	for i := range means {
		means[i] = rng.NormFloat64()
	}
	return pattern{means, func(i, j int) bool { return m[i][j] }}
}

func randomThreshold(rng *rand.Rand, k int) pattern {
	means := make([]float64, k)
	for i := range means {
		means[i] = rng.NormFloat64()
		if rng.IntN(8) == 0 && i > 0 { // some ties
			means[i] = means[rng.IntN(i)]
		}
	}
	d := 0.1 + 2*rng.Float64()
	return pattern{means, func(i, j int) bool { return means[i]-means[j] > d || means[j]-means[i] > d }}
}

// Thousands of random patterns, k from 2 to 40: random symmetric
// significance (any pattern is allowed) and significance from a threshold
// on random means (property test: Piepho 2004, section 2, and the maximal
// cliques of Bron & Kerbosch 1973). (Sparser random significance, below about 10% of
// pairs at k = 40, has of the order of 10⁴ maximal sets and is covered by
// TestLettersPathological.) The display must have the exact property, no redundant
// letter, and (every other pattern of each kind) its insert-and-absorb columns must be the
// maximal cliques found by Bron–Kerbosch.
func TestLettersRandom(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(1, 2))
	n := 2000
	if testing.Short() {
		n = 400
	}
	for it := range n {
		k := 2 + rng.IntN(39)
		var p pattern
		if it%2 == 0 {
			p = randomSymmetric(rng, k, []float64{0.15, 0.3, 0.5, 0.7, 0.95}[rng.IntN(5)])
		} else {
			p = randomThreshold(rng, k)
		}
		cols, err := letterColumns(p.means, p.sig, LetterOptions{LowerIsBetter: it%3 == 0})
		if err != nil {
			t.Fatalf("k=%d: %v", k, err)
		}
		checkDisplay(t, k, p.sig, cols)
		if it%4 < 2 {
			continue
		}
		got, want := sortedSets(preSweep(t, p.means, p.sig)), sortedSets(maximalCliques(k, p.sig))
		if !slices.Equal(got, want) {
			t.Fatalf("k=%d: insert-and-absorb %v, maximal cliques %v", k, got, want)
		}
	}
}

// Hand-worked example (constructed for this test): five treatments, means
// 10 > 9 > 8 > 7 > 6 (level order shuffled), significant when the means
// differ by more than 2.5, i.e. the pairs (10,7), (10,6), (9,6). Maximal
// non-significant sets: {10,9,8} = a, {9,8,7} = b, {8,7,6} = c. Sweeping
// column b from the top: 9 is needed there (9–7 meet only in b), 8 is not
// (8–9 also meet in a, 8–7 in c), 7 is needed (7–9). So the display is
// 10: a, 9: ab, 8: ac, 7: bc, 6: c.
func TestLettersHand(t *testing.T) {
	t.Parallel()
	means := []float64{8, 6, 10, 7, 9}
	sig := func(i, j int) bool { d := means[i] - means[j]; return d > 2.5 || d < -2.5 }
	got, err := Letters(means, sig, LetterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"ac", "c", "a", "bc", "ab"}
	if !slices.Equal(got, want) {
		t.Errorf("got %q, want %q", got, want)
	}
	// Lower is better: the lowest mean (6) gets a.
	got, _ = Letters(means, sig, LetterOptions{LowerIsBetter: true})
	want = []string{"ac", "a", "c", "ab", "bc"}
	if !slices.Equal(got, want) {
		t.Errorf("lower is better: got %q, want %q", got, want)
	}
	// Sweeping: with A–B, B–C, A–C not significant and C–D, A–D not
	// significant but B–D significant, the maximal sets are {A,B,C} and
	// {A,C,D}. Both are needed (B and D each have one letter). Now add a
	// treatment E not significant with A, B and D only: maximal sets
	// {A,B,C}, {A,C,D}, {A,B,E}, {A,D,E}; the pair A–B is covered twice,
	// A–D twice, A–C twice, so sweeping removes A from some column while
	// keeping the display valid.
	names := "ABCDE"
	ns := map[string]bool{"AB": true, "BC": true, "AC": true, "CD": true, "AD": true, "AE": true, "BE": true, "DE": true}
	sig2 := func(i, j int) bool { return !ns[string(names[i])+string(names[j])] }
	cols, err := letterColumns([]float64{5, 4, 3, 2, 1}, sig2, LetterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	checkDisplay(t, 5, sig2, cols)
	var letters int
	for _, c := range cols {
		letters += len(c)
	}
	if letters >= 12 {
		t.Errorf("sweeping left all %d letters of the 4 maximal sets: %v", letters, cols)
	}
}

// TestLetterLabels: letters run a–z (common practice for mean-separation
// letters), then A–Z and then two-letter labels; that continuation beyond 26
// is the package's own documented scheme, not an outside fact.
func TestLetterLabels(t *testing.T) {
	t.Parallel()
	for n, want := range map[int]string{0: "a", 25: "z", 26: "A", 51: "Z", 52: "aa", 53: "ab", 103: "aZ", 104: "ba", 52 + 52*52 - 1: "ZZ", 52 + 52*52: "aaa"} {
		if got := letterLabel(n); got != want {
			t.Errorf("label %d = %q, want %q", n, got, want)
		}
	}
	// 60 treatments all significantly different: 60 singleton letters, so
	// two-character letters appear; every treatment has exactly its own.
	means := make([]float64, 60)
	for i := range means {
		means[i] = float64(-i)
	}
	all := func(i, j int) bool { return true }
	got, err := Letters(means, all, LetterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if got[0] != "a" || got[51] != "Z" || got[52] != "aa" || got[59] != "ah" {
		t.Errorf("letters %q", got)
	}
	// Two multi-character letters for one treatment are space separated.
	k := 60
	means = make([]float64, k)
	for i := range means {
		means[i] = float64(-i)
	}
	// Treatment 59 (last letters) is not significant with 57 and 58 only;
	// all others pairwise significant.
	sig := func(i, j int) bool { return !(j == 59 && (i == 57 || i == 58)) }
	got, err = Letters(means, sig, LetterOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if got[59] != "af ag" {
		t.Errorf("treatment 59: %q, want \"af ag\"", got[59])
	}
}

// The complement of a perfect matching on 2m treatments (only the pairs
// (i, i+m) significant) has 2^m maximal non-significant sets, all needed
// (Moon & Moser 1965, Israel J. Math. 3, 23–28: the extreme case for the
// number of maximal cliques). With m = 15 that is beyond MaxLetterColumns
// and must be refused (also checked on m = 11 with a limit of 2000, so the
// check stays fast); with m = 8 insert-and-absorb gives the 256 sets and
// sweeping leaves a valid display with far fewer letters.
func TestLettersPathological(t *testing.T) {
	t.Parallel()
	if !testing.Short() {
		means := make([]float64, 30)
		if _, err := Letters(means, func(i, j int) bool { return j == i+15 }, LetterOptions{}); !errors.Is(err, ErrTooManyLetters) {
			t.Errorf("m=15: err = %v, want ErrTooManyLetters", err)
		}
	}
	for _, m := range []int{8, 11} {
		means := make([]float64, 2*m)
		sig := func(i, j int) bool { return j == i+m }
		if m == 11 {
			// 2048 maximal sets: beyond a limit of 2000.
			if _, err := insertAbsorb(2*m, sigBits(2*m, sig), 2000); !errors.Is(err, ErrTooManyLetters) {
				t.Errorf("m=11, limit 2000: err = %v, want ErrTooManyLetters", err)
			}
			continue
		}
		cols, err := letterColumns(means, sig, LetterOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if n := len(preSweep(t, means, sig)); n != 256 {
			t.Errorf("m=8: %d maximal sets, want 256", n)
		}
		if len(cols) >= 256 {
			t.Errorf("m=8: sweeping kept all %d letters", len(cols))
		}
		checkDisplay(t, 2*m, sig, cols)
	}
}

// TestLettersEdge: one treatment, no differences and a NaN mean (common
// practice: a lone mean or equal means all get "a").
func TestLettersEdge(t *testing.T) {
	t.Parallel()
	got, err := Letters([]float64{3}, func(i, j int) bool { return true }, LetterOptions{})
	if err != nil || !slices.Equal(got, []string{"a"}) {
		t.Errorf("one treatment: %q %v", got, err)
	}
	got, err = Letters([]float64{1, 2, 3}, func(i, j int) bool { return false }, LetterOptions{})
	if err != nil || !slices.Equal(got, []string{"a", "a", "a"}) {
		t.Errorf("no differences: %q %v", got, err)
	}
	if _, err := Letters([]float64{1, nanValue()}, func(i, j int) bool { return false }, LetterOptions{}); !errors.Is(err, ErrBadMean) {
		t.Errorf("NaN mean: %v", err)
	}
}

// realistic is a trial-like pattern: k means ~ N(0, 1) and a fixed LSD.
func realistic(k int, lsd float64) pattern {
	rng := rand.New(rand.NewPCG(uint64(k), 7))
	means := make([]float64, k)
	for i := range means {
		means[i] = rng.NormFloat64()
	}
	return pattern{means, func(i, j int) bool { d := means[i] - means[j]; return d > lsd || d < -lsd }}
}

// TestLettersRealistic is a property test on 300 random means: the display
// must have the defining property of Piepho (2004), checked by checkDisplay.
func TestLettersRealistic(t *testing.T) {
	t.Parallel()
	for _, lsd := range []float64{0.2, 0.5, 1} {
		p := realistic(300, lsd)
		cols, err := letterColumns(p.means, p.sig, LetterOptions{})
		if err != nil {
			t.Fatal(err)
		}
		checkDisplay(t, 300, p.sig, cols)
	}
}

func BenchmarkLetters300(b *testing.B) {
	p := realistic(300, 0.5)
	for b.Loop() {
		if _, err := Letters(p.means, p.sig, LetterOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkLetters1000(b *testing.B) {
	p := realistic(1000, 0.5)
	for b.Loop() {
		if _, err := Letters(p.means, p.sig, LetterOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}
