package cli

import (
	"bufio"
	"context"
	"fmt"
	"math/rand/v2"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"testing"
)

// benchMainEnv, set in a child's environment, makes the test binary run
// the command line after it as furlong would and exit, so that a benchmark
// can time the whole command with the process start included.
const benchMainEnv = "FURLONG_BENCH_MAIN"

func TestMain(m *testing.M) {
	if os.Getenv(benchMainEnv) == "1" {
		w := bufio.NewWriterSize(os.Stdout, 1<<16)
		code := Main(context.Background(), os.Args[1:], Env{Stdout: w, Stderr: os.Stderr, Version: "bench"})
		w.Flush()
		os.Exit(code)
	}
	os.Exit(m.Run())
}

// benchRCBDCSV writes an RCBD table of k entries × 4 blocks, one response
// from a seeded generator (invented numbers: a speed test).
func benchRCBDCSV(b *testing.B, k int) string {
	b.Helper()
	path := filepath.Join(b.TempDir(), "rcbd.csv")
	f, err := os.Create(path)
	if err != nil {
		b.Fatal(err)
	}
	w := bufio.NewWriter(f)
	fmt.Fprintln(w, "block,entry,yield")
	rng := rand.New(rand.NewPCG(11, uint64(k)))
	for bl := 1; bl <= 4; bl++ {
		for e := 1; e <= k; e++ {
			fmt.Fprintf(w, "%d,E%04d,%s\n", bl, e, strconv.FormatFloat(6+0.002*float64(e)+0.4*rng.NormFloat64(), 'f', 2, 64))
		}
	}
	if err := w.Flush(); err != nil {
		b.Fatal(err)
	}
	if err := f.Close(); err != nil {
		b.Fatal(err)
	}
	return path
}

// benchAnalyzeCommand times `furlong analyze FILE.csv --format json` as a
// new process each time (issue 11: 300 entries under 60 ms, 1,000 entries
// with all 499,500 Tukey pairs under 600 ms, process start included). The
// JSON goes to /dev/null.
func benchAnalyzeCommand(b *testing.B, k int, format string) {
	path := benchRCBDCSV(b, k)
	devnull, err := os.OpenFile(os.DevNull, os.O_WRONLY, 0)
	if err != nil {
		b.Fatal(err)
	}
	defer devnull.Close()
	b.ResetTimer()
	for b.Loop() {
		cmd := exec.Command(os.Args[0], "analyze", path, "--treatment", "entry", "--block", "block", "--response", "yield", "--format", format)
		cmd.Env = append(os.Environ(), benchMainEnv+"=1")
		cmd.Stdout = devnull
		cmd.Stderr = os.Stderr
		if err := cmd.Run(); err != nil {
			b.Fatalf("analyze: %v", err)
		}
	}
}

func BenchmarkAnalyzeCommand300JSON(b *testing.B)  { benchAnalyzeCommand(b, 300, "json") }
func BenchmarkAnalyzeCommand1000JSON(b *testing.B) { benchAnalyzeCommand(b, 1000, "json") }
func BenchmarkAnalyzeCommand300Text(b *testing.B)  { benchAnalyzeCommand(b, 300, "text") }
