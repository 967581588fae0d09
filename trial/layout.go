package trial

import "fmt"

// DefaultLayout returns the layout Furlong proposes for a new trial: plots
// 10 m long and 1.5 m wide, of which 8 m × 1.5 m is harvested, 1 m alleys,
// every block in one field row (range) with the blocks stacked one behind
// the other, the usual small-plot arrangement (common practice), plots
// numbered by block and walked in a serpentine.
func DefaultLayout() Layout {
	return Layout{
		PlotLength:    10,
		PlotWidth:     1.5,
		HarvestLength: 8,
		HarvestWidth:  1.5,
		Alley:         1,
		PlotsPerRow:   0,
		Blocks:        BlocksStacked,
		Numbering:     NumberByBlock,
		Walk:          WalkSerpentine,
	}
}

// withDefaults fills empty arrangement settings with DefaultLayout's.
func (l Layout) withDefaults() Layout {
	d := DefaultLayout()
	if l.Blocks == "" {
		l.Blocks = d.Blocks
	}
	if l.Numbering == "" {
		l.Numbering = d.Numbering
	}
	if l.Walk == "" {
		l.Walk = d.Walk
	}
	return l
}

// blockShape is how the plots of one design are grouped for arrangement.
type blockShape struct {
	blocks int // number of blocks
	size   int // plots per block
}

// shape returns the arrangement blocks of a design with nt treatments.
//
// A completely randomised design is arranged as a single block holding every
// plot, so all its plots have Block 1. A Latin square is arranged as nt
// blocks of nt plots, one per square row.
func shape(nt int, d Design) blockShape {
	switch d.Kind {
	case CRD:
		return blockShape{blocks: 1, size: nt * d.Reps}
	case Latin:
		return blockShape{blocks: nt, size: nt}
	default:
		return blockShape{blocks: d.Reps, size: nt}
	}
}

// numberMultiplier returns the factor a block number is multiplied by in
// by-block numbering: 100 for blocks of up to 99 plots, 1000 for up to 999
// plots, and so on (the smallest power of ten, at least 100, that is larger
// than the block size), so that plot numbers never collide.
func numberMultiplier(size int) int {
	m := 100
	for m <= size {
		m *= 10
	}
	return m
}

// LayOut returns the plots of a design in walking order, before
// randomisation: every plot has its Number, Block, Row and Column, and the
// treatments sit in standard order (block positions 1, 2, ... hold the
// treatments in list order; a completely randomised design repeats the list
// Reps times; a Latin square is the cyclic square, row r and column c holding
// treatment (r + c) mod t, counting from 0). Randomize or LayOutRandomized
// then assign the treatments at random.
//
// Arrangement. The plots of a block are set out PlotsPerRow to a field row
// (0: the whole block in one field row); a last, shorter row starts at the
// block's first column. Blocks sit side by side (block b's columns follow
// block b−1's, in the same field rows) or stacked (block b's field rows
// follow block b−1's). A completely randomised design is laid out as a single
// block: every plot has Block 1. A Latin square ignores PlotsPerRow and
// Blocks: it is a t × t grid whose field rows are the square's rows (Block =
// Row) and whose field columns are its columns.
//
// Walking order. The crew walks block by block, and within a block field row
// by field row from row 1 onwards. Straight: every row from its lowest column
// to its highest. Serpentine: even-numbered field rows are walked from the
// highest column back to the lowest, so that the crew never walks back empty.
// A plot's position in its block is its place in this walk, from 1.
//
// Numbering. NumberByBlock gives block × 100 + position (block × 1000 when a
// block holds 100 or more plots, block × 10000 from 1000 plots, and so on).
// NumberSequential gives 1, 2, 3, ... in walking order.
//
// Empty Blocks, Numbering and Walk take DefaultLayout's settings. The plot
// geometry (lengths, widths, alleys) does not affect the plots.
func LayOut(treatments []Treatment, d Design, l Layout) ([]Plot, error) {
	return LayOutPlan(nil, treatments, d, l)
}

// LayOutPlan is LayOut for a trial that may have treatment factors (see
// Trial.Factors). A factorial CRD or RCBD is laid out as a CRD or RCBD of
// the combinations. A split plot's block is its main plots side by side in
// walking order, each main plot a run of neighbouring plots holding its
// subplots side by side (and each subplot of a split-split plot a run
// holding its sub-subplots); in standard order main plot k holds level k of
// the main-plot factor and subplot j level j of the subplot factor (see
// Design.FactorOrder). PlotsPerRow must then be 0 or a multiple of the
// main-plot size, so that no main plot is broken over two field rows. A
// strip plot's block is a grid with one field row per level of the
// horizontal factor and one field column per level of the vertical factor
// (PlotsPerRow is ignored); in standard order the strip in row r of the
// block holds level r, the strip in column c level c. Every plot of a split
// or strip plot gets its MainPlot (and SubPlot or Strip).
func LayOutPlan(factors []Factor, treatments []Treatment, d Design, l Layout) ([]Plot, error) {
	plots, _, err := layOutPlan(factors, treatments, d, l)
	return plots, err
}

// layOutPlan lays out the plan and returns, for a split or strip plot, the
// standard-order level index of every plot for each factor in design order
// (Design.FactorOrder): std[i][k] is plot i's level of the k-th factor in
// that order.
func layOutPlan(factors []Factor, treatments []Treatment, d Design, l Layout) ([]Plot, [][3]int, error) {
	var p problems
	p.checkPlan(factors, treatments, d)
	p.checkArrangement(l)
	if err := p.err(); err != nil {
		return nil, nil, err
	}
	l = l.withDefaults()
	nt := len(treatments)
	s := shape(nt, d)
	st := newStrata(factors, treatments, d)

	perRow := l.PlotsPerRow
	stacked := l.Blocks == BlocksStacked
	switch d.Kind {
	case Latin:
		perRow = nt
		stacked = true
	case StripPlot:
		perRow = st.sizes[1]
	case SplitPlot:
		if m := st.mainSize(); perRow > 0 && perRow < s.size && perRow%m != 0 {
			return nil, nil, ValidationErrors{{Field: "Layout.PlotsPerRow", Msg: fmt.Sprintf(
				"in this split plot each main plot is %d plots side by side, so a field row must hold whole main plots: set the plots per row to 0 (each block in one row) or a multiple of %d", m, m)}}
		}
	}
	if perRow <= 0 || perRow > s.size {
		perRow = s.size
	}
	rowsPer := (s.size + perRow - 1) / perRow
	mult := numberMultiplier(s.size)
	serpentine := l.Walk == WalkSerpentine

	plots := make([]Plot, 0, s.blocks*s.size)
	var std [][3]int
	if st != nil {
		std = make([][3]int, 0, s.blocks*s.size)
	}
	for b := range s.blocks {
		pos := 0
		for r := range rowsPer {
			inRow := min(perRow, s.size-r*perRow)
			fieldRow, col0 := r+1, b*perRow
			if stacked {
				fieldRow, col0 = b*rowsPer+r+1, 0
			}
			reverse := serpentine && fieldRow%2 == 0
			for k := range inRow {
				c := k
				if reverse {
					c = inRow - 1 - k
				}
				pos++
				pl := Plot{Block: b + 1, Row: fieldRow, Column: col0 + c + 1}
				if l.Numbering == NumberSequential {
					pl.Number = len(plots) + 1
				} else {
					pl.Number = (b+1)*mult + pos
				}
				switch d.Kind {
				case Latin:
					pl.Treatment = treatments[(pl.Row-1+pl.Column-1)%nt].Code
				case SplitPlot:
					lv := st.splitLevels(pos - 1)
					pl.MainPlot = lv[0] + 1
					if len(st.order) == 3 {
						pl.SubPlot = lv[1] + 1
					}
					pl.Treatment = st.code(lv)
					std = append(std, lv)
				case StripPlot:
					lv := [3]int{r, c}
					pl.MainPlot, pl.Strip = r+1, c+1
					pl.Treatment = st.code(lv)
					std = append(std, lv)
				default:
					pl.Treatment = treatments[(pos-1)%nt].Code
				}
				plots = append(plots, pl)
			}
		}
	}
	return plots, std, nil
}
