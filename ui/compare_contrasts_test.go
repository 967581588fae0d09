package ui

import (
	"encoding/json"
	"math"
	"strings"
	"testing"

	"furlong/stats"
	"furlong/stats/refdata"
	"furlong/trial"
)

// contrastsOf returns Compare's "Contrasts" view.
func contrastsOf(t *testing.T, c *compareStep) *contrastsView {
	t.Helper()
	for _, v := range c.views {
		if cv, ok := v.(*contrastsView); ok {
			return cv
		}
	}
	t.Fatal("Compare has no contrasts view")
	return nil
}

// The Contrasts tab saves a contrast typed in with the trial, estimates it
// on the trait shown, and Undo takes it away again. "N2 vs STD" is the
// difference R's multcomp gives for N2 against the check, with the same SE
// (stats/refdata/dunnett-example.expected.json: lm with one plot missing), and
// t is the estimate over its SE.
func TestContrastsViewSaveEstimateUndo(t *testing.T) {
	data, err := refdata.ReadFile("dunnett-example.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var want struct {
		VsCheck []struct {
			Treatment string  `json:"treatment"`
			Diff      float64 `json:"diff"`
			SE        float64 `json:"se"`
		} `json:"vs_check"`
	}
	if err := json.Unmarshal(data, &want); err != nil {
		t.Fatal(err)
	}
	u, _ := newTestApp(t, 0)
	u.OpenTrial(dunnettTrial(t), "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	v := contrastsOf(t, u.steps[stepCompare].(*compareStep))
	if v.set != nil || !strings.Contains(v.note.Text, "No contrasts saved yet") {
		t.Fatalf("before any contrast: note %q", v.note.Text)
	}

	// A contrast naming a treatment the trial lacks is refused in words.
	v.name.SetText("bad")
	v.def.SetText("N2 vs NOPE")
	v.addContrast()
	if len(u.doc.t.Analysis.Contrasts) != 0 || !strings.Contains(v.message.Text, `"NOPE"`) {
		t.Fatalf("bad contrast: saved %v, message %q", u.doc.t.Analysis.Contrasts, v.message.Text)
	}

	v.name.SetText("n2")
	v.def.SetText("N2 vs STD")
	v.addContrast()
	if got := u.doc.t.Analysis.Contrasts; len(got) != 1 || got[0].String() != "n2=N2 vs STD" || !u.doc.dirty {
		t.Fatalf("saved %v (dirty %v)", got, u.doc.dirty)
	}
	pumpUntil(t, u, "the contrast estimated", func() bool { return v.set != nil && len(v.set.Rows) == 1 })
	got := v.set.Rows[0]
	r := want.VsCheck[1] // N2
	if r.Treatment != "N2" || math.Abs(got.Estimate-r.Diff) > 1e-9 || math.Abs(got.SE-r.SE) > 1e-9 {
		t.Errorf("N2 vs STD = %.9f (SE %.9f); R gives %.9f (SE %.9f)", got.Estimate, got.SE, r.Diff, r.SE)
	}
	if math.Abs(got.T-got.Estimate/got.SE) > 1e-12 {
		t.Errorf("t = %v, estimate/SE = %v", got.T, got.Estimate/got.SE)
	}
	if len(v.table.rows) != 1 || v.table.rows[0][0] != "n2" || v.table.rows[0][1] != "N2 vs STD" {
		t.Errorf("table rows %v", v.table.rows)
	}
	if len(v.removeSel.Options) != 1 {
		t.Errorf("saved list %v", v.removeSel.Options)
	}

	// Holm on one contrast leaves p as it is (Holm 1979: p × 1).
	v.adjustSel.SetSelected("Holm")
	pumpUntil(t, u, "the contrast with Holm", func() bool { return v.set != nil && v.set.Adjust == stats.Holm })
	if v.set.Rows[0].PAdjusted != v.set.Rows[0].P {
		t.Errorf("Holm on one contrast: %v, p %v", v.set.Rows[0].PAdjusted, v.set.Rows[0].P)
	}

	// Undo takes back the choice of Holm (an edit of the trial: the report
	// adjusts the same way), then the contrast; the view says there is none.
	if !u.doc.undo() || u.doc.t.Analysis.ContrastAdjust != "" {
		t.Fatalf("undoing Holm: %q", u.doc.t.Analysis.ContrastAdjust)
	}
	if !u.doc.undo() {
		t.Fatal("nothing to undo")
	}
	if len(u.doc.t.Analysis.Contrasts) != 0 {
		t.Fatalf("after undo: %v", u.doc.t.Analysis.Contrasts)
	}
	if v.set != nil || len(v.removeSel.Options) != 0 || !strings.Contains(v.note.Text, "No contrasts saved yet") {
		t.Errorf("after undo: set %v, list %v, note %q", v.set, v.removeSel.Options, v.note.Text)
	}
	// Redo brings it back, Remove takes it out.
	u.doc.redo()
	v.removeSel.SetSelected(v.removeSel.Options[0])
	v.removeContrast()
	if len(u.doc.t.Analysis.Contrasts) != 0 || !strings.Contains(v.message.Text, "Removed the contrast n2") {
		t.Errorf("after remove: %v, %q", u.doc.t.Analysis.Contrasts, v.message.Text)
	}
}

// The means table of a crop-protection trait shows Abbott's efficacy
// against the untreated check beside the means, with the caution.
func TestCompareEfficacyColumn(t *testing.T) {
	tr := dunnettTrial(t)
	for i := range tr.Treatments {
		if tr.Treatments[i].Code == "STD" {
			tr.Treatments[i].Role = trial.RoleUntreated
		}
	}
	tr.Traits[0].HigherBetter = false
	u, _ := newTestApp(t, 0)
	u.OpenTrial(tr, "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	c := u.steps[stepCompare].(*compareStep)
	if c.eff == nil || c.meanCols() != 6 || c.meansHeader(5) != "% efficacy" {
		t.Fatalf("no efficacy column: %v, %d columns", c.eff, c.meanCols())
	}
	var untreated, n2 float64
	for _, m := range c.meanRows {
		switch m.Treatment {
		case "STD":
			untreated = m.BackMean
		case "N2":
			n2 = m.BackMean
		}
	}
	for i, m := range c.meanRows {
		got := c.meanText(i, 5)
		switch m.Treatment {
		case "STD":
			if got != "untreated" {
				t.Errorf("untreated row shows %q", got)
			}
		case "N2":
			// Abbott (1925): (C − T)/C × 100, one decimal.
			if want := fixed((untreated-n2)/untreated*100, 1); got != want {
				t.Errorf("N2 efficacy %q, want %q", got, want)
			}
		}
	}
	if !strings.Contains(c.warnings.Text, "Caution: ") {
		t.Errorf("no caution beside the efficacy: %q", c.warnings.Text)
	}
}

// Choosing how the contrasts' p-values are adjusted is remembered with the
// trial (the report and 'furlong analyze' then adjust the same way) and
// undone like any edit, the select following the trial.
func TestContrastsAdjustSaved(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(dunnettTrial(t), "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	v := contrastsOf(t, u.steps[stepCompare].(*compareStep))
	v.adjustSel.SetSelected(adjustChoices[2].label) // Holm
	if got := u.doc.t.Analysis.ContrastAdjust; got != trial.AdjustHolm || !u.doc.dirty {
		t.Fatalf("saved %q (dirty %v)", got, u.doc.dirty)
	}
	u.undo()
	if got := u.doc.t.Analysis.ContrastAdjust; got != "" || v.adjustSel.Selected != adjustChoices[0].label || v.adjust != stats.AdjustNone {
		t.Errorf("after undo: saved %q, select %q, adjust %q", got, v.adjustSel.Selected, v.adjust)
	}
	u.redo()
	if v.adjustSel.Selected != adjustChoices[2].label || v.adjust != stats.Holm {
		t.Errorf("after redo: select %q, adjust %q", v.adjustSel.Selected, v.adjust)
	}
}
