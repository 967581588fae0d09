package cli

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strings"

	"furlong/trial/series"
)

// WindowOptions are the command-line choices of the window path.
type WindowOptions struct {
	Demo       bool   // open the built-in demo trial
	DemoSeries bool   // open the built-in demo series
	Path       string // open this trial file, or this series file (Series)
	Series     bool   // Path is a series file (.furlong-series)
}

// ParseWindowArgs reads the window path's arguments: nothing, --demo,
// --demo-series, or one trial or series file. Anything else is a usage
// error (Main reports it).
func ParseWindowArgs(args []string) (WindowOptions, error) {
	var o WindowOptions
	for _, a := range args {
		switch {
		case a == "--demo" || a == "-demo":
			o.Demo = true
		case a == "--demo-series" || a == "-demo-series":
			o.DemoSeries = true
		case strings.HasPrefix(a, "-"):
			return o, usagef("unknown option %q", a)
		case o.Path == "":
			o.Path = a
		default:
			return o, usagef("give one trial file at a time (got %q and %q)", o.Path, a)
		}
	}
	if o.Demo && o.Path != "" {
		return o, usagef("--demo and a trial file cannot be opened together")
	}
	if o.DemoSeries && (o.Demo || o.Path != "") {
		return o, usagef("--demo-series opens the demo series on its own, without --demo or a file")
	}
	o.Series = strings.EqualFold(filepath.Ext(o.Path), series.FileExt)
	if o.Path != "" {
		if _, err := os.Stat(o.Path); errors.Is(err, fs.ErrNotExist) {
			if !strings.ContainsAny(o.Path, "./\\") {
				// A word that is neither a command nor a file: most likely a
				// mistyped command.
				return o, usagef("there is no command %q", o.Path)
			}
			return o, errors.New("cannot find " + o.Path + ": check the name and folder")
		}
	}
	if err := checkDisplay(); err != nil {
		return o, err
	}
	return o, nil
}

// checkDisplay reports, on systems that draw windows through X11 or
// Wayland, that there is no display to open the window on, instead of
// letting the window library fail deep inside.
func checkDisplay() error {
	switch runtime.GOOS {
	case "linux", "freebsd", "openbsd", "netbsd", "dragonfly":
	default:
		return nil
	}
	if os.Getenv("DISPLAY") != "" || os.Getenv("WAYLAND_DISPLAY") != "" {
		return nil
	}
	return errors.New("the window needs a graphical display and none is set (DISPLAY and WAYLAND_DISPLAY are empty); " +
		"the commands work without one: run 'furlong --help'")
}
