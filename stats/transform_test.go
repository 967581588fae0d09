package stats

import (
	"errors"
	"math"
	"strconv"
	"testing"
)

// TestSqrtAgainstR: the square root of the InsectSprays counts without
// zeros equals R 4.2.2's sqrt() in insect-sprays-sqrt.csv (printed to 15
// significant digits), with no offset.
func TestSqrtAgainstR(t *testing.T) {
	t.Parallel()
	h1, r1 := readRefCSV(t, "insect-sprays.csv")
	h2, r2 := readRefCSV(t, "insect-sprays-sqrt.csv")
	counts := column(t, h1, r1, "count")
	roots := column(t, h2, r2, "sqrt_count")
	var y, want []float64
	for i := range counts {
		c, _ := strconv.ParseFloat(counts[i], 64)
		s, _ := strconv.ParseFloat(roots[i], 64)
		if c == 0 {
			continue
		}
		y = append(y, c)
		want = append(want, s)
	}
	ty, off, err := ApplyTransform(Sqrt, y)
	if err != nil || off != 0 {
		t.Fatalf("offset %g, err %v", off, err)
	}
	for i := range ty {
		checkRel(t, "sqrt", ty[i], want[i], 1e-14)
	}
	// With the zeros in, every value gets the +0.5 (common practice for
	// counts with zeros: Gomez & Gomez 1984, chapter 7).
	all := make([]float64, len(counts))
	for i, s := range counts {
		all[i], _ = strconv.ParseFloat(s, 64)
	}
	ty, off, err = ApplyTransform(Sqrt, all)
	if err != nil || off != 0.5 {
		t.Fatalf("offset %g, err %v", off, err)
	}
	for i, v := range all {
		checkRel(t, "sqrt(y+0.5)", ty[i], math.Sqrt(v+0.5), 1e-15)
	}
}

// TestTransforms checks known values and round trips.
func TestTransforms(t *testing.T) {
	t.Parallel()
	// Angular transformation table values (Gomez & Gomez 1984, appendix
	// table of arcsin √percentage, from memory): 1% → 5.74°, 10% → 18.43°,
	// 50% → 45.00°; and the exact values 25% → 30°, 75% → 60°.
	ty, off, err := ApplyTransform(ArcsineSqrt, []float64{0, 1, 10, 25, 50, 75, 100})
	if err != nil || off != 0 {
		t.Fatal(off, err)
	}
	for i, want := range []float64{0, 5.74, 18.43, 30, 45, 60, 90} {
		if math.Abs(ty[i]-want) > 0.005 {
			t.Errorf("arcsin %d: %.4f°, want %.2f°", i, ty[i], want)
		}
	}
	checkRel(t, "arcsin 25%", ty[3], 30, 1e-14)

	// Log: natural log without zeros, ln(y+1) with (common practice).
	ty, off, err = ApplyTransform(Log, []float64{1, math.E, 100})
	if err != nil || off != 0 {
		t.Fatal(off, err)
	}
	checkRel(t, "ln e", ty[1], 1, 1e-15)
	checkRel(t, "ln 100", ty[2], 4.605170185988091, 1e-15) // ln 100, from memory (= 2 ln 10)
	ty, off, err = ApplyTransform(Log, []float64{0, 9})
	if err != nil || off != 1 || ty[0] != 0 {
		t.Fatal(ty, off, err)
	}
	checkRel(t, "ln 10", ty[1], math.Ln10, 1e-15)

	// Round trips.
	data := map[Transform][]float64{
		NoTransform: {-3, 0, 2.5},
		Log:         {0, 3, 1200.5},
		Sqrt:        {0, 4, 17.25},
		ArcsineSqrt: {0, 3.5, 50, 99.9, 100},
	}
	for tr, y := range data {
		ty, off, err := ApplyTransform(tr, y)
		if err != nil {
			t.Fatal(tr, err)
		}
		for i, v := range y {
			if b := BackTransform(tr, ty[i], off); math.Abs(b-v) > 1e-12*math.Max(1, math.Abs(v)) {
				t.Errorf("%q: back-transform of %g gives %g", tr, v, b)
			}
		}
		if tr == NoTransform {
			ty[0] = 99
			if y[0] == 99 {
				t.Error("NoTransform did not copy")
			}
		}
	}
}

// TestTransformErrors: values outside a transformation's domain are typed
// errors naming the observation.
func TestTransformErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		tr   Transform
		y    []float64
		sent error
		obs  int
	}{
		{Log, []float64{1, -2}, ErrBadValue, 1},
		{Sqrt, []float64{-0.1}, ErrBadValue, 0},
		{ArcsineSqrt, []float64{50, 100.5}, ErrBadValue, 1},
		{ArcsineSqrt, []float64{-1}, ErrBadValue, 0},
		{Log, []float64{1, math.NaN()}, ErrNonFiniteValue, 1},
		{NoTransform, []float64{math.Inf(1)}, ErrNonFiniteValue, 0},
		{Transform("cube"), []float64{1}, ErrUnknownTransform, -1},
	} {
		_, _, err := ApplyTransform(c.tr, c.y)
		var ie *InputError
		if !errors.Is(err, c.sent) || !errors.As(err, &ie) || ie.Obs != c.obs {
			t.Errorf("%q %v: error %v, want %v at %d", c.tr, c.y, err, c.sent, c.obs)
		}
	}
	defer func() {
		if recover() == nil {
			t.Error("BackTransform of an unknown transformation did not panic")
		}
	}()
	BackTransform(Transform("cube"), 1, 0)
}
