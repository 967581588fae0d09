package cli

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io/fs"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"furlong/trial"
)

// Commands stop when their context is done (Ctrl+C or SIGTERM in main), and
// a stopped command says so and exits 1, not 2 (2 is a wrong command line;
// the exit-status convention is common practice for command-line tools).
func TestCommandsStopWhenTheContextIsDone(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "t.furlong")
	if code, _, stderr := run(t, "new", "-o", path, "--treatments", "4", "--reps", "3", "--seed", "5", "--traits", "yield:t/ha"); code != 0 {
		t.Fatalf("new: %s", stderr)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	var out bytes.Buffer
	env := Env{Stdout: &out, Stderr: &out}
	cases := []struct {
		name string
		run  func() error
	}{
		{"show", func() error { return runShow(ctx, showOptions{env: env, trial: path}) }},
		{"new", func() error {
			return runNew(ctx, newOptions{env: env, out: filepath.Join(dir, "n.furlong"), design: "rcbd", treatments: "3", reps: 2, seed: "1"})
		}},
		{"analyze", func() error {
			return runAnalyze(ctx, analyzeOptions{env: env, path: path, format: "text", alpha: 0.05})
		}},
		{"report", func() error {
			return runReport(ctx, reportOptions{env: env, trial: path, out: filepath.Join(dir, "r.xlsx"), method: "lsd", paper: "a4", alpha: 0.05})
		}},
	}
	for _, c := range cases {
		if err := c.run(); !errors.Is(err, context.Canceled) {
			t.Errorf("%s with a cancelled context returned %v, want context.Canceled", c.name, err)
		}
	}
	var stderr bytes.Buffer
	if code := Exit(context.Canceled, Env{Stdout: &out, Stderr: &stderr}); code != ExitFailure || !strings.Contains(stderr.String(), "stopped") {
		t.Errorf("a stopped command exits %d with %q", code, stderr.String())
	}
}

// A command that does not check its context is left behind after the grace
// period, so that a stop request is always obeyed.
func TestRunUntilDoneObeysAStopRequest(t *testing.T) {
	t.Parallel()
	ctx, cancel := context.WithCancel(context.Background())
	block := make(chan struct{}, 1)
	defer func() { block <- struct{}{} }()
	go func() { time.Sleep(20 * time.Millisecond); cancel() }()
	start := time.Now()
	err := runUntilDone(ctx, 50*time.Millisecond, func(context.Context) error { <-block; return nil })
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("got %v, want context.Canceled", err)
	}
	if d := time.Since(start); d > 5*time.Second {
		t.Errorf("took %v to stop", d)
	}
	// A command that finishes in the grace period keeps its own result.
	ctx2, cancel2 := context.WithCancel(context.Background())
	cancel2()
	want := errors.New("finished")
	if err := runUntilDone(ctx2, time.Minute, func(context.Context) error { return want }); err != want {
		t.Errorf("got %v, want the command's own error", err)
	}
}

// A panic on the command's goroutine is raised again on the caller's, with
// the stack of the goroutine that panicked, for main's crash handler.
func TestRunUntilDoneForwardsAPanic(t *testing.T) {
	t.Parallel()
	p := trial.Catch(func() {
		_ = runUntilDone(context.Background(), time.Second, func(context.Context) error { panic("inside a command") })
	})
	if p == nil || p.Value != "inside a command" {
		t.Fatalf("got %+v, want the command's panic", p)
	}
	if !strings.Contains(string(p.Stack), "TestRunUntilDoneForwardsAPanic") {
		t.Errorf("the stack is not the command goroutine's:\n%s", p.Stack)
	}
}

// File-system errors in plain words: a full disk says so and names the
// folder, never a save's hidden temporary file (error numbers from the Go
// standard library's syscall package).
func TestMessageOfFileErrors(t *testing.T) {
	t.Parallel()
	tmp := filepath.Join("fields", ".fl-5bce-26052-29442fa9.tmp")
	cases := []struct {
		err       error
		want, not string
	}{
		{&fs.PathError{Op: "write", Path: tmp, Err: syscall.ENOSPC}, "the disk is full: there is no space left to write in fields", ".fl-"},
		{fmt.Errorf("saving: %w", &fs.PathError{Op: "open", Path: tmp, Err: syscall.EACCES}), "not allowed to use the folder fields", ".fl-"},
		{&fs.PathError{Op: "open", Path: filepath.Join("fields", "t.furlong"), Err: syscall.ENOENT}, "cannot find " + filepath.Join("fields", "t.furlong"), "no such"},
		{&fs.PathError{Op: "rename", Path: tmp, Err: syscall.EROFS}, "fields is on a read-only disk", ".fl-"},
	}
	for _, c := range cases {
		got := Message(c.err)
		if !strings.Contains(got, c.want) || strings.Contains(got, c.not) {
			t.Errorf("%v: %q, want %q without %q", c.err, got, c.want, c.not)
		}
	}
}
