package ui

import (
	"fmt"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/export"
	"furlong/trial"
	"furlong/trial/analysis"
)

// marginsView is Compare's "Margins" tab: the user's prices (the produce
// price, a currency label, each treatment's product and application cost,
// saved with the trial and undoable) and each treatment's margin over input
// cost with its SE and letters (analysis.MarginsOf, as 'furlong margins'
// and the season report give it), worked out on the trait the prices are
// for (the yield trait unless the user chose another). The margins are
// worked out off the UI goroutine and come back through the analyser's post.
type marginsView struct {
	c        *compareStep
	item     *container.TabItem
	price    *widget.Entry
	currency *widget.Entry
	traitSel *widget.Select
	costs    *fyne.Container // one row per treatment: code, product, application
	product  map[string]*widget.Entry
	applic   map[string]*widget.Entry
	save     *widget.Button
	msg      *widget.Label
	note     *widget.Label
	table    *textTable
	notes    *widget.Label

	res *analysis.Result
	gen uint64
	// shown is the margins on screen (nil when none).
	shown *analysis.Margins
	// codes are the treatments the cost rows were made for.
	codes     []string
	syncing   bool
	syncedFor *trial.Trial // the trial the controls show
	// done, when set, is called after margins were shown (tests).
	done func()
}

func newMarginsView(c *compareStep) *marginsView {
	v := &marginsView{c: c, msg: widget.NewLabel(""), note: widget.NewLabel(""), notes: widget.NewLabel(""), table: newTextTable(),
		product: map[string]*widget.Entry{}, applic: map[string]*widget.Entry{}}
	for _, l := range []*widget.Label{v.msg, v.note, v.notes} {
		l.Wrapping = fyne.TextWrapWord
	}
	v.price = widget.NewEntry()
	v.price.SetPlaceHolder("e.g. 200")
	v.price.OnSubmitted = func(string) { v.savePrices() }
	v.currency = widget.NewEntry()
	v.currency.SetPlaceHolder("e.g. EUR")
	v.traitSel = widget.NewSelect(nil, nil)
	v.save = widget.NewButtonWithIcon("Use these prices", theme.ConfirmIcon(), v.savePrices)
	v.costs = container.New(&columnsLayout{cols: 3})
	h := v.price.MinSize().Height
	top := container.NewHBox(widget.NewLabel("Produce price"), container.NewGridWrap(fyne.NewSize(110, h), v.price),
		widget.NewLabel("Currency"), container.NewGridWrap(fyne.NewSize(90, h), v.currency),
		widget.NewLabel("of the trait"), container.NewGridWrap(fyne.NewSize(220, h), v.traitSel), v.save)
	help := widget.NewLabel("The produce price is per unit of the trait's produce (per t for a yield in t/ha); costs are per unit area (per ha). " +
		"A rate treatment without a product cost is costed at its rate times the input price the Response tab's price ratio implies. " +
		"Prices are yours: nothing is built in. Saved with the trial; the season report and 'furlong margins' use them.")
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	left := container.NewBorder(heading("Costs per unit area"), nil, nil, nil, container.NewVScroll(v.costs))
	right := container.NewBorder(v.note, nil, nil, nil, container.NewBorder(nil, v.notes, nil, nil, v.table))
	split := container.NewHSplit(left, right)
	split.Offset = 0.3
	v.item = container.NewTabItem("Margins", container.NewBorder(container.NewVBox(top, v.msg), help, nil, nil, split))
	v.msg.Hide()
	v.sync()
	return v
}

func (v *marginsView) tab() *container.TabItem { return v.item }

func (v *marginsView) trial() *trial.Trial {
	if v.c.u.doc == nil {
		return nil
	}
	return v.c.u.doc.t
}

func (v *marginsView) say(s string) { sayIn(v.msg, s) }

// yieldChoice is the trait select's entry for "the yield trait".
const yieldChoice = "the yield trait"

// sync fills the controls from the trial's saved prices.
func (v *marginsView) sync() {
	v.syncing = true
	defer func() { v.syncing = false }()
	t := v.trial()
	if t == nil {
		return
	}
	e := t.Economics
	v.price.SetText(amountText(e.ProducePrice))
	v.currency.SetText(e.Currency)
	opts := []string{yieldChoice}
	sel := yieldChoice
	for i := range t.Traits {
		opts = append(opts, t.Traits[i].Key)
		if t.Traits[i].Key == e.Trait {
			sel = e.Trait
		}
	}
	v.traitSel.Options = opts
	v.traitSel.SetSelected(sel)
	codes := t.TreatmentCodes()
	if strings.Join(codes, "\x00") != strings.Join(v.codes, "\x00") {
		v.codes = codes
		v.costs.Objects = []fyne.CanvasObject{boldLabel("Treatment"), boldLabel("Product"), boldLabel("Application")}
		v.product, v.applic = map[string]*widget.Entry{}, map[string]*widget.Entry{}
		for _, code := range codes {
			p, a := widget.NewEntry(), widget.NewEntry()
			p.OnSubmitted = func(string) { v.savePrices() }
			a.OnSubmitted = func(string) { v.savePrices() }
			v.product[code], v.applic[code] = p, a
			sz := fyne.NewSize(110, p.MinSize().Height)
			v.costs.Objects = append(v.costs.Objects, widget.NewLabel(code), container.NewGridWrap(sz, p), container.NewGridWrap(sz, a))
		}
		v.costs.Refresh()
	}
	v.syncedFor = t
	ratio := t.Analysis.Response.PriceRatio
	for _, code := range codes {
		p, a := v.product[code], v.applic[code]
		p.SetText("")
		a.SetText("")
		p.SetPlaceHolder("none")
		if tr := t.Treatment(code); tr != nil && tr.Rate != nil && ratio > 0 {
			p.SetPlaceHolder("from rate")
		}
		if c := e.Cost(code); c != nil {
			if c.Product != nil {
				p.SetText(amountText(*c.Product))
			}
			a.SetText(amountText(c.Application))
		}
	}
}

// amountText shows an amount as typed back ("" for 0).
func amountText(v float64) string {
	if v == 0 {
		return ""
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

func boldLabel(s string) *widget.Label {
	return widget.NewLabelWithStyle(s, fyne.TextAlignLeading, fyne.TextStyle{Bold: true})
}

// savePrices saves the prices typed in with the trial, as one edit.
func (v *marginsView) savePrices() {
	t := v.trial()
	if t == nil || v.syncing {
		return
	}
	num := func(what, s string) (float64, bool, error) {
		s = strings.TrimSpace(s)
		if s == "" {
			return 0, false, nil
		}
		x, err := trial.ParseNumber(s, trial.PointOrComma)
		if err != nil || x < 0 {
			return 0, false, fmt.Errorf("%s %q is not a positive number", what, s)
		}
		return x, true, nil
	}
	e := trial.Economics{Currency: strings.TrimSpace(v.currency.Text)}
	var err error
	if e.ProducePrice, _, err = num("the produce price", v.price.Text); err != nil {
		v.say("Not saved: " + err.Error() + ".")
		return
	}
	if s := v.traitSel.Selected; s != yieldChoice {
		e.Trait = s
	}
	for _, code := range v.codes {
		p, hasP, err := num("the product cost of "+code, v.product[code].Text)
		if err != nil {
			v.say("Not saved: " + err.Error() + ".")
			return
		}
		a, hasA, err := num("the application cost of "+code, v.applic[code].Text)
		if err != nil {
			v.say("Not saved: " + err.Error() + ".")
			return
		}
		if !hasP && !hasA {
			continue
		}
		c := trial.TreatmentCost{Treatment: code, Application: a}
		if hasP {
			c.Product = &p
		}
		e.Costs = append(e.Costs, c)
	}
	if msg := t.EconomicsProblem(e); msg != "" {
		v.say("Not saved: " + msg + ".")
		return
	}
	if economicsEqual(t.Economics, e) {
		return
	}
	v.c.u.doc.apply(&setEconomics{before: t.Economics.Clone(), after: e.Clone()})
	v.say("Saved the prices with the trial (Edit › Undo takes them back).")
}

func economicsEqual(a, b trial.Economics) bool {
	if a.Currency != b.Currency || a.ProducePrice != b.ProducePrice || a.Trait != b.Trait || len(a.Costs) != len(b.Costs) {
		return false
	}
	for i, c := range a.Costs {
		d := b.Costs[i]
		if c.Treatment != d.Treatment || c.Application != d.Application || (c.Product == nil) != (d.Product == nil) || (c.Product != nil && *c.Product != *d.Product) {
			return false
		}
	}
	return true
}

func (v *marginsView) refresh(ch change) {
	if ch&(changeDetails|changeStructure) == 0 {
		return
	}
	v.sync()
	v.work()
}

func (v *marginsView) show(s *resultSet, tr *traitResult) {
	if v.trial() != v.syncedFor {
		v.sync() // another trial; edits of this one come through refresh
	}
	if s == nil {
		return
	}
	if msg := resultProblem(s, tr); msg != "" {
		v.res = nil
		v.clear(msg)
		return
	}
	v.res = tr.res
	v.work()
}

// work works out the margins of the result shown.
func (v *marginsView) work() {
	t, r := v.trial(), v.res
	if t == nil || r == nil {
		return
	}
	key := t.EconomicsTrait()
	switch {
	case !(t.Economics.ProducePrice > 0):
		v.clear("Give the price of the produce above (and the treatments' costs) to see each treatment's margin over input cost.")
		return
	case key == "":
		v.clear("The trial has no yield trait: choose the trait the margins are worked out from above.")
		return
	case r.TraitKey != key:
		name := key
		if tr := t.Trait(key); tr != nil {
			name = traitLabel(tr)
		}
		v.clear("The margins are worked out from " + name + ": choose that trait at the top of Compare to see them.")
		return
	}
	v.gen++
	gen, snap := v.gen, t.Clone()
	v.note.SetText("Working out the margins…")
	go func() {
		m, err := marginsOf(snap, r)
		v.c.u.compute.post(func() {
			if gen != v.gen {
				return
			}
			v.display(r, m, err)
		})
	}()
}

// marginsOf is analysis.MarginsOf with a panic turned into an error.
func marginsOf(t *trial.Trial, r *analysis.Result) (m *analysis.Margins, err error) {
	defer func() {
		if e := recover(); e != nil {
			m, err = nil, errAnalysisFailed
		}
	}()
	return analysis.MarginsOf(t, r)
}

func (v *marginsView) clear(msg string) {
	v.gen++
	v.shown = nil
	v.note.SetText(msg)
	v.notes.SetText("")
	v.table.set(nil, nil)
}

func (v *marginsView) display(r *analysis.Result, m *analysis.Margins, err error) {
	defer func() {
		if v.done != nil {
			v.done()
		}
	}()
	if err != nil {
		v.shown = nil
		v.note.SetText("The margins cannot be worked out: " + err.Error())
		v.table.set(nil, nil)
		return
	}
	v.shown = m
	v.note.SetText(export.MarginsNote(m))
	tt := export.MarginsTable(m, analysis.MeanDecimals(r.Decimals))
	v.table.set(tt.Head, tt.Rows)
	v.notes.SetText(strings.TrimSpace(strings.Join(append(m.Notes, export.EconomicCautionText()), " ")))
}

// setEconomics replaces the trial's prices (undoable).
type setEconomics struct {
	before, after trial.Economics
}

func (c *setEconomics) do(t *trial.Trial)   { t.Economics = c.after.Clone() }
func (c *setEconomics) undo(t *trial.Trial) { t.Economics = c.before.Clone() }
func (c *setEconomics) kind() change        { return changeDetails }
func (c *setEconomics) label() string       { return "prices" }
