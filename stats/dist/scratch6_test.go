package dist

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/mathext"
)

var sink float64

func BenchmarkScratchRD(b *testing.B) {
	for i := 0; i < b.N; i++ {
		sink += rangeDensity(300, 5.5+float64(i%7)*0.1)
	}
}
func BenchmarkScratchLogInt(b *testing.B) {
	for i := 0; i < b.N; i++ {
		sink += rangeLogIntegrand(300, 5.5, 3+float64(i%7)*0.1)
	}
}
func BenchmarkScratchErf(b *testing.B) {
	for i := 0; i < b.N; i++ {
		sink += math.Erf(1 + float64(i%7)*0.1)
	}
}
func BenchmarkScratchGamma(b *testing.B) {
	for i := 0; i < b.N; i++ {
		sink += mathext.GammaIncReg(440, 440*(0.9+float64(i%7)*0.03))
	}
}
func BenchmarkScratchGamma10(b *testing.B) {
	for i := 0; i < b.N; i++ {
		sink += mathext.GammaIncReg(10, 10*(0.9+float64(i%7)*0.03))
	}
}
