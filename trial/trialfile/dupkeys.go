package trialfile

import (
	"bytes"
	"encoding/json"
	"strings"
)

// structural marks the bytes that end a number or a literal in JSON.
var structural = func() (t [256]bool) {
	for _, c := range []byte(" \t\r\n,:[]{}\"") {
		t[c] = true
	}
	return t
}()

// fold gives the form of a member name that encoding/json's matching,
// which ignores case, would not tell apart.
func fold(b []byte) string { return strings.ToLower(strings.ToUpper(string(b))) }

// duplicateKey finds the first object member in data (well-formed JSON)
// whose name its object already has, and reports it with its path.
// encoding/json would silently keep the last one, and it matches names
// regardless of case, so "Title" and "title" count as the same name too.
// The scan keeps its own stack, so deep nesting costs no recursion.
func duplicateKey(data []byte) *ParseError {
	type frame struct {
		obj       bool
		expectKey bool
		rawKey    []byte            // the current member's name (objects)
		index     int               // the current element's index (lists)
		names     [][]byte          // names as written (raw, unescaped ones point into data)
		set       map[string]string // folded name → name as written, for big objects
	}
	var stack []frame
	path := func(last string) string {
		p := make([]pathElem, 0, len(stack))
		for k, f := range stack {
			switch {
			case !f.obj:
				p = append(p, pathElem{index: f.index})
			case k == len(stack)-1:
				p = append(p, pathElem{key: last, index: -1})
			default:
				p = append(p, pathElem{key: string(f.rawKey), index: -1})
			}
		}
		return formatPath(p)
	}
	i := 0
	for i < len(data) {
		switch c := data[i]; c {
		case ' ', '\t', '\r', '\n', ':':
			i++
		case '{':
			stack = append(stack, frame{obj: true, expectKey: true})
			i++
		case '[':
			stack = append(stack, frame{})
			i++
		case '}', ']':
			if len(stack) > 0 {
				stack = stack[:len(stack)-1]
			}
			i++
		case ',':
			if n := len(stack); n > 0 {
				if stack[n-1].obj {
					stack[n-1].expectKey = true
				} else {
					stack[n-1].index++
				}
			}
			i++
		case '"':
			start := i
			i++
			escaped := false
			for i < len(data) && data[i] != '"' {
				if data[i] == '\\' {
					escaped = true
					i++
				}
				i++
			}
			i++
			n := len(stack)
			if n == 0 || !stack[n-1].obj || !stack[n-1].expectKey {
				continue
			}
			top := &stack[n-1]
			top.expectKey = false
			end := min(i, len(data))
			raw := data[start+1 : max(start+1, end-1)]
			if escaped {
				var name string
				json.Unmarshal(data[start:end], &name)
				raw = []byte(name)
			}
			var first string
			found := false
			if top.set != nil {
				first, found = top.set[fold(raw)]
			} else {
				for _, k := range top.names {
					if bytes.EqualFold(k, raw) {
						first, found = string(k), true
						break
					}
				}
			}
			name := ""
			if found {
				name = string(raw)
				where := path(first)
				if i := strings.LastIndexByte(where, '.'); i >= 0 {
					where = where[:i]
				} else {
					where = "the top level of the file"
				}
				msg := "the member %q appears twice in %s"
				args := []any{name, where}
				if first != name {
					msg = "the members %q and %q in %s are the same name (names do not depend on capitals)"
					args = []any{first, name, where}
				}
				pe := &ParseError{Path: path(name), Err: errorf(ErrDuplicateKey, msg+"; a trial file names each member once: remove the wrong one, or restore the backup copy (.bak)", args...)}
				pe.Line, pe.Column = position(data, start)
				return pe
			}
			top.rawKey = raw
			if top.set == nil && len(top.names) < 16 {
				top.names = append(top.names, raw)
				continue
			}
			if top.set == nil {
				top.set = make(map[string]string, 32)
				for _, k := range top.names {
					top.set[fold(k)] = string(k)
				}
				top.names = nil
			}
			top.set[fold(raw)] = string(raw)
		default:
			// A number or a literal: skip to the next structural byte.
			i++
			for i < len(data) && !structural[data[i]] {
				i++
			}
		}
	}
	return nil
}
