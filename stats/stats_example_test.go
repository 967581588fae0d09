package stats_test

import (
	"fmt"

	"furlong/stats"
)

// plantGrowth is R's datasets::PlantGrowth: dried weight of plants under a
// control and two treatments, 10 plants each (Dobson 1983, An Introduction
// to Statistical Modelling, Table 7.1).
var plantGrowth = struct {
	groups  []string
	weights [][]float64
}{
	groups: []string{"ctrl", "trt1", "trt2"},
	weights: [][]float64{
		{4.17, 5.58, 5.18, 6.11, 4.50, 4.61, 5.17, 4.53, 5.33, 5.14},
		{4.81, 4.17, 4.41, 3.59, 5.87, 3.83, 6.03, 4.89, 4.32, 4.69},
		{6.31, 5.12, 5.54, 5.50, 5.37, 5.29, 4.92, 6.15, 5.80, 5.26},
	},
}

// plantGrowthModel is the one-way model of plantGrowth.
func plantGrowthModel() stats.Model {
	m := stats.Model{Treatment: stats.Factor{Name: "treatment", Levels: len(plantGrowth.groups)}}
	for g, ws := range plantGrowth.weights {
		for _, w := range ws {
			m.Response = append(m.Response, w)
			m.Treatment.Index = append(m.Treatment.Index, g)
		}
	}
	return m
}

// A one-way analysis of variance of R's PlantGrowth data. R 4.2.2 gives the
// same table (anova(lm(weight ~ group, PlantGrowth))): F = 4.846 on 2 and 27
// df, p = 0.0159.
func ExampleFit() {
	a, err := stats.Fit(plantGrowthModel())
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range a.Sources {
		if s.HasTest {
			fmt.Printf("%-9s df %2d  SS %.5f  MS %.5f  F %.3f  p %s\n", s.Name, s.DF, s.SS, s.MS, s.F, stats.FormatP(s.P))
		} else {
			fmt.Printf("%-9s df %2d  SS %.5f\n", s.Name, s.DF, s.SS)
		}
	}
	fmt.Printf("grand mean %.3f, CV %.1f%%, SE of a mean %.4f\n", a.GrandMean, a.CVPercent, *a.SEMean)
	for i, m := range a.Means {
		fmt.Printf("%s %.3f\n", plantGrowth.groups[i], m.Mean)
	}
	// Output:
	// treatment df  2  SS 3.76634  MS 1.88317  F 4.846  p 0.016
	// error     df 27  SS 10.49209
	// total     df 29  SS 14.25843
	// grand mean 5.073, CV 12.3%, SE of a mean 0.1971
	// ctrl 5.032
	// trt1 4.661
	// trt2 5.526
}

// Lines of the table are found by their role, whatever the factor is called.
func ExampleANOVA_Treatment() {
	a, err := stats.Fit(plantGrowthModel())
	if err != nil {
		fmt.Println(err)
		return
	}
	trt, _ := a.Treatment()
	e, _ := a.Error()
	fmt.Printf("%v: F %.3f on %d and %d df\n", trt.Role, trt.F, trt.DF, e.DF)
	// Output:
	// treatment: F 4.846 on 2 and 27 df
}

// p-values are written with three decimals, and as "<0.001" below a
// thousandth (common practice in trial reports).
func ExampleFormatP() {
	for _, p := range []float64{0.0159099583256229, 0.0004, 0.5} {
		fmt.Println(stats.FormatP(p))
	}
	// Output:
	// 0.016
	// <0.001
	// 0.500
}

// The square root of counts with zeros adds 0.5 first (Gomez & Gomez 1984,
// chapter 7); the offset goes back when the means are back-transformed.
// The counts are the first six of spray C in R's InsectSprays (Beall 1942,
// Biometrika 32, 243–262).
func ExampleApplyTransform() {
	counts := []float64{0, 1, 7, 2, 3, 1}
	ty, offset, err := stats.ApplyTransform(stats.Sqrt, counts)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("offset %.1f, first %.4f, back %.1f\n", offset, ty[0], stats.BackTransform(stats.Sqrt, ty[2], offset))
	// Output:
	// offset 0.5, first 0.7071, back 7.0
}
