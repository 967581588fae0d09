package ui

import (
	"context"
	"math"
	"testing"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/test"
	"fyne.io/fyne/v2/widget"

	"furlong/sampledata"
	"furlong/stats/meansep"
	"furlong/trial/analysis"
)

// Switching to Tukey shows the Tukey letters of the same analysis, and a
// new significance level recomputes with it.
func TestCompareControls(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 4 + float64(tr.TreatmentIndex(tr.Plots[i].Treatment)) + float64(i%3)/10
		tr.Traits[1].Values[i] = float64(300 + i)
	}
	u.OpenTrial(tr, "")
	waitAnalysis(t, u, func() { u.showStep(stepCompare) })
	c := u.steps[stepCompare].(*compareStep)
	if c.traitKey != "yld" {
		t.Fatalf("Compare opened on %q", c.traitKey)
	}
	// The all-traits view is the report's summary (export.NewSummary): a
	// row per treatment, then mean, CV, LSD and P lines.
	if len(c.summaryHead) != 1+len(tr.Traits)+1 || len(c.summaryRows) != len(tr.Treatments)+4 {
		t.Errorf("summary %v with %d rows", c.summaryHead, len(c.summaryRows))
	}
	cell := func(row, col int) string {
		o := compactCell("", false)
		c.updateMean(widget.TableCellID{Row: row, Col: col}, o)
		return o.(*fyne.Container).Objects[0].(*canvas.Text).Text
	}
	if got, want := cell(0, 4), c.meanRows[0].LettersLSD; got != want {
		t.Errorf("LSD letters shown %q, want %q", got, want)
	}
	waitAnalysis(t, u, func() { c.methodSel.SetSelected(methodLabel(meansep.Tukey)) })
	if got, want := cell(0, 4), c.meanRows[0].LettersTukey; got != want {
		t.Errorf("Tukey letters shown %q, want %q", got, want)
	}
	set := waitAnalysis(t, u, func() { c.alphaSel.SetSelected("0.01") })
	if set.alpha != 0.01 || set.result("yld").res.Alpha != 0.01 {
		t.Errorf("alpha of the new round %v", set.alpha)
	}
	// Best mean first: yield is higher-is-better, so the largest mean leads.
	if c.meanRows[0].BackMean < c.meanRows[len(c.meanRows)-1].BackMean {
		t.Error("means not ordered best first")
	}
	// A round that finished after a newer one started is dropped.
	old := *set
	old.gen = u.compute.gen - 1
	old.traits = nil
	u.compute.deliver(&old)
	if u.compute.current != set {
		t.Error("a stale round replaced the current results")
	}
}

// The value entry's keys: ↓ stores and moves down, ↑ moves up, Esc puts
// back the stored value.
func TestEntryKeys(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	u.OpenTrial(tr, "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	r.table.Select(widget.TableCellID{Row: 4, Col: fixedCols})
	r.entry.SetText("")
	test.Type(r.entry, "6.5")
	r.entry.TypedKey(&fyne.KeyEvent{Name: fyne.KeyDown})
	if tr.Traits[0].Values[4] != 6.5 || r.sel.Row != 5 {
		t.Fatalf("↓: value %v, row %d", tr.Traits[0].Values[4], r.sel.Row)
	}
	r.entry.TypedKey(&fyne.KeyEvent{Name: fyne.KeyUp})
	if r.sel.Row != 4 || r.entry.Text != "6.5" {
		t.Fatalf("↑: row %d, entry %q", r.sel.Row, r.entry.Text)
	}
	r.entry.SetText("")
	test.Type(r.entry, "9")
	r.entry.TypedKey(&fyne.KeyEvent{Name: fyne.KeyEscape})
	if r.entry.Text != "6.5" || tr.Traits[0].Values[4] != 6.5 {
		t.Fatalf("Esc: entry %q, value %v", r.entry.Text, tr.Traits[0].Values[4])
	}
}

// Paste list reads the clipboard (the injected app's, never a global).
func TestPasteFromClipboard(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.newTrial()
	s := u.steps[stepSetup].(*setupStep)
	u.app.Clipboard().SetContent("N1\tNorth one\nN2\tNorth two\nCK\tFarm check\n")
	s.pasteTreatments(u.app.Clipboard().Content())
	got := u.doc.t.Treatments
	if len(got) != 3 || got[2].Code != "CK" || got[2].Name != "Farm check" {
		t.Fatalf("treatments %+v", got)
	}
	if setupStatus(u.doc.t) != "3 treatments · RCBD, 4 blocks · no traits yet" {
		t.Errorf("status %q", setupStatus(u.doc.t))
	}
	s.title.SetText("")
	if s.title.Validate() == nil {
		t.Error("an empty title passes validation")
	}
	u.undo()
	if len(u.doc.t.Treatments) != 0 {
		t.Error("the paste is not one undoable edit")
	}
	if u.doc.t.Title != "" {
		t.Errorf("undoing the paste also undid the title typed later: %q", u.doc.t.Title)
	}
}

// With imperial units the Field step shows feet (1 ft = 0.3048 m exactly,
// NIST Handbook 44, Appendix C) and reads untouched lengths back exactly.
func TestFieldFeet(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.prefs.onUnitsChanged(unitsImperial)
	tr := smallTrial(t)
	tr.Layout.PlotLength, tr.Layout.PlotWidth = 10, 1.5
	u.OpenTrial(tr, "")
	u.showStep(stepField)
	f := u.steps[stepField].(*fieldStep)
	if f.plotLen.Text != "32.808" {
		t.Fatalf("10 m shown as %q ft", f.plotLen.Text)
	}
	f.plotWid.SetText("6")
	l, err := f.layoutFromForm()
	if err != nil {
		t.Fatal(err)
	}
	if l.PlotLength != 10 || math.Abs(l.PlotWidth-1.8288) > 1e-12 {
		t.Errorf("read back %v m and %v m, want 10 and 1.8288", l.PlotLength, l.PlotWidth)
	}
}

// The window's round analyses every trait by the one per-trait rule
// (analysis.AnalyzeAll, as the report and the command line do): the same
// ANOVA and means for every trait of the demo trial.
func TestRoundMatchesAnalyzeAll(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr, err := sampledata.Trial()
	if err != nil {
		t.Fatal(err)
	}
	u.OpenTrial(tr, "")
	s := pumpAnalysis(t, u, func() { u.showStep(stepCompare) })
	outs, err := analysis.AnalyzeAll(context.Background(), s.snap, nil, analysis.Options{Alpha: s.alpha})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.traits) != len(outs) {
		t.Fatalf("%d traits in the round, %d by AnalyzeAll", len(s.traits), len(outs))
	}
	for i, oc := range outs {
		got := s.traits[i]
		if got.key != oc.Key || (got.err == nil) != (oc.Err == nil) {
			t.Fatalf("trait %d: %q (%v) vs %q (%v)", i, got.key, got.err, oc.Key, oc.Err)
		}
		if oc.Result == nil {
			continue
		}
		a, b := got.res, oc.Result
		ta, _ := a.ANOVA.Treatment()
		tb, _ := b.ANOVA.Treatment()
		if ta.F != tb.F || len(a.Means) != len(b.Means) {
			t.Errorf("%s: F %v vs %v", oc.Key, ta.F, tb.F)
			continue
		}
		for j := range a.Means {
			if a.Means[j].Mean != b.Means[j].Mean || a.Means[j].LettersLSD != b.Means[j].LettersLSD {
				t.Errorf("%s %s: %v %q vs %v %q", oc.Key, a.Means[j].Treatment, a.Means[j].Mean, a.Means[j].LettersLSD, b.Means[j].Mean, b.Means[j].LettersLSD)
			}
		}
	}
}
