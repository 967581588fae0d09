package ui

import (
	"fmt"
	"math"
	"slices"
	"strconv"
	"strings"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/export"
	"furlong/trial"
)

// logTab is the Setup step's Log tab: the trial's log of operations
// (sowing, applications, assessments, harvest, other work) in date order,
// a form to add an entry and a button to remove the chosen one. Adding and
// removing are undoable edits saved with the trial; the log goes into the
// season report. Furlong records what was done and never suggests a
// product or a rate.
type logTab struct {
	u       *App
	content fyne.CanvasObject

	list     *textTable
	selected int // the entry chosen in the list, -1 for none
	remove   *widget.Button
	message  *widget.Label

	kind                                             *widget.Select
	date, treatments, product, rate, rateUnit, water *widget.Entry
	equipment, temp, wind, windDir, humidity         *widget.Entry
	stage, scale, by, traits, notes                  *widget.Entry
}

func newLogTab(u *App) *logTab {
	l := &logTab{u: u, selected: -1, list: newTextTable(), message: widget.NewLabel("")}
	l.message.Wrapping = fyne.TextWrapWord
	l.message.Hide()
	l.list.OnSelected = func(id widget.TableCellID) {
		l.selected = id.Row
		l.remove.Enable()
	}
	var kinds []string
	for _, k := range trial.OperationKinds {
		kinds = append(kinds, k.Title())
	}
	l.kind = widget.NewSelect(kinds, nil)
	l.kind.SetSelected(trial.OpApplication.Title())
	entry := func(ph string) *widget.Entry {
		e := widget.NewEntry()
		e.SetPlaceHolder(ph)
		return e
	}
	l.date = entry("YYYY-MM-DD")
	l.treatments = entry("codes, e.g. T2,T3 (empty: the whole trial)")
	l.product = entry("as on its label")
	l.rate = entry("number")
	l.rateUnit = entry("e.g. L/ha")
	l.water = entry("L/ha")
	l.equipment = entry("e.g. plot sprayer, 3 m boom")
	l.temp = entry("air °C")
	l.wind = entry("wind km/h")
	l.windDir = entry("wind from, e.g. SW")
	l.humidity = entry("humidity %")
	l.stage = entry("e.g. 31")
	l.scale = entry("e.g. BBCH")
	l.by = entry("who applied or assessed")
	l.traits = entry("trait keys assessed, e.g. sev1,sev2")
	l.notes = entry("")
	pair := func(a fyne.CanvasObject, label string, b fyne.CanvasObject) fyne.CanvasObject {
		return container.NewBorder(nil, nil, nil, container.NewHBox(widget.NewLabel(label), container.NewGridWrap(fyne.NewSize(120, a.MinSize().Height), b)), a)
	}
	form := widget.NewForm(
		widget.NewFormItem("Operation", container.NewBorder(nil, nil, nil, container.NewHBox(widget.NewLabel("Date"), container.NewGridWrap(fyne.NewSize(140, l.date.MinSize().Height), l.date)), l.kind)),
		widget.NewFormItem("Treatments", l.treatments),
		widget.NewFormItem("Product", l.product),
		widget.NewFormItem("Rate", pair(l.rate, "unit", l.rateUnit)),
		widget.NewFormItem("Water (L/ha)", l.water),
		widget.NewFormItem("Equipment", l.equipment),
		widget.NewFormItem("Weather", container.NewGridWithColumns(4, l.temp, l.wind, l.windDir, l.humidity)),
		widget.NewFormItem("Growth stage", pair(l.stage, "scale", l.scale)),
		widget.NewFormItem("By", l.by),
		widget.NewFormItem("Traits", l.traits),
		widget.NewFormItem("Notes", l.notes),
	)
	add := widget.NewButtonWithIcon("Add to the log", theme.ContentAddIcon(), l.addEntry)
	add.Importance = widget.HighImportance
	l.remove = widget.NewButtonWithIcon("Remove the chosen entry", theme.DeleteIcon(), l.removeEntry)
	l.remove.Disable()
	caution := widget.NewLabel("Record what was done, as it was done: products and rates as on their labels. Furlong never suggests a product or a rate. " + export.ProtectionCautionText())
	caution.Wrapping = fyne.TextWrapWord
	caution.Importance = widget.WarningImportance
	right := container.NewVBox(form, container.NewHBox(add, l.remove), l.message, caution)
	split := container.NewHSplit(container.NewBorder(heading("Log of operations"), nil, nil, nil, l.list), container.NewVScroll(right))
	split.Offset = 0.55
	l.content = split
	return l
}

// load shows the trial's log.
func (l *logTab) load(t *trial.Trial) {
	if l.date.Text == "" {
		l.date.SetText(time.Now().Format("2006-01-02"))
	}
	head := []string{"#", "Date", "Operation", "Treatments", "Details"}
	var rows [][]string
	for i, o := range t.Operations {
		rows = append(rows, []string{strconv.Itoa(i + 1), o.Date.Format("2006-01-02"), o.Kind.Title(), o.TreatmentsText(), export.OperationDetails(o)})
	}
	if len(rows) == 0 {
		head, rows = []string{"The log is empty: add what was done on the trial with the form."}, nil
	}
	l.list.set(head, rows)
	if l.selected >= len(t.Operations) {
		l.selected = -1
	}
	if l.selected < 0 {
		l.list.UnselectAll()
		l.remove.Disable()
	}
}

// entry reads the form as an operation.
func (l *logTab) entry() (trial.Operation, error) {
	o := trial.Operation{Product: strings.TrimSpace(l.product.Text), RateUnit: strings.TrimSpace(l.rateUnit.Text),
		Equipment: strings.TrimSpace(l.equipment.Text), WindDirection: strings.TrimSpace(l.windDir.Text),
		GrowthStage: strings.TrimSpace(l.stage.Text), Scale: strings.TrimSpace(l.scale.Text),
		Assessor: strings.TrimSpace(l.by.Text), Notes: strings.TrimSpace(l.notes.Text)}
	for _, k := range trial.OperationKinds {
		if k.Title() == l.kind.Selected {
			o.Kind = k
		}
	}
	d, err := time.Parse("2006-01-02", strings.TrimSpace(l.date.Text))
	if err != nil {
		return o, fmt.Errorf("the date %q is not a day: write it as YYYY-MM-DD, for example 2026-05-14", l.date.Text)
	}
	o.Date = d
	o.Treatments = splitCodes(l.treatments.Text)
	o.Traits = splitCodes(l.traits.Text)
	for _, n := range []struct {
		what string
		e    *widget.Entry
		to   **float64
	}{{"rate", l.rate, &o.Rate}, {"water volume", l.water, &o.WaterVolume}, {"temperature", l.temp, &o.Temperature},
		{"wind speed", l.wind, &o.Wind}, {"relative humidity", l.humidity, &o.Humidity}} {
		s := strings.TrimSpace(n.e.Text)
		if s == "" {
			continue
		}
		v, err := strconv.ParseFloat(strings.ReplaceAll(s, ",", "."), 64)
		if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
			return o, fmt.Errorf("the %s %q is not a number", n.what, s)
		}
		*n.to = &v
	}
	return o, nil
}

func splitCodes(s string) []string {
	var out []string
	for _, p := range strings.Split(s, ",") {
		if p = strings.TrimSpace(p); p != "" {
			out = append(out, p)
		}
	}
	return out
}

// addEntry adds the form's entry to the log, as an undoable edit.
func (l *logTab) addEntry() {
	d := l.u.doc
	if d == nil {
		return
	}
	o, err := l.entry()
	if err == nil {
		work := d.t.Clone()
		if err = work.AddOperation(o); err == nil {
			d.apply(&setOperations{before: cloneOps(d.t.Operations), after: work.Operations, what: "log entry " + o.Kind.Title()})
			l.say(fmt.Sprintf("Added the %s of %s to the log.", o.Kind, o.Date.Format("2 January 2006")))
			for _, e := range []*widget.Entry{l.product, l.rate, l.water, l.temp, l.wind, l.windDir, l.humidity, l.stage, l.notes, l.traits} {
				e.SetText("")
			}
			return
		}
	}
	l.say("Not added: " + err.Error() + ".")
}

// removeEntry removes the entry chosen in the list.
func (l *logTab) removeEntry() {
	d := l.u.doc
	if d == nil || l.selected < 0 || l.selected >= len(d.t.Operations) {
		l.say("Choose the entry to remove in the list.")
		return
	}
	i := l.selected
	o := d.t.Operations[i]
	after := slices.Delete(cloneOps(d.t.Operations), i, i+1)
	l.selected = -1
	d.apply(&setOperations{before: cloneOps(d.t.Operations), after: after, what: "removal of a log entry"})
	l.say(fmt.Sprintf("Removed the %s of %s (Edit › Undo brings it back).", o.Kind, o.Date.Format("2 January 2006")))
}

func cloneOps(ops []trial.Operation) []trial.Operation {
	t := trial.Trial{Operations: ops}
	return t.Clone().Operations
}

// setOperations replaces the trial's log (undoable).
type setOperations struct {
	before, after []trial.Operation
	what          string
}

func (c *setOperations) do(t *trial.Trial)   { t.Operations = cloneOps(c.after) }
func (c *setOperations) undo(t *trial.Trial) { t.Operations = cloneOps(c.before) }
func (c *setOperations) kind() change        { return changeDetails }
func (c *setOperations) label() string       { return c.what }

// say shows what the last add or remove did (no room taken when empty).
func (l *logTab) say(s string) { sayIn(l.message, s) }
