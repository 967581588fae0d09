package ui

import (
	"testing"

	"fyne.io/fyne/v2/test"

	"furlong/trial"
)

// The Field step's orientation form stores north and the landmark in the
// trial as one undoable edit (the map widget's own tests check the arrow).
func TestOrientationForm(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	u.OpenTrial(tr, "")
	u.showStep(stepField)
	f := u.steps[stepField].(*fieldStep)
	if f.orient.north.Selected != northUnknown || f.orient.landmark.Text != "" {
		t.Fatalf("a trial without orientation shows %q, %q", f.orient.north.Selected, f.orient.landmark.Text)
	}
	f.orient.north.SetSelected("right of the map")
	test.Type(f.orient.landmark, "farm track")
	f.orient.apply()
	if got := u.doc.t.Layout.Orientation; got != (trial.Orientation{North: trial.EdgeRight, Landmark: "farm track"}) {
		t.Fatalf("orientation stored %+v", got)
	}
	u.undo()
	if !u.doc.t.Layout.Orientation.IsZero() {
		t.Errorf("undo left %+v", u.doc.t.Layout.Orientation)
	}
	if f.orient.north.Selected != northUnknown {
		t.Errorf("after undo the form shows %q", f.orient.north.Selected)
	}
}
