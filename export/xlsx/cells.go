package xlsx

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"

	"github.com/xuri/excelize/v2"

	"furlong/stats"
)

// PFormat is the number format of a p-value cell: below stats.PFloor it
// shows "<0.001", otherwise stats.PDecimals decimals, as stats.FormatP
// writes text; the value in the cell stays the exact p.
var PFormat = `[<` + stats.PFloorText + `]"<` + stats.PFloorText + `";0.` + strings.Repeat("0", stats.PDecimals)

const percentFormat = "0.0"

// DecimalsFormat returns the number format showing d decimals ("0", "0.0",
// "0.00", ...). Negative d counts as 0.
func DecimalsFormat(d int) string {
	if d <= 0 {
		return "0"
	}
	if d > 15 {
		d = 15
	}
	return "0." + strings.Repeat("0", d)
}

// styleKey describes one cell style; styles are made once per workbook.
type styleKey struct {
	numFmt    string
	bold      bool
	italic    bool
	wrap      bool
	fill      string // RGB hex without '#', "" for none
	font      string // RGB hex, "" for automatic
	halign    string
	valign    string
	border    [4]int // left, top, right, bottom border style (excelize styles: 0 none, 1 thin, 2 medium, 5 thick)
	size      float64
	underline bool
}

type styles struct {
	f     *excelize.File
	cache map[styleKey]int
}

func (s *styles) get(k styleKey) (int, error) {
	if id, ok := s.cache[k]; ok {
		return id, nil
	}
	st := &excelize.Style{
		Font:      &excelize.Font{Bold: k.bold, Italic: k.italic, Color: k.font, Size: k.size},
		Alignment: &excelize.Alignment{WrapText: k.wrap, Horizontal: k.halign, Vertical: k.valign},
	}
	if k.numFmt != "" {
		f := k.numFmt
		st.CustomNumFmt = &f
	}
	if k.fill != "" {
		st.Fill = excelize.Fill{Type: "pattern", Pattern: 1, Color: []string{k.fill}}
	}
	for i, side := range []string{"left", "top", "right", "bottom"} {
		if k.border[i] > 0 {
			st.Border = append(st.Border, excelize.Border{Type: side, Color: "000000", Style: k.border[i]})
		}
	}
	id, err := s.f.NewStyle(st)
	if err != nil {
		return 0, err
	}
	s.cache[k] = id
	return id, nil
}

// sheet writes cells to one worksheet, remembers the first error, and keeps
// the widest content of each column so that widths can fit it.
type sheet struct {
	f      *excelize.File
	st     *styles
	name   string
	widths map[int]float64
	err    error
	// later are pictures to add once the columns have their widths: a
	// picture is anchored to cells, so it is stretched when a column under
	// it widens after it is placed.
	later []func()
}

// placeLater runs the pictures' placement kept for after fitColumns.
func (s *sheet) placeLater() {
	for _, f := range s.later {
		if s.err == nil {
			f()
		}
	}
	s.later = nil
}

func newSheet(f *excelize.File, st *styles, name string) *sheet {
	return &sheet{f: f, st: st, name: name, widths: make(map[int]float64)}
}

func (s *sheet) fail(err error) {
	if s.err == nil && err != nil {
		s.err = err
	}
}

func (s *sheet) style(k styleKey) int {
	id, err := s.st.get(k)
	s.fail(err)
	return id
}

func cellName(col, row int) string {
	n, err := excelize.CoordinatesToCellName(col, row)
	if err != nil {
		panic(err) // coordinates come from this package's own loops
	}
	return n
}

func (s *sheet) setStyle(col, row int, k styleKey) {
	if s.err != nil {
		return
	}
	c := cellName(col, row)
	s.fail(s.f.SetCellStyle(s.name, c, c, s.style(k)))
}

func (s *sheet) track(col int, width float64) {
	if width > s.widths[col] {
		s.widths[col] = width
	}
}

// text writes a string cell and counts its width.
func (s *sheet) text(col, row int, v string, k styleKey) {
	s.textNoWidth(col, row, v, k)
	w := displayWidth(v)
	if k.bold {
		w *= 1.1
	}
	s.track(col, w)
}

// textNoWidth writes a string cell that may overflow into the cells to its
// right (titles, prose) without widening its column.
func (s *sheet) textNoWidth(col, row int, v string, k styleKey) {
	if s.err != nil {
		return
	}
	c := cellName(col, row)
	s.fail(s.f.SetCellStr(s.name, c, v))
	if k != (styleKey{}) {
		s.fail(s.f.SetCellStyle(s.name, c, c, s.style(k)))
	}
}

// num writes a number cell at full float64 precision, shown with the number
// format of k. A value that is not finite leaves the cell empty.
func (s *sheet) num(col, row int, v float64, k styleKey) {
	if s.err != nil {
		return
	}
	c := cellName(col, row)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		if k != (styleKey{}) {
			s.fail(s.f.SetCellStyle(s.name, c, c, s.style(k)))
		}
		return
	}
	s.fail(s.f.SetCellFloat(s.name, c, v, floatPrec(v), 64))
	if k != (styleKey{}) {
		s.fail(s.f.SetCellStyle(s.name, c, c, s.style(k)))
	}
	s.track(col, numWidth(v, k.numFmt))
}

// integer writes a whole number cell.
func (s *sheet) integer(col, row int, v int, k styleKey) {
	if s.err != nil {
		return
	}
	c := cellName(col, row)
	s.fail(s.f.SetCellInt(s.name, c, int64(v)))
	if k != (styleKey{}) {
		s.fail(s.f.SetCellStyle(s.name, c, c, s.style(k)))
	}
	s.track(col, float64(len(strconv.Itoa(v))))
}

// fitColumns sets each written column's width to its widest content, within
// [min, max] characters.
func (s *sheet) fitColumns(min, max float64) {
	for col, w := range s.widths {
		w += 2
		if w < min {
			w = min
		}
		if w > max {
			w = max
		}
		name, err := excelize.ColumnNumberToName(col)
		if err != nil {
			panic(err)
		}
		if s.err == nil {
			s.fail(s.f.SetColWidth(s.name, name, name, w))
		}
	}
}

// freeze keeps the first rows (and cols) in view while scrolling.
func (s *sheet) freeze(rows, cols int) {
	if s.err != nil || (rows == 0 && cols == 0) {
		return
	}
	pane := "bottomLeft"
	switch {
	case rows > 0 && cols > 0:
		pane = "bottomRight"
	case cols > 0:
		pane = "topRight"
	}
	s.fail(s.f.SetPanes(s.name, &excelize.Panes{
		Freeze: true, XSplit: cols, YSplit: rows,
		TopLeftCell: cellName(cols+1, rows+1), ActivePane: pane,
	}))
}

// floatPrec is the number of decimals of the shortest decimal form of v
// that reads back as v exactly. excelize cuts automatic precision to 15
// significant digits; giving the precision keeps all of float64's.
func floatPrec(v float64) int {
	s := strconv.FormatFloat(v, 'f', -1, 64)
	if i := strings.IndexByte(s, '.'); i >= 0 {
		return len(s) - i - 1
	}
	return 0
}

// numWidth is the width in characters of v as shown with format.
func numWidth(v float64, format string) float64 {
	switch {
	case format == PFormat:
		return 6
	case strings.HasPrefix(format, "0"):
		d := 0
		if i := strings.IndexByte(format, '.'); i >= 0 {
			d = len(format) - i - 1
		}
		return float64(len(strconv.FormatFloat(v, 'f', d, 64)))
	default:
		return math.Min(float64(len(strconv.FormatFloat(v, 'g', -1, 64))), 12)
	}
}

// displayWidth estimates the width of s in character cells: wide (East Asian)
// characters count two; of several lines, the longest counts.
func displayWidth(s string) float64 {
	best, cur := 0.0, 0.0
	for _, r := range s {
		switch {
		case r == '\n':
			cur = 0
			continue
		case isWide(r):
			cur += 2
		default:
			cur++
		}
		if cur > best {
			best = cur
		}
	}
	return best
}

func isWide(r rune) bool {
	return unicode.Is(unicode.Han, r) || unicode.Is(unicode.Hiragana, r) || unicode.Is(unicode.Katakana, r) ||
		unicode.Is(unicode.Hangul, r) || (r >= 0xFF00 && r <= 0xFF60) || (r >= 0x3000 && r <= 0x303F)
}

// Paper is a paper size for printing.
type Paper int

// Paper sizes, numbered as the spreadsheet paperSize attribute
// (ECMA-376 Part 1, §18.3.1.64: 1 Letter, 9 A4).
const (
	A4     Paper = 9
	Letter Paper = 1
)

func (p Paper) code() int {
	if p == Letter {
		return int(Letter)
	}
	return int(A4)
}

// printSetup prints a sheet fitted to one page wide (as many pages high as
// needed), on the paper and orientation given, with title in the page header
// and the sheet name and page number in the footer.
func (s *sheet) printSetup(paper Paper, landscape bool, title string) {
	if s.err != nil {
		return
	}
	size, one, zero := paper.code(), 1, 0
	orient := "portrait"
	if landscape {
		orient = "landscape"
	}
	s.fail(s.f.SetPageLayout(s.name, &excelize.PageLayoutOptions{
		Size: &size, Orientation: &orient, FitToWidth: &one, FitToHeight: &zero,
	}))
	yes := true
	s.fail(s.f.SetSheetProps(s.name, &excelize.SheetPropsOptions{FitToPage: &yes}))
	s.fail(s.f.SetHeaderFooter(s.name, &excelize.HeaderFooterOptions{
		OddHeader: "&C&B" + headerText(title, 200),
		OddFooter: "&L&A&RPage &P of &N",
	}))
}

// headerText escapes s for a page header or footer ("&" starts a code there)
// and cuts it to at most max characters.
func headerText(s string, max int) string {
	s = strings.Join(strings.Fields(s), " ")
	r := []rune(s)
	if len(r) > max {
		r = append(r[:max-1], '…')
	}
	return strings.ReplaceAll(string(r), "&", "&&")
}

// printTitles repeats the first rows of the sheet at the top of every printed
// page (the defined name _xlnm.Print_Titles, ECMA-376 Part 1 §18.2.5).
func (s *sheet) printTitles(rows int) {
	if s.err != nil || rows < 1 {
		return
	}
	s.fail(s.f.SetDefinedName(&excelize.DefinedName{
		Name: "_xlnm.Print_Titles", RefersTo: fmt.Sprintf("'%s'!$1:$%d", strings.ReplaceAll(s.name, "'", "''"), rows), Scope: s.name,
	}))
}
