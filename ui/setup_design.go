package ui

import (
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// designTab is the Setup step's Design tab: the kind of design and the
// number of replicates.
type designTab struct {
	u       *App
	content fyne.CanvasObject

	designSel  *widget.RadioGroup
	reps       *widget.Entry
	mainSel    *widget.Select // the main-plot (or horizontal-strip) factor
	subSel     *widget.Select // the subplot factor of a split-split plot
	mainItem   *widget.FormItem
	subItem    *widget.FormItem
	form       *widget.Form
	designMsg  *widget.Label
	designDone *widget.Label // what Apply design changed
	plan       *planPanel    // what the design chosen can detect (setup_plan.go)
}

// designExplain says in one line what each design is for.
var designExplain = map[trial.DesignKind]string{
	trial.CRD:       "Completely randomised: every plot gets a treatment at random. For uniform ground, pots or glasshouse benches.",
	trial.RCBD:      "Randomised complete blocks: each block holds every treatment once, randomised within the block. For fields with a slope or gradient: lay blocks across it.",
	trial.Latin:     fmt.Sprintf("Latin square: each treatment once in every field row and every column. For gradients in two directions; needs as many replicates as treatments (%d to %d treatments).", trial.MinLatin, trial.MaxLatin),
	trial.SplitPlot: "Split plot: in each block the levels of the main-plot factor go on large main plots at random, and the other factor's levels on subplots side by side within each main plot, at random. For a factor that needs big plots (tillage, irrigation, sowing date); its comparisons are less precise than the subplot factor's. A third factor goes on sub-subplots.",
	trial.StripPlot: "Strip plot: in each block one factor's levels lie in strips across the block (one field row each) and the other's in strips along it (one field column each), both at random. For two factors that both need machinery passes the length of the block; the interaction is the most precise comparison.",
}

// designKinds are the designs offered, labelled by designLabels.
var designKinds = trial.DesignKinds()

var designLabels = func() []string {
	l := make([]string, len(designKinds))
	for i, k := range designKinds {
		l[i] = k.Title()
	}
	return l
}()

// newDesignTab builds the tab.
func newDesignTab(u *App) *designTab {
	s := &designTab{u: u}
	s.content = s.build()
	return s
}

func (s *designTab) build() fyne.CanvasObject {
	s.designMsg = widget.NewLabel("")
	s.designMsg.Wrapping = fyne.TextWrapWord
	s.designDone = widget.NewLabel("")
	s.designDone.Wrapping = fyne.TextWrapWord
	s.designDone.Importance = widget.SuccessImportance
	s.designSel = widget.NewRadioGroup(designLabels, nil)
	// A second click on the chosen design must not unset it.
	s.designSel.Required = true
	s.designSel.OnChanged = func(l string) {
		if i := slices.Index(designLabels, l); i >= 0 {
			s.designMsg.SetText(designExplain[designKinds[i]])
			s.showFactorPlaces(designKinds[i])
			s.reps.Enable()
			if designKinds[i] == trial.Latin {
				s.reps.SetText(strconv.Itoa(len(s.t().Treatments)))
				s.reps.Disable()
			}
		}
		s.plan.update()
	}
	s.reps = widget.NewEntry()
	s.reps.Validator = func(v string) error {
		n, err := strconv.Atoi(strings.TrimSpace(v))
		if err != nil || n < 2 {
			return errors.New("at least 2 replicates")
		}
		return nil
	}
	s.reps.OnChanged = func(string) { s.plan.update() }
	s.plan = newPlanPanel(s)
	apply := widget.NewButtonWithIcon("Apply design", theme.ConfirmIcon(), s.applyDesign)
	apply.Importance = widget.HighImportance
	s.mainSel = widget.NewSelect(nil, nil)
	s.subSel = widget.NewSelect(nil, nil)
	s.mainItem = widget.NewFormItem("Main plots", s.mainSel)
	s.subItem = widget.NewFormItem("Subplots", s.subSel)
	form := widget.NewForm(widget.NewFormItem("Design", s.designSel), widget.NewFormItem("Replicates", s.reps), s.mainItem, s.subItem)
	s.form = form
	left := container.NewVScroll(container.NewPadded(container.NewVBox(form, s.designMsg, container.NewHBox(apply), s.designDone)))
	split := container.NewHSplit(left, container.NewVScroll(container.NewPadded(s.plan.content)))
	split.Offset = 0.45
	return split
}

// applyDesign sets the design chosen in the Design tab.
func (s *designTab) applyDesign() {
	i := slices.Index(designLabels, s.designSel.Selected)
	if i < 0 {
		return
	}
	n, err := strconv.Atoi(strings.TrimSpace(s.reps.Text))
	if err != nil {
		dialog.ShowInformation("Replicates", "Type the number of replicates as a whole number, for example 4.", s.u.win)
		return
	}
	d := trial.Design{Kind: designKinds[i], Reps: n}
	d.MainFactor, d.SubFactor = s.factorPlaces(d.Kind)
	if d.Kind == trial.Latin {
		d.Reps = len(s.t().Treatments)
	}
	if d == s.t().Design {
		s.designDone.SetText("Nothing to change: the trial is already a " + d.Describe() + ".")
		return
	}
	hadPlots := len(s.t().Plots) > 0
	if !s.structural("The design could not be changed", func(t *trial.Trial) error { return t.SetDesign(d) }) {
		s.designDone.SetText("")
		return
	}
	msg := "Design changed to a " + d.Describe() + "."
	switch {
	case len(s.t().Plots) > 0:
		msg += fmt.Sprintf(" The %s are laid out again in standard order: randomise them in the Field step before sowing.", plural(len(s.t().Plots), "plot", "plots"))
	case hadPlots:
		msg += " The plots were removed: the trial cannot be laid out until the Setup step is complete."
	}
	s.designDone.SetText(msg + " Undo (Ctrl+Z) takes it back.")
}

func (s *designTab) loadDesign() {
	d := s.t().Design
	s.offerDesigns()
	s.loadFactorPlaces()
	if i := slices.Index(designKinds, d.Kind); i >= 0 {
		s.designSel.SetSelected(designLabels[i])
	}
	s.showFactorPlaces(d.Kind)
	s.reps.SetText(strconv.Itoa(d.Reps))
	if d.Kind == trial.Latin {
		s.reps.Disable()
	}
	s.plan.update()
}

func (s *designTab) t() *trial.Trial { return s.u.doc.t }

// structural applies a change as one undoable edit (see App.structuralEdit).
func (s *designTab) structural(action string, f func(t *trial.Trial) error) bool {
	return s.u.structuralEdit(editLabel(action), action, f)
}
