package dist_test

import (
	"fmt"

	"furlong/stats/dist"
)

// The 5% critical value of the studentised range for 3 means and 27 error
// df, as Tukey's HSD needs for R's PlantGrowth data: scipy's
// studentized_range.ppf(0.95, 3, 27) gives 3.506426123354149.
func ExampleStudentizedRange_Quantile() {
	q := dist.StudentizedRange{K: 3, Nu: 27}
	fmt.Printf("%.6f\n", q.Quantile(0.95))
	// Output:
	// 3.506426
}

// The Tukey p-value of one pair of PlantGrowth means (trt1 − trt2: −0.865
// with SE 0.278781608405549): the survival function at |diff|/SE·√2.
// scipy's studentized_range.sf gives 0.012006423979493364.
func ExampleStudentizedRange_Survival() {
	q := dist.StudentizedRange{K: 3, Nu: 27}
	fmt.Printf("%.6f\n", q.Survival(0.865/0.278781608405549*1.4142135623730951))
	// Output:
	// 0.012006
}

// A survival table answers many evaluations for the same K and Nu quickly
// (a large variety trial has tens of thousands of pairs), to about 1e-9.
func ExampleNewSurvivalTable() {
	tb := dist.NewSurvivalTable(3, 27)
	fmt.Printf("%.6f\n", tb.Survival(0.865/0.278781608405549*1.4142135623730951))
	// Output:
	// 0.012006
}
