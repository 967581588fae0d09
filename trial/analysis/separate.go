package analysis

import (
	"math"

	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
)

// separate compares all pairs of least-squares means and letters them by
// both LSD (protected by the treatment F test) and Tukey's HSD. It returns
// the t quantile used (1 − Alpha/2 with the error df).
func separate(r *Result, a *stats.ANOVA, lsm []float64, o Options) (float64, error) {
	cmp, err := meansep.Compare(lsm, a, a.DFError, o.Alpha)
	if err != nil {
		return 0, err
	}
	if cmp.EqualSE {
		r.LSD, r.HSD = cmp.LSD, cmp.HSD
	}
	lo := meansep.LetterOptions{LowerIsBetter: !r.HigherBetter}
	// Tukey's letters are built on a second goroutine while the pairs are
	// copied and the LSD letters built (independent work on cmp, which
	// both only read).
	var tk, lsdL meansep.Lettering
	var tkErr, lsdErr error
	var wk trial.Workers
	wk.Go(func() { tk, tkErr = cmp.TukeyLetters(lo) })
	// The LSD letters need only the comparisons and the F test: they are
	// built beside the copy of the pairs too (for 1,000 entries the three
	// take about the same time, and the copy of 499,500 pairs is not
	// shorter than either lettering).
	trtLine, _ := a.Treatment()
	wk.Go(func() { lsdL, lsdErr = cmp.LSDLetters(trtLine.P, o.Unprotected, lo) })
	defer wk.Wait()
	r.Pairs = make([]Pair, len(cmp.Pairs))
	var lsd, hsd Range
	for n, p := range cmp.Pairs {
		pr := Pair{
			A: r.Means[p.I].Treatment, B: r.Means[p.J].Treatment,
			Diff: p.Diff, SE: p.SE, Lower: p.Lower, Upper: p.Upper,
			PLSD: p.PLSD, PTukey: p.PTukey,
			// The least significant difference of one pair: t·SED for the
			// LSD, q·SED/√2 for Tukey–Kramer (Kramer 1956, Biometrics 12).
			LSD: cmp.TCrit * p.SE, HSD: cmp.QCrit * p.SE / math.Sqrt2,
		}
		r.Pairs[n] = pr
		if n == 0 {
			lsd, hsd = Range{pr.LSD, pr.LSD}, Range{pr.HSD, pr.HSD}
			continue
		}
		lsd = Range{math.Min(lsd.Min, pr.LSD), math.Max(lsd.Max, pr.LSD)}
		hsd = Range{math.Min(hsd.Min, pr.HSD), math.Max(hsd.Max, pr.HSD)}
	}
	if len(r.Pairs) > 0 && finite(lsd.Min) && finite(lsd.Max) && finite(hsd.Min) && finite(hsd.Max) {
		r.LSDRange, r.HSDRange = &lsd, &hsd
	}
	wk.Wait()
	if lsdErr != nil {
		return 0, lsdErr
	}
	if tkErr != nil {
		return 0, tkErr
	}
	r.LSDLettersGiven = !lsdL.Withheld
	if lsdL.Withheld && lsdL.Note != "" {
		r.Notes = append(r.Notes, lsdL.Note)
	}
	for i := range r.Means {
		if !lsdL.Withheld {
			r.Means[i].LettersLSD = lsdL.Letters[i]
		}
		r.Means[i].LettersTukey = tk.Letters[i]
	}
	return cmp.TCrit, nil
}
