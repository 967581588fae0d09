package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"furlong/trial"
)

func deepWorkerFunction() { panic("a worker's bug") }

// A panic on the main goroutine and one on a worker goroutine end the same
// way: a plain message, a crash log with the stacks, and exit status 3,
// never 2 (2 says the command line was wrong; exit-status meanings are
// common practice for command-line tools).
func TestPanicsWriteACrashLogAndNeverExit2(t *testing.T) {
	cache := t.TempDir()
	t.Setenv("XDG_CACHE_HOME", cache) // os.UserCacheDir reads it on Unix (Go standard library)
	cases := []struct {
		name string
		f    func() int
		want string // in the crash log
	}{
		{"main goroutine", func() int { panic("a bug on the main goroutine") }, "a bug on the main goroutine"},
		{"worker goroutine", func() int {
			var w trial.Workers
			w.Go(deepWorkerFunction)
			w.Wait()
			return 0
		}, "deepWorkerFunction"},
	}
	for _, c := range cases {
		var stderr bytes.Buffer
		code := guard(&stderr, c.f)
		if code != ExitCrash || code == 2 {
			t.Errorf("%s: exit %d, want %d", c.name, code, ExitCrash)
		}
		msg := stderr.String()
		if !strings.Contains(msg, "a bug, not your data") || strings.Contains(msg, "goroutine ") {
			t.Errorf("%s: message %q", c.name, msg)
		}
		i := strings.Index(msg, "saved to ")
		j := strings.Index(msg, "; please")
		if i < 0 || j < i {
			t.Fatalf("%s: no crash log named in %q", c.name, msg)
		}
		path := msg[i+len("saved to ") : j]
		if !strings.HasPrefix(path, filepath.Join(cache, "furlong")) {
			t.Errorf("%s: crash log %s is not in the cache folder", c.name, path)
		}
		log, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(string(log), c.want) {
			t.Errorf("%s: crash log lacks %q:\n%s", c.name, c.want, log)
		}
	}
	if code := guard(&bytes.Buffer{}, func() int { return 1 }); code != 1 {
		t.Errorf("guard changed a normal exit status to %d", code)
	}
}
