package xlsx

import (
	"strconv"
	"strings"
	"unicode"
	"unicode/utf16"
)

// maxSheetName is the longest sheet name a spreadsheet accepts, in UTF-16
// code units (Excel's limit of 31 characters; excelize counts the same way).
const maxSheetName = 31

// sheetNamer hands out sheet names that a spreadsheet accepts: at most 31
// characters, none of []:*?/\, not empty, not starting or ending with an
// apostrophe, not the reserved name "History", and unique without regard to
// case.
type sheetNamer struct {
	used map[string]bool // keyed by the case-folded name
}

func newSheetNamer() *sheetNamer { return &sheetNamer{used: make(map[string]bool)} }

// name returns a valid, unused sheet name as close to want as possible, and
// reserves it. fallback is used when nothing of want survives cleaning.
func (n *sheetNamer) name(want, fallback string) string {
	base := cleanSheetName(want)
	if base == "" {
		base = cleanSheetName(fallback)
	}
	if base == "" {
		base = "Sheet"
	}
	for i := 1; ; i++ {
		cand := base
		if i > 1 {
			suffix := " (" + strconv.Itoa(i) + ")"
			cand = trimQuotes(truncateUTF16(base, maxSheetName-utf16Len(suffix))) + suffix
		}
		key := foldName(cand)
		if !n.used[key] && key != foldName("History") {
			n.used[key] = true
			return cand
		}
	}
}

// foldName is the key under which two sheet names count as the same.
func foldName(s string) string { return strings.ToLower(strings.ToUpper(s)) }

// cleanSheetName replaces the characters a sheet name may not hold, drops
// control characters, trims spaces and apostrophes from the ends and cuts the
// name to the length limit.
func cleanSheetName(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case strings.ContainsRune(`[]:*?/\`, r):
			b.WriteRune('-')
		case unicode.IsControl(r) || r == unicode.ReplacementChar:
			b.WriteRune(' ')
		default:
			b.WriteRune(r)
		}
	}
	out := strings.Join(strings.Fields(b.String()), " ")
	out = trimQuotes(out)
	out = trimQuotes(truncateUTF16(out, maxSheetName))
	return out
}

func trimQuotes(s string) string {
	return strings.TrimSpace(strings.Trim(strings.TrimSpace(s), "'"))
}

func utf16Len(s string) int {
	n := 0
	for _, r := range s {
		n += utf16.RuneLen(r)
	}
	return n
}

// truncateUTF16 cuts s to at most max UTF-16 code units without splitting a
// character.
func truncateUTF16(s string, max int) string {
	n := 0
	for i, r := range s {
		l := utf16.RuneLen(r)
		if l < 0 {
			l = 1
		}
		if n+l > max {
			return s[:i]
		}
		n += l
	}
	return s
}
