package trial

import (
	"math"
	"testing"
)

// The differences of typed decimals are exact decimal arithmetic, worked by
// hand: 1000000000000.4 − 1000000000000.3 = 0.1, which the float64 values
// themselves differ by only approximately (their spacing near 1e12 is
// 2^-13 ≈ 0.000122).
func TestSharedDigits(t *testing.T) {
	t.Parallel()
	in := []float64{1000000000000.4, 1000000000000.3, math.NaN(), 1000000000000.5}
	origin, rest, ok := SharedDigits(in)
	if !ok {
		t.Fatal("values sharing 13 leading digits were not split")
	}
	if origin != 1000000000000.4 {
		t.Errorf("origin %v, want the middle value 1000000000000.4", origin)
	}
	want := []float64{0, -0.1, math.NaN(), 0.1}
	for i := range want {
		if math.IsNaN(want[i]) {
			if !math.IsNaN(rest[i]) {
				t.Errorf("rest[%d] = %v, want NaN (missing stays missing)", i, rest[i])
			}
			continue
		}
		if rest[i] != want[i] {
			t.Errorf("rest[%d] = %.17g, want exactly %.17g", i, rest[i], want[i])
		}
	}
	// The float64 difference loses most digits: this is what the split avoids.
	if d := in[1] - in[0]; d == -0.1 {
		t.Fatalf("float64 subtraction happened to be exact (%v); the example no longer shows the problem", d)
	}
}

func TestSharedDigitsNotNeeded(t *testing.T) {
	t.Parallel()
	for _, in := range [][]float64{
		{1.3, 1.4, 2.5},         // spread half the size: nothing to gain
		{5},                     // one value
		{math.NaN(), 2},         // one finite value
		{0, 0, 0},               // all zero
		{-2.5e-9, 2.5e-9, 1e-9}, // around zero
	} {
		if _, rest, ok := SharedDigits(in); ok || rest != nil {
			t.Errorf("SharedDigits(%v) split the values (ok %v); want them left alone", in, ok)
		}
	}
}

// Negative values and values with exponents split the same way (hand worked:
// −123456.78901 − (−123456.78900) = −0.00001).
func TestSharedDigitsNegativeAndExponent(t *testing.T) {
	t.Parallel()
	_, rest, ok := SharedDigits([]float64{-123456.789, -123456.78901, -123456.78899})
	if !ok || rest[1] != -0.00001 || rest[2] != 0.00001 || rest[0] != 0 {
		t.Errorf("got %v %v; want [0 -1e-05 1e-05]", rest, ok)
	}
	_, rest, ok = SharedDigits([]float64{2.0000001e20, 2.0000002e20, 2.0000003e20})
	if !ok || rest[0] != -1e13 || rest[2] != 1e13 {
		t.Errorf("got %v %v; want [-1e13 0 1e13]", rest, ok)
	}
}

// A value with more digits than float64 tells apart is taken as the float64
// holds it: 1e15 + 50.25 is exact in binary (spacing 0.125 there) although
// its shortest decimal, 1000000000000050.2, is not the same number.
func TestSharedDigitsBeyondFifteenDigits(t *testing.T) {
	t.Parallel()
	_, rest, ok := SharedDigits([]float64{1e15 + 50.25, 1e15 + 50.5, 1e15 + 50})
	if !ok || rest[0] != 0 || rest[1] != 0.25 || rest[2] != -0.25 {
		t.Errorf("got %v %v; want [0 0.25 -0.25]", rest, ok)
	}
}
