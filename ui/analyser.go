package ui

import (
	"context"
	"errors"
	"sync"
	"time"

	"fyne.io/fyne/v2"
	"gonum.org/v1/plot"

	"furlong/trial"
	"furlong/trial/analysis"
)

// traitResult is the analysis of one trait, or why it failed.
type traitResult struct {
	key string
	res *analysis.Result
	err error
}

// resultSet is one round of analyses of a trial snapshot.
type resultSet struct {
	gen      uint64       // analyser generation
	snap     *trial.Trial // the data analysed
	alpha    float64
	focus    string // trait key the charts were drawn for
	traits   []traitResult
	complete bool // every trait analysed (not only the focus)
	charts   []chartImage
	took     time.Duration // until the focus trait's tables were ready
	// vsChecks are the comparisons of every entry with the trial's check
	// (Dunnett), by trait key, for the summary of all traits; filled on the
	// UI goroutine after the complete round (onChecks), nil until then.
	vsChecks map[string]*analysis.CheckComparison
}

// result returns the analysis of the trait with key, or nil.
func (s *resultSet) result(key string) *traitResult {
	if s == nil {
		return nil
	}
	for i := range s.traits {
		if s.traits[i].key == key {
			return &s.traits[i]
		}
	}
	return nil
}

// chartImage is a chart ready to draw, or the reason it could not be.
type chartImage struct {
	title string
	plot  *plot.Plot
	err   error
}

// analyser recomputes the analyses off the UI goroutine whenever the data
// change. Each round gets a generation number; a round that finishes after
// a newer one started is dropped, and starting a round cancels the older.
type analyser struct {
	u       *App
	gen     uint64
	stop    context.CancelFunc
	active  bool // a screen shows results
	stale   bool
	current *resultSet

	// onResults receives every round that is not stale (UI goroutine).
	onResults []func(*resultSet)
	// onChecks receives the current round again once its comparisons with
	// the check were added (resultSet.vsChecks; UI goroutine).
	onChecks []func(*resultSet)
	// delivered, when set, is called after each delivery (tests).
	delivered func(*resultSet)

	rounds sync.WaitGroup // running rounds
	// post hands a delivery to the UI goroutine: fyne.Do. (The test driver
	// runs fyne.Do at once on the calling goroutine; tests replace post to
	// run deliveries on the test goroutine, as the real driver runs them on
	// the main one.)
	post func(func())
}

func newAnalyser(u *App) *analyser { return &analyser{u: u, stale: true, post: fyne.Do} }

// dataChanged marks results stale and recomputes when a screen shows them.
func (a *analyser) dataChanged() {
	a.stale = true
	if a.active {
		a.run()
	}
}

// visible is called when Compare or Report is shown.
func (a *analyser) visible() {
	a.active = true
	if a.stale {
		a.run()
	}
}

// settingsChanged recomputes after the alpha or the focus trait changed.
func (a *analyser) settingsChanged() {
	a.stale = true
	a.run()
}

func (a *analyser) cancel() {
	if a.stop != nil {
		a.stop()
		a.stop = nil
	}
	a.gen++
	a.current = nil
	a.stale = true
	a.active = false
	a.onResults = nil
	a.onChecks = nil
}

// shutdown cancels the running round and waits until its goroutine ended.
func (a *analyser) shutdown() {
	if a.stop != nil {
		a.stop()
	}
	a.rounds.Wait()
	a.cancel()
}

// analysisOptions are the options of the analyses, from the Compare step's
// controls (or the preferences before it exists).
func (a *analyser) analysisOptions() analysis.Options {
	alpha := a.u.prefs.alpha
	if cs, ok := a.u.steps[stepCompare].(*compareStep); ok && cs != nil {
		alpha = cs.alpha
	}
	return analysis.Options{Alpha: alpha}
}

func (a *analyser) focusKey() string {
	if cs, ok := a.u.steps[stepCompare].(*compareStep); ok && cs != nil {
		return cs.traitKey
	}
	return ""
}

// run starts a round on a snapshot of the trial.
func (a *analyser) run() {
	if a.u.doc == nil {
		return
	}
	if a.stop != nil {
		a.stop()
	}
	ctx, stop := context.WithCancel(context.Background())
	a.stop = stop
	a.gen++
	a.stale = false
	gen := a.gen
	snap := cloneTrial(a.u.doc.t)
	opts := a.analysisOptions()
	focus := a.focusKey()
	method := a.u.prefs.method
	order := chartOrder(a.u.prefs.meansOrder)
	if cs, ok := a.u.steps[stepCompare].(*compareStep); ok && cs != nil {
		method = cs.method
	}
	if snap.Trait(focus) == nil && len(snap.Traits) > 0 {
		focus = snap.Traits[0].Key
	}
	a.rounds.Add(1)
	go func() {
		defer a.rounds.Done()
		start := time.Now()
		set := &resultSet{gen: gen, snap: snap, alpha: opts.Alpha, focus: focus}
		// The trait on screen first, with its charts, so that Compare
		// updates at once; then the rest for the summary.
		if focus != "" {
			tr := analyzeTrait(snap, focus, opts)
			set.traits = append(set.traits, tr)
			if ctx.Err() != nil {
				return
			}
			// Tables first, charts as soon as they are drawn.
			set.took = time.Since(start)
			tables := *set
			tables.traits = append([]traitResult(nil), set.traits...)
			a.post(func() { a.deliver(&tables) })
			set.charts = drawCharts(snap, tr, method, order)
			if ctx.Err() != nil {
				return
			}
			withCharts := tables
			withCharts.charts = set.charts
			a.post(func() { a.deliver(&withCharts) })
		}
		var rest []string
		for _, tr := range snap.Traits {
			if tr.Key != focus {
				rest = append(rest, tr.Key)
			}
		}
		more, err := analyzeRest(ctx, snap, rest, opts)
		if err != nil {
			return // stopped: a newer round runs
		}
		set.traits = append(set.traits, more...)
		// Keep the trial's trait order.
		ordered := make([]traitResult, 0, len(set.traits))
		for _, tr := range snap.Traits {
			if r := set.result(tr.Key); r != nil {
				ordered = append(ordered, *r)
			}
		}
		set.traits = ordered
		set.complete = true
		if set.took == 0 {
			set.took = time.Since(start)
		}
		a.post(func() { a.deliver(set) })
		// Then each entry against the trial's check, for the summary's
		// "vs check" column (as the season report's summary has it).
		checks := compareWithChecks(ctx, set.traits)
		if len(checks) == 0 || ctx.Err() != nil {
			return
		}
		a.post(func() {
			if set.gen != a.gen || a.current != set {
				return
			}
			set.vsChecks = checks
			for _, f := range a.onChecks {
				f(set)
			}
		})
	}()
}

// compareWithChecks compares every entry with the trial's check
// (analysis.CheckOf, CompareWithCheck: the rule of the report's summary)
// for each trait of one list of treatments that has one; a trait whose
// comparison fails is left out (its own view says why).
func compareWithChecks(ctx context.Context, traits []traitResult) map[string]*analysis.CheckComparison {
	out := map[string]*analysis.CheckComparison{}
	for _, tr := range traits {
		if ctx.Err() != nil {
			return nil
		}
		r := tr.res
		if r == nil || r.IsFactorial() {
			continue
		}
		code := analysis.CheckOf(r)
		if code == "" {
			continue
		}
		if vc, err := summaryCheck(r, code); err == nil && vc != nil {
			out[tr.key] = vc
		}
	}
	return out
}

// deliver hands a round to the screens unless a newer one has started.
func (a *analyser) deliver(s *resultSet) {
	if s.gen != a.gen {
		return
	}
	a.current = s
	for _, f := range a.onResults {
		f(s)
	}
	if a.delivered != nil {
		a.delivered(s)
	}
}

// analyzeTrait analyses one trait, turning a panic in the statistics into
// an error so that a bad data set never takes the window down.
func analyzeTrait(t *trial.Trial, key string, opts analysis.Options) (tr traitResult) {
	tr.key = key
	defer func() {
		if p := recover(); p != nil {
			tr.res, tr.err = nil, errAnalysisFailed
		}
	}()
	tr.res, tr.err = analyzeFunc(t, key, opts)
	return tr
}

// summaryCheck is analysis.CompareWithCheck with a panic turned into an
// error (off the UI goroutine).
func summaryCheck(r *analysis.Result, code string) (vc *analysis.CheckComparison, err error) {
	defer func() {
		if e := recover(); e != nil {
			vc, err = nil, errAnalysisFailed
		}
	}()
	return analysis.CompareWithCheck(r, code)
}

// analyzeRest analyses the traits of keys by the one per-trait loop
// (analysis.AnalyzeAll: one worker per processor), for the summary after
// the trait on screen. Should the statistics panic on one trait, each is
// analysed again on its own so that only that trait shows the failure. It
// returns ctx's error when the round was stopped.
func analyzeRest(ctx context.Context, t *trial.Trial, keys []string, opts analysis.Options) ([]traitResult, error) {
	if len(keys) == 0 {
		return nil, nil
	}
	outs, err := safeAnalyzeAll(ctx, t, keys, opts)
	if errors.Is(err, errAnalysisFailed) {
		out := make([]traitResult, 0, len(keys))
		for _, k := range keys {
			if ctx.Err() != nil {
				return nil, ctx.Err()
			}
			out = append(out, analyzeTrait(t, k, opts))
		}
		return out, nil
	}
	if err != nil {
		return nil, err
	}
	out := make([]traitResult, len(outs))
	for i, oc := range outs {
		out[i] = traitResult{key: oc.Key, res: oc.Result, err: oc.Err}
	}
	return out, nil
}

// safeAnalyzeAll is analysis.AnalyzeAll with a panic (raised again on this
// goroutine by its workers) turned into errAnalysisFailed.
func safeAnalyzeAll(ctx context.Context, t *trial.Trial, keys []string, opts analysis.Options) (outs []analysis.Outcome, err error) {
	defer func() {
		if p := recover(); p != nil {
			outs, err = nil, errAnalysisFailed
		}
	}()
	return analysis.AnalyzeAll(ctx, t, keys, opts)
}
