package ui

import (
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// orientationBox is the Field step's small form that ties the map to the
// ground: which map edge faces north, and a landmark along row 1. Both
// are optional; they appear on the window's map, the printed map and the
// workbook's map.
type orientationBox struct {
	u        *App
	north    *widget.Select
	landmark *widget.Entry
	root     fyne.CanvasObject
}

// northLabels are the choices of the north select, in trial.Edges order,
// then "not recorded".
var northLabels = []string{"top of the map", "right of the map", "bottom of the map", "left of the map"}

const northUnknown = "not recorded"

func newOrientationBox(u *App) *orientationBox {
	o := &orientationBox{u: u}
	o.north = widget.NewSelect(append(append([]string(nil), northLabels...), northUnknown), nil)
	o.landmark = widget.NewEntry()
	o.landmark.SetPlaceHolder("for example: farm track, hedge")
	o.landmark.OnSubmitted = func(string) { o.apply() }
	apply := widget.NewButtonWithIcon("Apply orientation", theme.ConfirmIcon(), o.apply)
	o.root = container.NewVBox(
		heading("Orientation"),
		widget.NewLabel("North is at the"), o.north,
		widget.NewLabel("Along row 1 (the bottom edge)"), o.landmark,
		apply)
	return o
}

// load shows the trial's orientation.
func (o *orientationBox) load(t *trial.Trial) {
	or := t.Layout.Orientation
	sel := northUnknown
	for i, e := range trial.Edges {
		if e == or.North {
			sel = northLabels[i]
		}
	}
	o.north.SetSelected(sel)
	o.landmark.SetText(or.Landmark)
}

// value is the orientation the form shows.
func (o *orientationBox) value() trial.Orientation {
	var or trial.Orientation
	for i, l := range northLabels {
		if o.north.Selected == l {
			or.North = trial.Edges[i]
		}
	}
	or.Landmark = strings.TrimSpace(o.landmark.Text)
	return or
}

// apply stores the form's orientation as one undoable edit.
func (o *orientationBox) apply() {
	or := o.value()
	if or == o.u.doc.t.Layout.Orientation {
		return
	}
	o.u.structuralEdit("orientation change", "The orientation was not changed", func(t *trial.Trial) error {
		l := t.Layout
		l.Orientation = or
		return t.SetLayout(l)
	})
}

// northName is the map widget's name for an edge.
func northName(e trial.Edge) string {
	if e.Valid() {
		return string(e)
	}
	return ""
}
