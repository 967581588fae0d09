package xlsx

import (
	"bytes"
	"context"
	"fmt"
	"runtime"

	"github.com/xuri/excelize/v2"
	"gonum.org/v1/plot"
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
	return plotPNG(p, widthFor(len(a.Means)))
}

// widthFor is the width of a chart of n treatments, in points: wider from
// 30 treatments on, up to chartMaxWidth.
func widthFor(n int) float64 {
	if n > 30 {
		return min(chartWidthPt+float64(n-30)*chartPerMean, chartMaxWidth)
	}
	return chartWidthPt
}

// plotPNG draws p as a PNG image w points wide and chartHeightPt high.
func plotPNG(p *plot.Plot, w float64) ([]byte, error) {
	var buf bytes.Buffer
	if err := chart.Save(p, &buf, "png", vg.Length(w), vg.Length(chartHeightPt)); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// chartBelow draws a chart (draw) w points wide and puts it in column A at
// row once the sheet's columns are fitted (sheet.later), with alt as its
// alternative text; it returns the next free row. A chart that cannot be
// drawn leaves a note naming what instead.
func (s *sheet) chartBelow(f *excelize.File, row int, what, alt string, w float64, draw func() (*plot.Plot, error)) int {
	p, err := draw()
	var png []byte
	if err == nil {
		png, err = plotPNG(p, w)
	}
	if err != nil {
		s.textNoWidth(1, row, "The "+what+" could not be drawn: "+err.Error(), noteStyle)
		return row + 2
	}
	s.later = append(s.later, func() {
		yes := true
		s.fail(f.AddPictureFromBytes(s.name, cellName(1, row), &excelize.Picture{
			Extension: ".png", File: png,
			Format: &excelize.GraphicOptions{AltText: alt, PrintObject: &yes, LockAspectRatio: true},
		}))
	})
	return row + vsCheckChartRows
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
