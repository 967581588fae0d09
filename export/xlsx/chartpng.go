package xlsx

import (
	"bytes"
	"context"
	"fmt"
	"runtime"

	"gonum.org/v1/plot/vg"

	"furlong/export"
	"furlong/export/chart"
	"furlong/trial"
	"furlong/trial/analysis"
)

// Size of the means chart on a trait sheet, in points (1/72 inch):
// 16 cm × 10 cm, about 600 × 380 pixels at 96 dpi. More treatments widen it.
const (
	chartWidthPt  = 453.5
	chartHeightPt = 283.5
	chartPerMean  = 14   // points of width per treatment beyond 30
	chartMaxWidth = 2400 // about 85 cm: wider charts help no reader
)

// meansChartPNG draws the means of a with ± 1 SE error bars and the letters of
// the report's method, as a PNG image.
func meansChartPNG(t *trial.Trial, a *analysis.Result, opts ReportOptions) ([]byte, error) {
	p, err := chart.Means(t, a, chart.MeansOptions{ErrorBars: chart.StandardError, Letters: opts.Method})
	if err != nil {
		return nil, fmt.Errorf("the chart of the means of %s could not be drawn: %w", a.TraitName, err)
	}
	w := chartWidthPt
	if n := len(a.Means); n > 30 {
		w = min(w+float64(n-30)*chartPerMean, chartMaxWidth)
	}
	var buf bytes.Buffer
	if err := chart.Save(p, &buf, "png", vg.Length(w), vg.Length(chartHeightPt)); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// chartPNG is a drawn chart, or why it could not be drawn.
type chartPNG struct {
	png   []byte
	err   error
	panic *trial.WorkerPanic // the drawing panicked: raised again by the sheet that waits for it
}

// startCharts draws the means chart of every analysed trait of the report
// in the background, GOMAXPROCS at a time; the trait sheets take them from
// r.charts. Drawing stops when ctx is done.
func (r *report) startCharts(ctx context.Context) {
	r.charts = make(map[string]chan chartPNG)
	type job struct {
		res *analysis.Result
		out chan chartPNG
	}
	var jobs []job
	for _, tr := range r.traits {
		o, ok := export.LookupOutcome(r.res, tr.Key)
		if !ok || export.Reason(o) != "" {
			continue
		}
		ch := make(chan chartPNG, 1)
		r.charts[tr.Key] = ch
		jobs = append(jobs, job{o.Result, ch})
	}
	queue := make(chan job, len(jobs))
	for _, j := range jobs {
		queue <- j
	}
	close(queue)
	for w := 0; w < min(runtime.GOMAXPROCS(0), len(jobs)); w++ {
		go func() {
			for j := range queue {
				if ctx.Err() != nil {
					j.out <- chartPNG{err: ctx.Err()}
					continue
				}
				var c chartPNG
				c.panic = trial.Catch(func() { c.png, c.err = meansChartPNG(r.t, j.res, r.opts) })
				j.out <- c
			}
		}()
	}
}
