package cli

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"testing"
)

// writeBigSeriesCSV writes a simulated series of the size (40
// sites × 300 entries × 3 blocks, 36,000 plots, one trait) to a CSV file.
func writeBigSeriesCSV(b *testing.B) string {
	b.Helper()
	const sites, entries, blocks = 40, 300, 3
	path := filepath.Join(b.TempDir(), "big-series.csv")
	f, err := os.Create(path)
	if err != nil {
		b.Fatal(err)
	}
	w := bufio.NewWriter(f)
	rng := rand.New(rand.NewPCG(9, 40))
	fmt.Fprintln(w, "site,block,entry,yield")
	for s := 0; s < sites; s++ {
		eff := rng.NormFloat64()
		for bl := 1; bl <= blocks; bl++ {
			for e := 0; e < entries; e++ {
				v := 6 + eff + 0.002*float64(e%50) + 0.3*rng.NormFloat64()
				fmt.Fprintf(w, "S%02d,%d,E%03d,%s\n", s+1, bl, e+1, strconv.FormatFloat(v, 'f', 2, 64))
			}
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

// BenchmarkSeriesCommand runs "furlong series" on the size (issue
// 9: under 1 s): reading the CSV, every site's analysis, the combined
// ANOVA, means with letters, stability, head to head and the JSON.
func BenchmarkSeriesCommand(b *testing.B) {
	path := writeBigSeriesCSV(b)
	for _, format := range []string{"json", "text"} {
		b.Run(format, func(b *testing.B) {
			for i := 0; i < b.N; i++ {
				code := Main(context.Background(), []string{"series", path, "--site", "site", "--block", "block", "--treatment", "entry", "--check", "E001", "--format", format},
					Env{Stdout: io.Discard, Stderr: io.Discard})
				if code != ExitOK {
					b.Fatalf("exit %d", code)
				}
			}
		})
	}
}
