package chart

import (
	"errors"
	"strconv"
	"strings"
	"testing"

	"furlong/trial"
)

func TestHeatMapSVG(t *testing.T) {
	t.Parallel()
	tr := fixtureTrial()
	p, err := HeatMap(tr, "yield", HeatMapOptions{PlotNumbers: true})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	texts := svgTexts(svg)
	lo, hi, _ := finiteRange(tr.Traits[0].Values)
	// The colour scale: title with the unit, min, middle and max labels at
	// the trait's 2 decimals.
	for _, want := range []string{
		"Grain yield (t/ha)",
		strconv.FormatFloat(lo, 'f', 2, 64), strconv.FormatFloat(hi, 'f', 2, 64),
		strconv.FormatFloat((lo+hi)/2, 'f', 2, 64),
		"No value (1)", "Excluded from the", "analysis (1)", "Block outline", orientationNote,
	} {
		if countText(texts, want) < 1 {
			t.Errorf("text %q missing; have %q", want, texts)
		}
	}
	// A plot number in every cell.
	for _, pl := range tr.Plots {
		if countText(texts, strconv.Itoa(pl.Number)) != 1 {
			t.Errorf("plot number %d missing", pl.Number)
		}
	}
	// The lowest and highest values get the two ends of the viridis scale
	// (#440154 and #FDE725, matplotlib's table entries 0 and 255).
	if countFill(svg, "#440154") < 1 || countFill(svg, "#FDE725") < 1 {
		t.Error("cells at the scale ends do not use the viridis end colours")
	}

	// Without plot numbers, none are written.
	p, _ = HeatMap(tr, "yield", HeatMapOptions{})
	svg = render(t, p, "svg")
	if texts := svgTexts(svg); countText(texts, "101") != 0 {
		t.Error("plot numbers written although not asked for")
	}
	// The missing plot: one grey cell plus its key swatch.
	if got := countFill(svg, hexOf(missingFill)); got != 2 {
		t.Errorf("%d grey fills, want 1 cell + 1 key swatch", got)
	}
}

func TestHeatMapErrors(t *testing.T) {
	t.Parallel()
	tr := fixtureTrial()
	if _, err := HeatMap(tr, "height", HeatMapOptions{}); err == nil || !strings.Contains(err.Error(), `no trait "height"`) {
		t.Errorf("unknown trait: %v", err)
	}
	for i := range tr.Traits[0].Values {
		tr.Traits[0].Values[i] = trial.Missing
	}
	if _, err := HeatMap(tr, "yield", HeatMapOptions{}); !errors.Is(err, ErrNoData) {
		t.Errorf("no values: %v, want ErrNoData", err)
	}
	tr = fixtureTrial()
	tr.Plots[3].Row = 0
	if _, err := HeatMap(tr, "yield", HeatMapOptions{}); !errors.Is(err, ErrNoLayout) {
		t.Errorf("plot without position: %v, want ErrNoLayout", err)
	}
	if _, err := FieldMap(tr, FieldMapOptions{}); !errors.Is(err, ErrNoLayout) {
		t.Errorf("field map, plot without position: %v, want ErrNoLayout", err)
	}
}

func TestFieldMapSVG(t *testing.T) {
	t.Parallel()
	tr := fixtureTrial()
	p, err := FieldMap(tr, FieldMapOptions{})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	texts := svgTexts(svg)
	// Every cell holds its plot number and treatment code (drawn as two
	// lines of one text).
	count := map[string]int{}
	for _, pl := range tr.Plots {
		if countText(texts, strconv.Itoa(pl.Number)) != 1 {
			t.Errorf("plot number %d missing", pl.Number)
		}
		count[pl.Treatment]++
	}
	for i, trt := range tr.Treatments {
		if got := countText(texts, trt.Code); got != count[trt.Code] {
			t.Errorf("code %s written %d times, want %d", trt.Code, got, count[trt.Code])
		}
		label := trt.Code + "  " + trt.Name
		if trt.Role == trial.RoleCheck {
			label += " (check)"
		}
		if countText(texts, label) != 1 {
			t.Errorf("key entry %q missing", label)
		}
		// Fill per treatment: Okabe–Ito colour i, on each of its plots and
		// its key swatch.
		if got, want := countFill(svg, hexOf(OkabeIto[i])), count[trt.Code]+1; got != want {
			t.Errorf("%s fill %s used %d times, want %d", trt.Code, hexOf(OkabeIto[i]), got, want)
		}
	}
	found := false
	for _, s := range texts {
		if strings.Contains(s, orientationNote) {
			found = true
		}
	}
	if !found {
		t.Error("orientation note missing")
	}
	if countText(texts, "Thistlewade Farm maize hybrids 2026") != 1 {
		t.Error("title missing")
	}
}

func TestTreatmentSwatchesDistinct(t *testing.T) {
	t.Parallel()
	// Past eight treatments the colours repeat, so each colour × pattern
	// pair must be unique for the first 8·nPatterns treatments.
	seen := map[[2]string]int{}
	for i := 0; i < 8*int(nPatterns); i++ {
		sw := treatmentSwatch(i)
		k := [2]string{hexOf(sw.Fill), strconv.Itoa(int(sw.Pattern))}
		if j, ok := seen[k]; ok {
			t.Errorf("treatments %d and %d look alike", j, i)
		}
		seen[k] = i
	}
}

func TestFieldMapManyTreatments(t *testing.T) {
	t.Parallel()
	tr, _ := bigFixture(60, 3)
	p, err := FieldMap(tr, FieldMapOptions{})
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(render(t, p, "svg"))
	for _, pl := range tr.Plots {
		if countText(texts, strconv.Itoa(pl.Number)) != 1 {
			t.Fatalf("plot number %d missing at 60 treatments", pl.Number)
		}
	}
	if countText(texts, "L60  Line 60 (check)") != 1 {
		t.Error("key entry of the last treatment missing")
	}
}

func TestClipSegment(t *testing.T) {
	t.Parallel()
	// Liang–Barsky clipping, checked by hand: the diagonal of a 20×20
	// square through a 10×10 box at the origin keeps (0,0)–(10,10).
	r := rectOf(0, 0, 10, 10)
	a, b, ok := clipSegment(pt(-5, -5), pt(15, 15), r)
	if !ok || a != pt(0, 0) || b != pt(10, 10) {
		t.Errorf("clip = %v %v %v", a, b, ok)
	}
	if _, _, ok := clipSegment(pt(-5, 20), pt(20, 30), r); ok {
		t.Error("segment above the box was kept")
	}
	segs := patternSegments(patternHorizontal, r, 2.5)
	if len(segs) != 4 {
		t.Errorf("%d horizontal lines at spacing 2.5 in height 10, want 4", len(segs))
	}
}
