package analysis

import (
	"strings"
	"testing"
)

// TestFactorialMissingNoteOnce: a factorial with a missing plot says once,
// in the model's words (type II), that its lines no longer add up (common
// practice: one note per fact); a one-list analysis keeps its own note.
func TestFactorialMissingNoteOnce(t *testing.T) {
	t.Parallel()
	rows := [][]string{{"a", "b", "y"}}
	vals := []string{"5.1", "", "6.0", "6.3", "4.8", "5.5", "6.4", "6.1", "5.0", "5.3", "6.2", "6.6"}
	for i, v := range vals {
		rows = append(rows, []string{[]string{"a1", "a2"}[i%2], []string{"b1", "b2", "b3"}[(i/2)%3], v})
	}
	ds, err := ParseTable(rows, TableColumns{Factors: []string{"a", "b"}, Responses: []string{"y"}})
	if err != nil {
		t.Fatal(err)
	}
	r, err := AnalyzeData(ds[0], Options{})
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, s := range r.Warnings { // the notes and the readings, as shown
		n += strings.Count(s, "no longer add up")
	}
	if n != 1 {
		t.Errorf("%d notes that the lines no longer add up: %q %q", n, r.Notes, r.Warnings)
	}
}
