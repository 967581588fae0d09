package ui

import (
	"context"
	"fmt"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/widget"
	"gonum.org/v1/plot"

	"furlong/export/chart"
	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// planPanel is the planning part of Setup's Design tab: for the design and
// replicates chosen in the tab (applied or not) and the trial's number of
// treatments, the smallest difference between two means (percent of the
// mean) that the two-sided t test detects with the chosen power, at a CV
// typed or taken from a trial's analysis; optionally the replicates needed
// for a target difference; and a chart of the detectable difference
// against replicates. Nothing here changes the trial. The computations run
// off the UI goroutine and come back through the analyser's post (fyne.Do).
type planPanel struct {
	d       *designTab
	content fyne.CanvasObject

	cv       *widget.Entry
	cvFrom   *widget.Select // traits of the trial the CV was taken from
	cvOther  *widget.Button
	cvThis   *widget.Button
	power    *widget.Select
	alpha    *widget.Select
	target   *widget.Entry
	result   *widget.Label
	chartBox *fyne.Container

	// sources are the CVs the select offers (its options, in order).
	sources []cvSource
	ready   bool   // every widget is made: updates may run
	gen     uint64 // computations started; a late one is dropped
	// shown is the last plan shown (tests).
	shown *planOutcome
	// done, when set, is called after a plan or a CV source was shown
	// (tests).
	done func()
}

// cvSource is the CV% of one analysed trait of a trial.
type cvSource struct {
	label string
	cv    float64
}

// planOutcome is one computed plan.
type planOutcome struct {
	kind        trial.DesignKind
	treatments  int
	reps, df    int
	cv          float64
	alpha       float64
	power       float64
	detectable  float64
	target      float64 // 0: none asked
	repsNeeded  int     // 0: none asked, or not reachable
	targetProbl string  // why the target cannot be reached
	curve       []analysis.PlanPoint
	plot        *plot.Plot
	err         error
}

// planChartSize is the size of the planning chart: small enough to show
// whole under the controls at 1366 × 768, as it has few labels.
var planChartSize = fyne.NewSize(460, 290)

var powerChoices = []string{"0.8", "0.9", "0.95"}

func newPlanPanel(d *designTab) *planPanel {
	p := &planPanel{d: d}
	p.cv = widget.NewEntry()
	p.cv.SetPlaceHolder("expected CV %, e.g. 8")
	p.cv.OnChanged = func(string) { p.update() }
	p.cvFrom = widget.NewSelect(nil, func(s string) {
		if i := slices.IndexFunc(p.sources, func(c cvSource) bool { return c.label == s }); i >= 0 {
			p.cv.SetText(strconv.FormatFloat(roundTo(p.sources[i].cv, 2), 'f', -1, 64))
		}
	})
	p.cvFrom.PlaceHolder = "(take the CV from a trial)"
	p.cvThis = widget.NewButton("This trial", func() {
		p.loadSources(cloneTrial(d.t()), "this trial")
	})
	p.cvOther = widget.NewButton("Another trial…", p.chooseTrial)
	p.power = widget.NewSelect(powerChoices, func(string) { p.update() })
	p.power.SetSelected("0.8")
	p.alpha = widget.NewSelect(alphaChoices, func(string) { p.update() })
	p.alpha.SetSelected("0.05")
	p.target = widget.NewEntry()
	p.target.SetPlaceHolder("optional: a difference to detect, % of the mean")
	p.target.OnChanged = func(string) { p.update() }
	p.result = widget.NewLabel("")
	p.result.Wrapping = fyne.TextWrapWord
	p.chartBox = container.NewStack()
	form := widget.NewForm(
		widget.NewFormItem("Expected CV %", p.cv),
		widget.NewFormItem("Take the CV from", container.NewBorder(nil, nil, nil, container.NewHBox(p.cvThis, p.cvOther), p.cvFrom)),
		widget.NewFormItem("Power", p.power),
		widget.NewFormItem("Significance level", p.alpha),
		widget.NewFormItem("Difference to detect", p.target),
	)
	note := widget.NewLabel("A plan rests on the CV expected next season; a CV from one site-year may not repeat. Nothing here changes the trial.")
	note.Wrapping = fyne.TextWrapWord
	note.Importance = widget.LowImportance
	p.content = container.NewVBox(heading("Planning: the difference this design can detect"), form, p.result, p.chartBox, note)
	p.ready = true
	return p
}

func roundTo(v float64, dec int) float64 {
	s := strconv.FormatFloat(v, 'f', dec, 64)
	r, _ := strconv.ParseFloat(s, 64)
	return r
}

// chooseTrial takes the CVs from another trial file.
func (p *planPanel) chooseTrial() {
	p.d.u.chooseFile(chooseOptions{title: "Take the CV from a trial", exts: []string{".furlong"}, confirm: "Use"}, func(path string) {
		p.result.SetText("Reading " + filepath.Base(path) + "…")
		go func() {
			t, err := trialfile.Load(path)
			p.d.u.compute.post(func() {
				if err != nil {
					showError(p.d.u.win, "Could not read the trial", "The CV cannot be taken from "+filepath.Base(path), err)
					p.update()
					return
				}
				p.loadSources(t, filepath.Base(path))
			})
		}()
	})
}

// loadSources analyses every trait of t off the UI goroutine and offers
// their CVs; the yield's (or the first) is taken at once.
func (p *planPanel) loadSources(t *trial.Trial, name string) {
	p.result.SetText("Analysing " + name + " for its CVs…")
	go func() {
		var srcs []cvSource
		outs, err := analysis.AnalyzeAll(context.Background(), t, nil, analysis.Options{})
		if err == nil {
			for _, oc := range outs {
				if oc.Err != nil || oc.Result == nil || oc.Result.ANOVA == nil || !(oc.Result.ANOVA.CVPercent > 0) {
					continue
				}
				r := oc.Result
				label := fmt.Sprintf("%s: %s (CV %.1f %%)", name, r.TraitName, r.ANOVA.CVPercent)
				if r.Transform != stats.NoTransform {
					label += " on the " + r.Transform.Scale() + " scale"
				}
				srcs = append(srcs, cvSource{label: label, cv: r.ANOVA.CVPercent})
			}
		}
		yield := trial.YieldTrait(t.Traits)
		pick := 0
		if yield >= 0 {
			for i, s := range srcs {
				if strings.Contains(s.label, ": "+t.Traits[yield].Name+" (") {
					pick = i
				}
			}
		}
		p.d.u.compute.post(func() {
			if len(srcs) == 0 {
				p.result.SetText("No CV can be taken from " + name + ": none of its traits can be analysed yet. Type the CV expected instead.")
				p.finished()
				return
			}
			p.sources = srcs
			opts := make([]string, len(srcs))
			for i, s := range srcs {
				opts[i] = s.label
			}
			p.cvFrom.SetOptions(opts)
			p.cvFrom.SetSelected(opts[pick]) // sets the CV, which updates the plan
		})
	}()
}

// inputs reads the design tab and the panel; msg says what is missing.
func (p *planPanel) inputs() (o planOutcome, msg string) {
	d := p.d
	i := slices.Index(designLabels, d.designSel.Selected)
	if i < 0 {
		return o, "Choose a design above to see what it can detect."
	}
	o.kind = designKinds[i]
	if o.kind.Restricted() {
		return o, "The detectable difference of a " + o.kind.Name() + " depends on the stratum of each comparison (main plots or subplots), which this planning view does not cover yet; it plans completely randomised, block and Latin square designs."
	}
	o.treatments = len(d.t().Treatments)
	if o.treatments < 2 {
		return o, "Add at least two treatments (Treatments tab) to plan the comparisons."
	}
	n, err := strconv.Atoi(strings.TrimSpace(d.reps.Text))
	if o.kind == trial.Latin {
		n, err = o.treatments, nil
	}
	if err != nil {
		return o, "Type the number of replicates above, for example 4."
	}
	o.reps = n
	cvText := strings.TrimSpace(p.cv.Text)
	if cvText == "" {
		return o, "Type the CV % expected, or take it from this or another trial."
	}
	cv, err := trial.ParseNumber(cvText, trial.PointOrComma)
	if err != nil || !(cv > 0) {
		return o, "The CV “" + cvText + "” is not a percentage greater than 0; type it as a number, for example 8."
	}
	o.cv = cv
	o.alpha, _ = strconv.ParseFloat(p.alpha.Selected, 64)
	o.power, _ = strconv.ParseFloat(p.power.Selected, 64)
	if tt := strings.TrimSpace(p.target.Text); tt != "" {
		v, err := trial.ParseNumber(tt, trial.PointOrComma)
		if err != nil || !(v > 0) {
			return o, "The difference to detect “" + tt + "” is not a percentage greater than 0; type it as a number, for example 10, or leave it empty."
		}
		o.target = v
	}
	return o, ""
}

// update recomputes the plan for the controls' values.
func (p *planPanel) update() {
	if p == nil || !p.ready {
		return // the tab is still being built
	}
	o, msg := p.inputs()
	p.gen++
	gen := p.gen
	if msg != "" {
		p.result.SetText(msg)
		p.chartBox.Objects = nil
		p.chartBox.Refresh()
		p.shown = nil
		p.finished()
		return
	}
	go func() {
		out := computePlan(o)
		p.d.u.compute.post(func() {
			if gen != p.gen {
				return
			}
			p.display(out)
		})
	}()
}

// computePlan computes a plan (off the UI goroutine).
func computePlan(o planOutcome) (out *planOutcome) {
	out = &o
	defer func() {
		if r := recover(); r != nil {
			out.err = errAnalysisFailed
		}
	}()
	df, err := trial.PlannedErrorDF(o.kind, o.treatments, o.reps)
	if err != nil {
		out.err = err
		return out
	}
	out.df = df
	out.detectable, err = stats.DetectableDifference(stats.PowerInput{Reps: o.reps, DFError: float64(df), CV: o.cv, Alpha: o.alpha}, o.power)
	if err != nil {
		out.err = err
		return out
	}
	if o.target > 0 && o.kind != trial.Latin {
		dfOf := func(r int) float64 {
			df, err := trial.PlannedErrorDF(o.kind, o.treatments, r)
			if err != nil {
				return 0
			}
			return float64(df)
		}
		r, _, err := stats.RepsNeeded(o.target, o.cv, o.alpha, o.power, trial.MinReps, trial.MaxReps, dfOf)
		if err != nil {
			out.targetProbl = fmt.Sprintf("%d replicates are not enough to detect %g %% at this CV.", trial.MaxReps, o.target)
		} else {
			out.repsNeeded = r
		}
	}
	out.curve, err = analysis.PlanCurve(context.Background(), o.kind, o.treatments, o.reps, o.cv, o.alpha, o.power)
	if err != nil {
		out.err = err
		return out
	}
	if len(out.curve) > 1 {
		out.plot, _ = chart.Detectable(out.curve, o.reps, fmt.Sprintf("%s of %d treatments, CV %g %%", designShort(o.kind), o.treatments, o.cv))
	}
	return out
}

// display shows a computed plan (UI goroutine).
func (p *planPanel) display(o *planOutcome) {
	defer p.finished()
	p.shown = o
	p.chartBox.Objects = nil
	defer p.chartBox.Refresh()
	if o.err != nil {
		m := explain("This design cannot be planned", o.err)
		p.result.SetText(strings.TrimSpace(m.What + " " + m.Do))
		return
	}
	pct := strconv.FormatFloat(100*o.power, 'f', -1, 64)
	txt := fmt.Sprintf("With %d replicates (error df %d) the design detects a difference of %.1f %% of the mean between two treatments, with probability %s %% (two-sided t test at %g).",
		o.reps, o.df, o.detectable, pct, o.alpha)
	switch {
	case o.target > 0 && o.kind == trial.Latin:
		txt += " A Latin square has as many replicates as treatments, so the replicates cannot be chosen for a target."
	case o.repsNeeded > 0:
		txt += fmt.Sprintf(" To detect %g %%: %s.", o.target, plural(o.repsNeeded, "replicate", "replicates"))
	case o.targetProbl != "":
		txt += " " + o.targetProbl
	}
	p.result.SetText(txt)
	if o.plot != nil {
		v := newChartView(o.plot)
		v.min = planChartSize
		p.chartBox.Objects = []fyne.CanvasObject{v}
	}
}

func (p *planPanel) finished() {
	if p.done != nil {
		p.done()
	}
}

// designShort is a design's short name for a chart title.
func designShort(k trial.DesignKind) string {
	if k == trial.Latin {
		return "Latin square"
	}
	return strings.ToUpper(string(k))
}
