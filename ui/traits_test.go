package ui

import (
	"math"
	"slices"
	"strings"
	"testing"

	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// The Traits tab edits an existing trait through trial.UpdateTrait: a new
// name, range and key (the plots' exclusions follow the key), refused
// entries are explained under the form, and every change is undoable.
func TestEditTrait(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	tr.Traits[0].Values[0] = 5.5
	tr.Traits[1].Values[0] = 310
	if err := tr.Exclude(0, "yld", "hail"); err != nil {
		t.Fatal(err)
	}
	u.OpenTrial(tr, "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	f := s.tf

	s.traitList.Select(0)
	if f.editing != "yld" || f.key.Text != "yld" || f.maxE.Text != "10" || f.apply.Disabled() {
		t.Fatalf("form not loaded from the trait: editing %q key %q max %q", f.editing, f.key.Text, f.maxE.Text)
	}
	f.key.SetText("gy")
	f.name.SetText("Grain yield")
	f.maxE.SetText("12")
	test.Tap(f.apply)
	got := u.doc.t.Trait("gy")
	if got == nil || got.Name != "Grain yield" || got.Max == nil || *got.Max != 12 || got.Values[0] != 5.5 {
		t.Fatalf("trait after the change: %+v", got)
	}
	if ex, why := u.doc.t.Excluded(0, "gy"); !ex || why != "hail" {
		t.Fatal("the exclusion did not follow the renamed key")
	}
	if f.editing != "gy" || f.msg.Importance != widget.SuccessImportance {
		t.Fatalf("form after the change: editing %q, message %q", f.editing, f.msg.Text)
	}

	// Text that is not a number is refused, nothing changes.
	f.dec.SetText("two")
	test.Tap(f.apply)
	if f.msg.Importance != widget.DangerImportance || !strings.Contains(f.msg.Text, "two") {
		t.Fatalf("bad decimals: message %q", f.msg.Text)
	}
	if u.doc.t.Trait("gy").Decimals != 2 {
		t.Fatal("refused form changed the trait")
	}
	// A range upside down is refused by the trial's own check.
	f.dec.SetText("2")
	f.minE.SetText("20")
	test.Tap(f.apply)
	if f.msg.Importance != widget.DangerImportance || u.doc.t.Trait("gy").Min == nil || *u.doc.t.Trait("gy").Min != 0 {
		t.Fatalf("inverted range: message %q, min %v", f.msg.Text, u.doc.t.Trait("gy").Min)
	}
	// A measurement holding 5.5 cannot become a count (a count is a whole
	// number, trial.Count).
	f.minE.SetText("0")
	f.kind.SetSelectedIndex(1)
	test.Tap(f.apply)
	if f.msg.Importance != widget.DangerImportance || u.doc.t.Trait("gy").Kind != trial.Continuous {
		t.Fatalf("kind change over a fractional value: message %q", f.msg.Text)
	}

	// Undo takes the rename back; the form follows.
	u.undo()
	if u.doc.t.Trait("yld") == nil || u.doc.t.Trait("gy") != nil {
		t.Fatal("undo did not take back the trait change")
	}
	if f.editing != "" {
		t.Fatalf("form still edits %q after undo", f.editing)
	}
}

// A derived adjusted yield keeps its formula and lets its standard moisture
// and unit change; the computed values follow (MoistureAdjustedYield:
// Y = W·(100−M)/(100−Ms)·10/A, so going from a 13.5 % to a 15 % basis
// multiplies every yield by 86.5/85 — arithmetic from that formula).
func TestEditDerivedYield(t *testing.T) {
	u, _ := newTestApp(t, 0)
	if err := u.OpenDemo(); err != nil {
		t.Fatal(err)
	}
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	f := s.tf
	tr := u.doc.t
	j := tr.TraitIndex("yield")
	before, err := tr.TraitValues("yield")
	if err != nil {
		t.Fatal(err)
	}
	ms0 := tr.Traits[j].Derived.StandardMoisture
	s.traitList.Select(j)
	if !f.derivedBox.Visible() || !f.unit.Disabled() || !f.add.Disabled() {
		t.Fatal("derived settings not shown for the adjusted yield")
	}
	f.stdMoist.SetText("15")
	test.Tap(f.apply)
	y := u.doc.t.Trait("yield")
	if y.Derived == nil || y.Derived.StandardMoisture != 15 || y.Name != "Yield at 15 % moisture" {
		t.Fatalf("after the change: %+v %+v (%s)", y, y.Derived, f.msg.Text)
	}
	after, _ := u.doc.t.TraitValues("yield")
	// Moisture adjustment Y = W·(100−M)/(100−Ms)·10/A (common practice):
	// moving the basis from Ms0 to 15 % multiplies Y by (100−Ms0)/(100−15).
	ratio := (100 - ms0) / 85
	for i := range before {
		if trial.IsMissing(before[i]) {
			continue
		}
		if math.Abs(after[i]-before[i]*ratio) > 1e-9*before[i] {
			t.Fatalf("plot %d: yield %v, want %v", i, after[i], before[i]*ratio)
		}
	}
	// Bushels per acre use the crop's bushel weight (wheat in the demo).
	f.outUnit.SetSelected(trial.UnitBuAc)
	test.Tap(f.apply)
	y = u.doc.t.Trait("yield")
	if y.Unit != trial.UnitBuAc || y.Derived.OutputUnit != trial.UnitBuAc || y.Derived.BushelWeightLb <= 0 {
		t.Fatalf("bu/ac: %+v %+v (%s)", y, y.Derived, f.msg.Text)
	}
	u.undo()
	u.undo()
	if u.doc.t.Trait("yield").Derived.StandardMoisture != ms0 {
		t.Fatal("undo did not restore the standard moisture")
	}
}

// The Traits tab sets a trait's transformation and its percent-of-check
// choice (trial.Trait.Transform, PercentOfCheck), one undoable edit each
// time; the window's analysis then runs on the chosen scale. Reference:
// in a balanced RCBD the least-squares means are the treatment averages
// of the analysed values, here of √y (by hand, in the test), and the
// square root is undone by squaring (no zero counts, so no offset).
func TestTraitTransformAndPercentOfCheck(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	for i, p := range tr.Plots {
		tr.Traits[1].Values[i] = float64(300 + 17*i + 40*int(p.Treatment[0]-'A'))
	}
	u.OpenTrial(tr, "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	f := s.tf
	s.traitList.Select(1)
	if f.transform.SelectedIndex() != 0 || f.pctCheck.SelectedIndex() != 0 {
		t.Fatalf("a trait with no settings shows transform %q, percent of check %q", f.transform.Selected, f.pctCheck.Selected)
	}
	// The arcsine is for percentages: refused for a count, nothing changes.
	f.transform.SetSelectedIndex(3)
	test.Tap(f.apply)
	if f.msg.Importance != widget.DangerImportance || !strings.Contains(f.msg.Text, "percent") || u.doc.t.Traits[1].Transform != "" {
		t.Fatalf("arcsine of a count: message %q, transform %q", f.msg.Text, u.doc.t.Traits[1].Transform)
	}
	f.transform.SetSelectedIndex(2)
	f.pctCheck.SetSelectedIndex(1)
	test.Tap(f.apply)
	got := u.doc.t.Traits[1]
	if got.Transform != trial.TransformSqrt || got.PercentOfCheck == nil || !*got.PercentOfCheck {
		t.Fatalf("after the change: transform %q, percent of check %v (%s)", got.Transform, got.PercentOfCheck, f.msg.Text)
	}
	set := pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	res := set.result("heads")
	if res == nil || res.res == nil {
		t.Fatalf("heads not analysed: %+v", res)
	}
	r := res.res
	if r.Transform != trial.TransformSqrt || r.CheckMean == nil {
		t.Fatalf("analysed with transform %q, check mean %v", r.Transform, r.CheckMean)
	}
	for _, m := range r.Means {
		var sum float64
		n := 0
		for i, p := range u.doc.t.Plots {
			if p.Treatment == m.Treatment {
				sum += math.Sqrt(u.doc.t.Traits[1].Values[i])
				n++
			}
		}
		if want := sum / float64(n); math.Abs(m.Mean-want) > 1e-9*want {
			t.Errorf("%s: mean on the square-root scale %v, want %v", m.Treatment, m.Mean, want)
		}
		if math.Abs(m.BackMean-m.Mean*m.Mean) > 1e-9*m.BackMean {
			t.Errorf("%s: back-transformed mean %v, want %v squared", m.Treatment, m.BackMean, m.Mean)
		}
		if m.PercentOfCheck == nil {
			t.Errorf("%s: no percent of check although chosen", m.Treatment)
		}
	}
	u.showStep(stepSetup)
	u.undo()
	if got := u.doc.t.Traits[1]; got.Transform != "" || got.PercentOfCheck != nil {
		t.Fatalf("undo left transform %q, percent of check %v", got.Transform, got.PercentOfCheck)
	}
}

// Setup › Traits: "Adjusted for" offers the other traits; the choice is
// saved with the trait (undoable) and Compare's analysis of it is then the
// analysis of covariance on that trait, as the report's and the CLI's are.
func TestTraitCovariateChoice(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 5 + 0.1*float64(i%4) + 0.01*float64(i)
		tr.Traits[1].Values[i] = 300 + float64((i*7)%11)
	}
	u.OpenTrial(tr, "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	f := s.tf
	s.traitList.Select(0)
	if got := f.covariate.Options; len(got) != 2 || got[0] != noCovariate || got[1] != "heads" || f.covariate.Selected != noCovariate {
		t.Fatalf("covariate choices %v, selected %q", got, f.covariate.Selected)
	}
	f.covariate.SetSelected("heads")
	test.Tap(f.apply)
	if got := u.doc.t.Trait("yld").Covariate; got != "heads" {
		t.Fatalf("saved covariate %q", got)
	}
	s2 := pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	if r := s2.result("yld"); r == nil || r.res == nil || r.res.Covariate == nil || r.res.Covariate.Key != "heads" {
		t.Fatalf("Compare's analysis is not adjusted for heads: %+v", r)
	}
	u.undo()
	if got := u.doc.t.Trait("yld").Covariate; got != "" {
		t.Errorf("after undo: %q", got)
	}
}

// Setup › Traits builds a crop-protection trial as 'furlong new --assess'
// and '--pre-count' do: an assessment series with its AUDPC traits added
// in one undoable edit, a trait marked as the count before treatment of
// the series, and bad dates refused in words.
func TestTraitAssessmentSeries(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	if s.addAssessmentSeries("sev", "%", "2026-06-01, 13 June") || !strings.Contains(s.tf.msg.Text, "neither a date") {
		t.Fatalf("a bad date was accepted: %q", s.tf.msg.Text)
	}
	if !s.addAssessmentSeries("sev", "%", "2026-06-01, 2026-06-15/14DAT, 2026-06-29") {
		t.Fatalf("series not added: %q", s.tf.msg.Text)
	}
	want, _ := trial.AssessmentSeries("sev", "%", "2026-06-01, 2026-06-15/14DAT, 2026-06-29")
	var keys []string
	for _, tr := range u.doc.t.Traits {
		keys = append(keys, tr.Key)
	}
	if got := strings.Join(keys, ","); got != "yld,heads,sev_1,sev_2,sev_3,sev_audpc,sev_saudpc" || len(want) != 5 {
		t.Fatalf("traits %s", got)
	}
	if a := u.doc.t.Trait("sev_2").Assessment; a == nil || a.Series != "sev" || a.Days != 14 || a.From != trial.DaysAfterTreatment {
		t.Errorf("sev_2 assessment %+v", a)
	}
	// heads counted before treatment of the series.
	s.traitList.Select(1)
	f := s.tf
	if !slices.Contains(f.preCount.Options, "sev"+seriesSuffix) {
		t.Fatalf("pre-count choices %v", f.preCount.Options)
	}
	f.preCount.SetSelected("sev" + seriesSuffix)
	test.Tap(f.apply)
	if got := u.doc.t.Trait("heads").PreCountOf; got != "sev" {
		t.Fatalf("pre-count of %q (%s)", got, f.msg.Text)
	}
	u.undo()
	u.undo()
	if len(u.doc.t.Traits) != 2 {
		t.Errorf("after undoing both: %d traits", len(u.doc.t.Traits))
	}
}
