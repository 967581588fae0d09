package dist

import "testing"

var benchSink float64

func benchmarkCDF(b *testing.B, k, nu, q float64) {
	d := StudentizedRange{K: k, Nu: nu}
	for i := 0; i < b.N; i++ {
		benchSink += d.CDF(q)
	}
}

func BenchmarkCDFDirectK3Nu20(b *testing.B)    { benchmarkCDF(b, 3, 20, 3.0) }
func BenchmarkCDFDirectK300Nu880(b *testing.B) { benchmarkCDF(b, 300, 880, 5.7) }

func BenchmarkQuantileK300Nu880(b *testing.B) {
	d := StudentizedRange{K: 300, Nu: 880}
	for i := 0; i < b.N; i++ {
		benchSink += d.Quantile(0.95)
	}
}

func BenchmarkTableBuildK300Nu880(b *testing.B) {
	for i := 0; i < b.N; i++ {
		benchSink += NewSurvivalTable(300, 880).Survival(5)
	}
}

func BenchmarkTableBuildK1000Nu3000(b *testing.B) {
	for i := 0; i < b.N; i++ {
		benchSink += NewSurvivalTable(1000, 3000).Survival(6)
	}
}

func BenchmarkTableSurvival(b *testing.B) {
	tb := NewSurvivalTable(300, 880)
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		benchSink += tb.Survival(3 + 0.001*float64(i%4000))
	}
}

// benchTukeyWorkload is the whole Tukey workload of the mean-separation
// code for k means and nu error df: build the table, then one survival
// evaluation per pair of means.
func benchTukeyWorkload(b *testing.B, k, nu float64, pairs int) {
	for b.Loop() {
		tb := NewSurvivalTable(k, nu)
		for i := 0; i < pairs; i++ {
			benchSink += tb.Survival(0.5 + 7*float64(i)/float64(pairs))
		}
	}
}

// 300 means, 880 df: 44,850 pairs.
func BenchmarkTukeyWorkloadK300Nu880(b *testing.B) { benchTukeyWorkload(b, 300, 880, 44850) }

// 1,000 means, 3,000 df: 499,500 pairs.
func BenchmarkTukeyWorkloadK1000Nu3000(b *testing.B) { benchTukeyWorkload(b, 1000, 3000, 499500) }
