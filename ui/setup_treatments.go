package ui

import (
	"fmt"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// treatmentsTab is the Setup step's Treatments tab: the list of
// treatments and a form that adds, changes, moves and removes them.
type treatmentsTab struct {
	u       *App
	content fyne.CanvasObject

	trtList *widget.List
	trtSel  int
	trtForm treatmentForm
	trtMsg  *widget.Label // what the last button did
	fac     *factorEditor // the treatment structure and the factors (setup_factors.go)
	paste   *widget.Button
}

// newTreatmentsTab builds the tab.
func newTreatmentsTab(u *App) *treatmentsTab {
	s := &treatmentsTab{u: u, trtSel: -1}
	s.content = s.build()
	return s
}

func (s *treatmentsTab) build() fyne.CanvasObject {
	s.trtList = widget.NewList(
		func() int { return len(s.t().Treatments) },
		func() fyne.CanvasObject {
			return container.NewHBox(widget.NewLabelWithStyle("CODE", fyne.TextAlignLeading, fyne.TextStyle{Monospace: true}), widget.NewLabel("name"), widget.NewLabel(""), widget.NewLabel(""))
		},
		func(i widget.ListItemID, o fyne.CanvasObject) {
			tr := s.t().Treatments[i]
			row := o.(*fyne.Container)
			row.Objects[0].(*widget.Label).SetText(fmt.Sprintf("%-6s", tr.Code))
			row.Objects[1].(*widget.Label).SetText(tr.Name)
			role := ""
			switch tr.Role {
			case trial.RoleCheck:
				role = "check"
			case trial.RoleUntreated:
				role = "untreated check"
			}
			row.Objects[2].(*widget.Label).SetText(rateText(tr))
			row.Objects[3].(*widget.Label).SetText(role)
		})
	f := &s.trtForm
	f.code = widget.NewEntry()
	f.code.SetPlaceHolder("short code, e.g. T01")
	f.name = widget.NewEntry()
	f.name.SetPlaceHolder("name")
	f.desc = widget.NewEntry()
	f.desc.SetPlaceHolder("description (optional)")
	f.role = widget.NewRadioGroup(roleLabels, nil)
	f.role.SetSelected(roleLabels[0])
	f.rate = widget.NewEntry()
	f.rate.SetPlaceHolder("rate applied or sown, e.g. 120 (empty: none)")
	f.rateUnit = widget.NewEntry()
	f.rateUnit.SetPlaceHolder("unit of the rate, e.g. kg N/ha")
	code, name, desc := f.code, f.name, f.desc
	s.trtList.OnSelected = func(i widget.ListItemID) {
		if s.trtMsg != nil {
			s.trtMsg.SetText("")
		}
		s.trtSel = i
		tr := s.t().Treatments[i]
		code.SetText(tr.Code)
		name.SetText(tr.Name)
		desc.SetText(tr.Description)
		f.role.SetSelected(roleLabel(tr.Role))
		f.rate.SetText(boundText(tr.Rate))
		f.rateUnit.SetText(tr.RateUnit)
		s.trtButtons()
	}
	s.trtList.OnUnselected = func(widget.ListItemID) {
		s.trtSel = -1
		s.trtButtons()
	}
	form := widget.NewForm(
		widget.NewFormItem("Code", code),
		widget.NewFormItem("Name", name),
		widget.NewFormItem("Description", desc),
		widget.NewFormItem("Role", f.role),
		widget.NewFormItem("Rate", f.rate),
		widget.NewFormItem("Rate unit", f.rateUnit),
	)
	fromForm := func(base trial.Treatment) (trial.Treatment, bool) {
		base.Code = strings.TrimSpace(code.Text)
		base.Name = strings.TrimSpace(name.Text)
		base.Description = desc.Text
		base.Role = roleOf(f.role.Selected)
		rate, err := rateFromText(f.rate.Text)
		if err != nil {
			s.trtProblem(err.Error())
			return base, false
		}
		base.Rate = rate
		base.RateUnit = strings.TrimSpace(f.rateUnit.Text)
		return base, true
	}
	addTreatment := func() {
		tr, ok := fromForm(trial.Treatment{})
		if !ok {
			return
		}
		if tr.Code == "" {
			tr.Code = s.nextCode()
		}
		if s.structural("The treatment could not be added", func(t *trial.Trial) error { return t.AddTreatment(tr) }) {
			// An empty form for the next one, so that names typed one
			// after another never run together.
			s.clearTreatmentForm()
			s.u.win.Canvas().Focus(name)
		}
	}
	f.add = widget.NewButtonWithIcon("Add", theme.ContentAddIcon(), addTreatment)
	// Enter in the name adds a new treatment; with one selected it
	// applies the changes instead.
	name.OnSubmitted = func(string) {
		if s.trtSel >= 0 {
			f.apply.OnTapped()
			return
		}
		addTreatment()
	}
	code.OnSubmitted = name.OnSubmitted // Enter in the code does the same
	f.apply = widget.NewButtonWithIcon("Apply changes", theme.ConfirmIcon(), func() {
		if s.trtSel < 0 || s.trtSel >= len(s.t().Treatments) {
			return
		}
		old := s.t().Treatments[s.trtSel]
		nu, ok := fromForm(old)
		if !ok {
			return
		}
		if sameTreatment(nu, old) {
			s.trtMsg.Importance = widget.SuccessImportance
			s.trtMsg.SetText("Nothing to change: the form holds the treatment as it is.")
			return
		}
		if s.structural("The treatment could not be changed", func(t *trial.Trial) error { return t.UpdateTreatment(old.Code, nu) }) {
			s.trtMsg.Importance = widget.SuccessImportance
			s.trtMsg.SetText(treatmentChange(old, nu) + " Undo (Ctrl+Z) takes it back.")
		}
	})
	f.remove = widget.NewButtonWithIcon("Remove", theme.ContentRemoveIcon(), func() {
		if s.trtSel < 0 || s.trtSel >= len(s.t().Treatments) {
			return
		}
		c := s.t().Treatments[s.trtSel].Code
		if s.structural("The treatment could not be removed", func(t *trial.Trial) error { return t.RemoveTreatment(c) }) {
			s.trtList.UnselectAll()
			s.clearTreatmentForm()
		}
	})
	move := func(d int) func() {
		return func() {
			i := s.trtSel
			if i < 0 || i+d < 0 || i+d >= len(s.t().Treatments) {
				return
			}
			c := s.t().Treatments[i].Code
			if s.structural("The treatment could not be moved", func(t *trial.Trial) error { return t.MoveTreatment(c, i+d) }) {
				s.trtList.Select(i + d)
			}
		}
	}
	f.up = widget.NewButtonWithIcon("Up", theme.MoveUpIcon(), move(-1))
	f.down = widget.NewButtonWithIcon("Down", theme.MoveDownIcon(), move(1))
	up, down, add, update, remove := f.up, f.down, f.add, f.apply, f.remove
	paste := widget.NewButtonWithIcon("Paste list", theme.ContentPasteIcon(), func() {
		s.pasteTreatments(s.u.app.Clipboard().Content())
	})
	s.paste = paste
	s.fac = newFactorEditor(s)
	s.trtButtons()
	help := widget.NewLabel("Paste list adds the names on the clipboard: one per line, or code and name separated by a tab (two columns copied from a spreadsheet).")
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	s.trtMsg = widget.NewLabel("")
	s.trtMsg.Wrapping = fyne.TextWrapWord
	s.trtMsg.Importance = widget.SuccessImportance
	right := container.NewVBox(s.fac.object(), form, container.NewHBox(add, update, remove), container.NewHBox(up, down, paste), s.trtMsg, help)
	split := container.NewHSplit(s.trtList, container.NewVScroll(right))
	split.Offset = 0.4
	return split
}

// treatmentForm holds the Treatments tab's form and buttons.
type treatmentForm struct {
	code, name, desc             *widget.Entry
	role                         *widget.RadioGroup // roleLabels
	rate, rateUnit               *widget.Entry
	add, apply, remove, up, down *widget.Button
}

// clearTreatmentForm empties the form, ready for a new treatment.
func (s *treatmentsTab) clearTreatmentForm() {
	f := &s.trtForm
	f.code.SetText("")
	f.name.SetText("")
	f.desc.SetText("")
	f.role.SetSelected(roleLabels[0])
	f.rate.SetText("")
	f.rateUnit.SetText("")
}

// trtProblem shows why the form was refused, under the buttons.
func (s *treatmentsTab) trtProblem(msg string) {
	s.trtMsg.Importance = widget.DangerImportance
	s.trtMsg.SetText(msg)
}

// rateFromText reads a typed rate: empty is no rate; a number with a
// decimal point or comma; anything else is refused in words. A rate is
// not negative.
func rateFromText(text string) (*float64, error) {
	text = strings.TrimSpace(text)
	if text == "" {
		return nil, nil
	}
	v, err := trial.ParseNumber(text, trial.PointOrComma)
	if err != nil {
		return nil, fmt.Errorf("the rate “%s” is not a number: type it as a number, for example 120 or 2,5, and its unit in the next field", text)
	}
	if v < 0 {
		return nil, fmt.Errorf("the rate %s is below 0: a rate applied or sown is 0 or more", text)
	}
	return &v, nil
}

// rateText is a treatment's rate with its unit, "" without one.
func rateText(tr trial.Treatment) string {
	if tr.Rate == nil {
		return ""
	}
	return strings.TrimSpace(strconv.FormatFloat(*tr.Rate, 'f', -1, 64) + " " + tr.RateUnit)
}

// sameTreatment compares two treatments by value (the rate by its number).
func sameTreatment(a, b trial.Treatment) bool { return a.Equal(b) }

// trtButtons enables the buttons that act on a selected treatment only
// while one is selected, and Up and Down only where the move is possible.
func (s *treatmentsTab) trtButtons() {
	f := &s.trtForm
	if f.apply == nil {
		return
	}
	n := len(s.t().Treatments)
	if s.trtSel >= n {
		s.trtSel = -1
	}
	sel := s.trtSel >= 0
	enable := func(b *widget.Button, on bool) {
		if on {
			b.Enable()
		} else {
			b.Disable()
		}
	}
	// The treatments of a factorial trial are its factors' combinations:
	// they can be named or made the check, not added, removed or moved.
	list := !s.t().Factorial() && (s.fac == nil || !s.fac.wantFactor)
	enable(f.apply, sel)
	enable(f.remove, sel && list)
	enable(f.up, sel && s.trtSel > 0 && list)
	enable(f.down, sel && s.trtSel < n-1 && list)
	enable(f.add, list)
	if s.paste != nil {
		enable(s.paste, list)
	}
	if list {
		f.code.Enable()
	} else {
		f.code.Disable()
	}
}

// nextCode proposes an unused code T01, T02, ...
func (s *treatmentsTab) nextCode() string {
	for i := len(s.t().Treatments) + 1; ; i++ {
		c := fmt.Sprintf("T%02d", i)
		if s.t().Treatment(c) == nil {
			return c
		}
	}
}

// parseTreatmentList reads pasted text: one name per line, or code and
// name separated by a tab. Empty lines are skipped; codes are proposed by
// next for lines without one.
func parseTreatmentList(text string, next func(i int) string) []trial.Treatment {
	var out []trial.Treatment
	for _, line := range strings.Split(strings.ReplaceAll(text, "\r\n", "\n"), "\n") {
		line = strings.TrimSpace(line)
		if line == "" {
			continue
		}
		var tr trial.Treatment
		tr.Role = trial.RoleEntry
		if code, name, ok := strings.Cut(line, "\t"); ok {
			tr.Code, tr.Name = strings.TrimSpace(code), strings.TrimSpace(name)
			if i := strings.IndexByte(tr.Name, '\t'); i >= 0 {
				tr.Name = strings.TrimSpace(tr.Name[:i])
			}
		} else {
			tr.Name = line
		}
		if tr.Code == "" {
			tr.Code = next(len(out))
		}
		out = append(out, tr)
	}
	return out
}

// pasteTreatments adds every treatment in text as one edit.
func (s *treatmentsTab) pasteTreatments(text string) {
	base := len(s.t().Treatments)
	list := parseTreatmentList(text, func(i int) string {
		for n := base + i + 1; ; n++ {
			c := fmt.Sprintf("T%02d", n)
			if s.t().Treatment(c) == nil {
				return c
			}
		}
	})
	if len(list) == 0 {
		dialog.ShowInformation("Nothing to paste", "The clipboard holds no names. Copy a column of names (or code and name columns) from a spreadsheet first.", s.u.win)
		return
	}
	s.structural("The treatments could not be added", func(t *trial.Trial) error {
		for _, tr := range list {
			if err := t.AddTreatment(tr); err != nil {
				return fmt.Errorf("%s: %w", tr.Code, err)
			}
		}
		return nil
	})
}

func (s *treatmentsTab) t() *trial.Trial { return s.u.doc.t }

// structural applies a change as one undoable edit (see App.structuralEdit).
func (s *treatmentsTab) structural(action string, f func(t *trial.Trial) error) bool {
	return s.u.structuralEdit(editLabel(action), action, f)
}

// treatmentChange says in one sentence what an edit of a treatment
// changed: "T02: code is now B2, name is now Brisk, now the check."
func treatmentChange(old, nu trial.Treatment) string {
	var parts []string
	if nu.Code != old.Code {
		parts = append(parts, "code is now "+nu.Code)
	}
	if nu.Name != old.Name {
		parts = append(parts, "name is now “"+nu.Name+"”")
	}
	if nu.Description != old.Description {
		parts = append(parts, "description changed")
	}
	if rateText(nu) != rateText(old) {
		if nu.Rate == nil {
			parts = append(parts, "no rate")
		} else {
			parts = append(parts, "rate is now "+rateText(nu))
		}
	}
	if nu.Role != old.Role {
		if nu.Role == trial.RoleCheck {
			parts = append(parts, "now the check")
		} else {
			parts = append(parts, "no longer a check")
		}
	}
	if len(parts) == 0 {
		return "Treatment " + old.Code + " changed."
	}
	return "Treatment " + old.Code + ": " + strings.Join(parts, ", ") + "."
}

// roleLabels are the treatment roles offered, in the order of roleValues:
// an entry, the check (the standard the others are compared with) and the
// untreated check (the control of a crop-protection trial, against which
// percent efficacy is worked out; a check too).
var (
	roleLabels = []string{"Entry", "Check (the standard)", "Untreated check (for % efficacy)"}
	roleValues = []trial.Role{trial.RoleEntry, trial.RoleCheck, trial.RoleUntreated}
)

func roleLabel(r trial.Role) string {
	for i, v := range roleValues {
		if v == r {
			return roleLabels[i]
		}
	}
	return roleLabels[0]
}

func roleOf(label string) trial.Role {
	for i, l := range roleLabels {
		if l == label {
			return roleValues[i]
		}
	}
	return trial.RoleEntry
}
