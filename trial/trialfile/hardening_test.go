package trialfile

import (
	"bytes"
	"encoding/json"
	"errors"
	"strings"
	"testing"

	"furlong/trial"
)

// craft encodes t without the checks, as a damaged or hand-edited file.
func craft(t *testing.T, tr *trial.Trial) []byte {
	t.Helper()
	ft, err := toV1(tr)
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.MarshalIndent(fileV1{Format: Format, Version: Version, Trial: ft}, "", "  ")
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// TestBounds: every number is bounded to what its field can hold and the
// refusal names the JSON path (common practice for file readers; the
// block, row and decimals cases were found crashing or hanging commands).
func TestBounds(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name string
		edit func(*trial.Trial)
		path string
		want string
		kind error
	}{
		{"decimals huge", func(tr *trial.Trial) { tr.Traits[0].Decimals = 10000000 }, "trial.traits[0].decimals", "10000000 decimals", ErrOutOfRange},
		{"decimals negative", func(tr *trial.Trial) { tr.Traits[1].Decimals = -1 }, "trial.traits[1].decimals", "use 0 to 10", ErrOutOfRange},
		{"block 0", func(tr *trial.Trial) { tr.Plots[3].Block = 0 }, "trial.plots[3].block", "block 0", ErrOutOfRange},
		{"block negative", func(tr *trial.Trial) { tr.Plots[3].Block = -2 }, "trial.plots[3].block", "block -2", ErrOutOfRange},
		{"row far away", func(tr *trial.Trial) { tr.Plots[5].Row = 100000000000 }, "trial.plots[5].row", "row 100000000000", ErrOutOfRange},
		{"column 0", func(tr *trial.Trial) { tr.Plots[0].Column = 0 }, "trial.plots[0].column", "column 0", ErrOutOfRange},
		{"grid far too big", func(tr *trial.Trial) { tr.Plots[7].Row = 90000; tr.Plots[8].Column = 90000 }, "trial.plots[7].row", "positions look damaged", ErrOutOfRange},
		{"plot number negative", func(tr *trial.Trial) { tr.Plots[2].Number = -5 }, "trial.plots[2].number", "-5", ErrOutOfRange},
		{"reps", func(tr *trial.Trial) { tr.Design.Reps = 500000 }, "trial.design.reps", "500000", ErrOutOfRange},
		{"plots per row", func(tr *trial.Trial) { tr.Layout.PlotsPerRow = -1 }, "trial.layout.plots_per_row", "not -1", ErrOutOfRange},
		{"plot length", func(tr *trial.Trial) { tr.Layout.PlotLength = -3 }, "trial.layout.plot_length", "plot length", ErrOutOfRange},
		{"latitude", func(tr *trial.Trial) { v := 91.0; tr.Site.Latitude = &v }, "trial.site.latitude", "latitude", ErrOutOfRange},
		{"standard moisture", func(tr *trial.Trial) { tr.Traits[5].Derived.StandardMoisture = 100 }, "trial.traits[5].derived.standard_moisture", "below 100", ErrOutOfRange},
		{"trait kind", func(tr *trial.Trial) { tr.Traits[0].Kind = "zzz" }, "trial.traits[0].kind", `kind "zzz"`, ErrWrongType},
		{"formula kind", func(tr *trial.Trial) { tr.Traits[5].Derived.Kind = "zzz" }, "trial.traits[5].derived.kind", `formula "zzz"`, ErrWrongType},
		{"formula source", func(tr *trial.Trial) { tr.Traits[5].Derived.MoistureTrait = "nosuch" }, "trial.traits[5].derived.moisture_trait", `from trait "nosuch"`, ErrUnknownTrait},
		{"unknown design", func(tr *trial.Trial) { tr.Design.Kind = "xyz" }, "trial.design.kind", `the design kind "xyz" is not one Furlong knows ("crd", "rcbd", "latin", "split-plot", "strip-plot")`, ErrUnknownDesign},
		{"no design with plots", func(tr *trial.Trial) { tr.Design.Kind = "" }, "trial.design.kind", "does not say which design", ErrUnknownDesign},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			tr := richTrial()
			c.edit(tr)
			_, err := Decode(bytes.NewReader(craft(t, tr)))
			var pe *ParseError
			if !errors.As(err, &pe) || !errors.Is(err, c.kind) || pe.Path != c.path || pe.Line == 0 || !strings.Contains(err.Error(), c.want) {
				t.Fatalf("got %v (path %q), want %q at %s", err, pathOf(err), c.want, c.path)
			}
			// Encode refuses the same trial: what Furlong writes it reads.
			if err := Encode(&bytes.Buffer{}, tr); !errors.Is(err, c.kind) {
				t.Errorf("Encode: %v", err)
			}
		})
	}
	// The limits themselves are accepted.
	tr := richTrial()
	tr.Traits[0].Decimals = MaxDecimals
	tr.Plots[0].Number = MaxPlotNumber
	if _, err := Decode(bytes.NewReader(craft(t, tr))); err != nil {
		t.Errorf("limits refused: %v", err)
	}
}

func pathOf(err error) string {
	var pe *ParseError
	if errors.As(err, &pe) {
		return pe.Path
	}
	return ""
}

func TestDuplicateKeys(t *testing.T) {
	t.Parallel()
	head := `{"format": "furlong-trial", "version": 1, `
	cases := []struct {
		name, file, path, want string
	}{
		{"top level", `{"format": "furlong-trial", "version": 1, "version": 2, "trial": {}}`, "version", `"version" appears twice in the top level`},
		{"trial member", head + `"trial": {"title": "a", "crop": "x", "title": "b"}}`, "trial.title", `"title" appears twice in trial`},
		{"in a plot", head + `"trial": {"plots": [{"number": 1}, {"number": 2, "block": 1, "block": 2}]}}`, "trial.plots[1].block", `in trial.plots[1]`},
		{"capitals", head + `"trial": {"title": "a", "Title": "b"}}`, "trial.Title", `"title" and "Title"`},
		{"escaped name", head + `"trial": {"title": "a", "ti\u0074le": "b"}}`, "trial.title", `"title" appears twice`},
		{"unknown member", head + `"trial": {"extra": {"a": 1, "a": 2}}}`, "trial.extra.a", `"a" appears twice in trial.extra`},
		{"big object", head + `"trial": {"extra": {"a0":0,"a1":1,"a2":2,"a3":3,"a4":4,"a5":5,"a6":6,"a7":7,"a8":8,"a9":9,"b0":0,"b1":1,"b2":2,"b3":3,"b4":4,"b5":5,"b6":6,"b7":7,"a3":3}}}`, "trial.extra.a3", `"a3" appears twice`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			_, err := Decode(strings.NewReader(c.file))
			if !errors.Is(err, ErrDuplicateKey) || pathOf(err) != c.path || !strings.Contains(err.Error(), c.want) {
				t.Errorf("got %v (path %q), want %q at %s", err, pathOf(err), c.want, c.path)
			}
		})
	}
	// The same name in different objects is no duplicate.
	if _, err := Decode(bytes.NewReader(encodeT(t, richTrial()))); err != nil {
		t.Fatal(err)
	}
}

// TestCutInsideLiteral: a file cut inside null, true or false ends early;
// it holds no stray character.
func TestCutInsideLiteral(t *testing.T) {
	t.Parallel()
	full := `{"format": "furlong-trial", "version": 1, "trial": {"site": {"latitude": null}, "traits": [{"key": "a", "higher_better": true, "values": [1, null]}, {"key": "b", "higher_better": false}]}}`
	for _, lit := range []string{"null}", "true,", "null]", "false}"} {
		at := strings.Index(full, lit)
		for cut := at + 1; cut < at+len(lit)-1; cut++ {
			_, err := Decode(strings.NewReader(full[:cut]))
			if !errors.Is(err, ErrTruncated) || !strings.Contains(err.Error(), "ends early") {
				t.Errorf("cut after %q: %v", full[cut-3:cut], err)
			}
		}
	}
}

// TestDeepNesting: deeply nested data gives a short message.
func TestDeepNesting(t *testing.T) {
	t.Parallel()
	head := `{"format": "furlong-trial", "version": 1, "trial": {"notes": `
	for _, body := range []string{
		strings.Repeat("[", 100000) + strings.Repeat("]", 100000),
		strings.Repeat(`{"a":`, 50000) + "1" + strings.Repeat("}", 50000),
		strings.Repeat("[", 9990) + strings.Repeat("]", 9990), // under the limit of encoding/json: a wrong type, deep
	} {
		_, err := Decode(strings.NewReader(head + body + "}}"))
		if err == nil || len(err.Error()) > 400 {
			t.Errorf("message of %d characters: %.300v", len(fmtIfErr(err)), err)
		}
	}
	if s := shortPath(strings.Repeat("[0]", 1000)); len(s) > maxPathShown+4 || !strings.Contains(s, "…") {
		t.Errorf("short path %q", s)
	}
}

func fmtIfErr(err error) string {
	if err == nil {
		return ""
	}
	return err.Error()
}
