package xlsx

import (
	"fmt"
	"io"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
	"time"

	"furlong/trial/series"
)

// bigSeries analyses a simulated series (the size: 40 sites ×
// 300 entries × 3 blocks, 36,000 plots) with traits responses.
func bigSeries(b *testing.B, traits int) []*series.Result {
	b.Helper()
	const sites, entries, blocks = 40, 300, 3
	rng := rand.New(rand.NewPCG(9, 40))
	var sb strings.Builder
	sb.WriteString("site,block,entry")
	for k := 0; k < traits; k++ {
		fmt.Fprintf(&sb, ",t%d", k)
	}
	sb.WriteString("\n")
	siteEff := make([]float64, sites)
	for s := range siteEff {
		siteEff[s] = rng.NormFloat64()
	}
	for s := 0; s < sites; s++ {
		for bl := 1; bl <= blocks; bl++ {
			for e := 0; e < entries; e++ {
				fmt.Fprintf(&sb, "S%02d,%d,E%03d", s+1, bl, e+1)
				for k := 0; k < traits; k++ {
					v := 6 + siteEff[s] + 0.002*float64(e%50) + 0.3*rng.NormFloat64()
					sb.WriteString("," + strconv.FormatFloat(v, 'f', 2, 64))
				}
				sb.WriteString("\n")
			}
		}
	}
	tts, err := series.ReadTable(strings.NewReader(sb.String()), series.TableColumns{Site: "site", Block: "block", Treatment: "entry"})
	if err != nil {
		b.Fatal(err)
	}
	var out []*series.Result
	for _, tt := range tts {
		r, err := series.Analyze(tt.Trait, tt.Sites, series.Options{Check: "E001"})
		if err != nil {
			b.Fatal(err)
		}
		out = append(out, r)
	}
	return out
}

// BenchmarkSeriesWorkbook writes the series workbook of 10 traits of 40
// sites × 300 entries × 3 blocks with its charts (issue 9: under 15 s).
func BenchmarkSeriesWorkbook(b *testing.B) {
	res := bigSeries(b, 10)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if err := WriteSeries(io.Discard, res, SeriesOptions{Name: "Programme A", Now: time.Date(2026, 12, 3, 0, 0, 0, 0, time.UTC), Charts: true}); err != nil {
			b.Fatal(err)
		}
	}
}
