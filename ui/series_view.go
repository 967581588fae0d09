package ui

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/theme"
	"fyne.io/fyne/v2/widget"
	"gonum.org/v1/plot"

	"furlong/export"
	"furlong/export/chart"
	"furlong/stats"
	"furlong/stats/meansep"
	stseries "furlong/stats/series"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/series"
)

// seriesWidgets are the series view's controls and tables.
type seriesWidgets struct {
	root fyne.CanvasObject

	name       *widget.Entry
	trait      *widget.Select
	traitKeys  []string // aligned with trait.Options
	check      *widget.Select
	checkCodes []string // aligned with check.Options ("" = the trials' own)
	sites      *widget.RadioGroup
	weighted   *widget.Check
	method     *widget.RadioGroup
	alpha      *widget.Select
	// updating is true while the controls are set from the series, so
	// that their handlers do not take it for the user's choice.
	updating bool

	state, saved, exportNote *widget.Label
	problem                  *widget.Label // why there is no analysis to show

	trials       *fyne.Container
	trialsNote   *widget.Label // how many trial files need attention
	presence     *textTable
	presenceNote *widget.Label

	means     *textTable
	meansPct  *widget.Check
	meansNote *widget.Label

	method2  *widget.Label // how the series was analysed
	anova    *textGrid
	errLine  *widget.Label
	sitesTab *textTable
	bartlett *widget.Label

	stability *textTable
	stabNote  *widget.Label

	h2h      *textTable
	h2hNote  *widget.Label
	pairA    *widget.Select
	pairB    *widget.Select
	pairText *widget.Label

	charts   *container.AppTabs
	warnings *widget.Label
	tabs     *container.AppTabs
}

// Labels of the sites choice.
const (
	sitesRandomLabel = "random"
	sitesFixedLabel  = "fixed"
	checkOwnLabel    = "as marked in the trials"
)

func (v *seriesView) build() {
	w := &v.w
	w.name = widget.NewEntry()
	w.name.SetText(v.name)
	w.name.OnChanged = func(s string) {
		if w.updating || strings.TrimSpace(s) == "" {
			return
		}
		v.name = strings.TrimSpace(s)
		v.setDirty()
	}
	w.name.OnSubmitted = func(string) { v.analyse() } // chart titles carry the name
	add := widget.NewButtonWithIcon("Add trial…", theme.ContentAddIcon(), v.addDialog)
	add.Importance = widget.HighImportance
	save := widget.NewButtonWithIcon("Save", theme.DocumentSaveIcon(), func() { v.save(false, nil) })
	saveAs := widget.NewButton("Save as…", func() { v.save(true, nil) })
	exp := widget.NewButtonWithIcon("Export workbook…", theme.DownloadIcon(), v.exportDialog)
	closeBtn := widget.NewButtonWithIcon("Close series", theme.CancelIcon(), func() { v.u.leaveSeries(func() {}) })

	w.trait = widget.NewSelect(nil, func(s string) {
		if w.updating {
			return
		}
		if i := slices.Index(w.trait.Options, s); i >= 0 && w.traitKeys[i] != v.opts.Trait {
			v.opts.Trait = w.traitKeys[i]
			v.setDirty()
			v.analyse()
		}
	})
	w.check = widget.NewSelect(nil, func(s string) {
		if w.updating {
			return
		}
		if i := slices.Index(w.check.Options, s); i >= 0 && w.checkCodes[i] != v.opts.Check {
			v.opts.Check = w.checkCodes[i]
			v.setDirty()
			v.analyse()
		}
	})
	w.sites = widget.NewRadioGroup([]string{sitesRandomLabel, sitesFixedLabel}, func(s string) {
		if w.updating || s == "" {
			return
		}
		want := "random"
		if s == sitesFixedLabel {
			want = "fixed"
		}
		if cur, _ := series.ParseSites(v.opts.Sites); cur.String() != want {
			v.opts.Sites = want
			v.setDirty()
			v.analyse()
		}
	})
	w.sites.Horizontal = true
	w.sites.Required = true
	w.weighted = widget.NewCheck("weight site means by their precision (two-stage)", func(on bool) {
		if w.updating {
			return
		}
		v.opts.Weighting = series.WeightNone
		if on {
			v.opts.Weighting = series.WeightStage1
		}
		v.setDirty()
		v.analyse()
	})
	w.method = widget.NewRadioGroup([]string{methodLabel(meansep.LSD), methodLabel(meansep.Tukey)}, func(s string) {
		if w.updating || s == "" {
			return
		}
		m := meansep.LSD
		if s == methodLabel(meansep.Tukey) {
			m = meansep.Tukey
		}
		if m != v.method {
			v.method = m
			v.analyse()
		}
	})
	w.method.Horizontal = true
	w.method.Required = true
	w.alpha = widget.NewSelect(alphaChoices, func(s string) {
		if w.updating {
			return
		}
		if a, err := strconv.ParseFloat(s, 64); err == nil && a != v.alpha {
			v.alpha = a
			v.analyse()
		}
	})
	w.state = widget.NewLabel("")
	w.state.Importance = widget.LowImportance
	w.saved = widget.NewLabel("")
	w.saved.Importance = widget.LowImportance
	w.exportNote = widget.NewLabel("")
	w.exportNote.Importance = widget.WarningImportance
	w.exportNote.Truncation = fyne.TextTruncateEllipsis
	w.problem = widget.NewLabel("")
	w.problem.Wrapping = fyne.TextWrapWord
	w.problem.Importance = widget.WarningImportance
	w.problem.Hide()

	sel := func(s *widget.Select, width float32) fyne.CanvasObject {
		return container.NewGridWrap(fyne.NewSize(width, s.MinSize().Height), s)
	}
	row1 := container.NewBorder(nil, nil, container.NewHBox(heading("Series"), container.NewGridWrap(fyne.NewSize(340, w.name.MinSize().Height), w.name)),
		nil, container.NewHBox(add, save, saveAs, exp, closeBtn, w.saved))
	row2 := container.NewHBox(widget.NewLabel("Trait"), sel(w.trait, 290), widget.NewLabel("Check"), sel(w.check, 250),
		widget.NewSeparator(), widget.NewLabel("Sites"), w.sites, widget.NewSeparator(), w.weighted)
	row3 := container.NewBorder(nil, nil, container.NewHBox(widget.NewLabel("Letters"), w.method, widget.NewSeparator(),
		widget.NewLabel("Significance level"), w.alpha, w.state), nil, w.exportNote)
	top := container.NewVBox(row1, row2, row3, w.problem)

	// Trials: the list, and which entries are at which site.
	w.trials = container.NewVBox()
	w.presence = newTextTable()
	w.presenceNote = widget.NewLabel("")
	w.presenceNote.Importance = widget.LowImportance
	w.presenceNote.Wrapping = fyne.TextWrapWord
	w.trialsNote = widget.NewLabel("")
	w.trialsNote.Wrapping = fyne.TextWrapWord
	w.trialsNote.Importance = widget.DangerImportance
	w.trialsNote.Hide()
	trialsPane := container.NewBorder(container.NewVBox(heading("Trials of the series"), w.trialsNote), nil, nil, nil, container.NewVScroll(w.trials))
	presencePane := container.NewBorder(container.NewVBox(heading("Entries at each site"), w.presenceNote), nil, nil, nil, w.presence.Table)
	trialsSplit := container.NewHSplit(trialsPane, presencePane)
	trialsSplit.Offset = 0.36

	// Entry × site means.
	w.means = newTextTable()
	w.meansPct = widget.NewCheck("show % of the check at each site", func(bool) { v.showMeans() })
	w.meansNote = widget.NewLabel("")
	w.meansNote.Wrapping = fyne.TextWrapWord
	meansPane := container.NewBorder(container.NewHBox(heading("Entry means at each site and across sites"), w.meansPct), w.meansNote, nil, nil, w.means.Table)

	// The combined analysis.
	w.method2 = widget.NewLabel("")
	w.method2.Wrapping = fyne.TextWrapWord
	w.anova = newTextGrid(6)
	w.errLine = widget.NewLabel("")
	w.errLine.Wrapping = fyne.TextWrapWord
	w.sitesTab = newTextTable()
	w.bartlett = widget.NewLabel("")
	w.bartlett.Wrapping = fyne.TextWrapWord
	left := container.NewVScroll(container.NewVBox(w.method2, heading("Analysis of variance across sites"), w.anova.box, w.errLine))
	right := container.NewBorder(heading("Each site on its own"), w.bartlett, nil, nil, w.sitesTab.Table)
	anovaSplit := container.NewHSplit(left, right)
	anovaSplit.Offset = 0.45

	// Stability.
	w.stability = newTextTable()
	w.stabNote = widget.NewLabel("")
	w.stabNote.Wrapping = fyne.TextWrapWord
	stabPane := container.NewBorder(heading("Stability: Finlay–Wilkinson regression on the site mean, Wricke's ecovalence, rank at each site (1 = best)"),
		w.stabNote, nil, nil, w.stability.Table)

	// Head to head.
	w.h2h = newTextTable()
	w.h2hNote = widget.NewLabel("")
	w.h2hNote.Wrapping = fyne.TextWrapWord
	w.pairA = widget.NewSelect(nil, func(string) { v.showPair() })
	w.pairB = widget.NewSelect(nil, func(string) { v.showPair() })
	w.pairText = widget.NewLabel("")
	w.pairText.Wrapping = fyne.TextWrapWord
	pairRow := container.NewHBox(widget.NewLabel("Compare"), sel(w.pairA, 200), widget.NewLabel("with"), sel(w.pairB, 200))
	h2hPane := container.NewBorder(w.h2hNote, container.NewVBox(widget.NewSeparator(), heading("Any two entries"), pairRow, w.pairText), nil, nil, w.h2h.Table)

	w.charts = container.NewAppTabs()
	w.warnings = widget.NewLabel("")
	w.warnings.Wrapping = fyne.TextWrapWord

	w.tabs = container.NewAppTabs(
		container.NewTabItem("Trials", trialsSplit),
		container.NewTabItem("Entries × sites", meansPane),
		container.NewTabItem("Combined analysis", anovaSplit),
		container.NewTabItem("Stability", stabPane),
		container.NewTabItem("Head to head", h2hPane),
		container.NewTabItem("Charts", w.charts),
		container.NewTabItem("Warnings", container.NewVScroll(w.warnings)),
	)
	caution := widget.NewLabel(export.SeriesCautions[0] + " " + export.SeriesCautions[2])
	caution.Importance = widget.WarningImportance
	caution.Truncation = fyne.TextTruncateEllipsis
	w.root = container.NewBorder(top, caution, nil, nil, w.tabs)
}

// refreshAll redraws the trials, the options and the presence table, and
// analyses again.
func (v *seriesView) refreshAll() {
	v.refreshTrials()
	v.refreshOptions()
	v.refreshPresence()
	v.analyse()
}

// refreshTrials rebuilds the list of trials.
func (v *seriesView) refreshTrials() {
	box := v.w.trials
	box.Objects = nil
	if len(v.trial) == 0 {
		l := widget.NewLabel("No trials yet. “Add trial…” adds a trial file; add one per site or season (at least two).")
		l.Wrapping = fyne.TextWrapWord
		box.Add(l)
	}
	for _, st := range v.trial {
		title := st.fileName()
		var details []string
		switch {
		case st.loading:
			details = append(details, "reading…")
		case st.t != nil:
			title = series.Label(st.t, st.path)
			details = append(details, st.fileName(), plural(len(st.t.Treatments), "entry", "entries"))
			if c := st.t.Checks(); len(c) > 0 {
				details = append(details, "check "+c[0].Code)
			}
			if st.path == "" {
				details = append(details, "no file yet")
			}
		}
		name := widget.NewLabelWithStyle(title, fyne.TextAlignLeading, fyne.TextStyle{Bold: true})
		name.Truncation = fyne.TextTruncateEllipsis
		info := widget.NewLabel(strings.Join(details, " · "))
		info.Importance = widget.LowImportance
		info.Truncation = fyne.TextTruncateEllipsis
		col := container.NewVBox(name, info)
		if st.problem != "" {
			p := widget.NewLabel(sentence(st.problem))
			p.Wrapping = fyne.TextWrapWord
			p.Importance = widget.WarningImportance
			if st.missing {
				p.Importance = widget.DangerImportance
			}
			col.Add(p)
		}
		rm := widget.NewButtonWithIcon("", theme.DeleteIcon(), func() { v.remove(st) })
		buttons := container.NewVBox(rm)
		if st.missing {
			buttons.Add(widget.NewButton("Locate…", func() { v.locateDialog(st) }))
		}
		box.Add(container.NewBorder(nil, widget.NewSeparator(), nil, buttons, col))
	}
	box.Refresh()
	missing, changed := 0, 0
	for _, st := range v.trial {
		switch {
		case st.missing:
			missing++
		case st.problem != "":
			changed++
		}
	}
	var parts []string
	if missing > 0 {
		parts = append(parts, plural(missing, "trial file is missing or unreadable (Locate… finds it, the bin takes it out of the series)", "trial files are missing or unreadable (Locate… finds each, the bin takes it out of the series)"))
	}
	if changed > 0 {
		parts = append(parts, plural(changed, "trial file has changed since it was added (saving the series takes it as it is now)", "trial files have changed since they were added (saving the series takes them as they are now)"))
	}
	v.w.trialsNote.SetText(strings.Join(parts, "; "))
	v.w.trialsNote.Hidden = len(parts) == 0
	v.w.trialsNote.Refresh()
}

// refreshOptions fills the trait and check choices from the trials read
// and shows the options chosen.
func (v *seriesView) refreshOptions() {
	w := &v.w
	w.updating = true
	defer func() { w.updating = false }()
	if w.name.Text != v.name {
		w.name.SetText(v.name)
	}
	trials, _ := v.loadedTrials()
	keys := v.traitKeys()
	w.traitKeys = keys
	var labels []string
	for _, k := range keys {
		labels = append(labels, traitLabel(trials[0].Trait(k)))
	}
	w.trait.SetOptions(labels)
	if len(keys) > 0 && !slices.Contains(keys, v.opts.Trait) && !v.stillLoading() {
		v.opts.Trait = defaultSeriesTrait(trials[0], keys)
	}
	if i := slices.Index(keys, v.opts.Trait); i >= 0 {
		w.trait.SetSelected(labels[i])
	} else {
		w.trait.ClearSelected()
	}

	codes, names := seriesEntries(trials)
	w.checkCodes = append([]string{""}, codes...)
	opts := []string{checkOwnLabel}
	for i, c := range codes {
		opts = append(opts, entryLabel(c, names[i]))
	}
	w.check.SetOptions(opts)
	if i := slices.Index(w.checkCodes, v.opts.Check); i >= 0 {
		w.check.SetSelected(opts[i])
	} else {
		// A check the trials no longer have: say it in the choice itself.
		w.checkCodes = append(w.checkCodes, v.opts.Check)
		w.check.SetOptions(append(opts, v.opts.Check+" (in no trial)"))
		w.check.SetSelected(v.opts.Check + " (in no trial)")
	}
	w.pairA.SetOptions(opts[1:])
	w.pairB.SetOptions(opts[1:])

	if s, _ := series.ParseSites(v.opts.Sites); s == stseries.SitesFixed {
		w.sites.SetSelected(sitesFixedLabel)
	} else {
		w.sites.SetSelected(sitesRandomLabel)
	}
	w.weighted.SetChecked(v.opts.Weighting == series.WeightStage1)
	w.method.SetSelected(methodLabel(v.method))
	w.alpha.SetSelected(strconv.FormatFloat(v.alpha, 'g', -1, 64))
}

// defaultSeriesTrait is the trait a series opens on: the first derived
// trait the trials share (usually adjusted yield), else the first.
func defaultSeriesTrait(t *trial.Trial, keys []string) string {
	for _, k := range keys {
		if tr := t.Trait(k); tr != nil && tr.Derived != nil {
			return k
		}
	}
	return keys[0]
}

// entryLabel is an entry's code with its name.
func entryLabel(code, name string) string {
	if name == "" || name == code {
		return code
	}
	return code + "  " + name
}

// seriesEntries are the treatment codes of the trials in order of first
// appearance (as the series analysis orders them), with the first name
// met.
func seriesEntries(trials []*trial.Trial) (codes, names []string) {
	seen := map[string]bool{}
	for _, t := range trials {
		for _, tr := range t.Treatments {
			if !seen[tr.Code] {
				seen[tr.Code] = true
				codes = append(codes, tr.Code)
				names = append(names, tr.Name)
			}
		}
	}
	return codes, names
}

// Marks of the presence table.
const (
	presentMark = "●"
	absentMark  = "—"
)

// refreshPresence fills the entries × sites table of which entry is in
// which trial.
func (v *seriesView) refreshPresence() {
	trials, paths := v.loadedTrials()
	codes, names := seriesEntries(trials)
	head := []string{"Entry", "Name", "Sites"}
	for i, t := range trials {
		head = append(head, series.Label(t, paths[i]))
	}
	var rows [][]string
	incomplete := 0
	for i, c := range codes {
		row := []string{c, names[i], ""}
		n := 0
		for _, t := range trials {
			if t.TreatmentIndex(c) >= 0 {
				row = append(row, presentMark)
				n++
			} else {
				row = append(row, absentMark)
			}
		}
		if n < len(trials) {
			incomplete++
		}
		row[2] = strconv.Itoa(n)
		rows = append(rows, row)
	}
	if len(trials) == 0 {
		head = nil
	}
	v.w.presence.set(head, rows)
	switch {
	case len(trials) == 0:
		v.w.presenceNote.SetText("The entries of the trials appear here, matched by treatment code.")
	case incomplete == 0:
		v.w.presenceNote.SetText(fmt.Sprintf("%s %s in every trial (entries matched by treatment code).", presentMark, plural(len(codes), "entry is", "entries are all")))
	default:
		v.w.presenceNote.SetText(fmt.Sprintf("%s tested · %s not in the trial. %s of %d not in every trial: their means across sites are adjusted for the sites they were at.",
			presentMark, absentMark, plural(incomplete, "entry", "entries"), len(codes)))
	}
}

// showProblem shows msg instead of an analysis.
func (v *seriesView) showProblem(msg string) {
	v.res, v.resErr, v.charts = nil, nil, nil
	v.w.problem.SetText(msg)
	v.w.problem.Show()
	v.w.state.SetText("")
	v.clearResult()
}

func (v *seriesView) clearResult() {
	w := &v.w
	w.means.set(nil, nil)
	w.meansNote.SetText("")
	w.method2.SetText("")
	w.anova.set(nil, nil)
	w.errLine.SetText("")
	w.sitesTab.set(nil, nil)
	w.bartlett.SetText("")
	w.stability.set(nil, nil)
	w.stabNote.SetText("")
	w.h2h.set(nil, nil)
	w.h2hNote.SetText("")
	w.pairText.SetText("")
	w.charts.SetItems(nil)
	w.warnings.SetText(cautionsText())
}

func cautionsText() string {
	var b strings.Builder
	b.WriteString("Cautions:\n")
	for _, c := range export.SeriesCautions {
		b.WriteString("• " + c + "\n")
	}
	return b.String()
}

// showResult shows the newest analysis (or why there is none).
func (v *seriesView) showResult() {
	if v.resErr != nil {
		m := explain("The series cannot be analysed", v.resErr)
		v.showProblem(m.What + " " + m.Do)
		return
	}
	r := v.res
	if r == nil {
		return
	}
	v.w.problem.Hide()
	v.w.state.SetText(fmt.Sprintf("up to date (%d ms)", v.took.Milliseconds()))
	v.showMeans()
	v.showCombined()
	v.showStability()
	v.showHeadToHead()
	v.showCharts()
	v.showPair() // after the charts: it draws the pair in the response chart
	v.showWarnings()
}

// decimals of means, and of their SEs, for the trait.
func (v *seriesView) decimals() (mean, se int) {
	d := analysis.MeanDecimals(v.res.Trait.Decimals)
	return d, d + 1
}

// meanOrder is the order of the entries in the tables: best first (the
// Order of means preference) or as in the series.
func (v *seriesView) meanOrder() []int {
	r := v.res
	idx := make([]int, len(r.Entries))
	for i := range idx {
		idx[i] = i
	}
	if v.u.prefs.meansOrder != orderBestFirst {
		return idx
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		x, y := r.Means[a].Mean, r.Means[b].Mean
		if r.Trait.HigherBetter {
			x, y = y, x
		}
		switch {
		case x < y:
			return -1
		case x > y:
			return 1
		}
		return 0
	})
	return idx
}

func optPercent(p *float64) string {
	if p == nil {
		return "–"
	}
	return fixed(*p, 1)
}

// showMeans fills the entry × site table.
func (v *seriesView) showMeans() {
	r := v.res
	if r == nil {
		return
	}
	pct := v.w.meansPct.Checked && r.Check >= 0
	d, dse := v.decimals()
	// The summary across sites first, then one column per site (a long
	// series scrolls to the right).
	head := []string{"Entry", "Name", "Mean", "SE", "Sites", "Letters"}
	if r.Check >= 0 {
		head = append(head, "% of check")
	}
	for _, s := range r.SiteStats {
		head = append(head, s.Label)
	}
	var rows [][]string
	for _, i := range v.meanOrder() {
		e := r.Entries[i]
		name := e.Name
		if e.Check {
			name = strings.TrimSpace(name + " (check)")
		}
		m := r.Means[i]
		row := []string{e.Code, name, fixed(m.Mean, d), fixed(m.SE, dse), strconv.Itoa(m.NSites), m.Letters}
		if r.Check >= 0 {
			row = append(row, optPercent(m.PercentOfCheck))
		}
		for j := range r.SiteStats {
			switch x, ok := r.Cell(j, i); {
			case !ok:
				row = append(row, absentMark)
			case pct:
				row = append(row, optPercent(r.PercentOfCheck[j][i]))
			default:
				row = append(row, fixed(x, d))
			}
		}
		rows = append(rows, row)
	}
	v.w.means.set(head, rows)
	note := seriesLettersText(r)
	if pct {
		note += " Site columns: the entry's mean as % of the check's mean at the site."
	}
	if r.Check < 0 {
		note += " No check: choose one above to see % of check."
	}
	v.w.meansNote.SetText(note)
}

// seriesLettersText says what the letters mean.
func seriesLettersText(r *series.Result) string {
	if r.LettersWithheld {
		return "Letters withheld: the entries' test across sites is not significant at " + strconv.FormatFloat(r.Alpha, 'g', -1, 64) + "."
	}
	level := strconv.FormatFloat(100*r.Alpha, 'f', -1, 64) + "%"
	how := "Fisher's protected LSD"
	if r.Separation == meansep.Tukey {
		how = "Tukey's HSD"
	}
	return "Means across sites with a letter in common do not differ at the " + level + " level (" + how + ")."
}

// showCombined fills the combined analysis tab.
func (v *seriesView) showCombined() {
	r := v.res
	d, _ := v.decimals()
	var lines []string
	if r.Method == stseries.MethodTwoStage {
		lines = append(lines, "Method: "+sentence(r.MethodReason)+" Each site's means first, then an entry + site model on them; its residual is the entry × site interaction.")
		if r.Weighted {
			lines = append(lines, "Weighting: each site mean weighted by its stage-1 precision.")
		} else {
			lines = append(lines, "Weighting: none (every site mean counts the same).")
		}
	} else {
		lines = append(lines, "Method: "+sentence(r.MethodReason)+" One ANOVA of every site's plots: sites, blocks within sites, entries, entries × sites, pooled error.")
	}
	if r.Sites == stseries.SitesFixed {
		lines = append(lines, "Sites fixed: entries are tested against the pooled error, so the comparison holds for these sites only.")
	} else {
		lines = append(lines, "Sites random: entries are tested against the entry × site interaction, so the comparison speaks for sites like these.")
	}
	for _, n := range r.Notes {
		lines = append(lines, "Note: "+sentence(n))
	}
	v.w.method2.SetText(strings.Join(lines, "\n"))

	var rows [][]string
	for _, s := range r.ANOVA {
		ms, f, p := "", "", ""
		if s.Name != stseries.SourceTotal {
			ms = num(s.MS, 5)
		}
		if s.HasTest {
			f, p = fixed(s.F, 2), stats.FormatP(s.P)
		}
		rows = append(rows, []string{export.SeriesSourceLabel(s.Name), strconv.Itoa(s.DF), num(s.SS, 5), ms, f, p})
	}
	v.w.anova.set([]string{"Source", "df", "SS", "MS", "F", "P"}, rows)
	el := fmt.Sprintf("Means across sites are compared on %d error df (mean square %s).", r.DFError, num(r.MSError, 5))
	if r.LSD != nil {
		el += " LSD (" + strconv.FormatFloat(100*r.Alpha, 'f', -1, 64) + "%) " + fixed(*r.LSD, d) + "."
	}
	if r.HSD != nil {
		el += " Tukey HSD " + fixed(*r.HSD, d) + "."
	}
	if r.LSD == nil && r.HSD == nil {
		el += " Entries missing at some sites have means with different SEs, so there is no single LSD."
	}
	v.w.errLine.SetText(el)

	head := []string{"Site", "Entries", "n", "Mean", "CV %", "MSE", "Error df", "P (entries)", "LSD"}
	rows = nil
	for _, s := range r.SiteStats {
		df := "–"
		if s.MSE != nil {
			df = strconv.Itoa(s.DFError)
		}
		lsd := optNum(s.LSD, d)
		if s.LSDVaries && s.LSD != nil {
			lsd = "up to " + lsd
		}
		p := "–"
		if s.PTreatment != nil {
			p = stats.FormatP(*s.PTreatment)
		}
		mse := "–"
		if s.MSE != nil {
			mse = num(*s.MSE, 4)
		}
		rows = append(rows, []string{s.Label, strconv.Itoa(s.Entries), strconv.Itoa(s.N), fixed(s.GrandMean, d), optNum(s.CVPercent, 1), mse, df, p, lsd})
	}
	v.w.sitesTab.set(head, rows)
	if b := r.Bartlett; b != nil {
		v.w.bartlett.SetText(fmt.Sprintf("Site error variances (Bartlett's test): K² = %s on %d df, P %s; largest / smallest MSE = %s (%s / %s). %s",
			fixed(b.K2, 3), b.DF, stats.FormatP(b.P), fixed(b.MSERatio, 2), b.Largest, b.Smallest, b.Reading))
	} else {
		v.w.bartlett.SetText("Site error variances: no Bartlett test (it needs an error mean square at two sites or more).")
	}
}

// showStability fills the stability table.
func (v *seriesView) showStability() {
	r := v.res
	if len(r.Stability) == 0 {
		v.w.stability.set(nil, nil)
		v.w.stabNote.SetText("Stability could not be computed; the Warnings tab says why.")
		return
	}
	head := []string{"Entry", "Slope", "SE", "Deviation MS", "Ecovalence"}
	for _, s := range r.SiteStats {
		head = append(head, "Rank "+s.Label)
	}
	var rows [][]string
	for _, i := range v.meanOrder() {
		s := r.Stability[i]
		row := []string{s.Treatment, optNum(s.Slope, 3), optNum(s.SlopeSE, 3), optNumSig(s.DeviationMS, 4), num(s.Ecovalence, 4)}
		for _, k := range s.Ranks {
			if k == 0 {
				row = append(row, absentMark)
			} else {
				row = append(row, strconv.FormatFloat(k, 'f', -1, 64))
			}
		}
		rows = append(rows, row)
	}
	v.w.stability.set(head, rows)
	v.w.stabNote.SetText("Slope 1: the entry follows the sites; below 1 it changes less from poor to good sites, above 1 more. " +
		"A small deviation MS and ecovalence: the entry's response is predictable from the site mean. Ranks: 1 is the best entry at the site.")
}

func optNumSig(p *float64, sig int) string {
	if p == nil {
		return "–"
	}
	return num(*p, sig)
}

// showHeadToHead fills the table of each entry against the check.
func (v *seriesView) showHeadToHead() {
	r := v.res
	if r.Check < 0 {
		v.w.h2h.set(nil, nil)
		v.w.h2hNote.SetText("No check: choose the check above to compare every entry with it, or compare any two entries below.")
		return
	}
	d, dse := v.decimals()
	head := []string{"Entry", "Sites", "Higher", "Lower", "Ties", "Mean diff.", "SE", "t", "df", "P", "% of check"}
	byCode := map[string]series.HeadToHead{}
	for _, h := range r.HeadToHead {
		byCode[h.A] = h
	}
	var rows [][]string
	for _, i := range v.meanOrder() {
		h, ok := byCode[r.Entries[i].Code]
		if !ok {
			continue
		}
		rows = append(rows, h2hRow(h, d, dse))
	}
	v.w.h2h.set(head, rows)
	v.w.h2hNote.SetText("Each entry against the check " + r.Entries[r.Check].Code + " over the sites with both: sites where it was higher and lower, " +
		"the mean difference (entry − check) and a paired t test over the sites.")
}

func h2hRow(h series.HeadToHead, d, dse int) []string {
	t, df, p := "–", "–", "–"
	if h.T != nil {
		t = fixed(*h.T, 2)
		df = strconv.Itoa(h.DF)
	}
	if h.P != nil {
		p = stats.FormatP(*h.P)
	}
	return []string{h.A, strconv.Itoa(h.Sites), strconv.Itoa(h.Higher), strconv.Itoa(h.Lower), strconv.Itoa(h.Ties),
		fixed(h.MeanDiff, d), optNum(h.SE, dse), t, df, p, optPercent(h.PercentOfB)}
}

// showPair compares the two entries chosen.
func (v *seriesView) showPair() {
	r := v.res
	a, b := v.w.pairA.Selected, v.w.pairB.Selected
	if r == nil || a == "" || b == "" {
		v.w.pairText.SetText("Choose two entries to see how they compare at the sites where both were tested.")
		return
	}
	ca, cb := v.codeOf(a), v.codeOf(b)
	if ca == cb {
		v.w.pairText.SetText("Choose two different entries.")
		return
	}
	h, err := r.Pair(ca, cb)
	if err != nil {
		v.w.pairText.SetText(lowerFirst(err.Error()))
		return
	}
	d, dse := v.decimals()
	s := fmt.Sprintf("%s against %s over %s: %s higher at %d, lower at %d", ca, cb, plural(h.Sites, "site", "sites"), ca, h.Higher, h.Lower)
	if h.Ties > 0 {
		s += fmt.Sprintf(", equal at %d", h.Ties)
	}
	s += "; mean difference " + fixed(h.MeanDiff, d)
	if h.SE != nil {
		s += " (SE " + fixed(*h.SE, dse) + ")"
	}
	if h.T != nil && h.P != nil {
		s += fmt.Sprintf(", paired t = %s on %d df, P %s", fixed(*h.T, 2), h.DF, stats.FormatP(*h.P))
	}
	if h.PercentOfB != nil {
		s += "; " + ca + " is " + fixed(*h.PercentOfB, 1) + "% of " + cb + " over these sites"
	}
	v.w.pairText.SetText(s + ". The response chart shows both in colour.")
	v.highlightPair(ca, cb)
}

// codeOf is the entry code of a label of the entry choices.
func (v *seriesView) codeOf(label string) string {
	if i := slices.Index(v.w.check.Options, label); i >= 0 && i < len(v.w.checkCodes) {
		return v.w.checkCodes[i]
	}
	return label
}

// showWarnings fills the Warnings tab: the analysis' warnings, the entries
// not tested everywhere, the notes and the cautions.
func (v *seriesView) showWarnings() {
	r := v.res
	var b strings.Builder
	if len(r.Warnings) == 0 {
		b.WriteString("No warnings.\n")
	}
	for _, w := range r.Warnings {
		b.WriteString("• " + sentence(w) + "\n")
	}
	if len(r.Missing) > 0 {
		b.WriteString("\nEntries not tested everywhere:\n")
		for _, m := range r.Missing {
			b.WriteString("• " + m.Treatment + ": not at " + strings.Join(m.Sites, ", ") + "\n")
		}
	}
	b.WriteString("\n" + cautionsText())
	v.w.warnings.SetText(b.String())
	title := "Warnings"
	if n := len(r.Warnings); n > 0 {
		title = fmt.Sprintf("Warnings (%d)", n)
	}
	if it := v.w.tabs.Items[len(v.w.tabs.Items)-1]; it.Text != title {
		it.Text = title
		v.w.tabs.Refresh()
	}
}

// showCharts shows the charts of the newest analysis, keeping the tab
// chosen.
func (v *seriesView) showCharts() {
	sel := 0
	if it := v.w.charts.Selected(); it != nil {
		sel = slices.Index(v.w.charts.Items, it)
	}
	var items []*container.TabItem
	n := len(v.res.Entries)
	for _, ch := range v.charts {
		var obj fyne.CanvasObject
		if ch.err != nil {
			m := explain("The chart could not be drawn", ch.err)
			l := widget.NewLabel(m.What)
			l.Wrapping = fyne.TextWrapWord
			obj = l
		} else {
			cv := newChartView(ch.plot)
			if strings.Contains(ch.title, "heat map") && n > 24 {
				// One readable row per entry: scroll rather than squeeze.
				cv.min = fyne.NewSize(chartMinSize.Width, float32(min(80+18*n, 6000)))
				obj = container.NewVScroll(cv)
			} else {
				obj = cv
			}
		}
		items = append(items, container.NewTabItem(ch.title, obj))
	}
	v.w.charts.SetItems(items)
	if sel >= 0 && sel < len(items) {
		v.w.charts.SelectIndex(sel)
	}
}

// responseTitle is the tab of the Finlay–Wilkinson chart.
const responseTitle = "Response to the site (Finlay–Wilkinson)"

// highlightPair draws the response chart again with entries a and b in
// colour beside the check (a small plot, built on the UI goroutine).
func (v *seriesView) highlightPair(a, b string) {
	for _, it := range v.w.charts.Items {
		if it.Text != responseTitle {
			continue
		}
		p, err := safePlot(func() (*plot.Plot, error) { return chart.Response(chart.FromSeries(v.res, v.name, []string{a, b})) })
		if err != nil {
			return // the chart as it was
		}
		it.Content = newChartView(p)
		v.w.charts.Refresh()
	}
}

// drawSeriesCharts builds the series charts of r (off the UI goroutine):
// the means across sites with letters, the entry × site heat map (and as
// % of the check) and the Finlay–Wilkinson lines.
func drawSeriesCharts(r *series.Result, name string, m meansep.Method) []chartImage {
	s := chart.FromSeries(r, name, nil)
	type maker struct {
		title string
		make  func() (*plot.Plot, error)
	}
	makers := []maker{
		{"Means across sites", func() (*plot.Plot, error) {
			return chart.SeriesMeans(s, chart.MeansOptions{Points: true, Letters: m, Order: chart.ByMean})
		}},
		{"Entry × site heat map", func() (*plot.Plot, error) {
			return chart.SeriesHeatMap(s, chart.SeriesHeatMapOptions{Order: chart.ByMean})
		}},
	}
	if r.Check >= 0 {
		makers = append(makers, maker{"% of check heat map", func() (*plot.Plot, error) {
			return chart.SeriesHeatMap(s, chart.SeriesHeatMapOptions{PercentOfCheck: true, Order: chart.ByMean})
		}})
	}
	makers = append(makers, maker{responseTitle, func() (*plot.Plot, error) { return chart.Response(s) }})
	out := make([]chartImage, 0, len(makers))
	for _, mk := range makers {
		p, err := safePlot(mk.make)
		out = append(out, chartImage{title: mk.title, plot: p, err: err})
	}
	return out
}

// textGrid is a small table laid out in full (no scrolling): a bold
// heading row and rows of compactCells, each column as wide as its widest
// cell. head and rows are the text shown (tests read them).
type textGrid struct {
	cols int
	head []string
	rows [][]string
	box  *fyne.Container
}

func newTextGrid(cols int) *textGrid {
	return &textGrid{cols: cols, box: container.New(columnsLayout{cols: cols})}
}

func (g *textGrid) set(head []string, rows [][]string) {
	g.head, g.rows = head, rows
	g.box.Objects = nil
	if len(head) > 0 {
		for _, h := range head {
			g.box.Add(compactCell(h, true))
		}
		for _, r := range rows {
			for c := range g.cols {
				s := ""
				if c < len(r) {
					s = r[c]
				}
				g.box.Add(compactCell(s, false))
			}
		}
	}
	g.box.Refresh()
}

// find returns the row whose first cell is s, -1 when none.
func (g *textGrid) find(s string) int {
	for i, r := range g.rows {
		if len(r) > 0 && r[0] == s {
			return i
		}
	}
	return -1
}

// sentence makes s a sentence: a capital first letter and a full stop.
func sentence(s string) string {
	s = strings.TrimSpace(s)
	if s == "" {
		return s
	}
	if r := []rune(s); r[0] >= 'a' && r[0] <= 'z' {
		s = strings.ToUpper(string(r[0])) + string(r[1:])
	}
	if !strings.HasSuffix(s, ".") {
		s += "."
	}
	return s
}
