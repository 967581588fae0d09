package chart

import (
	"bytes"
	"image"
	"image/color"
	"image/png"
	"math"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"

	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// allCharts builds every chart of the package on the fixture.
func allCharts(t *testing.T) map[string]*plot.Plot {
	t.Helper()
	tr, r := fixtureTrial(), fixtureResult()
	tr.Layout.Orientation = trial.Orientation{North: trial.EdgeRight, Landmark: "farm track"}
	out := map[string]*plot.Plot{}
	add := func(name string, p *plot.Plot, err error) {
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		out[name] = p
	}
	p, err := Means(tr, r, MeansOptions{Letters: meansep.LSD})
	add("means", p, err)
	p, err = HeatMap(tr, "yield", HeatMapOptions{PlotNumbers: true})
	add("heat", p, err)
	p, err = ResidualMap(tr, r, ResidualMapOptions{PlotNumbers: true})
	add("residual map", p, err)
	p, err = FieldMap(tr, FieldMapOptions{})
	add("field map", p, err)
	p, err = Spread(tr, "yield", SpreadOptions{Seed: 1})
	add("spread", p, err)
	p, err = Residuals(tr, r)
	add("residuals", p, err)
	p, err = QQ(tr, r)
	add("qq", p, err)
	return out
}

// Screen images have exactly the pixel size asked for, at any canvas
// scale, and PNG files decode to width × 96/72 pixels per point (ScreenDPI).
func TestImageSizes(t *testing.T) {
	t.Parallel()
	for name, p := range allCharts(t) {
		for _, sc := range []float64{1, 1.25, 2, 0, math.NaN()} {
			img := ImageScaled(p, 700, 450, sc)
			if b := img.Bounds(); b.Dx() != 700 || b.Dy() != 450 {
				t.Errorf("%s at scale %v: %v, want 700×450", name, sc, b)
			}
		}
		var buf bytes.Buffer
		if err := Save(p, &buf, "png", 6*vg.Inch, 4*vg.Inch); err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(&buf)
		if err != nil {
			t.Fatalf("%s: PNG does not decode: %v", name, err)
		}
		// 6 in × 4 in at 96 dots per inch.
		if b := img.Bounds(); b.Dx() != 576 || b.Dy() != 384 {
			t.Errorf("%s PNG: %v, want 576×384", name, b)
		}
	}
}

// Every text of every chart is set in Liberation Sans, the window's face:
// the SVG backend names the family of each text (gonum/plot's vgsvg writes
// "font-family:<typeface> <variant>").
func TestChartsUseSansFace(t *testing.T) {
	t.Parallel()
	for name, p := range allCharts(t) {
		svg := string(render(t, p, "svg"))
		texts := strings.Count(svg, "<text")
		sans := strings.Count(svg, "font-family:"+FontFamily+";")
		if texts == 0 || sans < texts {
			t.Errorf("%s: %d of %d texts in %s", name, sans, texts, FontFamily)
		}
		if strings.Contains(svg, "Serif") {
			t.Errorf("%s: a serif face is used", name)
		}
	}
}

// A larger canvas scale draws the same chart with proportionally larger
// text: the width of the title's ink grows with the scale.
func TestImageScaledTextGrows(t *testing.T) {
	t.Parallel()
	p := allCharts(t)["means"]
	ink := func(img image.Image) int {
		// Dark pixels in the top tenth (the title).
		b := img.Bounds()
		n := 0
		for y := 0; y < b.Dy()/10; y++ {
			for x := 0; x < b.Dx(); x++ {
				r, g, bb, _ := img.At(x, y).RGBA()
				if r+g+bb < 3*0x4000 {
					n++
				}
			}
		}
		return n
	}
	one, two := ink(ImageScaled(p, 1200, 800, 1)), ink(ImageScaled(p, 1200, 800, 2))
	// Ink area grows with the square of the scale; allow for anti-aliasing.
	if float64(two) < 2.5*float64(one) {
		t.Errorf("title ink %d px at scale 1, %d at scale 2: text did not grow", one, two)
	}
}

// clipLine keeps the part of a line inside a rectangle (checked against
// the rectangle's edges by hand).
func TestClipLine(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name               string
		b0, b1             float64
		xlo, xhi, ylo, yhi float64
		ok                 bool
		ax, ay, bx, by     float64
	}{
		{"inside", 0, 0.5, -2, 2, -2, 2, true, -2, -1, 2, 1},
		{"steep", 0, 2, -2, 2, -1, 1, true, -0.5, -1, 0.5, 1},
		{"falling", 1, -1, 0, 3, 0, 2, true, 0, 1, 1, 0},
		{"flat inside", 1, 0, 0, 3, 0, 2, true, 0, 1, 3, 1},
		{"flat outside", 5, 0, 0, 3, 0, 2, false, 0, 0, 0, 0},
		{"misses", 10, 1, 0, 1, 0, 1, false, 0, 0, 0, 0},
		{"NaN", math.NaN(), 1, 0, 1, 0, 1, false, 0, 0, 0, 0},
	}
	for _, c := range cases {
		a, b, ok := clipLine(c.b0, c.b1, c.xlo, c.xhi, c.ylo, c.yhi)
		if ok != c.ok {
			t.Errorf("%s: ok %v", c.name, ok)
			continue
		}
		if !ok {
			continue
		}
		near := func(p, q float64) bool { return math.Abs(p-q) < 1e-12 }
		if !near(a.X, c.ax) || !near(a.Y, c.ay) || !near(b.X, c.bx) || !near(b.Y, c.by) {
			t.Errorf("%s: (%v,%v)–(%v,%v), want (%v,%v)–(%v,%v)", c.name, a.X, a.Y, b.X, b.Y, c.ax, c.ay, c.bx, c.by)
		}
	}
}

// bimodalResult has residuals in two tight groups at ±1, so that the line
// through the quartiles (slope about 1.5) would leave the data area at both
// ends if it were drawn across the whole quantile range.
func bimodalResult() *analysis.Result {
	r := &analysis.Result{TraitKey: "y", TraitName: "Yield", Alpha: 0.05}
	a := &stats.ANOVA{MSE: 1, DFError: 18}
	for i := 0; i < 20; i++ {
		e := -1 + 0.01*float64(i%10)
		if i >= 10 {
			e = 1 - 0.01*float64(i%10)
		}
		a.Residuals = append(a.Residuals, e)
		a.Fitted = append(a.Fitted, float64(i))
		r.Diagnostics.StandardizedResiduals = append(r.Diagnostics.StandardizedResiduals, e)
	}
	r.ANOVA = a
	return r
}

// The Q-Q reference line stays inside the data rectangle: no pixel of its
// colour lies outside the data area, except the key's own swatch to the
// right of it.
func TestQQLineClipped(t *testing.T) {
	t.Parallel()
	r := bimodalResult()
	p, err := QQ(nil, r)
	if err != nil {
		t.Fatal(err)
	}
	const w, h = 800, 500
	px := vg.Inch / ScreenDPI
	c := vgimg.NewWith(vgimg.UseWH(w*px, h*px), vgimg.UseDPI(ScreenDPI))
	dc := draw.New(c)
	p.Draw(dc)
	data := p.DataCanvas(dc)
	img := c.Image()
	// vg points to pixels, y downwards.
	toPx := func(v vg.Length) float64 { return float64(v / px) }
	left, right := toPx(data.Min.X), toPx(data.Max.X)
	top, bottom := h-toPx(data.Max.Y), h-toPx(data.Min.Y)
	keyStart := right + toPx(panelGap) - 1
	var inside, outside int
	for y := 0; y < h; y++ {
		for x := 0; x < w; x++ {
			if !nearColour(img.At(x, y), markColor, 40) {
				continue
			}
			fx, fy := float64(x), float64(y)
			switch {
			case fx >= left-1 && fx <= right+1 && fy >= top-1 && fy <= bottom+1:
				inside++
			case fx >= keyStart:
				// the key's line swatch
			default:
				outside++
			}
		}
	}
	if inside < 50 {
		t.Fatalf("only %d line pixels inside the data area: no line drawn?", inside)
	}
	if outside > 0 {
		t.Errorf("%d line pixels outside the data area", outside)
	}
	// And in data units: the axes were not widened to hold the line.
	lo, hi := r.ANOVA.Residuals[0], r.ANOVA.Residuals[10]
	if p.Y.Min < lo-0.3 || p.Y.Max > hi+0.3 {
		t.Errorf("Y axis %v..%v for residuals %v..%v", p.Y.Min, p.Y.Max, lo, hi)
	}
}

// nearColour reports whether c is within tol (per channel, 0–255) of want.
func nearColour(c color.Color, want color.NRGBA, tol int) bool {
	r, g, b, _ := c.RGBA()
	d := func(v uint32, w uint8) bool { return math.Abs(float64(v>>8)-float64(w)) <= float64(tol) }
	return d(r, want.R) && d(g, want.G) && d(b, want.B)
}

// cellColour samples the rendered chart at the centre of the field cell
// (col, row).
func cellColour(t *testing.T, p *plot.Plot, col, row int) (color.Color, float64) {
	t.Helper()
	const w, h = 900, 600
	px := vg.Inch / ScreenDPI
	c := vgimg.NewWith(vgimg.UseWH(w*px, h*px), vgimg.UseDPI(ScreenDPI))
	dc := draw.New(c)
	p.Draw(dc)
	data := p.DataCanvas(dc)
	trX, trY := p.Transforms(&data)
	x, y := float64(trX(float64(col))/px), h-float64(trY(float64(row))/px)
	// A little off the centre, clear of the plot number.
	return c.Image().At(int(x)+w/40, int(y)), y
}

// Row 1 is drawn at the bottom, as on paper: the cell of the plot in row 1
// is below the cell in row 2 and has its treatment's colour.
func TestFieldOrientationRowOneAtBottom(t *testing.T) {
	t.Parallel()
	tr := fixtureTrial()
	p, err := FieldMap(tr, FieldMapOptions{})
	if err != nil {
		t.Fatal(err)
	}
	swatchOf := func(code string) color.NRGBA {
		return treatmentSwatch(tr.TreatmentIndex(code)).Fill.(color.NRGBA)
	}
	// fixtureLayout: row 1 column 1 holds H3, row 2 column 1 holds H2.
	c1, y1 := cellColour(t, p, 1, 1)
	c2, y2 := cellColour(t, p, 1, 2)
	if !(y1 > y2) {
		t.Errorf("row 1 at y=%v px, row 2 at y=%v px: row 1 is not below row 2", y1, y2)
	}
	if !nearColour(c1, swatchOf(fixtureLayout[0][0]), 8) || !nearColour(c2, swatchOf(fixtureLayout[1][0]), 8) {
		t.Errorf("cell colours %v, %v; want the swatches of %s and %s", c1, c2, fixtureLayout[0][0], fixtureLayout[1][0])
	}
}

// The residual map colours the largest residual orange and the smallest
// purple on a scale centred on zero, greys the plots left out, and shows
// the orientation (north arrow, landmark).
func TestResidualMap(t *testing.T) {
	t.Parallel()
	tr, r := fixtureTrial(), fixtureResult()
	tr.Layout.Orientation = trial.Orientation{North: trial.EdgeTop, Landmark: "farm track"}
	p, err := ResidualMap(tr, r, ResidualMapOptions{PlotNumbers: true})
	if err != nil {
		t.Fatal(err)
	}
	// Observation 16 (plot 401, row 4 column 1) has residual +1.35, beyond
	// the 2.5·√MSE = 1.049 cap: full orange. Observation 1 (plot 102, row 1
	// column 2) has −0.31: a light purple, −0.31/1.05 of the way down.
	span := 2.5 * math.Sqrt(r.ANOVA.MSE)
	top, _ := cellColour(t, p, 1, 4)
	if !nearColour(top, Diverging(1), 6) {
		t.Errorf("plot 401 %v, want %v", top, Diverging(1))
	}
	low, _ := cellColour(t, p, 2, 1)
	if want := Diverging(0.5 - 0.5*0.31/span); !nearColour(low, want, 6) {
		t.Errorf("plot 102 %v, want %v", low, want)
	}
	// Missing plot 204 (row 2, column 4) and excluded 304: grey.
	if g, _ := cellColour(t, p, 4, 2); !nearColour(g, missingFill, 40) {
		t.Errorf("missing plot %v, want grey", g)
	}
	texts := svgTexts(render(t, p, "svg"))
	for _, want := range []string{"Residual (t/ha)", "+" + strconv.FormatFloat(span, 'f', 3, 64), "-" + strconv.FormatFloat(span, 'f', 3, 64), "0.000", "Not analysed (2)", "North", "farm track", orientationNote} {
		if countText(texts, want) < 1 {
			t.Errorf("text %q missing; have %q", want, texts)
		}
	}
	if _, err := ResidualMap(tr, &analysis.Result{}, ResidualMapOptions{}); err == nil {
		t.Error("a result without residuals gave a map")
	}
}

// Diverging runs from purple through near-white to orange, the ends and
// middle of ColorBrewer's PuOr (from memory: #2d004b, #f7f7f7, #7f3b08).
func TestDiverging(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		v    float64
		want color.NRGBA
	}{
		{0, color.NRGBA{0x2d, 0x00, 0x4b, 0xff}}, {0.5, color.NRGBA{0xf7, 0xf7, 0xf7, 0xff}},
		{1, color.NRGBA{0x7f, 0x3b, 0x08, 0xff}}, {-3, color.NRGBA{0x2d, 0x00, 0x4b, 0xff}},
	} {
		if got := Diverging(c.v); got != c.want {
			t.Errorf("Diverging(%v) = %v, want %v", c.v, got, c.want)
		}
	}
}

// The field map's key ties the map to the ground: a north arrow and the
// landmark when given, a note when not.
func TestFieldMapOrientationKey(t *testing.T) {
	t.Parallel()
	tr := fixtureTrial()
	p, _ := FieldMap(tr, FieldMapOptions{})
	if texts := svgTexts(render(t, p, "svg")); countText(texts, "North not recorded") != 1 {
		t.Errorf("no note that north is unknown: %q", texts)
	}
	tr.Layout.Orientation = trial.Orientation{North: trial.EdgeLeft, Landmark: "hedge"}
	p, _ = FieldMap(tr, FieldMapOptions{})
	texts := svgTexts(render(t, p, "svg"))
	if countText(texts, "North") != 1 || countText(texts, "hedge") != 1 || countText(texts, "North not recorded") != 0 {
		t.Errorf("orientation key %q", texts)
	}
}
