package ui

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"testing"
	"time"

	"fyne.io/fyne/v2/test"

	"furlong/stats/refdata"
	"furlong/trial"
)

// planTrial is an invented trial with n entries in an RCBD of 4 blocks.
func planTrial(t *testing.T, n int) *trial.Trial {
	t.Helper()
	var ts []trial.Treatment
	for i := 0; i < n; i++ {
		ts = append(ts, trial.Treatment{Code: fmt.Sprintf("E%02d", i+1), Role: trial.RoleEntry})
	}
	tr, err := trial.New(trial.NewOptions{
		Title: "Plan", Crop: "wheat", Season: "2026", Treatments: ts,
		Design: trial.Design{Kind: trial.RCBD, Reps: 4},
		Traits: []trial.Trait{{Key: "yld", Name: "Yield", Unit: "t/ha", Kind: trial.Continuous, Decimals: 2, HigherBetter: true}},
		Seed:   3, Now: time.Date(2026, 4, 1, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// waitPlan pumps the window's deliveries until the planning panel shows a
// plan for reps replicates (or a message, when reps is 0).
func waitPlan(t *testing.T, u *App, p *planPanel, reps int) {
	t.Helper()
	pumpUntil(t, u, fmt.Sprintf("a plan for %d replicates", reps), func() bool {
		if reps == 0 {
			return p.shown == nil
		}
		return p.shown != nil && p.shown.reps == reps && p.shown.err == nil
	})
}

// The planning panel of the Design tab gives the detectable difference of
// R 4.2.2 (stats/refdata/planning.expected.json: pt/qt with a noncentrality
// parameter) for each case, updating as the design, the replicates, the
// CV and the power change; the replicates needed for a target difference
// are the fewest whose detectable difference is at most the target.
func TestPlanPanelAgainstR(t *testing.T) {
	data, err := refdata.ReadFile("planning.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var want struct {
		Cases []struct {
			Design     string  `json:"design"`
			Treatments int     `json:"treatments"`
			Reps       int     `json:"reps"`
			CV         float64 `json:"cv"`
			Alpha      float64 `json:"alpha"`
			Power      float64 `json:"power"`
			DFError    int     `json:"df_error"`
			Detectable float64 `json:"detectable_percent"`
		} `json:"cases"`
	}
	if err := json.Unmarshal(data, &want); err != nil {
		t.Fatal(err)
	}
	for _, c := range want.Cases {
		t.Run(fmt.Sprintf("%s-%d-%d", c.Design, c.Treatments, c.Reps), func(t *testing.T) {
			u, _ := newTestApp(t, 0)
			u.OpenTrial(planTrial(t, c.Treatments), "")
			u.showStep(stepSetup)
			s := u.steps[stepSetup].(*setupStep)
			p := s.plan
			waitPlan(t, u, p, 0)
			if p.result.Text == "" {
				t.Fatal("no word on what the plan needs")
			}
			kind := trial.DesignKind(c.Design)
			for i, k := range designKinds {
				if k == kind {
					s.designSel.SetSelected(designLabels[i])
				}
			}
			s.reps.SetText(strconv.Itoa(c.Reps))
			p.alpha.SetSelected(strconv.FormatFloat(c.Alpha, 'g', -1, 64))
			p.power.SetSelected(strconv.FormatFloat(c.Power, 'g', -1, 64))
			test.Type(p.cv, strconv.FormatFloat(c.CV, 'g', -1, 64))
			waitPlan(t, u, p, c.Reps)
			got := p.shown
			if got.df != c.DFError || math.Abs(got.detectable-c.Detectable) > 1e-6 {
				t.Errorf("df %d, detectable %.9f %%; R gives df %d, %.9f %%", got.df, got.detectable, c.DFError, c.Detectable)
			}
			if got.plot == nil || len(p.chartBox.Objects) != 1 {
				t.Error("no chart of the detectable difference by replicates")
			}
			// The curve passes through the case itself.
			for _, pt := range got.curve {
				if pt.Reps == c.Reps && math.Abs(pt.Detectable-c.Detectable) > 1e-6 {
					t.Errorf("the curve at %d replicates gives %.6f %%, R %.6f %%", pt.Reps, pt.Detectable, c.Detectable)
				}
			}
			// A target just above R's detectable difference needs exactly
			// these replicates: one fewer detects only a larger difference.
			target := c.Detectable + 0.01
			p.target.SetText(strconv.FormatFloat(target, 'f', 4, 64))
			pumpUntil(t, u, "the replicates needed", func() bool { return p.shown != nil && p.shown.target > 0 })
			if p.shown.repsNeeded != c.Reps {
				t.Errorf("replicates needed for %.3f %%: %d, want %d", target, p.shown.repsNeeded, c.Reps)
			}
			for _, pt := range p.shown.curve {
				if pt.Reps == c.Reps-1 && !(pt.Detectable > target) {
					t.Errorf("%d replicates detect %.3f %%, within the target %.3f %%", pt.Reps, pt.Detectable, target)
				}
			}
			// One more replicate, live: a smaller difference is detected.
			s.reps.SetText(strconv.Itoa(c.Reps + 1))
			waitPlan(t, u, p, c.Reps+1)
			if !(p.shown.detectable < c.Detectable) {
				t.Errorf("%d replicates detect %.3f %%, not less than %d replicates' %.3f %%", c.Reps+1, p.shown.detectable, c.Reps, c.Detectable)
			}
			if u.doc.t.Design.Reps != 4 || u.doc.t.Design.Kind != trial.RCBD {
				t.Errorf("planning changed the trial's design to %+v", u.doc.t.Design)
			}
		})
	}
}

// "This trial" takes the CV from the trial's own analysis: for the 1931
// barley RCBD, R's CV (stats/refdata/barley-1931-rcbd.expected.json).
func TestPlanPanelCVFromTrial(t *testing.T) {
	data, err := refdata.ReadFile("barley-1931-rcbd.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var want struct {
		CV float64 `json:"cv_percent"`
	}
	if err := json.Unmarshal(data, &want); err != nil {
		t.Fatal(err)
	}
	u, _ := newTestApp(t, 0)
	u.OpenTrial(barleyTrial(t), "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	p := s.plan
	test.Tap(p.cvThis)
	waitPlan(t, u, p, 6)
	if len(p.sources) != 1 || math.Abs(p.sources[0].cv-want.CV) > 1e-6 {
		t.Fatalf("CV sources %+v; R's CV is %.6f", p.sources, want.CV)
	}
	if p.cv.Text != strconv.FormatFloat(roundTo(want.CV, 2), 'f', -1, 64) {
		t.Errorf("CV entry %q after taking R's %.4f", p.cv.Text, want.CV)
	}
	// A CV that is not a number is explained, and no plan is shown.
	p.cv.SetText("high")
	waitPlan(t, u, p, 0)
	if p.result.Text == "" || len(p.chartBox.Objects) != 0 {
		t.Errorf("a CV of %q: message %q, %d charts", p.cv.Text, p.result.Text, len(p.chartBox.Objects))
	}
}
