package dist

import (
	"math"

	"gonum.org/v1/gonum/integrate/quad"
)

// Gauss–Kronrod 15-point rule (7-point Gauss rule embedded), abscissae and
// weights on [-1, 1] from QUADPACK's qk15 (Piessens, de Doncker-Kapenga,
// Überhuber & Kahaner (1983), QUADPACK: A Subroutine Package for Automatic
// Integration, Springer). gk15x[7] is the centre node; the Gauss nodes are
// gk15x[1], gk15x[3], gk15x[5] and gk15x[7].
var (
	gk15x = [8]float64{
		0.991455371120812639206854697526329,
		0.949107912342758524526189684047851,
		0.864864423359769072789712788640926,
		0.741531185599394439863864773280788,
		0.586087235467691130294144845693013,
		0.405845151377397166906606412076961,
		0.207784955007898467600689403773245,
		0,
	}
	gk15w = [8]float64{
		0.022935322010529224963732008058970,
		0.063092092629978553290700663189204,
		0.104790010322250183839876322541518,
		0.140653259715525918745189590510238,
		0.169004726639267902826583426598550,
		0.190350578064785409913256402421014,
		0.204432940075298892414161999234649,
		0.209482141084727828012999174891714,
	}
	g7w = [4]float64{
		0.129484966168869693270611432679082,
		0.279705391489276667901467771423780,
		0.381830050505118944950369775488975,
		0.417959183673469387755102040816327,
	}
)

// innerNodes is the number of Gauss–Legendre nodes of the inner (range
// density) rule.
const innerNodes = 24

// glx and glw are the innerNodes-point Gauss–Legendre nodes and weights on
// [0, 1]. They are written once at package initialisation and only read
// afterwards.
var glx, glw = func() ([]float64, []float64) {
	x := make([]float64, innerNodes)
	w := make([]float64, innerNodes)
	quad.Legendre{}.FixedLocations(x, w, 0, 1)
	return x, w
}()

// pair is a value together with a second, optional, integrand (the density
// alongside a probability).
type pair struct{ v, d float64 }

// adaptiveGK integrates f over [a, b] by globally nested bisection with the
// 15-point Gauss–Kronrod rule. A panel is accepted when the difference
// between its Kronrod and Gauss estimates is below rel times the Kronrod
// estimate or below abs; for the positive integrands used here this bounds
// the relative error of the sum, and the Kronrod estimate is in practice far
// more accurate than that difference.
func adaptiveGK(f func(float64) pair, a, b, rel, abs float64, depth int) pair {
	c := 0.5 * (a + b)
	h := 0.5 * (b - a)
	var kv, gv, kd, gd float64
	fc := f(c)
	kv = gk15w[7] * fc.v
	gv = g7w[3] * fc.v
	kd = gk15w[7] * fc.d
	gd = g7w[3] * fc.d
	for i := 0; i < 7; i++ {
		dx := h * gk15x[i]
		f1 := f(c - dx)
		f2 := f(c + dx)
		sv := f1.v + f2.v
		sd := f1.d + f2.d
		kv += gk15w[i] * sv
		kd += gk15w[i] * sd
		if i%2 == 1 {
			gv += g7w[i/2] * sv
			gd += g7w[i/2] * sd
		}
	}
	kv *= h
	gv *= h
	kd *= h
	gd *= h
	ev := math.Abs(kv - gv)
	ed := math.Abs(kd - gd)
	if depth <= 0 || (ev <= math.Max(abs, rel*math.Abs(kv)) && ed <= math.Max(abs, rel*math.Abs(kd))) {
		return pair{kv, kd}
	}
	l := adaptiveGK(f, a, c, rel, abs, depth-1)
	r := adaptiveGK(f, c, b, rel, abs, depth-1)
	return pair{l.v + r.v, l.d + r.d}
}

// integratePieces integrates f over consecutive panels given by the sorted
// break points.
func integratePieces(f func(float64) pair, breaks []float64, rel, abs float64) pair {
	var sum pair
	for i := 1; i < len(breaks); i++ {
		if breaks[i] <= breaks[i-1] {
			continue
		}
		p := adaptiveGK(f, breaks[i-1], breaks[i], rel, abs, maxDepth)
		sum.v += p.v
		sum.d += p.d
	}
	return sum
}

// maxDepth bounds the bisection depth of adaptiveGK.
const maxDepth = 40
