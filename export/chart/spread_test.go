package chart

import (
	"bytes"
	"strings"
	"testing"
)

func TestSpreadDotPlot(t *testing.T) {
	t.Parallel()
	tr := fixtureTrial()
	p, err := Spread(tr, "yield", SpreadOptions{Seed: 11})
	if err != nil {
		t.Fatal(err)
	}
	a := render(t, p, "svg")
	texts := svgTexts(a)
	// Excluded plot hidden: noted in the key, no hollow marker entry.
	if countText(texts, "1 excluded plot not shown") != 1 {
		t.Errorf("excluded note missing: %q", texts)
	}
	if countText(texts, "Excluded plot") != 0 {
		t.Error("excluded key entry shown although excluded plots are hidden")
	}
	for _, want := range []string{"Grain yield (t/ha)", "Entry plot", "Check plot", "Treatment mean"} {
		if countText(texts, want) != 1 {
			t.Errorf("text %q missing", want)
		}
	}
	// The jitter is seeded: the same seed draws the same picture, another
	// seed another.
	p2, _ := Spread(tr, "yield", SpreadOptions{Seed: 11})
	if !bytes.Equal(a, render(t, p2, "svg")) {
		t.Error("same seed, different picture")
	}
	p3, _ := Spread(tr, "yield", SpreadOptions{Seed: 12})
	if bytes.Equal(a, render(t, p3, "svg")) {
		t.Error("different seeds, same picture")
	}

	p4, err := Spread(tr, "yield", SpreadOptions{Seed: 11, ShowExcluded: true})
	if err != nil {
		t.Fatal(err)
	}
	texts = svgTexts(render(t, p4, "svg"))
	if countText(texts, "Excluded plot") != 1 || countText(texts, "(not analysed)") != 1 {
		t.Errorf("hollow excluded entry missing: %q", texts)
	}
}

func TestSpreadBoxPlot(t *testing.T) {
	t.Parallel()
	p, err := Spread(fixtureTrial(), "yield", SpreadOptions{Kind: BoxPlot, Order: ByCode})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	// One box per treatment: 5 entry boxes and 1 check box, plus one key
	// swatch each.
	if got := countFill(svg, hexEntry); got != 5+1 {
		t.Errorf("%d entry fills, want 5 boxes + 1 key swatch", got)
	}
	if got := countFill(svg, hexCheck); got != 1+1 {
		t.Errorf("%d check fills, want 1 box + 1 key swatch", got)
	}
	texts := svgTexts(svg)
	if countText(texts, "Treatment (ordered by code)") != 1 {
		t.Error("order note missing")
	}
	if _, err := Spread(fixtureTrial(), "nope", SpreadOptions{}); err == nil || !strings.Contains(err.Error(), "nope") {
		t.Errorf("unknown trait: %v", err)
	}
}
