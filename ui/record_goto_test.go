package ui

import (
	"math"
	"strconv"
	"strings"
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"
)

// A plot number typed or scanned into "go to plot" (a scanner types the
// label's number and Enter) selects that plot's row in the same trait
// column and gives the keyboard to the value entry, so the next value typed
// is that plot's; an unknown number or text says so and moves nothing.
func TestRecordGoToPlot(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	u.OpenTrial(tr, "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	last := len(tr.Plots) - 1
	target := tr.Plots[last].Number

	test.Type(r.goTo, strconv.Itoa(target))
	r.goTo.TypedKey(&fyne.KeyEvent{Name: fyne.KeyReturn})
	if !r.hasSel || r.sel.Row != last || r.sel.Col != r.nfixed || u.win.Canvas().Focused() != r.entry || r.goTo.Text != "" {
		t.Fatalf("after scanning %d: row %d col %d (want %d, %d), focus %v, box %q", target, r.sel.Row, r.sel.Col, last, r.nfixed, u.win.Canvas().Focused(), r.goTo.Text)
	}
	enter(r, "7.25")
	if v := tr.Traits[0].Values[last]; math.Abs(v-7.25) > 1e-12 {
		t.Fatalf("the value typed after the jump went to another plot: plot %d holds %v", target, v)
	}

	before := r.sel
	r.goToPlot("99999")
	if r.sel != before || !strings.Contains(r.msg.Text, "no plot 99999") || r.msg.Importance != widget.DangerImportance {
		t.Errorf("unknown plot: sel %v, message %q", r.sel, r.msg.Text)
	}
	r.goToPlot("plot A")
	if r.sel != before || !strings.Contains(r.msg.Text, "not a plot number") {
		t.Errorf("text: sel %v, message %q", r.sel, r.msg.Text)
	}
	if !r.goToPlot(" "+strconv.Itoa(tr.Plots[0].Number)+" ") || r.sel.Row != 0 {
		t.Errorf("padded number: row %d", r.sel.Row)
	}
}
