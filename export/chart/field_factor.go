package chart

import (
	"fmt"
	"image/color"
	"strings"

	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial"
)

// mainPlotColour is the line of main-plot outlines: darker and thinner
// than block outlines, heavier than the cell grid.
var mainPlotColour = color.Gray{Y: 0x40}

// subPlotColour is the dashed line of subplot outlines (split-split plots).
var subPlotColour = color.Gray{Y: 0x50}

// mainPlotUnit is the main plot a plot belongs to in the field map's
// outlines: its MainPlot in a split plot, 0 (none) otherwise. The strips
// of a strip plot are whole field rows and columns of a block, which the
// grid already shows.
func mainPlotUnit(t *trial.Trial, pl trial.Plot) int {
	if t.Design.Kind == trial.SplitPlot {
		return pl.MainPlot
	}
	return 0
}

// subPlotUnit is the subplot a plot belongs to in the outlines: its
// SubPlot in a split-split plot, 0 (none) otherwise.
func subPlotUnit(t *trial.Trial, pl trial.Plot) int {
	if t.SplitSplit() {
		return pl.SubPlot
	}
	return 0
}

// plotUnits outlines the main plots: every cell side whose neighbour is
// in the same block but another main plot; and, dashed, the subplots of a
// split-split plot: every side whose neighbour is in the same main plot
// but another subplot.
func (g *fieldGrid) plotUnits(c draw.Canvas, trX, trY func(float64) vg.Length) {
	type pos struct{ r, c int }
	type unit struct{ block, unit, sub int }
	at := make(map[pos]unit, len(g.cells))
	some := false
	for _, cell := range g.cells {
		at[pos{cell.row, cell.col}] = unit{cell.block, cell.unit, cell.sub}
		some = some || cell.unit != 0
	}
	if !some {
		return
	}
	var segs, subSegs [][2]vg.Point
	for _, cell := range g.cells {
		if cell.unit == 0 {
			continue
		}
		r := cellRect(trX, trY, cell.col, cell.row)
		side := func(dr, dc int, a, b vg.Point) {
			nb, ok := at[pos{cell.row + dr, cell.col + dc}]
			switch {
			case !ok || nb.block != cell.block || nb.unit == 0:
			case nb.unit != cell.unit:
				segs = append(segs, [2]vg.Point{a, b})
			case nb.sub != cell.sub && nb.sub != 0 && cell.sub != 0:
				subSegs = append(subSegs, [2]vg.Point{a, b})
			}
		}
		// Each shared side once: the right and upper neighbours only.
		side(1, 0, vg.Point{X: r.Min.X, Y: r.Max.Y}, r.Max)
		side(0, 1, vg.Point{X: r.Max.X, Y: r.Min.Y}, r.Max)
	}
	strokeSegments(c, draw.LineStyle{Color: mainPlotColour, Width: vg.Points(1.2)}, segs)
	strokeSegments(c, draw.LineStyle{Color: subPlotColour, Width: vg.Points(0.9), Dashes: []vg.Length{vg.Points(3), vg.Points(2)}}, subSegs)
}

// colourFactor returns the index of the factor a field map is coloured
// by, −1 for colouring by treatment ("" key), or an error naming the
// factors when the key is not one of them.
func colourFactor(t *trial.Trial, key string) (int, error) {
	if key == "" {
		return -1, nil
	}
	if f := t.FactorIndex(key); f >= 0 {
		return f, nil
	}
	if !t.Factorial() {
		return -1, fmt.Errorf("the trial has no treatment factors, so its map cannot be coloured by factor %q", key)
	}
	keys := make([]string, len(t.Factors))
	for i, f := range t.Factors {
		keys[i] = f.Key
	}
	return -1, fmt.Errorf("the trial has no factor %q; colour the map by one of %s", key, strings.Join(keys, ", "))
}

// levelSwatches gives every treatment the swatch of its level of factor f.
func levelSwatches(t *trial.Trial, f int) map[string]swatch {
	look := make(map[string]swatch, len(t.Treatments))
	for _, trt := range t.Treatments {
		if f < len(trt.Levels) {
			if k := t.Factors[f].LevelIndex(trt.Levels[f]); k >= 0 {
				look[trt.Code] = treatmentSwatch(k)
			}
		}
	}
	return look
}

// levelEntries is the key of a map coloured by factor f: one swatch per
// level.
func levelEntries(t *trial.Trial, f int) []panelEntry {
	fac := t.Factors[f]
	out := []panelEntry{{text: "Colour: " + fac.Label()}}
	for k, l := range fac.Levels {
		sw := treatmentSwatch(k)
		sw.Outline = draw.LineStyle{Color: gridGrey, Width: vg.Points(0.3)}
		label := l.Code
		if l.Name != "" && l.Name != l.Code {
			label += "  " + l.Name
		}
		out = append(out, panelEntry{swatch: &sw, text: label})
	}
	return out
}

// factorialDesignWords names a factorial design for the map's subtitle:
// "split plot, N on main plots, 3 blocks".
func factorialDesignWords(t *trial.Trial) string {
	order := t.Design.FactorOrder(t.Factors)
	key := func(k int) string { return t.Factors[order[k]].Key }
	keys := make([]string, len(t.Factors))
	for i, f := range t.Factors {
		keys[i] = f.Key
	}
	switch t.Design.Kind {
	case trial.SplitPlot:
		return fmt.Sprintf("%s, %s on main plots, %d blocks", t.Design.Kind.Name(), key(0), t.Design.Reps)
	case trial.StripPlot:
		return fmt.Sprintf("%s, %s in horizontal and %s in vertical strips, %d blocks", t.Design.Kind.Name(), key(0), key(1), t.Design.Reps)
	}
	return fmt.Sprintf("%s factorial, %s, %d replicates", strings.Join(keys, " × "), t.Design.Kind.Abbrev(), t.Design.Reps)
}
