package ui

import (
	"slices"
	"strings"
	"testing"

	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// TestFactorStructure: in the Treatments tab, choosing factors and adding
// two factors (typed as a trial plan writes them: "0,60,120 kg N/ha";
// common practice) makes the treatments their combinations, each edit one
// undoable step; the list edits are off for combinations; the Design tab
// then offers the split and strip plots and names the main-plot factor;
// the Record grid shows a column per factor and the main plot; the Field
// step offers colouring by each factor. Going back to one list keeps the
// combinations as treatments.
func TestFactorStructure(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	e := s.fac
	if e.structure.Selected != structureList || e.box.Visible() {
		t.Fatalf("a one-list trial shows %q, factor form visible %v", e.structure.Selected, e.box.Visible())
	}
	e.structure.SetSelected(structureFactors)
	if !e.box.Visible() || !s.trtForm.add.Disabled() {
		t.Fatal("choosing factors did not show the factor form or left Add treatment on")
	}
	add := func(key, name, levels string) {
		e.sel.SetSelected(newFactorLabel)
		test.Type(e.key, key)
		test.Type(e.name, name)
		test.Type(e.levels, levels)
		test.Tap(e.add)
	}
	add("N", "Nitrogen", "0,60,120 kg N/ha")
	if got := u.doc.t; len(got.Factors) != 1 || len(got.Treatments) != 3 || got.Treatments[2].Code != "N120" {
		t.Fatalf("after the first factor: %+v", got.Treatments)
	}
	add("V", "Variety", "V1=Amberline,V2")
	tr := u.doc.t
	if len(tr.Treatments) != 6 || tr.Treatments[1].Code != "N0-V2" || tr.Treatments[0].Name != "0 kg N/ha × Amberline" {
		t.Fatalf("after the second factor: %+v (%s)", tr.Treatments, e.msg.Text)
	}
	if !strings.Contains(e.summary.Text, "= 6 combinations") {
		t.Errorf("summary %q", e.summary.Text)
	}
	f := &s.trtForm
	s.trtList.Select(0)
	if !f.remove.Disabled() || !f.up.Disabled() || f.apply.Disabled() || !f.code.Disabled() {
		t.Error("a combination can be removed or moved, or its code edited, or not named")
	}
	// The designs that fit two factors, and the main-plot choice.
	opts := s.designSel.Options
	for _, k := range []trial.DesignKind{trial.SplitPlot, trial.StripPlot} {
		if !slices.Contains(opts, k.Title()) {
			t.Errorf("the Design tab does not offer %s: %v", k, opts)
		}
	}
	if slices.Contains(opts, trial.Latin.Title()) {
		t.Error("a Latin square is offered for factors")
	}
	s.designSel.SetSelected(trial.SplitPlot.Title())
	if !slices.Contains(s.form.Items, s.mainItem) || slices.Contains(s.form.Items, s.subItem) {
		t.Error("split plot of 2 factors: main-plot choice hidden or subplot choice shown")
	}
	s.mainSel.SetSelectedIndex(1)
	s.reps.SetText("3")
	s.applyDesign()
	if d := u.doc.t.Design; d.Kind != trial.SplitPlot || d.MainFactor != "V" || d.Reps != 3 {
		t.Fatalf("design %+v (%s)", d, s.designDone.Text)
	}
	if err := u.tryStructural("randomised", func(t *trial.Trial) error { return t.Randomize(5) }); err != nil {
		t.Fatal(err)
	}
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	heads := map[string]bool{}
	for c := 0; c < r.nfixed; c++ {
		l := widget.NewLabel("")
		r.updateHeader(widget.TableCellID{Row: -1, Col: c}, l)
		heads[l.Text] = true
	}
	if !heads["Nitrogen (N)"] || !heads["Variety (V)"] || !heads["Main plot"] {
		t.Errorf("record grid headers %v", heads)
	}
	u.showStep(stepField)
	fs := u.steps[stepField].(*fieldStep)
	if !slices.Contains(fs.colorBy.Options, "Variety (V)") {
		t.Errorf("colour choices %v", fs.colorBy.Options)
	}
	fs.colorBy.SetSelected("Variety (V)")
	for i, p := range fs.fmap.Plots() {
		pl := u.doc.t.Plots[i]
		if want := u.doc.t.Factors[1].LevelIndex(u.doc.t.LevelCode(pl.Treatment, 1)); p.Group != want || p.Unit != pl.MainPlot {
			t.Fatalf("map plot %d: group %d unit %d, want %d and %d", i, p.Group, p.Unit, want, pl.MainPlot)
		}
	}

	// Back to one list: refused while the design is a split plot.
	u.showStep(stepSetup)
	e.structure.SetSelected(structureList)
	if !u.doc.t.Factorial() {
		t.Fatal("a split plot became one list")
	}
	// Undo walks back: the randomisation, the design, the factors.
	u.undo() // randomisation
	u.undo() // design
	u.undo() // second factor
	if got := u.doc.t; len(got.Factors) != 1 || len(got.Treatments) != 3 {
		t.Fatalf("after two undos: %d factors, %d treatments", len(got.Factors), len(got.Treatments))
	}
	u.undo()
	if got := u.doc.t; got.Factorial() || got.Treatments[0].Code != smallTrial(t).Treatments[0].Code {
		t.Fatalf("after three undos: %+v", got.Treatments)
	}
}
