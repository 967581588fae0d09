package cli

import (
	"encoding/json"
	"math"
	"path/filepath"
	"strings"
	"testing"
)

// TestContrastsCommand saves contrasts in the demo trial with 'furlong
// contrasts', removes one, and finds the saved one estimated by 'furlong
// analyze' exactly as when it is given with --contrast; the errors are
// plain and leave the file as it was.
func TestContrastsCommand(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "demo.furlong")
	if code, _, errs := run(t, "new", "--demo", "-o", path); code != 0 {
		t.Fatalf("new --demo: %d %s", code, errs)
	}
	code, out, errs := run(t, "contrasts", path)
	if code != 0 || !strings.Contains(out, "no saved contrasts") {
		t.Fatalf("list: %d %q %q", code, out, errs)
	}
	code, out, errs = run(t, "contrasts", path, "--add", "new=HM01,HM02 vs CHK", "--add", "one=HM01:1,HM02:-1")
	if code != 0 || !strings.Contains(out, "2 saved contrasts:\n  new=HM01,HM02 vs CHK\n  one=HM01:1,HM02:-1\n") {
		t.Fatalf("add: %d %q %q", code, out, errs)
	}
	code, out, _ = run(t, "contrasts", path, "--remove", "one")
	if code != 0 || !strings.Contains(out, "1 saved contrast:\n  new=HM01,HM02 vs CHK\n") {
		t.Fatalf("remove: %d %q", code, out)
	}
	for _, tc := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"--remove", "nope"}, 1, `no contrast "nope" (it has new)`},
		{[]string{"--add", "x=HM01 vs ZZ"}, 1, `no treatment "ZZ"`},
		{[]string{"--add", "bad"}, 2, "--add"},
		{[]string{"--add", "x=HM01:1,HM02:1"}, 1, "add up to 0"},
	} {
		code, _, errs := run(t, append([]string{"contrasts", path}, tc.args...)...)
		if code != tc.code || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d %q; want %d and %q", tc.args, code, errs, tc.code, tc.want)
		}
	}
	code, out, _ = run(t, "contrasts", path)
	if code != 0 || !strings.Contains(out, "1 saved contrast:\n  new=HM01,HM02 vs CHK\n") {
		t.Fatalf("after the errors: %d %q", code, out)
	}

	// The saved contrast and the same contrast given on the command line
	// (in a fresh copy of the demo) are the same numbers.
	fresh := filepath.Join(dir, "fresh.furlong")
	if code, _, errs := run(t, "new", "--demo", "-o", fresh); code != 0 {
		t.Fatalf("new --demo: %d %s", code, errs)
	}
	type contrast struct {
		Name     string  `json:"name"`
		Estimate float64 `json:"estimate"`
		SE       float64 `json:"se"`
		T        float64 `json:"t"`
	}
	get := func(args ...string) contrast {
		t.Helper()
		code, out, errs := run(t, append([]string{"analyze"}, append(args, "--trait", "wt", "--format", "json")...)...)
		if code != 0 {
			t.Fatalf("analyze %v: %d %s", args, code, errs)
		}
		var doc struct {
			Traits []struct {
				Contrasts []contrast `json:"contrasts"`
			} `json:"traits"`
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		if len(doc.Traits) != 1 || len(doc.Traits[0].Contrasts) != 1 {
			t.Fatalf("analyze %v: %+v", args, doc.Traits)
		}
		return doc.Traits[0].Contrasts[0]
	}
	saved := get(path)
	given := get(fresh, "--contrast", "new=HM01,HM02 vs CHK")
	if saved != given {
		t.Errorf("saved contrast %+v, given %+v", saved, given)
	}
	// t is the estimate over its SE (definition).
	if math.Abs(saved.T-saved.Estimate/saved.SE) > 1e-12 {
		t.Errorf("t %v, estimate/SE %v", saved.T, saved.Estimate/saved.SE)
	}
	// The text output carries the table too.
	code, out, _ = run(t, "analyze", path, "--trait", "wt")
	if code != 0 || !strings.Contains(out, "Contrasts (t tests on") || !strings.Contains(out, "HM01,HM02 vs CHK") {
		t.Errorf("analyze text: %d, no contrasts table:\n%s", code, out)
	}
}

// TestContrastsSavedAdjustment: 'furlong contrasts --adjust holm' saves the
// adjustment; 'furlong analyze' then adjusts the saved contrasts by Holm
// (Holm 1979, Scand. J. Statist. 6, 65–70: the smaller p times 2, the
// larger p but never below the first), and --adjust none on the command
// line still overrides it.
func TestContrastsSavedAdjustment(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "demo.furlong")
	if code, _, errs := run(t, "new", "--demo", "-o", path); code != 0 {
		t.Fatalf("new --demo: %d %s", code, errs)
	}
	code, out, errs := run(t, "contrasts", path, "--add", "new=HM01,HM02 vs CHK", "--add", "one=HM01:1,HM02:-1", "--adjust", "holm")
	if code != 0 || !strings.Contains(out, "p-values adjusted together: holm") {
		t.Fatalf("save: %d %q %q", code, out, errs)
	}
	type contrastJSON struct {
		Name      string  `json:"name"`
		P         float64 `json:"p"`
		PAdjusted float64 `json:"p_adjusted"`
	}
	get := func(args ...string) []contrastJSON {
		t.Helper()
		code, out, errs := run(t, append([]string{"analyze", path, "--trait", "yield", "--format", "json"}, args...)...)
		if code != 0 {
			t.Fatalf("analyze: %d %s", code, errs)
		}
		var doc struct {
			Traits []struct {
				Contrasts []contrastJSON `json:"contrasts"`
			} `json:"traits"`
		}
		if err := json.Unmarshal([]byte(out), &doc); err != nil {
			t.Fatal(err)
		}
		return doc.Traits[0].Contrasts
	}
	cs := get()
	if len(cs) != 2 {
		t.Fatalf("contrasts %+v", cs)
	}
	lo, hi := cs[0], cs[1]
	if lo.P > hi.P {
		lo, hi = hi, lo
	}
	first := math.Min(1, 2*lo.P)
	second := math.Min(1, math.Max(first, hi.P))
	if math.Abs(lo.PAdjusted-first) > 1e-12 || math.Abs(hi.PAdjusted-second) > 1e-12 {
		t.Errorf("saved Holm: %+v, by hand %g and %g", cs, first, second)
	}
	for _, c := range get("--adjust", "none") {
		if c.PAdjusted != c.P {
			t.Errorf("--adjust none: %+v", c)
		}
	}
	if code, _, errs := run(t, "contrasts", path, "--adjust", "sidak"); code != ExitUsage || !strings.Contains(errs, "not known") {
		t.Errorf("unknown adjustment: %d %q", code, errs)
	}
}
