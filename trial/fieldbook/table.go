package fieldbook

import (
	"bytes"
	"encoding/binary"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"unicode/utf16"
	"unicode/utf8"
)

// ReadTable reads a CSV field book into a table of strings, row i of the
// table being line i+1 of the file (rows are padded with empty rows where
// the file has blank lines or cells spanning lines, so that Plan's line
// numbers are the file's).
//
// The separator, comma, semicolon or tab, is detected from the header line
// (the first line); a first line "sep=;" as some spreadsheets write it also
// sets the separator. A byte order mark is removed; files in UTF-16 (with a
// byte order mark, as spreadsheets save "Unicode text") are converted to
// UTF-8. Quoted cells may hold separators, quotes ("") and line breaks.
func ReadTable(r io.Reader) ([][]string, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	data = toUTF8(data)
	var out [][]string
	comma, hinted := sniff(data)
	if hinted {
		// Drop the "sep=" line but keep the numbering.
		if i := bytes.IndexByte(data, '\n'); i >= 0 {
			data = data[i+1:]
		} else {
			data = nil
		}
		out = append(out, nil)
	}
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = comma
	cr.FieldsPerRecord = -1
	base := len(out)
	for {
		rec, err := cr.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, csvError(err, base)
		}
		line, _ := cr.FieldPos(0)
		for len(out) < base+line-1 {
			out = append(out, nil)
		}
		out = append(out, rec)
	}
	return out, nil
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

// toUTF8 removes a UTF-8 byte order mark and converts UTF-16 text that
// starts with a byte order mark.
func toUTF8(data []byte) []byte {
	switch {
	case bytes.HasPrefix(data, []byte{0xEF, 0xBB, 0xBF}):
		return data[3:]
	case bytes.HasPrefix(data, []byte{0xFF, 0xFE}), bytes.HasPrefix(data, []byte{0xFE, 0xFF}):
		var order binary.ByteOrder = binary.LittleEndian
		if data[0] == 0xFE {
			order = binary.BigEndian
		}
		data = data[2:]
		u := make([]uint16, len(data)/2)
		for i := range u {
			u[i] = order.Uint16(data[2*i:])
		}
		out := make([]byte, 0, len(u))
		for _, r := range utf16.Decode(u) {
			out = utf8.AppendRune(out, r)
		}
		return out
	}
	return data
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
