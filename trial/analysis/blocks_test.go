package analysis

import (
	"errors"
	"strings"
	"testing"

	"furlong/trial"
)

// Block numbers are labels (common practice: a block is a level of a
// factor, whatever it is called). Blocks numbered 1, 2, 3, 9, 10, 11 give
// exactly the analysis of blocks 1 to 6, which the barley tests check
// against R.
func TestBlockNumbersAreLabels(t *testing.T) {
	t.Parallel()
	ref, err := Analyze(barleyTrial(t), "yield", Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, renumber := range []map[int]int{
		{1: 1, 2: 2, 3: 3, 4: 9, 5: 10, 6: 11},
		{1: 0, 2: -1, 3: 3, 4: 4, 5: 5, 6: 6}, // in memory a block 0 or below must not panic
	} {
		tr := barleyTrial(t)
		for i := range tr.Plots {
			tr.Plots[i].Block = renumber[tr.Plots[i].Block]
		}
		r, err := Analyze(tr, "yield", Options{})
		if err != nil {
			t.Fatal(err)
		}
		rs, _ := r.ANOVA.Error()
		fs, _ := ref.ANOVA.Error()
		if rs.DF != fs.DF || r.ANOVA.MSE != ref.ANOVA.MSE || len(r.ANOVA.Sources) != len(ref.ANOVA.Sources) {
			t.Errorf("renumbered blocks %v: error DF %d MSE %v, want %d %v", renumber, rs.DF, r.ANOVA.MSE, fs.DF, ref.ANOVA.MSE)
		}
	}
	// A block without values is named by its own number.
	tr := barleyTrial(t)
	for i := range tr.Plots {
		tr.Plots[i].Block = map[int]int{1: 1, 2: 2, 3: 3, 4: 9, 5: 10, 6: 11}[tr.Plots[i].Block]
		if tr.Plots[i].Block == 9 {
			tr.Traits[0].Values[i] = trial.Missing
		}
	}
	_, err = Analyze(tr, "yield", Options{})
	if err == nil || !strings.Contains(err.Error(), "block 9 has no values") {
		t.Errorf("empty block 9: %v", err)
	}
}

func TestUnknownDesignIsRefused(t *testing.T) {
	t.Parallel()
	tr := barleyTrial(t)
	tr.Design.Kind = "alpha-lattice"
	_, err := Analyze(tr, "yield", Options{})
	if !errors.Is(err, ErrUnknownDesign) || !strings.Contains(err.Error(), `"alpha-lattice"`) {
		t.Errorf("unknown design: %v", err)
	}
}
