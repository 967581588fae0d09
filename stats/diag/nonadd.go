package diag

import (
	"math"

	"gonum.org/v1/gonum/mathext"
)

// NonAdditivity is the outcome of Tukey's one degree of freedom test for
// non-additivity in a two-way table with one plot per cell.
type NonAdditivity struct {
	SS        float64 // sum of squares for non-additivity (1 df)
	Remainder float64 // remaining error sum of squares
	F         float64 // SS / (Remainder / DF2)
	DF1       int     // always 1
	DF2       int     // (t−1)(b−1) − 1
	P         float64
}

// TukeyNonAdditivity tests whether block and treatment effects add, with
// Tukey's one degree of freedom for non-additivity: Tukey (1949), "One
// degree of freedom for non-additivity", Biometrics 5, 232–242. With y_ij
// the value of treatment j in block i,
//
//	SS_nonadd = [Σ_i Σ_j y_ij (ȳ_i. − ȳ..)(ȳ.j − ȳ..)]² / [Σ_i (ȳ_i. − ȳ..)² · Σ_j (ȳ.j − ȳ..)²],
//
// and F = SS_nonadd / [(SS_error − SS_nonadd) / ((t−1)(b−1) − 1)] with 1 and
// (t−1)(b−1) − 1 degrees of freedom, where SS_error is the residual sum of
// squares of the additive model. A significant result means the treatment
// differences change with the block level (often: with block fertility),
// which a transformation (such as log) may remove.
//
// values[i] is the observation on plot i, in block block[i] of blocks and
// treatment treatment[i] of treatments. Every block × treatment cell must
// hold exactly one finite value: with missing plots, or replicated cells,
// the test does not apply and a *NotApplicableError is returned.
func TukeyNonAdditivity(values []float64, block, treatment []int, blocks, treatments int) (NonAdditivity, error) {
	if len(values) != len(block) || len(values) != len(treatment) {
		panic("diag: values, block and treatment indices differ in length")
	}
	const test = "non-additivity"
	b, t := blocks, treatments
	if b < 2 || t < 2 || (b-1)*(t-1) < 2 {
		return NonAdditivity{}, notApplicable(test, "the test for non-additivity needs at least 2 blocks, 2 treatments and 3 plots beyond them (for example 2 blocks of 3 treatments)")
	}
	if err := checkFinite(test, values); err != nil {
		return NonAdditivity{}, err
	}
	// F and p are unit free: test standardised values (see standardise) and
	// give the sums of squares back in the values' unit.
	values, unit := standardise(values)
	y := make([]float64, b*t)
	seen := make([]bool, b*t)
	for i, v := range values {
		bi, tj := block[i], treatment[i]
		if bi < 0 || bi >= b || tj < 0 || tj >= t {
			panic("diag: block or treatment index out of range")
		}
		c := bi*t + tj
		if seen[c] {
			return NonAdditivity{}, notApplicable(test, "the test for non-additivity needs exactly one plot of each treatment in each block; some treatment appears twice in a block")
		}
		seen[c] = true
		y[c] = v
	}
	if len(values) != b*t {
		return NonAdditivity{}, notApplicable(test, "the test for non-additivity needs a complete table: some plots are missing")
	}

	rowMean := make([]float64, b)
	colMean := make([]float64, t)
	var grand float64
	for i := range b {
		for j := range t {
			v := y[i*t+j]
			rowMean[i] += v
			colMean[j] += v
			grand += v
		}
	}
	grand /= float64(b * t)
	var sr, sc float64
	for i := range rowMean {
		rowMean[i] = rowMean[i]/float64(t) - grand // block effect
		sr += rowMean[i] * rowMean[i]
	}
	for j := range colMean {
		colMean[j] = colMean[j]/float64(b) - grand // treatment effect
		sc += colMean[j] * colMean[j]
	}
	if sr == 0 || sc == 0 {
		return NonAdditivity{}, notApplicable(test, "the test for non-additivity needs differences between blocks and between treatments; here all block means or all treatment means are equal")
	}
	var cross, sse float64
	for i := range b {
		for j := range t {
			v := y[i*t+j]
			cross += v * rowMean[i] * colMean[j]
			r := v - grand - rowMean[i] - colMean[j]
			sse += r * r
		}
	}
	ssn := cross * cross / (sr * sc)
	rem := sse - ssn
	df2 := (b-1)*(t-1) - 1
	if rem <= 1e-13*sse || rem <= 0 {
		return NonAdditivity{}, notApplicable(test, "the block and treatment effects explain the data exactly, so there is nothing to test non-additivity against")
	}
	f := ssn / (rem / float64(df2))
	p := mathext.RegIncBeta(float64(df2)/2, 0.5, float64(df2)/(float64(df2)+f))
	u2 := unit * unit
	return NonAdditivity{SS: ssn * u2, Remainder: rem * u2, F: f, DF1: 1, DF2: df2, P: math.Min(p, 1)}, nil
}
