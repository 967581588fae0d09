package trialfile

import (
	"encoding/json"
	"errors"
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Sentinel errors. Every error Decode returns for a bad file wraps one of
// them, so callers can tell the kinds apart with errors.Is.
var (
	// ErrNotTrialFile: the file is not a Furlong trial file at all.
	ErrNotTrialFile = errors.New("not a Furlong trial file")
	// ErrNewerVersion: the file was written by a newer Furlong.
	ErrNewerVersion = errors.New("the file was written by a newer version of Furlong")
	// ErrTruncated: the file ends in the middle (an interrupted copy or save).
	ErrTruncated = errors.New("the file ends early")
	// ErrSyntax: the file is damaged: it is not well-formed JSON.
	ErrSyntax = errors.New("the file is damaged")
	// ErrWrongType: a field holds the wrong kind of value (text where a
	// number belongs, a fraction where a whole number belongs, ...).
	ErrWrongType = errors.New("a field holds the wrong kind of value")
	// ErrDuplicatePlot: two plots share a plot number.
	ErrDuplicatePlot = errors.New("two plots share a plot number")
	// ErrDuplicateTreatment: two treatments share a code.
	ErrDuplicateTreatment = errors.New("two treatments share a code")
	// ErrDuplicateTrait: two traits share a key.
	ErrDuplicateTrait = errors.New("two traits share a key")
	// ErrUnknownTreatment: a plot names a treatment code the trial lacks.
	ErrUnknownTreatment = errors.New("a plot names an unknown treatment")
	// ErrUnknownTrait: a value is filed under a trait key the trial lacks.
	ErrUnknownTrait = errors.New("a value belongs to an unknown trait")
	// ErrValueCount: a trait's list of values does not have one value per plot.
	ErrValueCount = errors.New("a trait does not have one value per plot")
	// ErrValueKind: a value is impossible for its trait's kind (a count of
	// 2.5, a percentage of 130, a number too large to store).
	ErrValueKind = errors.New("a value does not fit its trait")
	// ErrOutOfRange: a number lies outside what its field can hold (a
	// block of 0, a plot at row 100000000000, 10000000 decimals).
	ErrOutOfRange = errors.New("a number is outside what its field can hold")
	// ErrUnknownDesign: the design kind is not one Furlong knows.
	ErrUnknownDesign = errors.New("the design is not one Furlong knows")
	// ErrDuplicateKey: an object names the same member twice.
	ErrDuplicateKey = errors.New("a member is named twice")
)

// ParseError locates a problem in a trial file.
type ParseError struct {
	// Path is the JSON path of the offending value, for example
	// "trial.plots[3].number"; empty when the problem has no place.
	Path string
	// Line and Column are 1-based; Column counts characters. Both are 0
	// when unknown.
	Line, Column int
	// Err describes the problem; it wraps one of the package's sentinels.
	Err error
}

// Error implements the error interface.
func (e *ParseError) Error() string {
	var b strings.Builder
	if e.Line > 0 {
		fmt.Fprintf(&b, "line %d, column %d", e.Line, e.Column)
	}
	if e.Path != "" {
		if b.Len() > 0 {
			b.WriteString(" ")
		}
		fmt.Fprintf(&b, "(%s)", shortPath(e.Path))
	}
	if b.Len() > 0 {
		b.WriteString(": ")
	}
	b.WriteString(e.Err.Error())
	return b.String()
}

// Unwrap returns the underlying error.
func (e *ParseError) Unwrap() error { return e.Err }

// detail is a specific message that wraps a sentinel.
type detail struct {
	kind error
	msg  string
}

func (d *detail) Error() string { return d.msg }
func (d *detail) Unwrap() error { return d.kind }

func errorf(kind error, format string, args ...any) error {
	return &detail{kind: kind, msg: fmt.Sprintf(format, args...)}
}

// newerVersionError is the message for a file from a newer Furlong.
func newerVersionError(v int64) error {
	return errorf(ErrNewerVersion, "this file was written by a newer version of Furlong (file format %d; this version reads up to %d). Update Furlong to open it.", v, Version)
}

// maxPathShown is the longest JSON path a message shows in full; a longer
// one (deeply nested data) keeps its start and its end.
const maxPathShown = 120

func shortPath(p string) string {
	if len(p) <= maxPathShown {
		return p
	}
	head, tail := p[:maxPathShown/2], p[len(p)-maxPathShown/2:]
	return strings.ToValidUTF8(head, "") + "…" + strings.ToValidUTF8(tail, "")
}

// position converts a byte offset into a 1-based line and column
// (characters, not bytes).
func position(data []byte, off int) (line, col int) {
	if off > len(data) {
		off = len(data)
	}
	if off < 0 {
		off = 0
	}
	line, start := 1, 0
	for i := 0; i < off; i++ {
		if data[i] == '\n' {
			line++
			start = i + 1
		}
	}
	return line, utf8.RuneCount(data[start:off]) + 1
}

// at builds a ParseError for path with the position of the value at path.
func at(data []byte, path string, err error) *ParseError {
	pe := &ParseError{Path: path, Err: err}
	if off := locate(data, path); off >= 0 {
		pe.Line, pe.Column = position(data, off)
	}
	return pe
}

// syntaxError translates a JSON syntax error.
func syntaxError(data []byte, e *json.SyntaxError) *ParseError {
	off := int(e.Offset)
	if strings.Contains(e.Error(), "exceeded max depth") {
		// encoding/json stops at 10000 levels; no trial nests deeper than 6.
		pe := &ParseError{Err: errorf(ErrSyntax, "the file is damaged: its values are nested more than 10000 levels deep; restore the backup copy (.bak) or an earlier version")}
		pe.Line, pe.Column = position(data, off)
		return pe
	}
	path, _ := pathAt(data, off)
	pe := &ParseError{Path: path}
	// An error past the last character that is not a blank means the data
	// ended inside something: a cut-off file, also inside null, true or
	// false (encoding/json then complains of a blank "in literal").
	if off >= len(strings.TrimRight(string(data), " \t\r\n")) {
		pe.Path = ""
		pe.Err = errorf(ErrTruncated, "the file ends early: it may have been cut short while being copied or saved; restore the backup copy (.bak) or an earlier version")
		pe.Line, pe.Column = position(data, len(data))
		return pe
	}
	// The offset counts the offending byte; point at it.
	if off > 0 {
		off--
	}
	pe.Line, pe.Column = position(data, off)
	pe.Err = errorf(ErrSyntax, "the file is damaged: %s; restore the backup copy (.bak) or an earlier version", jsonProblem(e.Error()))
	return pe
}

// typeError translates a JSON type mismatch.
func typeError(data []byte, e *json.UnmarshalTypeError) *ParseError {
	path, start := pathAt(data, int(e.Offset))
	pe := &ParseError{Path: path}
	pe.Line, pe.Column = position(data, start)
	want := "a value of another kind"
	if e.Type != nil {
		switch e.Type.Kind().String() {
		case "int", "int64", "int32", "uint", "uint64":
			want = "a whole number"
		case "float64", "float32":
			want = "a number"
		case "string":
			want = "text"
		case "bool":
			want = "true or false"
		case "slice", "array":
			want = "a list"
		case "struct", "map":
			want = "an object"
		case "ptr":
			want = "a value of another kind"
		}
	}
	found := e.Value
	if n, ok := strings.CutPrefix(found, "number "); ok {
		if want == "a number" {
			pe.Err = errorf(ErrValueKind, "the number %s is too large to store", n)
			return pe
		}
		found = n
	} else {
		found = "a " + found
		if e.Value == "array" {
			found = "a list"
		}
	}
	pe.Err = errorf(ErrWrongType, "expected %s, found %s", want, found)
	return pe
}

// pathElem is one step of a JSON path.
type pathElem struct {
	key   string
	index int // -1 for an object member
}

func formatPath(p []pathElem) string {
	var b strings.Builder
	for _, e := range p {
		if e.index >= 0 {
			b.WriteByte('[')
			b.WriteString(strconv.Itoa(e.index))
			b.WriteByte(']')
			continue
		}
		if b.Len() > 0 {
			b.WriteByte('.')
		}
		b.WriteString(e.key)
	}
	return b.String()
}

// pathAt returns the path and start offset of the last value (in document
// order) that starts before off.
func pathAt(data []byte, off int) (string, int) {
	path, start := "", 0
	walk(data, func(p []pathElem, s int) bool {
		if s >= off {
			return false
		}
		path, start = formatPath(p), s
		return true
	})
	return path, start
}

// locate returns the offset where the value at path starts, or -1.
func locate(data []byte, path string) int {
	found := -1
	walk(data, func(p []pathElem, s int) bool {
		if formatPath(p) == path {
			found = s
			return false
		}
		return true
	})
	return found
}

// walk visits every value of a JSON document in order with its path and
// start offset until visit returns false or the data ends or turns invalid.
// It never panics, whatever data holds.
func walk(data []byte, visit func(path []pathElem, start int) bool) {
	w := &walker{data: data, visit: visit}
	w.value(0)
}

type walker struct {
	data  []byte
	i     int
	path  []pathElem
	visit func([]pathElem, int) bool
	stop  bool
}

func (w *walker) ws() {
	for w.i < len(w.data) {
		switch w.data[w.i] {
		case ' ', '\t', '\r', '\n':
			w.i++
		default:
			return
		}
	}
}

func (w *walker) value(depth int) {
	w.ws()
	if w.i >= len(w.data) || depth > 20000 {
		w.stop = true
		return
	}
	if !w.visit(w.path, w.i) {
		w.stop = true
		return
	}
	switch w.data[w.i] {
	case '{':
		w.i++
		for !w.stop {
			w.ws()
			if w.i >= len(w.data) {
				w.stop = true
				return
			}
			switch w.data[w.i] {
			case '}':
				w.i++
				return
			case ',':
				w.i++
				continue
			case '"':
			default:
				w.stop = true
				return
			}
			ks := w.i
			w.skipString()
			var key string
			if json.Unmarshal(w.data[ks:w.i], &key) != nil {
				key = string(w.data[ks:w.i])
			}
			w.ws()
			if w.i >= len(w.data) || w.data[w.i] != ':' {
				w.stop = true
				return
			}
			w.i++
			w.path = append(w.path, pathElem{key: key, index: -1})
			w.value(depth + 1)
			w.path = w.path[:len(w.path)-1]
		}
	case '[':
		w.i++
		for n := 0; !w.stop; n++ {
			w.ws()
			if w.i >= len(w.data) {
				w.stop = true
				return
			}
			if w.data[w.i] == ']' {
				w.i++
				return
			}
			w.path = append(w.path, pathElem{index: n})
			w.value(depth + 1)
			w.path = w.path[:len(w.path)-1]
			if w.stop {
				return
			}
			w.ws()
			if w.i < len(w.data) && w.data[w.i] == ',' {
				w.i++
			}
		}
	case '"':
		w.skipString()
	default:
		start := w.i
		for w.i < len(w.data) {
			c := w.data[w.i]
			if c == ',' || c == ']' || c == '}' || c == ' ' || c == '\t' || c == '\r' || c == '\n' {
				break
			}
			w.i++
		}
		if w.i == start {
			w.stop = true
		}
	}
}

// skipString moves past a JSON string starting at w.i.
func (w *walker) skipString() {
	w.i++
	for w.i < len(w.data) {
		switch w.data[w.i] {
		case '\\':
			w.i += 2
		case '"':
			w.i++
			return
		default:
			w.i++
		}
	}
	w.i = len(w.data)
}

// jsonProblem rewrites encoding/json's syntax messages ("invalid character
// 'x' after object key") in plain words.
func jsonProblem(msg string) string {
	if rest, ok := strings.CutPrefix(msg, "invalid character "); ok {
		ch, where, _ := strings.Cut(rest, " ")
		switch {
		case strings.HasPrefix(where, "after object key:value pair"), strings.HasPrefix(where, "after array element"):
			return "a comma or closing bracket is missing before " + ch
		case strings.HasPrefix(where, "after object key"):
			return "a colon is missing before " + ch
		case strings.HasPrefix(where, "looking for beginning of object key"):
			return "a quoted name was expected instead of " + ch
		}
		return "the character " + ch + " does not belong here"
	}
	return "the text is not well-formed"
}
