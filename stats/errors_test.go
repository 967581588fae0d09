package stats

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"
)

// rcbd builds an RCBD model with t treatments in r blocks from y(trt, blk),
// leaving out the plots in missing ("trt,blk").
func rcbd(t, r int, y func(i, b int) float64, missing ...string) Model {
	skip := map[string]bool{}
	for _, s := range missing {
		skip[s] = true
	}
	m := Model{Treatment: Factor{Name: "treatment", Levels: t}, Nuisance: []Factor{{Name: "block", Levels: r}}}
	for b := 0; b < r; b++ {
		for i := 0; i < t; i++ {
			if skip[fmt.Sprint(i, ",", b)] {
				continue
			}
			m.Response = append(m.Response, y(i, b))
			m.Treatment.Index = append(m.Treatment.Index, i)
			m.Nuisance[0].Index = append(m.Nuisance[0].Index, b)
		}
	}
	return m
}

// latin builds a cyclic s × s Latin square (treatment (r+c) mod s) without
// the plots in missing ("row,col").
func latin(s int, y func(r, c int) float64, missing ...string) Model {
	skip := map[string]bool{}
	for _, x := range missing {
		skip[x] = true
	}
	m := Model{Treatment: Factor{Name: "treatment", Levels: s},
		Nuisance: []Factor{{Name: "row", Levels: s}, {Name: "column", Levels: s}}}
	for r := 0; r < s; r++ {
		for c := 0; c < s; c++ {
			if skip[fmt.Sprint(r, ",", c)] {
				continue
			}
			m.Response = append(m.Response, y(r, c))
			m.Treatment.Index = append(m.Treatment.Index, (r+c)%s)
			m.Nuisance[0].Index = append(m.Nuisance[0].Index, r)
			m.Nuisance[1].Index = append(m.Nuisance[1].Index, c)
		}
	}
	return m
}

// noisy is a deterministic, irregular response (no exact fit).
func noisy(i, b int) float64 { return 10 + float64(i) + 0.5*float64(b) + math.Sin(float64(7*i+13*b+1)) }

func oneWay(levels int, idx []int, y []float64) Model {
	return Model{Response: y, Treatment: Factor{Name: "treatment", Levels: levels, Index: idx}}
}

// TestDegenerateInputs: every input a trial manager can get wrong gives the
// right typed error, with a plain message, and never a panic (common
// practice: the ANOVA needs at least two treatments, an estimate of error,
// and every factor level represented).
func TestDegenerateInputs(t *testing.T) {
	t.Parallel()
	emptyRow := latin(4, func(r, c int) float64 { return noisy(r, c) }, "2,0", "2,1", "2,2", "2,3")
	emptyBlock := rcbd(4, 3, noisy, "0,1", "1,1", "2,1", "3,1")
	// Treatments 0 and 1 only in block 0, 2 and 3 only in block 1, each
	// twice: blocks and treatments cannot be separated.
	confounded := Model{
		Response:  []float64{1, 2, 3, 5, 4, 7, 6, 9},
		Treatment: Factor{Name: "treatment", Levels: 4, Index: []int{0, 0, 1, 1, 2, 2, 3, 3}},
		Nuisance:  []Factor{{Name: "block", Levels: 2, Index: []int{0, 0, 0, 0, 1, 1, 1, 1}}},
	}
	additive := func(i, b int) float64 { return 3*float64(i) + 0.25*float64(b*b) }
	cases := []struct {
		name   string
		m      Model
		kind   ErrorKind
		sent   error
		factor string
		level  int
		obs    int
	}{
		{"no data", oneWay(2, nil, nil), NoData, ErrNoData, "", -1, -1},
		{"one treatment level", oneWay(1, []int{0, 0, 0}, []float64{1, 2, 3}), TooFewTreatments, ErrTooFewTreatments, "treatment", -1, -1},
		{"only one treatment has data", oneWay(3, []int{1, 1, 1}, []float64{1, 2, 3}), TooFewTreatments, ErrTooFewTreatments, "treatment", -1, -1},
		{"treatment without data", oneWay(3, []int{0, 0, 2, 2}, []float64{1, 2, 3, 5}), EmptyLevel, ErrEmptyLevel, "treatment", 1, -1},
		{"no error df", oneWay(3, []int{0, 1, 2}, []float64{1, 2, 3}), NoErrorDF, ErrNoErrorDF, "", -1, -1},
		{"RCBD without error df", rcbd(3, 2, noisy, "0,0", "1,1"), NoErrorDF, ErrNoErrorDF, "", -1, -1},
		{"all values equal", oneWay(2, []int{0, 0, 1, 1}, []float64{4, 4, 4, 4}), ZeroErrorVariance, ErrZeroErrorVariance, "", -1, -1},
		{"equal within treatments", oneWay(2, []int{0, 0, 1, 1}, []float64{4, 4, 6, 6}), ZeroErrorVariance, ErrZeroErrorVariance, "", -1, -1},
		{"exact additive RCBD", rcbd(4, 3, additive), ZeroErrorVariance, ErrZeroErrorVariance, "", -1, -1},
		{"exact additive RCBD, missing plot", rcbd(4, 3, additive, "1,2"), ZeroErrorVariance, ErrZeroErrorVariance, "", -1, -1},
		{"NaN response", oneWay(2, []int{0, 0, 1, 1}, []float64{1, math.NaN(), 3, 4}), NonFiniteValue, ErrNonFiniteValue, "", -1, 1},
		{"infinite response", oneWay(2, []int{0, 0, 1, 1}, []float64{1, 2, 3, math.Inf(-1)}), NonFiniteValue, ErrNonFiniteValue, "", -1, 3},
		{"absurdly large values", oneWay(2, []int{0, 0, 1, 1}, []float64{1e200, 2e200, 3e200, 5e200}), NonFiniteValue, ErrNonFiniteValue, "", -1, -1},
		{"single block", rcbd(3, 1, noisy), TooFewLevels, ErrTooFewLevels, "block", -1, -1},
		{"block with all plots missing", emptyBlock, EmptyLevel, ErrEmptyLevel, "block", 1, -1},
		{"Latin square row without data", emptyRow, EmptyLevel, ErrEmptyLevel, "row", 2, -1},
		{"nuisance level never used", func() Model { m := rcbd(3, 3, noisy); m.Nuisance[0].Levels = 4; return m }(), EmptyLevel, ErrEmptyLevel, "block", 3, -1},
		{"confounded blocks and treatments", confounded, Confounded, ErrConfounded, "", -1, -1},
	}
	for _, c := range cases {
		c := c
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			var a *ANOVA
			var err error
			func() {
				defer func() {
					if r := recover(); r != nil {
						t.Fatalf("panic: %v", r)
					}
				}()
				a, err = Fit(c.m)
			}()
			if err == nil {
				t.Fatalf("no error; got %+v", a.Sources)
			}
			var ie *InputError
			if !errors.As(err, &ie) {
				t.Fatalf("error %T %v is not an *InputError", err, err)
			}
			if ie.Kind != c.kind || !errors.Is(err, c.sent) {
				t.Errorf("kind %v, want %v (%v)", ie.Kind, c.kind, err)
			}
			if ie.Factor != c.factor && c.factor != "" {
				t.Errorf("factor %q, want %q", ie.Factor, c.factor)
			}
			if ie.Level != c.level || ie.Obs != c.obs {
				t.Errorf("level %d obs %d, want %d %d", ie.Level, ie.Obs, c.level, c.obs)
			}
			msg := err.Error()
			if msg == "" || strings.HasPrefix(msg, "stats") || strings.Contains(msg, "NaN") {
				t.Errorf("message %q is not a plain sentence", msg)
			}
		})
	}
	// Different kinds are told apart by errors.Is.
	if errors.Is(&InputError{Kind: NoErrorDF}, ErrEmptyLevel) {
		t.Error("errors.Is matched different kinds")
	}
}

// TestProgrammingErrorsPanic: mismatched lengths and out-of-range levels
// are bugs in the caller and panic with a "stats:" message.
func TestProgrammingErrorsPanic(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name string
		m    Model
	}{
		{"treatment index length", oneWay(2, []int{0, 1}, []float64{1, 2, 3})},
		{"treatment level out of range", oneWay(2, []int{0, 1, 2}, []float64{1, 2, 3})},
		{"negative level", oneWay(2, []int{0, -1, 1}, []float64{1, 2, 3})},
		{"nuisance index length", func() Model { m := rcbd(3, 2, noisy); m.Nuisance[0].Index = m.Nuisance[0].Index[1:]; return m }()},
	} {
		func() {
			defer func() {
				r := recover()
				if s, ok := r.(string); !ok || !strings.HasPrefix(s, "stats: ") {
					t.Errorf("%s: recovered %v, want a stats: panic", c.name, r)
				}
			}()
			Fit(c.m)
		}()
	}
	a, err := Fit(rcbd(3, 3, noisy))
	if err != nil {
		t.Fatal(err)
	}
	func() {
		defer func() {
			if recover() == nil {
				t.Error("PairSE out of range did not panic")
			}
		}()
		a.PairSE(0, 3)
	}()
	if a.PairSE(1, 1) != 0 {
		t.Error("PairSE(i, i) ≠ 0")
	}
}
