package stats

import (
	"fmt"
	"math"
)

// ApplyTransform returns the responses y transformed by t, and the offset
// added before transforming (0 when none), which BackTransform needs.
//
// The rules follow common practice for field trial data (Gomez & Gomez 1984,
// Statistical Procedures for Agricultural Research, chapter 7):
//
//   - Log: natural logarithm, for data whose spread grows with the mean
//     (for example counts of insects over a wide range). When any value is 0
//     every value is transformed as ln(y+1) (offset 1). Negative values are
//     an error.
//   - Sqrt: square root, for counts of rare events. When any value is 0
//     every value is transformed as √(y+0.5) (offset 0.5). Negative values
//     are an error.
//   - ArcsineSqrt: angular transformation of a percentage p, asin(√(p/100))
//     in degrees (0 to 90). Values outside 0–100 are an error. Values of
//     exactly 0 and 100 are transformed as they are (to 0° and 90°); no
//     1/(4n) substitution is made.
//   - NoTransform: the values are copied unchanged.
//
// The offset is chosen from the whole slice, so pass all the values of a
// trait at once. Problems are reported as *InputError with Obs set to the
// first offending observation.
func ApplyTransform(t Transform, y []float64) (ty []float64, offset float64, err error) {
	for i, v := range y {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, 0, &InputError{Kind: NonFiniteValue, Level: -1, Obs: i,
				Reason: fmt.Sprintf("value number %d is not a finite number; mark it as missing instead", i+1)}
		}
	}
	ty = make([]float64, len(y))
	switch t {
	case NoTransform:
		copy(ty, y)
		return ty, 0, nil
	case Log, Sqrt:
		name := map[Transform]string{Log: "logarithm", Sqrt: "square root"}[t]
		hasZero := false
		for i, v := range y {
			if v < 0 {
				return nil, 0, &InputError{Kind: BadValue, Level: -1, Obs: i,
					Reason: fmt.Sprintf("value number %d is negative (%g), and the %s transformation needs values of zero or more", i+1, v, name)}
			}
			if v == 0 {
				hasZero = true
			}
		}
		if hasZero {
			offset = 1
			if t == Sqrt {
				offset = 0.5
			}
		}
		for i, v := range y {
			if t == Log {
				ty[i] = math.Log(v + offset)
			} else {
				ty[i] = math.Sqrt(v + offset)
			}
		}
		return ty, offset, nil
	case ArcsineSqrt:
		for i, v := range y {
			if v < 0 || v > 100 {
				return nil, 0, &InputError{Kind: BadValue, Level: -1, Obs: i,
					Reason: fmt.Sprintf("value number %d (%g) is not a percentage between 0 and 100, which the arcsine transformation needs", i+1, v)}
			}
			ty[i] = math.Asin(math.Sqrt(v/100)) * 180 / math.Pi
		}
		return ty, 0, nil
	}
	return nil, 0, &InputError{Kind: UnknownTransform, Level: -1, Obs: -1,
		Reason: fmt.Sprintf("the transformation %q is not one this version knows (use log, sqrt or arcsin)", string(t))}
}

// BackTransform maps a value v on the transformed scale (a mean, or the end
// of a confidence interval) back to the original scale, undoing the offset
// returned by ApplyTransform. A back-transformed mean of logarithms is a
// geometric mean, not the arithmetic mean of the data. Standard errors
// cannot be back-transformed this way.
//
// BackTransform panics for a Transform that ApplyTransform would reject.
func BackTransform(t Transform, v, offset float64) float64 {
	switch t {
	case NoTransform:
		return v
	case Log:
		return math.Exp(v) - offset
	case Sqrt:
		return v*v - offset
	case ArcsineSqrt:
		s := math.Sin(v * math.Pi / 180)
		return 100 * s * s
	}
	panic(fmt.Sprintf("stats: BackTransform of unknown transformation %q", string(t)))
}

// Scale names the scale a transformation analyses on, in words for notes:
// "log", "square-root", "arcsine square-root"; "original" for none.
func (t Transform) Scale() string {
	switch t {
	case NoTransform:
		return "original"
	case Log:
		return "log"
	case Sqrt:
		return "square-root"
	case ArcsineSqrt:
		return "arcsine square-root"
	}
	return string(t)
}
