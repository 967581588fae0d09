package main

import (
	"bytes"
	"encoding/binary"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"io"
	"os"
)

// iconSizes are the sizes Windows picks from for Explorer, the taskbar and
// the title bar at 100–200 % display scaling (Microsoft, "Icons" design
// guidelines: 16, 24, 32, 48 and 256 pixels, with 20, 40, 64 for scaling).
var iconSizes = []int{16, 20, 24, 32, 40, 48, 64, 256}

func writeIconFile(in, out string) error {
	f, err := os.Open(in)
	if err != nil {
		return err
	}
	defer f.Close()
	src, err := png.Decode(f)
	if err != nil {
		return fmt.Errorf("%s: %w", in, err)
	}
	var buf bytes.Buffer
	if err := writeIcon(&buf, src, iconSizes); err != nil {
		return fmt.Errorf("%s: %w", in, err)
	}
	return os.WriteFile(out, buf.Bytes(), 0o644)
}

// writeIcon writes an .ico file (Microsoft, "Icons", ICONDIR and
// ICONDIRENTRY: a 6-byte header, one 16-byte entry per image, then the
// images) with one PNG-compressed image per size, as Windows Vista and
// later read them. The source is scaled down by area averaging.
func writeIcon(w io.Writer, src image.Image, sizes []int) error {
	b := src.Bounds()
	if b.Dx() != b.Dy() {
		return fmt.Errorf("the icon image is %d×%d; it must be square", b.Dx(), b.Dy())
	}
	var imgs [][]byte
	for _, s := range sizes {
		if s < 1 || s > 256 || s > b.Dx() {
			return fmt.Errorf("icon size %d: must be 1 to 256 and at most the image's %d pixels", s, b.Dx())
		}
		var p bytes.Buffer
		if err := png.Encode(&p, scaleDown(src, s)); err != nil {
			return err
		}
		imgs = append(imgs, p.Bytes())
	}
	hdr := []uint16{0, 1, uint16(len(sizes))} // reserved, type 1 = icon, count
	if err := binary.Write(w, binary.LittleEndian, hdr); err != nil {
		return err
	}
	off := 6 + 16*len(sizes)
	for i, s := range sizes {
		dim := uint8(s)
		if s == 256 {
			dim = 0 // 0 means 256
		}
		e := struct {
			W, H, Colours, Reserved uint8
			Planes, Bits            uint16
			Size, Offset            uint32
		}{dim, dim, 0, 0, 1, 32, uint32(len(imgs[i])), uint32(off)}
		if err := binary.Write(w, binary.LittleEndian, e); err != nil {
			return err
		}
		off += len(imgs[i])
	}
	for _, p := range imgs {
		if _, err := w.Write(p); err != nil {
			return err
		}
	}
	return nil
}

// scaleDown resizes a square image to n×n pixels: each target pixel is the
// mean of the source area it covers (fractional pixels weighted by the part
// covered), in premultiplied alpha so that transparent edges do not darken.
func scaleDown(src image.Image, n int) *image.NRGBA {
	b := src.Bounds()
	scale := float64(b.Dx()) / float64(n)
	dst := image.NewNRGBA(image.Rect(0, 0, n, n))
	// weights[i] lists the source columns (or rows) under target column i.
	type span struct {
		at int
		w  float64
	}
	weights := make([][]span, n)
	for i := range weights {
		lo, hi := float64(i)*scale, float64(i+1)*scale
		for s := int(lo); s < b.Dx() && float64(s) < hi; s++ {
			w := min(hi, float64(s+1)) - max(lo, float64(s))
			if w > 0 {
				weights[i] = append(weights[i], span{s, w})
			}
		}
	}
	area := scale * scale
	for y := 0; y < n; y++ {
		for x := 0; x < n; x++ {
			var r, g, bl, a float64
			for _, wy := range weights[y] {
				for _, wx := range weights[x] {
					c := color.RGBA64Model.Convert(src.At(b.Min.X+wx.at, b.Min.Y+wy.at)).(color.RGBA64)
					w := wx.w * wy.w
					r += w * float64(c.R)
					g += w * float64(c.G)
					bl += w * float64(c.B)
					a += w * float64(c.A)
				}
			}
			r, g, bl, a = r/area, g/area, bl/area, a/area
			px := color.NRGBA{}
			if a > 0 {
				px = color.NRGBA{R: to8(r * 0xffff / a), G: to8(g * 0xffff / a), B: to8(bl * 0xffff / a), A: to8(a)}
			}
			dst.SetNRGBA(x, y, px)
		}
	}
	return dst
}

// to8 rounds a 16-bit channel value to 8 bits.
func to8(v float64) uint8 {
	v = v/257 + 0.5
	if v > 255 {
		return 255
	}
	if v < 0 {
		return 0
	}
	return uint8(v)
}
