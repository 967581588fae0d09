package ui

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

// Only a refused randomisation is explained as one: a change of the
// treatments of a trial holding data is refused with the trial package's
// own reason (it names the treatments), not the randomising message.
func TestHasDataMessages(t *testing.T) {
	t.Parallel()
	tr := smallTrial(t)
	tr.Traits[0].Values[0] = 5.5
	err := tr.AddTreatment(trial.Treatment{Code: "D", Name: "Delta", Role: trial.RoleEntry})
	if err == nil {
		t.Fatal("a treatment of a trial holding data was changed")
	}
	m := explain("The treatment could not be added", fmt.Errorf("D: %w", err))
	if strings.Contains(m.What, "randomising again") || !strings.Contains(m.What, "treatments") {
		t.Fatalf("treatment edit refused with %q", m.What)
	}
	m = explain("The trial could not be randomised", trial.ErrHasData)
	if !strings.Contains(m.What, "randomising again") {
		t.Fatalf("randomisation refused with %q", m.What)
	}
}

// The Latin-square help states the limits validation uses (trial.MinLatin,
// trial.MaxLatin), and a square just outside them is refused.
func TestLatinLimitsOneSource(t *testing.T) {
	t.Parallel()
	help := designExplain[trial.Latin]
	if want := fmt.Sprintf("%d to %d", trial.MinLatin, trial.MaxLatin); !strings.Contains(help, want) {
		t.Fatalf("Latin help %q does not say %q", help, want)
	}
	for _, n := range []int{trial.MinLatin - 1, trial.MaxLatin + 1} {
		trs := make([]trial.Treatment, n)
		for i := range trs {
			trs[i] = trial.Treatment{Code: fmt.Sprintf("T%02d", i+1), Role: trial.RoleEntry}
		}
		tt := &trial.Trial{Treatments: trs, Design: trial.Design{Kind: trial.Latin, Reps: n}}
		if tt.Validate() == nil {
			t.Errorf("a Latin square of %d treatments passed validation", n)
		}
	}
}

// crdTrial is smallTrial laid out as a completely randomised design.
func crdTrial(t *testing.T) *trial.Trial {
	t.Helper()
	tr, err := trial.New(trial.NewOptions{
		Title: "Bench test", Crop: "wheat", Season: "2026",
		Treatments: []trial.Treatment{{Code: "A", Role: trial.RoleEntry}, {Code: "B", Role: trial.RoleEntry}, {Code: "C", Role: trial.RoleEntry}},
		Design:     trial.Design{Kind: trial.CRD, Reps: 4},
		Traits:     []trial.Trait{{Key: "ht", Name: "Height", Unit: "cm", Kind: trial.Continuous, Decimals: 0}},
		Seed:       7,
		Now:        time.Date(2026, 4, 1, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// gridTexts returns the header and the first row's texts as the grid draws them.
func gridTexts(r *recordStep) (head []string, row []string) {
	_, cols := r.length()
	for c := range cols {
		h := r.table.CreateHeader()
		r.updateHeader(widget.TableCellID{Row: -1, Col: c}, h)
		head = append(head, h.(*widget.Label).Text)
		cell := newGridCell()
		r.updateCell(widget.TableCellID{Row: 0, Col: c}, cell)
		row = append(row, cell.(*fyne.Container).Objects[1].(*fyne.Container).Objects[0].(*canvas.Text).Text)
	}
	return head, row
}

// A completely randomised trial has no blocks, so the Record grid shows no
// block column (common practice: a CRD has only plots and treatments), and
// typing still reaches the trait's column; an RCBD keeps its blocks.
func TestRecordNoBlocksForCRD(t *testing.T) {
	u, w := newTestApp(t, 0)
	u.OpenTrial(crdTrial(t), "")
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	head, row := gridTexts(r)
	if len(head) != 4 || head[0] != "Plot" || head[1] != "Treatment" || !strings.HasPrefix(head[2], "Height") {
		t.Fatalf("CRD grid columns %q", head)
	}
	if row[1] != u.doc.t.Plots[0].Treatment {
		t.Fatalf("CRD first row %q", row)
	}
	click(t, r, 0, 2)
	if strings.Contains(r.where.Text, "Rep") || strings.Contains(r.where.Text, "Block") {
		t.Fatalf("CRD cell described as %q", r.where.Text)
	}
	keys(t, w, "78\n")
	if v := u.doc.t.Traits[0].Values[0]; v != 78 {
		t.Fatalf("CRD value %v, want 78", v)
	}

	u2, _ := newTestApp(t, 0)
	u2.OpenTrial(smallTrial(t), "")
	u2.showStep(stepRecord)
	head, _ = gridTexts(u2.steps[stepRecord].(*recordStep))
	if head[1] != "Block" {
		t.Fatalf("RCBD grid columns %q", head)
	}
}

// The adjusted-yield dialog reads the standard moisture as every typed
// number is read: "15,5" (decimal comma) is 15.5.
func TestAdjustedYieldDecimalComma(t *testing.T) {
	u, _ := newTestApp(t, 0)
	tr := smallTrial(t)
	tr.Traits = append(tr.Traits, trial.Trait{Key: "wt", Name: "Plot weight", Unit: "kg", Kind: trial.Continuous, Decimals: 2},
		trial.Trait{Key: "mo", Name: "Moisture", Unit: "%", Kind: trial.Percent, Decimals: 1})
	for i := range tr.Traits[2:] {
		tr.Traits[2+i].Values = make([]float64, len(tr.Plots))
		for j := range tr.Traits[2+i].Values {
			tr.Traits[2+i].Values[j] = trial.Missing
		}
	}
	u.OpenTrial(tr, "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	if !s.addAdjustedYield("yield", "wt", "mo", "15,5", trial.UnitTHa) {
		t.Fatal("15,5 refused")
	}
	y := u.doc.t.Trait("yield")
	if y == nil || y.Derived == nil || y.Derived.StandardMoisture != 15.5 {
		t.Fatalf("yield trait %+v", y)
	}
}

// Apply design says what changed, and that nothing did when nothing did.
func TestApplyDesignFeedback(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	s.applyDesign()
	if !strings.Contains(s.designDone.Text, "Nothing to change") {
		t.Fatalf("unchanged design: %q", s.designDone.Text)
	}
	s.reps.SetText("4")
	s.applyDesign()
	if got := s.designDone.Text; !strings.Contains(got, "4 blocks") || !strings.Contains(got, "16 plots") || !strings.Contains(got, "randomise") {
		t.Fatalf("changed design: %q", got)
	}
}

// Small things of issue 12: Undo names what it undid, counts take the
// singular for one, Randomise is off once data exist, Enter in the Code
// field applies the change, the selected cell keeps a frame over a flag
// colour, and "plots per row" 0 shows as empty with its meaning stated.
func TestStepsSmallThings(t *testing.T) {
	u, w := newTestApp(t, 0)
	u.OpenTrial(smallTrial(t), "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	s.trtList.Select(1)
	s.trtForm.code.SetText("B2")
	s.trtForm.code.TypedKey(&fyne.KeyEvent{Name: fyne.KeyReturn})
	if u.doc.t.Treatment("B2") == nil || !strings.Contains(s.trtMsg.Text, "code is now B2") {
		t.Fatalf("Enter in Code: treatments %+v, message %q", u.doc.t.Treatments, s.trtMsg.Text)
	}
	u.showStep(stepRecord)
	r := u.steps[stepRecord].(*recordStep)
	click(t, r, 0, fixedCols)
	keys(t, w, "12\n") // above the 0–10 range: flagged
	click(t, r, 0, fixedCols)
	c := newGridCell()
	r.updateCell(widget.TableCellID{Row: 0, Col: fixedCols}, c)
	bg := c.(*fyne.Container).Objects[0].(*canvas.Rectangle)
	if bg.FillColor == nil || bg.StrokeWidth == 0 || bg.StrokeColor == nil {
		t.Fatalf("flagged selected cell: fill %v, frame %v %v", bg.FillColor, bg.StrokeWidth, bg.StrokeColor)
	}
	u.undo()
	if got, want := u.status.Text, "Undid: value of plot "+fmt.Sprint(u.doc.t.Plots[0].Number)+", Yield."; got != want {
		t.Fatalf("undo status %q, want %q", got, want)
	}

	one := &trial.Trial{Treatments: []trial.Treatment{{Code: "A"}}, Traits: []trial.Trait{{Key: "y"}}, Design: trial.Design{Kind: trial.RCBD, Reps: 3}}
	if s := setupStatus(one); !strings.Contains(s, "1 treatment ·") || !strings.Contains(s, "1 trait") || strings.Contains(s, "1 traits") {
		t.Fatalf("setup status %q", s)
	}

	u.showStep(stepField)
	f := u.steps[stepField].(*fieldStep)
	if f.randomBtn.Disabled() {
		t.Fatal("Randomise off before any data")
	}
	if f.perRow.Text != "" || !strings.Contains(f.perRow.PlaceHolder, "each block in one row") {
		t.Fatalf("plots per row shows %q (placeholder %q)", f.perRow.Text, f.perRow.PlaceHolder)
	}
	u.showStep(stepRecord)
	click(t, r, 1, fixedCols)
	keys(t, w, "5\n")
	u.showStep(stepField)
	if !f.randomBtn.Disabled() || !strings.Contains(f.randomState.Text, "Randomise is off") {
		t.Fatalf("Randomise with data: disabled %v, %q", f.randomBtn.Disabled(), f.randomState.Text)
	}

}
