package ui

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"time"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/dialog"
	"fyne.io/fyne/v2/widget"

	"furlong/export/xlsx"
	"furlong/sampledata"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/series"
	"furlong/trial/trialfile"
)

// The series view: a trial series (the same entries at several sites or
// seasons, trial/series) in the window, outside the five steps of one
// trial. It takes the whole window while it is open (File › Close series
// goes back); no trial is open meanwhile. Its trials are only read, never
// changed; the analysis and the reading of trial files run off the UI
// goroutine and come back through post (fyne.Do).

// seriesTrial is one trial of the open series.
type seriesTrial struct {
	// path is the trial file's absolute path; "" for a demo trial not
	// written to a file yet (demo then holds it).
	path string
	// ref is the trial's reference as the series file has (or will have)
	// it: its identity is that of the file as read.
	ref  series.TrialRef
	t    *trial.Trial // nil while loading or when it cannot be read
	demo *sampledata.SeriesTrial
	// loading is true while the file is being read.
	loading bool
	// problem says in words what is wrong with the file (missing,
	// changed since it was added, unreadable); "" when nothing.
	problem string
	// missing is true when the file is gone or unreadable.
	missing bool
}

// fileName is the trial's file name, for lists and messages.
func (st *seriesTrial) fileName() string {
	switch {
	case st.path != "":
		return filepath.Base(st.path)
	case st.demo != nil:
		return st.demo.FileName
	}
	return filepath.Base(filepath.FromSlash(st.ref.Path))
}

// seriesView is the open series and its screen.
type seriesView struct {
	u *App

	path  string // the series file; "" until saved
	name  string
	opts  series.FileOptions
	trial []*seriesTrial
	// method and alpha of the letters (not kept in the series file: the
	// user's preferences are the defaults).
	method meansep.Method
	alpha  float64
	dirty  bool

	// The analysis: gen numbers the requests; one runs at a time, the
	// newest waits in pending.
	gen              uint64
	running, pending bool
	res              *series.Result
	resErr           error
	charts           []chartImage
	took             time.Duration

	// post brings work back to the UI goroutine (fyne.Do; tests queue it).
	post func(func())
	// analysed, when set, runs after every result was shown (tests).
	analysed func()
	// loaded, when set, runs after every trial file read was taken in
	// (tests).
	loaded func()

	w seriesWidgets
}

// seriesName is the name a new series gets.
const seriesNewName = "New series"

func newSeriesView(u *App) *seriesView {
	v := &seriesView{u: u, name: seriesNewName, method: u.prefs.method, alpha: u.prefs.alpha, post: fyne.Do}
	if u.seriesPost != nil {
		v.post = u.seriesPost
	}
	v.build()
	return v
}

// enterSeries shows the series view v instead of the trial steps, once the
// open trial (if any) is dealt with: its unsaved changes saved or dropped
// as the user chooses, then closed.
func (u *App) enterSeries(build func() *seriesView) {
	u.leaveSeries(func() {
		u.leaveOpen("Open the series", func() {
			u.closeDocument()
			v := build()
			if v == nil {
				u.showStart()
				return
			}
			u.series = v
			if u.seriesPrev == nil {
				u.seriesPrev = u.win.Content()
			}
			u.win.SetContent(v.w.root)
			v.updateTitle()
			u.updateMenus()
		})
	})
}

// leaveSeries closes the open series, asking first about unsaved changes,
// then runs then (at once when no series is open).
func (u *App) leaveSeries(then func()) {
	v := u.series
	if v == nil {
		then()
		return
	}
	closeIt := func() {
		u.series = nil
		if u.seriesPrev != nil {
			u.win.SetContent(u.seriesPrev)
			u.seriesPrev = nil
		}
		if u.doc == nil {
			u.showStart() // what comes next (a trial, another series, quitting) replaces it
		}
		then()
	}
	if !v.dirty {
		closeIt()
		return
	}
	var d dialog.Dialog
	save := widget.NewButton("Save", func() {
		d.Hide()
		v.save(false, closeIt)
	})
	save.Importance = widget.HighImportance
	discard := widget.NewButton("Close without saving", func() {
		d.Hide()
		closeIt()
	})
	cancel := widget.NewButton("Cancel", func() { d.Hide() })
	text := widget.NewLabel("The series “" + v.name + "” has changes that are not saved to a series file (its trials, its options or its name).")
	text.Wrapping = fyne.TextWrapWord
	d = dialog.NewCustomWithoutButtons("Save the series?", container.NewVBox(text, container.NewHBox(cancel, discard, save)), u.win)
	d.Resize(fyne.NewSize(480, 190))
	d.Show()
	closeOnEscape(u.win, d)
}

// NewSeries opens an empty series.
func (u *App) NewSeries() {
	u.enterSeries(func() *seriesView {
		v := newSeriesView(u)
		v.refreshAll()
		return v
	})
}

// OpenDemoSeries opens the built-in demo series (five fictional sites) as a
// new series whose trials have no files yet; Save as writes them beside
// the series file. A failure is explained in a dialog, and the error
// returned.
func (u *App) OpenDemoSeries() error {
	trials, err := sampledata.SeriesTrials()
	if err != nil {
		showError(u.win, "Could not open the demo series", "The demo series could not be opened", err)
		return err
	}
	u.enterSeries(func() *seriesView {
		v := newSeriesView(u)
		v.name = sampledata.SeriesName
		v.opts.Trait = "yield"
		for i := range trials {
			v.trial = append(v.trial, &seriesTrial{demo: &trials[i], t: trials[i].Trial,
				ref: series.TrialRef{Path: trials[i].FileName}})
		}
		v.refreshAll()
		return v
	})
	return nil
}

// OpenSeriesFile opens the series file at path: its trials are read in
// the background, and a trial file that is missing or has changed since
// it was added is named in the Trials tab. A series file that cannot be
// read is explained in a dialog, and the error returned.
func (u *App) OpenSeriesFile(path string) error {
	f, err := os.Open(path)
	var s *series.Series
	if err == nil {
		s, err = series.Decode(f)
		f.Close()
	}
	if err != nil {
		showMessage(u.win, "Could not open the series", explain("The series file "+filepath.Base(path)+" could not be opened", err))
		return err
	}
	if abs, err := filepath.Abs(path); err == nil {
		path = abs
	}
	u.enterSeries(func() *seriesView {
		v := newSeriesView(u)
		v.path, v.name, v.opts = path, s.Name, s.Options
		if strings.TrimSpace(v.name) == "" {
			v.name = strings.TrimSuffix(filepath.Base(path), series.FileExt)
		}
		for _, ref := range s.Trials {
			v.trial = append(v.trial, &seriesTrial{path: series.Resolve(path, ref), ref: ref, loading: true})
		}
		u.prefs.onLastFolderChanged(filepath.Dir(path))
		v.refreshAll()
		v.load(v.trial, s)
		return v
	})
	return nil
}

// openSeriesDialog asks for a series file to open.
func (u *App) openSeriesDialog() {
	u.chooseFile(chooseOptions{title: "Open a series", exts: []string{series.FileExt}}, func(p string) { _ = u.OpenSeriesFile(p) })
}

// load reads the trial files of sts in the background (with s, the
// series file they come from, checked for missing and changed files).
func (v *seriesView) load(sts []*seriesTrial, s *series.Series) {
	seriesPath := v.path
	type got struct {
		t       *trial.Trial
		ref     series.TrialRef
		err     error
		problem *series.Problem
	}
	paths := make([]string, len(sts))
	for i, st := range sts {
		st.loading = true
		paths[i] = st.path
	}
	go func() {
		var problems []series.Problem
		if s != nil {
			problems = series.Check(seriesPath, s)
		}
		out := make([]got, len(sts))
		for i, p := range paths {
			for k := range problems {
				if s != nil && i < len(s.Trials) && problems[k].Path == s.Trials[i].Path {
					out[i].problem = &problems[k]
				}
			}
			if out[i].problem != nil && out[i].problem.Missing {
				continue
			}
			out[i].t, out[i].err = trialfile.Load(p)
			if out[i].err == nil {
				base := seriesPath
				if base == "" {
					base = p
				}
				out[i].ref, out[i].err = series.Ref(base, p)
			}
		}
		v.post(func() {
			for i, st := range sts {
				st.loading = false
				g := out[i]
				switch {
				case g.problem != nil && g.problem.Missing:
					st.missing, st.problem = true, g.problem.Msg
				case g.err != nil:
					m := explain("The trial file "+st.fileName()+" could not be read", g.err)
					st.missing, st.problem = true, m.What+" "+m.Do
				default:
					st.t, st.missing = g.t, false
					st.ref.Size, st.ref.ModTime, st.ref.SHA256 = g.ref.Size, g.ref.ModTime, g.ref.SHA256
					if s == nil {
						st.ref.Path = g.ref.Path
					}
					st.problem = ""
					if g.problem != nil {
						st.problem = g.problem.Msg
					}
				}
			}
			v.refreshAll()
			if v.loaded != nil {
				v.loaded()
			}
		})
	}()
}

// addDialog asks for a trial file to add; then offers the other trial
// files of its folder.
func (v *seriesView) addDialog() {
	v.u.chooseFile(chooseOptions{title: "Add a trial to the series", exts: []string{trialExt}, confirm: "Add"}, func(p string) {
		if !v.add(p) {
			return
		}
		v.offerFolder(filepath.Dir(p))
	})
}

// add adds the trial file at path (read in the background); false when it
// is already in the series (which is said).
func (v *seriesView) add(path string) bool {
	if abs, err := filepath.Abs(path); err == nil {
		path = abs
	}
	for _, st := range v.trial {
		if st.path == path {
			dialog.ShowInformation("Already in the series", filepath.Base(path)+" is already a trial of this series.", v.u.win)
			return false
		}
	}
	st := &seriesTrial{path: path, ref: series.TrialRef{Path: filepath.ToSlash(path)}, loading: true}
	v.trial = append(v.trial, st)
	v.setDirty()
	v.refreshAll()
	v.load([]*seriesTrial{st}, nil)
	return true
}

// offerFolder offers to add the other trial files of dir too.
func (v *seriesView) offerFolder(dir string) {
	ents, err := os.ReadDir(dir)
	if err != nil {
		return
	}
	var more []string
	for _, e := range ents {
		n := e.Name()
		if e.IsDir() || strings.HasPrefix(n, ".") || !strings.EqualFold(filepath.Ext(n), trialExt) {
			continue
		}
		p := filepath.Join(dir, n)
		if !slices.ContainsFunc(v.trial, func(st *seriesTrial) bool { return st.path == p }) {
			more = append(more, p)
		}
	}
	if len(more) == 0 {
		return
	}
	names := make([]string, 0, 6)
	for i, p := range more {
		if i == 5 {
			names = append(names, fmt.Sprintf("and %d more", len(more)-5))
			break
		}
		names = append(names, filepath.Base(p))
	}
	them := "them"
	if len(more) == 1 {
		them = "it"
	}
	dialog.ShowConfirm("Add the other trials of the folder?", fmt.Sprintf("The folder “%s” also holds %s: %s.\n\nAdd %s to the series too?",
		filepath.Base(dir), plural(len(more), "other trial file", "other trial files"), strings.Join(names, ", "), them),
		func(ok bool) {
			if !ok {
				return
			}
			for _, p := range more {
				v.add(p)
			}
		}, v.u.win)
}

// locateDialog asks where the missing trial file of st is now.
func (v *seriesView) locateDialog(st *seriesTrial) {
	v.u.chooseFile(chooseOptions{title: "Where is " + st.fileName() + "?", exts: []string{trialExt}, confirm: "Use this file"}, func(p string) {
		v.locate(st, p)
	})
}

// locate takes the trial file at path for the missing trial st (read in
// the background).
func (v *seriesView) locate(st *seriesTrial, path string) {
	if abs, err := filepath.Abs(path); err == nil {
		path = abs
	}
	if slices.ContainsFunc(v.trial, func(x *seriesTrial) bool { return x != st && x.path == path }) {
		dialog.ShowInformation("Already in the series", filepath.Base(path)+" is already a trial of this series.", v.u.win)
		return
	}
	st.path, st.ref = path, series.TrialRef{Path: filepath.ToSlash(path)}
	st.missing, st.problem = false, ""
	v.setDirty()
	v.load([]*seriesTrial{st}, nil)
	v.refreshAll()
}

// remove takes trial st out of the series.
func (v *seriesView) remove(st *seriesTrial) {
	i := slices.Index(v.trial, st)
	if i < 0 {
		return
	}
	v.trial = slices.Delete(v.trial, i, i+1)
	v.setDirty()
	v.refreshAll()
}

func (v *seriesView) setDirty() {
	v.dirty = true
	v.updateTitle()
}

func (v *seriesView) updateTitle() {
	t := "Furlong — Series: " + v.name
	if v.dirty {
		t += " •"
	}
	v.u.win.SetTitle(t)
}

// loadedTrials are the trials read, with the paths that name them.
func (v *seriesView) loadedTrials() ([]*trial.Trial, []string) {
	var ts []*trial.Trial
	var ps []string
	for _, st := range v.trial {
		if st.t != nil {
			ts = append(ts, st.t)
			p := st.path
			if p == "" {
				p = st.fileName()
			}
			ps = append(ps, p)
		}
	}
	return ts, ps
}

// analysisOptions are the options of the analysis as chosen.
func (v *seriesView) analysisOptions() series.Options {
	sites, _ := series.ParseSites(v.opts.Sites)
	return series.Options{Check: v.opts.Check, Sites: sites, Weighted: v.opts.Weighting == series.WeightStage1, Alpha: v.alpha, Method: v.method}
}

// analyse starts the analysis of the trait chosen (or queues it behind
// the one running).
func (v *seriesView) analyse() {
	v.gen++
	if v.running {
		v.pending = true
		return
	}
	trials, paths := v.loadedTrials()
	key := v.opts.Trait
	switch {
	case v.stillLoading():
		v.showProblem("Reading the trial files…")
		return
	case len(trials) < 2:
		v.showProblem("A series needs at least two trials (sites or seasons) whose files can be read. Add trial files with “Add trial…”; entries are matched by their treatment codes.")
		return
	case key == "":
		v.showProblem("The trials have no trait in common (a series matches traits by key). Give the trait the same key in every trial, or remove the trial that lacks it.")
		return
	}
	gen, opts, name, method := v.gen, v.analysisOptions(), v.name, v.method
	v.running = true
	v.w.state.SetText("computing…")
	go func() {
		start := time.Now()
		tr, sites, err := series.FromTrials(trials, paths, key)
		var res *series.Result
		if err == nil {
			res, err = series.Analyze(tr, sites, opts)
		}
		var charts []chartImage
		if err == nil {
			charts = drawSeriesCharts(res, name, method)
		}
		took := time.Since(start)
		v.post(func() {
			v.running = false
			if gen == v.gen {
				v.res, v.resErr, v.charts, v.took = res, err, charts, took
				v.showResult()
			}
			if v.pending {
				v.pending = false
				v.gen-- // analyse numbers it again
				v.analyse()
			}
			if gen == v.gen && v.analysed != nil {
				v.analysed()
			}
		})
	}()
}

func (v *seriesView) stillLoading() bool {
	return slices.ContainsFunc(v.trial, func(st *seriesTrial) bool { return st.loading })
}

// save writes the series file (asking where when it has none, or asNew);
// then runs after it succeeded.
func (v *seriesView) save(asNew bool, then func()) {
	if v.path == "" || asNew {
		name := v.name
		if v.path != "" {
			name = strings.TrimSuffix(filepath.Base(v.path), series.FileExt)
		}
		v.u.chooseFile(chooseOptions{title: "Save the series as", save: true, exts: []string{series.FileExt},
			name: safeFileName(name) + series.FileExt}, func(p string) {
			if v.saveTo(p) && then != nil {
				then()
			}
		})
		return
	}
	if v.saveTo(v.path) && then != nil {
		then()
	}
}

// saveTo writes the series file at path; demo trials without a file are
// first written beside it. A failure is explained in a dialog.
func (v *seriesView) saveTo(path string) bool {
	if err := v.writeFile(path); err != nil {
		showError(v.u.win, "Could not save the series", "The series could not be saved to "+path, err)
		return false
	}
	v.path, v.dirty = path, false
	v.u.prefs.onLastFolderChanged(filepath.Dir(path))
	v.w.saved.SetText("Saved to " + filepath.Base(path) + " at " + time.Now().Format("15:04:05") + ".")
	v.updateTitle()
	v.refreshTrials()
	return true
}

// writeFile writes the series file at path.
func (v *seriesView) writeFile(path string) error {
	dir := filepath.Dir(path)
	for _, st := range v.trial {
		if st.path != "" || st.demo == nil {
			continue
		}
		p, err := freeName(dir, st.demo.FileName)
		if err != nil {
			return err
		}
		if err := trialfile.Save(p, st.t); err != nil {
			return err
		}
		st.path = p
		ref, err := series.Ref(path, p)
		if err != nil {
			return err
		}
		st.ref = ref
	}
	s := &series.Series{Name: v.name, Options: v.opts}
	if s.Options.Weighting == "" {
		s.Options.Weighting = series.WeightNone
	}
	for _, st := range v.trial {
		ref := st.ref
		if st.t != nil {
			// The path relative to the series file as it is now; the
			// identity of the file as it was read.
			r, err := series.Ref(path, st.path)
			if err != nil {
				return err
			}
			ref.Path = r.Path
		} else if v.path != path {
			ref.Path = filepath.ToSlash(st.path) // a missing file: where it was looked for
		}
		s.Trials = append(s.Trials, ref)
	}
	if err := series.Save(path, s); err != nil {
		return err
	}
	for _, st := range v.trial {
		if !st.missing {
			st.problem = "" // changed files are in the series as read
		}
	}
	return nil
}

// freeName is name in dir, or name-2, name-3, ... when that exists.
func freeName(dir, name string) (string, error) {
	ext := filepath.Ext(name)
	base := strings.TrimSuffix(name, ext)
	for i := 1; i < 1000; i++ {
		n := name
		if i > 1 {
			n = fmt.Sprintf("%s-%d%s", base, i, ext)
		}
		p := filepath.Join(dir, n)
		if _, err := os.Stat(p); errors.Is(err, os.ErrNotExist) {
			return p, nil
		}
	}
	return "", fmt.Errorf("the folder %s already holds many copies of %s; choose another folder", dir, name)
}

// exportDialog asks where to write the series workbook.
func (v *seriesView) exportDialog() {
	if len(v.traitKeys()) == 0 {
		dialog.ShowInformation("Nothing to export", "Add at least two trials with a trait in common first.", v.u.win)
		return
	}
	v.u.exportDialog("series workbook", safeFileName(v.name)+".xlsx", []string{".xlsx"}, true, v.exportJob())
}

// exportJob writes the series workbook of every trait the trials share
// (the trait shown first) with the options chosen; traits that cannot be
// analysed are left out and named under the tabs.
func (v *seriesView) exportJob() exportJob {
	trials, paths := v.loadedTrials()
	keys := v.traitKeys()
	if i := slices.Index(keys, v.opts.Trait); i > 0 {
		keys = append([]string{keys[i]}, slices.Delete(slices.Clone(keys), i, i+1)...)
	}
	opts, name, version := v.analysisOptions(), v.name, v.u.opts.Version
	note := v.w.exportNote
	return func(ctx context.Context, w io.Writer, _ string, progress func(done, total int)) error {
		var results []*series.Result
		var left []string
		for i, k := range keys {
			progress(i, len(keys)+1)
			if err := ctx.Err(); err != nil {
				return err
			}
			tr, sites, err := series.FromTrials(trials, paths, k)
			var res *series.Result
			if err == nil {
				res, err = series.Analyze(tr, sites, opts)
			}
			if err != nil {
				left = append(left, k+" ("+lowerFirst(err.Error())+")")
				continue
			}
			results = append(results, res)
		}
		if len(results) == 0 {
			return fmt.Errorf("no trait of the series could be analysed: %s", strings.Join(left, "; "))
		}
		text := ""
		if len(left) > 0 {
			text = "The workbook leaves out " + strings.Join(left, "; ")
		}
		fyne.Do(func() { note.SetText(text) })
		err := xlsx.WriteSeries(w, results, xlsx.SeriesOptions{Name: name, Version: version, Now: time.Now(), Charts: true})
		progress(len(keys)+1, len(keys)+1)
		return err
	}
}

// traitKeys are the keys of the traits every trial read has.
func (v *seriesView) traitKeys() []string {
	trials, _ := v.loadedTrials()
	if len(trials) < 2 {
		return nil
	}
	return series.CommonTraits(trials)
}

// saveCommand is File › Save (Save as with asNew): the series while one is
// open, else the trial.
func (u *App) saveCommand(asNew bool) {
	if u.series != nil {
		u.series.save(asNew, nil)
		return
	}
	u.save(asNew, nil)
}

// exportCommand is File › Export: the series workbook while a series is
// open, else the trial's Report step.
func (u *App) exportCommand() {
	if u.series != nil {
		u.series.exportDialog()
		return
	}
	u.showStep(stepReport)
}

// closeCommand is File › Close: the series while one is open, else the
// trial.
func (u *App) closeCommand() {
	if u.series != nil {
		u.leaveSeries(func() {})
		return
	}
	u.closeTrial()
}
