package cli

import (
	"bufio"
	"bytes"
	"context"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strconv"
	"testing"
)

// writeBigCSV writes an RCBD table of rows rows (100 treatments per block)
// with two responses from a seeded generator: invented numbers, for speed
// and memory measurements only.
func writeBigCSV(w io.Writer, rows int) error {
	bw := bufio.NewWriterSize(w, 1<<16)
	rng := rand.New(rand.NewPCG(7, 11))
	bw.WriteString("block,treatment,yield,height\n")
	var buf []byte
	for i := 0; i < rows; i++ {
		buf = buf[:0]
		buf = append(buf, 'B')
		buf = strconv.AppendInt(buf, int64(i/100+1), 10)
		buf = append(buf, ",T"...)
		buf = strconv.AppendInt(buf, int64(i%100+1), 10)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, 5+0.01*float64(i%100)+rng.NormFloat64(), 'f', 3, 64)
		buf = append(buf, ',')
		buf = strconv.AppendFloat(buf, 100+5*rng.NormFloat64(), 'f', 1, 64)
		buf = append(buf, '\n')
		bw.Write(buf)
	}
	return bw.Flush()
}

// BenchmarkAnalyzeCSVMillionRows reads and analyses a 1,000,000-row CSV
// table (two responses, RCBD of 100 treatments × 10,000 blocks) through the
// same path as 'furlong analyze data.csv'. B/op is all memory allocated;
// retained-MB is the live heap once the table is read into columns.
func BenchmarkAnalyzeCSVMillionRows(b *testing.B) {
	path := filepath.Join(b.TempDir(), "big.csv")
	var data bytes.Buffer
	if err := writeBigCSV(&data, 1_000_000); err != nil {
		b.Fatal(err)
	}
	if err := os.WriteFile(path, data.Bytes(), 0o644); err != nil {
		b.Fatal(err)
	}
	data = bytes.Buffer{}
	o := analyzeOptions{env: Env{Stdout: io.Discard, Stderr: io.Discard}, path: path, treatment: "treatment", block: "block", format: "json", alpha: 0.05}
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if err := runAnalyze(context.Background(), o); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	// The compact columns alone: read the table and keep it.
	f, err := os.Open(path)
	if err != nil {
		b.Fatal(err)
	}
	defer f.Close()
	runtime.GC()
	var before, after runtime.MemStats
	runtime.ReadMemStats(&before)
	tab, err := analyzeCSVTables(context.Background(), o, f)
	if err != nil {
		b.Fatal(err)
	}
	runtime.GC()
	runtime.ReadMemStats(&after)
	b.ReportMetric(float64(after.HeapAlloc-before.HeapAlloc)/(1<<20), "retained-MB")
	runtime.KeepAlive(tab)
}
