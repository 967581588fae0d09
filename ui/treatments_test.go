package ui

import (
	"strconv"
	"strings"
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/test"

	"furlong/trial"
)

// The Treatments tab of a new trial: names typed one after another become
// separate treatments (the form empties after Add, Enter adds too), the
// buttons that act on a selection are off without one, and Up, Down,
// Remove and the check mark act on the selected treatment. Expected
// behaviour is common practice for list editors.
func TestTreatmentsTabNewTrial(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.startNewTrial()
	s := u.steps[stepSetup].(*setupStep)
	f := &s.trtForm

	if !f.apply.Disabled() || !f.remove.Disabled() || !f.up.Disabled() || !f.down.Disabled() {
		t.Fatal("Apply changes, Remove, Up and Down look usable with nothing selected")
	}
	for _, n := range []string{"Aurel", "Brisk"} {
		test.Type(f.name, n)
		test.Tap(f.add)
	}
	test.Type(f.name, "Corvo")
	f.name.TypedKey(&fyne.KeyEvent{Name: fyne.KeyReturn})
	tr := u.doc.t.Treatments
	if len(tr) != 3 || tr[0].Name != "Aurel" || tr[1].Name != "Brisk" || tr[2].Name != "Corvo" || tr[2].Code != "T03" {
		t.Fatalf("treatments after three adds: %+v", tr)
	}
	if f.name.Text != "" || f.code.Text != "" {
		t.Fatalf("form not emptied after Add: code %q name %q", f.code.Text, f.name.Text)
	}

	s.trtList.Select(1)
	if f.apply.Disabled() || f.remove.Disabled() || f.up.Disabled() || f.down.Disabled() || f.name.Text != "Brisk" {
		t.Fatalf("selection of the middle treatment: form %q, buttons not all on", f.name.Text)
	}
	f.role.SetSelected(roleLabels[1]) // the check
	test.Tap(f.apply)
	test.Tap(f.up)
	tr = u.doc.t.Treatments
	if tr[0].Code != "T02" || tr[0].Role != trial.RoleCheck || s.trtSel != 0 {
		t.Fatalf("after check and Up: %+v, selected %d", tr, s.trtSel)
	}
	if !f.up.Disabled() || f.down.Disabled() {
		t.Fatal("Up should be off for the first treatment, Down on")
	}
	test.Tap(f.remove)
	tr = u.doc.t.Treatments
	if len(tr) != 2 || tr[0].Code != "T01" || s.trtSel != -1 || !f.remove.Disabled() || f.name.Text != "" {
		t.Fatalf("after Remove: %+v, selected %d, form %q", tr, s.trtSel, f.name.Text)
	}
	// Undo brings it back as it was.
	u.undo()
	if tr = u.doc.t.Treatments; len(tr) != 3 || tr[0].Code != "T02" {
		t.Fatalf("after undo: %+v", tr)
	}
}

// A new trial with its treatments but no plots yet is told to press
// Randomise, not to add treatments it already has; Randomise then lays
// out every treatment once per block (RCBD, common practice).
func TestFieldNotLaidOut(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.startNewTrial()
	f := u.steps[stepField]
	if f == nil {
		u.showStep(stepField)
		f = u.steps[stepField]
	}
	fs := f.(*fieldStep)
	if !strings.Contains(fs.randomState.Text, "add treatments") {
		t.Fatalf("empty trial: %q", fs.randomState.Text)
	}
	s := u.steps[stepSetup].(*setupStep)
	s.pasteTreatments("Aurel\nBrisk\nCorvo")
	if len(u.doc.t.Plots) == 0 && !strings.Contains(fs.randomState.Text, "press Randomise") {
		t.Fatalf("treatments but no plots: %q", fs.randomState.Text)
	}
	u.showStep(stepField)
	fs.randomise()
	if n := len(u.doc.t.Plots); n != 3*u.doc.t.Design.Reps {
		t.Fatalf("%d plots after Randomise, want %d", n, 3*u.doc.t.Design.Reps)
	}
}

// The Treatments tab carries each treatment's rate and unit
// (trial.Treatment.Rate, RateUnit): typed with a decimal point or comma
// (the typed text read by strconv.ParseFloat after the comma becomes a
// point is the reference), empty for none, refused in words when it is not
// a number or below 0; every change one undoable edit.
func TestTreatmentRates(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	f := &s.trtForm
	cases := []struct {
		text, unit string
		ok         bool
	}{
		{"120", "kg N/ha", true},
		{"2,5", "l/ha", true},
		{"0", "kg N/ha", true},
		{"", "", true},
		{"lots", "kg/ha", false},
		{"-5", "kg/ha", false},
	}
	for _, c := range cases {
		s.trtList.Select(1)
		before := u.doc.t.Treatments[1]
		f.rate.SetText(c.text)
		f.rateUnit.SetText(c.unit)
		test.Tap(f.apply)
		got := u.doc.t.Treatments[1]
		if !c.ok {
			if !sameTreatment(got, before) || !strings.Contains(s.trtMsg.Text, c.text) {
				t.Errorf("rate %q: stored %v, message %q", c.text, got.Rate, s.trtMsg.Text)
			}
			continue
		}
		if c.text == "" {
			if got.Rate != nil {
				t.Errorf("an empty rate stored %v", *got.Rate)
			}
			continue
		}
		want, err := strconv.ParseFloat(strings.ReplaceAll(c.text, ",", "."), 64)
		if err != nil {
			t.Fatal(err)
		}
		if got.Rate == nil || *got.Rate != want || got.RateUnit != c.unit {
			t.Errorf("rate %q %q: stored %v %q (%s)", c.text, c.unit, got.Rate, got.RateUnit, s.trtMsg.Text)
		}
		if !strings.Contains(s.trtMsg.Text, "rate is now") {
			t.Errorf("rate %q: the message %q does not say what changed", c.text, s.trtMsg.Text)
		}
	}
	// Undo walks back: no rate, 0, 2.5, 120, none.
	for _, want := range []float64{0, 2.5, 120} {
		u.undo()
		if r := u.doc.t.Treatments[1].Rate; r == nil || *r != want {
			t.Fatalf("after undo the rate is %v, want %v", r, want)
		}
	}
	u.undo()
	if r := u.doc.t.Treatments[1].Rate; r != nil {
		t.Fatalf("after undoing every rate change the rate is %v", *r)
	}
	// A new treatment with a rate.
	s.trtList.UnselectAll()
	s.clearTreatmentForm()
	test.Type(f.name, "Delta")
	f.rate.SetText("80")
	f.rateUnit.SetText("kg N/ha")
	test.Tap(f.add)
	tr := u.doc.t.Treatments[len(u.doc.t.Treatments)-1]
	if tr.Name != "Delta" || tr.Rate == nil || *tr.Rate != 80 || tr.RateUnit != "kg N/ha" || rateText(tr) != "80 kg N/ha" {
		t.Fatalf("new treatment %+v", tr)
	}
}

// The untreated check is a role of its own in the Treatments tab: chosen
// there it is saved (the efficacy against it follows), and editing such a
// treatment keeps it (before, the form knew only entry and check, and an
// edit made an untreated check a plain entry).
func TestTreatmentUntreatedRole(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	f := &s.trtForm
	s.trtList.Select(2) // C
	f.role.SetSelected(roleLabels[2])
	test.Tap(f.apply)
	if got := u.doc.t.Treatments[2].Role; got != trial.RoleUntreated {
		t.Fatalf("role %q", got)
	}
	s.trtList.Select(0)
	s.trtList.Select(2)
	if f.role.Selected != roleLabels[2] {
		t.Fatalf("the form shows %q for the untreated check", f.role.Selected)
	}
	f.name.SetText("Charlie untreated")
	test.Tap(f.apply)
	if tr := u.doc.t.Treatments[2]; tr.Role != trial.RoleUntreated || tr.Name != "Charlie untreated" {
		t.Errorf("after editing the name: %+v", tr)
	}
}
