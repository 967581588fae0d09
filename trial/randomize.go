package trial

import (
	"fmt"
	"math/bits"
	"math/rand/v2"
	"time"
)

// MethodPCGFisherYatesV1 names the randomisation method of this package,
// stored in Randomization.Method:
//
//   - generator: math/rand/v2's PCG (128-bit state, DXSM output), created
//     with rand.NewPCG(seed, PCGStream);
//   - bounded draws: Lemire's multiply-and-reject method on the generator's
//     64-bit outputs (see uniformN);
//   - permutations: the Fisher–Yates shuffle (Knuth's Algorithm P) from the
//     last element down (see shuffle);
//   - draw order: CRD one shuffle of all plots; RCBD one shuffle per block,
//     block 1 first; Latin square a shuffle of the rows, then of the
//     columns, then of the treatment labels.
//
// All of it is written out in this package rather than taken from
// rand.Shuffle or rand.Perm, whose algorithms the Go project may change, so
// that a seed gives the same layout in every future version. A change to any
// part needs a new method name.
const MethodPCGFisherYatesV1 = "pcg-fisher-yates-v1"

// PCGStream is the fixed second seed word given to rand.NewPCG, part of
// MethodPCGFisherYatesV1 (the bytes of "furlong!").
const PCGStream uint64 = 0x6675726c6f6e6721

// MaxSeed is the largest seed NewSeed proposes; any uint64 is a valid seed.
const MaxSeed = 999_999_999

// NewSeed returns a fresh random seed between 1 and MaxSeed, short enough to
// write in a field book.
func NewSeed() uint64 { return 1 + rand.Uint64N(MaxSeed) }

// uniformN returns a uniformly distributed integer in [0, n) drawn from src,
// by Lemire's method (D. Lemire, "Fast random integer generation in an
// interval", ACM Trans. Model. Comput. Simul. 29(1), 2019): the 128-bit
// product x·n of a 64-bit draw x and n is split into high and low words; the
// high word is the result unless the low word falls below 2⁶⁴ mod n, in which
// case the draw is rejected and repeated. n must be positive.
func uniformN(src rand.Source, n uint64) uint64 {
	if n == 0 {
		panic("trial: uniformN with n = 0")
	}
	hi, lo := bits.Mul64(src.Uint64(), n)
	if lo < n {
		thresh := -n % n // 2⁶⁴ mod n
		for lo < thresh {
			hi, lo = bits.Mul64(src.Uint64(), n)
		}
	}
	return hi
}

// shuffle permutes a in place uniformly at random by the Fisher–Yates
// shuffle: for i from len(a)−1 down to 1, swap a[i] with a[j], j drawn
// uniformly from [0, i].
func shuffle(src rand.Source, a []int) {
	for i := len(a) - 1; i > 0; i-- {
		j := uniformN(src, uint64(i+1))
		a[i], a[j] = a[j], a[i]
	}
}

// identity returns 0, 1, ..., n−1.
func identity(n int) []int {
	a := make([]int, n)
	for i := range a {
		a[i] = i
	}
	return a
}

// LayOutRandomized lays out a design (see LayOut) and assigns the treatments
// to the plots at random by MethodPCGFisherYatesV1 from seed:
//
//   - completely randomised design: the Reps copies of every treatment are
//     shuffled over all plots;
//   - randomised complete block design: each block gets its own independent
//     random order of the treatments;
//   - Latin square: the cyclic square is taken, and its rows, its columns
//     and its treatment labels are permuted at random. Every cell is then
//     equally likely to hold any treatment, and every row and column holds
//     each treatment once; for 5 or more treatments not every Latin square
//     can come out (only those that are row, column and symbol permutations
//     of the cyclic square), which does not bias treatment comparisons.
//
// The same treatments, design, layout and seed always give the same plots.
func LayOutRandomized(treatments []Treatment, d Design, l Layout, seed uint64) ([]Plot, error) {
	return LayOutPlanRandomized(nil, treatments, d, l, seed)
}

// LayOutPlanRandomized is LayOutRandomized for a trial that may have
// treatment factors (see LayOutPlan). A factorial CRD or RCBD is
// randomised as a CRD or RCBD of the combinations, by
// MethodPCGFisherYatesV1. Split and strip plots are randomised by
// MethodPCGFisherYatesStrataV1 (see there).
func LayOutPlanRandomized(factors []Factor, treatments []Treatment, d Design, l Layout, seed uint64) ([]Plot, error) {
	plots, std, err := layOutPlan(factors, treatments, d, l)
	if err != nil {
		return nil, err
	}
	src := rand.NewPCG(seed, PCGStream)
	if d.Kind == SplitPlot || d.Kind == StripPlot {
		randomizeStrata(src, newStrata(factors, treatments, d), d, plots, std)
		return plots, nil
	}
	nt := len(treatments)
	switch d.Kind {
	case CRD:
		a := make([]int, len(plots))
		for i := range a {
			a[i] = i % nt
		}
		shuffle(src, a)
		for i := range plots {
			plots[i].Treatment = treatments[a[i]].Code
		}
	case RCBD:
		a := make([]int, nt)
		for b := 0; b < len(plots); b += nt {
			for i := range a {
				a[i] = i
			}
			shuffle(src, a)
			for i := range nt {
				plots[b+i].Treatment = treatments[a[i]].Code
			}
		}
	case Latin:
		rows, cols, syms := identity(nt), identity(nt), identity(nt)
		shuffle(src, rows)
		shuffle(src, cols)
		shuffle(src, syms)
		for i := range plots {
			r, c := rows[plots[i].Row-1], cols[plots[i].Column-1]
			plots[i].Treatment = treatments[syms[(r+c)%nt]].Code
		}
	default:
		panic(fmt.Sprintf("trial: LayOutRandomized reached design %q after validation", d.Kind))
	}
	return plots, nil
}

// Randomize lays the trial out afresh from its treatments, design and layout
// and randomises it from seed (see LayOutRandomized), recording the seed,
// the method and the current time in t.Random. It is RandomizeAt with
// time.Now().
func (t *Trial) Randomize(seed uint64) error { return t.RandomizeAt(seed, time.Now()) }

// RandomizeAt is Randomize with the time of randomisation given.
//
// A trial that already holds a recorded value is refused with ErrHasData.
// Otherwise the plots are replaced, so plot notes and exclusions are
// dropped, and every recorded trait gets one missing value per plot.
func (t *Trial) RandomizeAt(seed uint64, now time.Time) error {
	if t.HasData() {
		return ErrHasData
	}
	plots, err := LayOutPlanRandomized(t.Factors, t.Treatments, t.Design, t.Layout, seed)
	if err != nil {
		return err
	}
	t.setPlots(plots)
	t.Random = Randomization{Seed: seed, Method: MethodFor(t.Design.Kind), Done: now}
	t.Modified = now
	return nil
}

// Randomized reports whether the trial has been randomised.
func (t *Trial) Randomized() bool { return !t.Random.Done.IsZero() }

// setPlots replaces the plots and gives every recorded trait a fresh column
// of missing values.
func (t *Trial) setPlots(plots []Plot) {
	t.Plots = plots
	for j := range t.Traits {
		if t.Traits[j].Derived != nil {
			t.Traits[j].Values = nil
			continue
		}
		t.Traits[j].Values = missingValues(len(plots))
	}
}

// missingValues returns n missing values.
func missingValues(n int) []float64 {
	v := make([]float64, n)
	for i := range v {
		v[i] = Missing
	}
	return v
}

// CheckRandomization reproduces the layout from the trial's recorded seed
// and method and reports whether the stored plots match it (same numbers,
// blocks, positions and treatments, in the same order). It returns
// ErrNotRandomized for a trial never randomised, ErrUnknownMethod for a
// method this version cannot reproduce, a *ValidationError list when the
// trial's design cannot be laid out, and an error wrapping ErrLayoutMismatch
// when the plots differ.
func (t *Trial) CheckRandomization() error {
	if !t.Randomized() {
		return ErrNotRandomized
	}
	if t.Random.Method != MethodFor(t.Design.Kind) {
		return ErrUnknownMethod
	}
	want, err := LayOutPlanRandomized(t.Factors, t.Treatments, t.Design, t.Layout, t.Random.Seed)
	if err != nil {
		return err
	}
	if len(want) != len(t.Plots) {
		return fmt.Errorf("%w: it gives %d plots, the trial has %d", ErrLayoutMismatch, len(want), len(t.Plots))
	}
	for i, w := range want {
		g := t.Plots[i]
		if g.Number != w.Number || g.Block != w.Block || g.Row != w.Row || g.Column != w.Column || g.Treatment != w.Treatment ||
			g.MainPlot != w.MainPlot || g.SubPlot != w.SubPlot || g.Strip != w.Strip {
			return fmt.Errorf("%w: the first difference is at plot %d (position %d in walking order)", ErrLayoutMismatch, g.Number, i+1)
		}
	}
	return nil
}
