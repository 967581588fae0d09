package cli

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"furlong/sampledata"
	"furlong/trial/trialfile"
)

func TestPlanAgainstR(t *testing.T) {
	t.Parallel()
	// Reference: R 4.2.2 pt/qt with ncp (stats/refdata/planning.expected.json,
	// copied from the shared round-2 reference data): detectable difference
	// for rcbd 8 × 4 CV 10 → 20.7760054247588 %, crd 4 × 5 CV 7 power 0.9 →
	// 15.2967308700229 %, rcbd 20 × 3 CV 5 → 11.7368053437702 %.
	for _, c := range []struct {
		args []string
		df   int
		want float64
	}{
		{[]string{"--design", "rcbd", "--treatments", "8", "--reps", "4", "--cv", "10"}, 21, 20.7760054247588},
		{[]string{"--design", "crd", "--treatments", "4", "--reps", "5", "--cv", "7", "--power", "0.9"}, 16, 15.2967308700229},
		{[]string{"--design", "rcbd", "--treatments", "20", "--reps", "3", "--cv", "5"}, 38, 11.7368053437702},
	} {
		code, stdout, stderr := run(t, append([]string{"plan", "--format", "json"}, c.args...)...)
		if code != ExitOK {
			t.Fatalf("%v: exit %d: %s", c.args, code, stderr)
		}
		var got planResult
		if err := json.Unmarshal([]byte(stdout), &got); err != nil {
			t.Fatal(err)
		}
		if got.DFError != c.df || math.Abs(got.Detectable-c.want) > 1e-8 {
			t.Errorf("%v: df %d detectable %.12g; want %d, %.12g", c.args, got.DFError, got.Detectable, c.df, c.want)
		}
		if got.Note == "" || len(got.Curve) == 0 {
			t.Errorf("%v: no note or no curve", c.args)
		}
	}
}

func TestPlanRepsNeededAndText(t *testing.T) {
	t.Parallel()
	// 15 % with CV 7, power 0.9 in a CRD of 4: 5 replicates detect 15.30 %
	// (R reference above), so 6 are needed (6 detect less than 15 %).
	code, stdout, stderr := run(t, "plan", "--design", "crd", "--treatments", "4", "--difference", "15", "--cv", "7", "--power", "0.9", "--format", "json")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var got planResult
	if err := json.Unmarshal([]byte(stdout), &got); err != nil {
		t.Fatal(err)
	}
	if got.RepsNeeded == nil || *got.RepsNeeded != 6 || got.Detectable >= 15 {
		t.Errorf("reps needed %v, detectable %g; want 6 and < 15", got.RepsNeeded, got.Detectable)
	}
	code, stdout, _ = run(t, "plan", "--design", "crd", "--treatments", "4", "--difference", "15", "--cv", "7", "--power", "0.9")
	if code != ExitOK || !strings.Contains(stdout, "6 replicates") || !strings.Contains(stdout, "CV expected next season") {
		t.Errorf("text output:\n%s", stdout)
	}
}

func TestPlanCVFromTrial(t *testing.T) {
	t.Parallel()
	// The CV% taken from a trial is the one its analysis reports
	// (the same number "furlong analyze" prints).
	tr, err := sampledata.Trial()
	if err != nil {
		t.Fatal(err)
	}
	path := filepath.Join(t.TempDir(), "demo.furlong")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := trialfile.Encode(f, tr); err != nil {
		t.Fatal(err)
	}
	f.Close()
	key := tr.Traits[0].Key
	code, stdout, stderr := run(t, "plan", "--treatments", "8", "--reps", "4", "--cv-from", path, "--trait", key, "--format", "json")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var got planResult
	if err := json.Unmarshal([]byte(stdout), &got); err != nil {
		t.Fatal(err)
	}
	code, astdout, stderr := run(t, "analyze", path, "--trait", key, "--format", "json")
	if code != ExitOK {
		t.Fatalf("analyze: exit %d: %s", code, stderr)
	}
	var an struct {
		Traits []struct {
			CV *float64 `json:"cv_percent"`
		} `json:"traits"`
	}
	if err := json.Unmarshal([]byte(astdout), &an); err != nil {
		t.Fatalf("analyze JSON: %v", err)
	}
	if len(an.Traits) != 1 || an.Traits[0].CV == nil {
		t.Fatalf("analyze JSON has no cv_percent: %s", astdout)
	}
	if !strings.Contains(got.CVSource, key) || got.CV != *an.Traits[0].CV {
		t.Errorf("cv %g from %q; analyze says %g", got.CV, got.CVSource, *an.Traits[0].CV)
	}
}

func TestPlanUsageErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		args []string
		in   string
	}{
		{[]string{"plan", "--treatments", "4", "--cv", "8"}, "--reps N"},
		{[]string{"plan", "--treatments", "4", "--reps", "3", "--difference", "10", "--cv", "8"}, "not both"},
		{[]string{"plan", "--treatments", "4", "--reps", "3"}, "--cv"},
		{[]string{"plan", "--design", "split", "--treatments", "4", "--reps", "3", "--cv", "8"}, "crd, rcbd or latin"},
		{[]string{"plan", "--treatments", "4", "--reps", "3", "--cv", "8", "--spread", "1,2"}, "one expected mean per treatment"},
		{[]string{"plan", "--treatments", "1", "--reps", "3", "--cv", "8"}, "2 or more"},
	} {
		code, _, stderr := run(t, c.args...)
		if code != ExitUsage || !strings.Contains(stderr, c.in) {
			t.Errorf("%v: exit %d, stderr %q; want usage error with %q", c.args, code, stderr, c.in)
		}
	}
	// A difference no number of replicates reaches is a failure, not a usage error.
	code, _, stderr := run(t, "plan", "--treatments", "4", "--difference", "0.5", "--cv", "30")
	if code != ExitFailure || !strings.Contains(stderr, "replicates") {
		t.Errorf("unreachable difference: exit %d, %q", code, stderr)
	}
}
