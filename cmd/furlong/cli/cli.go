// Package cli holds Furlong's headless subcommands. Each command has a
// runX(ctx context.Context, opts xOptions) error function that tests call
// directly (runNew, runShow, runAnalyze, runFieldbook, runImport, runReport,
// runChart, runMap); Main parses the flags into the options, runs it and maps
// its error to a message and an exit code. Every command stops when ctx is
// done (Ctrl+C, SIGTERM). Nothing here opens a window.
package cli

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"sort"
	"strings"
	"time"

	"furlong/trial"
)

// Exit codes.
const (
	ExitOK      = 0
	ExitFailure = 1 // the command could not do its job
	ExitUsage   = 2 // the command line was wrong
)

// Env is what every command gets from the process.
type Env struct {
	Stdout  io.Writer // where results go
	Stderr  io.Writer // where messages and errors go
	Version string    // the program version printed by "version"
}

// command is one subcommand.
type command struct {
	name    string
	summary string
	usage   string // the synopsis line(s)
	details string // plain-words explanation printed by help
	flags   func(env Env) (*flag.FlagSet, func(ctx context.Context, args []string) error)
}

var commands = map[string]*command{}

func register(c *command) { commands[c.name] = c }

// UsageError is a mistake on the command line.
type UsageError struct {
	Msg     string // the mistake, in plain words
	Command string // the command whose flags were wrong, or "" for the overview
}

// Error returns the message.
func (e *UsageError) Error() string { return e.Msg }

func usagef(format string, a ...any) error { return &UsageError{Msg: fmt.Sprintf(format, a...)} }

// ExitError carries a specific exit status with an optional message (for
// example an import that found problems: the report was already printed).
type ExitError struct {
	Code int    // the exit status
	Msg  string // printed to standard error when not empty
}

// Error returns the message.
func (e *ExitError) Error() string { return e.Msg }

// IsCommand reports whether args start with a headless subcommand (or a
// help or version request), as opposed to the window path.
func IsCommand(args []string) bool {
	if len(args) == 0 {
		return false
	}
	switch args[0] {
	case "help", "-h", "-help", "--help", "version", "--version", "-version":
		return true
	}
	_, ok := commands[args[0]]
	return ok
}

// Main runs a subcommand and returns the process exit code.
func Main(ctx context.Context, args []string, env Env) int {
	return Exit(dispatch(ctx, args, env), env)
}

// Exit prints err in plain words on env.Stderr and returns its exit code.
func Exit(err error, env Env) int {
	if err == nil {
		return ExitOK
	}
	var ue *UsageError
	var ee *ExitError
	switch {
	case errors.Is(err, flag.ErrHelp):
		return ExitOK
	case errors.As(err, &ue):
		fmt.Fprintf(env.Stderr, "furlong: %s\n", ue.Msg)
		if ue.Command != "" {
			fmt.Fprintf(env.Stderr, "Run 'furlong help %s' for its flags.\n", ue.Command)
		} else {
			fmt.Fprintln(env.Stderr, "Run 'furlong --help' for the list of commands.")
		}
		return ExitUsage
	case errors.As(err, &ee):
		if ee.Msg != "" {
			fmt.Fprintf(env.Stderr, "furlong: %s\n", ee.Msg)
		}
		return ee.Code
	case errors.Is(err, context.Canceled):
		fmt.Fprintln(env.Stderr, "furlong: stopped before finishing (interrupted); files are either left as they were or completely written")
		return ExitFailure
	default:
		fmt.Fprintf(env.Stderr, "furlong: %s\n", Message(err))
		return ExitFailure
	}
}

func dispatch(ctx context.Context, args []string, env Env) error {
	if len(args) == 0 {
		printOverview(env.Stdout)
		return nil
	}
	switch args[0] {
	case "-h", "-help", "--help":
		printOverview(env.Stdout)
		return nil
	case "version", "--version", "-version":
		fmt.Fprintf(env.Stdout, "furlong %s\n", env.Version)
		return nil
	case "help":
		if len(args) == 1 {
			printOverview(env.Stdout)
			return nil
		}
		c, ok := commands[args[1]]
		if !ok {
			return usagef("there is no command %q", args[1])
		}
		fs, _ := c.flags(env)
		printCommandHelp(env.Stdout, c, fs)
		return nil
	}
	c, ok := commands[args[0]]
	if !ok {
		return usagef("there is no command %q", args[0])
	}
	fs, run := c.flags(env)
	fs.SetOutput(io.Discard)
	ordered, problem := interleave(fs, args[1:])
	if problem != "" {
		return &UsageError{Msg: c.name + ": " + problem, Command: c.name}
	}
	if err := fs.Parse(ordered); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			printCommandHelp(env.Stdout, c, fs)
			return flag.ErrHelp
		}
		return &UsageError{Msg: c.name + ": " + flagMessage(fs, err), Command: c.name}
	}
	err := runUntilDone(ctx, stopGrace, func(ctx context.Context) error { return run(ctx, fs.Args()) })
	var ue *UsageError
	if errors.As(err, &ue) && ue.Command == "" {
		ue.Command = c.name
	}
	return err
}

// stopGrace is how long a command may take to return after ctx is done
// (Ctrl+C or SIGTERM) before it is left behind: enough to finish writing a
// file, short enough that a stop request is obeyed.
const stopGrace = 2 * time.Second

// runUntilDone runs f on its own goroutine and returns its error, or ctx's
// error when ctx is done and f has not returned within grace: commands
// check ctx in their long loops, and this bounds the ones that cannot (a
// library call that takes long). Files are written atomically, so leaving a
// command behind never leaves a half-written file. A panic in f is raised
// again on the caller's goroutine, where the crash handler sees it.
func runUntilDone(ctx context.Context, grace time.Duration, f func(context.Context) error) error {
	type result struct {
		err   error
		panic *trial.WorkerPanic
	}
	done := make(chan result, 1)
	go func() {
		var r result
		r.panic = trial.Catch(func() { r.err = f(ctx) })
		done <- r
	}()
	var r result
	select {
	case r = <-done:
	case <-ctx.Done():
		select {
		case r = <-done:
		case <-time.After(grace):
			return ctx.Err()
		}
	}
	if r.panic != nil {
		panic(r.panic)
	}
	return r.err
}

// flagMessage rewrites the flag package's parse errors, which name Go
// types ("parse error", "flag provided but not defined: -x"), in plain words.
func flagMessage(fs *flag.FlagSet, err error) string {
	msg := err.Error()
	if name, ok := strings.CutPrefix(msg, "flag provided but not defined: "); ok {
		return fmt.Sprintf("there is no flag --%s", strings.TrimLeft(name, "-"))
	}
	if name, ok := strings.CutPrefix(msg, "flag needs an argument: "); ok {
		return fmt.Sprintf("--%s needs a value", strings.TrimLeft(name, "-"))
	}
	// invalid value "abc" for flag -plot-length: parse error
	if rest, ok := strings.CutPrefix(msg, "invalid value "); ok {
		if i := strings.Index(rest, " for flag -"); i > 0 {
			value := rest[:i]
			name, why, _ := strings.Cut(rest[i+len(" for flag -"):], ": ")
			f := fs.Lookup(name)
			if f == nil || (why != "parse error" && why != "value out of range") {
				return fmt.Sprintf("--%s: %s", name, why)
			}
			kind := "a number"
			if g, ok := f.Value.(flag.Getter); ok {
				switch g.Get().(type) {
				case int, int64, uint, uint64:
					kind = "a whole number"
				case bool:
					kind = "true or false"
				}
			}
			if why == "value out of range" {
				return fmt.Sprintf("--%s must be %s of sensible size, not %s", name, kind, value)
			}
			return fmt.Sprintf("--%s must be %s, not %s", name, kind, value)
		}
	}
	return msg
}

// interleave lets flags follow positional arguments ("furlong show
// trial.furlong --verbose"), which the flag package alone does not allow:
// it moves every flag (and its value) in front of the positional arguments.
//
// A last flag without its value is reported as problem ("" when none).
func interleave(fs *flag.FlagSet, args []string) (out []string, problem string) {
	var flags, pos []string
	for i := 0; i < len(args); i++ {
		a := args[i]
		if a == "--" {
			pos = append(pos, args[i+1:]...)
			break
		}
		if len(a) < 2 || a[0] != '-' {
			pos = append(pos, a)
			continue
		}
		flags = append(flags, a)
		name := strings.TrimLeft(a, "-")
		if strings.Contains(name, "=") {
			continue
		}
		f := fs.Lookup(name)
		if f == nil {
			continue // the parser reports it
		}
		if bf, ok := f.Value.(interface{ IsBoolFlag() bool }); ok && bf.IsBoolFlag() {
			continue
		}
		if i+1 < len(args) {
			flags = append(flags, args[i+1])
			i++
		} else {
			// The last argument is a flag that needs a value: once moved in
			// front it would take a file name as its value.
			return nil, "--" + name + " needs a value"
		}
	}
	return append(flags, pos...), ""
}

func printOverview(w io.Writer) {
	fmt.Fprint(w, `Furlong plans, randomises, records and analyses replicated field trials.

Usage:
  furlong                      open the window
  furlong TRIAL.furlong        open the window on a trial file
  furlong --demo               open the window on the built-in demo trial
  furlong NAME.furlong-series  open the window on a trial series
  furlong --demo-series        open the window on the built-in demo series
  furlong COMMAND [flags]      run a command without a window

Commands:
`)
	names := make([]string, 0, len(commands))
	for n := range commands {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		fmt.Fprintf(w, "  %-10s %s\n", n, commands[n].summary)
	}
	fmt.Fprint(w, `
Run 'furlong help COMMAND' for a command's flags.
Exit status: 0 done, 1 the command failed (the message says why) or was stopped (Ctrl+C),
2 the command line was wrong, 3 a bug in Furlong (a crash report is saved).
`)
}

func printCommandHelp(w io.Writer, c *command, fs *flag.FlagSet) {
	fmt.Fprintf(w, "Usage:\n  %s\n\n%s\n", strings.ReplaceAll(strings.TrimSpace(c.usage), "\n", "\n  "), strings.TrimSpace(c.details))
	has := false
	fs.VisitAll(func(*flag.Flag) { has = true })
	if has {
		fmt.Fprintln(w, "\nFlags:")
		fs.SetOutput(w)
		fs.PrintDefaults()
	}
}

// nowFunc is the clock; tests replace it.
var nowFunc = time.Now
