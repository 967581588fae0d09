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

// TestOperationsRoundTrip saves a trial's log of operations and reads it
// back unchanged, in date order, with the day written as YYYY-MM-DD (ISO
// 8601 calendar date).
func TestOperationsRoundTrip(t *testing.T) {
	t.Parallel()
	tr := richTrial()
	codes := tr.TreatmentCodes()
	ops := []trial.Operation{
		{Kind: trial.OpApplication, Date: time.Date(2026, 5, 14, 15, 30, 0, 0, time.UTC), Treatments: codes[1:2],
			Product: "Programme A product 1", Rate: fp(1.25), RateUnit: "L/ha", WaterVolume: fp(200), Equipment: "plot sprayer, 3 m boom",
			Temperature: fp(14.5), Wind: fp(8), WindDirection: "SW", Humidity: fp(65), GrowthStage: "31", Scale: "BBCH", Assessor: "crew 2"},
		{Kind: trial.OpSowing, Date: time.Date(2026, 4, 2, 0, 0, 0, 0, time.UTC), Notes: "350 seeds/m²"},
		{Kind: trial.OpAssessment, Date: time.Date(2026, 6, 1, 0, 0, 0, 0, time.UTC), Traits: []string{tr.Traits[0].Key}, GrowthStage: "65", Scale: "BBCH", Assessor: "A. Field"},
	}
	for _, o := range ops {
		if err := tr.AddOperation(o); err != nil {
			t.Fatal(err)
		}
	}
	if tr.Operations[0].Kind != trial.OpSowing || tr.Operations[1].Kind != trial.OpApplication {
		t.Fatalf("log not in date order: %v, %v", tr.Operations[0].Kind, tr.Operations[1].Kind)
	}
	var buf bytes.Buffer
	if err := Encode(&buf, tr); err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(buf.Bytes(), []byte(`"date": "2026-05-14"`)) || !bytes.Contains(buf.Bytes(), []byte(`"water_l_per_ha": 200`)) {
		t.Errorf("the file does not hold the day and the water volume:\n%s", buf.String())
	}
	got, err := Decode(bytes.NewReader(buf.Bytes()))
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(got.Operations, tr.Operations) {
		t.Errorf("read back %+v\nwant %+v", got.Operations, tr.Operations)
	}
	if w := got.Operations[1].WeatherText(); w != "14.5 °C, wind 8 km/h SW, RH 65 %" {
		t.Errorf("weather %q", w)
	}
	// A clone shares no memory: changing it leaves the trial as it was.
	c := got.Clone()
	*c.Operations[1].Rate = 9
	c.Operations[1].Treatments[0] = "zz"
	if *got.Operations[1].Rate != 1.25 || got.Operations[1].Treatments[0] != codes[1] {
		t.Error("a clone's log shares memory with the trial")
	}
}

// TestOperationsVersions: version 4 files had no log, so an "operations"
// member there is ignored like any unknown member; the version 2 demo
// opens with an empty log; a date that is not a day names its place.
func TestOperationsVersions(t *testing.T) {
	t.Parallel()
	src := `{"format": "furlong-trial", "version": 4, "trial": {
	"treatments": [{"code": "a"}, {"code": "b"}],
	"design": {"kind": "crd", "reps": 2},
	"operations": [{"kind": "sowing", "date": "2026-04-02"}]}}`
	tr, err := Decode(strings.NewReader(src))
	if err != nil {
		t.Fatal(err)
	}
	if tr.Operations != nil {
		t.Errorf("version 4 took a version 5 member: %+v", tr.Operations)
	}
	tr, err = Decode(strings.NewReader(strings.Replace(src, `"version": 4`, `"version": 5`, 1)))
	if err != nil || len(tr.Operations) != 1 || !tr.Operations[0].Date.Equal(time.Date(2026, 4, 2, 0, 0, 0, 0, time.UTC)) {
		t.Fatalf("version 5 log: %+v, %v", tr.Operations, err)
	}
	bad := strings.Replace(strings.Replace(src, `"version": 4`, `"version": 5`, 1), "2026-04-02", "2 April", 1)
	_, err = Decode(strings.NewReader(bad))
	var pe *ParseError
	if !errors.As(err, &pe) || !strings.Contains(err.Error(), "YYYY-MM-DD") || !strings.Contains(err.Error(), "operations[0].date") {
		t.Errorf("bad date: %v", err)
	}
	f, err := os.Open("testdata/v2-demo.furlong")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if v2, err := Decode(f); err != nil || v2.Operations != nil {
		t.Errorf("version 2 demo: %v", err)
	}
}

// TestOperationChecks: the log refuses what cannot be right, in words.
func TestOperationChecks(t *testing.T) {
	t.Parallel()
	tr := richTrial()
	day := time.Date(2026, 5, 1, 0, 0, 0, 0, time.UTC)
	for _, tc := range []struct {
		op   trial.Operation
		want string
	}{
		{trial.Operation{Kind: "spraying", Date: day}, "not a kind of operation"},
		{trial.Operation{Kind: trial.OpSowing}, "needs its date"},
		{trial.Operation{Kind: trial.OpApplication, Date: day}, "name of the product"},
		{trial.Operation{Kind: trial.OpOther, Date: day, Treatments: []string{"ZZ"}}, `no treatment "ZZ"`},
		{trial.Operation{Kind: trial.OpAssessment, Date: day, Traits: []string{"zz"}}, `no trait "zz"`},
		{trial.Operation{Kind: trial.OpApplication, Date: day, Product: "P", Humidity: fp(120)}, "relative humidity"},
		{trial.Operation{Kind: trial.OpApplication, Date: day, Product: "P", Rate: fp(1)}, "unit of the rate"},
	} {
		err := tr.AddOperation(tc.op)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%+v: %v, want %q", tc.op, err, tc.want)
		}
	}
	if len(tr.Operations) != 0 {
		t.Errorf("refused operations were added: %v", tr.Operations)
	}
	if err := tr.RemoveOperation(0); err == nil || !strings.Contains(err.Error(), "empty") {
		t.Errorf("remove from an empty log: %v", err)
	}
}
