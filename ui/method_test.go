package ui

import (
	"testing"

	"furlong/stats/meansep"
	"furlong/trial"
)

// The method chosen in Compare is the trial's: the Report step shows it,
// the report options use it, and Undo restores the previous one.
func TestMethodIsTheTrials(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 4 + float64(tr.TreatmentIndex(tr.Plots[i].Treatment)) + float64(i%3)/10
	}
	u.OpenTrial(tr, "")
	waitAnalysis(t, u, func() { u.showStep(stepCompare) })
	c := u.steps[stepCompare].(*compareStep)
	waitAnalysis(t, u, func() { c.methodSel.SetSelected(methodLabel(meansep.Tukey)) })
	if got := u.doc.t.Analysis.Method; got != trial.MethodTukey {
		t.Fatalf("trial method %q after choosing Tukey in Compare", got)
	}
	u.showStep(stepReport)
	r := u.steps[stepReport].(*reportStep)
	if opts, _ := r.reportOptions(); opts.Method != meansep.Tukey || r.method.Selected != methodLabel(meansep.Tukey) {
		t.Errorf("report uses %q, shows %q", opts.Method, r.method.Selected)
	}
	if !u.doc.undo() || u.trialMethod() != meansep.LSD {
		t.Errorf("undo left method %q", u.trialMethod())
	}
}
