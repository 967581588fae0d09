package chart

import (
	"bytes"
	"compress/zlib"
	"errors"
	"image/png"
	"io"
	"regexp"
	"testing"

	"gonum.org/v1/plot/vg"

	"furlong/stats/meansep"
)

func TestSavePNGSize(t *testing.T) {
	t.Parallel()
	p, err := Means(fixtureTrial(), fixtureResult(), MeansOptions{Letters: meansep.Tukey})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		w, h   vg.Length
		dpi    int
		px, py int
	}{
		// 6 in × 4 in at 96 and 150 dots per inch: 576 × 384 and 900 × 600
		// pixels (hand-computed).
		{6 * vg.Inch, 4 * vg.Inch, 96, 576, 384},
		{6 * vg.Inch, 4 * vg.Inch, 150, 900, 600},
	} {
		var buf bytes.Buffer
		var err error
		if c.dpi == ScreenDPI {
			err = Save(p, &buf, "png", c.w, c.h)
		} else {
			err = SavePNG(p, &buf, c.w, c.h, c.dpi)
		}
		if err != nil {
			t.Fatal(err)
		}
		img, err := png.Decode(&buf)
		if err != nil {
			t.Fatalf("PNG does not decode: %v", err)
		}
		if b := img.Bounds(); b.Dx() != c.px || b.Dy() != c.py {
			t.Errorf("%d dpi: image %v, want %d × %d", c.dpi, b, c.px, c.py)
		}
	}
	// A4 landscape, ISO 216: 297 mm × 210 mm is 11.693 in × 8.268 in, at
	// 96 dpi 1122.5 × 793.7 pixels; the backend rounds to 1123 × 794.
	img, err := png.Decode(bytes.NewReader(render(t, p, "png")))
	if err != nil {
		t.Fatal(err)
	}
	if b := img.Bounds(); b.Dx() != 1123 || b.Dy() != 794 {
		t.Errorf("A4 image %v, want 1123 × 794", b)
	}
	if im := Image(p, 320, 200); im.Bounds().Dx() != 320 || im.Bounds().Dy() != 200 {
		t.Errorf("Image size %v, want 320 × 200", im.Bounds())
	}
}

var (
	pdfStream = regexp.MustCompile(`(?s)stream\r?\n(.*?)\r?\nendstream`)
	pdfShown  = regexp.MustCompile(`\(((?:[^()\\]|\\.)*)\)\s*Tj`)
)

// pdfContent returns the PDF's objects outside streams and its page content
// streams, inflated; font programs (binary) are left out.
func pdfContent(t *testing.T, pdf []byte) []byte {
	t.Helper()
	out := pdfStream.ReplaceAll(pdf, nil)
	for _, m := range pdfStream.FindAllSubmatch(pdf, -1) {
		b := m[1]
		if zr, err := zlib.NewReader(bytes.NewReader(m[1])); err == nil {
			b, _ = io.ReadAll(zr)
		}
		if bytes.Contains(b, []byte("BT")) && bytes.Contains(b, []byte("Tj")) {
			out = append(out, b...)
		}
	}
	return out
}

func TestSavePDFText(t *testing.T) {
	t.Parallel()
	tr := fixtureTrial()
	tr.Title = "Essai de maïs, Ferme Brûlée 2026" // invented; accented letters
	p, err := Means(tr, fixtureResult(), MeansOptions{Letters: meansep.Tukey})
	if err != nil {
		t.Fatal(err)
	}
	pdf := render(t, p, "pdf")
	if !bytes.HasPrefix(pdf, []byte("%PDF")) {
		t.Fatalf("PDF starts %q", pdf[:8])
	}
	all := pdfContent(t, pdf)
	// The strings shown by the content streams' Tj operators. "Â" is how
	// the single-byte PDF fonts show the first byte of a UTF-8 "±" (U+00B1
	// is C2 B1; C2 is "Â" in Latin-1, ISO 8859-1): every string must be
	// ASCII.
	shown := pdfShown.FindAllSubmatch(all, -1)
	if len(shown) < 10 {
		t.Fatalf("only %d text strings found in the PDF", len(shown))
	}
	var texts []string
	for _, m := range shown {
		s := string(m[1])
		texts = append(texts, s)
		for i := 0; i < len(s); i++ {
			if s[i] >= 0x80 {
				t.Errorf("PDF text %q is not ASCII", s)
				break
			}
		}
	}
	if bytes.Contains(all, []byte("Â")) {
		t.Error(`PDF contains "Â"`)
	}
	for _, want := range []string{"Error bars: +/- 1 SE", "Letters: Tukey HSD, alpha = 5%.", "Essai de mais, Ferme Brulee 2026"} {
		if countText(texts, want) != 1 {
			t.Errorf("PDF text %q missing; have %q", want, texts)
		}
	}
	// SVG keeps the text as it is.
	svg := render(t, p, "svg")
	if countText(svgTexts(svg), "Error bars: ± 1 SE") != 1 {
		t.Error("SVG lost the ± sign")
	}
}

func TestSaveErrors(t *testing.T) {
	t.Parallel()
	p, err := FieldMap(fixtureTrial(), FieldMapOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := Save(p, &buf, "gif", vg.Inch, vg.Inch); !errors.Is(err, ErrFormat) {
		t.Errorf("gif: %v, want ErrFormat", err)
	}
	if err := Save(p, &buf, "png", 0, vg.Inch); !errors.Is(err, ErrSize) {
		t.Errorf("zero width: %v, want ErrSize", err)
	}
	if err := SavePNG(p, &buf, vg.Inch, vg.Inch, 0); err == nil {
		t.Error("0 dpi accepted")
	}
	buf.Reset()
	if err := SaveA4(p, &buf, "SVG"); err != nil || !bytes.Contains(buf.Bytes(), []byte("<svg")) {
		t.Errorf("SaveA4 SVG: %v", err)
	}
}

func TestA4AndLetter(t *testing.T) {
	t.Parallel()
	// ISO 216 A4: 210 mm × 297 mm; 1 in = 25.4 mm = 72 pt.
	w, h := A4Landscape()
	if d := w.Points() - 297/25.4*72; d*d > 1e-18 {
		t.Errorf("A4 width %g pt, want %g", w.Points(), 297/25.4*72)
	}
	if d := h.Points() - 210/25.4*72; d*d > 1e-18 {
		t.Errorf("A4 height %g pt", h.Points())
	}
	// US Letter: 8.5 in × 11 in = 612 pt × 792 pt.
	if w, h := LetterLandscape(); w.Points() != 792 || h.Points() != 612 {
		t.Errorf("Letter %g × %g pt, want 792 × 612", w.Points(), h.Points())
	}
}

func TestASCII(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ in, want string }{
		{"± 1 SE", "+/- 1 SE"},
		{"α = 5%", "alpha = 5%"},
		{"seeds/m²", "seeds/m2"},
		{"Müller Çiftliği", "Muller Ciftligi"},
		{"N ↑", "N ^"},
		{"plain", "plain"},
		{"漢", "?"},
	} {
		if got := ASCII(c.in); got != c.want {
			t.Errorf("ASCII(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}
