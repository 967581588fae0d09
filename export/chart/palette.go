package chart

import (
	"image/color"
	"math"
)

// OkabeIto is the colour-blind-safe qualitative palette of Okabe and Ito
// (2008), "Color Universal Design (CUD): how to make figures and
// presentations that are friendly to colorblind people", in the order
// orange, sky blue, bluish green, yellow, blue, vermillion, reddish purple,
// black. Charts cycle through it for treatments and roles.
var OkabeIto = [8]color.NRGBA{
	{R: 0xE6, G: 0x9F, B: 0x00, A: 0xFF}, // orange
	{R: 0x56, G: 0xB4, B: 0xE9, A: 0xFF}, // sky blue
	{R: 0x00, G: 0x9E, B: 0x73, A: 0xFF}, // bluish green
	{R: 0xF0, G: 0xE4, B: 0x42, A: 0xFF}, // yellow
	{R: 0x00, G: 0x72, B: 0xB2, A: 0xFF}, // blue
	{R: 0xD5, G: 0x5E, B: 0x00, A: 0xFF}, // vermillion
	{R: 0xCC, G: 0x79, B: 0xA7, A: 0xFF}, // reddish purple
	{R: 0x00, G: 0x00, B: 0x00, A: 0xFF}, // black
}

// Colours given a role in every chart.
var (
	entryColor  = OkabeIto[4] // blue: test entries
	checkColor  = OkabeIto[0] // orange, hatched: checks
	markColor   = OkabeIto[5] // vermillion: excluded plots, outliers
	missingFill = color.NRGBA{R: 0xD9, G: 0xD9, B: 0xD9, A: 0xFF}
	gridGrey    = color.NRGBA{R: 0x80, G: 0x80, B: 0x80, A: 0xFF}
)

// viridisAnchors are eighteen entries of the viridis colour map (van der
// Walt and Smith 2015, the 256-entry table published with matplotlib under
// CC0), at table indices 0, 16, 32, ..., 240, 248 and 255; 248 is kept
// because the blue channel turns there. Viridis is perceptually uniform,
// readable in grey scale and by the common forms of colour blindness.
var viridisAnchors = [...]struct {
	index   float64
	r, g, b float64
}{
	{0, 0.267004, 0.004874, 0.329415},
	{16, 0.282327, 0.094955, 0.417331},
	{32, 0.278826, 0.175490, 0.483397},
	{48, 0.258965, 0.251537, 0.524736},
	{64, 0.229739, 0.322361, 0.545706},
	{80, 0.199430, 0.387607, 0.554642},
	{96, 0.172719, 0.448791, 0.557885},
	{112, 0.149039, 0.508051, 0.557250},
	{128, 0.127568, 0.566949, 0.550556},
	{144, 0.120638, 0.625828, 0.533488},
	{160, 0.157851, 0.683765, 0.501686},
	{176, 0.246070, 0.738910, 0.452024},
	{192, 0.369214, 0.788888, 0.382914},
	{208, 0.515992, 0.831158, 0.294279},
	{224, 0.678489, 0.863742, 0.189503},
	{240, 0.845561, 0.887322, 0.099702},
	{248, 0.926106, 0.897330, 0.104071},
	{255, 0.993248, 0.906157, 0.143936},
}

// Viridis returns the colour of the viridis sequential scale at position v
// in [0, 1] (0 dark purple, 1 yellow), interpolated linearly between
// published anchor values. v outside [0, 1] is clamped; NaN panics.
func Viridis(v float64) color.NRGBA {
	if math.IsNaN(v) {
		panic("chart: Viridis of NaN")
	}
	v = math.Max(0, math.Min(1, v))
	x := v * 255
	n := len(viridisAnchors)
	k := n - 2
	for i := 0; i < n-1; i++ {
		if x <= viridisAnchors[i+1].index {
			k = i
			break
		}
	}
	a, b := viridisAnchors[k], viridisAnchors[k+1]
	f := (x - a.index) / (b.index - a.index)
	lerp := func(p, q float64) uint8 { return uint8(math.Round(255 * (p + f*(q-p)))) }
	return color.NRGBA{R: lerp(a.r, b.r), G: lerp(a.g, b.g), B: lerp(a.b, b.b), A: 0xFF}
}

// relativeLuminance is the WCAG 2.1 relative luminance of c: sRGB channels
// linearised, weighted 0.2126, 0.7152, 0.0722.
func relativeLuminance(c color.Color) float64 {
	r, g, b, _ := c.RGBA()
	lin := func(v uint32) float64 {
		s := float64(v) / 0xFFFF
		if s <= 0.04045 {
			return s / 12.92
		}
		return math.Pow((s+0.055)/1.055, 2.4)
	}
	return 0.2126*lin(r) + 0.7152*lin(g) + 0.0722*lin(b)
}

// contrastRatio is the WCAG 2.1 contrast ratio (L1+0.05)/(L2+0.05) of two
// colours, the lighter over the darker.
func contrastRatio(a, b color.Color) float64 {
	la, lb := relativeLuminance(a), relativeLuminance(b)
	if la < lb {
		la, lb = lb, la
	}
	return (la + 0.05) / (lb + 0.05)
}

// inkOn returns black or white, whichever contrasts more with the fill.
func inkOn(fill color.Color) color.Color {
	if contrastRatio(fill, color.Black) >= contrastRatio(fill, color.White) {
		return color.Black
	}
	return color.White
}

// purpleOrange is the 11-class diverging "PuOr" scheme of ColorBrewer
// (Brewer, Harrower and the Pennsylvania State University, colorbrewer2.org;
// values from memory), from dark orange through near-white to dark purple.
// It stays apart for the common forms of colour blindness.
var purpleOrange = [11]color.NRGBA{
	{R: 0x7f, G: 0x3b, B: 0x08, A: 0xff}, {R: 0xb3, G: 0x58, B: 0x06, A: 0xff},
	{R: 0xe0, G: 0x82, B: 0x14, A: 0xff}, {R: 0xfd, G: 0xb8, B: 0x63, A: 0xff},
	{R: 0xfe, G: 0xe0, B: 0xb6, A: 0xff}, {R: 0xf7, G: 0xf7, B: 0xf7, A: 0xff},
	{R: 0xd8, G: 0xda, B: 0xeb, A: 0xff}, {R: 0xb2, G: 0xab, B: 0xd2, A: 0xff},
	{R: 0x80, G: 0x73, B: 0xac, A: 0xff}, {R: 0x54, G: 0x27, B: 0x88, A: 0xff},
	{R: 0x2d, G: 0x00, B: 0x4b, A: 0xff},
}

// Diverging returns the colour of the diverging purple–orange scale at v in
// [0, 1]: 0 dark purple (far below), 0.5 near-white (as expected), 1 dark
// orange (far above), interpolated linearly between the eleven classes. v
// outside [0, 1] is clamped; NaN panics.
func Diverging(v float64) color.NRGBA {
	if math.IsNaN(v) {
		panic("chart: Diverging of NaN")
	}
	v = math.Max(0, math.Min(1, v))
	// The table runs orange to purple; low values are purple.
	x := (1 - v) * float64(len(purpleOrange)-1)
	k := min(int(x), len(purpleOrange)-2)
	f := x - float64(k)
	a, b := purpleOrange[k], purpleOrange[k+1]
	lerp := func(p, q uint8) uint8 { return uint8(math.Round(float64(p) + f*(float64(q)-float64(p)))) }
	return color.NRGBA{R: lerp(a.R, b.R), G: lerp(a.G, b.G), B: lerp(a.B, b.B), A: 0xff}
}
