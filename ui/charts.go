package ui

import (
	"image"
	"image/color"
	"sync"

	"fyne.io/fyne/v2"
	"fyne.io/fyne/v2/canvas"
	"fyne.io/fyne/v2/container"
	"fyne.io/fyne/v2/widget"
	"gonum.org/v1/plot"

	"furlong/export"
	"furlong/export/chart"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// chartMinSize is the smallest a chart is shown: its text stays at the
// window's size (charts are drawn at their real pixel size), and below
// about 500 × 380 the key and the axis labels crowd the data.
var chartMinSize = fyne.NewSize(500, 380)

// drawCharts builds the screen charts of one analysed trait, treatments in
// order (the Order of means preference). It runs on the analyser's
// goroutine and touches only the snapshot; the charts are drawn to pixels
// by chartView at the size they are shown.
func drawCharts(t *trial.Trial, tr traitResult, m meansep.Method, order chart.Order) []chartImage {
	if tr.res == nil {
		return nil
	}
	type maker struct {
		title string
		make  func() (*plot.Plot, error)
	}
	makers := []maker{
		{"Means", func() (*plot.Plot, error) {
			return chart.Means(t, tr.res, chart.MeansOptions{Letters: m, Order: order})
		}},
		{"Field heat map", func() (*plot.Plot, error) {
			return chart.HeatMap(t, tr.key, chart.HeatMapOptions{PlotNumbers: true})
		}},
		{"Residual map", func() (*plot.Plot, error) {
			return chart.ResidualMap(t, tr.res, chart.ResidualMapOptions{PlotNumbers: true})
		}},
		{"Spread", func() (*plot.Plot, error) {
			return chart.Spread(t, tr.key, chart.SpreadOptions{Order: order, ShowExcluded: true, Seed: 1})
		}},
		{"Residuals", func() (*plot.Plot, error) { return chart.Residuals(t, tr.res) }},
		{"Normal Q-Q", func() (*plot.Plot, error) { return chart.QQ(t, tr.res) }},
	}
	if series := export.SeriesOf(t, tr.key); series != "" {
		// An assessment (or its AUDPC): the whole series over the season.
		makers = append(makers, maker{"Over the season", func() (*plot.Plot, error) {
			pr, err := analysis.ProgressOf(t, series)
			if err != nil {
				return nil, err
			}
			return chart.Progress(t, pr)
		}})
	}
	out := make([]chartImage, 0, len(makers))
	for _, mk := range makers {
		p, err := safePlot(mk.make)
		out = append(out, chartImage{title: mk.title, plot: p, err: err})
	}
	return out
}

// chartOrder is the chart order for a means-order preference.
func chartOrder(pref string) chart.Order {
	if pref == orderTrial {
		return chart.AsListed
	}
	return chart.ByMean
}

// safePlot runs a chart constructor, turning a panic into an error.
func safePlot(f func() (*plot.Plot, error)) (p *plot.Plot, err error) {
	defer func() {
		if r := recover(); r != nil {
			p, err = nil, errChartFailed
		}
	}()
	return f()
}

// chartView shows a chart drawn at the widget's own pixel size and the
// canvas scale, so that its text is as large as the window's and never
// blurred by scaling; it redraws when resized (the last image is kept for
// a repaint at the same size). Charts are paper: white in both themes,
// framed so that they stand apart from a dark window.
type chartView struct {
	widget.BaseWidget
	p *plot.Plot
	// min is the smallest the chart is shown; chartMinSize when zero.
	min fyne.Size

	mu     sync.Mutex
	cached image.Image
	w, h   int
	raster *canvas.Raster
}

func newChartView(p *plot.Plot) *chartView {
	v := &chartView{p: p}
	v.raster = canvas.NewRaster(v.render)
	v.ExtendBaseWidget(v)
	return v
}

// render draws the chart at w × h pixels (the raster's size), reusing the
// last image when the size has not changed.
func (v *chartView) render(w, h int) image.Image {
	v.mu.Lock()
	defer v.mu.Unlock()
	if w <= 0 || h <= 0 {
		return image.NewRGBA(image.Rect(0, 0, 1, 1))
	}
	if v.cached != nil && v.w == w && v.h == h {
		return v.cached
	}
	scale := 1.0
	if size := v.Size(); size.Width > 0 {
		scale = float64(w) / float64(size.Width)
	}
	img, err := safeImage(v.p, w, h, scale)
	if err != nil {
		blank := image.NewRGBA(image.Rect(0, 0, w, h))
		for i := range blank.Pix {
			blank.Pix[i] = 0xff
		}
		img = blank
	}
	v.cached, v.w, v.h = img, w, h
	return img
}

// safeImage renders p, turning a panic in the plotting library into an
// error.
func safeImage(p *plot.Plot, w, h int, scale float64) (img image.Image, err error) {
	defer func() {
		if r := recover(); r != nil {
			img, err = nil, errChartFailed
		}
	}()
	return chart.ImageScaled(p, w, h, scale), nil
}

// MinSize keeps charts readable (chartMinSize, or the chart's own min).
func (v *chartView) MinSize() fyne.Size {
	if v.min.Width > 0 && v.min.Height > 0 {
		return v.min
	}
	return chartMinSize
}

// CreateRenderer shows the raster inside a thin frame.
func (v *chartView) CreateRenderer() fyne.WidgetRenderer {
	frame := canvas.NewRectangle(color.Transparent)
	frame.StrokeColor = color.NRGBA{R: 0x80, G: 0x80, B: 0x80, A: 0xff}
	frame.StrokeWidth = 1
	return widget.NewSimpleRenderer(container.NewStack(v.raster, frame))
}
