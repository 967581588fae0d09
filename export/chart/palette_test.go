package chart

import (
	"encoding/csv"
	"image/color"
	"math"
	"os"
	"strconv"
	"testing"
)

func TestOkabeItoPublished(t *testing.T) {
	t.Parallel()
	// RGB values of the eight colours as published by Okabe & Ito (2008),
	// "Color Universal Design (CUD): how to make figures and presentations
	// that are friendly to colorblind people", jfly.uni-koeln.de/color,
	// figure 16 (values from memory; the hex spellings #E69F00 ... are the
	// usual ones, common practice).
	want := []struct {
		name    string
		hex     string
		r, g, b uint8
	}{
		{"orange", "#E69F00", 230, 159, 0},
		{"sky blue", "#56B4E9", 86, 180, 233},
		{"bluish green", "#009E73", 0, 158, 115},
		{"yellow", "#F0E442", 240, 228, 66},
		{"blue", "#0072B2", 0, 114, 178},
		{"vermillion", "#D55E00", 213, 94, 0},
		{"reddish purple", "#CC79A7", 204, 121, 167},
		{"black", "#000000", 0, 0, 0},
	}
	for i, w := range want {
		got := OkabeIto[i]
		if got.R != w.r || got.G != w.g || got.B != w.b || got.A != 0xFF {
			t.Errorf("OkabeIto[%d] (%s) = %v, want RGB %d,%d,%d", i, w.name, got, w.r, w.g, w.b)
		}
		if h := hexOf(got); h != w.hex {
			t.Errorf("OkabeIto[%d] (%s) = %s, want %s", i, w.name, h, w.hex)
		}
	}
}

func hexOf(c color.Color) string {
	r, g, b, _ := c.RGBA()
	const digits = "0123456789ABCDEF"
	out := []byte{'#'}
	for _, v := range []uint32{r >> 8, g >> 8, b >> 8} {
		out = append(out, digits[v>>4], digits[v&15])
	}
	return string(out)
}

func TestViridisAgainstPublishedTable(t *testing.T) {
	t.Parallel()
	// testdata/viridis-matplotlib.csv: entries of matplotlib's published
	// 256-entry viridis table (van der Walt & Smith 2015, CC0).
	f, err := os.Open("testdata/viridis-matplotlib.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	for _, row := range rows[1:] {
		idx, _ := strconv.Atoi(row[0])
		got := Viridis(float64(idx) / 255)
		anchor := idx%16 == 0 || idx == 248 || idx == 255
		// Anchors are reproduced to rounding; between anchors the linear
		// interpolation stays within 2.5/255 per channel of the table.
		tol := 0.5
		if !anchor {
			tol = 2.5
		}
		for ch, gv := range []uint8{got.R, got.G, got.B} {
			w, _ := strconv.ParseFloat(row[ch+1], 64)
			if d := math.Abs(float64(gv) - 255*w); d > tol+1e-9 {
				t.Errorf("Viridis(%d/255) channel %d = %d, table %.2f (off by %.2f > %.1f)", idx, ch, gv, 255*w, d, tol)
			}
		}
	}
	// Property claimed for viridis by its authors: lightness rises
	// monotonically from one end to the other.
	prev := -1.0
	for i := 0; i <= 100; i++ {
		l := relativeLuminance(Viridis(float64(i) / 100))
		if l <= prev {
			t.Errorf("luminance not increasing at %d/100: %g after %g", i, l, prev)
		}
		prev = l
	}
	if got := Viridis(-1); got != Viridis(0) {
		t.Errorf("Viridis(-1) = %v, want the low end", got)
	}
	if got := Viridis(2); got != Viridis(1) {
		t.Errorf("Viridis(2) = %v, want the high end", got)
	}
}

func TestContrastRatio(t *testing.T) {
	t.Parallel()
	// WCAG 2.1, definition of contrast ratio: black on white is 21:1.
	if got := contrastRatio(color.White, color.Black); math.Abs(got-21) > 1e-9 {
		t.Errorf("contrast white/black = %g, want 21", got)
	}
	// #777777 on white is 4.48:1, the grey just short of WCAG AA's 4.5:1
	// (a commonly quoted figure, from memory).
	if got := contrastRatio(color.White, color.RGBA{0x77, 0x77, 0x77, 0xFF}); math.Abs(got-4.48) > 0.01 {
		t.Errorf("contrast white/#777777 = %.3f, want 4.48", got)
	}
	if inkOn(OkabeIto[3]) != color.Black { // yellow
		t.Error("text on Okabe–Ito yellow should be black")
	}
	if inkOn(OkabeIto[7]) != color.White { // black
		t.Error("text on Okabe–Ito black should be white")
	}
	if inkOn(Viridis(0)) != color.White || inkOn(Viridis(1)) != color.Black {
		t.Error("text on viridis ends should be white on purple, black on yellow")
	}
}
