package ui

import (
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/storage"
	"fyne.io/fyne/v2/widget"
	"github.com/xuri/excelize/v2"

	"furlong/export"
	"furlong/export/xlsx"
	"furlong/sampledata"
	stseries "furlong/stats/series"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/series"
	"furlong/trial/trialfile"
)

// The series view's tests check behaviour: that the numbers of the series
// analysis (trial/series, itself checked against R and published data in
// its own tests) reach the view's tables, that the trials' list and
// presence table follow additions and removals, that file problems are
// shown, and that the series file and the workbook hold what the view
// shows. The expected numbers are computed here by trial/series from the
// same trial files, never written down.

// seriesPosts makes the series view's background work come back on the
// test goroutine (pumpSeries runs it), as the real driver runs fyne.Do on
// the main goroutine.
func seriesPosts(u *App) chan func() {
	posts := make(chan func(), 256)
	u.seriesPost = func(f func()) { posts <- f }
	return posts
}

// pumpSeries runs the view's deliveries until no trial file is being read
// and no analysis is running or waiting.
func pumpSeries(t *testing.T, u *App, posts chan func()) *seriesView {
	t.Helper()
	timeout := time.After(60 * time.Second)
	for {
		v := u.series
		if v != nil && !v.stillLoading() && !v.running && !v.pending {
			return v
		}
		select {
		case f := <-posts:
			f()
		case <-timeout:
			t.Fatal("the series view did not settle within a minute")
		}
	}
}

// writeDemoTrials writes the demo series' trial files into dir and returns
// their paths, in the series' order.
func writeDemoTrials(t *testing.T, dir string) []string {
	t.Helper()
	trials, err := sampledata.SeriesTrials()
	if err != nil {
		t.Fatal(err)
	}
	var paths []string
	for _, st := range trials {
		p := filepath.Join(dir, st.FileName)
		if err := os.WriteFile(p, st.Bytes, 0o644); err != nil {
			t.Fatal(err)
		}
		paths = append(paths, p)
	}
	return paths
}

// writeSeriesFile writes a series file at path listing the trial files.
func writeSeriesFile(t *testing.T, path string, trials []string, opts series.FileOptions) {
	t.Helper()
	s := &series.Series{Name: "Test series", Options: opts}
	for _, p := range trials {
		ref, err := series.Ref(path, p)
		if err != nil {
			t.Fatal(err)
		}
		s.Trials = append(s.Trials, ref)
	}
	if err := series.Save(path, s); err != nil {
		t.Fatal(err)
	}
}

// expectSeries analyses the trial files at paths with trial/series.
func expectSeries(t *testing.T, paths []string, key string, o series.Options) *series.Result {
	t.Helper()
	var trials []*trial.Trial
	for _, p := range paths {
		tr, err := trialfile.Load(p)
		if err != nil {
			t.Fatal(err)
		}
		trials = append(trials, tr)
	}
	tr, sites, err := series.FromTrials(trials, paths, key)
	if err != nil {
		t.Fatal(err)
	}
	r, err := series.Analyze(tr, sites, o)
	if err != nil {
		t.Fatal(err)
	}
	return r
}

func findRow(rows [][]string, first string) []string {
	for _, r := range rows {
		if len(r) > 0 && r[0] == first {
			return r
		}
	}
	return nil
}

// Opening a series file fills every tab with the numbers trial/series
// gives for the same trial files (the analysis itself is checked against
// R 4.2.2 and Immer et al. (1934) in trial/series and stats/series).
func TestSeriesOpenFillsTables(t *testing.T) {
	u, w := newTestApp(t, 0)
	posts := seriesPosts(u)
	dir := t.TempDir()
	paths := writeDemoTrials(t, dir)
	sp := filepath.Join(dir, "wheat"+series.FileExt)
	writeSeriesFile(t, sp, paths, series.FileOptions{Trait: "yield"})
	if err := u.OpenSeriesFile(sp); err != nil {
		t.Fatal(err)
	}
	v := pumpSeries(t, u, posts)
	if w.Content() != v.w.root {
		t.Fatal("the series view is not the window's content")
	}
	if v.res == nil {
		t.Fatalf("no analysis shown; problem: %q", v.w.problem.Text)
	}
	want := expectSeries(t, paths, "yield", series.Options{Alpha: u.prefs.alpha, Method: u.prefs.method})
	d := analysis.MeanDecimals(want.Trait.Decimals)

	// Entries × sites: site means, mean across sites, SE, letters, % of check.
	m := v.w.means
	if len(m.rows) != len(want.Entries) {
		t.Fatalf("%d rows in the means table, want %d entries", len(m.rows), len(want.Entries))
	}
	cMean, cLet, cPct := slices.Index(m.head, "Mean"), slices.Index(m.head, "Letters"), slices.Index(m.head, "% of check")
	if cMean < 0 || cLet < 0 || cPct < 0 {
		t.Fatalf("means table heading %q", m.head)
	}
	for i, e := range want.Entries {
		row := findRow(m.rows, e.Code)
		if row == nil {
			t.Fatalf("no row for %s", e.Code)
		}
		if got := row[cMean]; got != fixed(want.Means[i].Mean, d) {
			t.Errorf("%s: mean %s, want %s", e.Code, got, fixed(want.Means[i].Mean, d))
		}
		if row[cLet] != want.Means[i].Letters {
			t.Errorf("%s: letters %q, want %q", e.Code, row[cLet], want.Means[i].Letters)
		}
		if want.Means[i].PercentOfCheck == nil || row[cPct] != fixed(*want.Means[i].PercentOfCheck, 1) {
			t.Errorf("%s: %% of check %q", e.Code, row[cPct])
		}
		for j, s := range want.SiteStats {
			c := slices.Index(m.head, s.Label)
			x, ok := want.Cell(j, i)
			switch {
			case c < 0:
				t.Fatalf("no column for site %s", s.Label)
			case !ok && row[c] != absentMark:
				t.Errorf("%s at %s: %q, want the absent mark", e.Code, s.Label, row[c])
			case ok && row[c] != fixed(x, d):
				t.Errorf("%s at %s: %q, want %s", e.Code, s.Label, row[c], fixed(x, d))
			}
		}
	}
	// % of check at each site, when asked for.
	v.w.meansPct.SetChecked(true)
	hm08 := want.EntryIndex("HM08")
	for j, s := range want.SiteStats {
		row := findRow(v.w.means.rows, "HM08")
		c := slices.Index(v.w.means.head, s.Label)
		if p := want.PercentOfCheck[j][hm08]; p != nil && row[c] != fixed(*p, 1) {
			t.Errorf("HM08 %% of check at %s: %q, want %s", s.Label, row[c], fixed(*p, 1))
		}
	}

	// Combined analysis: the ANOVA lines, the sites, Bartlett.
	if len(v.w.anova.rows) != len(want.ANOVA) {
		t.Fatalf("%d ANOVA lines, want %d", len(v.w.anova.rows), len(want.ANOVA))
	}
	for k, src := range want.ANOVA {
		row := v.w.anova.rows[k]
		if row[0] != export.SeriesSourceLabel(src.Name) || row[1] != strconv.Itoa(src.DF) || row[2] != num(src.SS, 5) {
			t.Errorf("ANOVA line %d: %q, want %s df %d SS %s", k, row, src.Name, src.DF, num(src.SS, 5))
		}
		if src.HasTest && row[4] != fixed(src.F, 2) {
			t.Errorf("ANOVA %s: F %q, want %s", src.Name, row[4], fixed(src.F, 2))
		}
	}
	if !strings.Contains(v.w.method2.Text, "Sites random") || !strings.Contains(v.w.method2.Text, sentence(want.MethodReason)) {
		t.Errorf("method text %q", v.w.method2.Text)
	}
	for _, s := range want.SiteStats {
		row := findRow(v.w.sitesTab.rows, s.Label)
		if row == nil || row[4] != optNum(s.CVPercent, 1) || row[6] != strconv.Itoa(s.DFError) || row[8] != optNum(s.LSD, d) {
			t.Errorf("site %s: %q, want CV %s df %d LSD %s", s.Label, row, optNum(s.CVPercent, 1), s.DFError, optNum(s.LSD, d))
		}
	}
	if b := want.Bartlett; b == nil || !strings.Contains(v.w.bartlett.Text, fixed(b.K2, 3)) || !strings.Contains(v.w.bartlett.Text, b.Reading) {
		t.Errorf("Bartlett text %q", v.w.bartlett.Text)
	}

	// Stability and head to head.
	for _, s := range want.Stability {
		row := findRow(v.w.stability.rows, s.Treatment)
		if row == nil || row[1] != optNum(s.Slope, 3) || row[4] != num(s.Ecovalence, 4) {
			t.Errorf("stability of %s: %q, want slope %s ecovalence %s", s.Treatment, row, optNum(s.Slope, 3), num(s.Ecovalence, 4))
		}
	}
	if len(v.w.h2h.rows) != len(want.HeadToHead) {
		t.Fatalf("%d head-to-head rows, want %d", len(v.w.h2h.rows), len(want.HeadToHead))
	}
	for _, h := range want.HeadToHead {
		row := findRow(v.w.h2h.rows, h.A)
		if row == nil || row[2] != strconv.Itoa(h.Higher) || row[3] != strconv.Itoa(h.Lower) || row[5] != fixed(h.MeanDiff, d) {
			t.Errorf("%s against the check: %q, want higher %d lower %d diff %s", h.A, row, h.Higher, h.Lower, fixed(h.MeanDiff, d))
		}
	}
	// Any two entries.
	respBefore := v.w.charts.Items[len(v.w.charts.Items)-1].Content
	v.w.pairA.SetSelected(entryLabel("HM01", "HM-2201"))
	v.w.pairB.SetSelected(entryLabel("HM07", "HM-2207"))
	pair, err := want.Pair("HM01", "HM07")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(v.w.pairText.Text, "mean difference "+fixed(pair.MeanDiff, d)) {
		t.Errorf("pair text %q, want the difference %s", v.w.pairText.Text, fixed(pair.MeanDiff, d))
	}
	if it := v.w.charts.Items[len(v.w.charts.Items)-1]; it.Text != responseTitle || it.Content == respBefore {
		t.Errorf("the response chart (%q) was not drawn again with the pair", it.Text)
	} else if _, ok := it.Content.(*chartView); !ok {
		t.Errorf("the response chart is a %T", it.Content)
	}

	// Charts: means, heat maps, response lines, all drawn.
	if len(v.w.charts.Items) != 4 {
		t.Errorf("%d charts", len(v.w.charts.Items))
	}
	for _, it := range v.w.charts.Items {
		if _, ok := it.Content.(*widget.Label); ok {
			t.Errorf("chart %q was not drawn", it.Text)
		}
	}
	// Warnings: the analysis' own, and the series cautions.
	for _, wn := range want.Warnings {
		if !strings.Contains(v.w.warnings.Text, sentence(wn)) {
			t.Errorf("warning %q not shown", wn)
		}
	}
	if !strings.Contains(v.w.warnings.Text, "limited evidence") {
		t.Error("the series cautions are not shown")
	}

	// Sites fixed: the view analyses again with the entries against the
	// pooled error (two-stage: trial/series notes that fixed applies to
	// the combined analysis).
	v.w.sites.SetSelected(sitesFixedLabel)
	// The analysis runs in the background: the choice returns at once and
	// the result comes back through the UI goroutine's queue.
	if !v.running || v.w.state.Text != "computing…" || v.res.Sites != stseries.SitesRandom {
		t.Errorf("right after the choice: running %v, state %q", v.running, v.w.state.Text)
	}
	v = pumpSeries(t, u, posts)
	if v.opts.Sites != "fixed" || !v.dirty {
		t.Errorf("sites fixed: option %q, dirty %v", v.opts.Sites, v.dirty)
	}
	fixedWant := expectSeries(t, paths, "yield", series.Options{Sites: stseries.SitesFixed, Alpha: u.prefs.alpha, Method: u.prefs.method})
	if v.res.Sites != fixedWant.Sites || len(v.w.anova.rows) != len(fixedWant.ANOVA) {
		t.Errorf("sites fixed: result sites %v, want %v", v.res.Sites, fixedWant.Sites)
	}
}

// Adding and removing trials updates the list, the presence table and the
// analysis (balanced: combined; an entry missing at a site: two-stage, as
// trial/series chooses). The series is reached through File › New series.
func TestSeriesAddRemoveUpdatesPresence(t *testing.T) {
	u, w := newTestApp(t, 0)
	posts := seriesPosts(u)
	paths := writeDemoTrials(t, t.TempDir()) // Long Acre, Brackenhythe, Quillon Rise (no HM08), ...
	var item *fyne.MenuItem
	for _, it := range w.MainMenu().Items[0].Items {
		if it.Label == "New series" {
			item = it
		}
	}
	if item == nil {
		t.Fatal("File has no New series item")
	}
	item.Action()
	v := pumpSeries(t, u, posts)
	if len(v.w.presence.rows) != 0 || !v.w.problem.Visible() {
		t.Fatalf("empty series: %d presence rows, problem shown %v", len(v.w.presence.rows), v.w.problem.Visible())
	}
	v.add(paths[0])
	v.add(paths[1])
	v = pumpSeries(t, u, posts)
	if len(v.w.presence.head) != 5 || len(v.w.presence.rows) != 10 {
		t.Fatalf("two trials: presence heading %q, %d rows", v.w.presence.head, len(v.w.presence.rows))
	}
	if v.res == nil || v.res.Method != stseries.MethodCombined {
		t.Fatalf("two balanced trials: %v (%q)", v.res, v.w.problem.Text)
	}
	if len(v.w.trials.Objects) != 2 {
		t.Errorf("%d trials listed", len(v.w.trials.Objects))
	}

	v.add(paths[2])
	v = pumpSeries(t, u, posts)
	row := findRow(v.w.presence.rows, "HM08")
	if c := slices.Index(v.w.presence.head, "Quillon Rise 2026"); c < 0 || row[c] != absentMark || row[2] != "2" {
		t.Errorf("HM08 with Quillon Rise: %q (heading %q)", row, v.w.presence.head)
	}
	if row := findRow(v.w.presence.rows, "HM01"); v.w.presence.head[2] != "Sites" || row[2] != "3" {
		t.Errorf("HM01: %q", row)
	}
	if v.res == nil || v.res.Method != stseries.MethodTwoStage || len(v.res.Missing) != 1 {
		t.Fatalf("with an entry missing: %+v", v.res)
	}
	if !strings.Contains(v.w.presenceNote.Text, "1 entry of 10 not in every trial") {
		t.Errorf("presence note %q", v.w.presenceNote.Text)
	}

	v.remove(v.trial[2])
	v = pumpSeries(t, u, posts)
	if len(v.w.presence.head) != 5 || slices.Contains(findRow(v.w.presence.rows, "HM08"), absentMark) {
		t.Errorf("after removing Quillon Rise: %q, %q", v.w.presence.head, findRow(v.w.presence.rows, "HM08"))
	}
	if v.res == nil || v.res.Method != stseries.MethodCombined || len(v.res.SiteStats) != 2 {
		t.Errorf("after removing Quillon Rise: %+v", v.res)
	}
	if !v.dirty || !strings.HasSuffix(w.Title(), "•") {
		t.Errorf("changed series: dirty %v, title %q", v.dirty, w.Title())
	}
	// Adding the same file again is refused, once.
	if v.add(paths[0]) || len(v.trial) != 2 {
		t.Errorf("the same trial added twice: %d trials", len(v.trial))
	}
}

// A trial file that is gone is named in the trials' list (in
// series.Check's words) and the rest of the series is analysed; one that
// changed since it was added is said too, and used as it is now.
func TestSeriesMissingTrialFile(t *testing.T) {
	u, _ := newTestApp(t, 0)
	posts := seriesPosts(u)
	dir := t.TempDir()
	paths := writeDemoTrials(t, dir)
	sp := filepath.Join(dir, "wheat"+series.FileExt)
	writeSeriesFile(t, sp, paths, series.FileOptions{Trait: "yield"})
	if err := os.Remove(paths[3]); err != nil {
		t.Fatal(err)
	}
	changed, err := trialfile.Load(paths[1])
	if err != nil {
		t.Fatal(err)
	}
	changed.Notes += " Checked again."
	if err := trialfile.Save(paths[1], changed); err != nil {
		t.Fatal(err)
	}
	s, _, err := series.Load(sp)
	if err != nil {
		t.Fatal(err)
	}
	problems := series.Check(sp, s)
	if len(problems) != 2 {
		t.Fatalf("series.Check: %+v", problems)
	}
	if err := u.OpenSeriesFile(sp); err != nil {
		t.Fatal(err)
	}
	v := pumpSeries(t, u, posts)
	for _, p := range problems {
		var st *seriesTrial
		for _, x := range v.trial {
			if x.ref.Path == p.Path {
				st = x
			}
		}
		if st == nil || st.problem != p.Msg || st.missing != p.Missing {
			t.Errorf("%s: shown %+v, want %q", p.Path, st, p.Msg)
		}
		if !slices.ContainsFunc(labelsIn(v.w.trials), func(s string) bool { return s == sentence(p.Msg) }) {
			t.Errorf("the trials' list does not say %q", p.Msg)
		}
	}
	if v.res == nil || len(v.res.SiteStats) != 4 {
		t.Fatalf("the four readable trials are not analysed: %v (%q)", v.res, v.w.problem.Text)
	}
	if note := v.w.trialsNote.Text; !v.w.trialsNote.Visible() || !strings.HasPrefix(note, "1 trial file is missing") || !strings.Contains(note, "1 trial file has changed") {
		t.Errorf("trials note %q", note)
	}
	if slices.Contains(v.w.presence.head, "Tarnbeck Flats 2026") {
		t.Error("the missing trial is in the presence table")
	}

	// Locating the file where it went brings the trial back.
	demo, err := sampledata.SeriesTrials()
	if err != nil {
		t.Fatal(err)
	}
	moved := filepath.Join(t.TempDir(), "moved.furlong")
	if err := os.WriteFile(moved, demo[3].Bytes, 0o644); err != nil {
		t.Fatal(err)
	}
	var gone *seriesTrial
	for _, st := range v.trial {
		if st.missing {
			gone = st
		}
	}
	if gone == nil || !slices.ContainsFunc(buttonsIn(v.w.trials), func(b *widget.Button) bool { return b.Text == "Locate…" }) {
		t.Fatal("the missing trial has no Locate button")
	}
	v.locate(gone, moved)
	v = pumpSeries(t, u, posts)
	if gone.missing || gone.problem != "" || gone.path != moved || !v.dirty {
		t.Errorf("located trial: %+v, dirty %v", gone, v.dirty)
	}
	if note := v.w.trialsNote.Text; strings.Contains(note, "missing") {
		t.Errorf("trials note after locating: %q", note)
	}
	if v.res == nil || len(v.res.SiteStats) != 5 || !slices.Contains(v.w.presence.head, "Tarnbeck Flats 2026") {
		t.Errorf("after locating: %v", v.w.presence.head)
	}
}

// buttonsIn collects the buttons in c.
func buttonsIn(c *fyne.Container) []*widget.Button {
	var out []*widget.Button
	var walk func(o fyne.CanvasObject)
	walk = func(o fyne.CanvasObject) {
		switch x := o.(type) {
		case *widget.Button:
			out = append(out, x)
		case *fyne.Container:
			for _, k := range x.Objects {
				walk(k)
			}
		}
	}
	walk(c)
	return out
}

// Closing a series with unsaved changes asks first (nothing is dropped
// without the user's choice, as the window does for a trial: askUnsaved); Cancel
// keeps it open, "Close without saving" goes back to the start screen.
func TestSeriesCloseAsksAboutChanges(t *testing.T) {
	u, w := newTestApp(t, 0)
	posts := seriesPosts(u)
	if err := u.OpenDemoSeries(); err != nil {
		t.Fatal(err)
	}
	v := pumpSeries(t, u, posts)
	v.w.sites.SetSelected(sitesFixedLabel)
	v = pumpSeries(t, u, posts)
	u.closeCommand()
	dialogButton(t, w, "Cancel").OnTapped()
	if u.series != v || w.Content() != v.w.root {
		t.Fatal("Cancel closed the series")
	}
	u.closeCommand()
	dialogButton(t, w, "Close without saving").OnTapped()
	if u.series != nil || w.Content() == v.w.root {
		t.Fatal("the series is still open")
	}
	if len(u.body.Objects) != 1 || u.body.Objects[0] != u.start.object() {
		t.Error("the start screen is not shown after closing the series")
	}
	if strings.Contains(w.Title(), "Series") {
		t.Errorf("title %q", w.Title())
	}
}

// labelsIn collects the text of every label in c.
func labelsIn(c *fyne.Container) []string {
	var out []string
	var walk func(o fyne.CanvasObject)
	walk = func(o fyne.CanvasObject) {
		switch x := o.(type) {
		case *widget.Label:
			out = append(out, x.Text)
		case *fyne.Container:
			for _, k := range x.Objects {
				walk(k)
			}
		}
	}
	walk(c)
	return out
}

// The demo series saved (its trial files written beside the series file)
// and opened again gives back its name, trials and options, and the same
// tables.
func TestSeriesSaveReopen(t *testing.T) {
	u, w := newTestApp(t, 0)
	posts := seriesPosts(u)
	if err := u.OpenDemoSeries(); err != nil {
		t.Fatal(err)
	}
	v := pumpSeries(t, u, posts)
	if v.res == nil || len(v.res.SiteStats) != 5 {
		t.Fatalf("demo series: %v (%q)", v.res, v.w.problem.Text)
	}
	// Choices to keep: another trait, a chosen check, weighting, fixed sites.
	v.w.trait.SetSelected(traitLabel(v.trial[0].t.Trait("ht")))
	v.w.check.SetSelected(v.w.check.Options[slices.Index(v.w.checkCodes, "HM01")])
	v.w.weighted.SetChecked(true)
	v = pumpSeries(t, u, posts)
	if v.opts.Trait != "ht" || v.opts.Check != "HM01" || v.opts.Weighting != series.WeightStage1 || v.res.Trait.Key != "ht" || !v.res.Weighted {
		t.Fatalf("options %+v, result %s weighted %v", v.opts, v.res.Trait.Key, v.res.Weighted)
	}
	before := v.w.means.rows

	dir := t.TempDir()
	sp := filepath.Join(dir, "demo"+series.FileExt)
	if !v.saveTo(sp) {
		t.Fatal("not saved")
	}
	if v.dirty || strings.HasSuffix(w.Title(), "•") {
		t.Errorf("after saving: dirty %v, title %q", v.dirty, w.Title())
	}
	s, problems, err := series.Load(sp)
	if err != nil || len(problems) != 0 || len(s.Trials) != 5 {
		t.Fatalf("series file: %+v, problems %+v, %v", s, problems, err)
	}
	if s.Name != sampledata.SeriesName || s.Options.Trait != "ht" || s.Options.Check != "HM01" || s.Options.Weighting != series.WeightStage1 {
		t.Errorf("series file: %+v", s)
	}
	for _, ref := range s.Trials {
		if filepath.IsAbs(filepath.FromSlash(ref.Path)) || strings.Contains(ref.Path, "/") {
			t.Errorf("trial path %q: want a name beside the series file", ref.Path)
		}
		if _, err := os.Stat(series.Resolve(sp, ref)); err != nil {
			t.Errorf("trial file %s: %v", ref.Path, err)
		}
	}

	u.leaveSeries(func() {})
	if u.series != nil {
		t.Fatal("the saved series did not close")
	}
	if err := u.OpenSeriesFile(sp); err != nil {
		t.Fatal(err)
	}
	v = pumpSeries(t, u, posts)
	if v.name != sampledata.SeriesName || v.opts != s.Options || len(v.trial) != 5 || v.dirty {
		t.Errorf("reopened: name %q options %+v, %d trials, dirty %v", v.name, v.opts, len(v.trial), v.dirty)
	}
	for _, st := range v.trial {
		if st.problem != "" {
			t.Errorf("%s: %s", st.fileName(), st.problem)
		}
	}
	if !slices.EqualFunc(before, v.w.means.rows, slices.Equal) {
		t.Errorf("reopened means table differs:\n%q\n%q", before, v.w.means.rows)
	}
}

// The workbook export (off the UI goroutine, through the export dialog's
// runner) writes a series workbook whose summary sheet, read back with
// excelize, holds the means across sites the view shows, at full
// precision.
func TestSeriesExportWorkbook(t *testing.T) {
	u, _ := newTestApp(t, 0)
	posts := seriesPosts(u)
	dir := t.TempDir()
	paths := writeDemoTrials(t, dir)
	sp := filepath.Join(dir, "wheat"+series.FileExt)
	writeSeriesFile(t, sp, paths, series.FileOptions{Trait: "yield"})
	if err := u.OpenSeriesFile(sp); err != nil {
		t.Fatal(err)
	}
	v := pumpSeries(t, u, posts)
	if v.res == nil {
		t.Fatalf("no analysis: %q", v.w.problem.Text)
	}
	out := filepath.Join(dir, "wheat.xlsx")
	wc, err := storage.Writer(storage.NewFileURI(out))
	if err != nil {
		t.Fatal(err)
	}
	done := make(chan error, 1)
	u.exported = func(_ fyne.URI, err error) { done <- err }
	u.runExport("series workbook", wc, true, v.exportJob())
	select {
	case err := <-done:
		if err != nil {
			t.Fatal(err)
		}
	case <-time.After(2 * time.Minute):
		t.Fatal("the export did not finish")
	}
	f, err := excelize.OpenFile(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows(xlsx.SeriesSummarySheet, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	// The first block of the summary is the trait shown.
	hr, hc := -1, -1
	for i, r := range rows {
		if c := slices.Index(r, "Mean across sites"); c >= 0 {
			hr, hc = i, c
			break
		}
	}
	if hr < 0 {
		t.Fatal("no 'Mean across sites' column on the summary sheet")
	}
	if !strings.Contains(strings.Join(rows[hr-2], " "), v.res.Trait.Name) {
		t.Errorf("the first trait of the summary is %q, want %s", rows[hr-2], v.res.Trait.Name)
	}
	for i, e := range v.res.Entries {
		var row []string
		for _, r := range rows[hr+1:] {
			if len(r) > 0 && r[0] == e.Code {
				row = r
				break
			}
		}
		if row == nil || hc >= len(row) {
			t.Fatalf("no summary row for %s", e.Code)
		}
		got, err := strconv.ParseFloat(row[hc], 64)
		if err != nil || math.Abs(got-v.res.Means[i].Mean) > 1e-12*math.Abs(v.res.Means[i].Mean) {
			t.Errorf("%s: workbook mean %q, view %v", e.Code, row[hc], v.res.Means[i].Mean)
		}
		shown := findRow(v.w.means.rows, e.Code)[slices.Index(v.w.means.head, "Mean")]
		if shown != fixed(got, analysis.MeanDecimals(v.res.Trait.Decimals)) {
			t.Errorf("%s: view shows %s, workbook %v", e.Code, shown, got)
		}
	}
	sheets := f.GetSheetList()
	if len(sheets) < 3 || sheets[0] != xlsx.SeriesCoverSheet {
		t.Errorf("sheets %q", sheets)
	}
}

// BenchmarkSeriesView40Sites measures a 40-site series of 300 entries in
// 4 blocks in the view: the analysis and charts (off the UI goroutine),
// and separately the work the UI goroutine does to show the result
// (ui-ms/op), which is what could freeze the window.
func BenchmarkSeriesView40Sites(b *testing.B) {
	u, _ := newTestApp(b, 0)
	posts := make(chan func(), 16)
	u.seriesPost = func(f func()) { posts <- f }
	u.NewSeries()
	v := u.series
	for j := range 40 {
		tr := bigTrial(b, 1200)
		tr.Site.Name = "Site " + strconv.Itoa(j+1)
		for i := range tr.Traits[0].Values {
			tr.Traits[0].Values[i] += 0.05*float64(j) + 0.01*float64((i*j)%13)
		}
		v.trial = append(v.trial, &seriesTrial{t: tr, ref: series.TrialRef{Path: "site" + strconv.Itoa(j+1) + ".furlong"}})
	}
	v.opts.Trait = "wt"
	var ui time.Duration
	for b.Loop() {
		v.analyse()
		f := <-posts
		start := time.Now()
		f()
		ui += time.Since(start)
		if v.res == nil {
			b.Fatalf("no result: %q", v.w.problem.Text)
		}
	}
	b.ReportMetric(float64(ui.Milliseconds())/float64(b.N), "ui-ms/op")
}
