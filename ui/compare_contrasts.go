package ui

import (
	"fmt"
	"slices"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"

	"furlong/export"
	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// contrastsView is Compare's "Contrasts" tab: the trial's planned
// comparisons (saved in the trial, trial.Contrast) estimated on the trait
// shown (analysis.EstimateContrasts: estimate, SE from the model, t on the
// error df, p and adjusted p), with a line to add a contrast and a list to
// remove one. Adding and removing are edits of the trial, undone like any
// other; the same contrasts appear in the season report and in 'furlong
// analyze'. The estimates run off the UI goroutine and come back through
// the analyser's post (fyne.Do).
type contrastsView struct {
	c         *compareStep
	item      *container.TabItem
	name, def *widget.Entry
	add       *widget.Button
	removeSel *widget.Select
	remove    *widget.Button
	adjustSel *widget.Select
	adjust    stats.Adjustment
	message   *widget.Label // what the last add or remove said
	note      *widget.Label
	table     *textTable

	// res is the result on screen (nil when none); gen counts the
	// estimates started, so that a late one is dropped.
	res *analysis.Result
	gen uint64
	// set is the estimate shown (nil when none).
	set *analysis.ContrastSet
	// done, when set, is called after an estimate was shown (tests).
	done func()
	// syncing is set while the select is filled from the trial.
	syncing bool
}

// adjustChoices are the adjustments offered, in the order of the select.
var adjustChoices = []struct {
	adj   stats.Adjustment
	label string
}{
	{stats.AdjustNone, "not adjusted"},
	{stats.Bonferroni, "Bonferroni"},
	{stats.Holm, "Holm"},
	{stats.Scheffe, "Scheffé (chosen after looking)"},
}

func newContrastsView(c *compareStep) *contrastsView {
	v := &contrastsView{c: c, note: widget.NewLabel(""), message: widget.NewLabel(""), table: newTextTable()}
	v.note.Wrapping = fyne.TextWrapWord
	v.message.Wrapping = fyne.TextWrapWord
	v.name = widget.NewEntry()
	v.name.SetPlaceHolder("name, e.g. new vs standard")
	v.def = widget.NewEntry()
	v.def.SetPlaceHolder("HM01,HM02 vs CHK   or   HM01:1,HM02:1,CHK:-2")
	v.def.OnSubmitted = func(string) { v.addContrast() }
	v.add = widget.NewButtonWithIcon("Save contrast", theme.ContentAddIcon(), v.addContrast)
	v.removeSel = widget.NewSelect(nil, nil)
	v.removeSel.PlaceHolder = "(saved contrasts)"
	v.remove = widget.NewButtonWithIcon("Remove", theme.DeleteIcon(), v.removeContrast)
	var labels []string
	for _, a := range adjustChoices {
		labels = append(labels, a.label)
	}
	v.adjustSel = widget.NewSelect(labels, func(s string) {
		for _, a := range adjustChoices {
			if a.label == s && a.adj != v.adjust {
				v.adjust = a.adj
				v.saveAdjust()
				v.estimate()
			}
		}
	})
	v.adjustSel.SetSelected(adjustChoices[0].label)
	h := v.name.MinSize().Height
	addRow := container.NewBorder(nil, nil,
		container.NewHBox(widget.NewLabel("Name"), container.NewGridWrap(fyne.NewSize(200, h), v.name), widget.NewLabel("Compare")),
		v.add, v.def)
	removeRow := container.NewHBox(widget.NewLabel("Saved"), container.NewGridWrap(fyne.NewSize(300, h), v.removeSel), v.remove,
		widget.NewSeparator(), widget.NewLabel("p-values"), container.NewGridWrap(fyne.NewSize(260, h), v.adjustSel))
	help := widget.NewLabel(`A contrast compares groups of treatments: "A,B vs C" is the mean of A and B minus the mean of C; "A:1,B:1,C:-2" gives each treatment named a coefficient (the others 0; they add up to 0). Saved with the trial, estimated for every trait here, in the report and by 'furlong analyze'.`)
	help.Wrapping = fyne.TextWrapWord
	help.Importance = widget.LowImportance
	top := container.NewVBox(addRow, removeRow, v.message, help, v.note)
	v.message.Hide()
	v.item = container.NewTabItem("Contrasts", container.NewBorder(top, nil, nil, nil, v.table))
	v.syncSaved()
	return v
}

func (v *contrastsView) tab() *container.TabItem { return v.item }

// say shows what the last add or remove did; the line takes no room while
// there is nothing to say.
func (v *contrastsView) say(s string) { sayIn(v.message, s) }

// saved is the open trial's contrasts.
func (v *contrastsView) saved() []trial.Contrast {
	if v.c.u.doc == nil {
		return nil
	}
	return v.c.u.doc.t.Analysis.Contrasts
}

// syncSaved fills the list of saved contrasts.
func (v *contrastsView) syncSaved() {
	var opts []string
	for _, c := range v.saved() {
		opts = append(opts, c.String())
	}
	v.removeSel.Options = opts
	if indexOf(opts, v.removeSel.Selected) < 0 {
		v.removeSel.Selected = ""
	}
	v.removeSel.Refresh()
	if len(opts) == 0 {
		v.remove.Disable()
	} else {
		v.remove.Enable()
	}
}

// refresh follows an edit that may have changed the saved contrasts or
// their adjustment (an undone or redone contrast, another trial); value
// edits bring a new round of results instead (show).
func (v *contrastsView) refresh(ch change) {
	if ch&(changeDetails|changeStructure) == 0 {
		return
	}
	v.syncSaved()
	v.syncAdjust()
	v.estimate()
}

// syncAdjust shows the trial's saved adjustment in the select.
func (v *contrastsView) syncAdjust() {
	d := v.c.u.doc
	if d == nil {
		return
	}
	want := analysis.SavedAdjustment(d.t)
	for _, a := range adjustChoices {
		if a.adj == want && v.adjust != want {
			v.adjust = want
			v.syncing = true
			v.adjustSel.SetSelected(a.label)
			v.syncing = false
		}
	}
}

// saveAdjust remembers the adjustment chosen with the trial (undoable), so
// that the season report and 'furlong analyze' adjust the same way.
func (v *contrastsView) saveAdjust() {
	d := v.c.u.doc
	if d == nil || v.syncing || analysis.SavedAdjustment(d.t) == v.adjust {
		return
	}
	d.apply(&setContrastAdjust{before: d.t.Analysis.ContrastAdjust, after: string(v.adjust)})
}

// setContrastAdjust replaces the trial's adjustment of its contrasts
// (undoable).
type setContrastAdjust struct{ before, after string }

func (c *setContrastAdjust) do(t *trial.Trial)   { t.Analysis.ContrastAdjust = c.after }
func (c *setContrastAdjust) undo(t *trial.Trial) { t.Analysis.ContrastAdjust = c.before }
func (c *setContrastAdjust) kind() change        { return changeDetails }
func (c *setContrastAdjust) label() string       { return "adjustment of the contrasts" }

func (v *contrastsView) show(s *resultSet, tr *traitResult) {
	v.syncSaved()
	if s == nil {
		return
	}
	if msg := resultProblem(s, tr); msg != "" {
		v.res = nil
		v.clear(msg)
		return
	}
	v.res = tr.res
	v.estimate()
}

// estimate estimates the saved contrasts on the result shown.
func (v *contrastsView) estimate() {
	r := v.res
	cs := slices.Clone(v.saved())
	switch {
	case r == nil:
		return
	case len(cs) == 0:
		v.clear("No contrasts saved yet: name one and say which treatments it compares above, then Save contrast.")
		return
	}
	v.gen++
	gen, adj := v.gen, v.adjust
	v.note.SetText("Estimating the contrasts…")
	go func() {
		set, err := estimateContrasts(r, cs, adj)
		v.c.u.compute.post(func() {
			if gen != v.gen {
				return
			}
			v.display(r, set, err)
		})
	}()
}

// estimateContrasts is analysis.EstimateContrasts with a panic turned into
// an error (off the UI goroutine).
func estimateContrasts(r *analysis.Result, cs []trial.Contrast, adj stats.Adjustment) (set *analysis.ContrastSet, err error) {
	defer func() {
		if e := recover(); e != nil {
			set, err = nil, errAnalysisFailed
		}
	}()
	return analysis.EstimateContrasts(r, cs, adj)
}

// clear shows msg and no estimates.
func (v *contrastsView) clear(msg string) {
	v.gen++
	v.set = nil
	v.note.SetText(msg)
	v.table.set(nil, nil)
}

// display shows finished estimates (UI goroutine).
func (v *contrastsView) display(r *analysis.Result, set *analysis.ContrastSet, err error) {
	defer func() {
		if v.done != nil {
			v.done()
		}
	}()
	if err != nil {
		v.set = nil
		m := explain("The contrasts cannot be estimated for this trait", err)
		v.note.SetText(strings.TrimSpace(m.What + " " + m.Do))
		v.table.set(nil, nil)
		return
	}
	v.set = set
	head, rows := contrastsTable(r, set)
	scale := ""
	if r.Transform != stats.NoTransform {
		scale = " on the " + r.Transform.Scale() + " scale the trait is analysed on"
	}
	v.note.SetText(fmt.Sprintf("%s: each contrast of the means%s with its standard error from the model and a t test on the %d error df; %s.",
		r.TraitName, scale, r.ANOVA.DFError, export.AdjustmentText(set.Adjust)))
	v.table.set(head, rows)
}

// contrastsTable is the table of estimates.
func contrastsTable(r *analysis.Result, set *analysis.ContrastSet) (head []string, rows [][]string) {
	dec := analysis.MeanDecimals(r.Decimals)
	if r.Transform != stats.NoTransform {
		dec = analysis.TransformedDecimals
	}
	head = []string{"Contrast", "Compares", "Estimate", "SE", "df", "t", "P", "P adjusted"}
	for _, c := range set.Rows {
		rows = append(rows, []string{c.Name, c.Definition, fixed(c.Estimate, dec), fixed(c.SE, dec),
			fmt.Sprint(c.DF), fixed(c.T, 3), stats.FormatP(c.P), stats.FormatP(c.PAdjusted)})
	}
	return head, rows
}

// addContrast saves the contrast typed in, as an edit of the trial.
func (v *contrastsView) addContrast() {
	d := v.c.u.doc
	if d == nil {
		return
	}
	name, def := strings.TrimSpace(v.name.Text), strings.TrimSpace(v.def.Text)
	if name == "" || def == "" {
		v.say("Give the contrast a name and say what it compares, for example HM01,HM02 vs CHK.")
		return
	}
	c, err := trial.ParseContrast(name + "=" + def)
	if err == nil {
		_, err = c.Weights(d.t.TreatmentCodes())
	}
	if err != nil {
		v.say("Not saved: " + err.Error() + ".")
		return
	}
	after := slices.Clone(d.t.Analysis.Contrasts)
	replaced := false
	for i := range after {
		if after[i].Name == c.Name {
			after[i], replaced = c, true
		}
	}
	if !replaced {
		after = append(after, c)
	}
	d.apply(&setContrasts{before: slices.Clone(d.t.Analysis.Contrasts), after: after, what: "contrast " + c.Name})
	if replaced {
		v.say("Replaced the contrast " + c.Name + " (Edit › Undo brings the old one back).")
	} else {
		v.say("Saved the contrast " + c.Name + " with the trial.")
	}
	v.name.SetText("")
	v.def.SetText("")
}

// removeContrast removes the saved contrast chosen in the list.
func (v *contrastsView) removeContrast() {
	d := v.c.u.doc
	i := indexOf(v.removeSel.Options, v.removeSel.Selected)
	if d == nil || i < 0 || i >= len(d.t.Analysis.Contrasts) {
		v.say("Choose a saved contrast to remove.")
		return
	}
	name := d.t.Analysis.Contrasts[i].Name
	before := slices.Clone(d.t.Analysis.Contrasts)
	after := slices.Delete(slices.Clone(before), i, i+1)
	d.apply(&setContrasts{before: before, after: after, what: "removal of contrast " + name})
	v.say("Removed the contrast " + name + " (Edit › Undo brings it back).")
}

// setContrasts replaces the trial's saved contrasts (undoable).
type setContrasts struct {
	before, after []trial.Contrast
	what          string
}

func (c *setContrasts) do(t *trial.Trial)   { t.Analysis.Contrasts = slices.Clone(c.after) }
func (c *setContrasts) undo(t *trial.Trial) { t.Analysis.Contrasts = slices.Clone(c.before) }
func (c *setContrasts) kind() change        { return changeDetails }
func (c *setContrasts) label() string       { return c.what }
