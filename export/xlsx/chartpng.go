package xlsx

import (
	"bytes"
	"fmt"

	"gonum.org/v1/plot/vg"

	"furlong/export/chart"
	"furlong/trial"
	"furlong/trial/analysis"
)

// Size of the means chart on a trait sheet, in points (1/72 inch):
// 16 cm × 10 cm, about 600 × 380 pixels at 96 dpi. More treatments widen it.
const (
	chartWidthPt  = 453.5
	chartHeightPt = 283.5
	chartPerMean  = 14 // points of width per treatment beyond 30
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
		w += float64(n-30) * chartPerMean
	}
	var buf bytes.Buffer
	if err := chart.Save(p, &buf, "png", vg.Length(w), vg.Length(chartHeightPt)); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}
