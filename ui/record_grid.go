package ui

import (
	"strconv"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/trial"
)

func (r *recordStep) length() (int, int) {
	t := r.trial()
	return len(t.Plots), fixedCols + len(t.Traits) + 1
}

func (r *recordStep) setWidths() {
	t := r.trial()
	r.widths = r.widths[:0]
	set := func(col int, w float32) {
		r.table.SetColumnWidth(col, w)
		r.widths = append(r.widths, w)
	}
	set(colPlot, 70)
	set(colBlock, 60)
	set(colTreatment, r.colWidth(colTreatment))
	pad := 4 * theme.Padding()
	for j := range t.Traits {
		head := traitLabel(&t.Traits[j]) + " ="
		w := fyne.MeasureText(head, theme.TextSize(), fyne.TextStyle{Bold: true}).Width + pad
		set(fixedCols+j, min(max(w, 90), 240))
	}
	set(fixedCols+len(t.Traits), r.colWidth(fixedCols+len(t.Traits)))
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
	switch {
	case id.Col == colPlot:
		l.SetText("Plot")
	case id.Col == colBlock:
		l.SetText(blockWord(t))
	case id.Col == colTreatment:
		l.SetText("Treatment")
	case id.Col-fixedCols < len(t.Traits):
		tr := &t.Traits[id.Col-fixedCols]
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
	switch {
	case id.Col == colPlot:
		text = strconv.Itoa(p.Number)
	case id.Col == colBlock:
		text = strconv.Itoa(p.Block)
	case id.Col == colTreatment:
		text = p.Treatment
		if tr := t.Treatment(p.Treatment); tr != nil && tr.Name != "" && tr.Name != tr.Code {
			text += "  " + tr.Name
		}
	case id.Col-fixedCols < len(t.Traits):
		j := id.Col - fixedCols
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
	if len(p.Exclusions) > 0 && id.Col < fixedCols {
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
	bg.Refresh()
	if id.Col == colTreatment || id.Col >= fixedCols+len(t.Traits) {
		text = fitText(text, r.colWidth(id.Col), theme.TextSize())
	}
	l.Alignment = align
	l.TextStyle = fyne.TextStyle{Italic: italic}
	l.Color = theme.Color(theme.ColorNameForeground)
	l.Text = text
	l.Refresh()
}

// colWidth is the width given to a column.
func (r *recordStep) colWidth(col int) float32 {
	switch col {
	case colTreatment:
		return 210
	}
	return 260
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
