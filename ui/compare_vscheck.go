package ui

import (
	"fmt"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/widget"
	"gonum.org/v1/plot"

	"furlong/export"
	"furlong/export/chart"
	"furlong/stats"
	"furlong/stats/dist"
	"furlong/trial"
	"furlong/trial/analysis"
)

// vsCheckView is Compare's "Against the check" tab: every entry compared
// with one check by Dunnett's many-to-one comparisons
// (analysis.CompareWithCheck): the difference with its simultaneous
// interval, the adjusted P two-sided and in the better direction, and the
// verdict (better, worse, not different) in the trait's better direction,
// with a chart of the intervals. The comparisons run off the UI goroutine
// and come back through the analyser's post (fyne.Do).
type vsCheckView struct {
	c        *compareStep
	item     *container.TabItem
	checkSel *widget.Select
	note     *widget.Label
	table    *textTable
	chartBox *fyne.Container

	// codes are the treatment codes of the select's options, in order.
	codes []string
	// chosen is the check the user picked ("" follows the trial's check).
	chosen string
	// gen counts the computations started; a late one is dropped.
	gen uint64
	// shownRes and shownCheck are what the tab shows (or computes).
	shownRes   *analysis.Result
	shownCheck string
	// vc is the comparison shown (nil when none).
	vc *analysis.CheckComparison
	// done, when set, is called after a comparison was shown (tests).
	done func()
}

func newVsCheckView(c *compareStep) *vsCheckView {
	v := &vsCheckView{c: c, note: widget.NewLabel(""), table: newTextTable(), chartBox: container.NewStack()}
	v.note.Wrapping = fyne.TextWrapWord
	v.checkSel = widget.NewSelect(nil, func(s string) {
		i := indexOf(v.checkSel.Options, s)
		if i < 0 || i >= len(v.codes) || v.codes[i] == v.shownCheck {
			return
		}
		v.chosen = v.codes[i]
		v.show(v.c.shown, v.c.shown.result(v.c.traitKey))
	})
	top := container.NewVBox(container.NewHBox(widget.NewLabel("Compare every entry with"), container.NewGridWrap(fyne.NewSize(300, v.checkSel.MinSize().Height), v.checkSel)), v.note)
	// The table and the chart side by side; the chart keeps its minimum.
	split := container.NewHSplit(container.New(&widthFloor{width: v.table.width}, v.table), v.chartBox)
	split.Offset = 0
	v.item = container.NewTabItem("Against the check", container.NewBorder(top, nil, nil, nil, split))
	return v
}

func (v *vsCheckView) tab() *container.TabItem { return v.item }

func indexOf(ss []string, s string) int {
	for i, x := range ss {
		if x == s {
			return i
		}
	}
	return -1
}

// defaultCheck is the check to compare with when the user has not chosen:
// the trial's one check, else its first check, else "".
func defaultCheck(r *analysis.Result) string {
	if c := analysis.CheckOf(r); c != "" {
		return c
	}
	for _, m := range r.Means {
		if m.Check {
			return m.Treatment
		}
	}
	return ""
}

func (v *vsCheckView) show(s *resultSet, tr *traitResult) {
	if s == nil {
		return
	}
	if msg := resultProblem(s, tr); msg != "" {
		v.checkSel.Disable()
		v.clear(msg)
		return
	}
	v.checkSel.Enable()
	r := tr.res
	v.codes = v.codes[:0]
	var opts []string
	for _, m := range r.Means {
		v.codes = append(v.codes, m.Treatment)
		l := m.Treatment
		if m.Name != "" && m.Name != m.Treatment {
			l += "  " + m.Name
		}
		if m.Check {
			l += " (check)"
		}
		opts = append(opts, l)
	}
	check := v.chosen
	if indexOf(v.codes, check) < 0 {
		check = defaultCheck(r)
	}
	v.checkSel.Options = opts
	if i := indexOf(v.codes, check); i >= 0 {
		v.checkSel.Selected = opts[i]
	} else {
		v.checkSel.Selected = ""
	}
	v.checkSel.Refresh()
	if check == "" {
		v.clear("The trial has no check. Choose above the treatment to compare every entry with, or give one treatment the check role in Setup › Treatments.")
		return
	}
	if r == v.shownRes && check == v.shownCheck {
		return
	}
	v.shownRes, v.shownCheck = r, check
	v.gen++
	gen := v.gen
	snap := s.snap
	v.note.SetText(fmt.Sprintf("Comparing every entry with %s…", check))
	go func() {
		vc, p, err := compareWithCheck(snap, r, check)
		v.c.u.compute.post(func() {
			if gen != v.gen {
				return
			}
			v.display(r, vc, p, err)
		})
	}()
}

// compareWithCheck runs the comparisons and draws their chart (off the UI
// goroutine), turning a panic into an error.
func compareWithCheck(t *trial.Trial, r *analysis.Result, check string) (vc *analysis.CheckComparison, p *plot.Plot, err error) {
	defer func() {
		if e := recover(); e != nil {
			vc, p, err = nil, nil, errAnalysisFailed
		}
	}()
	vc, err = analysis.CompareWithCheck(r, check)
	if err != nil {
		return nil, nil, err
	}
	p, perr := chart.VsCheck(t, r, vc)
	if perr != nil {
		p = nil
	}
	return vc, p, nil
}

// clear shows msg and no comparison.
func (v *vsCheckView) clear(msg string) {
	v.gen++
	v.shownRes, v.shownCheck, v.vc = nil, "", nil
	v.note.SetText(msg)
	v.table.set(nil, nil)
	v.chartBox.Objects = nil
	v.chartBox.Refresh()
}

// display shows a finished comparison (UI goroutine).
func (v *vsCheckView) display(r *analysis.Result, vc *analysis.CheckComparison, p *plot.Plot, err error) {
	defer func() {
		if v.done != nil {
			v.done()
		}
	}()
	if err != nil {
		v.vc = nil
		m := explain("The entries cannot be compared with the check", err)
		v.note.SetText(strings.TrimSpace(m.What + " " + m.Do))
		v.table.set(nil, nil)
		v.chartBox.Objects = nil
		v.chartBox.Refresh()
		return
	}
	v.vc = vc
	head, rows := vsCheckTable(r, vc)
	v.note.SetText(vsCheckNote(r, vc))
	v.table.set(head, rows)
	v.chartBox.Objects = nil
	if p != nil {
		v.chartBox.Objects = []fyne.CanvasObject{newChartView(p)}
	}
	v.chartBox.Refresh()
}

// vsCheckTable is the table of the comparisons (narrow enough to leave
// the chart its minimum width beside it): each entry's verdict, its difference from the check with the simultaneous limits, and
// the adjusted P, two-sided and one-sided in the better direction.
func vsCheckTable(r *analysis.Result, vc *analysis.CheckComparison) (head []string, rows [][]string) {
	ddec := analysis.MeanDecimals(r.Decimals)
	if r.Transform != stats.NoTransform {
		ddec = analysis.TransformedDecimals
	}
	better := "P (higher)"
	if !vc.HigherBetter {
		better = "P (lower)"
	}
	head = []string{"Entry", "Verdict", "Difference", levelText(1-vc.Alpha) + " limits", "P", better}
	means := make(map[string]analysis.Mean, len(r.Means))
	for _, m := range r.Means {
		means[m.Treatment] = m
	}
	for _, row := range vc.Rows {
		m := means[row.Treatment]
		label := row.Treatment
		if m.Name != "" && m.Name != row.Treatment {
			label += "  " + m.Name
		}
		rows = append(rows, []string{label, row.Verdict, fixed(row.Diff, ddec),
			fixed(row.Lower, ddec) + " – " + fixed(row.Upper, ddec), stats.FormatP(row.PTwoSided), stats.FormatP(row.PBetter)})
	}
	return head, rows
}

// vsCheckNote says how the comparisons were made and how to read them,
// with the cautions that go with a verdict against a standard.
func vsCheckNote(r *analysis.Result, vc *analysis.CheckComparison) string {
	dir := "higher"
	if !vc.HigherBetter {
		dir = "lower"
	}
	var b strings.Builder
	fmt.Fprintf(&b, "Each entry minus the check %s (Dunnett's many-to-one comparisons, single-step), with %s simultaneous limits: all the intervals together hold the true differences with that confidence. P is two-sided, P (%s) one-sided in the better direction, both adjusted for the number of entries. ",
		vc.Check, levelText(1-vc.Alpha), dir)
	fmt.Fprintf(&b, "An entry is better when its whole interval lies on the %s side of 0 (%s values are better for this trait), worse when it lies on the other side, otherwise not different. ", dir, dir)
	switch vc.Method {
	case dist.ProductMethod:
		b.WriteString("The probabilities are exact for this layout. ")
	case dist.LatticeMethod:
		fmt.Fprintf(&b, "The probabilities are computed to within %s. ", num(vc.Error, 1))
	default:
		b.WriteString("With this pattern of missing plots the probabilities are a close approximation. ")
	}
	if r.Transform != stats.NoTransform {
		b.WriteString("Differences and limits are on the " + r.Transform.Scale() + " scale the trait is analysed on. ")
	}
	b.WriteString(export.Cautions[0] + " " + export.Cautions[1])
	return b.String()
}
