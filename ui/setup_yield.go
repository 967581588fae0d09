package ui

import (
	"fmt"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// yieldDialog adds the derived moisture-adjusted yield from a weight and a
// moisture trait, with the standard moisture of the crop as default.
func (s *traitsTab) yieldDialog() {
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
		s.addAdjustedYield(key.Text, keys[weight.SelectedIndex()], keys[moist.SelectedIndex()], std.Text, unit.Selected)
	}, s.u.win)
	d.Resize(fyne.NewSize(520, 400))
	d.Show()
	closeOnEscape(s.u.win, d)
}

// addAdjustedYield adds the derived yield key from the weight and moisture
// traits at the standard moisture typed in std (read as every typed
// number is, trial.ParseNumber: "15,5" is 15.5), in unit.
func (s *traitsTab) addAdjustedYield(key, weight, moisture, std, unit string) bool {
	m, err := trial.ParseNumber(std, trial.PointOrComma)
	if err != nil {
		showError(s.u.win, "Could not add adjusted yield", "The standard moisture must be a number", err)
		return false
	}
	tr := trial.AdjustedYieldTrait(strings.TrimSpace(key), weight, moisture, s.t().Crop, unit)
	tr.Derived.StandardMoisture = m
	tr.Name = fmt.Sprintf("Yield at %g %% moisture", m) // the basis typed, not the crop's default
	return s.structural("The adjusted yield could not be added", func(t *trial.Trial) error { return t.AddTrait(tr) })
}
