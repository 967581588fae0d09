package trial

import (
	"errors"
	"math"
	"strings"
	"testing"
	"time"
)

func fptr(v float64) *float64 { return &v }

// sampleTrial is a small valid trial on an invented farm: 4 entries of an
// invented maize series in 3 blocks, with weight, moisture, height and a
// derived adjusted yield.
func sampleTrial(t *testing.T) *Trial {
	t.Helper()
	ts := []Treatment{
		{Code: "CHK", Name: "Farm check", Role: RoleCheck},
		{Code: "MZ-101", Name: "Meadowgate 101"},
		{Code: "MZ-102", Name: "Meadowgate 102"},
		{Code: "MZ-103", Name: "Meadowgate 103"},
	}
	tr, err := New(NewOptions{
		Title:      "Maize entry trial, North Paddock",
		Crop:       "maize",
		Season:     "2026",
		Site:       Site{Name: "Hollow Creek Farm, North Paddock"},
		Treatments: ts,
		Design:     Design{Kind: RCBD, Reps: 3},
		Traits: []Trait{
			{Key: "wt", Name: "Plot weight", Unit: "kg", Kind: Continuous, Min: fptr(0), Decimals: 2},
			{Key: "mst", Name: "Grain moisture", Unit: "%", Kind: Percent, Min: fptr(5), Max: fptr(45), Decimals: 1},
			{Key: "ht", Name: "Plant height", Unit: "cm", Kind: Continuous, Min: fptr(20), Max: fptr(400)},
			AdjustedYieldTrait("yld", "wt", "mst", "maize", UnitTHa),
		},
		Seed: 42,
		Now:  time.Date(2026, 4, 20, 8, 0, 0, 0, time.UTC),
	})
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// wantProblem asserts that err is a ValidationErrors holding a problem for
// field whose message contains msg.
func wantProblem(t *testing.T, err error, field, msg string) {
	t.Helper()
	var ve ValidationErrors
	if !errors.As(err, &ve) {
		t.Fatalf("error %v (%T) is not a ValidationErrors", err, err)
	}
	for _, e := range ve {
		if e.Field == field && strings.Contains(e.Msg, msg) {
			return
		}
	}
	t.Errorf("no problem for %s containing %q in:\n%v", field, msg, err)
}

func TestSampleTrialValid(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	if err := tr.Validate(); err != nil {
		t.Fatal(err)
	}
}

// The rules below are Furlong's own (the limits documented in validate.go);
// the Latin square's error degrees of freedom, (t − 1)(t − 2), are from
// Gomez & Gomez (1984), Statistical Procedures for Agricultural Research, 2.3.
func TestValidationRules(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name   string
		edit   func(*Trial)
		field  string
		substr string
	}{
		{"one treatment", func(tr *Trial) { tr.Treatments = tr.Treatments[:1] },
			"Treatments", "a trial needs at least 2 treatments to compare; it has 1"},
		{"empty code", func(tr *Trial) { tr.Treatments[1].Code = "" },
			"Treatments[1].Code", "treatment 2 has no code"},
		{"long code", func(tr *Trial) { tr.Treatments[1].Code = "ABCDEFGHIJKLM" },
			"Treatments[1].Code", `treatment code "ABCDEFGHIJKLM" is 13 characters long; use at most 12`},
		{"space", func(tr *Trial) { tr.Treatments[1].Code = "MZ 101" },
			"Treatments[1].Code", "contains a space"},
		{"comma", func(tr *Trial) { tr.Treatments[1].Code = "MZ,101" },
			"Treatments[1].Code", "contains a comma"},
		{"duplicate code", func(tr *Trial) { tr.Treatments[2].Code = "MZ-101" },
			"Treatments[2].Code", `treatment code "MZ-101" is used twice (treatments 2 and 3)`},
		{"codes differ in case only", func(tr *Trial) { tr.Treatments[2].Code = "mz-101" },
			"Treatments[2].Code", "differ only in capitals"},
		{"bad role", func(tr *Trial) { tr.Treatments[0].Role = "control" },
			"Treatments[0].Role", "an entry, a check or the untreated check"},
		{"no design", func(tr *Trial) { tr.Design.Kind = "" },
			"Design.Kind", "choose a design"},
		{"unknown design", func(tr *Trial) { tr.Design.Kind = "alpha" },
			"Design.Kind", `the design "alpha" is not one Furlong knows`},
		{"one rep", func(tr *Trial) { tr.Design.Reps = 1 },
			"Design.Reps", "a randomised complete block design needs 2 to 50 replicates, not 1"},
		{"too many reps", func(tr *Trial) { tr.Design = Design{Kind: CRD, Reps: 51} },
			"Design.Reps", "a completely randomised design needs 2 to 50 replicates, not 51"},
		{"latin reps", func(tr *Trial) {
			tr.Treatments = append(tr.Treatments, Treatment{Code: "MZ-104"})
			tr.Design = Design{Kind: Latin, Reps: 4}
		}, "Design.Reps", "a Latin square needs as many rows and columns as treatments: 5 treatments need a 5 × 5 square, not 4 replicates"},
		{"latin too small", func(tr *Trial) {
			tr.Treatments = tr.Treatments[:2]
			tr.Design = Design{Kind: Latin, Reps: 2}
		}, "Design.Kind", "a Latin square needs at least 3 treatments: with 2 there are no degrees of freedom left to estimate the error"},
		{"latin too large", func(tr *Trial) {
			tr.Treatments = treatments(17)
			tr.Design = Design{Kind: Latin, Reps: 17}
		}, "Design.Kind", "17 × 17 = 289 plots"},
		{"plot length", func(tr *Trial) { tr.Layout.PlotLength = 0 },
			"Layout.PlotLength", "the plot length must be more than 0 m"},
		{"harvest longer than plot", func(tr *Trial) { tr.Layout.HarvestLength = 12 },
			"Layout.HarvestLength", "the harvested length (12 m) cannot be more than the plot length (10 m)"},
		{"negative alley", func(tr *Trial) { tr.Layout.Alley = -1 },
			"Layout.Alley", "the alley width must be 0 m or more"},
		{"unknown walk", func(tr *Trial) { tr.Layout.Walk = "spiral" },
			"Layout.Walk", `either serpentine or straight, not "spiral"`},
		{"empty trait key", func(tr *Trial) { tr.Traits[2].Key = "" },
			"Traits[2].Key", "trait 3 has no key"},
		{"unsafe trait key", func(tr *Trial) { tr.Traits[2].Key = "plant height" },
			"Traits[2].Key", "can hold only letters, digits, _ and -"},
		{"duplicate trait key", func(tr *Trial) { tr.Traits[2].Key = "WT" },
			"Traits[2].Key", `trait key "WT" is used twice (traits 1 and 3)`},
		{"min above max", func(tr *Trial) { tr.Traits[2].Min, tr.Traits[2].Max = fptr(500), fptr(400) },
			"Traits[2].Min", "minimum (500) above its maximum (400)"},
		{"decimals", func(tr *Trial) { tr.Traits[2].Decimals = 7 },
			"Traits[2].Decimals", "is set to 7 decimals; use 0 to 6"},
		{"values length", func(tr *Trial) { tr.Traits[2].Values = tr.Traits[2].Values[:5] },
			"Traits[2].Values", `trait "ht" has 5 values for 12 plots`},
		{"infinite value", func(tr *Trial) { tr.Traits[2].Values[0] = math.Inf(1) },
			"Traits[2].Values[0]", "Plant height value is infinite"},
		{"fractional count", func(tr *Trial) {
			tr.Traits[2].Kind, tr.Traits[2].Min, tr.Traits[2].Max = Count, nil, nil
			tr.Traits[2].Values[1] = 2.5
		}, "Traits[2].Values[1]", "is a count, so 2.5 is not possible"},
		{"derived unknown source", func(tr *Trial) { tr.Traits[3].Derived.WeightTrait = "weight" },
			"Traits[3].Derived.WeightTrait", `computed from plot weight trait "weight", which is not in the trial`},
		{"derived from derived", func(tr *Trial) { tr.Traits[3].Derived.MoistureTrait = "yld" },
			"Traits[3].Derived.MoistureTrait", "which is itself computed"},
		{"standard moisture", func(tr *Trial) { tr.Traits[3].Derived.StandardMoisture = 100 },
			"Traits[3].Derived.StandardMoisture", "standard moisture of 100 %; it must be at least 0 and below 100"},
		{"derived with values", func(tr *Trial) { tr.Traits[3].Values = make([]float64, 12) },
			"Traits[3].Values", "is computed, so it cannot hold recorded values"},
		{"bad output unit", func(tr *Trial) { tr.Traits[3].Derived.OutputUnit = "kg/ha" },
			"Traits[3].Derived.OutputUnit", `output unit "kg/ha"; use t/ha or bu/ac`},
		{"bu/ac without bushel weight", func(tr *Trial) {
			tr.Crop = "sorghum"
			tr.Traits[3].Derived.OutputUnit = UnitBuAc
		}, "Traits[3].Derived.BushelWeightLb", `needs a bushel weight (crop "sorghum" has no default)`},
		{"impossible moisture", func(tr *Trial) {
			tr.Traits[1].Max = nil
			tr.Traits[1].Kind = Continuous
			tr.Traits[1].Values[4] = 104
		}, "Traits[3].Derived", "a grain moisture of 104 % is not possible"},
		{"duplicate plot number", func(tr *Trial) { tr.Plots[5].Number = tr.Plots[4].Number },
			"Plots[5].Number", "is used twice"},
		{"unknown plot treatment", func(tr *Trial) { tr.Plots[2].Treatment = "MZ-999" },
			"Plots[2].Treatment", `has treatment "MZ-999", which is not in the treatment list`},
		{"same field position", func(tr *Trial) { tr.Plots[1].Row, tr.Plots[1].Column = tr.Plots[0].Row, tr.Plots[0].Column },
			"Plots[1].Row", "are both at field row"},
		{"block broken", func(tr *Trial) { tr.Plots[0].Treatment = tr.Plots[1].Treatment },
			"Plots", "times; in a randomised complete block design every treatment appears once in each block"},
		{"plots missing", func(tr *Trial) {
			tr.Plots = tr.Plots[:11]
			for j := range tr.Traits {
				if tr.Traits[j].Values != nil {
					tr.Traits[j].Values = tr.Traits[j].Values[:11]
				}
			}
		}, "Plots", "the trial has 11 plots but a randomised complete block design of 4 treatments and 3 replicates needs 12"},
		{"exclusion of unknown trait", func(tr *Trial) { tr.Plots[0].Exclusions = []Exclusion{{Trait: "lodge"}} },
			"Plots[0].Exclusions", `left out of trait "lodge", which is not in the trial`},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			tr := sampleTrial(t)
			c.edit(tr)
			wantProblem(t, tr.Validate(), c.field, c.substr)
		})
	}
}

func TestCRDPlotCounts(t *testing.T) {
	t.Parallel()
	tr, err := New(NewOptions{Treatments: lettered(3), Design: Design{Kind: CRD, Reps: 2}, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	for i := range tr.Plots {
		if tr.Plots[i].Treatment == "C" {
			tr.Plots[i].Treatment = "A"
			break
		}
	}
	wantProblem(t, tr.Validate(), "Plots", `treatment "A" is on 3 plots; with 2 replicates it needs exactly 2`)
}

func TestLatinPlotCounts(t *testing.T) {
	t.Parallel()
	tr, err := New(NewOptions{Treatments: lettered(3), Design: Design{Kind: Latin}, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if tr.Design.Reps != 3 {
		t.Errorf("Latin square Reps 0 became %d, want 3", tr.Design.Reps)
	}
	tr.Plots[0].Treatment, tr.Plots[3].Treatment = tr.Plots[3].Treatment, tr.Plots[0].Treatment
	if tr.Plots[0].Treatment == tr.Plots[3].Treatment {
		t.Fatal("swap did nothing")
	}
	wantProblem(t, tr.Validate(), "Plots", "in a Latin square every treatment appears once in each field ")
}

func TestValidationErrorsForm(t *testing.T) {
	t.Parallel()
	err := ValidateDesign(nil, Design{Kind: RCBD, Reps: 0})
	var ve ValidationErrors
	if !errors.As(err, &ve) || len(ve) != 2 {
		t.Fatalf("got %v", err)
	}
	if !strings.HasPrefix(err.Error(), "2 problems found:\n- a trial needs at least 2 treatments") {
		t.Errorf("message %q", err.Error())
	}
	var one *ValidationError
	if !errors.As(err, &one) || one.Field != "Treatments" {
		t.Errorf("errors.As to *ValidationError gave %+v", one)
	}
	if err := ValidateDesign(lettered(3), Design{Kind: RCBD, Reps: 2}); err != nil {
		t.Errorf("valid design: %v", err)
	}
	if err := CheckCode("T01"); err != nil {
		t.Error(err)
	}
	if err := CheckCode("T 01"); err == nil {
		t.Error(`CheckCode("T 01") = nil`)
	}
	if err := CheckTraitKey("yield_t-ha"); err != nil {
		t.Error(err)
	}
	if err := CheckTraitKey("höhe"); err == nil {
		t.Error(`CheckTraitKey("höhe") = nil`)
	}
}

func TestValidateCapsPlotProblems(t *testing.T) {
	t.Parallel()
	tr := sampleTrial(t)
	for i := range tr.Plots {
		tr.Plots[i].Treatment = "ZZZ"
	}
	var ve ValidationErrors
	if !errors.As(tr.Validate(), &ve) {
		t.Fatal("no ValidationErrors")
	}
	if len(ve) != maxValueProblems+1 || !strings.Contains(ve[len(ve)-1].Msg, "and 2 more problems with the plots") {
		t.Errorf("got %d problems, last %q", len(ve), ve[len(ve)-1].Msg)
	}
}
