package chart

import (
	"errors"
	"fmt"
	"image"
	"io"
	"math"
	"strings"
	"unicode/utf8"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgpdf"
	"gonum.org/v1/plot/vg/vgsvg"
)

// ScreenDPI is the resolution Save uses for PNG output: 96 dots per inch,
// so that one point is 4/3 pixels.
const ScreenDPI = 96

// ErrFormat is returned by Save for a file format it cannot write.
var ErrFormat = errors.New("charts can be saved as PNG, SVG or PDF only")

// ErrSize is returned by Save for a page with no area.
var ErrSize = errors.New("the chart needs a width and a height greater than zero")

// A4Landscape returns the size of an A4 sheet in landscape, 297 mm × 210 mm
// (ISO 216).
func A4Landscape() (width, height vg.Length) {
	return 297 * vg.Millimeter, 210 * vg.Millimeter
}

// LetterLandscape returns the size of a US Letter sheet in landscape,
// 11 in × 8.5 in.
func LetterLandscape() (width, height vg.Length) {
	return 11 * vg.Inch, 8.5 * vg.Inch
}

// Save draws p at width × height and writes it to w as "png", "svg" or
// "pdf" (case-insensitive). PNG is rendered at ScreenDPI.
//
// The PDF backend encodes text as single bytes, so Save spells non-ASCII
// characters in ASCII there ("±" as "+/-", "α" as "alpha", "é" as "e");
// PNG and SVG keep the text as it is.
func Save(p *plot.Plot, w io.Writer, format string, width, height vg.Length) error {
	return save(p, w, format, width, height, ScreenDPI)
}

// SavePNG draws p at width × height and writes it to w as a PNG image at
// dpi dots per inch.
func SavePNG(p *plot.Plot, w io.Writer, width, height vg.Length, dpi int) error {
	if dpi <= 0 {
		return fmt.Errorf("the image resolution must be at least 1 dot per inch, not %d", dpi)
	}
	return save(p, w, "png", width, height, dpi)
}

// SaveA4 writes p as an A4 landscape page in the given format; see Save.
func SaveA4(p *plot.Plot, w io.Writer, format string) error {
	width, height := A4Landscape()
	return Save(p, w, format, width, height)
}

// Image renders p as an image of widthPx × heightPx pixels at ScreenDPI,
// for display in a window.
func Image(p *plot.Plot, widthPx, heightPx int) image.Image {
	return ImageScaled(p, widthPx, heightPx, 1)
}

// ImageScaled renders p as an image of widthPx × heightPx pixels for a
// screen whose scale is the number of pixels per device-independent pixel
// (a window's canvas scale): text and lines keep their size in
// device-independent pixels, so a chart drawn at the size of the widget
// showing it is neither blurred nor shrunk. A scale that is not positive
// counts as 1.
func ImageScaled(p *plot.Plot, widthPx, heightPx int, scale float64) image.Image {
	if widthPx <= 0 || heightPx <= 0 {
		panic("chart: Image with a non-positive size")
	}
	if !(scale > 0) || math.IsInf(scale, 0) {
		scale = 1
	}
	dpi := max(1, math.Round(ScreenDPI*scale))
	px := vg.Inch / vg.Length(dpi)
	c := vgimg.NewWith(vgimg.UseWH(vg.Length(widthPx)*px, vg.Length(heightPx)*px), vgimg.UseDPI(int(dpi)))
	p.Draw(draw.New(c))
	return c.Image()
}

func save(p *plot.Plot, w io.Writer, format string, width, height vg.Length, dpi int) error {
	if p == nil {
		panic("chart: Save of a nil plot")
	}
	if !(width > 0) || !(height > 0) {
		return ErrSize
	}
	var c vg.CanvasWriterTo
	switch strings.ToLower(strings.TrimPrefix(format, ".")) {
	case "png":
		c = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(dpi))}
	case "svg":
		c = vgsvg.New(width, height)
	case "pdf":
		c = asciiCanvas{vgpdf.New(width, height)}
	default:
		return ErrFormat
	}
	p.Draw(draw.New(c))
	_, err := c.WriteTo(w)
	return err
}

// asciiCanvas spells every string it draws in ASCII.
type asciiCanvas struct{ vg.CanvasWriterTo }

func (c asciiCanvas) FillString(f font.Face, pt vg.Point, s string) {
	c.CanvasWriterTo.FillString(f, pt, ASCII(s))
}

// asciiSpelling maps characters that appear in trial text to ASCII.
var asciiSpelling = map[rune]string{
	'±': "+/-", '−': "-", '–': "-", '—': "-", '‐': "-", '×': "x", '÷': "/",
	'α': "alpha", 'β': "beta", 'μ': "u", 'µ': "u", 'σ': "sigma", 'χ': "chi",
	'≤': "<=", '≥': ">=", '≠': "!=", '≈': "~", '°': " deg", '²': "2", '³': "3",
	'¹': "1", '½': "1/2", '¼': "1/4", '¾': "3/4", '·': ".", '•': "*", '…': "...",
	'‘': "'", '’': "'", '‚': ",", '“': "\"", '”': "\"", '„': "\"", '«': "\"", '»': "\"",
	'↑': "^", '↓': "v", '→': "->", '←': "<-", '√': "sqrt",
	'ß': "ss", 'æ': "ae", 'Æ': "AE", 'œ': "oe", 'Œ': "OE", 'ø': "o", 'Ø': "O",
	'å': "a", 'Å': "A", 'ð': "d", 'Ð': "D", 'þ': "th", 'Þ': "Th", 'ł': "l", 'Ł': "L",
	'\u00a0': " ", '\u2009': " ", '\u202f': " ",
}

// asciiBase gives the unaccented letter of accented Latin letters.
var asciiBase = func() map[rune]rune {
	groups := map[rune]string{
		'a': "àáâãäāăą", 'A': "ÀÁÂÃÄĀĂĄ", 'c': "çćčĉ", 'C': "ÇĆČĈ",
		'e': "èéêëēėęě", 'E': "ÈÉÊËĒĖĘĚ", 'i': "ìíîïīį", 'I': "ÌÍÎÏĪĮİ",
		'n': "ñńň", 'N': "ÑŃŇ", 'o': "òóôõöōő", 'O': "ÒÓÔÕÖŌŐ",
		'u': "ùúûüūůű", 'U': "ÙÚÛÜŪŮŰ", 'y': "ýÿ", 'Y': "ÝŸ",
		's': "śšş", 'S': "ŚŠŞ", 'z': "źżž", 'Z': "ŹŻŽ", 'r': "ř", 'R': "Ř",
		'g': "ğ", 'G': "Ğ", 'd': "ď", 'D': "Ď", 't': "ťţ", 'T': "ŤŢ",
	}
	m := make(map[rune]rune)
	for base, letters := range groups {
		for _, r := range letters {
			m[r] = base
		}
	}
	return m
}()

// ASCII spells s in printable ASCII: common symbols get an ASCII spelling
// ("±" → "+/-"), accented letters lose their accents, anything else becomes
// "?". Save applies it to PDF text.
func ASCII(s string) string {
	ascii := true
	for i := 0; i < len(s); i++ {
		if s[i] >= utf8.RuneSelf {
			ascii = false
			break
		}
	}
	if ascii {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		switch {
		case r < utf8.RuneSelf:
			b.WriteRune(r)
		case asciiSpelling[r] != "":
			b.WriteString(asciiSpelling[r])
		case asciiBase[r] != 0:
			b.WriteRune(asciiBase[r])
		default:
			b.WriteByte('?')
		}
	}
	return b.String()
}
