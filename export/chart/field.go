package chart

import (
	"fmt"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial"
)

// orientationNote says where the field grid starts. Trials store no compass
// bearing, so the charts state the grid orientation only.
const orientationNote = "Row 1 / Column 1 at the lower left"

// HeatMapOptions control a field heat map.
type HeatMapOptions struct {
	// Title replaces the trial title on the first line.
	Title string
	// PlotNumbers writes the plot number in each cell when the cells are
	// large enough to hold it legibly.
	PlotNumbers bool
}

// HeatMap draws one trait over the field grid: a cell per plot coloured on
// the viridis scale from the smallest to the largest recorded value (dark
// purple low, yellow high), missing plots grey and hatched, excluded plots
// crossed (their colour still shows their value), blocks outlined, and a
// colour scale labelled with the minimum, middle and maximum and the unit.
func HeatMap(t *trial.Trial, traitKey string, opt HeatMapOptions) (*plot.Plot, error) {
	if t == nil {
		panic("chart: HeatMap of a nil trial")
	}
	tr, err := traitOf(t, traitKey)
	if err != nil {
		return nil, err
	}
	vals, err := t.TraitValues(traitKey)
	if err != nil {
		return nil, err
	}
	g, err := newFieldGrid(t.Plots)
	if err != nil {
		return nil, err
	}
	lo, hi, ok := finiteRange(vals)
	if !ok {
		return nil, fmt.Errorf("trait %q has no recorded values yet: %w", traitKey, ErrNoData)
	}
	g.minFont = vg.Points(5)
	g.maxFont = vg.Points(8)
	nMissing, nExcluded := 0, 0
	for i, pl := range t.Plots {
		v := vals[i]
		cell := gridCell{row: pl.Row, col: pl.Column, block: pl.Block}
		if math.IsNaN(v) || math.IsInf(v, 0) {
			cell.sw = swatch{Fill: missingFill, Pattern: patternBackDiagonal, Ink: gridGrey}
			nMissing++
		} else {
			f := 0.5
			if hi > lo {
				f = (v - lo) / (hi - lo)
			}
			cell.sw = swatch{Fill: Viridis(f)}
		}
		if excludedFor(t, i, traitKey) {
			cell.sw.Cross = true
			cell.sw.Ink = inkOn(cell.sw.Fill)
			nExcluded++
		}
		if opt.PlotNumbers {
			cell.lines = []string{strconv.Itoa(pl.Number)}
		}
		g.cells = append(g.cells, cell)
	}
	title := opt.Title
	if title == "" {
		title = t.Title
	}
	p := newPlot(chartTitle(title, tr.Name+" across the field"))
	g.setAxes(p)
	p.Add(g)

	dec := tr.Decimals
	if dec < 0 || dec > 6 {
		dec = -1
	}
	panel := &sidePanel{size: vg.Points(8)}
	panel.scale = &colourScale{
		min: lo, max: hi,
		title:  traitTitle(tr.Name, tr.Unit, tr.Key),
		format: func(v float64) string { return formatValue(v, dec) },
	}
	if dec < 0 {
		panel.scale.format = func(v float64) string { return formatValue(v, -1) }
	}
	if nMissing > 0 {
		panel.entries = append(panel.entries, panelEntry{
			swatch: &swatch{Fill: missingFill, Pattern: patternBackDiagonal, Ink: gridGrey, Outline: draw.LineStyle{Color: gridGrey, Width: vg.Points(0.3)}},
			text:   "No value (" + strconv.Itoa(nMissing) + ")",
		})
	}
	if nExcluded > 0 {
		panel.entries = append(panel.entries, panelEntry{
			swatch: &swatch{Fill: color.White, Cross: true, Outline: draw.LineStyle{Color: gridGrey, Width: vg.Points(0.3)}},
			text:   "Excluded from the\nanalysis (" + strconv.Itoa(nExcluded) + ")",
		})
	}
	if g.blockCount() > 1 {
		panel.entries = append(panel.entries, panelEntry{
			swatch: &swatch{Outline: draw.LineStyle{Color: color.Black, Width: vg.Points(2)}},
			text:   "Block outline",
		})
	}
	panel.entries = append(panel.entries, panelEntry{text: orientationNote})
	p.Add(panel)
	return p, nil
}

// FieldMapOptions control a printable field map.
type FieldMapOptions struct {
	// Title replaces the trial title on the first line.
	Title string
}

// FieldMap draws the printable field map: the plot grid with the plot
// number and treatment code in each cell, a fill colour per treatment (the
// Okabe–Ito palette in turn; past eight treatments the colours come round
// again with a line pattern added), block outlines, the orientation of the
// grid, and a key of treatment codes and names. It is laid out for an A4 or
// Letter landscape page.
func FieldMap(t *trial.Trial, opt FieldMapOptions) (*plot.Plot, error) {
	if t == nil {
		panic("chart: FieldMap of a nil trial")
	}
	g, err := newFieldGrid(t.Plots)
	if err != nil {
		return nil, err
	}
	g.minFont = vg.Points(3.5)
	g.maxFont = vg.Points(14)
	look := make(map[string]swatch, len(t.Treatments))
	for i, trt := range t.Treatments {
		look[trt.Code] = treatmentSwatch(i)
	}
	unknown := swatch{Fill: color.White}
	for _, pl := range t.Plots {
		sw, ok := look[pl.Treatment]
		if !ok {
			sw = unknown
		}
		g.cells = append(g.cells, gridCell{
			row: pl.Row, col: pl.Column, block: pl.Block, sw: sw,
			lines: []string{strconv.Itoa(pl.Number), pl.Treatment},
		})
	}
	title := opt.Title
	if title == "" {
		title = t.Title
	}
	sub := "Field map"
	if d := designName(t.Design.Kind); d != "" {
		sub += ": " + d
		if t.Design.Reps > 0 {
			sub += fmt.Sprintf(", %d replicates", t.Design.Reps)
		}
	}
	sub += fmt.Sprintf(", %d treatments, %d plots", len(t.Treatments), len(t.Plots))
	p := newPlot(chartTitle(title, sub))
	g.setAxes(p)
	p.Add(g)

	panel := &sidePanel{size: vg.Points(8)}
	n := len(t.Treatments)
	switch {
	case n > 120:
		panel.entries = append(panel.entries, panelEntry{text: fmt.Sprintf("%d treatments: codes\nare listed with names\nin the treatment list", n)})
	default:
		if n > 40 {
			panel.size = vg.Points(6)
		}
		perCol := 30
		if n > 40 {
			perCol = 40
		}
		panel.columns = (n + perCol - 1) / perCol
		for i, trt := range t.Treatments {
			sw := treatmentSwatch(i)
			sw.Outline = draw.LineStyle{Color: gridGrey, Width: vg.Points(0.3)}
			label := trt.Code
			if trt.Name != "" && trt.Name != trt.Code {
				label += "  " + trt.Name
			}
			if trt.Role == trial.RoleCheck {
				label += " (check)"
			}
			panel.entries = append(panel.entries, panelEntry{swatch: &sw, text: label})
		}
	}
	note := []string{orientationNote, "Cells: plot number, treatment code"}
	if g.blockCount() > 1 {
		note = append(note, "Thick lines: block outlines")
	}
	p.X.Label.Text = "Field column    (" + joinNotes(note) + ")"
	p.Add(panel)
	return p, nil
}

func joinNotes(ns []string) string {
	s := ""
	for i, n := range ns {
		if i > 0 {
			s += "; "
		}
		s += n
	}
	return s
}

// treatmentSwatch is the fill of the i-th treatment in a field map.
func treatmentSwatch(i int) swatch {
	fill := OkabeIto[i%len(OkabeIto)]
	pat := pattern((i / len(OkabeIto)) % int(nPatterns))
	return swatch{Fill: fill, Pattern: pat, Ink: inkOn(fill)}
}

func designName(k trial.DesignKind) string {
	switch k {
	case trial.CRD:
		return "completely randomised design"
	case trial.RCBD:
		return "randomised complete block design"
	case trial.Latin:
		return "Latin square"
	}
	return ""
}
