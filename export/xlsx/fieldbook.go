package xlsx

import (
	"archive/zip"
	"bytes"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"github.com/xuri/excelize/v2"

	"furlong/trial"
	"furlong/trial/fieldbook"
)

// FieldBookSheet is the name of the sheet WriteFieldBook writes and
// ReadTable looks for first.
const FieldBookSheet = "Field book"

// FieldBookOptions control WriteFieldBook.
type FieldBookOptions struct {
	Paper Paper // A4 (default) or Letter
}

// Columns of the field book before the trait columns, as in the CSV field
// book.
var fieldBookColumns = []string{
	fieldbook.ColPlot, fieldbook.ColBlock, fieldbook.ColRow, fieldbook.ColColumn,
	fieldbook.ColTreatment, fieldbook.ColTreatmentName,
}

// FieldBookHeader returns the header cell of a trait column: the trait key,
// then its unit in parentheses and its valid range, for example
// "ht (cm) 20–250", "lodging 1–9" or "weed ≥ 0".
func FieldBookHeader(tr trial.Trait) string {
	h := tr.Key
	if tr.Unit != "" {
		h += " (" + tr.Unit + ")"
	}
	fmtB := func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
	switch {
	case tr.Min != nil && tr.Max != nil:
		h += " " + fmtB(*tr.Min) + "–" + fmtB(*tr.Max)
	case tr.Min != nil:
		h += " ≥ " + fmtB(*tr.Min)
	case tr.Max != nil:
		h += " ≤ " + fmtB(*tr.Max)
	}
	return h
}

// storedTraits are the traits a crew records: every trait that is not
// derived.
func storedTraits(t *trial.Trial) []trial.Trait {
	var out []trial.Trait
	for _, tr := range t.Traits {
		if tr.Derived == nil {
			out = append(out, tr)
		}
	}
	return out
}

// WriteFieldBook writes the crew's field book of trial t as an xlsx workbook
// to w: the plots in walking order with the columns of the CSV field book,
// one column per recorded trait with its current values, and data
// validation on each trait column so that a value out of range or a typo is
// refused as it is typed.
func WriteFieldBook(w io.Writer, t *trial.Trial, opts FieldBookOptions) error {
	f := excelize.NewFile()
	defer f.Close()
	if err := f.SetSheetName("Sheet1", FieldBookSheet); err != nil {
		return err
	}
	st := &styles{f: f, cache: make(map[styleKey]int)}
	s := newSheet(f, st, FieldBookSheet)
	traits := storedTraits(t)
	names := make(map[string]string, len(t.Treatments))
	for _, tm := range t.Treatments {
		names[tm.Code] = tm.Name
	}
	design := fieldbook.DesignColumns(t)
	nfixed := len(fieldBookColumns) + len(design)
	ncol := nfixed + len(traits)
	first := nfixed + 1
	// Column number formats first: setting them later would restyle the
	// header cells too.
	for j, tr := range traits {
		col, _ := excelize.ColumnNumberToName(first + j)
		s.fail(f.SetColStyle(FieldBookSheet, col, s.style(numStyleFB(tr.Decimals))))
	}
	for i, h := range append(append([]string(nil), fieldBookColumns...), design...) {
		s.text(i+1, 1, h, headStyle)
	}
	for j, tr := range traits {
		h := FieldBookHeader(tr)
		s.text(first+j, 1, h, headStyle)
		s.widths[first+j] = math.Min(s.widths[first+j], 16)
		s.track(first+j, 8)
	}
	for i, p := range t.Plots {
		row := i + 2
		s.integer(1, row, p.Number, styleKey{})
		s.integer(2, row, p.Block, styleKey{})
		s.integer(3, row, p.Row, styleKey{})
		s.integer(4, row, p.Column, styleKey{})
		s.text(5, row, p.Treatment, styleKey{})
		s.text(6, row, names[p.Treatment], styleKey{})
		for k, cell := range fieldbook.DesignCells(t, p) {
			// Level codes are text; main plot, subplot and strip numbers
			// whole numbers.
			if n, err := strconv.Atoi(cell); err == nil && k >= len(t.Factors) {
				s.integer(7+k, row, n, styleKey{})
			} else {
				s.text(7+k, row, cell, styleKey{})
			}
		}
		for j, tr := range traits {
			if i < len(tr.Values) {
				if v := tr.Values[i]; !math.IsNaN(v) && !math.IsInf(v, 0) {
					s.fail(f.SetCellFloat(FieldBookSheet, cellName(first+j, row), v, floatPrec(v), 64))
				}
			}
		}
		if s.err != nil {
			return s.err
		}
	}
	last := len(t.Plots) + 1
	if last < 2 {
		last = 2
	}
	for j, tr := range traits {
		col, _ := excelize.ColumnNumberToName(first + j)
		dv, err := traitValidation(tr, fmt.Sprintf("%s2:%s%d", col, col, last))
		if err != nil {
			return err
		}
		if err := f.AddDataValidation(FieldBookSheet, dv); err != nil {
			return err
		}
	}
	s.freeze(1, 0)
	s.fitColumns(6, 30)
	total := 0.0
	for c := 1; c <= ncol; c++ {
		total += s.widths[c] + 2
	}
	if s.err != nil {
		return s.err
	}
	// About 90 characters of the default font fit across an A4 or Letter
	// page in portrait at full size (common practice); wider books print
	// landscape.
	title := t.Title
	if strings.TrimSpace(title) == "" {
		title = "Field book"
	} else {
		title += ": field book"
	}
	s.printSetup(opts.Paper, total > 90, title)
	if s.err != nil {
		return s.err
	}
	s.printTitles(1)
	if s.err != nil {
		return s.err
	}
	var buf bytes.Buffer
	if err := f.Write(&buf); err != nil {
		return err
	}
	out, err := printGridLines(buf.Bytes(), "xl/worksheets/sheet1.xml")
	if err != nil {
		return err
	}
	_, err = w.Write(out)
	return err
}

func numStyleFB(decimals int) styleKey {
	if decimals <= 0 {
		return styleKey{numFmt: "General"}
	}
	return styleKey{numFmt: DecimalsFormat(decimals)}
}

// traitValidation is the data validation of a trait column: whole numbers
// for counts, decimals otherwise, within the trait's range (a percentage
// within 0–100 when it has none), with a message naming the trait.
func traitValidation(tr trial.Trait, sqref string) (*excelize.DataValidation, error) {
	dv := excelize.NewDataValidation(true)
	dv.Sqref = sqref
	typ, kind := excelize.DataValidationTypeDecimal, "a number"
	if tr.Kind == trial.Count {
		typ, kind = excelize.DataValidationTypeWhole, "a whole number"
	}
	lo, hi := tr.Min, tr.Max
	if tr.Kind == trial.Percent {
		zero, hundred := 0.0, 100.0
		if lo == nil {
			lo = &zero
		}
		if hi == nil {
			hi = &hundred
		}
	}
	if tr.Kind == trial.Count && lo == nil {
		zero := 0.0
		lo = &zero
	}
	// Bounds of a whole-number rule are the whole numbers within the range.
	low := func(v float64) any {
		if typ == excelize.DataValidationTypeWhole {
			return int(math.Ceil(v))
		}
		return v
	}
	high := func(v float64) any {
		if typ == excelize.DataValidationTypeWhole {
			return int(math.Floor(v))
		}
		return v
	}
	fmtB := func(v float64) string { return strconv.FormatFloat(v, 'f', -1, 64) }
	var err error
	var rule string
	switch {
	case lo != nil && hi != nil:
		err = dv.SetRange(low(*lo), high(*hi), typ, excelize.DataValidationOperatorBetween)
		rule = fmt.Sprintf("%s from %s to %s", kind, fmtB(*lo), fmtB(*hi))
	case lo != nil:
		err = dv.SetRange(low(*lo), low(*lo), typ, excelize.DataValidationOperatorGreaterThanOrEqual)
		rule = fmt.Sprintf("%s of at least %s", kind, fmtB(*lo))
	case hi != nil:
		err = dv.SetRange(high(*hi), high(*hi), typ, excelize.DataValidationOperatorLessThanOrEqual)
		rule = fmt.Sprintf("%s of at most %s", kind, fmtB(*hi))
	default:
		// No range: any number, so that text typed by mistake is caught.
		err = dv.SetRange(-math.MaxFloat32, math.MaxFloat32, typ, excelize.DataValidationOperatorBetween)
		rule = kind
	}
	if err != nil {
		return nil, err
	}
	name := nonEmpty(tr.Name, tr.Key)
	dv.SetError(excelize.DataValidationErrorStyleStop, "Value not accepted",
		fmt.Sprintf("%s takes %s. Leave the cell empty when the plot was not assessed.", name, rule))
	dv.SetInput(truncRunes(name, 32), truncRunes("Enter "+rule+".", 255))
	return dv, nil
}

func truncRunes(s string, n int) string {
	r := []rune(s)
	if len(r) > n {
		return string(r[:n])
	}
	return s
}

// printGridLines turns on the printing of gridlines of one worksheet part of
// an xlsx package (excelize has no setting for it): it adds the printOptions
// element gridLines="1" in its place in the worksheet (ECMA-376 Part 1,
// §18.3.1.70, after the data validations and before the page margins).
func printGridLines(pkg []byte, part string) ([]byte, error) {
	zr, err := zip.NewReader(bytes.NewReader(pkg), int64(len(pkg)))
	if err != nil {
		return nil, err
	}
	var out bytes.Buffer
	zw := zip.NewWriter(&out)
	found := false
	for _, zf := range zr.File {
		rc, err := zf.Open()
		if err != nil {
			return nil, err
		}
		data, err := io.ReadAll(rc)
		rc.Close()
		if err != nil {
			return nil, err
		}
		if zf.Name == part {
			if data, err = insertPrintOptions(data); err != nil {
				return nil, err
			}
			found = true
		}
		hdr := zf.FileHeader
		hdr.Method = zip.Deflate
		fw, err := zw.CreateHeader(&hdr)
		if err != nil {
			return nil, err
		}
		if _, err := fw.Write(data); err != nil {
			return nil, err
		}
	}
	if !found {
		panic("xlsx: worksheet part " + part + " not in the package")
	}
	if err := zw.Close(); err != nil {
		return nil, err
	}
	return out.Bytes(), nil
}

func insertPrintOptions(xml []byte) ([]byte, error) {
	const elem = `<printOptions gridLines="1"/>`
	if i := bytes.Index(xml, []byte("<printOptions")); i >= 0 {
		return nil, errors.New("xlsx: worksheet already has print options")
	}
	at := -1
	for _, next := range []string{"<pageMargins", "<pageSetup", "<headerFooter", "<rowBreaks", "<colBreaks", "<drawing", "<legacyDrawing", "<tableParts", "<extLst", "</worksheet>"} {
		if i := bytes.Index(xml, []byte(next)); i >= 0 && (at < 0 || i < at) {
			at = i
		}
	}
	if at < 0 {
		return nil, errors.New("xlsx: worksheet part has no end")
	}
	out := make([]byte, 0, len(xml)+len(elem))
	out = append(out, xml[:at]...)
	out = append(out, elem...)
	return append(out, xml[at:]...), nil
}

// ReadTable reads a workbook, such as a field book filled in and saved by a
// spreadsheet program, as a table of strings: ReadBook's rows.
func ReadTable(r io.Reader) ([][]string, error) {
	b, err := ReadBook(r)
	if err != nil {
		return nil, err
	}
	return b.Rows, nil
}

// ReadBook reads a workbook, such as a field book filled in and saved by a
// spreadsheet program, for fieldbook.PlanBook: the sheet named "Field book"
// when there is one, else the first sheet; the notes say which sheet was
// read and which were ignored.
//
// A cell gives the number it shows: at full precision, and a cell formatted
// as a percentage (stored as 0.154, shown as 15.4 %) as the percentage
// (15.4), as a person reading the sheet sees it. A cell that holds a date or
// time, TRUE/FALSE, an error value (#DIV/0!) or a formula whose result was
// never calculated and saved is a problem named by sheet and cell
// ("sheet Plots, cell D7"), never a number.
func ReadBook(r io.Reader) (*fieldbook.Book, error) {
	f, err := excelize.OpenReader(r, excelize.Options{RawCellValue: true})
	if err != nil {
		// The library's reason (a zip or XML detail) means nothing to the
		// user; say what to do instead.
		return nil, errors.New("the file could not be read as an xlsx workbook: it may be damaged, protected by a password or saved in another format; save it again as .xlsx or as CSV")
	}
	defer f.Close()
	sheets := f.GetSheetList()
	if len(sheets) == 0 {
		return nil, errors.New("the workbook has no sheets")
	}
	name := sheets[0]
	for _, s := range sheets {
		if strings.EqualFold(strings.TrimSpace(s), FieldBookSheet) {
			name = s
			break
		}
	}
	rows, err := f.GetRows(name, excelize.Options{RawCellValue: true})
	if err != nil {
		return nil, err
	}
	b := &fieldbook.Book{Mark: trial.PointOnly}
	var others []string
	for _, s := range sheets {
		if s != name {
			others = append(others, strconv.Quote(s))
		}
	}
	note := fmt.Sprintf("read sheet %q of the workbook", name)
	if len(others) > 0 {
		note += fmt.Sprintf("; the other %s (%s) %s ignored", pluralWord(len(others), "sheet", "sheets"), strings.Join(others, ", "), pluralWord(len(others), "was", "were"))
	}
	b.Notes = append(b.Notes, note)
	width := 0
	for _, row := range rows {
		width = max(width, len(row))
	}
	cr := cellReader{f: f, sheet: name, formats: map[int]shownAs{}}
	for i, row := range rows {
		if len(row) < width {
			row = append(row, make([]string, width-len(row))...)
			rows[i] = row
		}
		for j := range row {
			text, problem, err := cr.read(j+1, i+1, row[j])
			if err != nil {
				return nil, err
			}
			row[j] = text
			if problem != "" {
				b.Problems = append(b.Problems, fieldbook.CellProblem{Line: i + 1, Column: j, Msg: problem})
			}
		}
	}
	b.Rows = rows
	return b, nil
}

func pluralWord(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

// shownAs is what a number format says about a number.
type shownAs uint8

const (
	shownPlain shownAs = iota
	shownPercent
	shownDate
)

// cellReader reads cells of one sheet, remembering the number formats seen.
type cellReader struct {
	f       *excelize.File
	sheet   string
	formats map[int]shownAs // by style index
}

// read returns the text of the cell at column col and row row (from 1)
// whose raw value is raw, or a problem.
func (c *cellReader) read(col, row int, raw string) (text, problem string, err error) {
	ref, err := excelize.CoordinatesToCellName(col, row)
	if err != nil {
		return "", "", err
	}
	where := fmt.Sprintf("sheet %s, cell %s", c.sheet, ref)
	typ, err := c.f.GetCellType(c.sheet, ref)
	if err != nil {
		return "", "", err
	}
	if raw == "" {
		if formula, _ := c.f.GetCellFormula(c.sheet, ref); formula != "" {
			return "", fmt.Sprintf("%s holds the formula =%s, whose result was never saved; open the book in a spreadsheet program, let it calculate and save it again, or type the value", where, formula), nil
		}
		return "", "", nil
	}
	switch typ {
	case excelize.CellTypeBool:
		word := "FALSE"
		if raw == "1" || strings.EqualFold(raw, "true") {
			word = "TRUE"
		}
		return word, fmt.Sprintf("%s holds %s (a true/false cell), not a number", where, word), nil
	case excelize.CellTypeDate:
		return raw, fmt.Sprintf("%s holds a date, not a number; type the measured value", where), nil
	case excelize.CellTypeError:
		return raw, fmt.Sprintf("%s holds the error value %s, not a number", where, raw), nil
	case excelize.CellTypeInlineString, excelize.CellTypeSharedString:
		return raw, "", nil
	}
	v, perr := strconv.ParseFloat(raw, 64)
	if perr != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return raw, "", nil // text a formula left: the import says it is not a number
	}
	style, err := c.f.GetCellStyle(c.sheet, ref)
	if err != nil {
		return "", "", err
	}
	format, ok := c.formats[style]
	if !ok {
		format = c.numberFormat(style)
		c.formats[style] = format
	}
	switch format {
	case shownPercent:
		// 15 significant digits: the product carries binary noise
		// (0.154 × 100 = 15.400000000000002) that no spreadsheet shows.
		return strconv.FormatFloat(v*100, 'g', 15, 64), "", nil
	case shownDate:
		return raw, fmt.Sprintf("%s holds a date or time, not a number; type the measured value, or format the cell as a number if it is one", where), nil
	}
	return raw, "", nil
}

// numberFormat classifies the number format of a style: built-in formats 9
// and 10 are percentages, 14 to 22 and 45 to 47 dates and times (ECMA-376
// Part 1, §18.8.30 numFmt); a custom format is a percentage when it has a
// % sign and a date when it has date or time letters, outside quotes and
// brackets.
func (c *cellReader) numberFormat(style int) shownAs {
	st, err := c.f.GetStyle(style)
	if err != nil || st == nil {
		return shownPlain
	}
	switch {
	case st.NumFmt == 9 || st.NumFmt == 10:
		return shownPercent
	case st.NumFmt >= 14 && st.NumFmt <= 22, st.NumFmt >= 45 && st.NumFmt <= 47:
		return shownDate
	}
	if st.CustomNumFmt == nil {
		return shownPlain
	}
	return classifyFormat(*st.CustomNumFmt)
}

// classifyFormat reads a number format code (ECMA-376 Part 1, §18.8.31):
// only the first section (positive numbers) counts; text in quotes, escaped
// characters and bracketed parts ([Red], [$-409]) are skipped.
func classifyFormat(code string) shownAs {
	if i := strings.IndexByte(code, ';'); i >= 0 {
		code = code[:i]
	}
	percent, date := false, false
	for i := 0; i < len(code); i++ {
		switch ch := code[i]; ch {
		case '"':
			for i++; i < len(code) && code[i] != '"'; i++ {
			}
		case '\\', '_', '*':
			i++
		case '[':
			for i++; i < len(code) && code[i] != ']'; i++ {
			}
		case '%':
			percent = true
		case 'y', 'Y', 'm', 'M', 'd', 'D', 'h', 'H', 's', 'S':
			date = true
		}
	}
	switch {
	case date:
		return shownDate
	case percent:
		return shownPercent
	}
	return shownPlain
}
