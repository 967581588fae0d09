package pdf

import (
	"bytes"
	"image"
	"image/png"
	"os"
	"os/exec"
	"slices"
	"strconv"
	"strings"
	"testing"

	"furlong/trial"
)

// TestLabelsDecode prints labels for a 48-plot trial on two sheets and
// reads every barcode back with zbar's zbarimg (an independent reader from
// Debian's zbar-tools), Code 128 and QR alike, one label at a time as a
// scanner reads them (the page cut at the sheet's label grid; zbar misses
// some QR codes when a page holds 24 of them side by side, though each
// alone reads): every label's code is its plot's number, in walking order,
// so a scanner (which types what it decodes) gives the Record step and the
// field-book import the plot number.
func TestLabelsDecode(t *testing.T) {
	t.Parallel()
	zbar := tool(t, "zbarimg", "zbar-tools")
	tr := &trial.Trial{Title: "Label check", Design: trial.Design{Kind: trial.RCBD, Reps: 4}}
	for i := 0; i < 12; i++ {
		tr.Treatments = append(tr.Treatments, trial.Treatment{Code: "E" + strconv.Itoa(i+1)})
	}
	for b := 1; b <= 4; b++ {
		for i := 0; i < 12; i++ {
			tr.Plots = append(tr.Plots, trial.Plot{Number: 100*b + i + 1, Block: b, Row: b, Column: i + 1, Treatment: tr.Treatments[(i+b)%12].Code})
		}
	}
	for _, bc := range []Barcode{Code128, QR} {
		var buf bytes.Buffer
		if err := WriteLabels(&buf, tr, LabelOptions{Sheet: SheetPresets["a4-3x8"], Barcode: bc}); err != nil {
			t.Fatal(err)
		}
		pages := pdfPages(t, buf.Bytes(), 300)
		slices.Sort(pages)
		if len(pages) != 2 {
			t.Fatalf("%s: %d pages, want 2 (48 labels, 24 a sheet)", bc, len(pages))
		}
		sheet, err := SheetPresets["a4-3x8"].resolve()
		if err != nil {
			t.Fatal(err)
		}
		var crops []string
		for _, page := range pages {
			crops = append(crops, cutLabels(t, page, sheet, 300)...)
		}
		out, err := exec.Command(zbar, append([]string{"--quiet", "--raw"}, crops...)...).Output()
		if err != nil {
			t.Fatalf("%s: zbarimg: %v (%d labels)", bc, err, len(crops))
		}
		got := strings.Fields(string(out))
		var want []string
		for _, pl := range tr.Plots {
			want = append(want, strconv.Itoa(pl.Number))
		}
		if !slices.Equal(got, want) {
			t.Errorf("%s: decoded %v,\nwant %v", bc, got, want)
		}
	}
}

// cutLabels cuts a page rendered at dpi into one PNG per label of the
// sheet, row by row, and returns their paths.
func cutLabels(tb testing.TB, page string, s Sheet, dpi float64) []string {
	tb.Helper()
	f, err := os.Open(page)
	if err != nil {
		tb.Fatal(err)
	}
	img, err := png.Decode(f)
	f.Close()
	if err != nil {
		tb.Fatal(err)
	}
	sub, ok := img.(interface {
		SubImage(r image.Rectangle) image.Image
	})
	if !ok {
		tb.Fatalf("%s: the page image cannot be cut", page)
	}
	px := func(mm float64) int { return int(mm / 25.4 * dpi) }
	var out []string
	for r := 0; r < s.Rows; r++ {
		for c := 0; c < s.Cols; c++ {
			x := s.Left + float64(c)*(s.Width+s.GapX)
			y := s.Top + float64(r)*(s.Height+s.GapY)
			crop := sub.SubImage(image.Rect(px(x), px(y), px(x+s.Width), px(y+s.Height)))
			name := strings.TrimSuffix(page, ".png") + "-" + strconv.Itoa(r) + "-" + strconv.Itoa(c) + ".png"
			w, err := os.Create(name)
			if err != nil {
				tb.Fatal(err)
			}
			if err := png.Encode(w, crop); err != nil {
				tb.Fatal(err)
			}
			w.Close()
			out = append(out, name)
		}
	}
	return out
}
