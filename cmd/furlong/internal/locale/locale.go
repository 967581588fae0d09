// Package locale quiets the toolkit's complaint about the "C" locale.
//
// Fyne reads the user's locale while its packages initialise and logs an
// error for "C" or "POSIX" (common on servers, containers and fresh
// installs), which would clutter every command's output. This package is
// imported by main for its side effect; Go initialises packages in import
// path order when they do not depend on each other, so "furlong/..." runs
// before "fyne.io/...". Furlong's words are English only, so an unusable
// locale is replaced by en_US.UTF-8; a real locale is left alone.
package locale

import (
	"os"
	"strings"
)

func init() {
	for _, v := range []string{"LC_ALL", "LC_MESSAGES", "LANG"} {
		val, ok := os.LookupEnv(v)
		if !ok || val == "" {
			continue
		}
		if usable(val) {
			return // the first one set decides, and it is fine
		}
		os.Setenv(v, "en_US.UTF-8")
		return
	}
	os.Setenv("LANG", "en_US.UTF-8")
}

func usable(v string) bool {
	base, _, _ := strings.Cut(v, ".")
	return base != "C" && base != "POSIX" && len(base) >= 2
}
