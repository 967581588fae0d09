// Package pdf writes Furlong's printable documents as PDF: the season report
// (for readers who never open a spreadsheet), sheets of plot labels with
// barcodes for stakes and seed bags, and the field map with its dimensions.
//
// Text and tables are laid out with codeberg.org/go-pdf/fpdf, already in the
// build through gonum/plot's PDF backend; text is set in Liberation Sans
// embedded as a UTF-8 TrueType font, so ±, ×, é and – print as typed.
// Charts are drawn by export/chart and placed as PNG images.
package pdf

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strings"

	"codeberg.org/go-fonts/liberation/liberationsansbold"
	"codeberg.org/go-fonts/liberation/liberationsansregular"
	"codeberg.org/go-pdf/fpdf"
)

// Paper is the sheet size of a document.
type Paper int

// Paper sizes.
const (
	A4     Paper = iota // 210 mm × 297 mm (ISO 216)
	Letter              // 8.5 in × 11 in
)

// String names the paper as the command line does.
func (p Paper) String() string {
	if p == Letter {
		return "letter"
	}
	return "a4"
}

// size returns the portrait width and height in millimetres.
func (p Paper) size() (w, h float64) {
	if p == Letter {
		return 215.9, 279.4
	}
	return 210, 297
}

const (
	fontName = "LiberationSans"
	margin   = 15.0 // mm, every side of a report page
	bodyPt   = 9.0
	lineMM   = 4.6
)

// doc is an fpdf document with Furlong's fonts and footer.
type doc struct {
	*fpdf.Fpdf
	paper   Paper
	footer  string // left part of the footer; "" for none
	imageNo int
}

// newDoc starts a document on paper, portrait. With footer != "" every page
// carries it and "page N of M" at the foot.
func newDoc(paper Paper, footer string) *doc {
	w, h := paper.size()
	f := fpdf.NewCustom(&fpdf.InitType{
		OrientationStr: "P", UnitStr: "mm", Size: fpdf.SizeType{Wd: w, Ht: h},
	})
	d := &doc{Fpdf: f, paper: paper, footer: footer}
	f.AddUTF8FontFromBytes(fontName, "", liberationsansregular.TTF)
	f.AddUTF8FontFromBytes(fontName, "B", liberationsansbold.TTF)
	f.SetMargins(margin, margin, margin)
	f.SetAutoPageBreak(true, margin+4)
	f.SetCreator("Furlong", true)
	if footer != "" {
		f.AliasNbPages("{nb}")
		f.SetFooterFunc(func() {
			f.SetY(-margin + 2)
			d.font(false, 7.5)
			f.SetTextColor(90, 90, 90)
			pw, _ := f.GetPageSize()
			left, _, right, _ := f.GetMargins()
			f.CellFormat((pw-left-right)*0.75, 4, fit(d, d.footer, (pw-left-right)*0.75), "", 0, "L", false, 0, "")
			f.CellFormat((pw-left-right)*0.25, 4, fmt.Sprintf("page %d of {nb}", f.PageNo()), "", 0, "R", false, 0, "")
			f.SetTextColor(0, 0, 0)
		})
	}
	return d
}

// font sets Liberation Sans, bold or regular, at size points.
func (d *doc) font(bold bool, size float64) {
	style := ""
	if bold {
		style = "B"
	}
	d.SetFont(fontName, style, size)
}

// contentWidth is the width between the margins of the current page.
func (d *doc) contentWidth() float64 {
	w, _ := d.GetPageSize()
	l, _, r, _ := d.GetMargins()
	return w - l - r
}

// bottom is the lowest y that content may reach on the current page.
func (d *doc) bottom() float64 {
	_, h := d.GetPageSize()
	return h - margin - 4
}

// heading writes a title line.
func (d *doc) heading(s string, size float64) {
	d.font(true, size)
	d.MultiCell(0, size*0.5, s, "", "L", false)
	d.Ln(1.5)
}

// section writes a section title, keeping it with at least need mm after it.
func (d *doc) section(s string, need float64) {
	if d.GetY()+8+need > d.bottom() {
		d.AddPage()
	}
	d.Ln(2)
	d.font(true, 11)
	d.CellFormat(0, 6, s, "", 1, "L", false, 0, "")
	d.font(false, bodyPt)
}

// para writes wrapped text.
func (d *doc) para(s string, bold bool, size float64) {
	d.font(bold, size)
	d.MultiCell(0, size*0.45+0.6, s, "", "L", false)
	d.font(false, bodyPt)
}

// note writes a small grey wrapped line.
func (d *doc) note(s string) {
	d.SetTextColor(70, 70, 70)
	d.para(s, false, 8)
	d.SetTextColor(0, 0, 0)
}

// png places a PNG image at (x, y) w mm wide and h mm high.
func (d *doc) png(data []byte, x, y, w, h float64) error {
	d.imageNo++
	name := fmt.Sprintf("img%d", d.imageNo)
	d.RegisterImageOptionsReader(name, fpdf.ImageOptions{ImageType: "PNG"}, bytes.NewReader(data))
	if err := d.Error(); err != nil {
		return err
	}
	d.ImageOptions(name, x, y, w, h, false, fpdf.ImageOptions{ImageType: "PNG"}, 0, "")
	return d.Error()
}

// finish writes the document to w.
func (d *doc) finish(w io.Writer) error {
	if err := d.Error(); err != nil {
		return fmt.Errorf("the PDF could not be written: %w", err)
	}
	return d.Output(w)
}

// fit shortens s with an ellipsis until it is at most w mm wide in the
// current font.
func fit(d *doc, s string, w float64) string {
	const slack = 0.05 // mm: widths measured for the same text may differ by rounding
	if d.GetStringWidth(s) <= w+slack {
		return s
	}
	r := []rune(s)
	for len(r) > 1 {
		r = r[:len(r)-1]
		if t := strings.TrimRight(string(r), " ") + "…"; d.GetStringWidth(t) <= w+slack {
			return t
		}
	}
	return ""
}

// table is a grid of text cells with a header row.
type table struct {
	heads  []string
	right  []bool // right-align the column (numbers)
	rows   [][]string
	bold   []bool // per row
	size   float64
	maxCol float64 // widest a column may be, mm (0: no limit)
}

// draw writes t at the current position, across the page width at most,
// repeating the header on each new page.
func (d *doc) table(t table) {
	if t.size == 0 {
		t.size = 8.5
	}
	n := len(t.heads)
	if n == 0 {
		return
	}
	pad := 1.6
	widths := make([]float64, n)
	// A header may wrap at its spaces: its longest word sets the least width.
	d.font(true, t.size)
	for i, h := range t.heads {
		for _, word := range strings.Fields(h) {
			widths[i] = math.Max(widths[i], d.GetStringWidth(word)+2*pad)
		}
	}
	for ri, r := range t.rows {
		d.font(ri < len(t.bold) && t.bold[ri], t.size)
		for i := 0; i < n && i < len(r); i++ {
			widths[i] = math.Max(widths[i], d.GetStringWidth(r[i])+2*pad)
		}
	}
	avail := d.contentWidth()
	if t.maxCol > 0 {
		for i := range widths {
			widths[i] = math.Min(widths[i], t.maxCol)
		}
	}
	total := 0.0
	for _, w := range widths {
		total += w
	}
	if total > avail {
		// Shrink the widest columns first; their text is cut with an ellipsis.
		for total > avail+0.01 {
			wi := 0
			for i, w := range widths {
				if w > widths[wi] {
					wi = i
				}
			}
			widths[wi] -= math.Min(total-avail, widths[wi]*0.1+0.1)
			total = 0
			for _, w := range widths {
				total += w
			}
		}
	}
	h := t.size*0.42 + 1.6
	header := func() {
		d.font(true, t.size)
		d.SetFillColor(225, 230, 238)
		lines := make([][]string, n)
		nl := 1
		for i, s := range t.heads {
			lines[i] = wrapWords(d, s, widths[i]-2*pad)
			nl = max(nl, len(lines[i]))
		}
		x0, y0 := d.GetX(), d.GetY()
		x := x0
		for i := range t.heads {
			align := "L"
			if i < len(t.right) && t.right[i] {
				align = "R"
			}
			for k := 0; k < nl; k++ {
				s := ""
				// Bottom-aligned: short headers sit on the last line.
				if j := k - (nl - len(lines[i])); j >= 0 {
					s = lines[i][j]
				}
				border := ""
				if k == nl-1 {
					border = "B"
				}
				d.SetXY(x, y0+float64(k)*h)
				d.CellFormat(widths[i], h, fit(d, s, widths[i]-2*pad), border, 0, align, true, 0, "")
			}
			x += widths[i]
		}
		d.SetXY(x0, y0+float64(nl)*h)
		d.font(false, t.size)
	}
	if d.GetY()+2*h > d.bottom() {
		d.AddPage()
	}
	header()
	for ri, r := range t.rows {
		if d.GetY()+h > d.bottom() {
			d.AddPage()
			header()
		}
		bold := ri < len(t.bold) && t.bold[ri]
		d.font(bold, t.size)
		fill := ri%2 == 1
		d.SetFillColor(245, 246, 248)
		for i := 0; i < n; i++ {
			s := ""
			if i < len(r) {
				s = r[i]
			}
			align := "L"
			if i < len(t.right) && t.right[i] {
				align = "R"
			}
			d.CellFormat(widths[i], h, fit(d, s, widths[i]-2*pad), "", 0, align, fill, 0, "")
		}
		d.Ln(-1)
	}
	d.font(false, bodyPt)
	d.Ln(2)
}

// fpdfSize is a page size in millimetres, portrait width and height.
func fpdfSize(w, h float64) fpdf.SizeType { return fpdf.SizeType{Wd: w, Ht: h} }

// wrapWords breaks s at spaces into lines at most w mm wide in the current
// font (a word wider than w stays whole on its own line).
func wrapWords(d *doc, s string, w float64) []string {
	var lines []string
	cur := ""
	for _, word := range strings.Fields(s) {
		if cur == "" {
			cur = word
			continue
		}
		if d.GetStringWidth(cur+" "+word) <= w {
			cur += " " + word
			continue
		}
		lines = append(lines, cur)
		cur = word
	}
	if cur != "" || len(lines) == 0 {
		lines = append(lines, cur)
	}
	return lines
}
