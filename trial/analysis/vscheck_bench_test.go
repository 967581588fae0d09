package analysis

import "testing"

// BenchmarkVsCheck300 is the target case: 300 entries against one
// check in 4 blocks with 2% of plots missing (target under 50 ms), after
// the analysis itself.
func BenchmarkVsCheck300(b *testing.B) {
	t := variety(b, 300, 4, 1, 0.02)
	r, err := Analyze(t, "t0", Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for b.Loop() {
		vc, err := CompareWithCheck(r, "E1")
		if err != nil {
			b.Fatal(err)
		}
		b.ReportMetric(float64(len(vc.Rows)), "comparisons")
		if vc.Method == "" {
			b.Fatal("no method")
		}
	}
}
