package trial

import "math/rand/v2"

// MethodPCGFisherYatesStrataV1 names the randomisation method of split and
// strip plots, stored in Randomization.Method. Generator, bounded draws
// and shuffle are those of MethodPCGFisherYatesV1; the draw order is:
//
//   - split plot: block by block, from block 1; in each block one shuffle
//     of the main-plot factor's levels over the main plots, then for each
//     main plot in turn (main plot 1 first) one shuffle of the subplot
//     factor's levels over its subplots, and in a split-split plot, right
//     after each main plot's subplot shuffle, one shuffle of the
//     sub-subplot factor's levels over the sub-subplots of each of its
//     subplots in turn;
//   - strip plot: block by block, from block 1; in each block one shuffle
//     of the horizontal factor's levels over the horizontal strips, then
//     one of the vertical factor's levels over the vertical strips.
//
// A change to any part needs a new method name.
const MethodPCGFisherYatesStrataV1 = "pcg-fisher-yates-strata-v1"

// MethodFor returns the randomisation method Furlong uses for a design:
// MethodPCGFisherYatesStrataV1 for split and strip plots,
// MethodPCGFisherYatesV1 for the others (whose layouts it has always
// given).
func MethodFor(k DesignKind) string {
	if k == SplitPlot || k == StripPlot {
		return MethodPCGFisherYatesStrataV1
	}
	return MethodPCGFisherYatesV1
}

// randomizeStrata assigns the treatments of a split or strip plot at
// random by MethodPCGFisherYatesStrataV1. plots are in standard order,
// std[i] holding plot i's standard-order levels in design order; plots
// of a block are consecutive.
func randomizeStrata(src rand.Source, st *strata, d Design, plots []Plot, std [][3]int) {
	a, b, c := st.sizes[0], st.sizes[1], st.sizes[2]
	for start := 0; start < len(plots); start += a * b * c {
		// perm[k][x] is the level that standard level x of the k-th factor
		// in design order takes, per unit.
		mainPerm := identity(a)
		shuffle(src, mainPerm)
		var sub [][]int  // per main plot (split) or one (strip)
		var ss [][][]int // per main plot, per subplot
		if d.Kind == StripPlot {
			v := identity(b)
			shuffle(src, v)
			sub = [][]int{v}
		} else {
			sub = make([][]int, a)
			ss = make([][][]int, a)
			for m := range a {
				sub[m] = identity(b)
				shuffle(src, sub[m])
				if len(st.order) == 3 {
					ss[m] = make([][]int, b)
					for j := range b {
						ss[m][j] = identity(c)
						shuffle(src, ss[m][j])
					}
				}
			}
		}
		for i := start; i < start+a*b*c; i++ {
			lv := std[i]
			var out [3]int
			out[0] = mainPerm[lv[0]]
			if d.Kind == StripPlot {
				out[1] = sub[0][lv[1]]
			} else {
				out[1] = sub[lv[0]][lv[1]]
				if len(st.order) == 3 {
					out[2] = ss[lv[0]][lv[1]][lv[2]]
				}
			}
			plots[i].Treatment = st.code(out)
		}
	}
}
