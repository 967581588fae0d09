// Command furlong is Furlong's single binary: with no arguments, or a trial
// file, or --demo, it opens the window; with a command name it runs that
// command headless (see 'furlong --help').
package main

import (
	"context"
	"fmt"
	"os"
	"os/signal"
	"runtime/debug"
	"syscall"

	"furlong/cmd/furlong/cli"
	_ "furlong/cmd/furlong/internal/locale" // before fyne reads the locale
)

// version is set at build time with -ldflags "-X main.version=...".
var version = "0.1.0-dev"

func main() {
	os.Exit(run(os.Args[1:]))
}

func run(args []string) (code int) {
	env := cli.Env{Stdout: os.Stdout, Stderr: os.Stderr, Version: version}
	defer func() {
		if r := recover(); r != nil {
			// A panic is a bug: say so plainly, keep the details in a crash log.
			path := writeCrashLog(r, debug.Stack())
			fmt.Fprintln(os.Stderr, "furlong: something went wrong inside Furlong (a bug, not your data).")
			if path != "" {
				fmt.Fprintf(os.Stderr, "Details were saved to %s; please send that file with a bug report.\n", path)
			}
			code = 3
		}
	}()
	if cli.IsCommand(args) {
		ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
		defer stop()
		return cli.Main(ctx, args, env)
	}
	opts, err := cli.ParseWindowArgs(args)
	if err != nil {
		return cli.Exit(err, env)
	}
	return openWindow(opts, env)
}

func writeCrashLog(r any, stack []byte) string {
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
	fmt.Fprintf(f, "furlong %s\npanic: %v\n\n%s", version, r, stack)
	return f.Name()
}
