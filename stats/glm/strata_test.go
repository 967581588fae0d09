package glm

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// cellMeans averages the response over the plots sharing the levels of
// the given factors (combined list: treatment factors, then block).
func cellMeans(m Model, fs []int) map[[3]int]float64 {
	sum := map[[3]int]float64{}
	cnt := map[[3]int]float64{}
	all := append(append([]Factor(nil), m.Factors...), *m.Block)
	for i, y := range m.Response {
		var k [3]int
		for a := range k {
			k[a] = -1
		}
		for a, f := range fs {
			k[a] = all[f].Index[i]
		}
		sum[k] += y
		cnt[k]++
	}
	for k := range sum {
		sum[k] /= cnt[k]
	}
	return sum
}

func key(ls ...int) [3]int {
	k := [3]int{-1, -1, -1}
	copy(k[:], ls)
	return k
}

// TestStripPlotDefinitions checks the strata analysis of a balanced strip
// plot against the sums of squares computed from their definitions and
// the SEDs and Satterthwaite df of the strip-plot comparisons, as laid out
// in Gomez & Gomez (1984), section 3.5 (formulas from memory):
// SS(A) = rb Σ(ȳ_i − ȳ)², error (a) = b Σ(ȳ_ik − ȳ_i − ȳ_k + ȳ)²,
// SS(B) = ra Σ(ȳ_j − ȳ)², error (b) = a Σ(ȳ_jk − ȳ_j − ȳ_k + ȳ)²,
// SS(AB) = r Σ(ȳ_ij − ȳ_i − ȳ_j + ȳ)², error (c) by difference; SEDs
// √(2Ea/rb), √(2Eb/ra), two A levels at one B √(2((b−1)Ec+Ea)/rb) with df
// ((b−1)Ec+Ea)²/(((b−1)Ec)²/dfc + Ea²/dfa), and symmetrically.
func TestStripPlotDefinitions(t *testing.T) {
	t.Parallel()
	m := simulated(21, []int{4, 3}, 5, StripPlot, 0)
	r, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	a, b, rr := 4, 3, 5
	blk := 2
	gm := 0.0
	for _, y := range m.Response {
		gm += y
	}
	gm /= float64(len(m.Response))
	mA, mB, mK := cellMeans(m, []int{0}), cellMeans(m, []int{1}), cellMeans(m, []int{blk})
	mAK, mBK, mAB := cellMeans(m, []int{0, blk}), cellMeans(m, []int{1, blk}), cellMeans(m, []int{0, 1})
	var ssA, ssB, ssK, ssEa, ssEb, ssAB, sst float64
	for i := range a {
		ssA += float64(rr*b) * math.Pow(mA[key(i)]-gm, 2)
	}
	for j := range b {
		ssB += float64(rr*a) * math.Pow(mB[key(j)]-gm, 2)
	}
	for k := range rr {
		ssK += float64(a*b) * math.Pow(mK[key(k)]-gm, 2)
		for i := range a {
			ssEa += float64(b) * math.Pow(mAK[key(i, k)]-mA[key(i)]-mK[key(k)]+gm, 2)
		}
		for j := range b {
			ssEb += float64(a) * math.Pow(mBK[key(j, k)]-mB[key(j)]-mK[key(k)]+gm, 2)
		}
	}
	for i := range a {
		for j := range b {
			ssAB += float64(rr) * math.Pow(mAB[key(i, j)]-mA[key(i)]-mB[key(j)]+gm, 2)
		}
	}
	for _, y := range m.Response {
		sst += (y - gm) * (y - gm)
	}
	ssEc := sst - ssA - ssB - ssK - ssEa - ssEb - ssAB
	want := []struct {
		src string
		df  int
		ss  float64
	}{
		{"block", rr - 1, ssK}, {"A", a - 1, ssA}, {"error_a", (rr - 1) * (a - 1), ssEa},
		{"B", b - 1, ssB}, {"error_b", (rr - 1) * (b - 1), ssEb},
		{"A:B", (a - 1) * (b - 1), ssAB}, {"error_c", (rr - 1) * (a - 1) * (b - 1), ssEc}, {"total", a*b*rr - 1, sst},
	}
	for k, w := range want {
		l := r.Lines[k]
		if l.Source != w.src || l.DF != w.df || !near(l.SS, w.ss, 1e-9) {
			t.Errorf("line %d = %s %d %.10g, want %s %d %.10g", k, l.Source, l.DF, l.SS, w.src, w.df, w.ss)
		}
	}
	ea, eb, ec := ssEa/float64((rr-1)*(a-1)), ssEb/float64((rr-1)*(b-1)), ssEc/float64((rr-1)*(a-1)*(b-1))
	dfa, dfb, dfc := float64((rr-1)*(a-1)), float64((rr-1)*(b-1)), float64((rr-1)*(a-1)*(b-1))
	for _, l := range r.Lines {
		switch l.Source {
		case "A":
			checkF(t, l, ea, dfa)
		case "B":
			checkF(t, l, eb, dfb)
		case "A:B":
			checkF(t, l, ec, dfc)
		}
	}
	fb, fa := float64(b), float64(a)
	mixA := (fb-1)*ec + ea
	mixB := (fa-1)*ec + eb
	seds := []struct {
		key     string
		sed, df float64
	}{
		{"horizontal", math.Sqrt(2 * ea / (float64(rr) * fb)), dfa},
		{"vertical", math.Sqrt(2 * eb / (float64(rr) * fa)), dfb},
		{"horizontal_within_vertical", math.Sqrt(2 * mixA / (float64(rr) * fb)), mixA * mixA / ((fb-1)*(fb-1)*ec*ec/dfc + ea*ea/dfa)},
		{"vertical_within_horizontal", math.Sqrt(2 * mixB / (float64(rr) * fa)), mixB * mixB / ((fa-1)*(fa-1)*ec*ec/dfc + eb*eb/dfb)},
	}
	for _, w := range seds {
		s, ok := r.SED(w.key)
		if !ok || !near(s.SED, w.sed, 1e-9) || !near(s.Min, s.Max, 1e-9) || !near(s.DF, w.df, 1e-9) {
			t.Errorf("SED %s = %+v, want %.10g df %.10g", w.key, s, w.sed, w.df)
		}
	}
}

func checkF(t *testing.T, l Line, e, df float64) {
	t.Helper()
	if !l.HasTest || !near(l.F, l.MS/e, 1e-9) || l.DFDen != df {
		t.Errorf("%s F %.10g on %g df, want %.10g on %g", l.Source, l.F, l.DFDen, l.MS/e, df)
	}
}

// TestSplitSplitSequential checks the strata lines of a balanced
// split-split plot against sequential fits by dense QR in the classic
// order (block, A, error (a), B, A:B, error (b), C, A:C, B:C, A:B:C,
// error (c); Gomez & Gomez 1984, section 4.2), and the SEDs of two main,
// sub and sub-subplot means: √(2Ea/rbc), √(2Eb/rac), √(2Ec/rab).
func TestSplitSplitSequential(t *testing.T) {
	t.Parallel()
	m := simulated(5, []int{3, 2, 4}, 3, SplitPlot, 0)
	r, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	d := &dense{m: m, facts: append(append([]Factor(nil), m.Factors...), *m.Block)}
	for i := range m.Response {
		d.used = append(d.used, i)
	}
	order := [][]int{{3}, {0}, {0, 3}, {1}, {0, 1}, {1, 3}, {0, 1, 3}, {2}, {0, 2}, {1, 2}, {0, 1, 2}}
	names := []string{"block", "A", "error_a", "B", "A:B", "", "error_b", "C", "A:C", "B:C", "A:B:C"}
	prev := d.rss(nil)
	ms := map[string]float64{}
	carry := 0.0
	for k := range order {
		cur := d.rss(order[:k+1])
		ss := prev - cur + carry
		prev = cur
		carry = 0
		if names[k] == "" { // block:B, the first part of error (b)
			carry = ss
			continue
		}
		l, ok := r.Line(names[k])
		if !ok || !near(l.SS, ss, 1e-8) {
			t.Errorf("%s SS %.10g, want %.10g", names[k], l.SS, ss)
		}
		ms[names[k]] = l.MS
	}
	ec, _ := r.Line("error_c")
	if !near(ec.SS, prev, 1e-8) || ec.DF != 3*2*4*3-1-2-2-2-1-2-2-3-6-3-6-6 {
		t.Errorf("error_c %d %.10g, want %.10g", ec.DF, ec.SS, prev)
	}
	rr, a, b, c := 3.0, 3.0, 2.0, 4.0
	for _, w := range []struct {
		key string
		sed float64
	}{
		{"main", math.Sqrt(2 * ms["error_a"] / (rr * b * c))},
		{"sub", math.Sqrt(2 * ms["error_b"] / (rr * a * c))},
		{"subsub", math.Sqrt(2 * ec.MS / (rr * a * b))},
		{"subsub_within_main_sub", math.Sqrt(2 * ec.MS / rr)},
	} {
		s, ok := r.SED(w.key)
		if !ok || !near(s.SED, w.sed, 1e-9) {
			t.Errorf("SED %s = %+v, want %.10g", w.key, s, w.sed)
		}
	}
}

// TestREMLBalanced checks the REML path on complete split, split-split and
// strip plots against the strata analysis: for balanced data with
// positive moment estimates REML gives the ANOVA estimates of the
// variance components and the strata F tests with the stratum df
// (Searle, Casella & McCulloch 1992, Variance Components, section 6.7;
// from memory).
func TestREMLBalanced(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct {
		s     Structure
		sizes []int
		seed  uint64
	}{
		{SplitPlot, []int{3, 4}, 31},
		{SplitPlot, []int{2, 3, 2}, 32},
		{StripPlot, []int{3, 4}, 33},
	} {
		m := simulated(tc.seed, tc.sizes, 4, tc.s, 0)
		ss, err := Fit(m)
		if err != nil {
			t.Fatal(err)
		}
		rm, err := fit(m, true)
		if err != nil {
			t.Fatal(err)
		}
		for j, c := range ss.VarianceComponents {
			if c.Truncated {
				t.Fatalf("seed %d: choose data with positive components", tc.seed)
			}
			if !near(rm.VarianceComponents[j].Variance, c.Variance, 1e-6) {
				t.Errorf("%v %s: REML %.10g, moments %.10g", tc.s, c.Name, rm.VarianceComponents[j].Variance, c.Variance)
			}
		}
		for _, l := range rm.Lines {
			sl, _ := ss.Line(l.Source)
			if !near(l.F, sl.F, 1e-6) || !near(l.DFDen, sl.DFDen, 1e-5) || l.DF != sl.DF {
				t.Errorf("%v %s: REML F %.8g on %d, %.6g df; strata %.8g on %d, %g", tc.s, l.Source, l.F, l.DF, l.DFDen, sl.F, sl.DF, sl.DFDen)
			}
		}
		for _, k := range ss.SEDs {
			rk, ok := rm.SED(k.Key)
			if !ok || !near(rk.SED, k.SED, 1e-6) || !near(rk.DF, k.DF, 1e-4) {
				t.Errorf("%v SED %s: REML %+v, strata %+v", tc.s, k.Key, rk, k)
			}
		}
	}
}

// TestOatsSlices checks the slices of the oats split plot (Yates 1935;
// R 4.2.2 strata mean squares in testdata/oats-split.expected.json): the
// varieties at one nitrogen level are compared with the mixed SED
// √(2((b−1)Eb + Ea)/rb) with Satterthwaite df ((b−1)Eb + Ea)² /
// (((b−1)Eb)²/df_b + Ea²/df_a) (Gomez & Gomez 1984, section 3.4; from
// memory), the nitrogen levels within one variety with √(2Eb/r) on df_b.
func TestOatsSlices(t *testing.T) {
	t.Parallel()
	m := loadCSV(t, "oats-split.csv", []string{"variety", "nitrogen"}, "block", "yield")
	m.Structure = SplitPlot
	m.AllSlices = true
	r, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	ref := loadRef(t, "oats-split.expected.json")
	ea, eb := *ref.Anova[2].SS/10, *ref.Anova[5].SS/45
	mix := 3*eb + ea
	dfMix := mix * mix / (9*eb*eb/45 + ea*ea/10)
	if len(r.Slices) != 4+3 {
		t.Fatalf("%d slices", len(r.Slices))
	}
	for _, s := range r.Slices {
		c := s.Comparison
		switch m.Factors[s.Factor].Name {
		case "variety":
			if !c.EqualSED || !near(c.SED, ref.SED["main_within_sub"], 1e-9) || !near(c.DF, dfMix, 1e-9) {
				t.Errorf("%s: SED %g df %g, want %g %g", s.Name, c.SED, c.DF, ref.SED["main_within_sub"], dfMix)
			}
		case "nitrogen":
			if !c.EqualSED || !near(c.SED, ref.SED["sub_within_main"], 1e-9) || c.DF != 45 {
				t.Errorf("%s: SED %g df %g, want %g 45", s.Name, c.SED, c.DF, ref.SED["sub_within_main"])
			}
			// One stratum: the slice F is the ratio of the slice's mean
			// square to Eb (simple effects; Gomez & Gomez 1984, section 3.4).
			ms := 0.0
			mean := 0.0
			for _, mn := range s.Means {
				mean += mn.Mean / 4
			}
			for _, mn := range s.Means {
				ms += 6 * (mn.Mean - mean) * (mn.Mean - mean) / 3
			}
			if !near(s.F, ms/eb, 1e-9) || s.DF != 3 || s.DFDen != 45 {
				t.Errorf("%s: F %g (%d, %g), want %g (3, 45)", s.Name, s.F, s.DF, s.DFDen, ms/eb)
			}
		}
	}
	_ = mat.NewDense
}

// TestOatsUnitResiduals checks the main-plot residuals of the balanced
// oats split plot against their definition ȳ_ik − ȳ_i − ȳ_k + ȳ (variety
// i, block k) and their sum of squares, times the 4 subplots, against
// error (a) of the R 4.2.2 strata analysis (testdata/oats-split.expected.json).
func TestOatsUnitResiduals(t *testing.T) {
	t.Parallel()
	m := loadCSV(t, "oats-split.csv", []string{"variety", "nitrogen"}, "block", "yield")
	m.Structure = SplitPlot
	r, err := Fit(m)
	if err != nil {
		t.Fatal(err)
	}
	if len(r.UnitResiduals) != 1 {
		t.Fatalf("%d unit residual sets", len(r.UnitResiduals))
	}
	ur := r.UnitResiduals[0]
	gm := r.GrandMean
	mV, mK, mVK := cellMeans(m, []int{0}), cellMeans(m, []int{2}), cellMeans(m, []int{0, 2})
	ss := 0.0
	for k, i := range r.Obs {
		v, b := m.Factors[0].Index[i], m.Block.Index[i]
		want := mVK[key(v, b)] - mV[key(v)] - mK[key(b)] + gm
		if got := ur.Values[ur.Unit[k]]; !near(got, want, 1e-9) {
			t.Errorf("plot %d: main-plot residual %.10g, want %.10g", i+1, got, want)
		}
	}
	for _, v := range ur.Values {
		ss += 4 * v * v
	}
	ref := loadRef(t, "oats-split.expected.json")
	if ur.Stratum != "error_a" || ur.DF != 10 || len(ur.Values) != 18 || !near(ss, *ref.Anova[2].SS, 1e-9) {
		t.Errorf("%s df %d, %d units, 4·Σr² = %.10g, want error_a 10 18 %.10g", ur.Stratum, ur.DF, len(ur.Values), ss, *ref.Anova[2].SS)
	}
	// Within-stratum residuals sum to error (b) (same source).
	sb := 0.0
	for _, e := range r.Residuals {
		sb += e * e
	}
	if !near(sb, *ref.Anova[5].SS, 1e-9) || r.ResidualDF != 45 {
		t.Errorf("Σ residual² %.10g on %d, want %.10g on 45", sb, r.ResidualDF, *ref.Anova[5].SS)
	}
}
