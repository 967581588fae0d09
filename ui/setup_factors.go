package ui

import (
	"fmt"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// The treatment structures the Treatments tab offers.
const (
	structureList    = "One list of treatments"
	structureFactors = "Factors with levels (every combination is a treatment)"
)

// newFactorLabel is the factor choice that starts a new factor.
const newFactorLabel = "New factor…"

// factorEditor is the part of the Treatments tab that chooses the
// treatment structure and edits the factors of a factorial trial.
type factorEditor struct {
	s          *treatmentsTab
	structure  *widget.RadioGroup
	box        *fyne.Container // the factor form, shown for factors
	sel        *widget.Select
	key, name  *widget.Entry
	levels     *widget.Entry
	add, apply *widget.Button
	remove     *widget.Button
	summary    *widget.Label
	msg        *widget.Label
	wantFactor bool // factors chosen, none entered yet
	loading    bool
}

// newFactorEditor builds the structure choice and the factor form.
func newFactorEditor(s *treatmentsTab) *factorEditor {
	e := &factorEditor{s: s}
	e.structure = widget.NewRadioGroup([]string{structureList, structureFactors}, e.chooseStructure)
	e.structure.Required = true
	e.sel = widget.NewSelect(nil, func(string) { e.loadForm() })
	e.key = widget.NewEntry()
	e.key.SetPlaceHolder("short key, e.g. N or V")
	e.name = widget.NewEntry()
	e.name.SetPlaceHolder("name, e.g. Nitrogen rate")
	e.levels = widget.NewEntry()
	e.levels.SetPlaceHolder("e.g. 0,60,120 kg N/ha  or  V1=Amberline,V2,V3")
	e.add = widget.NewButtonWithIcon("Add factor", theme.ContentAddIcon(), e.addFactor)
	e.apply = widget.NewButtonWithIcon("Apply to factor", theme.ConfirmIcon(), e.applyFactor)
	e.remove = widget.NewButtonWithIcon("Remove factor", theme.ContentRemoveIcon(), e.removeFactor)
	e.summary = widget.NewLabel("")
	e.summary.Wrapping = fyne.TextWrapWord
	e.summary.TextStyle = fyne.TextStyle{Bold: true}
	e.msg = widget.NewLabel("")
	e.msg.Wrapping = fyne.TextWrapWord
	help := widget.NewLabel("Levels: codes separated by commas, a name after '=' (V1=Amberline). Numbers are rates: 0,60,120 kg N/ha gives levels N0, N60, N120 of factor N. Two or three factors are crossed; each combination (N60-V1, …) is one treatment, listed on the left, where it can be named or made the check.")
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	form := widget.NewForm(
		widget.NewFormItem("Factor", e.sel),
		widget.NewFormItem("Key", e.key),
		widget.NewFormItem("Name", e.name),
		widget.NewFormItem("Levels", e.levels),
	)
	e.box = container.NewVBox(form, container.NewHBox(e.add, e.apply, e.remove), e.msg, e.summary, help, widget.NewSeparator())
	return e
}

// object is what the tab shows: the structure choice, and the factor form
// for factors.
func (e *factorEditor) object() fyne.CanvasObject {
	return container.NewVBox(heading("Treatment structure"), e.structure, e.box)
}

func (e *factorEditor) t() *trial.Trial { return e.s.t() }

// load shows the trial's structure and factors.
func (e *factorEditor) load() {
	t := e.t()
	e.loading = true
	defer func() { e.loading = false }()
	if t.Factorial() {
		e.wantFactor = false
	}
	if t.Factorial() || e.wantFactor {
		e.structure.SetSelected(structureFactors)
		e.box.Show()
	} else {
		e.structure.SetSelected(structureList)
		e.box.Hide()
	}
	opts := make([]string, 0, len(t.Factors)+1)
	for i := range t.Factors {
		opts = append(opts, factorLabel(&t.Factors[i]))
	}
	if len(t.Factors) < trial.MaxFactors {
		opts = append(opts, newFactorLabel)
	}
	keep := e.sel.SelectedIndex()
	e.sel.Options = opts
	if keep < 0 || keep >= len(opts) {
		keep = 0 // the first factor, or "New factor…" when there is none
	}
	e.sel.SetSelectedIndex(keep)
	e.sel.Refresh()
	e.loadForm()
	e.summary.SetText(factorSummary(t))
	e.s.trtButtons()
}

// loadForm puts the chosen factor into the form (empty for a new one).
func (e *factorEditor) loadForm() {
	t := e.t()
	i := e.sel.SelectedIndex()
	if i >= 0 && i < len(t.Factors) {
		f := t.Factors[i]
		e.key.SetText(f.Key)
		e.name.SetText(f.Name)
		e.levels.SetText(trial.FormatLevels(f))
		e.add.Disable()
		e.apply.Enable()
		e.remove.Enable()
		return
	}
	e.key.SetText("")
	e.name.SetText("")
	e.levels.SetText("")
	if len(t.Factors) < trial.MaxFactors {
		e.add.Enable()
	} else {
		e.add.Disable()
	}
	e.apply.Disable()
	e.remove.Disable()
}

// chooseStructure switches between one list and factors.
func (e *factorEditor) chooseStructure(choice string) {
	if e.loading {
		return
	}
	t := e.t()
	switch choice {
	case structureFactors:
		if !t.Factorial() {
			e.wantFactor = true
			e.box.Show()
			e.say("Enter the first factor and its levels, then Add factor. The treatments become the combinations of the factors' levels (Undo takes it back).", widget.MediumImportance)
			e.s.trtButtons()
		}
	case structureList:
		e.wantFactor = false
		if t.Factorial() {
			d := t.Design
			d.MainFactor, d.SubFactor = "", ""
			if !e.s.structural("The treatment structure could not be changed", func(t *trial.Trial) error { return t.SetPlan(nil, d) }) {
				e.load() // back to factors
				return
			}
			e.s.trtMsg.Importance = widget.SuccessImportance
			e.s.trtMsg.SetText("The combinations are now one list of treatments. Undo (Ctrl+Z) takes it back.")
		}
		e.box.Hide()
		e.s.trtButtons()
	}
}

// fromForm reads the factor form.
func (e *factorEditor) fromForm() (trial.Factor, error) {
	f := trial.Factor{Key: strings.TrimSpace(e.key.Text), Name: strings.TrimSpace(e.name.Text)}
	if err := trial.CheckFactorKey(f.Key); err != nil {
		return f, err
	}
	ls, err := trial.ParseLevels(f.Key, e.levels.Text)
	if err != nil {
		return f, err
	}
	f.Levels = ls
	return f, nil
}

// setFactors applies a new factor list as one undoable edit and says what
// it did.
func (e *factorEditor) setFactors(action string, fs []trial.Factor, done string) {
	refused := e.s.u.tryStructural(editLabel(action), func(t *trial.Trial) error { return t.SetFactors(fs) })
	if refused != nil {
		e.say(explain(action, refused).What, widget.DangerImportance)
		return
	}
	e.wantFactor = false
	e.say(done+" Undo (Ctrl+Z) takes it back.", widget.SuccessImportance)
}

func (e *factorEditor) say(msg string, imp widget.Importance) {
	e.msg.Importance = imp
	e.msg.SetText(msg)
}

func (e *factorEditor) addFactor() {
	f, err := e.fromForm()
	if err != nil {
		e.say(err.Error(), widget.DangerImportance)
		return
	}
	fs := append(cloneFactorList(e.t().Factors), f)
	e.setFactors("The factor could not be added", fs, fmt.Sprintf("Factor %s added with %d levels.", f.Key, len(f.Levels)))
}

func (e *factorEditor) applyFactor() {
	i := e.sel.SelectedIndex()
	fs := cloneFactorList(e.t().Factors)
	if i < 0 || i >= len(fs) {
		return
	}
	f, err := e.fromForm()
	if err != nil {
		e.say(err.Error(), widget.DangerImportance)
		return
	}
	fs[i] = f
	e.setFactors("The factor could not be changed", fs, fmt.Sprintf("Factor %s changed.", f.Key))
}

func (e *factorEditor) removeFactor() {
	i := e.sel.SelectedIndex()
	fs := cloneFactorList(e.t().Factors)
	if i < 0 || i >= len(fs) {
		return
	}
	key := fs[i].Key
	fs = append(fs[:i], fs[i+1:]...)
	e.sel.SetSelectedIndex(max(i-1, 0))
	e.setFactors("The factor could not be removed", fs, fmt.Sprintf("Factor %s removed.", key))
}

// cloneFactorList copies a factor list so that an edit never touches the
// trial's own.
func cloneFactorList(fs []trial.Factor) []trial.Factor {
	out := make([]trial.Factor, len(fs))
	for i, f := range fs {
		f.Levels = append([]trial.Level(nil), f.Levels...)
		out[i] = f
	}
	return out
}

// factorSummary says what the factors make: "N (3 levels) × V (2
// levels) = 6 combinations".
func factorSummary(t *trial.Trial) string {
	if !t.Factorial() {
		return ""
	}
	parts := make([]string, len(t.Factors))
	for i, f := range t.Factors {
		parts[i] = fmt.Sprintf("%s (%s)", f.Key, plural(len(f.Levels), "level", "levels"))
	}
	lines := []string{strings.Join(parts, " × ") + " = " + plural(len(t.Treatments), "combination", "combinations")}
	for i := range t.Factors {
		f := &t.Factors[i]
		levels := make([]string, len(f.Levels))
		for k, l := range f.Levels {
			levels[k] = l.Code
			if l.Name != "" && l.Name != l.Code {
				levels[k] += " " + l.Name
			}
		}
		lines = append(lines, factorLabel(f)+": "+strings.Join(levels, ", "))
	}
	return strings.Join(lines, "\n")
}
