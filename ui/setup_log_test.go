package ui

import (
	"strings"
	"testing"

	"fyne.io/fyne/v2/widget"
)

// The Log tab adds an entry typed into its form to the trial's log (in
// date order), refuses an application without a product in words, and
// Undo takes the entry away again.
func TestLogTabAddRemoveUndo(t *testing.T) {
	u, _ := newTestApp(t, 0)
	u.OpenTrial(dunnettTrial(t), "")
	u.showStep(stepSetup)
	s := u.steps[stepSetup].(*setupStep)
	l := s.log
	l.kind.SetSelected("Application")
	l.date.SetText("2026-05-14")
	l.treatments.SetText("N1, N2")
	l.addEntry()
	if len(u.doc.t.Operations) != 0 || !strings.Contains(l.message.Text, "name of the product") {
		t.Fatalf("application without a product: %v, %q", u.doc.t.Operations, l.message.Text)
	}
	l.product.SetText("Programme A")
	l.rate.SetText("1,5") // a decimal comma, as typed on many laptops
	l.rateUnit.SetText("L/ha")
	l.humidity.SetText("65")
	l.addEntry()
	ops := u.doc.t.Operations
	if len(ops) != 1 || ops[0].Product != "Programme A" || *ops[0].Rate != 1.5 || *ops[0].Humidity != 65 ||
		strings.Join(ops[0].Treatments, ",") != "N1,N2" || !u.doc.dirty {
		t.Fatalf("log after add: %+v", ops)
	}
	l.kind.SetSelected("Sowing")
	l.date.SetText("2026-04-02")
	l.addEntry()
	if ops := u.doc.t.Operations; len(ops) != 2 || ops[0].Kind != "sowing" {
		t.Fatalf("not in date order: %+v", ops)
	}
	if len(l.list.rows) != 2 || l.list.rows[0][1] != "2026-04-02" || !strings.Contains(l.list.rows[1][4], "1.5 L/ha") {
		t.Errorf("list rows %v", l.list.rows)
	}
	l.date.SetText("14 May")
	l.addEntry()
	if len(u.doc.t.Operations) != 2 || !strings.Contains(l.message.Text, "YYYY-MM-DD") {
		t.Errorf("bad date: %q", l.message.Text)
	}
	if !u.doc.undo() || len(u.doc.t.Operations) != 1 || len(l.list.rows) != 1 {
		t.Fatalf("undo: %+v, %d rows", u.doc.t.Operations, len(l.list.rows))
	}
	l.list.Select(widgetCell(0, 0))
	l.removeEntry()
	if len(u.doc.t.Operations) != 0 || !strings.Contains(l.message.Text, "Removed") {
		t.Errorf("remove: %+v, %q", u.doc.t.Operations, l.message.Text)
	}
}

func widgetCell(row, col int) widget.TableCellID { return widget.TableCellID{Row: row, Col: col} }
