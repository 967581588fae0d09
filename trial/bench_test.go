package trial

import "testing"

func benchLayOut(b *testing.B, nt, reps int, kind DesignKind) {
	ts := treatments(nt)
	d := Design{Kind: kind, Reps: reps}
	l := DefaultLayout()
	l.PlotsPerRow = 24
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		if _, err := LayOutRandomized(ts, d, l, uint64(i)); err != nil {
			b.Fatal(err)
		}
	}
}

// 1,200 plots: 24 entries × 50 blocks.
func BenchmarkRandomizeRCBD1200(b *testing.B) { benchLayOut(b, 24, 50, RCBD) }

// 24,000 plots: 480 entries × 50 blocks.
func BenchmarkRandomizeRCBD24000(b *testing.B) { benchLayOut(b, 480, 50, RCBD) }

// 24,000 plots: 480 entries × 50 replicates, completely randomised.
func BenchmarkRandomizeCRD24000(b *testing.B) { benchLayOut(b, 480, 50, CRD) }

// 256 plots: the largest Latin square.
func BenchmarkRandomizeLatin16(b *testing.B) { benchLayOut(b, 16, 16, Latin) }

func bigTrial(b *testing.B) *Trial {
	tr, err := New(NewOptions{
		Treatments: treatments(480),
		Design:     Design{Kind: RCBD, Reps: 50},
		Traits: []Trait{
			{Key: "wt", Min: fptr(0)},
			{Key: "mst", Min: fptr(0), Max: fptr(60)},
			AdjustedYieldTrait("yld", "wt", "mst", "maize", UnitTHa),
		},
		Seed: 1,
	})
	if err != nil {
		b.Fatal(err)
	}
	for i := range tr.Plots {
		tr.Traits[0].Values[i] = 10 + float64(i%7)
		tr.Traits[1].Values[i] = 15 + float64(i%5)
	}
	return tr
}

// New on 24,000 plots: lay out, randomise, validate.
func BenchmarkNew24000(b *testing.B) {
	ts := treatments(480)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := New(NewOptions{Treatments: ts, Design: Design{Kind: RCBD, Reps: 50}, Seed: 1}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkValidate24000(b *testing.B) {
	tr := bigTrial(b)
	b.ReportAllocs()
	for b.Loop() {
		if err := tr.Validate(); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkPlotIndexByNumber24000(b *testing.B) {
	tr := bigTrial(b)
	nums := make([]int, len(tr.Plots))
	for i, p := range tr.Plots {
		nums[i] = p.Number
	}
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		if tr.PlotIndexByNumber(nums[i%len(nums)]) < 0 {
			b.Fatal("not found")
		}
	}
}

func BenchmarkAdjustedYield24000(b *testing.B) {
	tr := bigTrial(b)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := tr.TraitValues("yld"); err != nil {
			b.Fatal(err)
		}
	}
}
