package ui

import (
	"errors"
	"fmt"
	"math"
	"slices"
	"sort"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// setupStep edits the trial's details, treatments, design and traits.
type setupStep struct {
	u    *App
	root fyne.CanvasObject

	// details
	title, season, site, lat, lon, soil, prev, investigator *widget.Entry
	crop                                                    *widget.SelectEntry
	objective, notes                                        *widget.Entry
	problems                                                *widget.Label
	loading                                                 bool

	// treatments
	trtList *widget.List
	trtSel  int
	trtForm treatmentForm

	// design
	designSel *widget.RadioGroup
	reps      *widget.Entry
	designMsg *widget.Label

	// traits
	traitList *widget.List
	traitSel  int
	tf        *traitForm
}

// designExplain says in one line what each design is for.
var designExplain = map[trial.DesignKind]string{
	trial.CRD:   "Completely randomised: every plot gets a treatment at random. For uniform ground, pots or glasshouse benches.",
	trial.RCBD:  "Randomised complete blocks: each block holds every treatment once, randomised within the block. For fields with a slope or gradient: lay blocks across it.",
	trial.Latin: "Latin square: each treatment once in every field row and every column. For gradients in two directions; needs as many replicates as treatments (4 to 8).",
}

var designLabels = []string{"Completely randomised (CRD)", "Randomised complete blocks (RCBD)", "Latin square"}
var designKinds = []trial.DesignKind{trial.CRD, trial.RCBD, trial.Latin}

func newSetupStep(u *App) *setupStep {
	s := &setupStep{u: u, trtSel: -1, traitSel: -1}
	tabs := container.NewAppTabs(
		container.NewTabItem("Details", s.detailsTab()),
		container.NewTabItem("Treatments", s.treatmentsTab()),
		container.NewTabItem("Design", s.designTab()),
		container.NewTabItem("Traits", s.traitsTab()),
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

func (s *setupStep) detailsTab() fyne.CanvasObject {
	edit := func(set func(t *trial.Trial, v string)) func(string) {
		return func(v string) {
			if s.loading {
				return
			}
			set(s.t(), v)
			s.u.doc.edited(changeDetails)
		}
	}
	entry := func(ph string, set func(*trial.Trial, string)) *widget.Entry {
		e := widget.NewEntry()
		e.SetPlaceHolder(ph)
		e.OnChanged = edit(set)
		return e
	}
	s.title = entry("for example Spring wheat entries, north field", func(t *trial.Trial, v string) { t.Title = v })
	s.title.Validator = func(v string) error {
		if strings.TrimSpace(v) == "" {
			return errors.New("give the trial a title")
		}
		return nil
	}
	crops := make([]string, 0, len(trial.CropDefaults))
	for k := range trial.CropDefaults {
		crops = append(crops, k)
	}
	sort.Strings(crops)
	s.crop = widget.NewSelectEntry(crops)
	s.crop.SetPlaceHolder("choose or type a crop")
	s.crop.OnChanged = edit(func(t *trial.Trial, v string) { t.Crop = v })
	s.season = entry("for example 2026 or 2026/27", func(t *trial.Trial, v string) { t.Season = v })
	s.site = entry("farm and field", func(t *trial.Trial, v string) { t.Site.Name = v })
	coord := func(ph string, lim float64, set func(*trial.Trial, *float64)) *widget.Entry {
		e := widget.NewEntry()
		e.SetPlaceHolder(ph)
		e.Validator = func(v string) error {
			if strings.TrimSpace(v) == "" {
				return nil
			}
			f, err := strconv.ParseFloat(strings.TrimSpace(v), 64)
			if err != nil || f < -lim || f > lim {
				return fmt.Errorf("a number of decimal degrees between −%g and %g", lim, lim)
			}
			return nil
		}
		e.OnChanged = func(v string) {
			if s.loading {
				return
			}
			v = strings.TrimSpace(v)
			if v == "" {
				set(s.t(), nil)
			} else if f, err := strconv.ParseFloat(v, 64); err == nil && f >= -lim && f <= lim {
				set(s.t(), &f)
			} else {
				return
			}
			s.u.doc.edited(changeDetails)
		}
		return e
	}
	s.lat = coord("latitude, for example 52.123", 90, func(t *trial.Trial, v *float64) { t.Site.Latitude = v })
	s.lon = coord("longitude, for example -1.456", 180, func(t *trial.Trial, v *float64) { t.Site.Longitude = v })
	s.soil = entry("for example silty clay loam", func(t *trial.Trial, v string) { t.Site.Soil = v })
	s.prev = entry("for example oilseed rape", func(t *trial.Trial, v string) { t.Site.PreviousCrop = v })
	s.investigator = entry("who runs the trial", func(t *trial.Trial, v string) { t.Investigator = v })
	s.objective = widget.NewMultiLineEntry()
	s.objective.SetMinRowsVisible(2)
	s.objective.SetPlaceHolder("what the trial should find out")
	s.objective.OnChanged = edit(func(t *trial.Trial, v string) { t.Objective = v })
	s.notes = widget.NewMultiLineEntry()
	s.notes.SetMinRowsVisible(3)
	s.notes.OnChanged = edit(func(t *trial.Trial, v string) { t.Notes = v })
	form := widget.NewForm(
		widget.NewFormItem("Title", s.title),
		widget.NewFormItem("Crop", s.crop),
		widget.NewFormItem("Season", s.season),
		widget.NewFormItem("Site", s.site),
		widget.NewFormItem("Latitude", s.lat),
		widget.NewFormItem("Longitude", s.lon),
		widget.NewFormItem("Soil", s.soil),
		widget.NewFormItem("Previous crop", s.prev),
		widget.NewFormItem("Investigator", s.investigator),
		widget.NewFormItem("Objective", s.objective),
		widget.NewFormItem("Notes", s.notes),
	)
	return container.NewVScroll(container.NewPadded(form))
}

func coordText(p *float64) string {
	if p == nil {
		return ""
	}
	return strconv.FormatFloat(*p, 'f', -1, 64)
}

// refresh reloads the controls from the trial.
func (s *setupStep) refresh(c change) {
	t := s.t()
	if c&(changeDetails|changeFile) != 0 && c != changeDetails {
		s.loading = true
		setIf := func(e interface{ SetText(string) }, cur, v string) {
			if cur != v {
				e.SetText(v)
			}
		}
		setIf(s.title, s.title.Text, t.Title)
		setIf(s.crop, s.crop.Text, t.Crop)
		setIf(s.season, s.season.Text, t.Season)
		setIf(s.site, s.site.Text, t.Site.Name)
		setIf(s.lat, s.lat.Text, coordText(t.Site.Latitude))
		setIf(s.lon, s.lon.Text, coordText(t.Site.Longitude))
		setIf(s.soil, s.soil.Text, t.Site.Soil)
		setIf(s.prev, s.prev.Text, t.Site.PreviousCrop)
		setIf(s.investigator, s.investigator.Text, t.Investigator)
		setIf(s.objective, s.objective.Text, t.Objective)
		setIf(s.notes, s.notes.Text, t.Notes)
		s.loading = false
	}
	if c&changeStructure != 0 {
		s.trtList.Refresh()
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

// ---- treatments ----

func (s *setupStep) treatmentsTab() fyne.CanvasObject {
	s.trtList = widget.NewList(
		func() int { return len(s.t().Treatments) },
		func() fyne.CanvasObject {
			return container.NewHBox(widget.NewLabelWithStyle("CODE", fyne.TextAlignLeading, fyne.TextStyle{Monospace: true}), widget.NewLabel("name"), widget.NewLabel(""))
		},
		func(i widget.ListItemID, o fyne.CanvasObject) {
			tr := s.t().Treatments[i]
			row := o.(*fyne.Container)
			row.Objects[0].(*widget.Label).SetText(fmt.Sprintf("%-6s", tr.Code))
			row.Objects[1].(*widget.Label).SetText(tr.Name)
			role := ""
			if tr.Role == trial.RoleCheck {
				role = "check"
			}
			row.Objects[2].(*widget.Label).SetText(role)
		})
	f := &s.trtForm
	f.code = widget.NewEntry()
	f.code.SetPlaceHolder("short code, e.g. T01")
	f.name = widget.NewEntry()
	f.name.SetPlaceHolder("name")
	f.desc = widget.NewEntry()
	f.desc.SetPlaceHolder("description (optional)")
	f.check = widget.NewCheck("Check (the standard the others are compared with)", nil)
	code, name, desc, check := f.code, f.name, f.desc, f.check
	s.trtList.OnSelected = func(i widget.ListItemID) {
		s.trtSel = i
		tr := s.t().Treatments[i]
		code.SetText(tr.Code)
		name.SetText(tr.Name)
		desc.SetText(tr.Description)
		check.SetChecked(tr.Role == trial.RoleCheck)
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
		widget.NewFormItem("", check),
	)
	fromForm := func(base trial.Treatment) trial.Treatment {
		base.Code = strings.TrimSpace(code.Text)
		base.Name = strings.TrimSpace(name.Text)
		base.Description = desc.Text
		base.Role = trial.RoleEntry
		if check.Checked {
			base.Role = trial.RoleCheck
		}
		return base
	}
	addTreatment := func() {
		tr := fromForm(trial.Treatment{})
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
	f.apply = widget.NewButtonWithIcon("Apply changes", theme.ConfirmIcon(), func() {
		if s.trtSel < 0 || s.trtSel >= len(s.t().Treatments) {
			return
		}
		old := s.t().Treatments[s.trtSel]
		s.structural("The treatment could not be changed", func(t *trial.Trial) error { return t.UpdateTreatment(old.Code, fromForm(old)) })
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
	s.trtButtons()
	help := widget.NewLabel("Paste list adds the names on the clipboard: one per line, or code and name separated by a tab (two columns copied from a spreadsheet).")
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	right := container.NewVBox(form, container.NewHBox(add, update, remove), container.NewHBox(up, down, paste), help)
	split := container.NewHSplit(s.trtList, container.NewVScroll(right))
	split.Offset = 0.4
	return split
}

// treatmentForm holds the Treatments tab's form and buttons.
type treatmentForm struct {
	code, name, desc             *widget.Entry
	check                        *widget.Check
	add, apply, remove, up, down *widget.Button
}

// clearTreatmentForm empties the form, ready for a new treatment.
func (s *setupStep) clearTreatmentForm() {
	f := &s.trtForm
	f.code.SetText("")
	f.name.SetText("")
	f.desc.SetText("")
	f.check.SetChecked(false)
}

// trtButtons enables the buttons that act on a selected treatment only
// while one is selected, and Up and Down only where the move is possible.
func (s *setupStep) trtButtons() {
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
	enable(f.apply, sel)
	enable(f.remove, sel)
	enable(f.up, sel && s.trtSel > 0)
	enable(f.down, sel && s.trtSel < n-1)
}

// nextCode proposes an unused code T01, T02, ...
func (s *setupStep) nextCode() string {
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
func (s *setupStep) pasteTreatments(text string) {
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

// structural applies a change that may move plots as one undoable edit on
// a copy, so that a refused change leaves the trial untouched.
func (s *setupStep) structural(action string, f func(t *trial.Trial) error) bool {
	return s.u.structuralEdit("setup change", action, f)
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

// ---- design ----

func (s *setupStep) designTab() fyne.CanvasObject {
	s.designMsg = widget.NewLabel("")
	s.designMsg.Wrapping = fyne.TextWrapWord
	s.designSel = widget.NewRadioGroup(designLabels, nil)
	// A second click on the chosen design must not unset it.
	s.designSel.Required = true
	s.designSel.OnChanged = func(l string) {
		if i := slices.Index(designLabels, l); i >= 0 {
			s.designMsg.SetText(designExplain[designKinds[i]])
			s.reps.Enable()
			if designKinds[i] == trial.Latin {
				s.reps.SetText(strconv.Itoa(len(s.t().Treatments)))
				s.reps.Disable()
			}
		}
	}
	s.reps = widget.NewEntry()
	s.reps.Validator = func(v string) error {
		n, err := strconv.Atoi(strings.TrimSpace(v))
		if err != nil || n < 2 {
			return errors.New("at least 2 replicates")
		}
		return nil
	}
	apply := widget.NewButtonWithIcon("Apply design", theme.ConfirmIcon(), s.applyDesign)
	apply.Importance = widget.HighImportance
	form := widget.NewForm(widget.NewFormItem("Design", s.designSel), widget.NewFormItem("Replicates", s.reps))
	return container.NewVScroll(container.NewPadded(container.NewVBox(form, s.designMsg, container.NewHBox(apply))))
}

// applyDesign sets the design chosen in the Design tab.
func (s *setupStep) applyDesign() {
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
	if d.Kind == trial.Latin {
		d.Reps = len(s.t().Treatments)
	}
	s.structural("The design could not be changed", func(t *trial.Trial) error { return t.SetDesign(d) })
}

func (s *setupStep) loadDesign() {
	d := s.t().Design
	if i := slices.Index(designKinds, d.Kind); i >= 0 {
		s.designSel.SetSelected(designLabels[i])
	}
	s.reps.SetText(strconv.Itoa(d.Reps))
	if d.Kind == trial.Latin {
		s.reps.Disable()
	}
}

// ---- traits ----

var kindLabels = []string{"measurement", "count", "percentage", "score"}
var kindValues = []trial.TraitKind{trial.Continuous, trial.Count, trial.Percent, trial.Score}

// traitForm is the Traits tab's form: it adds a recorded trait, or edits
// the selected one (recorded or derived) through trial.UpdateTrait.
type traitForm struct {
	key, name, unit, minE, maxE, dec *widget.Entry
	kind                             *widget.Select
	higher                           *widget.Check

	// Settings of a derived (adjusted-yield) trait, shown only for one.
	derivedBox       *fyne.Container
	derivedFrom      *widget.Label
	stdMoist, bushel *widget.Entry
	outUnit          *widget.RadioGroup

	msg                *widget.Label
	add, apply, remove *widget.Button
	clear              *widget.Button
	editing            string // key of the trait being edited, "" when adding
}

func (s *setupStep) traitsTab() fyne.CanvasObject {
	s.traitList = widget.NewList(
		func() int { return len(s.t().Traits) },
		func() fyne.CanvasObject {
			l := widget.NewLabel("")
			l.Truncation = fyne.TextTruncateEllipsis
			return l
		},
		func(i widget.ListItemID, o fyne.CanvasObject) {
			if i >= len(s.t().Traits) {
				return
			}
			tr := s.t().Traits[i]
			txt := fmt.Sprintf("%s — %s", tr.Key, traitLabel(&tr))
			if tr.Derived != nil {
				txt += fmt.Sprintf("  (computed from %s and %s at %g %% moisture)", tr.Derived.WeightTrait, tr.Derived.MoistureTrait, tr.Derived.StandardMoisture)
			} else {
				txt += "  · " + kindLabels[max(slices.Index(kindValues, tr.Kind), 0)] + " · " + rangeText(&tr)
			}
			o.(*widget.Label).SetText(txt)
		})
	f := &traitForm{}
	s.tf = f
	f.key = widget.NewEntry()
	f.key.SetPlaceHolder("short key, e.g. ht (used in field books)")
	f.name = widget.NewEntry()
	f.name.SetPlaceHolder("e.g. Plant height")
	f.unit = widget.NewEntry()
	f.unit.SetPlaceHolder("e.g. cm")
	f.kind = widget.NewSelect(kindLabels, nil)
	f.kind.SetSelectedIndex(0)
	f.minE, f.maxE = widget.NewEntry(), widget.NewEntry()
	f.minE.SetPlaceHolder("lowest plausible value (empty: none)")
	f.maxE.SetPlaceHolder("highest plausible value (empty: none)")
	f.dec = widget.NewEntry()
	f.dec.SetText("1")
	f.higher = widget.NewCheck("Higher values are better", nil)
	f.higher.SetChecked(true)

	f.derivedFrom = widget.NewLabel("")
	f.derivedFrom.Wrapping = fyne.TextWrapWord
	f.stdMoist = widget.NewEntry()
	f.bushel = widget.NewEntry()
	f.bushel.SetPlaceHolder("lb per bushel (empty: the crop's default)")
	f.outUnit = widget.NewRadioGroup([]string{trial.UnitTHa, trial.UnitBuAc}, func(u string) {
		if f.editing != "" && f.derivedBox.Visible() && u != "" {
			f.unit.SetText(u)
		}
	})
	f.outUnit.Horizontal = true
	f.derivedBox = container.NewVBox(widget.NewSeparator(), heading("Computed yield"), f.derivedFrom,
		widget.NewForm(widget.NewFormItem("Standard moisture %", f.stdMoist),
			widget.NewFormItem("Yield unit", f.outUnit),
			widget.NewFormItem("Bushel weight (lb)", f.bushel)))
	f.derivedBox.Hide()

	f.msg = widget.NewLabel("")
	f.msg.Wrapping = fyne.TextWrapWord
	f.msg.Importance = widget.DangerImportance

	s.traitList.OnSelected = func(i widget.ListItemID) {
		s.traitSel = i
		if i < len(s.t().Traits) {
			s.loadTraitForm(&s.t().Traits[i])
		}
	}
	f.add = widget.NewButtonWithIcon("Add as new trait", theme.ContentAddIcon(), s.addTrait)
	f.apply = widget.NewButtonWithIcon("Apply changes", theme.ConfirmIcon(), s.applyTrait)
	f.apply.Importance = widget.HighImportance
	f.apply.Disable()
	f.clear = widget.NewButtonWithIcon("New trait", theme.DocumentCreateIcon(), func() {
		s.traitSel = -1
		s.traitList.UnselectAll()
		s.loadTraitForm(nil)
	})
	f.remove = widget.NewButtonWithIcon("Remove selected", theme.ContentRemoveIcon(), func() {
		if s.traitSel < 0 || s.traitSel >= len(s.t().Traits) {
			return
		}
		k := s.t().Traits[s.traitSel].Key
		dialog.ShowConfirm("Remove trait", "Remove the trait "+k+" and every value recorded for it? You can undo this.", func(ok bool) {
			if ok {
				if s.structural("The trait could not be removed", func(t *trial.Trial) error { return t.RemoveTrait(k) }) {
					s.traitSel = -1
					s.traitList.UnselectAll()
					s.loadTraitForm(nil)
				}
			}
		}, s.u.win)
	})
	f.remove.Disable()
	yield := widget.NewButtonWithIcon("Add adjusted yield…", theme.ContentAddIcon(), s.yieldDialog)
	form := widget.NewForm(
		widget.NewFormItem("Key", f.key), widget.NewFormItem("Name", f.name), widget.NewFormItem("Unit", f.unit),
		widget.NewFormItem("Kind", f.kind), widget.NewFormItem("Valid from", f.minE), widget.NewFormItem("Valid to", f.maxE),
		widget.NewFormItem("Decimals", f.dec), widget.NewFormItem("", f.higher),
	)
	help := widget.NewLabel("Select a trait to change it; values outside the valid range are kept and flagged in Record. Adjusted yield is computed from plot weight and grain moisture.")
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	right := container.NewVBox(form, f.derivedBox, f.msg,
		container.NewHBox(f.apply, f.add, f.clear, f.remove), widget.NewSeparator(), yield, help)
	split := container.NewHSplit(s.traitList, container.NewVScroll(right))
	split.Offset = 0.45
	return split
}

// loadTraitForm fills the form from tr, or empties it for a new trait.
func (s *setupStep) loadTraitForm(tr *trial.Trait) {
	f := s.tf
	f.msg.SetText("")
	if tr == nil {
		f.editing = ""
		f.key.SetText("")
		f.name.SetText("")
		f.unit.SetText("")
		f.unit.Enable()
		f.kind.SetSelectedIndex(0)
		f.kind.Enable()
		f.minE.SetText("")
		f.maxE.SetText("")
		f.dec.SetText("1")
		f.higher.SetChecked(true)
		f.derivedBox.Hide()
		f.apply.Disable()
		f.remove.Disable()
		f.add.Enable()
		return
	}
	f.editing = tr.Key
	f.key.SetText(tr.Key)
	f.name.SetText(tr.Name)
	f.unit.SetText(tr.Unit)
	f.kind.SetSelectedIndex(max(slices.Index(kindValues, tr.Kind), 0))
	f.minE.SetText(boundText(tr.Min))
	f.maxE.SetText(boundText(tr.Max))
	f.dec.SetText(strconv.Itoa(tr.Decimals))
	f.higher.SetChecked(tr.HigherBetter)
	f.apply.Enable()
	f.remove.Enable()
	if d := tr.Derived; d != nil {
		f.derivedFrom.SetText(fmt.Sprintf("Computed from %s (plot weight) and %s (moisture).", d.WeightTrait, d.MoistureTrait))
		f.stdMoist.SetText(strconv.FormatFloat(d.StandardMoisture, 'f', -1, 64))
		unit := d.OutputUnit
		if unit == "" {
			unit = trial.UnitTHa
		}
		f.outUnit.SetSelected(unit)
		f.bushel.SetText("")
		if d.BushelWeightLb > 0 {
			f.bushel.SetText(strconv.FormatFloat(d.BushelWeightLb, 'f', -1, 64))
		}
		f.unit.SetText(unit)
		f.unit.Disable() // follows the yield unit
		f.kind.Disable() // a yield is a measurement
		f.derivedBox.Show()
		f.add.Disable()
		return
	}
	f.unit.Enable()
	f.kind.Enable()
	f.derivedBox.Hide()
	f.add.Enable()
}

func boundText(p *float64) string {
	if p == nil {
		return ""
	}
	return strconv.FormatFloat(*p, 'f', -1, 64)
}

// traitFromForm reads the form over base (the trait being edited, or an
// empty one). Text that is not a number is reported in plain words.
func (s *setupStep) traitFromForm(base trial.Trait) (trial.Trait, error) {
	f := s.tf
	var errs []error
	bound := func(e *widget.Entry, what string) *float64 {
		v := strings.TrimSpace(e.Text)
		if v == "" {
			return nil
		}
		x, err := strconv.ParseFloat(strings.ReplaceAll(v, ",", "."), 64)
		if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
			errs = append(errs, fmt.Errorf("the %s “%s” is not a number", what, v))
			return nil
		}
		return &x
	}
	tr := base
	tr.Key = strings.TrimSpace(f.key.Text)
	tr.Name = strings.TrimSpace(f.name.Text)
	if tr.Name == "" {
		tr.Name = tr.Key
	}
	tr.Unit = strings.TrimSpace(f.unit.Text)
	tr.Min = bound(f.minE, "lowest valid value")
	tr.Max = bound(f.maxE, "highest valid value")
	d, err := strconv.Atoi(strings.TrimSpace(f.dec.Text))
	if err != nil {
		errs = append(errs, fmt.Errorf("the decimals “%s” must be a whole number, for example 1", strings.TrimSpace(f.dec.Text)))
	}
	tr.Decimals = d
	tr.HigherBetter = f.higher.Checked
	if base.Derived == nil {
		tr.Kind = kindValues[max(f.kind.SelectedIndex(), 0)]
		return tr, errors.Join(errs...)
	}
	dv := *base.Derived
	if m := bound(f.stdMoist, "standard moisture"); m != nil {
		// A name that states the old moisture basis follows the new one.
		if tr.Name == fmt.Sprintf("Yield at %g %% moisture", dv.StandardMoisture) {
			tr.Name = fmt.Sprintf("Yield at %g %% moisture", *m)
		}
		dv.StandardMoisture = *m
	} else if strings.TrimSpace(f.stdMoist.Text) == "" {
		errs = append(errs, errors.New("give the standard moisture, for example 13.5"))
	}
	dv.OutputUnit = f.outUnit.Selected
	dv.BushelWeightLb = 0
	if dv.OutputUnit == trial.UnitBuAc {
		if b := bound(f.bushel, "bushel weight"); b != nil {
			dv.BushelWeightLb = *b
		} else if cd, ok := trial.LookupCrop(s.t().Crop); ok {
			dv.BushelWeightLb = cd.BushelWeightLb
		}
	}
	tr.Unit = dv.OutputUnit
	tr.Derived = &dv
	return tr, errors.Join(errs...)
}

// addTrait adds the form's trait as a new recorded trait.
func (s *setupStep) addTrait() {
	tr, err := s.traitFromForm(trial.Trait{})
	if err == nil {
		err = s.u.tryStructural("trait added", func(t *trial.Trial) error { return t.AddTrait(tr) })
	}
	if err != nil {
		s.traitProblem("The trait was not added", err)
		return
	}
	s.traitSel = len(s.t().Traits) - 1
	s.traitList.Select(s.traitSel)
}

// applyTrait changes the selected trait to the form's values.
func (s *setupStep) applyTrait() {
	f := s.tf
	old := s.t().Trait(f.editing)
	if old == nil {
		return
	}
	tr, err := s.traitFromForm(*old)
	if err == nil {
		key := f.editing
		err = s.u.tryStructural("trait change", func(t *trial.Trial) error { return t.UpdateTrait(key, tr) })
	}
	if err != nil {
		s.traitProblem("The trait was not changed", err)
		return
	}
	if i := s.t().TraitIndex(tr.Key); i >= 0 {
		s.traitSel = i
		s.loadTraitForm(&s.t().Traits[i])
	}
	f.msg.Importance = widget.SuccessImportance
	f.msg.SetText("Changed. Undo (Ctrl+Z) takes it back.")
}

// traitProblem shows why the form was refused, under the form.
func (s *setupStep) traitProblem(action string, err error) {
	m := explain(action, err)
	s.tf.msg.Importance = widget.DangerImportance
	s.tf.msg.SetText(m.What)
}

// yieldDialog adds the derived moisture-adjusted yield from a weight and a
// moisture trait, with the standard moisture of the crop as default.
func (s *setupStep) yieldDialog() {
	t := s.t()
	var names, keys []string
	for _, tr := range t.Traits {
		if tr.Derived == nil {
			names = append(names, traitLabel(&tr))
			keys = append(keys, tr.Key)
		}
	}
	if len(keys) < 2 {
		dialog.ShowInformation("Adjusted yield", "Add the plot weight (kg) and grain moisture (%) traits first; adjusted yield is computed from them.", s.u.win)
		return
	}
	weight := widget.NewSelect(names, nil)
	moist := widget.NewSelect(names, nil)
	for i, k := range keys {
		tr := t.Trait(k)
		if strings.Contains(strings.ToLower(tr.Unit), "kg") && weight.SelectedIndex() < 0 {
			weight.SetSelectedIndex(i)
		}
		if tr.Kind == trial.Percent || strings.Contains(strings.ToLower(tr.Name), "moist") {
			moist.SetSelectedIndex(i)
		}
	}
	unit := widget.NewRadioGroup([]string{trial.UnitTHa, trial.UnitBuAc}, nil)
	unit.Horizontal = true
	unit.SetSelected(trial.UnitTHa)
	if s.u.prefs.units == unitsImperial {
		unit.SetSelected(trial.UnitBuAc)
	}
	std := widget.NewEntry()
	cropNote := "No defaults known for the crop “" + t.Crop + "”; type the moisture basis your market uses (for bu/ac, also give the bushel weight in the trait's form afterwards)."
	if strings.TrimSpace(t.Crop) == "" {
		cropNote = "No crop is chosen under Details, so there is no default: type the moisture basis your market uses (for bu/ac, also give the bushel weight in the trait's form afterwards)."
	}
	if d, ok := trial.LookupCrop(t.Crop); ok {
		std.SetText(strconv.FormatFloat(d.StandardMoisture, 'f', -1, 64))
		cropNote = fmt.Sprintf("Default for %s: %g %% (common practice; change it if your market uses another basis).", t.Crop, d.StandardMoisture)
	}
	note := widget.NewLabel(cropNote)
	note.Wrapping = fyne.TextWrapWord
	key := widget.NewEntry()
	key.SetText("yield")
	form := widget.NewForm(
		widget.NewFormItem("Key", key),
		widget.NewFormItem("Plot weight (kg)", weight),
		widget.NewFormItem("Moisture (%)", moist),
		widget.NewFormItem("Standard moisture %", std),
		widget.NewFormItem("Unit", unit),
	)
	d := dialog.NewCustomConfirm("Add adjusted yield", "Add", "Cancel", container.NewVBox(form, note), func(ok bool) {
		if !ok || weight.SelectedIndex() < 0 || moist.SelectedIndex() < 0 {
			return
		}
		m, err := strconv.ParseFloat(strings.TrimSpace(std.Text), 64)
		if err != nil {
			showError(s.u.win, "Could not add adjusted yield", "The standard moisture must be a number", err)
			return
		}
		tr := trial.AdjustedYieldTrait(strings.TrimSpace(key.Text), keys[weight.SelectedIndex()], keys[moist.SelectedIndex()], t.Crop, unit.Selected)
		tr.Derived.StandardMoisture = m
		tr.Name = fmt.Sprintf("Yield at %g %% moisture", m) // the basis typed, not the crop's default
		s.structural("The adjusted yield could not be added", func(t *trial.Trial) error { return t.AddTrait(tr) })
	}, s.u.win)
	d.Resize(fyne.NewSize(520, 400))
	d.Show()
	closeOnEscape(s.u.win, d)
}
