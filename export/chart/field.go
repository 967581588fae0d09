package chart

import (
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/trial"
	"furlong/trial/analysis"
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

// ResidualMapOptions control a residual heat map.
type ResidualMapOptions struct {
	// Title replaces the trial title on the first line.
	Title string
	// PlotNumbers writes the plot number in each cell when the cells are
	// large enough to hold it legibly.
	PlotNumbers bool
}

// ResidualMap draws the residuals of the analysis r over the field grid:
// each analysed plot's recorded value minus the value the model expects
// for its treatment (and block), on a diverging scale centred on zero
// (purple below, orange above what the model expects). With the
// treatment effects taken out, what is left shows the field: fertility
// gradients, wet corners, an edge effect, a mistake in recording. Plots
// the analysis did not use (missing or excluded) are grey and hatched.
func ResidualMap(t *trial.Trial, r *analysis.Result, opt ResidualMapOptions) (*plot.Plot, error) {
	if t == nil || r == nil {
		panic("chart: ResidualMap of a nil trial or result")
	}
	g, err := newFieldGrid(t.Plots)
	if err != nil {
		return nil, err
	}
	if r.ANOVA == nil || len(r.ANOVA.Residuals) == 0 || len(r.PlotIndex) != len(r.ANOVA.Residuals) {
		return nil, fmt.Errorf("the analysis of %q has no residuals: %w", r.TraitKey, ErrNoData)
	}
	res := make([]float64, len(t.Plots))
	used := make([]bool, len(t.Plots))
	span := 0.0
	for i, e := range r.ANOVA.Residuals {
		k := r.PlotIndex[i]
		if k < 0 || k >= len(t.Plots) || math.IsNaN(e) || math.IsInf(e, 0) {
			continue
		}
		res[k], used[k] = e, true
		span = math.Max(span, math.Abs(e))
	}
	// The colours run to ±2.5 residual standard deviations (beyond that,
	// full colour), so that one outlier does not wash out the trend.
	if a := r.ANOVA; a.MSE > 0 && !math.IsInf(a.MSE, 0) {
		span = math.Min(span, 2.5*math.Sqrt(a.MSE))
	}
	g.minFont = vg.Points(5)
	g.maxFont = vg.Points(9)
	nUnused := 0
	for i, pl := range t.Plots {
		cell := gridCell{row: pl.Row, col: pl.Column, block: pl.Block}
		if !used[i] {
			cell.sw = swatch{Fill: missingFill, Pattern: patternBackDiagonal, Ink: gridGrey}
			nUnused++
		} else {
			f := 0.5
			if span > 0 {
				f = 0.5 + 0.5*math.Max(-1, math.Min(1, res[i]/span))
			}
			cell.sw = swatch{Fill: Diverging(f)}
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
	p := newPlot(chartTitle(title, r.TraitName+": residuals across the field"))
	g.setAxes(p)
	p.Add(g)

	dec := r.Decimals
	if dec < 0 || dec > 6 {
		dec = -1
	}
	if dec >= 0 {
		dec++
	}
	if span == 0 {
		span = 1
	}
	panel := &sidePanel{size: keySize}
	panel.scale = &colourScale{
		min: -span, max: span,
		title:  "Residual" + unitSuffix(r.Unit),
		format: func(v float64) string { return signed(formatValue(v, dec)) },
		ramp:   Diverging,
	}
	panel.entries = append(panel.entries,
		panelEntry{text: "Recorded minus expected\n(treatment" + blockWords(t) + ").\nPatches of one colour:\na trend in the field."})
	if nUnused > 0 {
		panel.entries = append(panel.entries, panelEntry{
			swatch: &swatch{Fill: missingFill, Pattern: patternBackDiagonal, Ink: gridGrey, Outline: draw.LineStyle{Color: gridGrey, Width: vg.Points(0.3)}},
			text:   "Not analysed (" + strconv.Itoa(nUnused) + ")",
		})
	}
	if g.blockCount() > 1 {
		panel.entries = append(panel.entries, panelEntry{
			swatch: &swatch{Outline: draw.LineStyle{Color: color.Black, Width: vg.Points(2)}},
			text:   "Block outline",
		})
	}
	panel.entries = append(panel.entries, panelEntry{text: orientationNote})
	panel.entries = append(panel.entries, orientationEntries(t)...)
	p.Add(panel)
	return p, nil
}

// blockWords names the other terms of the model, for the key.
func blockWords(t *trial.Trial) string {
	switch t.Design.Kind {
	case trial.RCBD:
		return " and block"
	case trial.Latin:
		return ", row, column"
	}
	return ""
}

// signed puts a plus before a positive number's text.
func signed(s string) string {
	if s != "" && s[0] != '-' && strings.Trim(s, "0.") != "" {
		return "+" + s
	}
	return s
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
	panel := &sidePanel{size: keySize}
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
	panel.entries = append(panel.entries, orientationEntries(t)...)
	p.Add(panel)
	return p, nil
}

// FieldMapOptions control a printable field map.
type FieldMapOptions struct {
	// Title replaces the trial title on the first line.
	Title string
	// ColourBy, the key of one of a factorial trial's factors, colours
	// the plots by their level of that factor instead of by treatment.
	ColourBy string
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
	colourBy, err := colourFactor(t, opt.ColourBy)
	if err != nil {
		return nil, err
	}
	if colourBy >= 0 {
		look = levelSwatches(t, colourBy)
	}
	unknown := swatch{Fill: color.White}
	for _, pl := range t.Plots {
		sw, ok := look[pl.Treatment]
		if !ok {
			sw = unknown
		}
		g.cells = append(g.cells, gridCell{
			row: pl.Row, col: pl.Column, block: pl.Block, unit: mainPlotUnit(t, pl), sub: subPlotUnit(t, pl), sw: sw,
			lines: []string{strconv.Itoa(pl.Number), pl.Treatment},
		})
	}
	title := opt.Title
	if title == "" {
		title = t.Title
	}
	sub := "Field map"
	if k := t.Design.Kind; k.Known() && t.Factorial() {
		sub += ": " + factorialDesignWords(t)
	} else if k.Known() {
		sub += ": " + k.Name()
		if t.Design.Reps > 0 {
			sub += fmt.Sprintf(", %d replicates", t.Design.Reps)
		}
	}
	sub += fmt.Sprintf(", %d treatments, %d plots", len(t.Treatments), len(t.Plots))
	p := newPlot(chartTitle(title, sub))
	g.setAxes(p)
	p.Add(g)

	panel := &sidePanel{size: keySize}
	n := len(t.Treatments)
	switch {
	case colourBy >= 0:
		panel.entries = append(panel.entries, levelEntries(t, colourBy)...)
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
	if t.Design.Kind == trial.SplitPlot {
		note = append(note, "dark lines: main plots")
		if t.SplitSplit() {
			note = append(note, "dashed: subplots")
		}
	}
	p.X.Label.Text = "Field column    (" + joinNotes(note) + ")"
	panel.entries = append(orientationEntries(t), panel.entries...)
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
