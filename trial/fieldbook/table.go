package fieldbook

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"strings"
	"unicode/utf8"

	"golang.org/x/text/encoding/charmap"
	xunicode "golang.org/x/text/encoding/unicode"
	"golang.org/x/text/transform"

	"furlong/trial"
)

// ReadOptions are the choices a caller can make about a CSV file.
type ReadOptions struct {
	// DecimalComma says that numbers in the file have decimal commas even
	// though the cells are separated by commas (such cells are quoted).
	// Without it a comma inside a number in a comma-separated file is
	// refused as ambiguous; semicolon- and tab-separated files accept a
	// decimal point or a decimal comma in any case.
	DecimalComma bool
}

// Reader reads a CSV table (a field book, or a data table for analysis)
// one row at a time, so that a large file never has to be held in memory
// as text. It is the one CSV reader of Furlong: 'furlong import',
// 'furlong analyze data.csv' and the window's import all use it.
//
// The format is RFC 4180 (quoted cells may hold separators, doubled quotes
// and line breaks) with what spreadsheets write besides: the separator is
// a comma, semicolon or tab, detected from the header line or named by a
// first line "sep=;"; line endings are CRLF, LF or CR alone (old Mac
// files); the text is UTF-8 (with or without a byte order mark), UTF-16
// (with or without one) or Windows-1252 (Western European, what older
// spreadsheets save as "CSV"), detected from the start of the file.
// Blank lines and lines of empty cells are skipped, and empty cells at the
// end of a line are dropped.
type Reader struct {
	csv      *csv.Reader
	base     int // lines before the CSV text (a "sep=" line)
	comma    rune
	mark     trial.DecimalMark
	encoding string
	checkUTF bool
	header   bool
}

// sniffSize is how much of the start of a file is looked at to detect its
// encoding and separator.
const sniffSize = 64 << 10

// NewReader starts reading a CSV table from r.
func NewReader(r io.Reader, o ReadOptions) (*Reader, error) {
	raw := bufio.NewReaderSize(r, sniffSize)
	head, err := raw.Peek(sniffSize)
	if err != nil && err != io.EOF && !errors.Is(err, bufio.ErrBufferFull) {
		return nil, err
	}
	rd := &Reader{}
	var text io.Reader = raw
	switch enc := detectEncoding(head); enc {
	case "UTF-8":
		rd.checkUTF = true
		if bytes.HasPrefix(head, []byte{0xEF, 0xBB, 0xBF}) {
			raw.Discard(3)
		}
	case "UTF-16LE", "UTF-16BE":
		endian := xunicode.LittleEndian
		if enc == "UTF-16BE" {
			endian = xunicode.BigEndian
		}
		rd.encoding = enc
		// A byte order mark is removed by the decoder; without one the
		// detected byte order is used.
		policy := xunicode.IgnoreBOM
		if bytes.HasPrefix(head, []byte{0xFF, 0xFE}) || bytes.HasPrefix(head, []byte{0xFE, 0xFF}) {
			policy = xunicode.ExpectBOM
		}
		text = transform.NewReader(raw, xunicode.UTF16(endian, policy).NewDecoder())
	default:
		rd.encoding = enc
		text = transform.NewReader(raw, charmap.Windows1252.NewDecoder())
	}
	tb := bufio.NewReaderSize(&crReader{r: bufio.NewReader(text)}, sniffSize)
	first, err := tb.Peek(sniffSize)
	if err != nil && err != io.EOF && !errors.Is(err, bufio.ErrBufferFull) {
		return nil, err
	}
	first = bytes.TrimPrefix(first, []byte("\uFEFF")) // a BOM the decoder kept
	comma, hinted := sniff(first)
	if hinted {
		if _, err := tb.ReadBytes('\n'); err != nil && err != io.EOF {
			return nil, err
		}
		rd.base = 1
	}
	rd.comma = comma
	rd.mark = trial.PointOrComma
	if comma == ',' && !o.DecimalComma {
		rd.mark = trial.PointOnly
	}
	rd.csv = csv.NewReader(tb)
	rd.csv.Comma = comma
	rd.csv.FieldsPerRecord = -1
	rd.csv.ReuseRecord = true
	return rd, nil
}

// Comma is the cell separator of the file.
func (r *Reader) Comma() rune { return r.comma }

// Mark is the decimal mark rule for the file's numbers (trial.ParseNumber).
func (r *Reader) Mark() trial.DecimalMark { return r.mark }

// Encoding names the file's text encoding when it is not UTF-8
// ("Windows-1252", "UTF-16LE", "UTF-16BE"), else "".
func (r *Reader) Encoding() string { return r.encoding }

// Read returns the next row that has a cell that is not empty, with its
// line in the file (1 is the first line). Trailing empty cells are
// dropped. The slice is reused by the next call. At the end it returns
// io.EOF.
func (r *Reader) Read() (line int, cells []string, err error) {
	for {
		rec, err := r.csv.Read()
		if err == io.EOF {
			return 0, nil, io.EOF
		}
		if err != nil {
			return 0, nil, csvError(err, r.base)
		}
		l, _ := r.csv.FieldPos(0)
		l += r.base
		n := len(rec)
		for n > 0 && strings.TrimSpace(rec[n-1]) == "" {
			n--
		}
		if n == 0 {
			continue
		}
		rec = rec[:n]
		if r.checkUTF {
			for _, c := range rec {
				if !utf8.ValidString(c) {
					return 0, nil, fmt.Errorf("line %d is not UTF-8 text, unlike the start of the file; save the whole file again as CSV UTF-8", l)
				}
			}
		}
		return l, rec, nil
	}
}

// ReadTable reads a whole CSV field book into a table of strings, row i of
// the table being line i+1 of the file: lines that are blank, hold only
// empty cells or continue a quoted cell are empty rows (nil), so that
// Plan's line numbers are the file's. See Reader for the format; numbers
// are read with a decimal point or comma (ReadBook refuses the ambiguous
// comma of comma-separated files).
func ReadTable(r io.Reader) ([][]string, error) {
	b, err := ReadBook(r, ReadOptions{DecimalComma: true})
	if err != nil {
		return nil, err
	}
	return b.Rows, nil
}

// ReadBook reads a whole CSV field book for PlanBook (field books are small:
// one row per plot).
func ReadBook(r io.Reader, o ReadOptions) (*Book, error) {
	rd, err := NewReader(r, o)
	if err != nil {
		return nil, err
	}
	b := &Book{Mark: rd.Mark()}
	if enc := rd.Encoding(); enc != "" {
		b.Notes = append(b.Notes, fmt.Sprintf("the file was read as %s text", enc))
	}
	for {
		line, rec, err := rd.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		for len(b.Rows) < line-1 {
			b.Rows = append(b.Rows, nil)
		}
		b.Rows = append(b.Rows, append([]string(nil), rec...))
	}
	return b, nil
}

func csvError(err error, base int) error {
	var pe *csv.ParseError
	if !errors.As(err, &pe) {
		return err
	}
	line := pe.Line + base
	switch {
	case errors.Is(pe.Err, csv.ErrBareQuote):
		return fmt.Errorf("line %d, character %d: a quote mark (\") stands inside a cell that does not start with one; put the whole cell in quotes and double the quote mark", line, pe.Column)
	case errors.Is(pe.Err, csv.ErrQuote):
		return fmt.Errorf("line %d: a quoted cell that starts on line %d is not closed properly", line, pe.StartLine+base)
	}
	return fmt.Errorf("line %d: %v", line, pe.Err)
}

// detectEncoding names the encoding of a file from its first bytes: a byte
// order mark, else UTF-16 when NUL bytes fill every other position (text
// in the Latin range), else UTF-8 when the bytes are valid UTF-8, else
// Windows-1252 (any byte is a Windows-1252 character).
func detectEncoding(head []byte) string {
	switch {
	case bytes.HasPrefix(head, []byte{0xEF, 0xBB, 0xBF}):
		return "UTF-8"
	case bytes.HasPrefix(head, []byte{0xFF, 0xFE}):
		return "UTF-16LE"
	case bytes.HasPrefix(head, []byte{0xFE, 0xFF}):
		return "UTF-16BE"
	}
	if len(head) >= 4 {
		var even, odd int
		n := len(head) &^ 1
		for i := 0; i < n; i += 2 {
			if head[i] == 0 {
				even++
			}
			if head[i+1] == 0 {
				odd++
			}
		}
		half := n / 2
		switch {
		case odd*10 >= half*9 && even*10 < half:
			return "UTF-16LE"
		case even*10 >= half*9 && odd*10 < half:
			return "UTF-16BE"
		}
	}
	h := head
	// A multi-byte character cut at the end of the sample is not an error.
	for k := 0; k < utf8.UTFMax-1 && len(h) > 0 && !utf8.Valid(h); k++ {
		h = h[:len(h)-1]
	}
	if utf8.Valid(h) {
		return "UTF-8"
	}
	return "Windows-1252"
}

// crReader turns a carriage return that is not followed by a line feed
// (the line ending of old Mac files) into a line feed; CRLF is left for the
// CSV reader. Line numbers are unchanged.
type crReader struct {
	r *bufio.Reader
}

func (c *crReader) Read(p []byte) (int, error) {
	n, err := c.r.Read(p)
	for i := 0; i < n; i++ {
		if p[i] != '\r' {
			continue
		}
		if i+1 < n {
			if p[i+1] != '\n' {
				p[i] = '\n'
			}
			continue
		}
		if next, perr := c.r.Peek(1); perr != nil || next[0] != '\n' {
			p[i] = '\n'
		}
	}
	return n, err
}

// sniff picks the separator from the first line: the most frequent of tab,
// semicolon and comma outside quotes (ties favour tab, then semicolon);
// comma when there is none. A first line "sep=X" names the separator
// directly (hinted is then true).
func sniff(data []byte) (comma rune, hinted bool) {
	line := data
	if i := bytes.IndexByte(data, '\n'); i >= 0 {
		line = data[:i]
	}
	line = bytes.TrimRight(line, "\r")
	if len(line) == 5 && bytes.EqualFold(line[:4], []byte("sep=")) {
		switch line[4] {
		case ',', ';', '\t':
			return rune(line[4]), true
		}
	}
	var n [3]int // tab, semicolon, comma
	quoted := false
	for _, c := range data {
		if c == '"' {
			quoted = !quoted
		}
		if quoted {
			continue
		}
		if c == '\n' {
			break
		}
		switch c {
		case '\t':
			n[0]++
		case ';':
			n[1]++
		case ',':
			n[2]++
		}
	}
	seps := [3]rune{'\t', ';', ','}
	best := 2
	for k := range 3 {
		if n[k] > n[best] || (n[k] == n[best] && k < best && n[k] > 0) {
			best = k
		}
	}
	return seps[best], false
}
