// Package jsonout writes JSON as a stream: a small Writer that appends
// objects, arrays, numbers and strings to a buffer and hands it to an
// io.Writer in chunks, so a large document (half a million mean pairs) is
// never built in memory, and the mapping of an analysis result to the JSON
// document of `furlong analyze --format json` (WriteAnalysis), in one place.
//
// Numbers and strings are written exactly as encoding/json writes them
// (shortest decimal that reads back to the same float64; the same escapes),
// so a document decodes to the same values as one marshalled from structs.
package jsonout

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"unicode/utf8"
)

// flushAt is the buffer size at which the Writer hands its bytes on.
const flushAt = 64 << 10

// Writer writes one JSON document as a stream. Containers nest with
// BeginObject/EndObject and BeginArray/EndArray; inside an object every
// value is preceded by Key (or use the Field helpers, which do both).
//
// Layout: each member of an ordinary container starts on its own line,
// indented by two spaces a level; a container begun with
// BeginCompactObject (and everything inside it) is written on one line
// without spaces, which keeps long lists of small records (pairs, means)
// short and fast to read back.
//
// The first error (of the io.Writer, or a value JSON cannot hold such as
// NaN) is kept: later calls do nothing, and Flush and Err return it.
type Writer struct {
	out io.Writer
	buf []byte
	err error
	// stack holds one entry per open container.
	stack []frame
	// afterKey is set between Key and its value.
	afterKey bool
	// compact counts open compact containers (0: indented layout).
	compact int
	// key is the last key, named in errors.
	key string
}

type frame struct {
	object  bool
	compact bool
	n       int // members written so far
}

// New returns a Writer that writes to w. Call Flush at the end.
func New(w io.Writer) *Writer {
	return &Writer{out: w, buf: make([]byte, 0, flushAt+4096)}
}

// Err returns the first error met, or nil.
func (w *Writer) Err() error { return w.err }

// Flush writes out what is buffered and returns the first error met. A
// complete document ends with a newline (as json.Encoder writes it).
func (w *Writer) Flush() error {
	if w.err != nil {
		return w.err
	}
	if len(w.stack) == 0 && len(w.buf) > 0 && w.buf[len(w.buf)-1] != '\n' {
		w.buf = append(w.buf, '\n')
	}
	w.write()
	return w.err
}

func (w *Writer) write() {
	if w.err != nil || len(w.buf) == 0 {
		return
	}
	_, w.err = w.out.Write(w.buf)
	w.buf = w.buf[:0]
}

func (w *Writer) maybeFlush() {
	if w.out != nil && len(w.buf) >= flushAt {
		w.write()
	}
}

func (w *Writer) fail(err error) {
	if w.err == nil {
		w.err = err
	}
}

// newline starts a line at the current depth.
func (w *Writer) newline() {
	w.buf = append(w.buf, '\n')
	for range len(w.stack) {
		w.buf = append(w.buf, ' ', ' ')
	}
}

// beforeValue writes the separator and line break due before a value (or
// before a key in an object).
func (w *Writer) beforeValue() bool {
	if w.err != nil {
		return false
	}
	if w.afterKey {
		w.afterKey = false
		return true
	}
	if len(w.stack) == 0 {
		return true
	}
	f := &w.stack[len(w.stack)-1]
	if f.object {
		w.fail(fmt.Errorf("jsonout: a value without a key in an object (after %q)", w.key))
		return false
	}
	if f.n > 0 {
		w.buf = append(w.buf, ',')
	}
	f.n++
	if w.compact == 0 {
		w.newline()
	}
	return true
}

// Key writes the key of the next member of the current object.
func (w *Writer) Key(k string) {
	if w.err != nil {
		return
	}
	if len(w.stack) == 0 || !w.stack[len(w.stack)-1].object || w.afterKey {
		w.fail(fmt.Errorf("jsonout: key %q outside an object", k))
		return
	}
	w.key = k
	f := &w.stack[len(w.stack)-1]
	if f.n > 0 {
		w.buf = append(w.buf, ',')
	}
	f.n++
	if w.compact == 0 {
		w.newline()
	}
	w.buf = appendString(w.buf, k)
	if w.compact == 0 {
		w.buf = append(w.buf, ':', ' ')
	} else {
		w.buf = append(w.buf, ':')
	}
	w.afterKey = true
}

func (w *Writer) begin(open byte, object, compact bool) {
	if !w.beforeValue() {
		return
	}
	w.buf = append(w.buf, open)
	if compact {
		w.compact++
	}
	w.stack = append(w.stack, frame{object: object, compact: compact})
}

func (w *Writer) end(close byte, object bool) {
	if w.err != nil {
		return
	}
	if len(w.stack) == 0 || w.stack[len(w.stack)-1].object != object || w.afterKey {
		w.fail(fmt.Errorf("jsonout: %q does not close the open container", close))
		return
	}
	f := w.stack[len(w.stack)-1]
	w.stack = w.stack[:len(w.stack)-1]
	if f.compact {
		w.compact--
	} else if f.n > 0 {
		w.newline()
	}
	w.buf = append(w.buf, close)
	w.maybeFlush()
}

// BeginObject opens an object whose members go on lines of their own.
func (w *Writer) BeginObject() { w.begin('{', true, w.compact > 0) }

// BeginCompactObject opens an object written on one line, with everything
// inside it.
func (w *Writer) BeginCompactObject() { w.begin('{', true, true) }

// EndObject closes the innermost object.
func (w *Writer) EndObject() { w.end('}', true) }

// BeginArray opens an array whose elements go on lines of their own.
func (w *Writer) BeginArray() { w.begin('[', false, w.compact > 0) }

// BeginCompactArray opens an array written on one line.
func (w *Writer) BeginCompactArray() { w.begin('[', false, true) }

// EndArray closes the innermost array.
func (w *Writer) EndArray() { w.end(']', false) }

// String writes a string value.
func (w *Writer) String(s string) {
	if w.beforeValue() {
		w.buf = appendString(w.buf, s)
	}
}

// Int writes an integer value.
func (w *Writer) Int(v int) {
	if w.beforeValue() {
		w.buf = strconv.AppendInt(w.buf, int64(v), 10)
	}
}

// Bool writes true or false.
func (w *Writer) Bool(v bool) {
	if w.beforeValue() {
		w.buf = strconv.AppendBool(w.buf, v)
	}
}

// Null writes null.
func (w *Writer) Null() {
	if w.beforeValue() {
		w.buf = append(w.buf, "null"...)
	}
}

// Number writes a float64 in the shortest form that reads back to the same
// value, as encoding/json does. NaN and infinities have no JSON form: they
// stop the document with an error (a value that does not apply is null or
// left out, never NaN).
func (w *Writer) Number(v float64) {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		if w.err == nil {
			w.fail(fmt.Errorf("jsonout: %q is %v, which JSON cannot hold", w.key, v))
		}
		return
	}
	if w.beforeValue() {
		w.buf = AppendNumber(w.buf, v)
	}
}

// NullableNumber writes *v, or null when v is nil.
func (w *Writer) NullableNumber(v *float64) {
	if v == nil {
		w.Null()
		return
	}
	w.Number(*v)
}

// NullableString writes *s, or null when s is nil.
func (w *Writer) NullableString(s *string) {
	if s == nil {
		w.Null()
		return
	}
	w.String(*s)
}

// Strings writes an array of strings (an empty array for none), one per line.
func (w *Writer) Strings(ss []string) {
	w.BeginArray()
	for _, s := range ss {
		w.String(s)
	}
	w.EndArray()
}

// StringField writes a member with a string value.
func (w *Writer) StringField(k, s string) { w.Key(k); w.String(s) }

// IntField writes a member with an integer value.
func (w *Writer) IntField(k string, v int) { w.Key(k); w.Int(v) }

// BoolField writes a member with a boolean value.
func (w *Writer) BoolField(k string, v bool) { w.Key(k); w.Bool(v) }

// NumberField writes a member with a number value.
func (w *Writer) NumberField(k string, v float64) { w.Key(k); w.Number(v) }

// NullableNumberField writes a member whose value is a number or null.
func (w *Writer) NullableNumberField(k string, v *float64) { w.Key(k); w.NullableNumber(v) }

// OptionalNumberField writes a member only when v is not nil (a key left
// out when it does not apply, like encoding/json's omitempty on a pointer).
func (w *Writer) OptionalNumberField(k string, v *float64) {
	if v != nil {
		w.Key(k)
		w.Number(*v)
	}
}

// NumberMemo remembers the last number written through it, so a value
// repeated down a long list (the SE, LSD and HSD of every pair of a
// balanced trial) is formatted once. The zero value is ready to use.
type NumberMemo struct {
	bits uint64
	text []byte
	set  bool
}

// NumberFieldMemo is NumberField with the text of v kept in m for the next
// call with the same value.
func (w *Writer) NumberFieldMemo(k string, v float64, m *NumberMemo) {
	if b := math.Float64bits(v); !m.set || b != m.bits {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			w.NumberField(k, v) // refused there
			return
		}
		m.bits, m.set = b, true
		m.text = AppendNumber(m.text[:0], v)
	}
	w.Key(k)
	if w.beforeValue() {
		w.buf = append(w.buf, m.text...)
	}
}

// AppendNumber appends v as encoding/json formats a float64: the shortest
// decimal that reads back to v, plain for 1e-6 ≤ |v| < 1e21 and with an
// exponent (e-7, e+21) otherwise. v must be finite.
func AppendNumber(b []byte, v float64) []byte {
	abs := math.Abs(v)
	format := byte('f')
	if abs != 0 && (abs < 1e-6 || abs >= 1e21) {
		format = 'e'
	}
	b = strconv.AppendFloat(b, v, format, -1, 64)
	if format == 'e' {
		// e-09 → e-9, as encoding/json writes it.
		n := len(b)
		if n >= 4 && b[n-4] == 'e' && b[n-3] == '-' && b[n-2] == '0' {
			b[n-2] = b[n-1]
			b = b[:n-1]
		}
	}
	return b
}

const hexDigits = "0123456789abcdef"

// appendString appends s quoted with encoding/json's escapes: \" \\ \b \f
// \n \r \t, other control characters and <, >, & as \u00XX, U+2028 and
// U+2029 as \u2028 and \u2029, and invalid UTF-8 as \ufffd.
func appendString(b []byte, s string) []byte {
	b = append(b, '"')
	start := 0
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			if c >= 0x20 && c != '"' && c != '\\' && c != '<' && c != '>' && c != '&' {
				i++
				continue
			}
			b = append(b, s[start:i]...)
			switch c {
			case '"', '\\':
				b = append(b, '\\', c)
			case '\b':
				b = append(b, '\\', 'b')
			case '\f':
				b = append(b, '\\', 'f')
			case '\n':
				b = append(b, '\\', 'n')
			case '\r':
				b = append(b, '\\', 'r')
			case '\t':
				b = append(b, '\\', 't')
			default:
				b = append(b, '\\', 'u', '0', '0', hexDigits[c>>4], hexDigits[c&0xF])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			b = append(b, s[start:i]...)
			b = append(b, `\ufffd`...)
			i += size
			start = i
			continue
		}
		if r == '\u2028' || r == '\u2029' {
			b = append(b, s[start:i]...)
			b = append(b, '\\', 'u', '2', '0', '2', hexDigits[r&0xF])
			i += size
			start = i
			continue
		}
		i += size
	}
	b = append(b, s[start:]...)
	return append(b, '"')
}
