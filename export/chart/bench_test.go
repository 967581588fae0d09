package chart

import (
	"io"
	"testing"

	"furlong/stats/meansep"
)

func BenchmarkMeans300PNG(b *testing.B) {
	tr, r := bigFixture(300, 2)
	w, h := A4Landscape()
	for b.Loop() {
		p, err := Means(tr, r, MeansOptions{Letters: meansep.Tukey})
		if err != nil {
			b.Fatal(err)
		}
		if err := Save(p, io.Discard, "png", w, h); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkHeatMap1200PNG(b *testing.B) {
	tr, _ := bigFixture(400, 3) // 1,200 plots in 60 rows of 20
	w, h := A4Landscape()
	for b.Loop() {
		p, err := HeatMap(tr, "yield", HeatMapOptions{PlotNumbers: true})
		if err != nil {
			b.Fatal(err)
		}
		if err := Save(p, io.Discard, "png", w, h); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkFieldMap1200PNG(b *testing.B) {
	tr, _ := bigFixture(400, 3)
	w, h := A4Landscape()
	for b.Loop() {
		p, err := FieldMap(tr, FieldMapOptions{})
		if err != nil {
			b.Fatal(err)
		}
		if err := Save(p, io.Discard, "png", w, h); err != nil {
			b.Fatal(err)
		}
	}
}
