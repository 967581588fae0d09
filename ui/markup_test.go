package ui

import (
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"
)

// The start screen's layout is kept as Fyne markup (testdata/start.xml).
// When it differs, fyne's test package writes the new rendering to
// testdata/failed/start.xml; copy it over the master after checking it.
func TestStartMarkup(t *testing.T) {
	a := test.NewTempApp(t)
	w := test.NewTempWindow(t, widget.NewLabel(""))
	u := New(a, w, Options{Version: "test"})
	t.Cleanup(u.saver.stop)
	u.recoveryDir = t.TempDir()
	w.Resize(fyne.NewSize(1000, 640))
	test.AssertRendersToMarkup(t, "start.xml", w.Canvas())
}
