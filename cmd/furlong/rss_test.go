package main

import (
	"bufio"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"time"
)

// runMainEnv makes the test binary run the program itself (main's run) on
// its arguments, so that a test can measure a real 'furlong' process.
const runMainEnv = "FURLONG_TEST_RUN_MAIN"

func TestMain(m *testing.M) {
	if os.Getenv(runMainEnv) == "1" {
		os.Exit(run(os.Args[1:]))
	}
	os.Exit(m.Run())
}

// The bound: 'furlong analyze' of a 1,000,000-row CSV table stays
// under 500 MB of resident memory. The table (invented numbers from a
// seeded generator) is an RCBD of 100 treatments × 10,000 blocks with two
// responses, about 26 MB of text. Peak RSS is the kernel's ru_maxrss for the
// child process (getrusage(2), in kilobytes on Linux).
func TestAnalyzeMillionRowsPeakMemory(t *testing.T) {
	if testing.Short() {
		t.Skip("writes and analyses a 26 MB table")
	}
	if runtime.GOOS != "linux" {
		t.Skip("ru_maxrss is in kilobytes on Linux only")
	}
	path := filepath.Join(t.TempDir(), "million.csv")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	w := bufio.NewWriterSize(f, 1<<16)
	rng := rand.New(rand.NewPCG(3, 5))
	fmt.Fprintln(w, "block,treatment,yield,height")
	for i := 0; i < 1_000_000; i++ {
		fmt.Fprintf(w, "B%d,T%d,%.3f,%.1f\n", i/100+1, i%100+1, 5+0.01*float64(i%100)+rng.NormFloat64(), 100+5*rng.NormFloat64())
	}
	if err := w.Flush(); err != nil {
		t.Fatal(err)
	}
	f.Close()
	cmd := exec.Command(os.Args[0], "analyze", path, "--treatment", "treatment", "--block", "block", "--format", "csv")
	cmd.Env = append(os.Environ(), runMainEnv+"=1")
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("analyze: %v\n%s", err, out)
	}
	// 100 treatment means for each of the two responses, plus the header.
	if n := strings.Count(string(out), "\n"); n != 201 {
		t.Errorf("analyze printed %d lines, want 201", n)
	}
	ru, ok := cmd.ProcessState.SysUsage().(*syscall.Rusage)
	if !ok {
		t.Skip("no resource usage for the child")
	}
	mb := float64(ru.Maxrss) / 1024
	t.Logf("peak RSS of furlong analyze on 1,000,000 rows: %.0f MB", mb)
	if mb >= 500 {
		t.Errorf("peak RSS %.0f MB, want under 500 MB", mb)
	}

	// Ctrl+C (SIGINT) while the table is being read: the command stops,
	// says so and exits 1 (exit-status meanings: common practice).
	stop := exec.Command(os.Args[0], "analyze", path, "--treatment", "treatment", "--block", "block", "--format", "csv")
	stop.Env = append(os.Environ(), runMainEnv+"=1")
	var stderr strings.Builder
	stop.Stderr = &stderr
	if err := stop.Start(); err != nil {
		t.Fatal(err)
	}
	time.Sleep(300 * time.Millisecond)
	stop.Process.Signal(os.Interrupt)
	err = stop.Wait()
	code := stop.ProcessState.ExitCode()
	if code == 0 {
		t.Logf("the analysis finished before the interrupt arrived")
		return
	}
	if code != 1 || !strings.Contains(stderr.String(), "stopped before finishing") {
		t.Errorf("after Ctrl+C: exit %d (%v), stderr %q", code, err, stderr.String())
	}
}
