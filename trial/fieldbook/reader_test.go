package fieldbook

import (
	"bytes"
	"encoding/binary"
	"io"
	"strings"
	"testing"
	"unicode/utf16"

	"furlong/trial"
)

type readRow struct {
	line  int
	cells string // joined with |
}

func readAll(t *testing.T, data []byte, o ReadOptions) (*Reader, []readRow, error) {
	t.Helper()
	rd, err := NewReader(bytes.NewReader(data), o)
	if err != nil {
		return nil, nil, err
	}
	var rows []readRow
	for {
		line, rec, err := rd.Read()
		if err == io.EOF {
			return rd, rows, nil
		}
		if err != nil {
			return rd, rows, err
		}
		rows = append(rows, readRow{line, strings.Join(rec, "|")})
	}
}

func utf16Bytes(s string, order binary.ByteOrder, bom bool) []byte {
	u := utf16.Encode([]rune(s))
	if bom {
		u = append([]uint16{0xFEFF}, u...)
	}
	out := make([]byte, 2*len(u))
	for i, c := range u {
		order.PutUint16(out[2*i:], c)
	}
	return out
}

func TestReaderFormats(t *testing.T) {
	t.Parallel()
	want := []readRow{{1, "plot|Höhe (µm)|note"}, {2, "101|5|€ 5"}, {3, "102|6,5|x"}}
	text := "plot;Höhe (µm);note\n101;5;€ 5\n102;6,5;x\n"
	// Windows-1252 bytes from its code chart (WHATWG Encoding Standard,
	// index-windows-1252): ö 0xF6, µ 0xB5, € 0x80.
	cp1252 := []byte("plot;H\xf6he (\xb5m);note\n101;5;\x80 5\n102;6,5;x\n")
	cases := []struct {
		name string
		data []byte
		enc  string
		want []readRow
	}{
		{"UTF-8", []byte(text), "", want},
		{"UTF-8 with BOM", append([]byte{0xEF, 0xBB, 0xBF}, text...), "", want},
		// RFC 4180 ends lines with CRLF; old Mac files with CR alone.
		{"CRLF", []byte(strings.ReplaceAll(text, "\n", "\r\n")), "", want},
		{"CR only", []byte(strings.ReplaceAll(text, "\n", "\r")), "", want},
		{"UTF-16LE with BOM", utf16Bytes(text, binary.LittleEndian, true), "UTF-16LE", want},
		{"UTF-16LE without BOM", utf16Bytes(text, binary.LittleEndian, false), "UTF-16LE", want},
		{"UTF-16BE without BOM", utf16Bytes(text, binary.BigEndian, false), "UTF-16BE", want},
		{"Windows-1252", cp1252, "Windows-1252", want},
		{"sep line", []byte("sep=;\n" + text), "", []readRow{{2, "plot|Höhe (µm)|note"}, {3, "101|5|€ 5"}, {4, "102|6,5|x"}}},
		// Blank lines and lines of empty cells are skipped; line numbers stay the file's.
		{"blank lines", []byte("plot;Höhe (µm);note\n\n101;5;€ 5\n;;\n  ;\n102;6,5;x\n\n"), "", []readRow{{1, "plot|Höhe (µm)|note"}, {3, "101|5|€ 5"}, {6, "102|6,5|x"}}},
		// Trailing empty cells are dropped.
		{"trailing empty cells", []byte("plot;Höhe (µm);note;;\n101;5;€ 5;;;\n102;6,5;x;\n"), "", want},
		// RFC 4180 §2.6: a quoted cell may hold a line break (CR-only files too).
		{"quoted line break", []byte("a,b\r\"x\ry\",2\r3,4\r"), "", []readRow{{1, "a|b"}, {2, "x\ny|2"}, {4, "3|4"}}},
	}
	for _, c := range cases {
		rd, rows, err := readAll(t, c.data, ReadOptions{})
		if err != nil {
			t.Errorf("%s: %v", c.name, err)
			continue
		}
		if rd.Encoding() != c.enc {
			t.Errorf("%s: encoding %q, want %q", c.name, rd.Encoding(), c.enc)
		}
		if len(rows) != len(c.want) {
			t.Errorf("%s: rows %v, want %v", c.name, rows, c.want)
			continue
		}
		for i := range rows {
			if rows[i] != c.want[i] {
				t.Errorf("%s: row %d = %v, want %v", c.name, i, rows[i], c.want[i])
			}
		}
	}
}

func TestReaderDecimalMark(t *testing.T) {
	t.Parallel()
	cases := []struct {
		data string
		o    ReadOptions
		mark trial.DecimalMark
	}{
		{"a,b\n1,2\n", ReadOptions{}, trial.PointOnly},
		{"a,b\n1,\"2,5\"\n", ReadOptions{DecimalComma: true}, trial.PointOrComma},
		{"a;b\n1;2,5\n", ReadOptions{}, trial.PointOrComma},
		{"a\tb\n1\t2,5\n", ReadOptions{}, trial.PointOrComma},
	}
	for _, c := range cases {
		rd, err := NewReader(strings.NewReader(c.data), c.o)
		if err != nil {
			t.Fatal(err)
		}
		if rd.Mark() != c.mark {
			t.Errorf("%q %+v: mark %v, want %v", c.data, c.o, rd.Mark(), c.mark)
		}
	}
}

func TestReaderRefusesMixedEncodings(t *testing.T) {
	t.Parallel()
	// Valid UTF-8 at the start, a Windows-1252 byte far beyond the sniffed part.
	data := "plot,ht\n" + strings.Repeat("1,2\n", sniffSize/4+10) + "2,\xe9\n"
	_, _, err := readAll(t, []byte(data), ReadOptions{})
	if err == nil || !strings.Contains(err.Error(), "UTF-8") || !strings.Contains(err.Error(), "line ") {
		t.Errorf("got %v, want a message naming the line and UTF-8", err)
	}
}

// A book read in UTF-16 says so in the import report.
func TestBookNotesTheEncoding(t *testing.T) {
	t.Parallel()
	b, err := ReadBook(bytes.NewReader(utf16Bytes("plot,ht\n1,5\n", binary.LittleEndian, false)), ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := PlanBook(smallTrial(), b)
	if err != nil {
		t.Fatal(err)
	}
	var r strings.Builder
	p.Report(&r)
	if !strings.Contains(r.String(), "read as UTF-16LE text") || len(p.Changes()) != 1 {
		t.Errorf("report:\n%s", r.String())
	}
}

// A book that holds nothing new says there is nothing to import, not "Ready to import".
func TestUnfilledBookHasNothingToImport(t *testing.T) {
	t.Parallel()
	b, err := ReadBook(strings.NewReader("plot,block,row,column,treatment,ht,n,pc\n1,1,1,1,A,,,\n2,1,1,2,B,,,\n3,2,2,1,B,20,,\n4,2,2,2,A,,,\n"), ReadOptions{})
	if err != nil {
		t.Fatal(err)
	}
	p, err := PlanBook(smallTrial(), b)
	if err != nil {
		t.Fatal(err)
	}
	var r strings.Builder
	p.Report(&r)
	if !strings.Contains(r.String(), "Nothing to import") || strings.Contains(r.String(), "Ready to import") {
		t.Errorf("report:\n%s", r.String())
	}
}
