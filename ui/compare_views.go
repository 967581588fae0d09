package ui

import (
	"fmt"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/stats"
	"furlong/stats/diag"
	"furlong/trial/analysis"
)

// compareView is one more view of the Compare step, a tab beside "This
// trait" and "All traits". Each view lives in its own file
// (compare_<view>.go) and is listed in newViews.
type compareView interface {
	// tab is the view's tab, made once.
	tab() *container.TabItem
	// show displays round s for the trait on screen, tr (nil while it is
	// computed); it is called on the UI goroutine after every round and
	// after a change of trait or method.
	show(s *resultSet, tr *traitResult)
}

// newViews makes the further views of Compare, in the order of their tabs.
func (c *compareStep) newViews() []compareView {
	return []compareView{newPairsView(c), newVsCheckView(c), newContrastsView(c), newEffectsView(c), newResponseView(c), newMarginsView(c)}
}

// meansHeader is the heading of column col of the means table: the SE
// column shows the confidence limits of a transformed trait's means.
func (c *compareStep) meansHeader(col int) string {
	if col == 3 && c.limits {
		return levelText(c.limitsLevel) + " limits"
	}
	if col == 5 {
		if c.eff != nil && c.eff.PreCount != "" {
			return "% efficacy A / H–T"
		}
		return "% efficacy"
	}
	return []string{"Treatment", "Plots", "Mean", "SE", "Letters"}[col]
}

// meanCols is the number of columns of the means table: a sixth for the
// percent efficacy against the untreated check of a crop-protection trait.
func (c *compareStep) meanCols() int {
	if c.eff != nil {
		return len(meansColumns) + 1
	}
	return len(meansColumns)
}

// effWidth is the width of the efficacy column.
func (c *compareStep) effWidth() float32 {
	w := cellTextWidth("untreated")
	if c.eff != nil && c.eff.PreCount != "" {
		w = max(w, fyne.MeasureText("% efficacy A / H–T", theme.TextSize(), fyne.TextStyle{Bold: true}).Width+3*theme.Padding())
	}
	return max(w, fyne.MeasureText("% efficacy", theme.TextSize(), fyne.TextStyle{Bold: true}).Width+3*theme.Padding())
}

// efficacyText is a treatment's percent efficacy (Abbott; with
// pre-treatment counts, Abbott / Henderson–Tilton), "untreated" for the
// untreated check itself.
func (c *compareStep) efficacyText(code string) string {
	e := c.eff
	if e == nil {
		return ""
	}
	if code == e.Untreated {
		return "untreated"
	}
	row := e.Row(code)
	if row == nil {
		return ""
	}
	p := func(v *float64) string {
		if v == nil {
			return "–"
		}
		return fixed(*v, 1)
	}
	if e.PreCount != "" {
		return p(row.Abbott) + " / " + p(row.HendersonTilton)
	}
	return p(row.Abbott)
}

// levelText is a confidence level as a percentage: 0.95 → "95 %".
func levelText(level float64) string {
	return strings.TrimSuffix(strings.TrimRight(fmt.Sprintf("%.1f", 100*level), "0"), ".") + " %"
}

// limitsText is a mean's confidence limits on the recorded scale, "–" when
// they do not apply (no error degrees of freedom).
func limitsText(m analysis.Mean, dec int) string {
	if m.Lower == nil || m.Upper == nil {
		return "–"
	}
	return fixed(*m.Lower, dec) + " – " + fixed(*m.Upper, dec)
}

// fitLimitsColumn widens the means table's third number column to the
// widest pair of limits when it shows them, and gives it back its SE width
// otherwise.
func (c *compareStep) fitLimitsColumn() {
	w := meansColumns[3]
	if c.limits {
		w = max(w, cellTextWidth(c.meansHeader(3)))
		for i := range c.meanRows {
			w = max(w, cellTextWidth(c.meanText(i, 3)))
		}
	}
	c.limitsWidth = w
	c.means.SetColumnWidth(3, w)
}

// showChecks adds the model checks of r to the statistics: Shapiro–Wilk on
// the residuals, the equality of variances by treatment and Tukey's test of
// non-additivity, each with its statistic and P, where they were computed
// (the same tests the command line and the workbook report).
func (c *compareStep) showChecks(r *analysis.Result) {
	add := func(k, v string) {
		c.statsBox.Add(compactCell(k, false))
		c.statsBox.Add(compactCell(v, true))
	}
	for _, l := range checkLines(r.Diagnostics) {
		add(l[0], l[1])
	}
}

// checkLines are the model checks of d as (name, value) lines, those that
// were computed only.
func checkLines(d analysis.Diagnostics) [][2]string {
	var out [][2]string
	on := "" // what the variance tests were computed on
	if d.VarianceOn != "" {
		on = " (" + d.VarianceOn + ")"
	}
	if d.ShapiroW != nil && d.ShapiroP != nil {
		out = append(out, [2]string{"Shapiro–Wilk (residuals)", fmt.Sprintf("W %s, P %s", fixed(*d.ShapiroW, 3), stats.FormatP(*d.ShapiroP))})
	}
	if d.LeveneF != nil && d.LeveneP != nil {
		out = append(out, [2]string{"Brown–Forsythe" + on, fmt.Sprintf("F %s, P %s", fixed(*d.LeveneF, 2), stats.FormatP(*d.LeveneP))})
	}
	if d.BartlettK2 != nil && d.BartlettP != nil {
		out = append(out, [2]string{"Bartlett" + on, fmt.Sprintf("K² %s, P %s", fixed(*d.BartlettK2, 2), stats.FormatP(*d.BartlettP))})
	}
	if d.NonAdditivityF != nil && d.NonAdditivityP != nil {
		out = append(out, [2]string{"Tukey non-additivity", fmt.Sprintf("F %s, P %s", fixed(*d.NonAdditivityF, 2), stats.FormatP(*d.NonAdditivityP))})
	}
	if len(out) > 0 {
		out = append(out, [2]string{"Checks read at", fmt.Sprintf("P < %g", diag.CheckAlpha)})
	}
	return out
}

// textTable is a read-only table of text with a bold header row, its
// columns fitted to their widest cell (up to maxCol), for the views'
// tables.
type textTable struct {
	*widget.Table
	head   []string
	rows   [][]string
	widths []float32
}

// maxCol is the widest a textTable column grows.
const maxCol = 260

func newTextTable() *textTable {
	t := &textTable{}
	t.Table = widget.NewTableWithHeaders(
		func() (int, int) { return len(t.rows), len(t.head) },
		func() fyne.CanvasObject { return compactCell("", false) },
		func(id widget.TableCellID, o fyne.CanvasObject) {
			s := ""
			if id.Row < len(t.rows) && id.Col < len(t.rows[id.Row]) {
				s = t.rows[id.Row][id.Col]
			}
			setCompact(o, fitText(s, maxCol-theme.Padding(), theme.TextSize()))
		})
	t.ShowHeaderColumn = false
	t.CreateHeader = func() fyne.CanvasObject { return compactCell("", true) }
	t.UpdateHeader = func(id widget.TableCellID, o fyne.CanvasObject) {
		if id.Col < len(t.head) {
			setCompact(o, t.head[id.Col])
		}
	}
	return t
}

// set shows head and rows, fitting the columns (the widths are measured
// on the first 500 rows: a long table's columns hold the same kind of
// text throughout).
func (t *textTable) set(head []string, rows [][]string) {
	t.head, t.rows = head, rows
	t.widths = t.widths[:0]
	for i, h := range head {
		w := fyne.MeasureText(h, theme.TextSize(), fyne.TextStyle{Bold: true}).Width + 3*theme.Padding()
		for r := 0; r < len(rows) && r < 500; r++ {
			if i < len(rows[r]) {
				w = max(w, cellTextWidth(rows[r][i]))
			}
		}
		w = min(max(w, 50), maxCol)
		t.SetColumnWidth(i, w)
		t.widths = append(t.widths, w)
	}
	t.Refresh()
}

// width is what the table needs to show every column: the columns, the
// gaps between them and the vertical scroll bar.
func (t *textTable) width() float32 {
	var w float32
	for _, cw := range t.widths {
		w += cw + theme.Padding()
	}
	return w + theme.ScrollBarSize()
}

// sayIn shows s in l, a line under a view's controls that says what the
// last change did; the line takes no room while there is nothing to say.
func sayIn(l *widget.Label, s string) {
	l.SetText(s)
	if s == "" {
		l.Hide()
	} else {
		l.Show()
	}
}
