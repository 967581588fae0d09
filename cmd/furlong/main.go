// Command furlong is Furlong's single binary: with no arguments, or a trial
// file, or --demo, it opens the window; with a command name it runs that
// command headless (see 'furlong --help').
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/debug"
	"syscall"

	"furlong/cmd/furlong/cli"
	_ "furlong/cmd/furlong/internal/locale" // before fyne reads the locale
	"furlong/trial"
)

// version is set at build time with -ldflags "-X main.version=...".
var version = "0.1.0-dev"

func main() {
	os.Exit(run(os.Args[1:]))
}

// ExitCrash is the exit status after a panic (a bug). It is never 2, which
// says that the command line was wrong.
const ExitCrash = 3

func run(args []string) (code int) {
	env := cli.Env{Stdout: os.Stdout, Stderr: os.Stderr, Version: version}
	return guard(os.Stderr, func() int {
		if cli.IsCommand(args) {
			ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
			defer stop()
			// After the first Ctrl+C the command is asked to stop; a second
			// one ends the process at once, as usual.
			go func() { <-ctx.Done(); stop() }()
			return cli.Main(ctx, args, env)
		}
		opts, err := cli.ParseWindowArgs(args)
		if err != nil {
			return cli.Exit(err, env)
		}
		return openWindow(opts, env)
	})
}

// guard runs f and returns its exit status. A panic in f, or one forwarded
// from a worker goroutine as a *trial.WorkerPanic, is a bug: it is told in
// plain words on stderr, the details go to a crash log, and the status is
// ExitCrash.
func guard(stderr io.Writer, f func() int) (code int) {
	defer func() {
		if r := recover(); r != nil {
			var worker []byte
			if wp, ok := r.(*trial.WorkerPanic); ok {
				r, worker = wp.Value, wp.Stack
			}
			path := writeCrashLog(r, worker, debug.Stack())
			fmt.Fprintln(stderr, "furlong: something went wrong inside Furlong (a bug, not your data).")
			if path != "" {
				fmt.Fprintf(stderr, "Details were saved to %s; please send that file with a bug report.\n", path)
			}
			code = ExitCrash
		}
	}()
	return f()
}

// writeCrashLog saves the panic value and stacks (the worker goroutine's
// when the panic came from one, then the crash handler's) in the user's cache
// folder and returns the file's path, or "" when it cannot be written.
func writeCrashLog(r any, worker, stack []byte) string {
	dir, err := os.UserCacheDir()
	if err != nil {
		dir = os.TempDir()
	}
	dir += string(os.PathSeparator) + "furlong"
	if os.MkdirAll(dir, 0o755) != nil {
		return ""
	}
	f, err := os.CreateTemp(dir, "crash-*.txt")
	if err != nil {
		return ""
	}
	defer f.Close()
	fmt.Fprintf(f, "furlong %s\npanic: %v\n\n", version, r)
	if worker != nil {
		fmt.Fprintf(f, "on a worker goroutine:\n%s\nraised again on:\n", worker)
	}
	fmt.Fprintf(f, "%s", stack)
	return f.Name()
}
