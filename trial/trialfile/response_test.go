package trialfile

import (
	"bytes"
	"errors"
	"slices"
	"strings"
	"testing"

	"furlong/trial"
)

// TestResponseSettings: a rate trial's response settings (version 6) are
// written only when set, read back unchanged, ignored in a version 5 file
// like any unknown member, and a negative price ratio names its place.
func TestResponseSettings(t *testing.T) {
	t.Parallel()
	src := `{"format": "furlong-trial", "version": 5, "trial": {
	"treatments": [{"code": "N0", "rate": 0}, {"code": "N60", "rate": 60}, {"code": "UTC"}],
	"design": {"kind": "crd", "reps": 2},
	"analysis": {"mean_separation": "lsd", "response": {"leave_out": ["UTC"], "price_ratio": 0.006}}}}`
	tr, err := Decode(strings.NewReader(src))
	if err != nil {
		t.Fatal(err)
	}
	if tr.Analysis.Response.PriceRatio != 0 || tr.Analysis.Response.LeaveOut != nil {
		t.Errorf("version 5 took a version 6 member: %+v", tr.Analysis.Response)
	}
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	if bytes.Contains(buf.Bytes(), []byte(`"response"`)) {
		t.Error("a trial without response settings wrote a response member")
	}
	tr, err = Decode(strings.NewReader(strings.Replace(src, `"version": 5`, `"version": 6`, 1)))
	if err != nil {
		t.Fatal(err)
	}
	want := trial.ResponseSettings{LeaveOut: []string{"UTC"}, PriceRatio: 0.006}
	if got := tr.Analysis.Response; got.PriceRatio != want.PriceRatio || !slices.Equal(got.LeaveOut, want.LeaveOut) {
		t.Fatalf("read %+v, want %+v", got, want)
	}
	buf.Reset()
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	back, err := Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if got := back.Analysis.Response; got.PriceRatio != want.PriceRatio || !slices.Equal(got.LeaveOut, want.LeaveOut) {
		t.Errorf("round trip gave %+v, want %+v", got, want)
	}
	bad := strings.Replace(strings.Replace(src, `"version": 5`, `"version": 6`, 1), "0.006", "-1", 1)
	_, err = Decode(strings.NewReader(bad))
	var pe *ParseError
	if !errors.As(err, &pe) || !strings.Contains(err.Error(), "price_ratio") {
		t.Errorf("negative price ratio: %v", err)
	}
}

// TestEconomicsRoundTrip: the user's prices (version 6) are read back as
// written, a product cost not given stays not given (absent, not 0), a
// version 5 file ignores the member, and a negative cost names its place.
func TestEconomicsRoundTrip(t *testing.T) {
	t.Parallel()
	src := `{"format": "furlong-trial", "version": 6, "trial": {
	"treatments": [{"code": "A"}, {"code": "B"}],
	"design": {"kind": "crd", "reps": 2},
	"economics": {"currency": "EUR", "produce_price": 180, "trait": "",
		"costs": [{"treatment": "A", "product": 42.5, "application": 12}, {"treatment": "B", "application": 12}]}}}`
	tr, err := Decode(strings.NewReader(src))
	if err != nil {
		t.Fatal(err)
	}
	e := tr.Economics
	if e.Currency != "EUR" || e.ProducePrice != 180 || len(e.Costs) != 2 || e.Costs[0].Product == nil || *e.Costs[0].Product != 42.5 ||
		e.Costs[0].Application != 12 || e.Costs[1].Product != nil || e.Costs[1].Application != 12 {
		t.Fatalf("read %+v", e)
	}
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	back, err := Decode(&buf)
	if err != nil {
		t.Fatal(err)
	}
	if b := back.Economics; b.Currency != e.Currency || b.ProducePrice != e.ProducePrice || len(b.Costs) != 2 || *b.Costs[0].Product != 42.5 || b.Costs[1].Product != nil {
		t.Errorf("round trip %+v", b)
	}
	old, err := Decode(strings.NewReader(strings.Replace(src, `"version": 6`, `"version": 5`, 1)))
	if err != nil || old.Economics.ProducePrice != 0 || old.Economics.Costs != nil {
		t.Errorf("version 5 took the economics: %+v, %v", old.Economics, err)
	}
	_, err = Decode(strings.NewReader(strings.Replace(src, `"application": 12}, {`, `"application": -1}, {`, 1)))
	if err == nil || !strings.Contains(err.Error(), "economics.costs[0]") {
		t.Errorf("negative cost: %v", err)
	}
}

// TestContrastAdjust: the saved adjustment of the contrasts (version 6) is
// read back, "none" is written as nothing, and an unknown name is refused
// naming its place.
func TestContrastAdjust(t *testing.T) {
	t.Parallel()
	src := `{"format": "furlong-trial", "version": 6, "trial": {
	"treatments": [{"code": "a"}, {"code": "b"}], "design": {"kind": "crd", "reps": 2},
	"analysis": {"mean_separation": "lsd", "contrast_adjust": "holm"}}}`
	tr, err := Decode(strings.NewReader(src))
	if err != nil || tr.Analysis.ContrastAdjust != trial.AdjustHolm {
		t.Fatalf("read %q, %v", tr.Analysis.ContrastAdjust, err)
	}
	var buf bytes.Buffer
	tr.Analysis.ContrastAdjust = trial.AdjustNone
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	if bytes.Contains(buf.Bytes(), []byte("contrast_adjust")) {
		t.Error("no adjustment was written")
	}
	if v5, err := Decode(strings.NewReader(strings.Replace(src, `"version": 6`, `"version": 5`, 1))); err != nil || v5.Analysis.ContrastAdjust != "" {
		t.Errorf("version 5 took the adjustment: %q, %v", v5.Analysis.ContrastAdjust, err)
	}
	_, err = Decode(strings.NewReader(strings.Replace(src, `"holm"`, `"sidak"`, 1)))
	if err == nil || !strings.Contains(err.Error(), "contrast_adjust") {
		t.Errorf("unknown adjustment: %v", err)
	}
}

// TestTraitCovariateSaved: a trait's covariate (version 6) is read back as
// written and ignored in a version 5 file.
func TestTraitCovariateSaved(t *testing.T) {
	t.Parallel()
	src := `{"format": "furlong-trial", "version": 6, "trial": {
	"treatments": [{"code": "a"}, {"code": "b"}], "design": {"kind": "crd", "reps": 1},
	"plots": [{"number": 1, "block": 1, "row": 1, "column": 1, "treatment": "a"}, {"number": 2, "block": 1, "row": 1, "column": 2, "treatment": "b"}],
	"traits": [{"key": "y", "kind": "continuous", "values": [1, 2], "covariate": "st"},
	           {"key": "st", "kind": "count", "values": [30, 31]}]}}`
	tr, err := Decode(strings.NewReader(src))
	if err != nil || tr.Traits[0].Covariate != "st" {
		t.Fatalf("read %+v, %v", tr.Traits[0], err)
	}
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	back, err := Decode(&buf)
	if err != nil || back.Traits[0].Covariate != "st" || back.Traits[1].Covariate != "" {
		t.Errorf("round trip: %v, %q", err, back.Traits[0].Covariate)
	}
	if v5, err := Decode(strings.NewReader(strings.Replace(src, `"version": 6`, `"version": 5`, 1))); err != nil || v5.Traits[0].Covariate != "" {
		t.Errorf("version 5 took the covariate: %v", err)
	}
}
