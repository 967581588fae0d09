package ui

import (
	"encoding/json"
	"math"
	"slices"
	"strings"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/trialfile"
)

// The nitrogen-rate reference data (5 rates × 4 blocks) as a trial file,
// with R 4.2.2 results beside the CSV it was made from: aov with
// contr.poly(scores = rates), lm, the profiled quadratic-plateau, the
// economic optimum at a price ratio of 0.008 (see stats/refdata/README.md).
const (
	nitrogenFixture = "nitrogen-rates.furlong"
	nitrogenJSON    = "nitrogen-rates.expected.json"
)

// nitrogenTrial is the nitrogen trial with an untreated control that has
// no rate (any values: it is left out of the trend).
func nitrogenTrial(t *testing.T) *trial.Trial {
	t.Helper()
	tr, err := trialfile.Load(refdata.File(t, nitrogenFixture))
	if err != nil {
		t.Fatal(err)
	}
	tr.Treatments = append(tr.Treatments, trial.Treatment{Code: "UTC", Role: trial.RoleUntreated})
	for b := 1; b <= 4; b++ {
		tr.Plots = append(tr.Plots, trial.Plot{Number: 100 + b, Block: b, Row: b, Column: 6, Treatment: "UTC"})
		tr.Traits[0].Values = append(tr.Traits[0].Values, 3+float64(b)/10)
	}
	return tr
}

func responseViewOf(t *testing.T, c *compareStep) *responseView {
	t.Helper()
	for _, v := range c.views {
		if rv, ok := v.(*responseView); ok {
			return rv
		}
	}
	t.Fatal("Compare has no response view")
	return nil
}

// The Response tab of a rate trial shows the trends and curves R gives for
// the same data, leaves the control without a rate out, saves a price
// ratio typed in with the trial (undoable), and then shows R's economic
// optimum of the quadratic.
func TestResponseViewAgainstR(t *testing.T) {
	b, err := refdata.ReadFile(nitrogenJSON)
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Contrasts []struct {
			Source string  `json:"source"`
			SS     float64 `json:"ss"`
		} `json:"contrasts"`
		Q struct {
			Optimum float64 `json:"economic_optimum_rate"`
		} `json:"quadratic"`
		QP struct {
			Join float64 `json:"join_point"`
		} `json:"quadratic_plateau"`
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	u, _ := newTestApp(t, 0)
	u.OpenTrial(nitrogenTrial(t), "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	v := responseViewOf(t, u.steps[stepCompare].(*compareStep))
	pumpUntil(t, u, "the response analysed", func() bool { return v.resp != nil })

	r := v.resp
	if len(r.Points) != 5 || len(r.LeftOut) != 1 || r.LeftOut[0] != "UTC" || !slices.Contains(v.leave.Selected, "UTC") {
		t.Fatalf("points %d, left out %v, ticked %v", len(r.Points), r.LeftOut, v.leave.Selected)
	}
	if len(v.trend.rows) != len(ref.Contrasts) {
		t.Fatalf("trend rows %v", v.trend.rows)
	}
	for i, c := range ref.Contrasts {
		if g := r.Trends[i]; g.Source != c.Source || math.Abs(g.SS-c.SS) > 1e-9*c.SS {
			t.Errorf("%s: SS %.12g, R %.12g", c.Source, g.SS, c.SS)
		}
	}
	if len(v.model.rows) != 4 || len(v.sens.rows) != 0 || len(v.chart.Objects) != 1 {
		t.Errorf("models %d rows, sensitivity %d rows, chart %d objects", len(v.model.rows), len(v.sens.rows), len(v.chart.Objects))
	}
	for _, m := range r.Models {
		if m.Model == "quadratic-plateau" && (m.Join == nil || math.Abs(*m.Join-ref.QP.Join) > 1e-5) {
			t.Errorf("join %v, R %g", m.Join, ref.QP.Join)
		}
	}

	// A price ratio that is not a number is refused in words.
	v.ratio.SetText("cheap")
	v.saveSettings()
	if u.doc.t.Analysis.Response.PriceRatio != 0 || !strings.Contains(v.msg.Text, "positive number") {
		t.Fatalf("bad ratio: saved %v, message %q", u.doc.t.Analysis.Response, v.msg.Text)
	}
	v.ratio.SetText("0,008") // a decimal comma is read too
	v.saveSettings()
	if got := u.doc.t.Analysis.Response.PriceRatio; got != 0.008 || !u.doc.dirty {
		t.Fatalf("saved ratio %v (dirty %v)", got, u.doc.dirty)
	}
	pumpUntil(t, u, "the optimum shown", func() bool { return v.resp != nil && v.resp.PriceRatio == 0.008 })
	found := false
	for _, m := range v.resp.Models {
		if m.Model == "quadratic" {
			found = m.Econ != nil && math.Abs(*m.Econ-ref.Q.Optimum) < 1e-7
		}
	}
	if !found || len(v.sens.rows) != 4 || !strings.Contains(v.note.Text, "not a recommendation") || !strings.Contains(strings.Join(v.model.head, " "), "Economic optimum") {
		t.Errorf("with the ratio: quadratic optimum found %v (R %g), sensitivity rows %d, note %q", found, ref.Q.Optimum, len(v.sens.rows), v.note.Text)
	}

	// Undo takes the ratio away again, and the view follows.
	u.undo()
	if u.doc.t.Analysis.Response.PriceRatio != 0 || v.ratio.Text != "" {
		t.Fatalf("after undo: %v, entry %q", u.doc.t.Analysis.Response, v.ratio.Text)
	}
	pumpUntil(t, u, "the optimum gone", func() bool { return v.resp != nil && v.resp.PriceRatio == 0 })
}

// A trial whose treatments have no rates says what the view is for.
func TestResponseViewNoRates(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(dunnettTrial(t), "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	v := responseViewOf(t, u.steps[stepCompare].(*compareStep))
	if v.resp != nil || !strings.Contains(v.note.Text, "rate trials") || !strings.Contains(v.note.Text, "at least 3 treatments with a rate") {
		t.Errorf("note %q", v.note.Text)
	}
}
