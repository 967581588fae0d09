package ui

import (
	"testing"

	"fyne.io/fyne/v2"

	"furlong/sampledata"
)

// openDemoCompare opens the demo trial in a window of the given size and
// shows Compare with its charts.
func openDemoCompare(t *testing.T, size fyne.Size) (*App, *compareStep) {
	t.Helper()
	u, w := newTestApp(t, 0)
	tr, err := sampledata.Trial()
	if err != nil {
		t.Fatal(err)
	}
	u.OpenTrial(tr, "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	w.Resize(size)
	return u, u.steps[stepCompare].(*compareStep)
}

// At 1366 × 768 every chart tab holds a chart drawn at its own pixel size
// (never a shrunk bitmap), at least chartMinSize, and the residual map is
// one of them.
func TestCompareChartsAtRealSize(t *testing.T) {
	_, c := openDemoCompare(t, fyne.NewSize(1366, 768))
	var titles []string
	for i, it := range c.charts.Items {
		titles = append(titles, it.Text)
		v, ok := it.Content.(*chartView)
		if !ok {
			t.Errorf("tab %q shows %T, not a chart", it.Text, it.Content)
			continue
		}
		c.charts.SelectIndex(i)
		size := v.Size()
		if size.Width < chartMinSize.Width || size.Height < chartMinSize.Height {
			t.Errorf("%s chart is %v, smaller than %v", it.Text, size, chartMinSize)
		}
		img := v.render(int(size.Width), int(size.Height))
		if b := img.Bounds(); b.Dx() != int(size.Width) || b.Dy() != int(size.Height) {
			t.Errorf("%s drawn at %v for a %v widget", it.Text, b, size)
		}
		// The same size again reuses the drawing.
		if again := v.render(int(size.Width), int(size.Height)); again != img {
			t.Errorf("%s redrawn at an unchanged size", it.Text)
		}
	}
	want := []string{"Means", "Field heat map", "Residual map", "Spread", "Residuals", "Normal Q-Q"}
	if len(titles) != len(want) {
		t.Fatalf("chart tabs %q, want %q", titles, want)
	}
	for i := range want {
		if titles[i] != want[i] {
			t.Errorf("chart tab %d is %q, want %q", i, titles[i], want[i])
		}
	}
}

// The means table is wide enough for all its columns, so the Letters
// column shows without a horizontal scroll, and the charts keep their
// minimum size beside it: at a 1366 × 768 screen and at the window's
// default 1280 × 720.
func TestCompareMeansLettersVisible(t *testing.T) {
	for _, size := range []fyne.Size{{Width: 1366, Height: 768}, {Width: 1280, Height: 720}} {
		_, c := openDemoCompare(t, size)
		need := c.treatWidth
		for _, w := range meansColumns[1:] {
			need += w
		}
		if got := c.means.Size().Width; got < need {
			t.Errorf("%v: means table %v wide, its columns need %v: Letters hidden", size, got, need)
		}
		if got := c.charts.Size(); got.Width < chartMinSize.Width {
			t.Errorf("%v: charts %v wide, less than %v", size, got.Width, chartMinSize.Width)
		}
		if got, max := c.root.Size().Width, size.Width; got > max {
			t.Errorf("%v: Compare is %v wide, more than the window", size, got)
		}
		checkTreatWidth(t, c)
	}
}

func checkTreatWidth(t *testing.T, c *compareStep) {
	t.Helper()
	if c.treatWidth < treatColMin || c.treatWidth > treatColMax {
		t.Errorf("treatment column %v outside %v–%v", c.treatWidth, float32(treatColMin), float32(treatColMax))
	}
}
