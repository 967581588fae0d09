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
