package ui

import (
	"math"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// The entry flow follows the Record step of issue 5 (common practice for
// plot data entry): Enter stores the value and moves to the next plot in
// walking order; text that is not a number is refused and nothing moves;
// a value outside the valid range is kept and flagged.
func TestRecordEntryFlow(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	u.OpenTrial(tr, "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)

	r.table.Select(widget.TableCellID{Row: 0, Col: fixedCols})
	enter(r, "abc")
	if !math.IsNaN(tr.Traits[0].Values[0]) {
		t.Fatalf("bad text stored: %v", tr.Traits[0].Values[0])
	}
	if r.sel.Row != 0 || r.msg.Importance != widget.DangerImportance || r.msg.Text == "" {
		t.Fatalf("bad text: row %d, message %q (%v)", r.sel.Row, r.msg.Text, r.msg.Importance)
	}

	// Typing on the grid goes to the entry, replacing its text.
	r.entry.SetText("99")
	r.table.TypedRune('5')
	if r.entry.Text != "5" || u.win.Canvas().Focused() != r.entry {
		t.Fatalf("typing on the grid: entry %q, focus %v", r.entry.Text, u.win.Canvas().Focused())
	}
	enter(r, "5,5") // a decimal comma is accepted
	if got := tr.Traits[0].Values[0]; got != 5.5 {
		t.Fatalf("value = %v, want 5.5", got)
	}
	if r.sel.Row != 1 {
		t.Fatalf("after Enter the row is %d, want 1", r.sel.Row)
	}

	enter(r, "12") // above the 0–10 range: kept, flagged
	if got := tr.Traits[0].Values[1]; got != 12 {
		t.Fatalf("out-of-range value = %v, want 12 kept", got)
	}
	if r.msg.Importance != widget.WarningImportance {
		t.Fatalf("out-of-range value not flagged: %q", r.msg.Text)
	}
	// The flag is the trial package's note for the value.
	if want := tr.Traits[0].RangeNote(12); want == "" || !strings.Contains(r.msg.Text, want) {
		t.Fatalf("flag %q does not carry the trait's range note %q", r.msg.Text, want)
	}

	// Counts refuse fractions (trial.Count is a whole number, 0 or more).
	r.table.Select(widget.TableCellID{Row: 0, Col: fixedCols + 1})
	enter(r, "2.5")
	if !math.IsNaN(tr.Traits[1].Values[0]) || r.sel.Row != 0 {
		t.Fatal("a fractional count was accepted")
	}
	if r.msg.Importance != widget.DangerImportance || !strings.Contains(r.msg.Text, "count") {
		t.Fatalf("fractional count: message %q (%v)", r.msg.Text, r.msg.Importance)
	}
	enter(r, "-4") // a negative count is impossible too
	if !math.IsNaN(tr.Traits[1].Values[0]) || r.sel.Row != 0 {
		t.Fatal("a negative count was accepted")
	}
	enter(r, "310")
	if tr.Traits[1].Values[0] != 310 {
		t.Fatal("count not stored")
	}

	// Undo and redo.
	u.undo()
	if !math.IsNaN(tr.Traits[1].Values[0]) {
		t.Fatal("undo did not restore the missing count")
	}
	u.undo()
	if !math.IsNaN(tr.Traits[0].Values[1]) {
		t.Fatal("second undo did not restore the missing yield")
	}
	u.redo()
	if tr.Traits[0].Values[1] != 12 {
		t.Fatal("redo did not restore 12")
	}

	// Exclusion with a reason and a note, undoable.
	if err := r.setExclusion(2, "", "hail", "stones on 3 May", false); err != nil {
		t.Fatal(err)
	}
	if ex, why := tr.Excluded(2, "yld"); !ex || why != "hail" {
		t.Fatalf("plot not excluded: %v %q", ex, why)
	}
	if tr.Plots[2].Note != "stones on 3 May" {
		t.Fatal("note not stored")
	}
	// 2 of 24 stored values (12 plots × 2 traits) are entered after the
	// undos: 100·2/24 = 8 % (arithmetic).
	if got := recordStatus(tr); got != "data 8% entered · 1 plot excluded" {
		t.Fatalf("status %q", got)
	}
	u.undo()
	if ex, _ := tr.Excluded(2, "yld"); ex || tr.Plots[2].Note != "" {
		t.Fatal("undo did not take back the exclusion")
	}
	u.redo()

	// Save, reopen in a fresh window, and find everything.
	path := filepath.Join(t.TempDir(), "strip.furlong")
	u.saveTo(path, nil)
	if u.doc.dirty {
		t.Fatal("still marked unsaved after saving")
	}
	u2, _ := newTestApp(t, 0)
	if err := u2.OpenFile(path); err != nil {
		t.Fatal(err)
	}
	got := u2.doc.t
	if got.Traits[0].Values[0] != 5.5 || got.Traits[0].Values[1] != 12 {
		t.Fatalf("reopened values %v", got.Traits[0].Values[:2])
	}
	if ex, why := got.Excluded(2, ""); !ex || why != "hail" {
		t.Fatal("exclusion lost on reopening")
	}
}

// Every edit reaches the disk within two seconds (issue 5's autosave
// bound), written by the background saver to the recovery file.
func TestAutosaveWithinTwoSeconds(t *testing.T) {
	u, _ := newTestApp(t, 300*time.Millisecond)
	tr := smallTrial(t)
	u.OpenTrial(tr, "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	saved := make(chan struct{})
	u.saved = func(j saveJob, err error) {
		if err == nil && j.gen == u.doc.gen {
			close(saved)
			u.saved = nil
		}
	}
	r.table.Select(widget.TableCellID{Row: 3, Col: fixedCols})
	// The edit Enter makes in the grid; nothing touches the window after
	// it while the saver works (the test driver runs its fyne.Do report on
	// the saver's goroutine).
	start := time.Now()
	u.doc.apply(&setValue{trait: 0, plot: 3, old: tr.Traits[0].Values[3], new: 7.25})
	select {
	case <-saved:
	case <-time.After(2 * time.Second):
		t.Fatal("the edit was not on disk within 2 s")
	}
	t.Logf("edit on disk after %v", time.Since(start))
	back, err := loadFile(u.doc.recovery)
	if err != nil {
		t.Fatal(err)
	}
	if back.Traits[0].Values[3] != 7.25 {
		t.Fatalf("recovery file holds %v", back.Traits[0].Values[3])
	}
	_ = trial.Missing
}
