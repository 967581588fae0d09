package trialfile_test

import (
	"bytes"
	"fmt"
	"time"

	"furlong/trial"
	"furlong/trial/trialfile"
)

// A completely randomised trial with R's PlantGrowth data as its one trait
// (dried plant weight of a control and two treatments, 10 plants each;
// Dobson 1983, An Introduction to Statistical Modelling, Table 7.1),
// written to a .furlong document and read back: the values come back plot
// by plot, so the treatment means are the data's (5.032, 4.661, 5.526).
func Example() {
	weights := map[string][]float64{
		"ctrl": {4.17, 5.58, 5.18, 6.11, 4.50, 4.61, 5.17, 4.53, 5.33, 5.14},
		"trt1": {4.81, 4.17, 4.41, 3.59, 5.87, 3.83, 6.03, 4.89, 4.32, 4.69},
		"trt2": {6.31, 5.12, 5.54, 5.50, 5.37, 5.29, 4.92, 6.15, 5.80, 5.26},
	}
	t, err := trial.New(trial.NewOptions{
		Title: "PlantGrowth", Crop: "plants", Season: "1983",
		Treatments: []trial.Treatment{{Code: "ctrl", Role: trial.RoleCheck}, {Code: "trt1"}, {Code: "trt2"}},
		Design:     trial.Design{Kind: trial.CRD, Reps: 10},
		Traits:     []trial.Trait{{Key: "weight", Name: "Dried weight", Unit: "g", Kind: trial.Continuous, Decimals: 2}},
		Seed:       1983,
		Now:        time.Date(2026, 4, 1, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	next := map[string]int{}
	for i, p := range t.Plots {
		v := weights[p.Treatment][next[p.Treatment]]
		next[p.Treatment]++
		if err := t.SetValue(i, "weight", v); err != nil {
			fmt.Println(err)
			return
		}
	}

	var buf bytes.Buffer
	if err := trialfile.Encode(&buf, t); err != nil {
		fmt.Println(err)
		return
	}
	back, err := trialfile.Decode(&buf)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(back.Title, back.Design.Describe(), len(back.Plots), "plots")
	sum, n := map[string]float64{}, map[string]int{}
	for i, p := range back.Plots {
		sum[p.Treatment] += back.Traits[0].Values[i]
		n[p.Treatment]++
	}
	for _, code := range []string{"ctrl", "trt1", "trt2"} {
		fmt.Printf("%s %.3f\n", code, sum[code]/float64(n[code]))
	}
	// Output:
	// PlantGrowth completely randomised design, 10 replicates 30 plots
	// ctrl 5.032
	// trt1 4.661
	// trt2 5.526
}
