package main

import (
	"bytes"
	"encoding/binary"
	"image"
	"image/color"
	"image/png"
	"testing"
)

// halfRed is an n×n image whose left half is opaque red and right half
// fully transparent.
func halfRed(n int) *image.NRGBA {
	img := image.NewNRGBA(image.Rect(0, 0, n, n))
	for y := 0; y < n; y++ {
		for x := 0; x < n/2; x++ {
			img.SetNRGBA(x, y, color.NRGBA{R: 255, A: 255})
		}
	}
	return img
}

// TestWriteIcon reads the .ico back by its published layout (Microsoft,
// "Icons": ICONDIR of reserved 0, type 1, count; 16-byte ICONDIRENTRY with
// width, height (0 = 256), planes, bit count, size and offset) and decodes
// each image with the standard library's PNG decoder.
func TestWriteIcon(t *testing.T) {
	t.Parallel()
	var buf bytes.Buffer
	sizes := []int{16, 48, 256}
	if err := writeIcon(&buf, halfRed(512), sizes); err != nil {
		t.Fatal(err)
	}
	b := buf.Bytes()
	le := binary.LittleEndian
	if le.Uint16(b[0:]) != 0 || le.Uint16(b[2:]) != 1 || int(le.Uint16(b[4:])) != len(sizes) {
		t.Fatalf("header % x", b[:6])
	}
	for i, s := range sizes {
		e := b[6+16*i:]
		w := int(e[0])
		if w == 0 {
			w = 256
		}
		if w != s || int(e[1]) != int(e[0]) || le.Uint16(e[4:]) != 1 || le.Uint16(e[6:]) != 32 {
			t.Errorf("entry %d: % x", i, e[:16])
		}
		size, off := le.Uint32(e[8:]), le.Uint32(e[12:])
		if int(off+size) > len(b) {
			t.Fatalf("entry %d points past the file", i)
		}
		img, err := png.Decode(bytes.NewReader(b[off : off+size]))
		if err != nil {
			t.Fatalf("entry %d: %v", i, err)
		}
		if img.Bounds().Dx() != s || img.Bounds().Dy() != s {
			t.Errorf("entry %d is %v, want %d×%d", i, img.Bounds(), s, s)
		}
		left := color.NRGBAModel.Convert(img.At(s/4, s/2)).(color.NRGBA)
		right := color.NRGBAModel.Convert(img.At(3*s/4, s/2)).(color.NRGBA)
		if left != (color.NRGBA{R: 255, A: 255}) || right.A != 0 {
			t.Errorf("size %d: left %v right %v, want opaque red and transparent", s, left, right)
		}
	}
}

// TestScaleDownAveragesArea: scaling 3×3 to 2×2 covers source pixels by
// parts; a pixel half-covered by opaque red and half by transparent is red
// at half opacity (premultiplied averaging keeps the colour).
func TestScaleDownAveragesArea(t *testing.T) {
	t.Parallel()
	src := image.NewNRGBA(image.Rect(0, 0, 4, 4))
	for y := 0; y < 4; y++ {
		src.SetNRGBA(1, y, color.NRGBA{R: 255, A: 255}) // column 1 of 4: half of target column 0
	}
	got := scaleDown(src, 2).NRGBAAt(0, 0)
	if got.R != 255 || got.A != 128 {
		t.Errorf("got %v, want red at alpha 128", got)
	}
	if got := scaleDown(src, 2).NRGBAAt(1, 0); got.A != 0 {
		t.Errorf("right half: %v, want transparent", got)
	}
	if err := writeIcon(&bytes.Buffer{}, image.NewNRGBA(image.Rect(0, 0, 4, 3)), []int{2}); err == nil {
		t.Error("a non-square image: no error")
	}
}
