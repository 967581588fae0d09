package trial

import "testing"

func TestPlannedErrorDF(t *testing.T) {
	t.Parallel()
	// Error df of the classic ANOVA tables (Cochran & Cox 1957, ch. 4), and
	// the df_error of the R planning reference (stats/refdata/planning.expected.json):
	// rcbd 8 × 4 → 21, crd 4 × 5 → 16, rcbd 20 × 3 → 38.
	for _, c := range []struct {
		kind    DesignKind
		t, r, w int
	}{
		{RCBD, 8, 4, 21}, {CRD, 4, 5, 16}, {RCBD, 20, 3, 38}, {Latin, 5, 5, 12}, {CRD, 2, 2, 2},
	} {
		got, err := PlannedErrorDF(c.kind, c.t, c.r)
		if err != nil || got != c.w {
			t.Errorf("%s %d × %d: %d, %v; want %d", c.kind, c.t, c.r, got, err, c.w)
		}
	}
	for _, c := range []struct {
		kind DesignKind
		t, r int
	}{
		{CRD, 1, 4}, {RCBD, 4, 1}, {RCBD, 4, MaxReps + 1}, {Latin, 4, 3}, {Latin, 2, 2}, {"alpha", 4, 4},
	} {
		if _, err := PlannedErrorDF(c.kind, c.t, c.r); err == nil {
			t.Errorf("%s %d × %d: no error", c.kind, c.t, c.r)
		}
	}
}
