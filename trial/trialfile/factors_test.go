package trialfile

import (
	"bytes"
	"errors"
	"os"
	"reflect"
	"strings"
	"testing"
	"time"

	"furlong/trial"
)

// factorialTrial is an invented 2 × 3 split plot (a fictional nitrogen ×
// variety trial) laid out and randomised by the trial package.
func factorialTrial(t testing.TB, kind trial.DesignKind, nf int) *trial.Trial {
	t.Helper()
	v60 := 60.0
	fs := []trial.Factor{
		{Key: "N", Name: "Nitrogen rate", Levels: []trial.Level{{Code: "N0", Name: "no N"}, {Code: "N60", Name: "60 kg N/ha", Value: &v60, Unit: "kg N/ha"}}},
		{Key: "V", Name: "Variety", Levels: []trial.Level{{Code: "V1", Name: "Amberline"}, {Code: "V2"}, {Code: "V3"}}},
		{Key: "S", Name: "Sowing date", Levels: []trial.Level{{Code: "early"}, {Code: "late"}}},
	}[:nf]
	d := trial.Design{Kind: kind, Reps: 3}
	if kind.Restricted() {
		d.MainFactor = "N"
	}
	tr, err := trial.New(trial.NewOptions{
		Title: "Nitrogen by variety, Larkspur Bend farm", Crop: "wheat",
		Factors: fs, Design: d,
		Traits: []trial.Trait{{Key: "yield", Unit: "t/ha", Kind: trial.Continuous, Decimals: 2}},
		Seed:   20260412, Now: time.Date(2026, 4, 12, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// TestFactorsRoundTrip: a factorial trial of every design writes and
// reads back to the same trial, and writing the read trial gives the same
// bytes (the codec's own contract, see doc.go).
func TestFactorsRoundTrip(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		kind trial.DesignKind
		nf   int
	}{{trial.CRD, 2}, {trial.RCBD, 3}, {trial.SplitPlot, 2}, {trial.SplitPlot, 3}, {trial.StripPlot, 2}} {
		tr := factorialTrial(t, c.kind, c.nf)
		var buf bytes.Buffer
		if err := Encode(&buf, tr); err != nil {
			t.Fatalf("%s: %v", c.kind, err)
		}
		first := buf.String()
		got, err := Decode(strings.NewReader(first))
		if err != nil {
			t.Fatalf("%s: %v", c.kind, err)
		}
		if !reflect.DeepEqual(got.Factors, tr.Factors) || !reflect.DeepEqual(got.Treatments, tr.Treatments) ||
			got.Design != tr.Design || !reflect.DeepEqual(got.Plots, tr.Plots) {
			t.Errorf("%s %d factors: the trial read back differs", c.kind, c.nf)
		}
		if err := got.CheckRandomization(); err != nil {
			t.Errorf("%s: the layout read back is not the seed's: %v", c.kind, err)
		}
		buf.Reset()
		if err := Encode(&buf, got); err != nil || buf.String() != first {
			t.Errorf("%s: re-encoding changed the file (%v)", c.kind, err)
		}
		for _, want := range []string{`"version": 6,`, `"factors": [`, `"levels": [`, `"main_factor": "N"`} {
			if !strings.Contains(first, want) && (want != `"main_factor": "N"` || c.kind.Restricted()) {
				t.Errorf("%s: the file lacks %s", c.kind, want)
			}
		}
		if c.kind.Restricted() != strings.Contains(first, `"main_plot": `) {
			t.Errorf("%s: main_plot written = %v", c.kind, !c.kind.Restricted())
		}
	}
}

// TestV2OpensUnchanged: the demo trial as version 2 wrote it
// (testdata/v2-demo.furlong) opens as one list of treatments with no main
// plots, and saving it writes the same bytes apart from the version
// number: version 3 adds only optional members.
func TestV2OpensUnchanged(t *testing.T) {
	t.Parallel()
	data, err := os.ReadFile("testdata/v2-demo.furlong")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(data, []byte(`"version": 2,`)) {
		t.Fatal("the fixture is not a version 2 file")
	}
	tr, err := Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	if tr.Factorial() || tr.Design.MainFactor != "" {
		t.Errorf("a version 2 trial got factors: %+v %+v", tr.Factors, tr.Design)
	}
	for _, trt := range tr.Treatments {
		if trt.Levels != nil {
			t.Errorf("treatment %s got levels %v", trt.Code, trt.Levels)
		}
	}
	for _, p := range tr.Plots {
		if p.MainPlot != 0 || p.SubPlot != 0 || p.Strip != 0 {
			t.Fatalf("plot %d got a main plot or strip", p.Number)
		}
	}
	if err := tr.CheckRandomization(); err != nil {
		t.Errorf("the version 2 layout no longer reproduces: %v", err)
	}
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	want := bytes.Replace(data, []byte(`"version": 2,`), []byte(`"version": 6,`), 1)
	if !bytes.Equal(buf.Bytes(), want) {
		t.Error("saving a version 2 trial changed more than its version number")
	}
}

// TestOlderVersionsIgnoreFactors: members of version 3 in a file of an
// older version are ignored like any unknown member, so a version 0, 1 or
// 2 trial opens as it always has; in a version 3 file they are read.
func TestOlderVersionsIgnoreFactors(t *testing.T) {
	t.Parallel()
	src := `{"format": "furlong-trial", "version": 2, "trial": {
	"factors": [{"key": "N", "name": "", "levels": [{"code": "a", "name": "", "value": null}, {"code": "b", "name": "", "value": null}]}],
	"treatments": [{"code": "a", "levels": ["a"]}, {"code": "b", "levels": ["b"]}],
	"design": {"kind": "rcbd", "reps": 2, "main_factor": "N"},
	"plots": [{"number": 1, "block": 1, "row": 1, "column": 1, "treatment": "a", "main_plot": 4}]}}`
	for _, v := range []string{"1", "2"} {
		tr, err := Decode(strings.NewReader(strings.Replace(src, `"version": 2`, `"version": `+v, 1)))
		if err != nil {
			t.Fatalf("version %s: %v", v, err)
		}
		if tr.Factors != nil || tr.Treatments[0].Levels != nil || tr.Design.MainFactor != "" || tr.Plots[0].MainPlot != 0 {
			t.Errorf("version %s took version 3 members", v)
		}
	}
	tr, err := Decode(strings.NewReader(strings.Replace(src, `"version": 2`, `"version": 3`, 1)))
	if err != nil {
		t.Fatal(err)
	}
	if len(tr.Factors) != 1 || tr.Treatments[1].Levels[0] != "b" || tr.Plots[0].MainPlot != 4 {
		t.Errorf("version 3 members not read: %+v", tr)
	}
	// The version 0 fixture still opens (its own tests check its content).
	f, err := os.Open("testdata/v0-sample.furlong")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if v0, err := Decode(f); err != nil || v0.Factorial() {
		t.Errorf("version 0: %v", err)
	}
}

// TestFactorBounds: the decoder refuses factor members that do not fit,
// naming the path, as it does for the other bounds (common practice for
// file readers, as TestBounds).
func TestFactorBounds(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name   string
		change func(*trial.Trial)
		path   string
		err    error
	}{
		{"four factors", func(tr *trial.Trial) {
			tr.Factors = append(tr.Factors, trial.Factor{Key: "a"}, trial.Factor{Key: "b"})
		}, "trial.factors", ErrOutOfRange},
		{"duplicate key", func(tr *trial.Trial) { tr.Factors[1].Key = "n" }, "trial.factors[1].key", ErrBadFactor},
		{"duplicate level", func(tr *trial.Trial) { tr.Factors[1].Levels[2].Code = "V1" }, "trial.factors[1].levels[2].code", ErrBadFactor},
		{"too many levels", func(tr *trial.Trial) {
			tr.Factors[0].Levels = make([]trial.Level, trial.MaxLevels+1)
			for i := range tr.Factors[0].Levels {
				tr.Factors[0].Levels[i].Code = strings.Repeat("x", i+1)
			}
		}, "trial.factors[0].levels", ErrOutOfRange},
		{"short levels", func(tr *trial.Trial) { tr.Treatments[2].Levels = tr.Treatments[2].Levels[:1] }, "trial.treatments[2].levels", ErrBadFactor},
		{"unknown level", func(tr *trial.Trial) { tr.Treatments[3].Levels[1] = "V9" }, "trial.treatments[3].levels[1]", ErrBadFactor},
		{"levels without factors", func(tr *trial.Trial) { tr.Factors = nil }, "trial.treatments[0].levels", ErrBadFactor},
		{"split plot, one factor", func(tr *trial.Trial) {
			tr.Factors = tr.Factors[:1]
			for i := range tr.Treatments {
				tr.Treatments[i].Levels = tr.Treatments[i].Levels[:1]
			}
		}, "trial.design.kind", ErrBadFactor},
		{"unknown main factor", func(tr *trial.Trial) { tr.Design.MainFactor = "K" }, "trial.design.main_factor", ErrBadFactor},
		{"main plot", func(tr *trial.Trial) { tr.Plots[4].MainPlot = MaxPosition + 1 }, "trial.plots[4].main_plot", ErrOutOfRange},
		{"strip", func(tr *trial.Trial) { tr.Plots[0].Strip = -1 }, "trial.plots[0].strip", ErrOutOfRange},
	} {
		tr := factorialTrial(t, trial.SplitPlot, 2)
		c.change(tr)
		_, err := Decode(bytes.NewReader(craft(t, tr)))
		var pe *ParseError
		if !errors.As(err, &pe) || pe.Path != c.path || !errors.Is(err, c.err) {
			t.Errorf("%s: got %v, want %v at %s", c.name, err, c.err, c.path)
		}
		if err := Encode(&bytes.Buffer{}, tr); err == nil {
			t.Errorf("%s: Encode wrote what Decode refuses", c.name)
		}
	}
}
