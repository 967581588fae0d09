package chart

import (
	"errors"
	"fmt"
	"image/color"
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"furlong/stats/meansep"
	"furlong/stats/series"
)

// Series is what the series charts draw: one trait of a series of trials
// (the same entries at several sites), as plain slices from the series
// analysis. Entries and Sites name the columns and rows of Cells.
type Series struct {
	Name    string   // the series' name, first line of every title
	Trait   string   // "Yield (t/ha)"
	Entries []string // entry codes
	Sites   []string // site labels ("North farm 2026")
	// Cells are the site × entry means (Cells[site][entry], NaN where the
	// entry was not tested), as in series.Result.Cells.
	Cells [][]float64
	// Means are the entries' means across sites (series.Result.Means).
	Means []series.Mean
	// Letters are the mean separation letters of each entry (nil: none)
	// and LetterMethod names them ("LSD", "Tukey HSD").
	Letters      []string
	LetterMethod string
	Alpha        float64 // significance level of the letters (0: 5%)
	// Stability holds each entry's Finlay–Wilkinson regression
	// (series.StabilityOf), for Response.
	Stability []series.Stability
	// Check is the index of the check entry, −1 for none.
	Check int
	// Highlight are entries drawn in colour in Response besides the check;
	// with at most eight entries in all every entry is drawn in colour.
	Highlight     []int
	LowerIsBetter bool
	// SitesNote says how the sites were treated ("sites random"), written
	// on the means chart.
	SitesNote string
}

// ErrSeriesShape is returned when the slices of a Series do not agree.
var ErrSeriesShape = errors.New("the series table does not match its entries and sites")

func (s *Series) check() error {
	if len(s.Entries) == 0 || len(s.Sites) == 0 {
		return ErrNoData
	}
	if len(s.Cells) != len(s.Sites) {
		return ErrSeriesShape
	}
	for _, row := range s.Cells {
		if len(row) != len(s.Entries) {
			return ErrSeriesShape
		}
	}
	return nil
}

func (s *Series) isCheck(e int) bool { return s.Check >= 0 && e == s.Check }

// SeriesMeans draws each entry's mean across sites as a point (or bar,
// opt.Points false) with ± 1 SE and the mean separation letters, ordered
// by opt.Order. Entries without a mean are named in the title.
func SeriesMeans(s *Series, opt MeansOptions) (*plot.Plot, error) {
	if err := s.check(); err != nil {
		return nil, err
	}
	if len(s.Means) != len(s.Entries) || (s.Letters != nil && len(s.Letters) != len(s.Entries)) {
		return nil, ErrSeriesShape
	}
	alpha := s.Alpha
	if alpha <= 0 || alpha >= 1 {
		alpha = 0.05
	}
	var bars []meanBar
	var missing []string
	for i, m := range s.Means {
		if m.Sites == 0 || math.IsNaN(m.Mean) || math.IsInf(m.Mean, 0) {
			missing = append(missing, s.Entries[i])
			continue
		}
		b := meanBar{code: s.Entries[i], check: s.isCheck(i), y: m.Mean, low: math.NaN(), top: math.NaN()}
		if opt.ErrorBars != NoErrorBars && m.SE > 0 && !math.IsInf(m.SE, 0) {
			b.low, b.top = m.Mean-m.SE, m.Mean+m.SE
		}
		if s.Letters != nil {
			b.letters = s.Letters[i]
		}
		bars = append(bars, b)
	}
	if len(bars) == 0 {
		return nil, ErrNoData
	}
	codes := make([]string, len(bars))
	ys := make([]float64, len(bars))
	for i, b := range bars {
		codes[i], ys[i] = b.code, b.y
	}
	order := orderIndices(opt.Order, codes, ys, !s.LowerIsBetter)
	sorted := make([]meanBar, len(bars))
	for i, j := range order {
		sorted[i] = bars[j]
	}
	sub := "Means across " + strconv.Itoa(len(s.Sites)) + " sites"
	if s.SitesNote != "" {
		sub += " (" + s.SitesNote + ")"
	}
	var notes []string
	if len(missing) > 0 {
		notes = append(notes, "Not shown (no data): "+strings.Join(missing, ", "))
	}
	p := newPlot(chartTitle(append([]string{s.Name, s.Trait, sub}, notes...)...))
	p.Y.Label.Text = s.Trait
	p.X.Label.Text = "Entry (" + orderNote(opt.Order, !s.LowerIsBetter) + ")"
	o := opt
	o.Letters = meansep.LSD
	if s.LetterMethod == "Tukey HSD" {
		o.Letters = meansep.Tukey
	}
	if err := drawMeanBars(p, sorted, o, alpha, "Error bars: ± 1 SE across sites"); err != nil {
		return nil, err
	}
	return p, nil
}

// SeriesHeatMapOptions control the entry × site heat map.
type SeriesHeatMapOptions struct {
	// PercentOfCheck colours and labels each cell by the entry's mean as a
	// percentage of the check's mean at the same site.
	PercentOfCheck bool
	Order          Order // order of the entries (rows, best at the top)
}

// SeriesHeatMap draws the site means as a grid, entries in rows and sites
// in columns, coloured on the viridis scale (or as % of the check), the
// value written in each cell when it fits, entries not tested at a site
// grey and hatched.
func SeriesHeatMap(s *Series, opt SeriesHeatMapOptions) (*plot.Plot, error) {
	if err := s.check(); err != nil {
		return nil, err
	}
	if opt.PercentOfCheck && s.Check < 0 {
		return nil, errors.New("choose a check entry to show the percent of check")
	}
	ne, ns := len(s.Entries), len(s.Sites)
	vals := make([][]float64, ns)
	for si := range vals {
		vals[si] = make([]float64, ne)
		for e := range vals[si] {
			v := s.Cells[si][e]
			if opt.PercentOfCheck {
				v = math.NaN()
				if p := series.PercentOf(s.Cells[si][e], s.Cells[si][s.Check]); p != nil {
					v = *p
				}
			}
			vals[si][e] = v
		}
	}
	var all []float64
	for _, row := range vals {
		all = append(all, row...)
	}
	lo, hi, ok := finiteRange(all)
	if !ok {
		return nil, ErrNoData
	}
	means := make([]float64, ne)
	for e := range means {
		means[e] = math.NaN()
		if e < len(s.Means) && s.Means[e].Sites > 0 {
			means[e] = s.Means[e].Mean
		}
	}
	order := orderIndices(opt.Order, s.Entries, means, !s.LowerIsBetter)
	g := &fieldGrid{rows: ne, cols: ns, maxFont: vg.Points(8), minFont: vg.Points(5)}
	dec := 1
	if !opt.PercentOfCheck {
		dec = decimalsFor(lo, hi)
	}
	nMissing := 0
	names := make([]string, ne)
	for r, e := range order {
		row := ne - r // best at the top
		names[ne-1-r] = s.Entries[e]
		for si := 0; si < ns; si++ {
			v := vals[si][e]
			cell := gridCell{row: row, col: si + 1}
			if math.IsNaN(v) || math.IsInf(v, 0) {
				cell.sw = swatch{Fill: missingFill, Pattern: patternBackDiagonal, Ink: gridGrey}
				nMissing++
			} else {
				f := 0.5
				if hi > lo {
					f = (v - lo) / (hi - lo)
				}
				cell.sw = swatch{Fill: Viridis(f)}
				cell.lines = []string{formatValue(v, dec)}
			}
			g.cells = append(g.cells, cell)
		}
	}
	what := "Site means"
	title := s.Trait
	if opt.PercentOfCheck {
		what = "Percent of the check (" + s.Entries[s.Check] + ") at each site"
		title = s.Trait + ", % of check"
	}
	p := newPlot(chartTitle(s.Name, s.Trait, what))
	p.Add(g)
	p.X.Min, p.X.Max = 0.5, float64(ns)+0.5
	p.Y.Min, p.Y.Max = 0.5, float64(ne)+0.5
	p.X.Padding, p.Y.Padding = 0, 0
	var xt, yt plot.ConstantTicks
	for si, name := range s.Sites {
		xt = append(xt, plot.Tick{Value: float64(si + 1), Label: name})
	}
	step := max(1, ne/60)
	for r, name := range names {
		if r%step == 0 {
			yt = append(yt, plot.Tick{Value: float64(r + 1), Label: name})
		}
	}
	p.X.Tick.Marker, p.Y.Tick.Marker = xt, yt
	if ns > 6 {
		p.X.Tick.Label.Rotation = math.Pi / 2
		p.X.Tick.Label.XAlign = draw.XRight
		p.X.Tick.Label.YAlign = draw.YCenter
	}
	if ne > 40 {
		p.Y.Tick.Label.Font.Size = vg.Points(5)
	}
	p.X.Label.Text = "Site"
	p.Y.Label.Text = "Entry (" + orderNote(opt.Order, !s.LowerIsBetter) + ", first at the top)"
	panel := &sidePanel{size: keySize}
	panel.scale = &colourScale{min: lo, max: hi, title: title, format: func(v float64) string { return formatValue(v, dec) }}
	if nMissing > 0 {
		panel.entries = append(panel.entries, panelEntry{
			swatch: &swatch{Fill: missingFill, Pattern: patternBackDiagonal, Ink: gridGrey, Outline: draw.LineStyle{Color: gridGrey, Width: vg.Points(0.3)}},
			text:   "Not tested (" + strconv.Itoa(nMissing) + ")",
		})
	}
	p.Add(panel)
	return p, nil
}

// decimalsFor picks decimals that show about three significant digits of
// values between lo and hi.
func decimalsFor(lo, hi float64) int {
	m := math.Max(math.Abs(lo), math.Abs(hi))
	switch {
	case m >= 100:
		return 0
	case m >= 10:
		return 1
	case m >= 1:
		return 2
	}
	return 3
}

// ResponseLine is one entry's Finlay–Wilkinson line: y = Intercept +
// Slope·x over the site indices From..To where the entry was tested.
type ResponseLine struct {
	Entry                 int
	Intercept, Slope      float64
	From, To              float64
	Points                plotter.XYs // (site index, entry mean) per site tested
	Highlighted, IsCheck  bool
	highlightColourNumber int
}

// ResponseLines returns each entry's regression line on the site index
// (series.SiteIndex of the cells): the slope from s.Stability, the
// intercept through the mean of the entry's points. Entries without a
// slope (tested at fewer than two sites) are left out.
func ResponseLines(s *Series) ([]ResponseLine, []float64, error) {
	if err := s.check(); err != nil {
		return nil, nil, err
	}
	if len(s.Stability) != len(s.Entries) {
		return nil, nil, ErrSeriesShape
	}
	index, err := series.SiteIndex(s.Cells)
	if err != nil {
		return nil, nil, err
	}
	hl := map[int]bool{}
	for _, e := range s.Highlight {
		hl[e] = true
	}
	all := len(s.Entries) <= 8
	var out []ResponseLine
	n := 0
	for e := range s.Entries {
		st := s.Stability[e]
		if st.Slope == nil {
			continue
		}
		l := ResponseLine{Entry: e, Slope: *st.Slope, From: math.Inf(1), To: math.Inf(-1), IsCheck: s.isCheck(e)}
		var mx, my float64
		for si, row := range s.Cells {
			if v := row[e]; !math.IsNaN(v) {
				l.Points = append(l.Points, plotter.XY{X: index[si], Y: v})
				mx += index[si]
				my += v
				l.From, l.To = math.Min(l.From, index[si]), math.Max(l.To, index[si])
			}
		}
		k := float64(len(l.Points))
		l.Intercept = my/k - l.Slope*mx/k
		l.Highlighted = all || hl[e] || l.IsCheck
		if l.Highlighted && !l.IsCheck {
			l.highlightColourNumber = n
			n++
		}
		out = append(out, l)
	}
	if len(out) == 0 {
		return nil, nil, ErrNoData
	}
	return out, index, nil
}

// Response draws each entry's site means against the site index (the mean
// of all entries at the site) with its Finlay–Wilkinson line, and the 1:1
// line of an entry that follows the sites exactly (slope 1). The check and
// the highlighted entries are drawn in colour with a key; with more than
// eight entries the others are thin grey lines.
func Response(s *Series) (*plot.Plot, error) {
	lines, index, err := ResponseLines(s)
	if err != nil {
		return nil, err
	}
	p := newPlot(chartTitle(s.Name, s.Trait, "Response of each entry to the site mean (Finlay–Wilkinson)"))
	p.X.Label.Text = "Site mean (mean of all entries at the site)"
	p.Y.Label.Text = "Entry mean at the site"
	lo, hi, _ := finiteRange(index)
	if hi == lo {
		lo, hi = lo-1, hi+1
	}
	one, err := plotter.NewLine(plotter.XYs{{X: lo, Y: lo}, {X: hi, Y: hi}})
	if err != nil {
		return nil, err
	}
	one.Color = color.Black
	one.Width = vg.Points(0.8)
	one.Dashes = []vg.Length{vg.Points(2), vg.Points(3)}
	grey := color.NRGBA{R: 0xB0, G: 0xB0, B: 0xB0, A: 0xFF}
	panel := &sidePanel{size: keySize}
	add := func(l ResponseLine, clr color.Color, width vg.Length, glyph draw.GlyphDrawer, dashes []vg.Length, key bool) error {
		ln, err := plotter.NewLine(plotter.XYs{{X: l.From, Y: l.Intercept + l.Slope*l.From}, {X: l.To, Y: l.Intercept + l.Slope*l.To}})
		if err != nil {
			return err
		}
		ln.Color, ln.Width, ln.Dashes = clr, width, dashes
		p.Add(ln)
		if glyph != nil {
			sc, err := plotter.NewScatter(l.Points)
			if err != nil {
				return err
			}
			sc.GlyphStyle = draw.GlyphStyle{Color: clr, Radius: vg.Points(2.5), Shape: glyph}
			p.Add(sc)
		}
		if key {
			g := draw.GlyphStyle{Color: clr, Radius: vg.Points(3), Shape: glyph}
			what := s.Entries[l.Entry]
			if l.IsCheck {
				what += " (check)"
			}
			panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Glyph: &g}, text: fmt.Sprintf("%s: slope %.2f", what, l.Slope)})
		}
		return nil
	}
	nGrey := 0
	for _, l := range lines {
		if !l.Highlighted {
			if err := add(l, grey, vg.Points(0.5), nil, nil, false); err != nil {
				return nil, err
			}
			nGrey++
		}
	}
	p.Add(one)
	for _, l := range lines {
		if !l.Highlighted {
			continue
		}
		clr, glyph, dashes := color.Color(checkColor), draw.GlyphDrawer(draw.TriangleGlyph{}), []vg.Length(nil)
		if !l.IsCheck {
			k := l.highlightColourNumber
			clr = responseColours[k%len(responseColours)]
			glyph = responseGlyphs[k%len(responseGlyphs)]
			dashes = dashesFor(k / len(responseColours))
		}
		if err := add(l, clr, vg.Points(1.5), glyph, dashes, true); err != nil {
			return nil, err
		}
	}
	panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Line: &one.LineStyle}, text: "1:1 (slope 1)"})
	if nGrey > 0 {
		g := draw.LineStyle{Color: grey, Width: vg.Points(1)}
		panel.entries = append(panel.entries, panelEntry{swatch: &swatch{Line: &g}, text: "Other entries (" + strconv.Itoa(nGrey) + ")"})
	}
	p.Add(panel)
	return p, nil
}

// responseGlyphs are the point shapes of highlighted entries (the check
// has the triangle).
var responseGlyphs = []draw.GlyphDrawer{draw.CircleGlyph{}, draw.BoxGlyph{}, draw.RingGlyph{}, draw.PyramidGlyph{}, draw.CrossGlyph{}, draw.PlusGlyph{}, draw.SquareGlyph{}}

// responseColours are the Okabe–Ito colours other than the check's orange.
var responseColours = []color.Color{OkabeIto[4], OkabeIto[2], OkabeIto[5], OkabeIto[6], OkabeIto[1], OkabeIto[7]}
