package glm

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// TestInputErrors checks that problems a user can cause come back as
// plain-language errors of the right kind, never a panic (common
// practice).
func TestInputErrors(t *testing.T) {
	t.Parallel()
	base := func() Model { return simulated(3, []int{2, 3}, 3, SplitPlot, 0) }
	cases := []struct {
		name string
		edit func(m *Model)
		kind ErrorKind
	}{
		{"no factors", func(m *Model) { m.Factors = nil }, BadModel},
		{"strip plot with three factors", func(m *Model) {
			m.Structure = StripPlot
			m.Factors = append(m.Factors, Factor{Name: "C", Levels: []string{"x", "y"}, Index: make([]int, len(m.Response))})
		}, BadModel},
		{"split plot without blocks", func(m *Model) { m.Block = nil }, BadModel},
		{"duplicate names", func(m *Model) { m.Factors[1].Name = "A" }, BadModel},
		{"level out of range", func(m *Model) { m.Factors[0].Index[4] = 7 }, BadModel},
		{"short index", func(m *Model) { m.Factors[1].Index = m.Factors[1].Index[:3] }, BadModel},
		{"all missing", func(m *Model) {
			for i := range m.Response {
				m.Response[i] = math.NaN()
			}
		}, NoData},
		{"empty level", func(m *Model) {
			for i := range m.Response {
				if m.Factors[1].Index[i] == 2 {
					m.Response[i] = math.NaN()
				}
			}
		}, EmptyLevel},
		{"repeated plot", func(m *Model) { m.Factors[1].Index[1] = m.Factors[1].Index[0] }, BadModel},
		{"bad alpha", func(m *Model) { m.Alpha = 5 }, BadModel},
		{"infinite value", func(m *Model) { m.Response[2] = math.Inf(1) }, BadModel},
		{"interaction without main effect", func(m *Model) {
			m.Structure = Factorial
			m.Terms = [][]int{{0}, {0, 1}}
		}, BadModel},
		{"constant response", func(m *Model) {
			m.Structure = Factorial
			for i := range m.Response {
				m.Response[i] = 7
			}
		}, ZeroError},
		{"mask length", func(m *Model) { m.Missing = []bool{true} }, BadModel},
	}
	for _, tc := range cases {
		m := base()
		tc.edit(&m)
		_, err := Fit(m)
		var ge *Error
		if !errors.As(err, &ge) || ge.Kind != tc.kind {
			t.Errorf("%s: error %v, want kind %d", tc.name, err, tc.kind)
			continue
		}
		if msg := ge.Error(); msg == "" || strings.Contains(msg, "NaN") {
			t.Errorf("%s: message %q", tc.name, msg)
		}
	}
}

// TestNoNaN checks that no number in a result is NaN or infinite, for
// complete and incomplete data of every structure (project rule: a value
// that does not apply is absent).
func TestNoNaN(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		s       Structure
		sizes   []int
		missing int
	}{
		{Factorial, []int{3, 2, 2}, 3},
		{SplitPlot, []int{3, 4}, 2},
		{SplitPlot, []int{2, 3, 2}, 2},
		{StripPlot, []int{3, 4}, 3},
		{StripPlot, []int{3, 4}, 0},
	} {
		m := simulated(9, tc.sizes, 4, tc.s, tc.missing)
		m.AllSlices = true
		r, err := Fit(m)
		if err != nil {
			t.Fatalf("%v: %v", tc.s, err)
		}
		bad := func(what string, v float64) {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Errorf("%v %d missing: %s = %v", tc.s, tc.missing, what, v)
			}
		}
		for _, l := range r.Lines {
			bad(l.Source+" SS", l.SS)
			bad(l.Source+" F", l.F)
			bad(l.Source+" P", l.P)
			bad(l.Source+" DFDen", l.DFDen)
		}
		for _, e := range r.Effects {
			for _, mn := range e.Means {
				bad(e.Name+" mean", mn.Mean)
				bad(e.Name+" SE", mn.SE)
				bad(e.Name+" DF", mn.DF)
			}
			for _, p := range e.Comparison.Pairs {
				bad(e.Name+" pair", p.SE+p.DF+p.PLSD+p.PTukey+p.T)
			}
		}
		for _, s := range r.Slices {
			bad(s.Name+" F", s.F+s.P+s.DFDen)
		}
		for _, s := range r.SEDs {
			bad(s.Key, s.SED+s.DF+s.Min+s.Max)
		}
		for i := range r.Residuals {
			bad("residual", r.Residuals[i]+r.Fitted[i])
		}
		if (tc.s != Factorial) != (len(r.UnitResiduals) > 0) {
			t.Errorf("%v: %d unit residual sets", tc.s, len(r.UnitResiduals))
		}
		for _, u := range r.UnitResiduals {
			for _, v := range u.Values {
				bad(u.Stratum+" unit residual", v)
			}
		}
		if len(r.Residuals) != r.N || r.N != len(m.Response)-tc.missing {
			t.Errorf("%v: %d residuals for %d plots", tc.s, len(r.Residuals), r.N)
		}
	}
}

// TestEmptyCombination: with every plot of one combination missing, the
// interaction loses a degree of freedom and exactly the marginal means
// that need that cell are not estimable (under the cell-means model a
// marginal mean is estimable when all its cells have data; Searle 1987,
// Linear Models for Unbalanced Data, ch. 4, from memory).
func TestEmptyCombination(t *testing.T) {
	t.Parallel()
	m := randomFactorial(8, []int{2, 3}, 0, 3, 0)
	for i := range m.Response {
		if m.Factors[0].Index[i] == 1 && m.Factors[1].Index[i] == 2 {
			m.Response[i] = math.NaN()
		}
	}
	r, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	if l, _ := r.Line("A:B"); l.DF != 1 {
		t.Errorf("A:B df %d, want 1", l.DF)
	}
	if l, _ := r.Line("error"); l.DF != 15-5 {
		t.Errorf("error df %d, want 10", l.DF)
	}
	a, _ := r.Effect("A")
	b, _ := r.Effect("B")
	ab, _ := r.Effect("A:B")
	want := map[*Effect][]bool{a: {true, false}, b: {true, true, false}, ab: {true, true, true, true, true, false}}
	for e, w := range want {
		for i, mn := range e.Means {
			if mn.Estimable != w[i] {
				t.Errorf("%s %v estimable %v, want %v", e.Name, mn.Levels, mn.Estimable, w[i])
			}
		}
		if e.Comparison != nil {
			t.Errorf("%s has comparisons with a missing mean", e.Name)
		}
	}
}
