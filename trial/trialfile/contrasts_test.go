package trialfile

import (
	"bytes"
	"os"
	"reflect"
	"strings"
	"testing"

	"furlong/trial"
)

// TestContrastsRoundTrip: saved contrasts (groups and coefficients) come
// back as they were saved.
func TestContrastsRoundTrip(t *testing.T) {
	t.Parallel()
	tr := richTrial()
	codes := tr.TreatmentCodes()
	want := []trial.Contrast{
		{Name: "treated vs first", First: codes[1:], Second: codes[:1]},
		{Name: "linear", Terms: []trial.ContrastTerm{{Treatment: codes[0], Weight: -1}, {Treatment: codes[1], Weight: 0.5}, {Treatment: codes[2], Weight: 0.5}}},
	}
	for _, c := range want {
		if err := tr.SetContrast(c); err != nil {
			t.Fatal(err)
		}
	}
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(buf.String(), `"contrasts": [`) {
		t.Fatalf("no contrasts in the file:\n%s", buf.String())
	}
	got, err := Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got.Analysis.Contrasts, want) {
		t.Errorf("contrasts %+v, want %+v", got.Analysis.Contrasts, want)
	}
}

// TestOlderVersionsIgnoreContrasts: a "contrasts" member in a file of
// version 3 or older is ignored like any unknown member (those versions had
// none), and the version 2 demo still opens with no contrasts.
func TestOlderVersionsIgnoreContrasts(t *testing.T) {
	t.Parallel()
	src := `{"format": "furlong-trial", "version": 3, "trial": {
	"analysis": {"mean_separation": "tukey", "contrasts": [{"name": "x", "first": ["a"], "second": ["b"]}]},
	"treatments": [{"code": "a"}, {"code": "b"}],
	"design": {"kind": "crd", "reps": 2}}}`
	tr, err := Decode(strings.NewReader(src))
	if err != nil {
		t.Fatal(err)
	}
	if tr.Analysis.Contrasts != nil || tr.Analysis.Method != "tukey" {
		t.Errorf("version 3 took a version 4 member: %+v", tr.Analysis)
	}
	tr, err = Decode(strings.NewReader(strings.Replace(src, `"version": 3`, `"version": 4`, 1)))
	if err != nil {
		t.Fatal(err)
	}
	if len(tr.Analysis.Contrasts) != 1 || tr.Analysis.Contrasts[0].Second[0] != "b" {
		t.Errorf("version 4 contrasts not read: %+v", tr.Analysis)
	}
	f, err := os.Open("testdata/v2-demo.furlong")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if v2, err := Decode(f); err != nil || v2.Analysis.Contrasts != nil {
		t.Errorf("version 2 demo: %v", err)
	}
}
