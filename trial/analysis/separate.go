package analysis

import (
	"furlong/stats"
	"furlong/stats/meansep"
)

// separate compares all pairs of least-squares means and letters them by
// both LSD (protected by the treatment F test) and Tukey's HSD.
func separate(r *Result, a *stats.ANOVA, lsm []float64, o Options) error {
	cmp, err := meansep.Compare(lsm, a, a.DFError, o.Alpha)
	if err != nil {
		return err
	}
	if cmp.EqualSE {
		r.LSD, r.HSD = cmp.LSD, cmp.HSD
	}
	r.Pairs = make([]Pair, len(cmp.Pairs))
	for n, p := range cmp.Pairs {
		r.Pairs[n] = Pair{
			A: r.Means[p.I].Treatment, B: r.Means[p.J].Treatment,
			Diff: p.Diff, SE: p.SE, Lower: p.Lower, Upper: p.Upper,
			PLSD: p.PLSD, PTukey: p.PTukey,
		}
	}
	lo := meansep.LetterOptions{LowerIsBetter: !r.HigherBetter}
	trtLine, _ := a.Treatment()
	fp := trtLine.P
	lsd, err := cmp.LSDLetters(fp, o.Unprotected, lo)
	if err != nil {
		return err
	}
	tk, err := cmp.TukeyLetters(lo)
	if err != nil {
		return err
	}
	r.LSDLettersGiven = !lsd.Withheld
	if lsd.Withheld && lsd.Note != "" {
		r.Warnings = append(r.Warnings, lsd.Note)
	}
	for i := range r.Means {
		if !lsd.Withheld {
			r.Means[i].LettersLSD = lsd.Letters[i]
		}
		r.Means[i].LettersTukey = tk.Letters[i]
	}
	return nil
}
