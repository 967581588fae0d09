package glm_test

import (
	"fmt"
	"math"

	"furlong/stats/glm"
)

// A nitrogen-rate × cover-crop split plot on an invented farm: cover crop
// on main plots, nitrogen rate on subplots, three blocks, one subplot
// lost. The missing plot makes it a REML fit.
func Example() {
	yield := []float64{
		// block I: cover none (N 0, 60, 120), then rye
		4.1, 5.0, 5.6, 4.6, 5.5, 6.0,
		// block II
		3.8, 4.9, 5.2, 4.4, 5.6, math.NaN(),
		// block III
		4.3, 5.3, 5.9, 4.9, 5.8, 6.4,
	}
	cover := glm.Factor{Name: "cover", Levels: []string{"none", "rye"}}
	nrate := glm.Factor{Name: "N", Levels: []string{"0", "60", "120"}}
	block := glm.Factor{Name: "block", Levels: []string{"I", "II", "III"}}
	for b := range 3 {
		for c := range 2 {
			for n := range 3 {
				cover.Index = append(cover.Index, c)
				nrate.Index = append(nrate.Index, n)
				block.Index = append(block.Index, b)
			}
		}
	}
	r, err := glm.Fit(glm.Model{
		Response:  yield,
		Factors:   []glm.Factor{cover, nrate},
		Block:     &block,
		Structure: glm.SplitPlot,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(r.Method, "with", r.Missing, "plot missing")
	for _, l := range r.Lines {
		fmt.Printf("%-8s F = %6.2f on %d and %.1f df, p = %.4f\n", l.Source, l.F, l.DF, l.DFDen, l.P)
	}
	n, _ := r.Effect("N")
	for i, m := range n.Means {
		fmt.Printf("N %-3s %.2f ± %.2f  %s\n", nrate.Levels[m.Levels[0]], m.Mean, m.SE, n.Comparison.LettersTukey[i])
	}
	// Output:
	// REML with 1 plot missing
	// cover    F =  73.46 on 1 and 1.7 df, p = 0.0206
	// N        F = 326.74 on 2 and 6.9 df, p = 0.0000
	// cover:N  F =   0.02 on 2 and 6.9 df, p = 0.9774
	// N 0   4.35 ± 0.05  c
	// N 60  5.35 ± 0.05  b
	// N 120 5.84 ± 0.05  a
}
