package ui

import (
	"context"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/export/chart"
	"furlong/export/pdf"
	"furlong/export/xlsx"
	"furlong/trial"
	"furlong/trial/fieldbook"
	"furlong/ui/fieldmap"
)

// fieldStep holds the plot geometry and arrangement, the randomisation
// and the field map.
type fieldStep struct {
	u    *App
	root fyne.CanvasObject

	plotLen, plotWid, harvLen, harvWid, alley, perRow *widget.Entry
	blocks, numbering, walk                           *widget.Select
	seed                                              *widget.Entry
	randomState                                       *widget.Label
	randomBtn                                         *widget.Button
	layoutMsg                                         *widget.Label // what Apply layout changed
	colorBy                                           *widget.RadioGroup

	fmap    *fieldmap.Map
	orient  *orientationBox // north and landmark (fieldorient.go)
	details *widget.Label

	// Lengths are shown in unit ("m" or "ft"); perUnit metres make one.
	unit    string
	perUnit float64
	shown   map[*widget.Entry]float64 // metres behind each length's text
}

// footM is the international foot in metres (exact by definition, NIST
// Handbook 44, Appendix C).
const footM = 0.3048

var (
	arrangeLabels = []string{"side by side", "one behind the other"}
	arrangeValues = []trial.BlockArrangement{trial.BlocksSideBySide, trial.BlocksStacked}
	numberLabels  = []string{"by block (101, 102, … 201)", "1, 2, 3 … in walking order"}
	numberValues  = []trial.Numbering{trial.NumberByBlock, trial.NumberSequential}
	walkLabels    = []string{"serpentine (back and forth)", "every row from the same end"}
	walkValues    = []trial.Walk{trial.WalkSerpentine, trial.WalkStraight}
)

func newFieldStep(u *App) *fieldStep {
	f := &fieldStep{u: u, unit: "m", perUnit: 1}
	if u.prefs.units == unitsImperial {
		f.unit, f.perUnit = "ft", footM
	}
	num := func() *widget.Entry {
		e := widget.NewEntry()
		e.Validator = func(s string) error {
			if strings.TrimSpace(s) == "" {
				return nil
			}
			if v, err := trial.ParseNumber(s, trial.PointOrComma); err != nil || v < 0 {
				return errors.New("a length, 0 or more")
			}
			return nil
		}
		return e
	}
	f.plotLen, f.plotWid, f.harvLen, f.harvWid, f.alley = num(), num(), num(), num(), num()
	f.perRow = widget.NewEntry()
	f.perRow.SetPlaceHolder("empty: each block in one row")
	f.blocks = widget.NewSelect(arrangeLabels, nil)
	f.numbering = widget.NewSelect(numberLabels, nil)
	f.walk = widget.NewSelect(walkLabels, nil)
	applyLayout := widget.NewButtonWithIcon("Apply layout", theme.ConfirmIcon(), f.applyLayout)
	geom := widget.NewForm(
		widget.NewFormItem("Plot length ("+f.unit+")", f.plotLen),
		widget.NewFormItem("Plot width ("+f.unit+")", f.plotWid),
		widget.NewFormItem("Harvested length ("+f.unit+")", f.harvLen),
		widget.NewFormItem("Harvested width ("+f.unit+")", f.harvWid),
		widget.NewFormItem("Alley ("+f.unit+")", f.alley),
		widget.NewFormItem("Plots per row", f.perRow),
	)
	// The choices sit under their labels, the panel's full width, so that
	// their long wording is never cut off in the narrow panel.
	stacked := func(label string, sel *widget.Select) fyne.CanvasObject {
		return container.NewVBox(widget.NewLabelWithStyle(label, fyne.TextAlignLeading, fyne.TextStyle{Bold: true}), sel)
	}
	choices := container.NewVBox(stacked("Blocks", f.blocks), stacked("Numbering", f.numbering), stacked("Walking order", f.walk))
	f.seed = widget.NewEntry()
	newSeed := widget.NewButtonWithIcon("New seed", theme.ViewRefreshIcon(), func() {
		f.seed.SetText(strconv.FormatUint(trial.NewSeed(), 10))
	})
	randomise := widget.NewButtonWithIcon("Randomise", theme.MediaReplayIcon(), f.randomise)
	randomise.Importance = widget.HighImportance
	f.randomBtn = randomise
	f.randomState = widget.NewLabel("")
	f.randomState.Wrapping = fyne.TextWrapWord
	randomBox := container.NewVBox(
		heading("Randomisation"),
		container.NewBorder(nil, nil, widget.NewLabel("Seed"), newSeed, f.seed),
		randomise, f.randomState)

	mapBtn := widget.NewButtonWithIcon("Field map (PNG/PDF)…", theme.DocumentSaveIcon(), func() { u.exportMapDialog() })
	csvBtn := widget.NewButtonWithIcon("Field book (CSV)…", theme.DocumentSaveIcon(), func() { u.exportFieldBookCSV() })
	xlsxBtn := widget.NewButtonWithIcon("Field book (xlsx)…", theme.DocumentSaveIcon(), func() { u.exportFieldBookXLSX() })
	exports := container.NewVBox(heading("Take to the field"), mapBtn, csvBtn, xlsxBtn)

	perRowHelp := widget.NewLabel("Plots per row: how many plots of a block make one field row; empty (or 0) puts each block in one row. A Latin square ignores it.")
	perRowHelp.Wrapping = fyne.TextWrapWord
	perRowHelp.Importance = widget.LowImportance
	f.layoutMsg = widget.NewLabel("")
	f.layoutMsg.Wrapping = fyne.TextWrapWord
	f.layoutMsg.Importance = widget.SuccessImportance
	f.orient = newOrientationBox(u)
	left := container.NewVScroll(container.NewVBox(heading("Plots and arrangement"), geom, perRowHelp, choices, applyLayout, f.layoutMsg,
		widget.NewSeparator(), f.orient.root, widget.NewSeparator(), randomBox, widget.NewSeparator(), exports))

	f.fmap = fieldmap.New()
	f.fmap.OnHover = func(i int) {
		if i < 0 {
			i = f.fmap.Selected()
		}
		f.showDetails(i)
	}
	f.fmap.OnTapped = f.showDetails
	f.colorBy = widget.NewRadioGroup([]string{"Colour by treatment", "Colour by block"}, func(string) { f.loadMap() })
	f.colorBy.Horizontal = true
	f.colorBy.SetSelected("Colour by treatment")
	f.details = widget.NewLabel("Point at a plot to see its details.")
	f.details.Wrapping = fyne.TextWrapWord
	detailBox := container.NewGridWrap(fyne.NewSize(230, 300), container.NewVBox(heading("Plot"), f.details))
	mapArea := container.NewBorder(f.colorBy, nil, nil, detailBox, f.fmap)
	split := container.NewHSplit(left, mapArea)
	split.Offset = 0.3
	f.root = split
	f.refresh(changeAll)
	return f
}

func (f *fieldStep) object() fyne.CanvasObject { return f.root }
func (f *fieldStep) t() *trial.Trial           { return f.u.doc.t }

// showLength puts a length in metres into e in the display unit and
// remembers the metres, so that untouched text is read back exactly.
func (f *fieldStep) showLength(e *widget.Entry, m float64) {
	text := ""
	if m != 0 {
		text = strconv.FormatFloat(math.Round(m/f.perUnit*1000)/1000, 'f', -1, 64)
	}
	if f.shown == nil {
		f.shown = map[*widget.Entry]float64{}
	}
	e.SetText(text)
	f.shown[e] = m
}

func (f *fieldStep) refresh(c change) {
	t := f.t()
	if c&(changeStructure|changeFile) != 0 {
		l := t.Layout
		f.showLength(f.plotLen, l.PlotLength)
		f.showLength(f.plotWid, l.PlotWidth)
		f.showLength(f.harvLen, l.HarvestLength)
		f.showLength(f.harvWid, l.HarvestWidth)
		f.showLength(f.alley, l.Alley)
		f.perRow.SetText("")
		if l.PlotsPerRow > 0 {
			f.perRow.SetText(strconv.Itoa(l.PlotsPerRow))
		}
		if i := slices.Index(arrangeValues, l.Blocks); i >= 0 {
			f.blocks.SetSelectedIndex(i)
		}
		if i := slices.Index(numberValues, l.Numbering); i >= 0 {
			f.numbering.SetSelectedIndex(i)
		}
		if i := slices.Index(walkValues, l.Walk); i >= 0 {
			f.walk.SetSelectedIndex(i)
		}
		if t.Random.Seed != 0 {
			f.seed.SetText(strconv.FormatUint(t.Random.Seed, 10))
		} else if f.seed.Text == "" {
			f.seed.SetText(strconv.FormatUint(trial.NewSeed(), 10))
		}
	}
	switch {
	case len(t.Plots) == 0:
		if len(t.Treatments) < 2 {
			f.randomState.SetText("The trial is not laid out yet: add treatments in Setup, then press Randomise.")
		} else {
			f.randomState.SetText("The trial is not laid out yet: press Randomise to lay out the plots.")
		}
	case !t.Randomized():
		f.randomState.SetText("The plots are in treatment order, not randomised. Press Randomise before sowing.")
	default:
		f.randomState.SetText(fmt.Sprintf("Randomised on %s with seed %d. The same seed always gives the same layout.",
			t.Random.Done.Format("2 Jan 2006"), t.Random.Seed))
	}
	if t.HasData() {
		// Randomising again would move treatments away from their values.
		f.randomState.SetText(f.randomState.Text + "\nData are recorded, so the layout is fixed and Randomise is off: randomising again would move treatments away from the values recorded for their plots.")
		f.randomBtn.Disable()
	} else {
		f.randomBtn.Enable()
	}
	f.loadMap()
}

// loadMap passes the plots to the map widget.
func (f *fieldStep) loadMap() {
	if f.fmap == nil {
		return
	}
	t := f.t()
	f.colourChoices(t)
	byBlock := f.colorBy.Selected == "Colour by block"
	byFactor := f.colourFactor(t)
	plots := make([]fieldmap.Plot, len(t.Plots))
	for i, p := range t.Plots {
		g := t.TreatmentIndex(p.Treatment)
		if byBlock {
			g = p.Block - 1
		}
		if byFactor >= 0 {
			g = t.Factors[byFactor].LevelIndex(t.LevelCode(p.Treatment, byFactor))
		}
		ex := false
		for _, e := range p.Exclusions {
			ex = ex || e.Trait == ""
		}
		plots[i] = fieldmap.Plot{Row: p.Row, Column: p.Column, Number: p.Number, Code: p.Treatment, Block: p.Block, Unit: mapUnit(t, p), Sub: mapSub(t, p), Group: g, Excluded: ex}
	}
	f.fmap.SetPlots(plots)
	f.fmap.SetOrientation(northName(t.Layout.Orientation.North), t.Layout.Orientation.Landmark)
	f.orient.load(t)
}

// showDetails shows plot i in the side panel.
func (f *fieldStep) showDetails(i int) {
	t := f.t()
	if i < 0 || i >= len(t.Plots) {
		f.details.SetText("Point at a plot to see its details.")
		return
	}
	p := t.Plots[i]
	var b strings.Builder
	if t.Design.Kind == trial.CRD { // no blocks
		fmt.Fprintf(&b, "Plot %d\nfield row %d, column %d\n", p.Number, p.Row, p.Column)
	} else {
		fmt.Fprintf(&b, "Plot %d\n%s %d%s · field row %d, column %d\n", p.Number, blockWord(t), p.Block, mainPlotWords(t, &p), p.Row, p.Column)
	}
	if tr := t.Treatment(p.Treatment); tr != nil {
		fmt.Fprintf(&b, "%s  %s", tr.Code, tr.Name)
		if tr.Role == trial.RoleCheck {
			b.WriteString(" (check)")
		}
		b.WriteString("\n")
		b.WriteString(levelLines(t, tr))
	}
	for j := range t.Traits {
		tr := &t.Traits[j]
		if vals, err := t.TraitValues(tr.Key); err == nil && i < len(vals) && !trial.IsMissing(vals[i]) {
			fmt.Fprintf(&b, "%s: %s\n", tr.Name, formatValue(vals[i], tr.Decimals))
		}
	}
	if s := exclusionText(t, &p); s != "" {
		b.WriteString("Excluded: " + s + "\n")
	}
	f.details.SetText(b.String())
}

// layoutFromForm reads the geometry and arrangement controls.
func (f *fieldStep) layoutFromForm() (trial.Layout, error) {
	l := f.t().Layout
	var errs []error
	read := func(e *widget.Entry, name string) float64 {
		s := strings.TrimSpace(e.Text)
		if s == "" {
			return 0
		}
		if m, ok := f.shown[e]; ok && m != 0 {
			shown := math.Round(m/f.perUnit*1000) / 1000
			if s == strconv.FormatFloat(shown, 'f', -1, 64) {
				return m // untouched: keep the stored metres exactly
			}
		}
		v, err := trial.ParseNumber(s, trial.PointOrComma)
		if err != nil || v < 0 {
			errs = append(errs, fmt.Errorf("the %s must be a length in %s, 0 or more, not “%s”", name, f.unit, s))
		}
		return v * f.perUnit
	}
	l.PlotLength = read(f.plotLen, "plot length")
	l.PlotWidth = read(f.plotWid, "plot width")
	l.HarvestLength = read(f.harvLen, "harvested length")
	l.HarvestWidth = read(f.harvWid, "harvested width")
	l.Alley = read(f.alley, "alley")
	n, err := strconv.Atoi(strings.TrimSpace(f.perRow.Text))
	if strings.TrimSpace(f.perRow.Text) == "" {
		n, err = 0, nil
	}
	if err != nil || n < 0 {
		errs = append(errs, fmt.Errorf("plots per row must be a whole number, not “%s”", f.perRow.Text))
	}
	l.PlotsPerRow = n
	if i := f.blocks.SelectedIndex(); i >= 0 {
		l.Blocks = arrangeValues[i]
	}
	if i := f.numbering.SelectedIndex(); i >= 0 {
		l.Numbering = numberValues[i]
	}
	if i := f.walk.SelectedIndex(); i >= 0 {
		l.Walk = walkValues[i]
	}
	return l, errors.Join(errs...)
}

func (f *fieldStep) applyLayout() {
	l, err := f.layoutFromForm()
	if err != nil {
		showError(f.u.win, "Could not change the layout", "The layout was not changed", err)
		return
	}
	before := f.t().Layout
	if l == before {
		f.layoutMsg.SetText("Nothing to change: the layout already has these settings.")
		return
	}
	if f.u.structuralEdit("layout change", "The layout could not be changed", func(t *trial.Trial) error { return t.SetLayout(l) }) {
		var msg string
		if l.PlotsPerRow != before.PlotsPerRow || l.Blocks != before.Blocks || l.Numbering != before.Numbering || l.Walk != before.Walk {
			msg = "Layout changed: the plots are laid out again in standard order; press Randomise before sowing."
		} else {
			msg = "Layout changed: new plot sizes; the plots and their treatments stay as they were."
		}
		f.layoutMsg.SetText(msg + " Undo (Ctrl+Z) takes it back.")
	} else {
		f.layoutMsg.SetText("")
	}
}

// randomise lays the trial out afresh from the seed; refused with the
// trial package's explanation once data exist.
func (f *fieldStep) randomise() {
	seed, err := strconv.ParseUint(strings.TrimSpace(f.seed.Text), 10, 64)
	if err != nil {
		showError(f.u.win, "Could not randomise", "The seed must be a whole number", err)
		return
	}
	l, err := f.layoutFromForm()
	if err != nil {
		showError(f.u.win, "Could not randomise", "The layout settings are not valid", err)
		return
	}
	f.u.structuralEdit("randomisation", "The trial could not be randomised", func(t *trial.Trial) error {
		if t.HasData() {
			return trial.ErrHasData
		}
		if err := t.SetLayout(l); err != nil {
			return err
		}
		return t.Randomize(seed)
	})
}

// ---- exports of the Field step ----

func (u *App) exportMapDialog() {
	snap := cloneTrial(u.doc.t)
	name := safeFileName(snap.Title) + " field map"
	by := u.mapColourFactor()
	paper := u.paper()
	u.exportDialog("field map", name+".pdf", []string{".pdf", ".png", ".svg"}, false,
		func(ctx context.Context, w io.Writer, ext string, _ func(int, int)) error {
			return writeFieldMap(w, snap, ext, by, paper)
		})
}

// writeFieldMap draws the printable field map in the format named by the
// file extension (".png", ".svg" on A4 landscape; otherwise a PDF page on
// the chosen paper with the dimensions on the ground under the map),
// coloured by treatment or by the factor of key colourBy.
func writeFieldMap(w io.Writer, t *trial.Trial, ext, colourBy string, paper xlsx.Paper) error {
	if ext != ".png" && ext != ".svg" {
		return pdf.WriteMap(w, t, pdf.MapOptions{Paper: pdfPaper(paper), ColourBy: colourBy})
	}
	p, err := chart.FieldMap(t, chart.FieldMapOptions{ColourBy: colourBy})
	if err != nil {
		return err
	}
	format := strings.TrimPrefix(ext, ".")
	if format != "png" && format != "svg" {
		format = "pdf"
	}
	return chart.SaveA4(p, w, format)
}

func (u *App) exportFieldBookCSV() {
	snap := cloneTrial(u.doc.t)
	u.exportDialog("field book", safeFileName(snap.Title)+" field book.csv", []string{".csv"}, false,
		func(ctx context.Context, w io.Writer, ext string, _ func(int, int)) error {
			return fieldbook.WriteCSV(w, snap, fieldbook.Options{BOM: true})
		})
}

func (u *App) exportFieldBookXLSX() {
	snap := cloneTrial(u.doc.t)
	u.exportDialog("field book", safeFileName(snap.Title)+" field book.xlsx", []string{".xlsx"}, false,
		func(ctx context.Context, w io.Writer, ext string, _ func(int, int)) error {
			return xlsx.WriteFieldBook(w, snap, xlsx.FieldBookOptions{Paper: u.paper()})
		})
}
