package diag

import "math"

// standardise returns the values centred and divided by a power of two so
// that the largest magnitude lies in [0.5, 1], and that power of two times
// the first one used (the unit of the result in the values' unit). Every
// test in this package is unchanged by a shift and a positive scaling of
// its values, so it runs on the standardised values: sums of squares then
// neither overflow (values near 1e150) nor underflow (values near 1e-160),
// and values that share a large offset (1e15 + small differences) keep
// their differences exactly (dividing by a power of two is exact, and so is
// subtracting a nearby centre). unit is 0 when every value is the same.
func standardise(x []float64) (z []float64, unit float64) {
	z = make([]float64, len(x))
	maxAbs := 0.0
	for _, v := range x {
		maxAbs = math.Max(maxAbs, math.Abs(v))
	}
	if maxAbs == 0 || len(x) == 0 {
		return z, 0
	}
	s1 := pow2Above(maxAbs)
	var c float64
	for i, v := range x {
		z[i] = v / s1
		c += z[i]
	}
	c /= float64(len(x))
	dev := 0.0
	for i := range z {
		z[i] -= c
		dev = math.Max(dev, math.Abs(z[i]))
	}
	if dev == 0 {
		return z, 0
	}
	s2 := pow2Above(dev)
	for i := range z {
		z[i] /= s2
	}
	return z, s1 * s2
}

// pow2Above is the smallest power of two not below v > 0.
func pow2Above(v float64) float64 {
	f, e := math.Frexp(v) // v = f·2^e, 0.5 ≤ f < 1
	if f == 0.5 {
		return math.Ldexp(1, e-1)
	}
	return math.Ldexp(1, e)
}
