package ui

import (
	"furlong/export/chart"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"fyne.io/fyne/v2/canvas"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"
)

// overlayWidgets walks the top dialog's objects.
func overlayWidgets(t *testing.T, w fyne.Window) []fyne.CanvasObject {
	t.Helper()
	top := w.Canvas().Overlays().Top()
	if top == nil {
		t.Fatal("no dialog is open")
	}
	var out []fyne.CanvasObject
	var walk func(o fyne.CanvasObject)
	walk = func(o fyne.CanvasObject) {
		out = append(out, o)
		switch v := o.(type) {
		case *fyne.Container:
			for _, c := range v.Objects {
				walk(c)
			}
		case fyne.Widget:
			for _, c := range test.WidgetRenderer(v).Objects() {
				walk(c)
			}
		}
	}
	walk(top)
	return out
}

// dialogButton finds the top dialog's button labelled text.
func dialogButton(t *testing.T, w fyne.Window, text string) *widget.Button {
	t.Helper()
	for _, o := range overlayWidgets(t, w) {
		if b, ok := o.(*widget.Button); ok && b.Text == text {
			return b
		}
	}
	t.Fatalf("the dialog has no button %q", text)
	return nil
}

// Esc closes the custom dialogs (common practice for desktop dialogs),
// and gives the screen behind back its key handling and focus.
func TestEscapeClosesDialogs(t *testing.T) {
	u, w := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	r.table.Select(widget.TableCellID{Row: 0, Col: fixedCols})
	w.Canvas().Focus(r.entry)

	for name, open := range map[string]func(){
		"exclude":     r.excludeDialog,
		"about":       u.showAbout,
		"cautions":    u.showCautions,
		"preferences": u.showPreferences,
	} {
		open()
		if w.Canvas().Overlays().Top() == nil {
			t.Fatalf("%s: no dialog", name)
		}
		w.Canvas().OnTypedKey()(&fyne.KeyEvent{Name: fyne.KeyEscape})
		if w.Canvas().Overlays().Top() != nil {
			t.Fatalf("%s: Esc did not close the dialog", name)
		}
		if w.Canvas().OnTypedKey() != nil || w.Canvas().Focused() != r.entry {
			t.Fatalf("%s: key handler or focus not given back", name)
		}
	}
}

// The Exclude plot dialog: a reason is required (and the dialog says so),
// one trait or every trait can be left out, and Compare counts the plot
// as excluded for that trait only.
func TestExcludeDialog(t *testing.T) {
	u, w := newTestApp(t, 0)
	tr := smallTrial(t)
	rng := rand.New(rand.NewPCG(1, 2))
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 4 + rng.Float64()
		tr.Traits[1].Values[i] = float64(300 + rng.IntN(50))
	}
	u.OpenTrial(tr, "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	r.table.Select(widget.TableCellID{Row: 2, Col: fixedCols}) // plot 3, yield
	r.excludeDialog()
	test.Tap(dialogButton(t, w, "Exclude"))
	if ex, _ := tr.Excluded(2, "yld"); ex || w.Canvas().Overlays().Top() == nil {
		t.Fatal("excluded without a reason, or the dialog closed")
	}
	var said bool
	var reason *widget.SelectEntry
	for _, o := range overlayWidgets(t, w) {
		if l, ok := o.(*widget.Label); ok && l.Visible() && l.Text == "Give a reason, so that the report can say why the plot was left out." {
			said = true
		}
		if e, ok := o.(*widget.SelectEntry); ok {
			reason = e
		}
	}
	if !said || reason == nil {
		t.Fatal("the dialog did not ask for a reason")
	}
	reason.SetText("hail")
	test.Tap(dialogButton(t, w, "Exclude"))
	if ex, why := tr.Excluded(2, "yld"); !ex || why != "hail" {
		t.Fatal("the plot was not excluded for yield")
	}
	if ex, _ := tr.Excluded(2, "heads"); ex {
		t.Fatal("the plot was excluded for a trait not chosen")
	}
	if r.undoBtn.Disabled() {
		t.Fatal("undo button off after an exclusion")
	}
	set := waitAnalysis(t, u, func() { u.showStep(stepCompare) })
	y, h := set.result("yld"), set.result("heads")
	if y == nil || y.res == nil || h == nil || h.res == nil {
		t.Fatal("no analysis for the traits")
	}
	// 4 treatments × 3 blocks = 12 plots; one left out of yield only.
	if len(y.res.Excluded) != 1 || y.res.N != 11 || len(h.res.Excluded) != 0 || h.res.N != 12 {
		t.Fatalf("yield N %d excluded %d; heads N %d excluded %d", y.res.N, len(y.res.Excluded), h.res.N, len(h.res.Excluded))
	}
}

// The Record toolbar's undo and redo buttons follow the history.
func TestRecordUndoButtons(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	if !r.undoBtn.Disabled() || !r.redoBtn.Disabled() {
		t.Fatal("undo or redo on with an empty history")
	}
	r.table.Select(widget.TableCellID{Row: 0, Col: fixedCols})
	enter(r, "5.5")
	if r.undoBtn.Disabled() || !r.redoBtn.Disabled() {
		t.Fatal("after an entry: undo should be on, redo off")
	}
	u.undo()
	if !r.undoBtn.Disabled() || r.redoBtn.Disabled() {
		t.Fatal("after undo: undo should be off, redo on")
	}
}

// The save-changes question names the action that asked, and a second
// request while it is open (Ctrl+Q pressed again) does not stack a copy.
func TestUnsavedWording(t *testing.T) {
	u, w := newTestApp(t, 0)
	for _, c := range []struct {
		do     func()
		button string
	}{
		{u.newTrial, "Start new without saving"},
		{func() { u.openPath("/nowhere/x.furlong") }, "Open another without saving"},
		{u.onClose, "Quit without saving"},
		{u.closeTrial, "Close without saving"},
	} {
		u.OpenTrial(smallTrial(t), "")
		u.doc.edited(changeDetails)
		c.do()
		dialogButton(t, w, c.button)
		top := w.Canvas().Overlays().Top()
		c.do()
		if n := len(w.Canvas().Overlays().List()); n != 1 || w.Canvas().Overlays().Top() != top {
			t.Fatalf("%s: %d dialogs after asking twice", c.button, n)
		}
		dialogButton(t, w, "Cancel").OnTapped()
		if w.Canvas().Overlays().Top() != nil {
			t.Fatalf("%s: Cancel did not close the question", c.button)
		}
	}
}

// A long treatment name in the means table is shortened with an ellipsis
// instead of running into the Plots column (common practice for tables).
func TestMeansLongName(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	tr.Treatments[3].Name = "Standard check variety from the regional list, certified seed lot"
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 4 + float64(tr.TreatmentIndex(tr.Plots[i].Treatment)) + float64(i%3)/10
		tr.Traits[1].Values[i] = float64(300 + i)
	}
	u.OpenTrial(tr, "")
	waitAnalysis(t, u, func() { u.showStep(stepCompare) })
	c := u.steps[stepCompare].(*compareStep)
	cell := compactCell("", false)
	found := false
	for row := range c.meanRows {
		full := c.meanText(row, 0)
		c.updateMean(widget.TableCellID{Row: row, Col: 0}, cell)
		got := cell.(*fyne.Container).Objects[0].(*canvas.Text).Text
		if cellTextWidth(got) > treatColMax {
			t.Fatalf("row %d: %q is wider than the column", row, got)
		}
		if strings.HasPrefix(full, "K ") {
			found = true
			if got == full || !strings.HasSuffix(got, "…") {
				t.Fatalf("long name not shortened: %q", got)
			}
		}
	}
	if !found {
		t.Fatal("the check's row is missing")
	}
}

// Choosing "Trial order" in Preferences redraws the charts in that order
// (a new analysis round), not only the means table.
func TestOrderPreferenceRedrawsCharts(t *testing.T) {
	u, w := newTestApp(t, 0)
	tr := smallTrial(t)
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 4 + float64(tr.TreatmentIndex(tr.Plots[i].Treatment)) + float64(i%3)/10
		tr.Traits[1].Values[i] = float64(300 + i)
	}
	u.OpenTrial(tr, "")
	waitAnalysis(t, u, func() { u.showStep(stepCompare) })
	if chartOrder(u.prefs.meansOrder) != chart.ByMean {
		t.Fatal("charts not best-first by default")
	}
	gen := u.compute.gen
	u.showPreferences()
	var order *widget.RadioGroup
	for _, o := range overlayWidgets(t, w) {
		if r, ok := o.(*widget.RadioGroup); ok && slices.Contains(r.Options, "Trial order") {
			order = r
		}
	}
	if order == nil {
		t.Fatal("no order choice in Preferences")
	}
	set := waitAnalysis(t, u, func() { order.SetSelected("Trial order") })
	if u.compute.gen == gen || set.charts == nil || chartOrder(u.prefs.meansOrder) != chart.AsListed {
		t.Fatalf("order change: generation %d → %d, charts %v", gen, u.compute.gen, set.charts != nil)
	}
}
