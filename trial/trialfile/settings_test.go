package trialfile

import (
	"bytes"
	"errors"
	"os"
	"strings"
	"testing"

	"furlong/trial"
)

// TestMigrateV1 reads a version 1 file (testdata/v1-demo.furlong, see
// testdata/README.md): the trial opens unchanged, with the default analysis
// settings, and saving it writes the current version that reads back to the same
// trial.
func TestMigrateV1(t *testing.T) {
	t.Parallel()
	data, err := os.ReadFile("testdata/v1-demo.furlong")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(data, []byte(`"version": 1,`)) {
		t.Fatal("the fixture is not a version 1 file")
	}
	tr, err := Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	if tr.Analysis.Method != trial.MethodLSD {
		t.Errorf("method %q, want lsd (the default)", tr.Analysis.Method)
	}
	for _, trt := range tr.Traits {
		if trt.Transform != trial.TransformNone || trt.PercentOfCheck != nil {
			t.Errorf("trait %s: transform %q, percent of check %v; want the defaults", trt.Key, trt.Transform, trt.PercentOfCheck)
		}
	}
	// The default percent of check is the yield trait only, as before
	// version 2.
	if y := trial.YieldTrait(tr.Traits); y < 0 || !tr.ShowsPercentOfCheck(tr.Traits[y].Key) {
		t.Error("the yield trait does not show percent of check by default")
	}
	for i, trt := range tr.Traits {
		if i != trial.YieldTrait(tr.Traits) && tr.ShowsPercentOfCheck(trt.Key) {
			t.Errorf("trait %s shows percent of check by default", trt.Key)
		}
	}
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	for _, want := range []string{`"version": 6,`, `"mean_separation": "lsd"`, `"transform": "none"`, `"percent_of_check": null`} {
		if !strings.Contains(out, want) {
			t.Errorf("the saved file lacks %s", want)
		}
	}
	back, err := Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if d := diff(tr, back); d != "" {
		t.Error(d)
	}
}

// TestV1IgnoresLaterMembers: version 1 had no analysis settings, so members
// of those names in a version 1 file are ignored like any unknown member.
func TestV1IgnoresLaterMembers(t *testing.T) {
	t.Parallel()
	src := `{"format": "furlong-trial", "version": 1, "trial": {"analysis": {"mean_separation": "tukey"},
		"treatments": [{"code": "A"}, {"code": "B"}], "design": {"kind": "crd", "reps": 2},
		"traits": [{"key": "n", "kind": "count", "transform": "sqrt", "percent_of_check": true}]}}`
	tr, err := Decode(strings.NewReader(src))
	if err != nil {
		t.Fatal(err)
	}
	if tr.Analysis.Method != trial.MethodLSD || tr.Traits[0].Transform != "" || tr.Traits[0].PercentOfCheck != nil {
		t.Errorf("version 1 file took version 2 settings: %+v %+v", tr.Analysis, tr.Traits[0])
	}
	// The same members in a version 2 file are read.
	tr, err = Decode(strings.NewReader(strings.Replace(src, `"version": 1`, `"version": 2`, 1)))
	if err != nil {
		t.Fatal(err)
	}
	if tr.Analysis.Method != trial.MethodTukey || tr.Traits[0].Transform != trial.TransformSqrt ||
		tr.Traits[0].PercentOfCheck == nil || !*tr.Traits[0].PercentOfCheck {
		t.Errorf("version 2 settings not read: %+v %+v", tr.Analysis, tr.Traits[0])
	}
}

// TestMigrateV0Defaults: a version 0 file gets the default settings too.
func TestMigrateV0Defaults(t *testing.T) {
	t.Parallel()
	tr, err := Load("testdata/v0-sample.furlong")
	if err != nil {
		t.Fatal(err)
	}
	if tr.Analysis.Method != trial.MethodLSD {
		t.Errorf("method %q", tr.Analysis.Method)
	}
	for _, trt := range tr.Traits {
		if trt.Transform != "" || trt.PercentOfCheck != nil {
			t.Errorf("trait %s has settings %q %v", trt.Key, trt.Transform, trt.PercentOfCheck)
		}
	}
}

// TestBadSettings: unknown names and an arcsine on a trait that is not a
// percentage are refused with the path, on reading and on writing.
func TestBadSettings(t *testing.T) {
	t.Parallel()
	base := `{"format": "furlong-trial", "version": 2, "trial": {"analysis": {"mean_separation": "METHOD"},
		"treatments": [{"code": "A"}, {"code": "B"}], "design": {"kind": "crd", "reps": 2},
		"traits": [{"key": "n", "kind": "KIND", "transform": "TF"}]}}`
	for _, c := range []struct {
		method, kind, tf, path, words string
	}{
		{"lsd", "count", "cuberoot", "trial.traits[0].transform", `"cuberoot" is not known`},
		{"lsd", "count", "arcsin", "trial.traits[0].transform", "for percentages"},
		{"duncan", "count", "none", "trial.analysis.mean_separation", `"duncan" is not known`},
	} {
		src := strings.NewReplacer("METHOD", c.method, "KIND", c.kind, "TF", c.tf).Replace(base)
		_, err := Decode(strings.NewReader(src))
		var pe *ParseError
		if !errors.As(err, &pe) || pe.Path != c.path || !strings.Contains(err.Error(), c.words) {
			t.Errorf("%s/%s/%s: got %v, want a ParseError at %s saying %s", c.method, c.kind, c.tf, err, c.path, c.words)
		}
	}
	// Accepted: arcsine on a percent trait, Tukey.
	src := strings.NewReplacer("METHOD", "tukey", "KIND", "percent", "TF", "arcsin").Replace(base)
	if _, err := Decode(strings.NewReader(src)); err != nil {
		t.Errorf("valid settings refused: %v", err)
	}
	tr := richTrial()
	tr.Traits[0].Transform = "cube"
	if err := Encode(&bytes.Buffer{}, tr); err == nil {
		t.Error("Encode wrote an unknown transformation")
	}
}
