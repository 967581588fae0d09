package analysis

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"furlong/trial"
)

// quarterData is a random RCBD (t treatments, r blocks) or CRD whose values
// are multiples of 1/4, so that 1e15 + value is exact in float64.
func quarterData(rng *rand.Rand, design trial.DesignKind, t, r int) *Data {
	d := &Data{TraitKey: "y", Design: design, Decimals: 2, HigherBetter: true}
	eff := make([]float64, t)
	for i := range eff {
		eff[i] = 3 * rng.NormFloat64()
		d.Treatments = append(d.Treatments, fmt.Sprintf("T%d", i+1))
	}
	if design == trial.RCBD {
		d.Blocks = r
	}
	for b := range r {
		for i := range t {
			// Uneven spread between treatments, so the variance tests have
			// something to find.
			v := math.Round(4*(50+eff[i]+float64(b)+(1+float64(i%3))*rng.NormFloat64())) / 4
			d.Treatment = append(d.Treatment, i)
			d.Values = append(d.Values, v)
			d.Plot = append(d.Plot, 100*(b+1)+i+1)
			if design == trial.RCBD {
				d.Block = append(d.Block, b)
			}
		}
	}
	return d
}

// TestAnalysisScaleInvariance: the whole analysis (F tests, letters, pair
// p-values, diagnostics, standardised residuals) reads the same whatever
// the unit and origin of the data, y → a + b·y (a property of every method
// used: each is unchanged by a shift and a positive scaling), and the
// result never holds NaN (it marshals to JSON). Where float64 cannot hold
// the differences at all (1e15 + 1e-10·y) the trait is refused in words.
func TestAnalysisScaleInvariance(t *testing.T) {
	t.Parallel()
	const tol = 1e-9
	rng := rand.New(rand.NewPCG(5, 6))
	rel := func(got, want float64) bool {
		return math.Abs(got-want) <= tol*math.Max(math.Abs(want), 1e-300)
	}
	sets := 8
	if testing.Short() {
		sets = 3
	}
	for n := range sets {
		design := trial.RCBD
		if n%2 == 1 {
			design = trial.CRD
		}
		base := quarterData(rng, design, 3+rng.IntN(6), 3+rng.IntN(3))
		ref, err := AnalyzeData(base, Options{})
		if err != nil {
			t.Fatal(err)
		}
		for _, sc := range []struct{ a, b float64 }{
			{0, 1e-160}, {0, 1e-10}, {0, 1e100}, {1e15, 1e-160}, {1e15, 1e-10}, {1e15, 1e100}, {1e15, 1},
		} {
			what := fmt.Sprintf("data %d (%s), %g + %g·y", n, design, sc.a, sc.b)
			d := *base
			d.Values = make([]float64, len(base.Values))
			same := true
			for i, v := range base.Values {
				d.Values[i] = sc.a + sc.b*v
				same = same && d.Values[i] == d.Values[0]
			}
			r, err := AnalyzeData(&d, Options{})
			if same {
				if err == nil {
					t.Errorf("%s: values all equal in float64 but analysed", what)
				}
				continue
			}
			if err != nil {
				t.Errorf("%s: %v", what, err)
				continue
			}
			if _, err := json.Marshal(r); err != nil {
				t.Errorf("%s: result does not marshal: %v", what, err)
			}
			for i, s := range r.ANOVA.Sources {
				if w := ref.ANOVA.Sources[i]; s.HasTest && (!rel(s.F, w.F) || !rel(s.P, w.P)) {
					t.Errorf("%s: %s F %g p %g, want %g %g", what, s.Name, s.F, s.P, w.F, w.P)
				}
			}
			for i, m := range r.Means {
				w := ref.Means[i]
				if m.LettersLSD != w.LettersLSD || m.LettersTukey != w.LettersTukey {
					t.Errorf("%s: %s letters %q/%q, want %q/%q", what, m.Treatment, m.LettersLSD, m.LettersTukey, w.LettersLSD, w.LettersTukey)
				}
			}
			for i, p := range r.Pairs {
				w := ref.Pairs[i]
				if !rel(p.PLSD, w.PLSD) || math.Abs(p.PTukey-w.PTukey) > 1e-9 {
					t.Errorf("%s: pair %s–%s p %g/%g, want %g/%g", what, p.A, p.B, p.PLSD, p.PTukey, w.PLSD, w.PTukey)
				}
			}
			diagEqual := func(name string, got, want *float64) {
				t.Helper()
				switch {
				case (got == nil) != (want == nil):
					t.Errorf("%s: %s present %v, want %v", what, name, got != nil, want != nil)
				case got != nil && !rel(*got, *want):
					t.Errorf("%s: %s %g, want %g", what, name, *got, *want)
				}
			}
			g, w := r.Diagnostics, ref.Diagnostics
			diagEqual("Shapiro–Wilk p", g.ShapiroP, w.ShapiroP)
			diagEqual("Levene p", g.LeveneP, w.LeveneP)
			diagEqual("Bartlett p", g.BartlettP, w.BartlettP)
			diagEqual("non-additivity F", g.NonAdditivityF, w.NonAdditivityF)
			diagEqual("non-additivity p", g.NonAdditivityP, w.NonAdditivityP)
			if len(g.StandardizedResiduals) != len(w.StandardizedResiduals) {
				t.Fatalf("%s: %d standardised residuals, want %d", what, len(g.StandardizedResiduals), len(w.StandardizedResiduals))
			}
			for i := range g.StandardizedResiduals {
				if math.Abs(g.StandardizedResiduals[i]-w.StandardizedResiduals[i]) > 1e-8 {
					t.Errorf("%s: standardised residual %d = %g, want %g", what, i, g.StandardizedResiduals[i], w.StandardizedResiduals[i])
				}
			}
		}
	}
}
