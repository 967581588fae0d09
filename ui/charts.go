package ui

import (
	"gonum.org/v1/plot"

	"furlong/export/chart"
	"furlong/trial"
	"furlong/trial/analysis"
)

// Size of the chart images drawn for the screen; the canvas.Image scales
// them to fit (FillMode contain).
const chartW, chartH = 760, 500

// drawCharts draws the screen charts of one analysed trait, treatments in
// order (the Order of means preference). It runs on the analyser's
// goroutine and touches only the snapshot.
func drawCharts(t *trial.Trial, tr traitResult, m analysis.Method, order chart.Order) []chartImage {
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
		{"Spread", func() (*plot.Plot, error) {
			return chart.Spread(t, tr.key, chart.SpreadOptions{Order: order, ShowExcluded: true, Seed: 1})
		}},
		{"Residuals", func() (*plot.Plot, error) { return chart.Residuals(t, tr.res) }},
		{"Normal Q-Q", func() (*plot.Plot, error) { return chart.QQ(t, tr.res) }},
	}
	out := make([]chartImage, 0, len(makers))
	for _, mk := range makers {
		p, err := safePlot(mk.make)
		ci := chartImage{title: mk.title, err: err}
		if err == nil {
			ci.img = chart.Image(p, chartW, chartH)
		}
		out = append(out, ci)
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
