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

	"furlong/stats"
	"furlong/trial"
)

// traitsTab is the Setup step's Traits tab: the traits measured on
// every plot, and the form that adds or changes one.
type traitsTab struct {
	u       *App
	content fyne.CanvasObject

	traitList *widget.List
	traitSel  int
	tf        *traitForm
}

var kindLabels = []string{"measurement", "count", "percentage", "score"}
var kindValues = []trial.TraitKind{trial.Continuous, trial.Count, trial.Percent, trial.Score}

// traitForm is the Traits tab's form: it adds a recorded trait, or edits
// the selected one (recorded or derived) through trial.UpdateTrait.
type traitForm struct {
	key, name, unit, minE, maxE, dec *widget.Entry
	kind                             *widget.Select
	higher                           *widget.Check
	// transform is the scale the trait is analysed on (transformLabels);
	// pctCheck whether its means are shown as percent of the check
	// (pctCheckLabels: the default, yes or no).
	transform, pctCheck *widget.Select
	// covariate is the trait this one is adjusted for (noCovariate: none);
	// preCount the trait or series this one counts before treatment
	// (noPreCount: none).
	covariate, preCount *widget.Select

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

// newTraitsTab builds the tab.
func newTraitsTab(u *App) *traitsTab {
	s := &traitsTab{u: u, traitSel: -1}
	s.content = s.build()
	return s
}

func (s *traitsTab) build() fyne.CanvasObject {
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
			if tr.Transform != trial.TransformNone {
				txt += " · " + stats.Transform(tr.Transform).Scale() + " scale"
			}
			if tr.Covariate != "" {
				txt += " · adjusted for " + tr.Covariate
			}
			if tr.PreCountOf != "" {
				txt += " · count before treatment of " + tr.PreCountOf
			}
			if a := tr.Assessment; a != nil {
				txt += " · assessment of series " + a.Series
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
	f.transform = widget.NewSelect(transformLabels, nil)
	f.transform.SetSelectedIndex(0)
	f.pctCheck = widget.NewSelect(pctCheckLabels, nil)
	f.pctCheck.SetSelectedIndex(0)
	f.covariate = widget.NewSelect([]string{noCovariate}, nil)
	f.covariate.SetSelected(noCovariate)
	f.preCount = widget.NewSelect([]string{noPreCount}, nil)
	f.preCount.SetSelected(noPreCount)

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
	assess := widget.NewButtonWithIcon("Add assessment series…", theme.ContentAddIcon(), s.assessDialog)
	form := widget.NewForm(
		widget.NewFormItem("Key", f.key), widget.NewFormItem("Name", f.name), widget.NewFormItem("Unit", f.unit),
		widget.NewFormItem("Kind", f.kind), widget.NewFormItem("Valid from", f.minE), widget.NewFormItem("Valid to", f.maxE),
		widget.NewFormItem("Decimals", f.dec), widget.NewFormItem("", f.higher),
		widget.NewFormItem("Analysed as", f.transform), widget.NewFormItem("Percent of check", f.pctCheck),
		widget.NewFormItem("Adjusted for", f.covariate),
		widget.NewFormItem("Count before treatment of", f.preCount),
	)
	help := widget.NewLabel("Select a trait to change it; values outside the valid range are kept and flagged in Record. Adjusted yield is computed from plot weight and grain moisture. " + transformHelp)
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	right := container.NewVBox(form, f.derivedBox, f.msg,
		container.NewHBox(f.apply, f.add, f.clear, f.remove), widget.NewSeparator(), container.NewHBox(yield, assess), help)
	split := container.NewHSplit(s.traitList, container.NewVScroll(right))
	split.Offset = 0.45
	return split
}

// loadTraitForm fills the form from tr, or empties it for a new trait.
func (s *traitsTab) loadTraitForm(tr *trial.Trait) {
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
		f.transform.SetSelectedIndex(0)
		f.pctCheck.SetSelectedIndex(0)
		s.fillCovariates("", "")
		s.fillPreCounts("", "")
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
	f.transform.SetSelectedIndex(max(slices.Index(transformValues, tr.Transform), 0))
	f.pctCheck.SetSelectedIndex(pctCheckIndex(tr.PercentOfCheck))
	s.fillCovariates(tr.Key, tr.Covariate)
	s.fillPreCounts(tr.Key, tr.PreCountOf)
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
func (s *traitsTab) traitFromForm(base trial.Trait) (trial.Trait, error) {
	f := s.tf
	var errs []error
	bound := func(e *widget.Entry, what string) *float64 {
		v := strings.TrimSpace(e.Text)
		if v == "" {
			return nil
		}
		x, err := trial.ParseNumber(v, trial.PointOrComma)
		if err != nil {
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
	tr.Transform = transformValues[max(f.transform.SelectedIndex(), 0)]
	tr.PercentOfCheck = pctCheckValue(f.pctCheck.SelectedIndex())
	tr.Covariate = ""
	if c := f.covariate.Selected; c != noCovariate && c != "" {
		tr.Covariate = c
	}
	tr.PreCountOf = ""
	if c := f.preCount.Selected; c != noPreCount && c != "" {
		tr.PreCountOf = strings.TrimSuffix(c, seriesSuffix)
	}
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
func (s *traitsTab) addTrait() {
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
func (s *traitsTab) applyTrait() {
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
func (s *traitsTab) traitProblem(action string, err error) {
	m := explain(action, err)
	s.tf.msg.Importance = widget.DangerImportance
	s.tf.msg.SetText(m.What)
}

// yieldDialog adds the derived moisture-adjusted yield from a weight and a

func (s *traitsTab) t() *trial.Trial { return s.u.doc.t }

// structural applies a change as one undoable edit (see App.structuralEdit).
func (s *traitsTab) structural(action string, f func(t *trial.Trial) error) bool {
	return s.u.structuralEdit(editLabel(action), action, f)
}

// The transformations a trait can be analysed under, as the Traits tab
// offers them (trial.TransformProblem says which apply to which kind).
var (
	transformLabels = []string{"values as recorded", "log (natural logarithm)", "square root", "arcsine of the square root (percentages)"}
	transformValues = []string{trial.TransformNone, trial.TransformLog, trial.TransformSqrt, trial.TransformArcsine}
)

// transformHelp says what the transformations are for, under the form.
const transformHelp = "A transformation is for a trait whose spread grows with its mean: log for such measurements, square root for counts, arcsine for percentages; means are then shown back on the recorded scale with their confidence limits."

// The choices of showing a trait's means as percent of the check: by
// default only the trial's yield is shown so (trial.ShowsPercentOfCheck).
var pctCheckLabels = []string{"for the trial's yield only (default)", "shown", "not shown"}

// pctCheckIndex is the choice of pctCheckLabels for a trait's setting.
func pctCheckIndex(p *bool) int {
	switch {
	case p == nil:
		return 0
	case *p:
		return 1
	}
	return 2
}

// pctCheckValue is the trait setting for choice i of pctCheckLabels.
func pctCheckValue(i int) *bool {
	switch i {
	case 1:
		yes := true
		return &yes
	case 2:
		no := false
		return &no
	}
	return nil
}

// noCovariate is the covariate select's entry for no adjustment.
const noCovariate = "nothing (no covariate)"

// fillCovariates offers the trial's other traits as the covariate of the
// trait with key (every trait for a new one) and selects cov.
func (s *traitsTab) fillCovariates(key, cov string) {
	opts := []string{noCovariate}
	for _, tr := range s.t().Traits {
		if tr.Key != key {
			opts = append(opts, tr.Key)
		}
	}
	f := s.tf
	f.covariate.Options = opts
	if cov == "" || !slices.Contains(opts, cov) {
		cov = noCovariate
	}
	f.covariate.SetSelected(cov)
}

// noPreCount is the pre-count select's entry for none; seriesSuffix marks
// an assessment series among its choices.
const (
	noPreCount   = "nothing (not a pre-treatment count)"
	seriesSuffix = " (series)"
)

// fillPreCounts offers the trial's other traits and its assessment series
// as what the trait with key counts before treatment (Henderson–Tilton's
// efficacy needs it), and selects cur.
func (s *traitsTab) fillPreCounts(key, cur string) {
	opts := []string{noPreCount}
	sel := noPreCount
	seen := map[string]bool{}
	for _, tr := range s.t().Traits {
		if a := tr.Assessment; a != nil && !seen[a.Series] {
			seen[a.Series] = true
			opts = append(opts, a.Series+seriesSuffix)
			if a.Series == cur {
				sel = a.Series + seriesSuffix
			}
		}
	}
	for _, tr := range s.t().Traits {
		if tr.Key != key && tr.Derived == nil && tr.Assessment == nil {
			opts = append(opts, tr.Key)
			if tr.Key == cur {
				sel = tr.Key
			}
		}
	}
	f := s.tf
	f.preCount.Options = opts
	f.preCount.SetSelected(sel)
}
