package trialfile

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"
	"time"

	"furlong/trial"
)

func encodeT(t *testing.T, tr *trial.Trial) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatalf("Encode: %v", err)
	}
	return buf.Bytes()
}

func TestRoundTripRich(t *testing.T) {
	t.Parallel()
	want := richTrial()
	data := encodeT(t, want)
	got, err := Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatalf("Decode: %v", err)
	}
	if d := diff(want, got); d != "" {
		t.Fatal(d)
	}
	// Stable output: encoding the decoded trial gives the same bytes.
	if again := encodeT(t, got); !bytes.Equal(again, data) {
		t.Error("re-encoding changed the file")
	}
	// The file is valid JSON (RFC 8259) as judged by encoding/json, and
	// indented (one member per line).
	if !json.Valid(data) {
		t.Fatal("output is not valid JSON")
	}
	if !bytes.HasPrefix(data, []byte("{\n  \"format\": \"furlong-trial\",\n  \"version\": 6,\n  \"trial\": {\n    \"title\":")) {
		t.Errorf("unexpected file start:\n%s", data[:80])
	}
	// Missing values are JSON null: the first heads value is missing.
	if !bytes.Contains(data, []byte("\"values\": [\n          null,")) {
		t.Error("a missing first value is not written as null")
	}
}

// RFC 8259 §6: numbers outside [-(2^53)+1, 2^53-1] are not interoperable,
// so the seed must be written as a string.
func TestSeedIsExactString(t *testing.T) {
	t.Parallel()
	for _, seed := range []uint64{0, 1<<53 + 1, math.MaxUint64} {
		tr := richTrial()
		tr.Random.Seed = seed
		data := encodeT(t, tr)
		want := `"seed": "` + strconv.FormatUint(seed, 10) + `"`
		if !bytes.Contains(data, []byte(want)) {
			t.Errorf("seed %d: file lacks %s", seed, want)
		}
		got, err := Decode(bytes.NewReader(data))
		if err != nil {
			t.Fatal(err)
		}
		if got.Random.Seed != seed {
			t.Errorf("seed %d read back as %d", seed, got.Random.Seed)
		}
		// A JSON number is read exactly too (not through float64):
		// 2^53+1 is the smallest integer a float64 cannot hold (IEEE 754
		// binary64 has a 53-bit significand).
		num := bytes.Replace(data, []byte(want), []byte(`"seed": `+strconv.FormatUint(seed, 10)), 1)
		got, err = Decode(bytes.NewReader(num))
		if err != nil || got.Random.Seed != seed {
			t.Errorf("seed %d as a JSON number: got %v, %v", seed, got, err)
		}
	}
}

// The numbers are written the way encoding/json (the reference
// implementation used here) writes float64, and read back bit for bit
// (strconv.ParseFloat).
func TestFloatFormatMatchesEncodingJSON(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(1, 2))
	vals := []float64{0, 1, -1, 0.1, 1.0 / 3, 1e-6, 9.99999e-7, 1e-7, 1e20, 1e21, 123456789012345678, 5e-324, math.MaxFloat64, -2.5e-10, 100}
	for range 2000 {
		vals = append(vals, math.Float64frombits(rng.Uint64()), rng.NormFloat64()*100, float64(rng.IntN(1000))/10)
	}
	for _, v := range vals {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			continue
		}
		ref, _ := json.Marshal(v)
		got := appendFloat(nil, v)
		if string(got) != string(ref) {
			t.Errorf("%v: wrote %s, encoding/json writes %s", v, got, ref)
		}
		back, err := strconv.ParseFloat(string(got), 64)
		if err != nil || math.Float64bits(back) != math.Float64bits(v) {
			t.Errorf("%v: %s reads back as %v", v, got, back)
		}
	}
}

// Examples of RFC 3339 §5.8.
func TestTimesAreRFC3339(t *testing.T) {
	t.Parallel()
	tr := richTrial()
	tr.Created = time.Date(1985, 4, 12, 23, 20, 50, 520000000, time.UTC)
	tr.Modified = time.Date(1996, 12, 19, 16, 39, 57, 0, time.FixedZone("", -8*3600))
	tr.Random.Done = time.Time{}
	data := encodeT(t, tr)
	for _, want := range []string{`"created": "1985-04-12T23:20:50.52Z"`, `"modified": "1996-12-19T16:39:57-08:00"`, `"done": null`} {
		if !bytes.Contains(data, []byte(want)) {
			t.Errorf("file lacks %s", want)
		}
	}
	got, err := Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	if d := diff(tr, got); d != "" {
		t.Error(d)
	}
	// A historic local mean time offset (not whole minutes) is saved as UTC.
	tr.Created = time.Date(1900, 1, 1, 12, 0, 0, 0, time.FixedZone("LMT", 3600+23))
	got, err = Decode(bytes.NewReader(encodeT(t, tr)))
	if err != nil || !got.Created.Equal(tr.Created) {
		t.Errorf("LMT time: got %v, %v", got.Created, err)
	}
}

func TestNewerVersion(t *testing.T) {
	t.Parallel()
	_, err := Decode(strings.NewReader(`{"format": "furlong-trial", "version": 7, "trial": {"future": true}}`))
	if !errors.Is(err, ErrNewerVersion) {
		t.Fatalf("got %v, want ErrNewerVersion", err)
	}
	// Wording given in the specification of this package.
	want := "this file was written by a newer version of Furlong (file format 7; this version reads up to 6). Update Furlong to open it."
	if err.Error() != want {
		t.Errorf("message %q, want %q", err.Error(), want)
	}
}

func TestNotTrialFile(t *testing.T) {
	t.Parallel()
	for _, in := range []string{
		`{"format": "something-else", "version": 1, "trial": {}}`,
		`{"version": 1, "trial": {}}`,
		`{"format": 7, "version": 1}`,
		`[1, 2, 3]`,
		`"furlong-trial"`,
		`{"type":"FeatureCollection","features":[]}`,
		"PK\x03\x04\x14\x00\x06\x00", // a workbook given where a trial belongs
		"plot,block,row\n101,1,1\n",  // a field book
	} {
		_, err := Decode(strings.NewReader(in))
		if !errors.Is(err, ErrNotTrialFile) || err.Error() != "not a Furlong trial file" {
			t.Errorf("%s: got %v, want ErrNotTrialFile", in, err)
		}
	}
}

// small is a valid version 1 file written by hand; tests corrupt it at the
// marked places.
const small = `{
  "format": "furlong-trial",
  "version": 1,
  "trial": {
    "title": "Small",
    "created": "2026-01-02T03:04:05Z",
    "treatments": [
      {"code": "A", "name": "Alpha", "role": "entry"},
      {"code": "B", "name": "Beta", "role": "check"}
    ],
    "design": {"kind": "crd", "reps": 2},
    "randomization": {"seed": "42", "method": "m"},
    "plots": [
      {"number": 1, "block": 1, "row": 1, "column": 1, "treatment": "A"},
      {"number": 2, "block": 1, "row": 1, "column": 2, "treatment": "B"},
      {"number": 3, "block": 1, "row": 2, "column": 1, "treatment": "B"},
      {"number": 4, "block": 1, "row": 2, "column": 2, "treatment": "A"}
    ],
    "traits": [
      {"key": "ht", "kind": "continuous", "values": [1.5, null, 2.25, 3]},
      {"key": "n", "kind": "count", "values": [10, 11, null, 13]},
      {"key": "pc", "kind": "percent", "min": 0, "max": 50, "values": [5, 75, 0, 100]}
    ]
  }
}
`

func TestSmallDecodes(t *testing.T) {
	t.Parallel()
	tr, err := Decode(strings.NewReader(small))
	if err != nil {
		t.Fatal(err)
	}
	if len(tr.Plots) != 4 || tr.Random.Seed != 42 || tr.Treatments[1].Role != trial.RoleCheck {
		t.Fatalf("unexpected trial %+v", tr)
	}
	ht := tr.Traits[0].Values
	if ht[0] != 1.5 || !trial.IsMissing(ht[1]) || ht[2] != 2.25 || ht[3] != 3 {
		t.Errorf("ht values %v", ht)
	}
	// 75 is above the trait's max of 50: allowed data.
	if tr.Traits[2].Values[1] != 75 {
		t.Errorf("out-of-range value not kept: %v", tr.Traits[2].Values)
	}
}

// Each case replaces old with new in small (old must occur once) and names
// the sentinel, path and the text where the reported position must point
// (found with strings.Index in the corrupted file, independently of the
// package's own position arithmetic).
func TestErrorsNameThePlace(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name, old, new string
		kind           error
		path, at       string
	}{
		{"number as text", `{"number": 3,`, `{"number": "x3",`, ErrWrongType, "trial.plots[2].number", `"x3"`},
		{"fractional plot", `{"number": 3,`, `{"number": 3.5,`, ErrWrongType, "trial.plots[2].number", `3.5,`},
		{"plots not a list", `"plots": [`, `"plots": {"a": 1}, "x": [`, ErrWrongType, "trial.plots", `{"a"`},
		{"duplicate plot", `{"number": 3,`, `{"number": 2,`, ErrDuplicatePlot, "trial.plots[2].number", `2, "block": 1, "row": 2`},
		{"unknown treatment", `"column": 1, "treatment": "B"`, `"column": 1, "treatment": "Z"`, ErrUnknownTreatment, "trial.plots[2].treatment", `"Z"`},
		{"duplicate treatment", `{"code": "B"`, `{"code": "A"`, ErrDuplicateTreatment, "trial.treatments[1].code", `"A", "name": "Beta"`},
		{"duplicate trait", `{"key": "n",`, `{"key": "ht",`, ErrDuplicateTrait, "trial.traits[1].key", `"ht", "kind": "count"`},
		{"short values", `[1.5, null, 2.25, 3]`, `[1.5, null, 2.25]`, ErrValueCount, "trial.traits[0].values", `[1.5`},
		{"long values", `[1.5, null, 2.25, 3]`, `[1.5, null, 2.25, 3, 4]`, ErrValueCount, "trial.traits[0].values", `[1.5`},
		{"no values", `, "values": [1.5, null, 2.25, 3]`, ``, ErrValueCount, "trial.traits[0].values", ``},
		{"fractional count", `[10, 11, null, 13]`, `[10, 2.5, null, 13]`, ErrValueKind, "trial.traits[1].values[1]", `2.5`},
		{"negative count", `[10, 11, null, 13]`, `[10, 11, null, -1]`, ErrValueKind, "trial.traits[1].values[3]", `-1]`},
		{"percent above 100", `[5, 75, 0, 100]`, `[5, 75, 0, 100.5]`, ErrValueKind, "trial.traits[2].values[3]", `100.5`},
		{"huge value", `[1.5, null, 2.25, 3]`, `[1.5, 1e999, 2.25, 3]`, ErrValueKind, "trial.traits[0].values[1]", `1e999`},
		{"text value", `[1.5, null, 2.25, 3]`, `[1.5, null, "2.25", 3]`, ErrWrongType, "trial.traits[0].values[2]", `"2.25"`},
		{"huge layout number", `"design": {`, `"layout": {"alley": 1e400}, "design": {`, ErrValueKind, "trial.layout.alley", `1e400`},
		{"bad time", `"2026-01-02T03:04:05Z"`, `"2026-13-02T03:04:05Z"`, ErrWrongType, "trial.created", `"2026-13`},
		{"bad seed", `"seed": "42"`, `"seed": "-42"`, ErrWrongType, "trial.randomization.seed", `"-42"`},
		{"fractional seed", `"seed": "42"`, `"seed": 4.2`, ErrWrongType, "trial.randomization.seed", `4.2`},
		{"syntax", `"role": "check"}`, `"role": "check"]`, ErrSyntax, "trial.treatments[1].role", `]`},
		{"missing comma", `"title": "Small",`, `"title": "Small"`, ErrSyntax, "trial.title", `"created"`},
		{"truncated", "    ]\n  }\n}\n", "    ]\n", ErrTruncated, "", ""},
		{"no trial", `"trial": {`, `"trial": null, "x": {`, ErrWrongType, "trial", ``},
		{"bad version", `"version": 1,`, `"version": "1",`, ErrWrongType, "version", `"1"`},
	}
	for _, c := range cases {
		if strings.Count(small, c.old) != 1 {
			t.Fatalf("%s: %q occurs %d times", c.name, c.old, strings.Count(small, c.old))
		}
		in := strings.Replace(small, c.old, c.new, 1)
		tr, err := Decode(strings.NewReader(in))
		if err == nil {
			t.Errorf("%s: decoded without error: %+v", c.name, tr)
			continue
		}
		if !errors.Is(err, c.kind) {
			t.Errorf("%s: got %v, want %v", c.name, err, c.kind)
		}
		var pe *ParseError
		if !errors.As(err, &pe) {
			t.Errorf("%s: %T is not a *ParseError", c.name, err)
			continue
		}
		if pe.Path != c.path {
			t.Errorf("%s: path %q, want %q (%v)", c.name, pe.Path, c.path, err)
		}
		if c.at == "" {
			continue
		}
		off := strings.Index(in, c.at)
		line := strings.Count(in[:off], "\n") + 1
		col := off - strings.LastIndex(in[:off], "\n")
		if pe.Line != line || pe.Column != col {
			t.Errorf("%s: at line %d column %d, want line %d column %d (%v)", c.name, pe.Line, pe.Column, line, col, err)
		}
		if !strings.Contains(err.Error(), "line ") {
			t.Errorf("%s: message %q does not give the line", c.name, err)
		}
	}
}

func TestTruncatedEverywhere(t *testing.T) {
	t.Parallel()
	data := encodeT(t, richTrial())
	end := bytes.LastIndexByte(data, '}')
	for n := 0; n < end; n += 7 {
		_, err := Decode(bytes.NewReader(data[:n]))
		if err == nil {
			t.Fatalf("a file cut at byte %d decoded", n)
		}
		if !errors.Is(err, ErrTruncated) && !errors.Is(err, ErrSyntax) {
			t.Fatalf("cut at %d: got %v", n, err)
		}
	}
}

func TestEncodeRefusesBadTrial(t *testing.T) {
	t.Parallel()
	cases := map[string]func(*trial.Trial){
		"duplicate plot":    func(tr *trial.Trial) { tr.Plots[1].Number = tr.Plots[0].Number },
		"unknown treatment": func(tr *trial.Trial) { tr.Plots[1].Treatment = "NX" },
		"misaligned values": func(tr *trial.Trial) { tr.Traits[0].Values = tr.Traits[0].Values[1:] },
		"count 2.5":         func(tr *trial.Trial) { tr.Traits[2].Values[1] = 2.5 },
		"infinite value":    func(tr *trial.Trial) { tr.Traits[0].Values[1] = math.Inf(1) },
		"NaN latitude":      func(tr *trial.Trial) { tr.Site.Latitude = fp(math.NaN()) },
		"NaN plot length":   func(tr *trial.Trial) { tr.Layout.PlotLength = math.NaN() },
		"year 10000":        func(tr *trial.Trial) { tr.Modified = time.Date(10000, 1, 1, 0, 0, 0, 0, time.UTC) },
	}
	for name, mutate := range cases {
		tr := richTrial()
		mutate(tr)
		var buf bytes.Buffer
		if err := Encode(&buf, tr); err == nil {
			t.Errorf("%s: encoded", name)
		} else if buf.Len() != 0 {
			t.Errorf("%s: wrote %d bytes before failing", name, buf.Len())
		}
	}
}

// testdata/v0-sample.furlong is a version 0 file (see testdata/README.md).
func TestMigrateVersion0(t *testing.T) {
	t.Parallel()
	tr, err := Load("testdata/v0-sample.furlong")
	if err != nil {
		t.Fatal(err)
	}
	if tr.Title != "Barley sowing dates, Fernhollow block" || tr.Site.Name != "Fernhollow" || tr.Design.Kind != trial.RCBD || tr.Design.Reps != 2 {
		t.Errorf("metadata not migrated: %+v", tr)
	}
	// 9007199254740993 = 2^53+1 cannot be held by a float64 (RFC 8259 §6);
	// it must come through exactly.
	if tr.Random.Seed != 9007199254740993 {
		t.Errorf("seed %d", tr.Random.Seed)
	}
	if !tr.Random.Done.Equal(time.Date(2025, 4, 2, 10, 0, 0, 0, time.UTC)) || tr.Layout.Walk != trial.WalkSerpentine {
		t.Errorf("randomisation or walk not migrated: %+v %+v", tr.Random, tr.Layout)
	}
	if tr.Treatments[0].Role != trial.RoleCheck || tr.Treatments[1].Role != trial.RoleEntry {
		t.Errorf("roles %+v", tr.Treatments)
	}
	if len(tr.Plots) != 4 || tr.Plots[3].Number != 202 {
		t.Fatalf("plots %+v", tr.Plots)
	}
	y, s := tr.Traits[0].Values, tr.Traits[1].Values
	want := []float64{3.41, trial.Missing, 4.05, 3.875}
	for i := range want {
		if math.IsNaN(want[i]) != math.IsNaN(y[i]) || (!math.IsNaN(want[i]) && y[i] != want[i]) {
			t.Errorf("yield %v, want %v", y, want)
			break
		}
	}
	if s[0] != 2 || !math.IsNaN(s[1]) || !math.IsNaN(s[2]) || s[3] != 7 {
		t.Errorf("tillers %v", s)
	}
	// A migrated trial saves as version 1 and reads back unchanged.
	back, err := Decode(bytes.NewReader(encodeT(t, tr)))
	if err != nil {
		t.Fatal(err)
	}
	if d := diff(tr, back); d != "" {
		t.Error(d)
	}
}

func TestVersion0Errors(t *testing.T) {
	t.Parallel()
	raw, err := os.ReadFile("testdata/v0-sample.furlong")
	if err != nil {
		t.Fatal(err)
	}
	in := string(raw)
	cases := []struct {
		old, new string
		kind     error
		path     string
	}{
		{`"yield": 4.05`, `"yeild": 4.05`, ErrUnknownTrait, "trial.plots[2].values.yeild"},
		{`"yield": 4.05`, `"yield": "4.05"`, ErrWrongType, "trial.plots[2].values.yield"},
		{`"tillers": 7`, `"tillers": 7.5`, ErrValueKind, "trial.plots[3].values.tillers"},
		{`"plot": 201`, `"plot": 102`, ErrDuplicatePlot, "trial.plots[2].plot"},
	}
	for _, c := range cases {
		if strings.Count(in, c.old) != 1 {
			t.Fatalf("%q occurs %d times", c.old, strings.Count(in, c.old))
		}
		_, err := Decode(strings.NewReader(strings.Replace(in, c.old, c.new, 1)))
		var pe *ParseError
		if !errors.Is(err, c.kind) || !errors.As(err, &pe) || pe.Path != c.path || pe.Line == 0 {
			t.Errorf("%s: got %v", c.new, err)
		}
	}
}
