package jsonout

import (
	"bytes"
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"
)

type failWriter struct{ n int }

func (f *failWriter) Write(p []byte) (int, error) {
	f.n++
	return 0, errors.New("disk full")
}

// TestWriterLayout checks a nested document against encoding/json (a
// general-purpose library): valid JSON, the same values after decoding,
// compact records on one line, ordinary members one per line.
func TestWriterLayout(t *testing.T) {
	t.Parallel()
	var b bytes.Buffer
	w := New(&b)
	w.BeginObject()
	w.StringField("name", "a<b>")
	w.Key("list")
	w.BeginArray()
	for i := range 3 {
		w.BeginCompactObject()
		w.IntField("i", i)
		w.NumberField("x", float64(i)/3)
		w.Key("nested")
		w.BeginObject() // inside a compact record: compact too
		w.BoolField("ok", i%2 == 0)
		w.EndObject()
		w.EndObject()
	}
	w.EndArray()
	w.Key("empty")
	w.BeginArray()
	w.EndArray()
	w.NullableNumberField("none", nil)
	w.OptionalNumberField("left_out", nil)
	w.Key("words")
	w.Strings([]string{"one", "two"})
	w.EndObject()
	if err := w.Flush(); err != nil {
		t.Fatal(err)
	}
	want := map[string]any{
		"name": "a<b>",
		"list": []any{
			map[string]any{"i": 0.0, "x": 0.0, "nested": map[string]any{"ok": true}},
			map[string]any{"i": 1.0, "x": 1.0 / 3, "nested": map[string]any{"ok": false}},
			map[string]any{"i": 2.0, "x": 2.0 / 3, "nested": map[string]any{"ok": true}},
		},
		"empty": []any{}, "none": nil, "words": []any{"one", "two"},
	}
	var got map[string]any
	if err := json.Unmarshal(b.Bytes(), &got); err != nil {
		t.Fatalf("not JSON: %v\n%s", err, b.String())
	}
	wb, _ := json.Marshal(want)
	gb, _ := json.Marshal(got)
	if string(wb) != string(gb) {
		t.Errorf("decoded\n%s\nwant\n%s", gb, wb)
	}
	lines := strings.Split(strings.TrimSuffix(b.String(), "\n"), "\n")
	if lines[4] != `    {"i":1,"x":0.3333333333333333,"nested":{"ok":false}},` {
		t.Errorf("a compact record should be one line, got %q", lines[4])
	}
	if !strings.Contains(b.String(), "\n  \"empty\": [],\n") {
		t.Errorf("an empty array should be [] on its member's line:\n%s", b.String())
	}
}

// TestWriterRefusesNaN: JSON has no NaN or infinity (the project's rule:
// a value that does not apply is null or left out).
func TestWriterRefusesNaN(t *testing.T) {
	t.Parallel()
	for _, v := range []float64{math.NaN(), math.Inf(1), math.Inf(-1)} {
		var b bytes.Buffer
		w := New(&b)
		w.BeginObject()
		w.NumberField("ss", v)
		w.EndObject()
		if err := w.Flush(); err == nil || !strings.Contains(err.Error(), `"ss"`) {
			t.Errorf("%v: error %v, want one naming the key", v, err)
		}
	}
}

// TestWriterMisuse: a value without its key, or a container closed by the
// wrong end, is an error and not broken output.
func TestWriterMisuse(t *testing.T) {
	t.Parallel()
	var b bytes.Buffer
	w := New(&b)
	w.BeginObject()
	w.Int(1)
	if w.Err() == nil {
		t.Error("a value without a key in an object was accepted")
	}
	w = New(&b)
	w.BeginArray()
	w.EndObject()
	if w.Err() == nil {
		t.Error("an array closed as an object was accepted")
	}
}

// TestWriterKeepsWriteError: the io.Writer's error comes back from Flush
// and nothing more is written after it.
func TestWriterKeepsWriteError(t *testing.T) {
	t.Parallel()
	f := &failWriter{}
	w := New(f)
	w.BeginArray()
	for range 20000 {
		w.String("0123456789")
	}
	w.EndArray()
	if err := w.Flush(); err == nil || err.Error() != "disk full" {
		t.Fatalf("Flush = %v, want the writer's error", err)
	}
	if f.n != 1 {
		t.Errorf("%d writes after the first failure, want none", f.n-1)
	}
}
