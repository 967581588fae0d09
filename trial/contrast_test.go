package trial

import (
	"reflect"
	"strings"
	"testing"
)

func TestParseContrast(t *testing.T) {
	t.Parallel()
	codes := []string{"U", "A", "B", "C"}
	for _, c := range []struct {
		in   string
		want []float64
		def  string
	}{
		// Group means: each side weighted equally (common practice).
		{"programmes=A,B,C vs U", []float64{-1, 1.0 / 3, 1.0 / 3, 1.0 / 3}, "A,B,C vs U"},
		{"ab = A , B VS C", []float64{0, 0.5, 0.5, -1}, "A,B vs C"},
		{"lin=A:1,B:1,C:-2", []float64{0, 1, 1, -2}, "A:1,B:1,C:-2"},
		{"A vs B", []float64{0, 1, -1, 0}, "A vs B"},
	} {
		ct, err := ParseContrast(c.in)
		if err != nil {
			t.Fatalf("%q: %v", c.in, err)
		}
		w, err := ct.Weights(codes)
		if err != nil {
			t.Fatalf("%q: %v", c.in, err)
		}
		if !reflect.DeepEqual(w, c.want) || ct.Definition() != c.def {
			t.Errorf("%q: %v %q, want %v %q", c.in, w, ct.Definition(), c.want, c.def)
		}
		back, err := ParseContrast(ct.String())
		if err != nil || !reflect.DeepEqual(back, ct) {
			t.Errorf("%q does not read back: %+v %v", ct.String(), back, err)
		}
	}
}

func TestContrastRefusals(t *testing.T) {
	t.Parallel()
	codes := []string{"U", "A", "B"}
	for _, c := range []struct{ in, want string }{
		{"x=A:1,B:1", "add up to 2; they must add up to 0"},
		{"x=A,Z vs U", `no treatment "Z"`},
		{"x=A,B vs A", "A is on both sides"},
		{"x=A:1,A:-1", "named twice"},
		{"x=A:0,B:0", "every coefficient is 0"},
		{"x= vs U", "both groups need at least one treatment"},
		{"x=A:one,B:-1", "is not a number"},
		{"x=A B", "neither two groups"},
		{"=A vs B", "needs a name"},
		{"x=", "nothing after the = sign"},
	} {
		ct, err := ParseContrast(c.in)
		if err == nil {
			_, err = ct.Weights(codes)
		}
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%q: %v, want %q", c.in, err, c.want)
		}
	}
}

func TestSetRemoveContrast(t *testing.T) {
	t.Parallel()
	tr := &Trial{Treatments: []Treatment{{Code: "U"}, {Code: "A"}, {Code: "B"}}}
	a, _ := ParseContrast("t=A,B vs U")
	b, _ := ParseContrast("t=A vs B")
	if err := tr.SetContrast(a); err != nil {
		t.Fatal(err)
	}
	if err := tr.SetContrast(b); err != nil || len(tr.Analysis.Contrasts) != 1 || tr.Analysis.Contrasts[0].Definition() != "A vs B" {
		t.Errorf("replacing by name: %v %+v", err, tr.Analysis.Contrasts)
	}
	bad, _ := ParseContrast("u=A vs Q")
	if err := tr.SetContrast(bad); err == nil {
		t.Error("a contrast with an unknown code was saved")
	}
	if err := tr.RemoveContrast("nope"); err == nil || !strings.Contains(err.Error(), "(it has t)") {
		t.Errorf("remove unknown: %v", err)
	}
	if err := tr.RemoveContrast("t"); err != nil || len(tr.Analysis.Contrasts) != 0 {
		t.Errorf("remove: %v", err)
	}
}
