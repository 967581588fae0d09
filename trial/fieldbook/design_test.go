package fieldbook

import (
	"bytes"
	"encoding/csv"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"furlong/trial"
)

// splitTrial is an invented split plot (fictional varieties) with one
// trait.
func splitTrial(t *testing.T, kind trial.DesignKind, nf int) *trial.Trial {
	t.Helper()
	fs := []trial.Factor{
		{Key: "N", Levels: []trial.Level{{Code: "N0"}, {Code: "N60"}}},
		{Key: "V", Levels: []trial.Level{{Code: "V1"}, {Code: "V2"}, {Code: "V3"}}},
		{Key: "S", Levels: []trial.Level{{Code: "early"}, {Code: "late"}}},
	}[:nf]
	tr, err := trial.New(trial.NewOptions{Factors: fs, Design: trial.Design{Kind: kind, Reps: 2},
		Traits: []trial.Trait{{Key: "yield", Kind: trial.Continuous}}, Seed: 3, Now: time.Unix(0, 0)})
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// TestDesignColumns: the header of each kind of field book, as issue 8's
// field-book contract gives it (one column per factor key after
// treatment_name, then main_plot for split and strip plots); a trial with
// one list of treatments keeps the header it always had.
func TestDesignColumns(t *testing.T) {
	t.Parallel()
	fixed := "plot,block,row,column,treatment,treatment_name,"
	for _, c := range []struct {
		kind trial.DesignKind
		nf   int
		want string
	}{
		{trial.RCBD, 2, fixed + "N,V,yield"},
		{trial.SplitPlot, 2, fixed + "N,V,main_plot,yield"},
		{trial.SplitPlot, 3, fixed + "N,V,S,main_plot,sub_plot,yield"},
		{trial.StripPlot, 2, fixed + "N,V,main_plot,strip,yield"},
	} {
		tr := splitTrial(t, c.kind, c.nf)
		rows := Rows(tr)
		if got := strings.Join(rows[0], ","); got != c.want {
			t.Errorf("%s: header %s, want %s", c.kind, got, c.want)
		}
		for i, p := range tr.Plots {
			r := rows[i+1]
			trt := tr.Treatment(p.Treatment)
			for f := range tr.Factors {
				if r[6+f] != trt.Levels[f] {
					t.Fatalf("%s: plot %d has level %s in column %d", c.kind, p.Number, r[6+f], 6+f)
				}
			}
			if c.kind.Restricted() && r[6+c.nf] != strconv.Itoa(p.MainPlot) {
				t.Fatalf("%s: plot %d main_plot %s, want %d", c.kind, p.Number, r[6+c.nf], p.MainPlot)
			}
		}
	}
	one, err := trial.New(trial.NewOptions{Treatments: []trial.Treatment{{Code: "A"}, {Code: "B"}}, Design: trial.Design{Kind: trial.RCBD, Reps: 2},
		Traits: []trial.Trait{{Key: "yield"}}, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if got := strings.Join(Rows(one)[0], ","); got != fixed+"yield" {
		t.Errorf("one list: header %s", got)
	}
}

// TestFactorBookRoundTrip: a factorial book written, filled in and read
// back imports every value with no issue; a book of another layout (a
// level code changed) is an error, a changed main-plot number a warning,
// and factor columns may be headed in any case (the contract of the
// package doc: writing a book and importing it again never changes data).
func TestFactorBookRoundTrip(t *testing.T) {
	t.Parallel()
	tr := splitTrial(t, trial.SplitPlot, 3)
	rows := Rows(tr)
	yc := len(rows[0]) - 1
	for i := 1; i < len(rows); i++ {
		rows[i][yc] = formatValue(float64(i) + 0.25)
	}
	var buf bytes.Buffer
	if err := csv.NewWriter(&buf).WriteAll(rows); err != nil {
		t.Fatal(err)
	}
	table, err := ReadTable(&buf)
	if err != nil {
		t.Fatal(err)
	}
	table[0][6] = "n" // any case
	p, err := Plan(tr, table)
	if err != nil {
		t.Fatal(err)
	}
	if len(p.Errors()) > 0 || len(p.Warnings()) > 0 {
		t.Fatalf("own book: %v %v", p.Errors(), p.Warnings())
	}
	if _, err := p.Apply(tr, false); err != nil {
		t.Fatal(err)
	}
	for i, v := range tr.Traits[0].Values {
		if want := float64(i+1) + 0.25; v != want || math.IsNaN(v) {
			t.Fatalf("plot %d: %g, want %g", i, v, want)
		}
	}
	bad := slices.Clone(table)
	bad[1] = slices.Clone(table[1])
	bad[1][6] = map[string]string{"N0": "N60", "N60": "N0"}[table[1][6]]
	bad[2] = slices.Clone(table[2])
	bad[2][9] = "7"
	p, err = Plan(tr, bad)
	if err != nil {
		t.Fatal(err)
	}
	if e := p.Errors(); len(e) != 1 || !strings.Contains(e[0].Message, "belongs to another layout") {
		t.Errorf("errors %v", e)
	}
	if w := p.Warnings(); len(w) != 1 || !strings.Contains(w[0].Message, "main plot") {
		t.Errorf("warnings %v", w)
	}
}
