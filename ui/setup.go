package ui

import (
	"errors"
	"fmt"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// setupStep edits the trial's details, treatments, design and traits:
// one tab each (setup_details.go, setup_treatments.go, setup_design.go,
// setup_traits.go), and a line under them with what the trial still
// lacks. The tabs are embedded so that the step reads as one form.
type setupStep struct {
	u        *App
	root     fyne.CanvasObject
	problems *widget.Label

	*detailsTab
	*treatmentsTab
	*designTab
	*traitsTab
	log *logTab
}

func newSetupStep(u *App) *setupStep {
	s := &setupStep{u: u,
		detailsTab:    newDetailsTab(u),
		treatmentsTab: newTreatmentsTab(u),
		designTab:     newDesignTab(u),
		traitsTab:     newTraitsTab(u),
		log:           newLogTab(u),
	}
	tabs := container.NewAppTabs(
		container.NewTabItem("Details", s.detailsTab.content),
		container.NewTabItem("Treatments", s.treatmentsTab.content),
		container.NewTabItem("Design", s.designTab.content),
		container.NewTabItem("Traits", s.traitsTab.content),
		container.NewTabItem("Log", s.log.content),
	)
	s.problems = widget.NewLabel("")
	s.problems.Wrapping = fyne.TextWrapWord
	s.problems.Importance = widget.WarningImportance
	s.root = container.NewBorder(nil, s.problems, nil, nil, tabs)
	s.refresh(changeAll)
	return s
}

func (s *setupStep) object() fyne.CanvasObject { return s.root }
func (s *setupStep) t() *trial.Trial           { return s.u.doc.t }

// refresh reloads the controls from the trial.
func (s *setupStep) refresh(c change) {
	t := s.t()
	if c&(changeDetails|changeFile) != 0 && c != changeDetails {
		s.detailsTab.load(t)
	}
	if c&(changeDetails|changeFile|changeStructure) != 0 {
		s.log.load(t)
	}
	if c&changeStructure != 0 {
		s.trtList.Refresh()
		s.fac.load()
		s.trtButtons()
		s.traitList.Refresh()
		s.loadDesign()
		// The form follows the trait it edits (undo, redo, a rename).
		if k := s.tf.editing; k != "" {
			if i := t.TraitIndex(k); i >= 0 {
				s.loadTraitForm(&t.Traits[i])
			} else {
				s.traitSel = -1
				s.traitList.UnselectAll()
				s.loadTraitForm(nil)
			}
		}
	}
	s.problems.SetText(s.problemText())
}

// problemText summarises what Validate finds, in a few lines.
func (s *setupStep) problemText() string {
	t := s.t()
	if len(t.Treatments) == 0 {
		return "Add the treatments of the trial (at least two)."
	}
	if err := t.Validate(); err != nil {
		var list trial.ValidationErrors
		if errors.As(err, &list) && len(list) > 0 {
			lines := []string{}
			for i, e := range list {
				if i == 4 {
					lines = append(lines, fmt.Sprintf("… and %d more", len(list)-4))
					break
				}
				lines = append(lines, "• "+e.Msg)
			}
			return strings.Join(lines, "\n")
		}
		return explain("The trial is not complete", err).What
	}
	if len(t.Traits) == 0 {
		return "Add the traits you will measure on every plot."
	}
	return ""
}

// structuralEdit runs f on a copy of the trial and, when it succeeds,
// replaces the trial with it as one undoable edit; a refusal is shown in
// a dialog.
func (u *App) structuralEdit(label, action string, f func(t *trial.Trial) error) bool {
	if err := u.tryStructural(label, f); err != nil {
		showError(u.win, "Could not change the trial", action, err)
		return false
	}
	return true
}

// tryStructural is structuralEdit that returns the refusal instead of
// showing it.
func (u *App) tryStructural(label string, f func(t *trial.Trial) error) error {
	before := cloneTrial(u.doc.t)
	work := cloneTrial(u.doc.t)
	if err := f(work); err != nil {
		return err
	}
	u.doc.apply(&replaceTrial{what: label, before: before, after: work, c: changeStructure | changeValues, keepDetails: true})
	return nil
}

// editLabel names an edit for the undo history from the sentence that
// would report its refusal: "The treatment could not be added" gives
// "treatment added".
func editLabel(action string) string {
	what, how, ok := strings.Cut(strings.TrimPrefix(action, "The "), " could not be ")
	if !ok {
		return "setup change"
	}
	return what + " " + how
}
