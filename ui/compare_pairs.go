package ui

import (
	"fmt"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/widget"

	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial/analysis"
)

// pairsView is Compare's "Pairs" tab: every pair of treatment means with
// the difference, its SE and confidence interval, the unadjusted and the
// Tukey-adjusted P, each pair's LSD and HSD, and whether the pair differs
// by the method chosen (the pairs table of the command line and the
// workbook).
type pairsView struct {
	c     *compareStep
	item  *container.TabItem
	note  *widget.Label
	table *textTable
	// res and method are the result to show; built says the table shows
	// them. The table is built only while the tab is shown (shown): all
	// 44,850 pairs of 300 entries take a noticeable time to format.
	res    *analysis.Result
	method meansep.Method
	built  bool
}

func newPairsView(c *compareStep) *pairsView {
	v := &pairsView{c: c, note: widget.NewLabel(""), table: newTextTable()}
	v.note.Wrapping = fyne.TextWrapWord
	v.item = container.NewTabItem("Pairs", container.NewBorder(v.note, nil, nil, nil, v.table))
	return v
}

func (v *pairsView) tab() *container.TabItem { return v.item }

func (v *pairsView) show(s *resultSet, tr *traitResult) {
	if msg := resultProblem(s, tr); msg != "" {
		v.res, v.built = nil, false
		v.note.SetText(msg)
		v.table.set(nil, nil)
		return
	}
	v.res, v.method, v.built = tr.res, v.c.method, false
	if v.c.tabs != nil && v.c.tabs.Selected() == v.item {
		v.shown()
	}
}

// shown fills the table when the tab is shown.
func (v *pairsView) shown() {
	if v.built || v.res == nil {
		return
	}
	head, rows, note := pairsTable(v.res, v.method)
	v.note.SetText(note)
	v.table.set(head, rows)
	v.built = true
}

// pairsTable is the table of every pair of means of r (A minus B, in the
// trial's treatment order), with a note that says how to read it.
func pairsTable(r *analysis.Result, method meansep.Method) (head []string, rows [][]string, note string) {
	level := levelText(1 - r.Alpha)
	head = []string{"Treatment", "minus", "Difference", "SE", level + " limits", "P (t test)", "P (Tukey)", "LSD", "HSD", "Differ by " + methodLabel(method)}
	dec := analysis.MeanDecimals(r.Decimals)
	if r.Transform != stats.NoTransform {
		dec = analysis.TransformedDecimals
	}
	names := make(map[string]string, len(r.Means))
	for _, m := range r.Means {
		names[m.Treatment] = m.Name
	}
	label := func(code string) string {
		if n := names[code]; n != "" && n != code {
			return code + "  " + n
		}
		return code
	}
	withheld := method == meansep.LSD && !r.LSDLettersGiven
	for _, p := range r.Pairs {
		pv := p.PLSD
		if method == meansep.Tukey {
			pv = p.PTukey
		}
		differ := "no"
		switch {
		case withheld:
			differ = "–"
		case pv < r.Alpha:
			differ = "yes"
		}
		rows = append(rows, []string{
			label(p.A), label(p.B), fixed(p.Diff, dec), fixed(p.SE, dec),
			fixed(p.Lower, dec) + " – " + fixed(p.Upper, dec),
			stats.FormatP(p.PLSD), stats.FormatP(p.PTukey), fixed(p.LSD, dec), fixed(p.HSD, dec), differ,
		})
	}
	note = fmt.Sprintf("Each pair of treatment means, the first minus the second, with the %s confidence interval of the difference (t on the error's %d df), "+
		"the P of the t test (what the LSD uses) and Tukey's adjusted P (what the HSD uses). A pair differs when its P by the chosen method is below %g.",
		level, dfError(r), r.Alpha)
	if withheld {
		note += " The treatment F test is not significant, so the protected LSD declares no pair different; Tukey's HSD can still be read."
	}
	if r.Transform != stats.NoTransform {
		note += " Differences, SEs, limits, LSD and HSD are on the " + r.Transform.Scale() + " scale the trait is analysed on."
	}
	return head, rows, note
}

// dfError is the error degrees of freedom of r (0 without an ANOVA).
func dfError(r *analysis.Result) int {
	if r.ANOVA == nil {
		return 0
	}
	return r.ANOVA.DFError
}
