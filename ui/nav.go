package ui

import (
	"fmt"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// stepID names a step of the guided window.
type stepID int

const (
	stepSetup stepID = iota
	stepField
	stepRecord
	stepCompare
	stepReport
	numSteps
)

var stepTitles = [numSteps]string{"1  Setup", "2  Field", "3  Record", "4  Compare", "5  Report"}

// navigator is the list of steps on the left. Each entry shows where the
// trial stands; the current step is marked and the suggested next step
// highlighted.
type navigator struct {
	items   [numSteps]*navItem
	box     *fyne.Container
	current stepID
	next    stepID
}

func newNavigator(onTap func(stepID)) *navigator {
	n := &navigator{}
	objs := []fyne.CanvasObject{}
	for i := range n.items {
		id := stepID(i)
		n.items[i] = newNavItem(stepTitles[i], func() { onTap(id) })
		objs = append(objs, n.items[i])
	}
	n.box = container.NewVBox(objs...)
	return n
}

func (n *navigator) object() fyne.CanvasObject { return container.NewVScroll(n.box) }

func (n *navigator) setEnabled(on bool) {
	for _, it := range n.items {
		it.enabled = on
		if !on {
			it.setStatus("")
			it.current, it.next = false, false
		}
		it.Refresh()
	}
}

func (n *navigator) setCurrent(s stepID) {
	n.current = s
	for i, it := range n.items {
		it.current = stepID(i) == s
		it.next = stepID(i) == n.next && n.next != s
		it.Refresh()
	}
}

// update recomputes each step's status line from the trial.
func (n *navigator) update(t *trial.Trial, next stepID) {
	n.next = next
	n.items[stepSetup].setStatus(setupStatus(t))
	n.items[stepField].setStatus(fieldStatus(t))
	n.items[stepRecord].setStatus(recordStatus(t))
	n.items[stepCompare].setStatus(compareStatus(t))
	n.items[stepReport].setStatus("export workbook, field book, map")
	n.setCurrent(n.current)
}

func setupStatus(t *trial.Trial) string {
	if len(t.Treatments) == 0 {
		return "add treatments"
	}
	s := plural(len(t.Treatments), "treatment", "treatments") + " · " + t.Design.Brief()
	if len(t.Traits) == 0 {
		s += " · no traits yet"
	} else {
		s += " · " + plural(len(t.Traits), "trait", "traits")
	}
	return s
}

func fieldStatus(t *trial.Trial) string {
	if len(t.Plots) == 0 {
		return "not laid out yet"
	}
	if t.Random.Done.IsZero() {
		return plural(len(t.Plots), "plot", "plots") + ", not randomised"
	}
	return fmt.Sprintf("%s · seed %d", plural(len(t.Plots), "plot", "plots"), t.Random.Seed)
}

func recordStatus(t *trial.Trial) string {
	filled, total := dataProgress(t)
	if total == 0 {
		return "nothing to record yet"
	}
	pct := 100 * filled / total
	if filled > 0 && pct == 0 {
		pct = 1
	}
	if filled < total && pct == 100 {
		pct = 99
	}
	s := fmt.Sprintf("data %d%% entered", pct)
	if n := excludedPlots(t); n == 1 {
		s += " · 1 plot excluded"
	} else if n > 1 {
		s += fmt.Sprintf(" · %d plots excluded", n)
	}
	return s
}

func compareStatus(t *trial.Trial) string {
	filled, _ := dataProgress(t)
	if filled == 0 {
		return "waiting for data"
	}
	return "ANOVA and means per trait"
}

// navItem is one step in the navigator: a title and a status line on a
// background that marks the current and the suggested step.
type navItem struct {
	widget.BaseWidget
	title, status string
	enabled       bool
	current, next bool
	onTap         func()

	bg          *canvas.Rectangle
	bar         *canvas.Rectangle
	titleText   *canvas.Text
	statusLabel *widget.Label
	hint        *canvas.Text
}

func newNavItem(title string, onTap func()) *navItem {
	it := &navItem{title: title, onTap: onTap}
	it.ExtendBaseWidget(it)
	return it
}

func (it *navItem) setStatus(s string) {
	if s == it.status {
		return
	}
	it.status = s
	it.Refresh()
}

// Tapped moves to the step.
func (it *navItem) Tapped(*fyne.PointEvent) {
	if it.enabled && it.onTap != nil {
		it.onTap()
	}
}

// CreateRenderer implements fyne.Widget.
func (it *navItem) CreateRenderer() fyne.WidgetRenderer {
	it.bg = canvas.NewRectangle(nil)
	it.bg.CornerRadius = theme.InputRadiusSize()
	it.bar = canvas.NewRectangle(nil)
	it.titleText = canvas.NewText(it.title, nil)
	it.titleText.TextStyle = fyne.TextStyle{Bold: true}
	it.titleText.TextSize = theme.TextSize() * 1.1
	it.statusLabel = widget.NewLabel("")
	it.statusLabel.Wrapping = fyne.TextWrapWord
	it.statusLabel.SizeName = theme.SizeNameCaptionText
	it.hint = canvas.NewText("", nil)
	it.hint.TextSize = theme.CaptionTextSize()
	it.hint.TextStyle = fyne.TextStyle{Italic: true}
	inner := container.NewVBox(it.titleText, it.statusLabel, it.hint)
	bar := container.NewGridWrap(fyne.NewSize(4, 10), it.bar)
	content := container.NewBorder(nil, nil, bar, nil, container.NewPadded(inner))
	r := widget.NewSimpleRenderer(container.NewPadded(container.NewStack(it.bg, content)))
	it.refreshLooks()
	return r
}

// Refresh updates colours and texts.
func (it *navItem) Refresh() {
	if it.bg != nil {
		it.refreshLooks()
	}
	it.BaseWidget.Refresh()
}

func (it *navItem) refreshLooks() {
	it.titleText.Color = theme.Color(theme.ColorNameForeground)
	if !it.enabled {
		it.titleText.Color = theme.Color(theme.ColorNameDisabled)
	}
	it.statusLabel.SetText(it.status)
	it.hint.Text = ""
	it.hint.Color = theme.Color(theme.ColorNamePrimary)
	switch {
	case it.current:
		it.bg.FillColor = theme.Color(theme.ColorNameSelection)
		it.bar.FillColor = theme.Color(theme.ColorNamePrimary)
	case it.next && it.enabled:
		it.bg.FillColor = theme.Color(colorNameNext)
		it.bar.FillColor = theme.Color(theme.ColorNameSuccess)
		it.hint.Text = "suggested next"
	default:
		it.bg.FillColor = theme.Color(theme.ColorNameInputBackground)
		it.bar.FillColor = theme.Color(theme.ColorNameInputBackground)
	}
	it.bg.Refresh()
	it.bar.Refresh()
	it.titleText.Refresh()
	it.hint.Refresh()
}
