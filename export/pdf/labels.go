package pdf

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	qrcode "github.com/skip2/go-qrcode"

	"furlong/trial"
)

// Barcode is the symbology printed on plot labels.
type Barcode string

// Barcodes.
const (
	Code128 Barcode = "code128" // a linear code; any handheld scanner reads it
	QR      Barcode = "qr"      // a square code; phone cameras read it too
)

// Sheet is the geometry of a sheet of labels, in millimetres.
type Sheet struct {
	Paper      Paper
	Cols, Rows int
	// Top and Left are the margins to the first label; Width and Height
	// the size of one label (0: the space between the margins shared out);
	// GapX and GapY the spaces between labels.
	Top, Left, Width, Height, GapX, GapY float64
}

// SheetPresets are common label sheet geometries, named by paper and
// columns × rows (common practice for office label stock).
var SheetPresets = map[string]Sheet{
	"a4-3x8":      {Paper: A4, Cols: 3, Rows: 8, Top: 4.5, Left: 0, Width: 70, Height: 36, GapX: 0, GapY: 0},
	"a4-2x7":      {Paper: A4, Cols: 2, Rows: 7, Top: 15.1, Left: 4.65, Width: 99.1, Height: 38.1, GapX: 2.5, GapY: 0},
	"a4-2x4":      {Paper: A4, Cols: 2, Rows: 4, Top: 12.9, Left: 4.65, Width: 99.1, Height: 67.7, GapX: 2.5, GapY: 0},
	"letter-3x10": {Paper: Letter, Cols: 3, Rows: 10, Top: 12.7, Left: 4.76, Width: 66.68, Height: 25.4, GapX: 3.18, GapY: 0},
	"letter-2x5":  {Paper: Letter, Cols: 2, Rows: 5, Top: 12.7, Left: 4.76, Width: 101.6, Height: 50.8, GapX: 3.18, GapY: 0},
}

// PresetNames lists SheetPresets in a stable order.
func PresetNames() []string {
	return []string{"a4-3x8", "a4-2x7", "a4-2x4", "letter-3x10", "letter-2x5"}
}

// LabelOptions control WriteLabels.
type LabelOptions struct {
	Sheet   Sheet
	Barcode Barcode // Code128 (default) or QR
	// Skip leaves this many labels of the first sheet empty, for a sheet
	// already partly used.
	Skip int
}

// resolve fills a sheet's label size and checks that the labels fit the
// paper.
func (s Sheet) resolve() (Sheet, error) {
	if s.Cols < 1 || s.Rows < 1 || s.Cols > 20 || s.Rows > 40 {
		return s, fmt.Errorf("a label sheet needs 1 to 20 columns and 1 to 40 rows, not %d × %d", s.Cols, s.Rows)
	}
	for _, v := range []float64{s.Top, s.Left, s.Width, s.Height, s.GapX, s.GapY} {
		if !(v >= 0) || math.IsInf(v, 0) {
			return s, fmt.Errorf("label margins, sizes and gaps must be 0 mm or more")
		}
	}
	pw, ph := s.Paper.size()
	if s.Width == 0 {
		left := s.Left
		if left == 0 {
			left = 5
			s.Left = left
		}
		s.Width = (pw - 2*left - float64(s.Cols-1)*s.GapX) / float64(s.Cols)
	}
	if s.Height == 0 {
		top := s.Top
		if top == 0 {
			top = 10
			s.Top = top
		}
		s.Height = (ph - 2*top - float64(s.Rows-1)*s.GapY) / float64(s.Rows)
	}
	if s.Left+float64(s.Cols)*s.Width+float64(s.Cols-1)*s.GapX > pw+0.5 ||
		s.Top+float64(s.Rows)*s.Height+float64(s.Rows-1)*s.GapY > ph+0.5 {
		return s, fmt.Errorf("%d × %d labels of %s × %s mm do not fit on %s paper with these margins and gaps",
			s.Cols, s.Rows, num(s.Width, 1), num(s.Height, 1), s.Paper)
	}
	if s.Width < 25 || s.Height < 12 {
		return s, fmt.Errorf("labels of %s × %s mm are too small for a readable barcode; use at least 25 × 12 mm (fewer columns or rows)",
			num(s.Width, 1), num(s.Height, 1))
	}
	return s, nil
}

// WriteLabels writes one label per plot, in walking order (the order of
// t.Plots, the field book's), on sheets of labels: the plot number large,
// the block and treatment code, the trial title, and a barcode of the plot
// number, which a scanner types back as the number followed by Enter.
func WriteLabels(w io.Writer, t *trial.Trial, opts LabelOptions) error {
	s, err := opts.Sheet.resolve()
	if err != nil {
		return err
	}
	if len(t.Plots) == 0 {
		return fmt.Errorf("the trial has no plots yet: lay it out in the Field step (or with 'furlong new') first")
	}
	bc := opts.Barcode
	if bc == "" {
		bc = Code128
	}
	if bc != Code128 && bc != QR {
		return fmt.Errorf("the barcode must be code128 or qr, not %q", bc)
	}
	if opts.Skip < 0 || opts.Skip >= s.Cols*s.Rows {
		return fmt.Errorf("labels to skip must be between 0 and %d (one sheet less one)", s.Cols*s.Rows-1)
	}
	d := newDoc(s.Paper, "")
	d.SetTitle(trialTitle(t)+": plot labels", true)
	d.SetAutoPageBreak(false, 0)
	d.SetMargins(0, 0, 0)
	per := s.Cols * s.Rows
	title := trialTitle(t)
	blockWord := "Block"
	if t.Design.Kind == trial.Latin {
		blockWord = "Row"
	}
	for i, p := range t.Plots {
		k := i + opts.Skip
		if k%per == 0 || i == 0 {
			d.AddPage()
		}
		slot := k % per
		x := s.Left + float64(slot%s.Cols)*(s.Width+s.GapX)
		y := s.Top + float64(slot/s.Cols)*(s.Height+s.GapY)
		info := blockWord + " " + strconv.Itoa(p.Block) + " · " + p.Treatment
		if t.Design.Kind == trial.CRD {
			info = p.Treatment
		}
		if err := drawLabel(d, x, y, s.Width, s.Height, strconv.Itoa(p.Number), info, title, bc); err != nil {
			return err
		}
	}
	return d.finish(w)
}

// drawLabel draws one label in the box (x, y, w, h).
func drawLabel(d *doc, x, y, w, h float64, number, info, title string, bc Barcode) error {
	pad := math.Min(3, h*0.08)
	ix, iy, iw, ih := x+pad, y+pad, w-2*pad, h-2*pad
	// Title on the top line, small.
	tsize := math.Min(7.5, ih*0.16/0.3528)
	d.font(false, tsize)
	d.SetXY(ix, iy)
	d.CellFormat(iw, tsize*0.3528*1.2, fit(d, title, iw), "", 0, "L", false, 0, "")
	top := iy + tsize*0.3528*1.35
	rest := ih - (top - iy)
	if bc == QR {
		// QR at the right, the text at the left.
		side := math.Min(rest, iw*0.45)
		if err := drawQR(d, number, ix+iw-side, top+(rest-side)/2, side); err != nil {
			return err
		}
		tw := iw - side - 2
		nsize := math.Min(rest*0.55/0.3528, 28)
		d.font(true, nsize)
		for d.GetStringWidth(number) > tw && nsize > 8 {
			nsize--
			d.font(true, nsize)
		}
		d.SetXY(ix, top)
		d.CellFormat(tw, nsize*0.3528*1.1, number, "", 0, "L", false, 0, "")
		isize := math.Min(nsize*0.5, 10)
		d.font(false, isize)
		d.SetXY(ix, top+nsize*0.3528*1.2)
		d.CellFormat(tw, isize*0.3528*1.2, fit(d, info, tw), "", 0, "L", false, 0, "")
		return nil
	}
	// Code 128: number and information on one line, the bars under them.
	nsize := math.Min(rest*0.38/0.3528, 24)
	d.font(true, nsize)
	d.SetXY(ix, top)
	nw := d.GetStringWidth(number) + 2
	d.CellFormat(nw, nsize*0.3528*1.05, number, "", 0, "L", false, 0, "")
	isize := math.Min(nsize*0.5, 10)
	d.font(false, isize)
	d.SetXY(ix+nw, top+nsize*0.3528*1.05-isize*0.3528*1.3)
	d.CellFormat(iw-nw, isize*0.3528*1.2, fit(d, info, iw-nw), "", 0, "R", false, 0, "")
	by := top + nsize*0.3528*1.15
	bh := iy + ih - by
	return drawCode128(d, number, ix, by, iw, bh)
}

// drawCode128 draws the Code 128 barcode of s centred in (x, y, w, h), with
// quiet zones of 10 modules each side.
func drawCode128(d *doc, s string, x, y, w, h float64) error {
	widths, err := code128(s)
	if err != nil {
		return err
	}
	modules := 20
	for _, m := range widths {
		modules += m
	}
	mod := math.Min(w/float64(modules), 0.5) // 0.5 mm modules at most
	if mod < 0.19 {
		return fmt.Errorf("the label is too narrow for the barcode of plot %s: make the labels wider", s)
	}
	bx := x + (w-mod*float64(modules-20))/2
	d.SetFillColor(0, 0, 0)
	for i, m := range widths {
		if i%2 == 0 {
			d.Rect(bx, y, mod*float64(m), h, "F")
		}
		bx += mod * float64(m)
	}
	return nil
}

// drawQR draws the QR code (error correction M, 4-module quiet zone) of s
// as a side × side square at (x, y).
func drawQR(d *doc, s string, x, y, side float64) error {
	q, err := qrcode.New(s, qrcode.Medium)
	if err != nil {
		return fmt.Errorf("the QR code of plot %s could not be made: %w", s, err)
	}
	bm := q.Bitmap()
	n := len(bm)
	if n == 0 {
		return fmt.Errorf("the QR code of plot %s is empty", s)
	}
	m := side / float64(n)
	d.SetFillColor(0, 0, 0)
	for r, row := range bm {
		for c, on := range row {
			if on {
				// A hair wider than the module so neighbours join without seams.
				d.Rect(x+float64(c)*m, y+float64(r)*m, m+0.01, m+0.01, "F")
			}
		}
	}
	return nil
}

// ParseSheet reads "COLSxROWS" (for example "3x8").
func ParseSheet(s string) (cols, rows int, err error) {
	a, b, ok := strings.Cut(strings.ToLower(strings.TrimSpace(s)), "x")
	if ok {
		cols, err1 := strconv.Atoi(strings.TrimSpace(a))
		rows, err2 := strconv.Atoi(strings.TrimSpace(b))
		if err1 == nil && err2 == nil && cols > 0 && rows > 0 {
			return cols, rows, nil
		}
	}
	return 0, 0, fmt.Errorf("the sheet must be columns x rows, for example 3x8, not %q", s)
}
