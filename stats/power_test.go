package stats

import (
	"encoding/json"
	"errors"
	"math"
	"testing"

	"furlong/stats/refdata"
)

type planningCase struct {
	Design     string  `json:"design"`
	Treatments int     `json:"treatments"`
	Reps       int     `json:"reps"`
	CV         float64 `json:"cv"`
	Alpha      float64 `json:"alpha"`
	Power      float64 `json:"power"`
	DFError    float64 `json:"df_error"`
	Detectable float64 `json:"detectable_percent"`
}

func loadPlanning(t *testing.T) []planningCase {
	t.Helper()
	b, err := refdata.ReadFile("planning.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var f struct {
		Cases []planningCase `json:"cases"`
	}
	if err := json.Unmarshal(b, &f); err != nil {
		t.Fatal(err)
	}
	if len(f.Cases) == 0 {
		t.Fatal("no planning cases")
	}
	return f.Cases
}

func TestDetectableDifferenceAgainstR(t *testing.T) {
	t.Parallel()
	// Reference: R 4.2.2, pt/qt with ncp and uniroot
	// (stats/refdata/planning.expected.json).
	for _, c := range loadPlanning(t) {
		in := PowerInput{Reps: c.Reps, DFError: c.DFError, CV: c.CV, Alpha: c.Alpha}
		got, err := DetectableDifference(in, c.Power)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-c.Detectable) > 1e-9*c.Detectable {
			t.Errorf("%s t=%d r=%d cv=%g: detectable %.12g%%, R %.12g%%", c.Design, c.Treatments, c.Reps, c.CV, got, c.Detectable)
		}
		// Round trip: the power at the detectable difference is the target.
		p, err := PowerOfDifference(in, got)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(p-c.Power) > 1e-9 {
			t.Errorf("power at the detectable difference = %.12g, want %g", p, c.Power)
		}
		// The replicates needed for exactly that difference are the case's own.
		treatments := c.Treatments
		df := func(r int) float64 {
			if c.Design == "crd" {
				return float64(treatments * (r - 1))
			}
			return float64((treatments - 1) * (r - 1))
		}
		r, d, err := RepsNeeded(c.Detectable*(1+1e-9), c.CV, c.Alpha, c.Power, 2, 50, df)
		if err != nil || r != c.Reps || math.Abs(d-c.Detectable) > 1e-6 {
			t.Errorf("RepsNeeded(%g%%) = %d, %g, %v; want %d", c.Detectable, r, d, err, c.Reps)
		}
		r, _, err = RepsNeeded(c.Detectable*0.99, c.CV, c.Alpha, c.Power, 2, 50, df)
		if err != nil || r != c.Reps+1 {
			t.Errorf("RepsNeeded(%g%%) = %d, %v; want %d", c.Detectable*0.99, r, err, c.Reps+1)
		}
	}
}

func TestDetectableDifferenceLargeDF(t *testing.T) {
	t.Parallel()
	// With very many error df the t test is the z test, and the detectable
	// difference is (z_{1-α/2} + z_{power})·SE, neglecting the far tail
	// (the normal-approximation formula of textbook sample-size tables, e.g.
	// Snedecor & Cochran, Statistical Methods; z values from memory:
	// 1.959964 and 0.841621).
	in := PowerInput{Reps: 4, DFError: 1e7, CV: 10, Alpha: 0.05}
	got, err := DetectableDifference(in, 0.8)
	if err != nil {
		t.Fatal(err)
	}
	want := (1.959964 + 0.841621) * 10 * math.Sqrt(2.0/4)
	if math.Abs(got-want) > 1e-3 {
		t.Errorf("detectable = %.6f, normal approximation %.6f", got, want)
	}
}

func TestFPowerTwoMeansIsTPower(t *testing.T) {
	t.Parallel()
	// With two treatments the F test is the two-sided t test (F = t²), so
	// the two powers agree (a mathematical identity, Scheffé 1959 §2.8).
	in := PowerInput{Reps: 5, DFError: 12, CV: 8, Alpha: 0.05}
	for _, d := range []float64{3, 10, 18} {
		tp, err := PowerOfDifference(in, d)
		if err != nil {
			t.Fatal(err)
		}
		fp, lambda, err := FPower([]float64{100 - d/2, 100 + d/2}, in.Reps, in.DFError, in.CV, in.Alpha)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(fp-tp) > 1e-10 {
			t.Errorf("d=%g: F power %.12g, t power %.12g", d, fp, tp)
		}
		if want := 5 * d * d / (2 * 64); math.Abs(lambda-want) > 1e-12 {
			t.Errorf("lambda %g, want %g", lambda, want)
		}
	}
	// Equal means: the power is the significance level.
	p, _, err := FPower([]float64{100, 100, 100}, 4, 6, 10, 0.05)
	if err != nil || math.Abs(p-0.05) > 1e-12 {
		t.Errorf("power with equal means = %g, %v; want 0.05", p, err)
	}
}

func TestPlanningInputErrors(t *testing.T) {
	t.Parallel()
	good := PowerInput{Reps: 4, DFError: 21, CV: 10, Alpha: 0.05}
	for name, c := range map[string]struct {
		in    PowerInput
		power float64
	}{
		"no df":     {PowerInput{Reps: 4, CV: 10, Alpha: 0.05}, 0.8},
		"cv 0":      {PowerInput{Reps: 4, DFError: 21, Alpha: 0.05}, 0.8},
		"alpha 1":   {PowerInput{Reps: 4, DFError: 21, CV: 10, Alpha: 1}, 0.8},
		"power 1":   {good, 1},
		"power < α": {good, 0.01},
	} {
		_, err := DetectableDifference(c.in, c.power)
		var pe *ValueError
		if !errors.As(err, &pe) || pe.Reason == "" {
			t.Errorf("%s: error %v, want a ValueError", name, err)
		}
	}
	_, _, err := RepsNeeded(0.5, 30, 0.05, 0.9, 2, 10, func(r int) float64 { return float64(r - 1) })
	if !errors.Is(err, ErrTooManyReps) {
		t.Errorf("RepsNeeded beyond the limit: %v", err)
	}
}
