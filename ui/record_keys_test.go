package ui

import (
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"
)

// cellCentre is the centre of a grid cell in the table's coordinates,
// from the column widths and the row height the grid sets (the table puts
// a padding between cells and below its header row).
func cellCentre(r *recordStep, row, col int) fyne.Position {
	pad := theme.Padding()
	x := float32(0)
	for c := 0; c < col; c++ {
		x += r.colWidthAt(c) + pad
	}
	x += r.colWidthAt(col) / 2
	head := r.table.CreateHeader().MinSize().Height
	cell := newGridCell().MinSize().Height
	y := head + pad + float32(row)*(cell+pad) + cell/2
	return fyne.NewPos(x, y)
}

// click taps the grid at a cell, as the mouse does, and checks that the
// tap landed on that cell.
func click(t *testing.T, r *recordStep, row, col int) {
	t.Helper()
	test.TapAt(r.table, cellCentre(r, row, col))
	if !r.hasSel || r.sel.Row != row || r.sel.Col != col {
		t.Fatalf("click on row %d col %d selected row %d col %d", row, col, r.sel.Row, r.sel.Col)
	}
}

// keys sends text and keys to whatever holds the keyboard focus, as the
// window's driver does; "\n" is Enter, "↓" and "↑" the arrow keys, "⇥"
// Tab (which moves the focus on as the driver does).
func keys(t *testing.T, w fyne.Window, s string) {
	t.Helper()
	for _, c := range s {
		f := w.Canvas().Focused()
		if f == nil {
			t.Fatalf("nothing holds the keyboard focus when %q is typed", c)
		}
		switch c {
		case '\n':
			f.TypedKey(&fyne.KeyEvent{Name: fyne.KeyReturn})
		case '↓':
			f.TypedKey(&fyne.KeyEvent{Name: fyne.KeyDown})
		case '↑':
			f.TypedKey(&fyne.KeyEvent{Name: fyne.KeyUp})
		default:
			f.TypedRune(c)
		}
	}
}

// Every character typed into the grid is kept, whatever came before it:
// the lost first keystroke of issue 12 (a cell holding a value is
// selected, an empty one is clicked, "78" typed and Enter pressed stored
// 8). Expected values are what was typed (common practice: a data-entry
// grid stores exactly the keys pressed).
func TestRecordKeepsEveryKeystroke(t *testing.T) {
	const yld = fixedCols // the yield column of smallTrial
	type step func(t *testing.T, u *App, r *recordStep, w fyne.Window)
	clickAt := func(row int) step {
		return func(t *testing.T, _ *App, r *recordStep, _ fyne.Window) { click(t, r, row, yld) }
	}
	typeKeys := func(s string) step {
		return func(t *testing.T, _ *App, _ *recordStep, w fyne.Window) { keys(t, w, s) }
	}
	cases := []struct {
		name  string
		steps []step
		want  map[int]float64 // row → stored yield
	}{
		{"value cell, then empty cell, 78", []step{clickAt(0), clickAt(1), typeKeys("78\n")}, map[int]float64{0: 5.5, 1: 78}},
		{"value cell, then empty cell, 71", []step{clickAt(0), clickAt(1), typeKeys("71\n")}, map[int]float64{1: 71}},
		{"value cell, then empty cell, 83", []step{clickAt(0), clickAt(1), typeKeys("83\n")}, map[int]float64{1: 83}},
		{"typing right after a click on a value replaces it", []step{clickAt(0), typeKeys("78\n")}, map[int]float64{0: 78}},
		{"empty cell first", []step{clickAt(2), typeKeys("7.25\n")}, map[int]float64{2: 7.25}},
		{"clicks back and forth", []step{clickAt(0), clickAt(2), clickAt(0), clickAt(1), clickAt(1), typeKeys("78\n")}, map[int]float64{0: 5.5, 1: 78}},
		{"Enter moves on, typing goes on", []step{clickAt(1), typeKeys("71\n83\n")}, map[int]float64{1: 71, 2: 83}},
		{"arrow keys move, typing goes on", []step{clickAt(0), typeKeys("↓78\n↑↑9\n")}, map[int]float64{0: 9, 1: 78}},
		{"arrow down from a typed value stores it", []step{clickAt(1), typeKeys("78↓83\n")}, map[int]float64{1: 78, 2: 83}},
		{"a click elsewhere keeps what was typed", []step{clickAt(1), typeKeys("78"), clickAt(2), typeKeys("83\n")}, map[int]float64{1: 78, 2: 83}},
		{"the grid itself holds the focus", []step{clickAt(0), clickAt(1), func(t *testing.T, _ *App, r *recordStep, w fyne.Window) {
			w.Canvas().Focus(r.table)
		}, typeKeys("78\n")}, map[int]float64{1: 78}},
		{"a second click on the same cell", []step{clickAt(0), typeKeys("7"), clickAt(0), typeKeys("8\n")}, map[int]float64{0: 78}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			u, w := newTestApp(t, 0)
			tr := smallTrial(t)
			tr.Traits[0].Max = nil // no range, so no warning could hint at a lost key
			tr.Traits[0].Values[0] = 5.5
			u.OpenTrial(tr, "")
			u.showStep(stepRecord)
			r := u.steps[stepRecord].(*recordStep)
			for _, s := range c.steps {
				s(t, u, r, w)
			}
			for row, want := range c.want {
				if got := u.doc.t.Traits[0].Values[row]; got != want {
					t.Errorf("plot row %d holds %v, want %v (entry %q, message %q)", row, got, want, r.entry.Text, r.msg.Text)
				}
			}
		})
	}
}

// A click on a cell leaves the keyboard with the value entry, so that the
// next key goes to the cell's value (common practice for data grids).
func TestRecordClickFocusesEntry(t *testing.T) {
	u, w := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	click(t, r, 1, fixedCols)
	if w.Canvas().Focused() != r.entry {
		t.Fatalf("after a click the focus is on %T, want the value entry", w.Canvas().Focused())
	}
}

// Text that cannot be stored is not dropped by a click elsewhere: the
// cell stays selected with the text in the entry and a message says why
// (common practice: a grid refuses to leave an invalid entry silently).
func TestRecordRefusedTextStays(t *testing.T) {
	u, w := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	click(t, r, 1, fixedCols)
	keys(t, w, "7x")
	test.TapAt(r.table, cellCentre(r, 2, fixedCols))
	if r.sel.Row != 1 || r.entry.Text != "7x" || r.msg.Importance != widget.DangerImportance {
		t.Fatalf("after a click away from refused text: row %d, entry %q, message %q", r.sel.Row, r.entry.Text, r.msg.Text)
	}
	if w.Canvas().Focused() != r.entry {
		t.Fatal("the entry lost the keyboard after the refusal")
	}
	// Correcting the text and clicking away stores it.
	r.entry.SetText("7")
	click(t, r, 2, fixedCols)
	if got := u.doc.t.Traits[0].Values[1]; got != 7 {
		t.Fatalf("corrected value %v, want 7", got)
	}
}
