package ui

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"furlong/stats/refdata"
	"furlong/trial"
)

// dunnettTrial is stats/refdata/dunnett-example.csv as a trial: the entries and
// the check STD in three blocks, plot 9 missing.
func dunnettTrial(t *testing.T) *trial.Trial {
	t.Helper()
	f, err := refdata.Open("dunnett-example.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var ts []trial.Treatment
	seen := map[string]bool{}
	value := map[[2]string]float64{}
	for _, r := range rows[1:] {
		if !seen[r[2]] {
			seen[r[2]] = true
			role := trial.RoleEntry
			if r[2] == "STD" {
				role = trial.RoleCheck
			}
			ts = append(ts, trial.Treatment{Code: r[2], Name: r[2], Role: role})
		}
		v := math.NaN()
		if r[3] != "" {
			if v, err = strconv.ParseFloat(r[3], 64); err != nil {
				t.Fatal(err)
			}
		}
		value[[2]string{r[1], r[2]}] = v
	}
	tr, err := trial.New(trial.NewOptions{
		Title: "Entries against a standard", Crop: "wheat", Season: "2026", Treatments: ts,
		Design: trial.Design{Kind: trial.RCBD, Reps: 3},
		Traits: []trial.Trait{{Key: "yield", Name: "Yield", Unit: "t/ha", Kind: trial.Continuous, Decimals: 2, HigherBetter: true}},
		Seed:   7, Now: time.Date(2026, 4, 1, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range tr.Plots {
		tr.Traits[0].Values[i] = value[[2]string{strconv.Itoa(p.Block), p.Treatment}]
	}
	return tr
}

// vsCheckOf returns Compare's "Against the check" view.
func vsCheckOf(t *testing.T, c *compareStep) *vsCheckView {
	t.Helper()
	for _, v := range c.views {
		if vs, ok := v.(*vsCheckView); ok {
			return vs
		}
	}
	t.Fatal("Compare has no view against the check")
	return nil
}

// pumpUntil runs the analyser's deliveries on the test goroutine until
// cond holds.
func pumpUntil(t *testing.T, u *App, what string, cond func() bool) {
	t.Helper()
	v, _ := testPosts.Load(u.compute)
	posts := v.(chan func())
	timeout := time.After(60 * time.Second)
	for !cond() {
		select {
		case f := <-posts:
			f()
		case <-timeout:
			t.Fatalf("%s: not within a minute", what)
		}
	}
}

// The "Against the check" tab compares every entry with the trial's check
// as R's multcomp does (stats/refdata/dunnett-example.expected.json: Dunnett
// single-step with one plot missing, p good to about 1e-6): differences
// and SEs to 1e-9, adjusted P two-sided and one-sided (greater: higher is
// better here) to 2e-5, and each verdict follows its simultaneous interval.
func TestVsCheckAgainstR(t *testing.T) {
	data, err := refdata.ReadFile("dunnett-example.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var want struct {
		Check   string `json:"check"`
		VsCheck []struct {
			Treatment string  `json:"treatment"`
			Diff      float64 `json:"diff"`
			SE        float64 `json:"se"`
			PTwo      float64 `json:"p_two_sided"`
			PGreater  float64 `json:"p_greater"`
		} `json:"vs_check"`
	}
	if err := json.Unmarshal(data, &want); err != nil {
		t.Fatal(err)
	}
	u, _ := newTestApp(t, 0)
	u.OpenTrial(dunnettTrial(t), "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	cs := u.steps[stepCompare].(*compareStep)
	v := vsCheckOf(t, cs)
	pumpUntil(t, u, "the comparisons with the check", func() bool { return v.vc != nil })
	vc := v.vc
	if vc.Check != want.Check || len(vc.Rows) != len(want.VsCheck) {
		t.Fatalf("compared %d entries with %q; R compares %d with %q", len(vc.Rows), vc.Check, len(want.VsCheck), want.Check)
	}
	for i, w := range want.VsCheck {
		g := vc.Rows[i]
		if g.Treatment != w.Treatment {
			t.Fatalf("row %d is %s, R's is %s", i, g.Treatment, w.Treatment)
		}
		if math.Abs(g.Diff-w.Diff) > 1e-9 || math.Abs(g.SE-w.SE) > 1e-9 {
			t.Errorf("%s: difference %.9f SE %.9f, R gives %.9f %.9f", w.Treatment, g.Diff, g.SE, w.Diff, w.SE)
		}
		if math.Abs(g.PTwoSided-w.PTwo) > 2e-5 || math.Abs(g.PBetter-w.PGreater) > 2e-5 {
			t.Errorf("%s: P %.6f (higher %.6f), R gives %.6f (%.6f)", w.Treatment, g.PTwoSided, g.PBetter, w.PTwo, w.PGreater)
		}
		verdict := "not different"
		switch {
		case g.Lower > 0:
			verdict = "better"
		case g.Upper < 0:
			verdict = "worse"
		}
		row := v.table.rows[i]
		if row[1] != verdict || row[1] != g.Verdict {
			t.Errorf("%s: shown %q, interval %.3f–%.3f says %q", w.Treatment, row[1], g.Lower, g.Upper, verdict)
		}
		// The table shows the two-sided P as R gives it, to 3 decimals.
		if p := pText(t, row[4]); math.Abs(p-w.PTwo) > 0.00051 {
			t.Errorf("%s: P shown %s, R gives %.5f", w.Treatment, row[4], w.PTwo)
		}
	}
	if len(v.chartBox.Objects) != 1 {
		t.Error("no interval chart beside the table")
	}

	// Another treatment as the check: N2 against every other, the old
	// check among them.
	v.checkSel.SetSelected(v.checkSel.Options[indexOf(v.codes, "N2")])
	pumpUntil(t, u, "the comparisons with N2", func() bool { return v.vc != nil && v.vc.Check == "N2" })
	found := false
	for _, r := range v.vc.Rows {
		if r.Treatment == "STD" {
			found = true
			// STD − N2 is minus (N2 − STD), R's second row.
			if math.Abs(r.Diff+want.VsCheck[1].Diff) > 1e-9 || math.Abs(r.SE-want.VsCheck[1].SE) > 1e-9 {
				t.Errorf("STD − N2 = %.9f (SE %.9f); R's N2 − STD is %.9f (SE %.9f)", r.Diff, r.SE, want.VsCheck[1].Diff, want.VsCheck[1].SE)
			}
		}
	}
	if !found {
		t.Error("the old check is not compared with the new one")
	}
}

// A trial without a check says how to get one, and shows no comparison.
func TestVsCheckWithoutCheck(t *testing.T) {
	tr := dunnettTrial(t)
	for i := range tr.Treatments {
		tr.Treatments[i].Role = trial.RoleEntry
	}
	u, _ := newTestApp(t, 0)
	u.OpenTrial(tr, "")
	pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	v := vsCheckOf(t, u.steps[stepCompare].(*compareStep))
	if v.vc != nil || len(v.table.rows) != 0 || v.note.Text == "" || v.checkSel.Selected != "" {
		t.Fatalf("without a check: note %q, %d rows, selected %q", v.note.Text, len(v.table.rows), v.checkSel.Selected)
	}
	if len(v.checkSel.Options) != len(tr.Treatments) {
		t.Errorf("%d treatments to choose from, want %d", len(v.checkSel.Options), len(tr.Treatments))
	}
}

// The summary of all traits gets a "vs check" column once the comparisons
// with the trial's check are done (after the round, off the UI goroutine):
// better where R's multcomp two-sided adjusted p is below 0.05 and the
// difference positive (higher is better here), ns where p is above it
// (stats/refdata/dunnett-example.expected.json), "check" for the check itself.
func TestSummaryVsCheckColumn(t *testing.T) {
	data, err := refdata.ReadFile("dunnett-example.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var want struct {
		Check   string `json:"check"`
		VsCheck []struct {
			Treatment string  `json:"treatment"`
			Diff      float64 `json:"diff"`
			P         float64 `json:"p_two_sided"`
		} `json:"vs_check"`
	}
	if err := json.Unmarshal(data, &want); err != nil {
		t.Fatal(err)
	}
	u, _ := newTestApp(t, 0)
	u.OpenTrial(dunnettTrial(t), "")
	s := pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	pumpUntil(t, u, "the comparisons with the check", func() bool { return s.vsChecks != nil })
	c := u.steps[stepCompare].(*compareStep)
	col := -1
	for i, h := range c.summaryHead {
		if strings.HasSuffix(h, " vs check") {
			col = i
		}
	}
	if col < 0 {
		t.Fatalf("no vs check column in %v", c.summaryHead)
	}
	reading := map[string]string{}
	for _, row := range c.summaryRows {
		if len(row) > col {
			reading[strings.Fields(row[0])[0]] = row[col]
		}
	}
	for _, w := range want.VsCheck {
		exp := "ns"
		if w.P < 0.05 && w.Diff > 0 {
			exp = "better"
		} else if w.P < 0.05 {
			exp = "worse"
		}
		if reading[w.Treatment] != exp {
			t.Errorf("%s: %q, want %q (R p = %.4f, diff %.3f)", w.Treatment, reading[w.Treatment], exp, w.P, w.Diff)
		}
	}
	if reading[want.Check] != "check" {
		t.Errorf("the check %s reads %q", want.Check, reading[want.Check])
	}
}
