package trialfile

import (
	"bytes"
	"errors"
	"os"
	"strings"
	"testing"

	"furlong/trial"
)

// The field's orientation is two optional layout keys: absent in older
// files (which open with no orientation), written only when given, read
// back as written, and an unknown edge is refused with its path.
func TestOrientationKeys(t *testing.T) {
	t.Parallel()
	data, err := os.ReadFile("testdata/v1-demo.furlong")
	if err != nil {
		t.Fatal(err)
	}
	tr, err := Decode(bytes.NewReader(data))
	if err != nil {
		t.Fatal(err)
	}
	if !tr.Layout.Orientation.IsZero() {
		t.Fatalf("a file without the keys has orientation %+v", tr.Layout.Orientation)
	}
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	if s := buf.String(); strings.Contains(s, `"north"`) || strings.Contains(s, `"landmark"`) {
		t.Error("keys written for an orientation never given")
	}

	tr.Layout.Orientation = trial.Orientation{North: trial.EdgeLeft, Landmark: "farm track \"east\""}
	buf.Reset()
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{`"north": "left"`, `"landmark": "farm track \"east\""`} {
		if !strings.Contains(buf.String(), want) {
			t.Errorf("file lacks %s", want)
		}
	}
	back, err := Decode(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	if back.Layout.Orientation != tr.Layout.Orientation {
		t.Errorf("read back %+v, want %+v", back.Layout.Orientation, tr.Layout.Orientation)
	}

	bad := bytes.Replace(buf.Bytes(), []byte(`"north": "left"`), []byte(`"north": "up"`), 1)
	_, err = Decode(bytes.NewReader(bad))
	var pe *ParseError
	if !errors.As(err, &pe) || !strings.Contains(err.Error(), "trial.layout.north") || !strings.Contains(err.Error(), "top, right, bottom or left") {
		t.Errorf("unknown edge: %v", err)
	}
	tr.Layout.Orientation.North = "up"
	if err := Encode(&bytes.Buffer{}, tr); err == nil {
		t.Error("an unknown edge was written")
	}
}
