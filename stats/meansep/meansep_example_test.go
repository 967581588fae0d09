package meansep_test

import (
	"fmt"

	"furlong/stats/meansep"
)

// All pairwise comparisons of the three means of R's PlantGrowth data
// (Dobson 1983, Table 7.1: ctrl, trt1, trt2; 10 plants each, MSE 0.3886 on
// 27 df, so every pair has SE √(2·0.3886/10) = 0.27878). R 4.2.2 (emmeans)
// gives Tukey p-values 0.391, 0.198 and 0.012, LSD 0.572 and HSD 0.691.
func ExampleCompare() {
	means := []float64{5.032, 4.661, 5.526}
	se := meansep.PairSEFunc(func(i, j int) float64 { return 0.278781608405549 })
	r, err := meansep.Compare(means, se, 27, 0.05)
	if err != nil {
		fmt.Println(err)
		return
	}
	names := []string{"ctrl", "trt1", "trt2"}
	for _, p := range r.Pairs {
		fmt.Printf("%s − %s: %+.3f  p(LSD) %.4f  p(Tukey) %.4f\n", names[p.I], names[p.J], p.Diff, p.PLSD, p.PTukey)
	}
	fmt.Printf("LSD %.3f, HSD %.3f\n", *r.LSD, *r.HSD)
	tk, err := r.TukeyLetters(meansep.LetterOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(tk.Letters)
	// Output:
	// ctrl − trt1: +0.371  p(LSD) 0.1944  p(Tukey) 0.3909
	// ctrl − trt2: -0.494  p(LSD) 0.0877  p(Tukey) 0.1980
	// trt1 − trt2: -0.865  p(LSD) 0.0045  p(Tukey) 0.0120
	// LSD 0.572, HSD 0.691
	// [ab b a]
}

// Letters from any significance rule: two treatments share a letter exactly
// when their difference is not significant. Here only the first and the
// last of three means differ (letters as in the PlantGrowth Tukey test).
func ExampleLetters() {
	means := []float64{4.661, 5.032, 5.526}
	sig := func(i, j int) bool { return i == 0 && j == 2 }
	l, err := meansep.Letters(means, sig, meansep.LetterOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(l)
	// Output:
	// [b ab a]
}
