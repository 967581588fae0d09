package trial

import "testing"

// TestDesignNames: every way a design is named, in one table. The names are
// the trade's (common practice: "completely randomised design", CRD; "randomised
// complete block design", RCBD; "Latin square").
func TestDesignNames(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		d                               Design
		cli, name, abbrev, title, descr string
		brief                           string
	}{
		{Design{Kind: CRD, Reps: 4}, "crd", "completely randomised design", "CRD", "Completely randomised design (CRD)", "completely randomised design, 4 replicates", "CRD, 4 reps"},
		{Design{Kind: RCBD, Reps: 3}, "rcbd", "randomised complete block design", "RCBD", "Randomised complete block design (RCBD)", "randomised complete block design, 3 blocks", "RCBD, 3 blocks"},
		{Design{Kind: Latin, Reps: 5}, "latin", "Latin square", "Latin square", "Latin square", "5 × 5 Latin square", "Latin square"},
		{Design{Kind: "alpha", Reps: 2}, "alpha", `unknown design "alpha"`, `unknown design "alpha"`, `Unknown design "alpha"`, `unknown design "alpha"`, `unknown design "alpha"`},
	} {
		k := c.d.Kind
		got := []string{k.CLIName(), k.Name(), k.Abbrev(), k.Title(), c.d.Describe(), c.d.Brief()}
		want := []string{c.cli, c.name, c.abbrev, c.title, c.descr, c.brief}
		for i := range got {
			if got[i] != want[i] {
				t.Errorf("%s: name %d = %q, want %q", k, i, got[i], want[i])
			}
		}
		if p, ok := ParseDesignKind(" " + c.cli + " "); ok != k.Known() || (ok && p != k) {
			t.Errorf("ParseDesignKind(%q) = %q, %v", c.cli, p, ok)
		}
	}
	if p, ok := ParseDesignKind("RCBD"); !ok || p != RCBD {
		t.Errorf("ParseDesignKind is case-sensitive: %q %v", p, ok)
	}
	for _, k := range DesignKinds() {
		if !k.Known() {
			t.Errorf("%s listed but not known", k)
		}
	}
}
