package xlsx

import (
	"bytes"
	"strings"
	"testing"
	"time"

	"furlong/trial"
	"furlong/trial/fieldbook"
)

// TestFieldBookFactorColumns: the workbook field book of a strip plot has
// the columns of the CSV book (issue 8's field-book contract: one column
// per factor key after treatment_name, then main_plot, and strip), cell for
// cell, and reads back into the trial with no issue (the CSV book as the
// reference).
func TestFieldBookFactorColumns(t *testing.T) {
	t.Parallel()
	tr, err := trial.New(trial.NewOptions{
		Title: "Irrigation by nitrogen, Larkspur Bend farm",
		Factors: []trial.Factor{
			{Key: "I", Levels: []trial.Level{{Code: "dry"}, {Code: "wet"}}},
			{Key: "N", Levels: []trial.Level{{Code: "N0"}, {Code: "N50"}, {Code: "N100"}}},
		},
		Design: trial.Design{Kind: trial.StripPlot, Reps: 2},
		Traits: []trial.Trait{{Key: "yield", Kind: trial.Continuous, Decimals: 2}},
		Seed:   8, Now: time.Unix(0, 0),
	})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := WriteFieldBook(&buf, tr, FieldBookOptions{}); err != nil {
		t.Fatal(err)
	}
	b, err := ReadBook(&buf)
	if err != nil {
		t.Fatal(err)
	}
	want := fieldbook.Rows(tr)
	if got := strings.Join(b.Rows[0], ","); got != strings.Join(want[0], ",") {
		t.Fatalf("header %s, want %s", got, strings.Join(want[0], ","))
	}
	for i := 1; i < len(want); i++ {
		for c := 0; c < len(want[i])-1; c++ { // the trait column is empty in both
			if b.Rows[i][c] != want[i][c] {
				t.Fatalf("row %d column %s: %q, want %q", i, want[0][c], b.Rows[i][c], want[i][c])
			}
		}
	}
	p, err := fieldbook.PlanBook(tr, b)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Errors()) > 0 || len(p.Warnings()) > 0 {
		t.Errorf("own workbook: %v %v", p.Errors(), p.Warnings())
	}
}
