package trial

import (
	"fmt"
	"testing"
)

// treatments returns n treatments coded T01, T02, ...
func treatments(n int) []Treatment {
	ts := make([]Treatment, n)
	for i := range ts {
		ts[i] = Treatment{Code: fmt.Sprintf("T%02d", i+1), Name: fmt.Sprintf("Entry %d", i+1)}
	}
	return ts
}

// lettered returns treatments coded A, B, C, ...
func lettered(n int) []Treatment {
	ts := make([]Treatment, n)
	for i := range ts {
		ts[i] = Treatment{Code: string(rune('A' + i))}
	}
	return ts
}

type wantPlot struct {
	num, block, row, col int
	trt                  string
}

func checkPlots(t *testing.T, got []Plot, want []wantPlot) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("got %d plots, want %d", len(got), len(want))
	}
	for i, w := range want {
		g := got[i]
		if g.Number != w.num || g.Block != w.block || g.Row != w.row || g.Column != w.col || (w.trt != "" && g.Treatment != w.trt) {
			t.Errorf("plot %d in walking order = {num %d, block %d, row %d, col %d, %s}, want {num %d, block %d, row %d, col %d, %s}",
				i+1, g.Number, g.Block, g.Row, g.Column, g.Treatment, w.num, w.block, w.row, w.col, w.trt)
		}
	}
}

// The expected layouts in these tests are drawn by hand from the rules
// written in LayOut's documentation (plot numbering block × 100 + position
// is the usual field-book convention, common practice).
func TestLayOutStackedSerpentine(t *testing.T) {
	t.Parallel()
	// RCBD, 5 treatments, 2 blocks, 3 plots per field row, stacked,
	// serpentine, numbered by block. Seen from above, row 1 at the front:
	//
	//	row 4:  205 E  204 D            ← walked right to left
	//	row 3:  201 A  202 B  203 C     → left to right
	//	row 2:  105 E  104 D            ← right to left
	//	row 1:  101 A  102 B  103 C     → left to right
	l := DefaultLayout()
	l.PlotsPerRow = 3
	l.Blocks = BlocksStacked
	got, err := LayOut(lettered(5), Design{Kind: RCBD, Reps: 2}, l)
	if err != nil {
		t.Fatal(err)
	}
	checkPlots(t, got, []wantPlot{
		{101, 1, 1, 1, "A"}, {102, 1, 1, 2, "B"}, {103, 1, 1, 3, "C"}, {104, 1, 2, 2, "D"}, {105, 1, 2, 1, "E"},
		{201, 2, 3, 1, "A"}, {202, 2, 3, 2, "B"}, {203, 2, 3, 3, "C"}, {204, 2, 4, 2, "D"}, {205, 2, 4, 1, "E"},
	})
}

func TestLayOutSideBySideSequential(t *testing.T) {
	t.Parallel()
	// RCBD, 4 treatments, 3 blocks side by side, 2 plots per field row,
	// serpentine, sequential numbers:
	//
	//	row 2:  4  3 |  8  7 | 12 11
	//	row 1:  1  2 |  5  6 |  9 10
	//	       block 1 block 2 block 3
	l := DefaultLayout()
	l.PlotsPerRow = 2
	l.Blocks = BlocksSideBySide
	l.Numbering = NumberSequential
	got, err := LayOut(lettered(4), Design{Kind: RCBD, Reps: 3}, l)
	if err != nil {
		t.Fatal(err)
	}
	checkPlots(t, got, []wantPlot{
		{1, 1, 1, 1, "A"}, {2, 1, 1, 2, "B"}, {3, 1, 2, 2, "C"}, {4, 1, 2, 1, "D"},
		{5, 2, 1, 3, "A"}, {6, 2, 1, 4, "B"}, {7, 2, 2, 4, "C"}, {8, 2, 2, 3, "D"},
		{9, 3, 1, 5, "A"}, {10, 3, 1, 6, "B"}, {11, 3, 2, 6, "C"}, {12, 3, 2, 5, "D"},
	})
}

func TestLayOutOneRowPerBlock(t *testing.T) {
	t.Parallel()
	ts := lettered(3)
	d := Design{Kind: RCBD, Reps: 3}

	// Stacked, straight: every block in its own field row, walked left to right.
	l := DefaultLayout()
	l.Blocks = BlocksStacked
	l.Walk = WalkStraight
	got, err := LayOut(ts, d, l)
	if err != nil {
		t.Fatal(err)
	}
	checkPlots(t, got, []wantPlot{
		{101, 1, 1, 1, "A"}, {102, 1, 1, 2, "B"}, {103, 1, 1, 3, "C"},
		{201, 2, 2, 1, "A"}, {202, 2, 2, 2, "B"}, {203, 2, 2, 3, "C"},
		{301, 3, 3, 1, "A"}, {302, 3, 3, 2, "B"}, {303, 3, 3, 3, "C"},
	})

	// Stacked, serpentine: block 2's row is walked backwards.
	l.Walk = WalkSerpentine
	got, err = LayOut(ts, d, l)
	if err != nil {
		t.Fatal(err)
	}
	checkPlots(t, got, []wantPlot{
		{101, 1, 1, 1, "A"}, {102, 1, 1, 2, "B"}, {103, 1, 1, 3, "C"},
		{201, 2, 2, 3, "A"}, {202, 2, 2, 2, "B"}, {203, 2, 2, 1, "C"},
		{301, 3, 3, 1, "A"}, {302, 3, 3, 2, "B"}, {303, 3, 3, 3, "C"},
	})

	// Default: each block in one field row, blocks stacked, serpentine.
	got, err = LayOut(ts, d, DefaultLayout())
	if err != nil {
		t.Fatal(err)
	}
	checkPlots(t, got, []wantPlot{
		{101, 1, 1, 1, "A"}, {102, 1, 1, 2, "B"}, {103, 1, 1, 3, "C"},
		{201, 2, 2, 3, "A"}, {202, 2, 2, 2, "B"}, {203, 2, 2, 1, "C"},
		{301, 3, 3, 1, "A"}, {302, 3, 3, 2, "B"}, {303, 3, 3, 3, "C"},
	})

	// Empty arrangement settings take the defaults.
	bare := Layout{PlotLength: 5, PlotWidth: 2}
	got2, err := LayOut(ts, d, bare)
	if err != nil {
		t.Fatal(err)
	}
	checkPlots(t, got2, []wantPlot{
		{101, 1, 1, 1, "A"}, {102, 1, 1, 2, "B"}, {103, 1, 1, 3, "C"},
		{201, 2, 2, 3, "A"}, {202, 2, 2, 2, "B"}, {203, 2, 2, 1, "C"},
		{301, 3, 3, 1, "A"}, {302, 3, 3, 2, "B"}, {303, 3, 3, 3, "C"},
	})
}

func TestLayOutCRD(t *testing.T) {
	t.Parallel()
	// CRD, 3 treatments × 3 replicates, 4 plots per field row: one block.
	//
	//	row 3:  109
	//	row 2:  108 107 106 105
	//	row 1:  101 102 103 104
	l := DefaultLayout()
	l.PlotsPerRow = 4
	got, err := LayOut(lettered(3), Design{Kind: CRD, Reps: 3}, l)
	if err != nil {
		t.Fatal(err)
	}
	checkPlots(t, got, []wantPlot{
		{101, 1, 1, 1, "A"}, {102, 1, 1, 2, "B"}, {103, 1, 1, 3, "C"}, {104, 1, 1, 4, "A"},
		{105, 1, 2, 4, "B"}, {106, 1, 2, 3, "C"}, {107, 1, 2, 2, "A"}, {108, 1, 2, 1, "B"},
		{109, 1, 3, 1, "C"},
	})
}

func TestLayOutLatin(t *testing.T) {
	t.Parallel()
	// 3 × 3 Latin square, serpentine; Block is the square row. Before
	// randomisation it is the cyclic square:
	//
	//	row 3:  C A B
	//	row 2:  B C A   (walked right to left)
	//	row 1:  A B C
	l := DefaultLayout()
	l.PlotsPerRow = 2 // ignored for a Latin square
	l.Blocks = BlocksSideBySide
	got, err := LayOut(lettered(3), Design{Kind: Latin, Reps: 3}, l)
	if err != nil {
		t.Fatal(err)
	}
	checkPlots(t, got, []wantPlot{
		{101, 1, 1, 1, "A"}, {102, 1, 1, 2, "B"}, {103, 1, 1, 3, "C"},
		{201, 2, 2, 3, "A"}, {202, 2, 2, 2, "C"}, {203, 2, 2, 1, "B"},
		{301, 3, 3, 1, "C"}, {302, 3, 3, 2, "A"}, {303, 3, 3, 3, "B"},
	})
}

func TestNumberMultiplier(t *testing.T) {
	t.Parallel()
	// block × 100 + position, block × 1000 from 100 plots per block (the rule
	// given in the Numbering documentation), and so on.
	for _, c := range []struct{ size, want int }{
		{1, 100}, {24, 100}, {99, 100}, {100, 1000}, {999, 1000}, {1000, 10000}, {24000, 100000},
	} {
		if got := numberMultiplier(c.size); got != c.want {
			t.Errorf("numberMultiplier(%d) = %d, want %d", c.size, got, c.want)
		}
	}
	for _, c := range []struct {
		nt              int
		first, last, b2 int
	}{
		{99, 101, 199, 201},
		{100, 1001, 1100, 2001},
	} {
		got, err := LayOut(treatments(c.nt), Design{Kind: RCBD, Reps: 2}, DefaultLayout())
		if err != nil {
			t.Fatal(err)
		}
		if got[0].Number != c.first || got[c.nt-1].Number != c.last || got[c.nt].Number != c.b2 {
			t.Errorf("%d treatments: numbers %d, %d, %d; want %d, %d, %d", c.nt,
				got[0].Number, got[c.nt-1].Number, got[c.nt].Number, c.first, c.last, c.b2)
		}
	}
}

func TestLayOutRefusesInvalid(t *testing.T) {
	t.Parallel()
	if _, err := LayOut(lettered(1), Design{Kind: RCBD, Reps: 3}, DefaultLayout()); err == nil {
		t.Error("one treatment: no error")
	}
	l := DefaultLayout()
	l.Walk = "zigzag"
	if _, err := LayOut(lettered(3), Design{Kind: RCBD, Reps: 3}, l); err == nil {
		t.Error("unknown walk: no error")
	}
}
