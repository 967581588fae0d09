package chart

import (
	"regexp"
	"strings"
	"testing"
	"time"

	"furlong/trial"
)

// factorTrial is an invented split or strip plot (fictional levels).
func factorTrial(t *testing.T, kind trial.DesignKind) *trial.Trial {
	t.Helper()
	tr, err := trial.New(trial.NewOptions{
		Title: "Fictional Larkspur Bend tillage by variety",
		Factors: []trial.Factor{
			{Key: "T", Name: "Tillage", Levels: []trial.Level{{Code: "CT", Name: "ploughed"}, {Code: "MT"}, {Code: "NT", Name: "no-till"}}},
			{Key: "V", Levels: []trial.Level{{Code: "V1"}, {Code: "V2"}, {Code: "V3"}}},
		},
		Design: trial.Design{Kind: kind, Reps: 2},
		Seed:   4, Now: time.Unix(0, 0),
	})
	if err != nil {
		t.Fatal(err)
	}
	return tr
}

// mainPlotSegments counts the segments of the main-plot outline path in
// an SVG (one move per segment).
func mainPlotSegments(svg []byte) int {
	re := regexp.MustCompile(`<path d="([^"]*)"[^>]*stroke:` + hexOf(mainPlotColour))
	n := 0
	for _, m := range re.FindAllSubmatch(svg, -1) {
		n += strings.Count(string(m[1]), "M")
	}
	return n
}

// TestFieldMapMainPlots: a split plot's map outlines every side between
// two main plots of one block (brute force over neighbouring plots, as a
// map drawn by hand would: common practice); an RCBD has no such lines.
// Coloured by a factor, each level's Okabe–Ito colour fills its plots and
// its key swatch (as TestFieldMapSVG checks treatments).
func TestFieldMapMainPlots(t *testing.T) {
	t.Parallel()
	tr := factorTrial(t, trial.SplitPlot)
	type pos struct{ r, c int }
	at := map[pos]trial.Plot{}
	for _, p := range tr.Plots {
		at[pos{p.Row, p.Column}] = p
	}
	want := 0
	for _, p := range tr.Plots {
		for _, d := range []pos{{1, 0}, {0, 1}} {
			if q, ok := at[pos{p.Row + d.r, p.Column + d.c}]; ok && q.Block == p.Block && q.MainPlot != p.MainPlot {
				want++
			}
		}
	}
	if want == 0 {
		t.Fatal("the fixture has no main-plot boundaries")
	}
	p, err := FieldMap(tr, FieldMapOptions{ColourBy: "T"})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	if got := mainPlotSegments(svg); got != want {
		t.Errorf("%d main-plot outline segments, want %d", got, want)
	}
	count := map[string]int{}
	for _, pl := range tr.Plots {
		count[tr.LevelCode(pl.Treatment, 0)]++
	}
	for k, l := range tr.Factors[0].Levels {
		if got, w := countFill(svg, hexOf(OkabeIto[k])), count[l.Code]+1; got != w {
			t.Errorf("level %s fill used %d times, want %d", l.Code, got, w)
		}
	}
	texts := svgTexts(svg)
	if countText(texts, "NT  no-till") != 1 || countText(texts, "Colour: Tillage") != 1 {
		t.Error("the level key is missing")
	}
	rc := factorTrial(t, trial.RCBD)
	p, err = FieldMap(rc, FieldMapOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if got := mainPlotSegments(render(t, p, "svg")); got != 0 {
		t.Errorf("an RCBD map has %d main-plot segments", got)
	}
	if _, err := FieldMap(rc, FieldMapOptions{ColourBy: "X"}); err == nil || !strings.Contains(err.Error(), "one of T, V") {
		t.Errorf("unknown factor: %v", err)
	}
}

// TestFieldMapSubPlots: a split-split plot's map also outlines, dashed,
// every side between two subplots of one main plot (brute force over
// neighbouring plots, as TestFieldMapMainPlots).
func TestFieldMapSubPlots(t *testing.T) {
	t.Parallel()
	tr, err := trial.New(trial.NewOptions{
		Title: "Fictional Larkspur Bend tillage by variety by sowing date",
		Factors: []trial.Factor{
			{Key: "T", Levels: []trial.Level{{Code: "CT"}, {Code: "NT"}}},
			{Key: "V", Levels: []trial.Level{{Code: "V1"}, {Code: "V2"}, {Code: "V3"}}},
			{Key: "S", Levels: []trial.Level{{Code: "early"}, {Code: "late"}}},
		},
		Design: trial.Design{Kind: trial.SplitPlot, Reps: 2},
		Seed:   6, Now: time.Unix(0, 0),
	})
	if err != nil {
		t.Fatal(err)
	}
	type pos struct{ r, c int }
	at := map[pos]trial.Plot{}
	for _, p := range tr.Plots {
		at[pos{p.Row, p.Column}] = p
	}
	wantMain, wantSub := 0, 0
	for _, p := range tr.Plots {
		for _, d := range []pos{{1, 0}, {0, 1}} {
			q, ok := at[pos{p.Row + d.r, p.Column + d.c}]
			switch {
			case !ok || q.Block != p.Block:
			case q.MainPlot != p.MainPlot:
				wantMain++
			case q.SubPlot != p.SubPlot:
				wantSub++
			}
		}
	}
	p, err := FieldMap(tr, FieldMapOptions{})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	if got := mainPlotSegments(svg); got != wantMain {
		t.Errorf("%d main-plot segments, want %d", got, wantMain)
	}
	re := regexp.MustCompile(`<path d="([^"]*)"[^>]*stroke:` + hexOf(subPlotColour))
	got := 0
	for _, m := range re.FindAllSubmatch(svg, -1) {
		got += strings.Count(string(m[1]), "M")
	}
	if wantSub == 0 || got != wantSub {
		t.Errorf("%d subplot segments, want %d", got, wantSub)
	}
}
