package xlsx

import (
	"fmt"
	"math"
	"strconv"

	"github.com/xuri/excelize/v2"

	"furlong/export"
	"furlong/trial"
)

// writeData writes every plot with its position, treatment, all trait values
// (derived ones included), exclusions and notes. Missing values are empty
// cells.
func (r *report) writeData(name string) error {
	t := r.t
	s := newSheet(r.f, r.st, name)
	names := make(map[string]string, len(t.Treatments))
	for _, tm := range t.Treatments {
		names[tm.Code] = tm.Name
	}
	heads := []string{"Plot", "Block", "Field row", "Column", "Treatment", "Treatment name"}
	const first = 7
	traits := t.Traits
	for _, tr := range traits {
		h := tr.Key
		if tr.Unit != "" {
			h += " (" + tr.Unit + ")"
		}
		heads = append(heads, h)
	}
	exclCol := first + len(traits)
	noteCol := exclCol + 1
	heads = append(heads, "Excluded", "Note")
	for i, h := range heads {
		s.textNoWidth(i+1, 1, h, headStyle)
		s.track(i+1, math.Min(displayWidth(h), 12))
	}
	if s.err == nil {
		lines := 1.0
		for _, h := range heads {
			lines = math.Max(lines, math.Ceil(displayWidth(h)/12))
		}
		s.fail(r.f.SetRowHeight(name, 1, 15*math.Min(lines, 4)))
	}
	// Number formats by column, set once; cells written after take them.
	for j, tr := range traits {
		col, _ := excelize.ColumnNumberToName(first + j)
		id := s.style(numStyle(tr.Decimals))
		if s.err == nil {
			s.fail(r.f.SetColStyle(name, col, id))
		}
	}
	hid := s.style(headStyle)
	if s.err == nil {
		s.fail(r.f.SetCellStyle(name, "A1", cellName(len(heads), 1), hid))
	}
	values := make([][]float64, len(traits))
	for j, tr := range traits {
		values[j] = r.valuesOf(tr)
	}
	wInt := make([]int, 4)
	for i, p := range t.Plots {
		if s.err != nil {
			break
		}
		row := i + 2
		for c, v := range [4]int{p.Number, p.Block, p.Row, p.Column} {
			s.fail(r.f.SetCellInt(name, cellName(c+1, row), int64(v)))
			wInt[c] = max(wInt[c], len(strconv.Itoa(v)))
		}
		s.text(5, row, p.Treatment, styleKey{})
		s.text(6, row, names[p.Treatment], styleKey{})
		for j := range traits {
			if i < len(values[j]) {
				v := values[j][i]
				if !math.IsNaN(v) && !math.IsInf(v, 0) {
					s.fail(r.f.SetCellFloat(name, cellName(first+j, row), v, floatPrec(v), 64))
					s.track(first+j, numWidth(v, DecimalsFormat(traits[j].Decimals)))
				}
			}
		}
		if reason := export.PlotExclusions(p); reason != "" {
			s.text(exclCol, row, reason, styleKey{})
		}
		if p.Note != "" {
			s.text(noteCol, row, p.Note, styleKey{})
		}
	}
	for c, w := range wInt {
		s.track(c+1, float64(w))
	}
	s.freeze(1, 1)
	s.fitColumns(6, 40)
	if s.err == nil && len(t.Plots) > 0 {
		s.fail(r.f.AutoFilter(name, "A1:"+cellName(len(heads), len(t.Plots)+1), nil))
	}
	s.printSetup(r.opts.Paper, len(heads) > 9, r.t.Title+": plot data")
	s.printTitles(1)
	return s.err
}

// OkabeIto is the colour-blind-safe palette of Okabe & Ito (2008), "Color
// Universal Design", used for the treatments on the field map.
var OkabeIto = []string{"E69F00", "56B4E9", "009E73", "F0E442", "0072B2", "D55E00", "CC79A7", "000000"}

// fontFor returns the font colour, black or white, with the higher contrast
// ratio against the fill colour hex (WCAG 2.1 relative luminance and
// contrast ratio).
func fontFor(hex string) string {
	l := luminance(hex)
	black := (l + 0.05) / 0.05
	white := 1.05 / (l + 0.05)
	if white > black {
		return "FFFFFF"
	}
	return "000000"
}

// luminance is the WCAG 2.1 relative luminance of an RRGGBB colour.
func luminance(hex string) float64 {
	v, err := strconv.ParseUint(hex, 16, 32)
	if err != nil || len(hex) != 6 {
		panic("xlsx: bad colour " + hex)
	}
	ch := func(c uint64) float64 {
		x := float64(c) / 255
		if x <= 0.04045 {
			return x / 12.92
		}
		return math.Pow((x+0.055)/1.055, 2.4)
	}
	return 0.2126*ch(v>>16&0xFF) + 0.7152*ch(v>>8&0xFF) + 0.0722*ch(v&0xFF)
}

// writeFieldMap draws the plots as cells at their field row and column, with
// the plot number and treatment code, a colour per treatment, the blocks
// outlined, and a legend.
func (r *report) writeFieldMap(name string) error {
	t := r.t
	s := newSheet(r.f, r.st, name)
	s.textNoWidth(1, 1, "Field map", titleStyle)
	maxRow, maxCol := 0, 0
	for _, p := range t.Plots {
		if p.Row < 1 || p.Column < 1 {
			continue
		}
		maxRow, maxCol = max(maxRow, p.Row), max(maxCol, p.Column)
	}
	if maxRow == 0 {
		s.textNoWidth(1, 3, "The plots have no field positions yet; randomise the trial to lay them out.", noteStyle)
		s.printSetup(r.opts.Paper, true, r.t.Title+": field map")
		return s.err
	}
	s.textNoWidth(1, 2, "Each cell is one plot: plot number and treatment code. Field row 1 is at the bottom and column 1 at the left, as on the printed map; heavy lines outline the blocks.", noteStyle)
	colour := make(map[string]string, len(t.Treatments))
	order := make(map[string]int, len(t.Treatments))
	for i, tm := range t.Treatments {
		colour[tm.Code] = OkabeIto[i%len(OkabeIto)]
		order[tm.Code] = i
	}
	type cell struct {
		text  string
		block int
		trt   string
		used  bool
	}
	grid := make([][]cell, maxRow+1)
	for i := range grid {
		grid[i] = make([]cell, maxCol+1)
	}
	for _, p := range t.Plots {
		if p.Row < 1 || p.Column < 1 {
			continue
		}
		c := &grid[p.Row][p.Column]
		txt := fmt.Sprintf("%d\n%s", p.Number, p.Treatment)
		if c.used {
			c.text += "\n" + txt // two plots recorded at one position: show both
		} else {
			*c = cell{text: txt, block: p.Block, trt: p.Treatment, used: true}
		}
	}
	const top, left = 4, 2 // grid origin: header row 4, header column 1
	for c := 1; c <= maxCol; c++ {
		s.text(left+c-1, top-1, "Col "+strconv.Itoa(c), styleKey{bold: true, halign: "center"})
	}
	sameBlock := func(r1, c1, r2, c2 int) bool {
		if r2 < 1 || c2 < 1 || r2 > maxRow || c2 > maxCol {
			return false
		}
		a, b := grid[r1][c1], grid[r2][c2]
		return a.used && b.used && a.block == b.block
	}
	// The highest field row is printed first, so that row 1 is at the
	// bottom as on the printed map and in 'furlong show'.
	for fr := maxRow; fr >= 1; fr-- {
		row := top + maxRow - fr
		s.text(1, row, "Row "+strconv.Itoa(fr), styleKey{bold: true, valign: "center"})
		if s.err == nil {
			s.fail(r.f.SetRowHeight(name, row, 30))
		}
		for fc := 1; fc <= maxCol; fc++ {
			g := grid[fr][fc]
			if !g.used {
				continue
			}
			k := styleKey{wrap: true, halign: "center", valign: "center"}
			if hex, ok := colour[g.trt]; ok {
				k.fill, k.font = hex, fontFor(hex)
			}
			// Thin lines between plots, thick ones (excelize style 5)
			// around each block, so blocks stand out on paper too.
			edge := func(same bool) int {
				if same {
					return 1
				}
				return 5
			}
			k.border = [4]int{
				edge(sameBlock(fr, fc, fr, fc-1)), edge(sameBlock(fr, fc, fr+1, fc)),
				edge(sameBlock(fr, fc, fr, fc+1)), edge(sameBlock(fr, fc, fr-1, fc)),
			}
			s.textNoWidth(left+fc-1, row, g.text, k)
		}
	}
	for c := 1; c <= maxCol; c++ {
		s.track(left+c-1, 8)
	}
	s.track(1, 6)

	// Legend, under the grid: its own rows, all of one height (beside the
	// grid its rows took the tall plot rows and then short ones).
	lt := top + maxRow + 1
	s.textNoWidth(1, lt, "Legend", styleKey{bold: true})
	s.text(left, lt+1, "Treatment", withBottom(styleKey{bold: true, halign: "center"}))
	s.textNoWidth(left+1, lt+1, "Name", withBottom(styleKey{bold: true}))
	for i, tm := range t.Treatments {
		row := lt + 2 + i
		hex := colour[tm.Code]
		k := styleKey{fill: hex, font: fontFor(hex), halign: "center", valign: "center", border: [4]int{1, 1, 1, 1}}
		s.text(left, row, tm.Code, k)
		label := tm.Name
		if tm.Role == trial.RoleCheck {
			label += " (check)"
		}
		s.textNoWidth(left+1, row, label, styleKey{valign: "center"})
		if s.err == nil {
			s.fail(r.f.SetRowHeight(name, row, legendRowHeight))
		}
	}
	if len(t.Treatments) > len(OkabeIto) {
		s.textNoWidth(left, lt+2+len(t.Treatments), "More treatments than colours: colours repeat; read the code in each cell.", noteStyle)
	}
	s.freeze(top-1, 1)
	s.fitColumns(5, 40)
	s.printSetup(r.opts.Paper, true, r.t.Title+": field map")
	return s.err
}

// legendRowHeight is the height, in points, of each row of the field map's
// legend: one size for all (a little above the default 15 so the colour
// swatches read as swatches).
const legendRowHeight = 18
