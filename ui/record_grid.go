package ui

import (
	"strconv"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
	"furlong/trial/fieldbook"
)

func (r *recordStep) length() (int, int) {
	t := r.trial()
	return len(t.Plots), r.nfixed + len(t.Traits) + 1
}

func (r *recordStep) setWidths() {
	t := r.trial()
	r.widths = r.widths[:0]
	set := func(w float32) {
		r.table.SetColumnWidth(len(r.widths), w)
		r.widths = append(r.widths, w)
	}
	// A completely randomised trial has no blocks: no block column.
	r.nbase = fixedCols
	if t.Design.Kind == trial.CRD {
		r.nbase = fixedCols - 1
	}
	design := fieldbook.DesignColumns(t)
	r.nfixed = r.nbase + len(design)
	r.table.StickyColumnCount = r.nbase
	set(70)
	if r.nbase == fixedCols {
		set(60)
	}
	set(210)
	for _, h := range design {
		w := fyne.MeasureText(designHeader(t, h), theme.TextSize(), fyne.TextStyle{Bold: true}).Width + 4*theme.Padding()
		set(min(max(w+2*theme.Padding(), 70), 190))
	}
	pad := 4 * theme.Padding()
	for j := range t.Traits {
		head := traitLabel(&t.Traits[j]) + " ="
		w := fyne.MeasureText(head, theme.TextSize(), fyne.TextStyle{Bold: true}).Width + pad
		set(min(max(w, 90), 240))
	}
	set(260)
}

// kind is what column col shows: colPlot, colBlock, colTreatment, or
// fixedCols for a trait or the notes column.
func (r *recordStep) kind(col int) int {
	if col >= r.nfixed {
		return fixedCols
	}
	if col >= r.nbase {
		return colDesign
	}
	if r.nbase < fixedCols && col >= colBlock {
		return col + 1 // no block column
	}
	return col
}

// colWidthAt is the width setWidths gave column col.
func (r *recordStep) colWidthAt(col int) float32 {
	if col < 0 || col >= len(r.widths) {
		return 0
	}
	return r.widths[col]
}

// value returns the value shown for plot i and trait j.
func (r *recordStep) value(i, j int) float64 {
	t := r.trial()
	tr := &t.Traits[j]
	if tr.Derived != nil {
		if v := r.derived[j]; i < len(v) {
			return v[i]
		}
		return trial.Missing
	}
	if i < len(tr.Values) {
		return tr.Values[i]
	}
	return trial.Missing
}

func (r *recordStep) updateHeader(id widget.TableCellID, o fyne.CanvasObject) {
	l := o.(*widget.Label)
	t := r.trial()
	k := r.kind(id.Col)
	switch {
	case k == colPlot:
		l.SetText("Plot")
	case k == colBlock:
		l.SetText(blockWord(t))
	case k == colTreatment:
		l.SetText("Treatment")
	case k == colDesign:
		if cols := fieldbook.DesignColumns(t); id.Col-r.nbase < len(cols) {
			l.SetText(designHeader(t, cols[id.Col-r.nbase]))
		}
	case id.Col-r.nfixed < len(t.Traits):
		tr := &t.Traits[id.Col-r.nfixed]
		s := traitLabel(tr)
		if tr.Derived != nil {
			s += " ="
		}
		l.SetText(s)
	default:
		l.SetText("Excluded / note")
	}
}

func blockWord(t *trial.Trial) string {
	switch t.Design.Kind {
	case trial.CRD:
		return "Rep"
	case trial.Latin:
		return "Row"
	}
	return "Block"
}

// newGridCell is a table cell: a background (flag, exclusion) under a
// text. canvas.Text is used rather than a label: the grid redraws many
// cells on every entry and a label's text shaping costs far more.
func newGridCell() fyne.CanvasObject {
	bg := canvas.NewRectangle(nil)
	txt := canvas.NewText("", theme.Color(theme.ColorNameForeground))
	return container.NewStack(bg, container.NewPadded(txt))
}

func (r *recordStep) updateCell(id widget.TableCellID, o fyne.CanvasObject) {
	c := o.(*fyne.Container)
	bg := c.Objects[0].(*canvas.Rectangle)
	l := c.Objects[1].(*fyne.Container).Objects[0].(*canvas.Text)
	t := r.trial()
	if id.Row >= len(t.Plots) {
		return
	}
	p := &t.Plots[id.Row]
	var fill fyne.ThemeColorName
	text := ""
	align := fyne.TextAlignLeading
	italic := false
	k := r.kind(id.Col)
	switch {
	case k == colPlot:
		text = strconv.Itoa(p.Number)
	case k == colBlock:
		text = strconv.Itoa(p.Block)
	case k == colTreatment:
		text = p.Treatment
		if tr := t.Treatment(p.Treatment); tr != nil && tr.Name != "" && tr.Name != tr.Code {
			text += "  " + tr.Name
		}
	case k == colDesign:
		if cells := fieldbook.DesignCells(t, *p); id.Col-r.nbase < len(cells) {
			text = cells[id.Col-r.nbase]
		}
	case id.Col-r.nfixed < len(t.Traits):
		j := id.Col - r.nfixed
		tr := &t.Traits[j]
		v := r.value(id.Row, j)
		text = formatValue(v, tr.Decimals)
		align = fyne.TextAlignTrailing
		italic = tr.Derived != nil
		if ex, _ := t.Excluded(id.Row, tr.Key); ex {
			fill = colorNameExcluded
		} else if tr.RangeNote(v) != "" {
			fill = colorNameFlag
		}
	default:
		text = exclusionText(t, p)
	}
	if len(p.Exclusions) > 0 && id.Col < r.nfixed {
		for _, e := range p.Exclusions {
			if e.Trait == "" {
				fill = colorNameExcluded
			}
		}
	}
	if fill == "" {
		bg.FillColor = nil
	} else {
		bg.FillColor = theme.Color(fill)
	}
	// The selected cell keeps a frame over any flag colour, so that the
	// selection stays visible on a flagged or excluded value.
	bg.StrokeWidth, bg.StrokeColor = 0, nil
	if r.hasSel && id == r.sel {
		bg.StrokeWidth = 2
		bg.StrokeColor = theme.Color(theme.ColorNamePrimary)
	}
	bg.Refresh()
	if k == colTreatment || id.Col >= r.nfixed+len(t.Traits) {
		text = fitText(text, r.colWidthAt(id.Col), theme.TextSize())
	}
	l.Alignment = align
	l.TextStyle = fyne.TextStyle{Italic: italic}
	l.Color = theme.Color(theme.ColorNameForeground)
	l.Text = text
	l.Refresh()
}

// fitText shortens s with an ellipsis to fit width at text size ts.
func fitText(s string, width, ts float32) string {
	width -= 2 * theme.Padding()
	if fyne.MeasureText(s, ts, fyne.TextStyle{}).Width <= width {
		return s
	}
	rs := []rune(s)
	for n := len(rs) - 1; n > 0; n-- {
		t := string(rs[:n]) + "…"
		if fyne.MeasureText(t, ts, fyne.TextStyle{}).Width <= width {
			return t
		}
	}
	return "…"
}
