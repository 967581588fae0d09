package cli

import (
	"strings"
)

// WindowOptions are the command-line choices of the window path.
type WindowOptions struct {
	Demo bool   // open the built-in demo trial
	Path string // open this trial file
}

// ParseWindowArgs reads the window path's arguments: nothing, --demo, or
// one trial file. Anything else is a usage error (Main reports it).
func ParseWindowArgs(args []string) (WindowOptions, error) {
	var o WindowOptions
	for _, a := range args {
		switch {
		case a == "--demo" || a == "-demo":
			o.Demo = true
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
	return o, nil
}
