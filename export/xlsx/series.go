package xlsx

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"runtime"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/xuri/excelize/v2"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"furlong/export"
	"furlong/export/chart"
	"furlong/stats/meansep"
	stseries "furlong/stats/series"
	"furlong/trial/series"
)

// SeriesOptions control WriteSeries.
type SeriesOptions struct {
	Name    string    // the series' name; "" for "Trial series"
	Version string    // software version printed on the cover
	Now     time.Time // date of the report; zero for the current time
	Charts  bool      // the three series charts on each trait sheet
	Paper   Paper     // A4 (default) or Letter
	// Highlight are the codes of entries drawn in colour in the
	// response chart besides the check.
	Highlight []string
}

// Sheet names of the series workbook before its trait sheets.
const (
	SeriesCoverSheet   = "Cover"
	SeriesSummarySheet = "Summary"
)

type seriesReport struct {
	f      *excelize.File
	st     *styles
	opts   SeriesOptions
	res    []*series.Result
	charts []chan seriesCharts
}

// seriesCharts are the PNGs of one trait's charts (nil where it could not
// be drawn, with the reason in errs).
type seriesCharts struct {
	png  [3][]byte
	errs [3]error
}

// WriteSeries writes the series workbook: a cover with the sites,
// seasons, the method of each trait's analysis and the cautions; a
// summary sheet with, per trait, the entries × sites table of means with
// the mean across sites, its letters and percent of the check; and a
// sheet per trait with the series ANOVA, the means across sites, each
// site's own statistics, Bartlett's test of the site variances,
// stability, head to head against the check and the charts. Numbers are
// written as numbers at full precision.
func WriteSeries(w io.Writer, results []*series.Result, opts SeriesOptions) error {
	if len(results) == 0 {
		return fmt.Errorf("there is no analysed trait to write; analyse the series first")
	}
	if strings.TrimSpace(opts.Name) == "" {
		opts.Name = "Trial series"
	}
	if opts.Now.IsZero() {
		opts.Now = time.Now()
	}
	f := excelize.NewFile()
	defer f.Close()
	r := &seriesReport{f: f, st: &styles{f: f, cache: make(map[styleKey]int)}, opts: opts, res: results}
	if opts.Charts {
		r.startCharts()
	}
	names := newSheetNamer()
	type step struct {
		name  string
		write func(string) error
	}
	steps := []step{
		{names.name(SeriesCoverSheet, ""), r.writeCover},
		{names.name(SeriesSummarySheet, ""), r.writeSummary},
	}
	for i, res := range results {
		steps = append(steps, step{names.name(nonEmpty(res.Trait.Name, res.Trait.Key), res.Trait.Key), func(n string) error { return r.writeTrait(n, i) }})
	}
	for i, s := range steps {
		if i == 0 {
			if err := f.SetSheetName("Sheet1", s.name); err != nil {
				return err
			}
		} else if _, err := f.NewSheet(s.name); err != nil {
			return err
		}
		if err := s.write(s.name); err != nil {
			return err
		}
	}
	f.SetActiveSheet(1)
	if err := f.SetDocProps(&excelize.DocProperties{
		Title: opts.Name, Creator: "Furlong " + opts.Version, Created: opts.Now.UTC().Format(time.RFC3339),
	}); err != nil {
		return err
	}
	return f.Write(w)
}

// Size of each series chart on a trait sheet, in points.
const (
	seriesChartW = 520.0
	seriesChartH = 340.0
)

// startCharts draws every trait's charts in the background, on all cores.
func (r *seriesReport) startCharts() {
	r.charts = make([]chan seriesCharts, len(r.res))
	type job struct {
		trait, which int
	}
	jobs := make(chan job, 3*len(r.res))
	parts := make([]seriesCharts, len(r.res))
	var wg sync.WaitGroup
	for i := range r.res {
		r.charts[i] = make(chan seriesCharts, 1)
		for k := 0; k < 3; k++ {
			jobs <- job{i, k}
		}
	}
	close(jobs)
	left := make([]int, len(r.res))
	for i := range left {
		left[i] = 3
	}
	var mu sync.Mutex
	for w := 0; w < min(runtime.GOMAXPROCS(0), 3*len(r.res)); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for j := range jobs {
				png, err := r.drawChart(j.trait, j.which)
				mu.Lock()
				parts[j.trait].png[j.which], parts[j.trait].errs[j.which] = png, err
				left[j.trait]--
				if left[j.trait] == 0 {
					r.charts[j.trait] <- parts[j.trait]
				}
				mu.Unlock()
			}
		}()
	}
}

// drawChart draws chart which (0 means, 1 heat map, 2 response) of trait i.
func (r *seriesReport) drawChart(i, which int) (png []byte, err error) {
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("the chart could not be drawn (an internal error: %v)", p)
		}
	}()
	res := r.res[i]
	s := chart.FromSeries(res, r.opts.Name, r.opts.Highlight)
	var p *plot.Plot
	w, h := seriesChartW, seriesChartH
	n := len(res.Entries)
	switch which {
	case 0:
		p, err = chart.SeriesMeans(s, chart.MeansOptions{Points: true})
		if n > 30 {
			w = min(w+float64(n-30)*8, chartMaxWidth)
		}
	case 1:
		p, err = chart.SeriesHeatMap(s, chart.SeriesHeatMapOptions{PercentOfCheck: res.Check >= 0})
		h = min(max(h, 60+float64(n)*9), 1600)
		w = min(max(w, 200+float64(len(res.SiteStats))*40), chartMaxWidth)
	case 2:
		p, err = chart.Response(s)
	}
	if err != nil {
		return nil, err
	}
	var buf bytes.Buffer
	if err := chart.Save(p, &buf, "png", vg.Length(w), vg.Length(h)); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

func methodText(res *series.Result) string {
	m := "combined analysis of the plots"
	if res.Method == stseries.MethodTwoStage {
		m = "two-stage analysis of the site means"
		if res.Weighted {
			m += ", weighted by the precision of each site mean"
		} else {
			m += ", unweighted"
		}
	}
	return m + "; sites " + res.Sites.String()
}

func lettersText(res *series.Result) string {
	level := strconv.FormatFloat(100*res.Alpha, 'f', -1, 64) + "%"
	if res.Separation == meansep.Tukey {
		return "Means across sites followed by the same letter do not differ at the " + level + " level (Tukey's HSD)."
	}
	return "Means across sites followed by the same letter do not differ at the " + level + " level (Fisher's protected LSD)."
}

func (r *seriesReport) writeCover(name string) error {
	s := newSheet(r.f, r.st, name)
	first := r.res[0]
	s.textNoWidth(1, 1, r.opts.Name, titleStyle)
	s.textNoWidth(1, 2, fmt.Sprintf("Series of %d trials: the same entries at several sites and seasons, summarised across them.", len(first.SiteStats)), noteStyle)
	row := 4
	s.textNoWidth(1, row, "Sites and seasons", sectionStyle)
	row++
	for i, h := range []string{"Site and season", "Site", "Season", "Entries", "Trial file"} {
		k := headStyle
		if i == 3 {
			k = headNumStyle
		}
		s.text(1+i, row, h, k)
	}
	row++
	for _, st := range first.SiteStats {
		s.text(1, row, st.Label, proseStyle)
		s.text(2, row, nonEmpty(st.Site, dash), proseStyle)
		s.text(3, row, nonEmpty(st.Season, dash), proseStyle)
		s.integer(4, row, st.Entries, styleKey{})
		s.textNoWidth(5, row, nonEmpty(st.Path, dash), proseStyle)
		row++
	}
	row++
	s.textNoWidth(1, row, "Analysis of each trait", sectionStyle)
	row++
	for i, h := range []string{"Trait", "Method", "Why", "Check"} {
		s.text(1+i, row, h, headStyle)
	}
	row++
	for _, res := range r.res {
		s.text(1, row, traitLabel(nonEmpty(res.Trait.Name, res.Trait.Key), res.Trait.Unit), labelStyle)
		s.text(2, row, methodText(res), proseStyle)
		s.textNoWidth(3, row, res.MethodReason, proseStyle)
		check := "none"
		if res.Check >= 0 {
			check = res.Entries[res.Check].Code
		}
		s.text(4, row, check, proseStyle)
		row++
	}
	row++
	s.para(row, "Sites random: the sites stand for the region the entries are grown in, and the entries are compared against their interaction with the sites. Sites fixed: the comparison holds for these sites only.")
	row += 2
	line := func(label, v string) {
		s.text(1, row, label, labelStyle)
		s.textNoWidth(2, row, v, proseStyle)
		row++
	}
	line("Report date", r.opts.Now.Format("2006-01-02"))
	line("Software", strings.TrimSpace("Furlong "+r.opts.Version))
	row++
	s.textNoWidth(1, row, "Cautions", sectionStyle)
	row++
	for _, c := range export.SeriesCautions {
		s.textNoWidth(1, row, c, proseStyle)
		row++
	}
	s.fitColumns(8, 44)
	s.printSetup(r.opts.Paper, false, r.opts.Name)
	return s.err
}

// writeSummary writes, per trait, the entries × sites table of site means
// with the mean across sites, its letters, the sites tested and the
// percent of the check, one block under another.
func (r *seriesReport) writeSummary(name string) error {
	s := newSheet(r.f, r.st, name)
	s.textNoWidth(1, 1, r.opts.Name+": entry means at each site and across sites", titleStyle)
	row := 3
	for _, res := range r.res {
		dec := res.Trait.Decimals
		if dec < 0 || dec > 6 {
			dec = 2
		}
		s.textNoWidth(1, row, traitLabel(nonEmpty(res.Trait.Name, res.Trait.Key), res.Trait.Unit), sectionStyle)
		row++
		s.textNoWidth(1, row, methodText(res)+". "+lettersText(res), noteStyle)
		row++
		ns := len(res.SiteStats)
		cMean, cLet, cN, cPct := 3+ns, 4+ns, 5+ns, 6+ns
		head := withBottom(styleKey{bold: true, wrap: true, valign: "center", fill: headFill})
		headR := head
		headR.halign = "right"
		s.text(1, row, "Entry", head)
		s.text(2, row, "Name", head)
		for j, st := range res.SiteStats {
			s.text(3+j, row, st.Label, headR)
		}
		s.text(cMean, row, "Mean across sites", headR)
		s.text(cLet, row, "group", withBottom(styleKey{bold: true, halign: "center", fill: headFill}))
		s.text(cN, row, "Sites", headR)
		if res.Check >= 0 {
			s.text(cPct, row, "% check", headR)
		}
		row++
		for i, e := range res.Entries {
			band := styleKey{}
			if i%2 == 1 {
				band.fill = bandFill
			}
			s.text(1, row, e.Code, withBold(band, e.Check))
			nm := e.Name
			if e.Check {
				nm = strings.TrimSpace(nm + " (check)")
			}
			s.text(2, row, nm, withBold(band, e.Check))
			for j := range res.SiteStats {
				if v, ok := res.Cell(j, i); ok {
					s.num(3+j, row, v, withFill(numStyle(dec), band.fill))
				} else {
					s.text(3+j, row, dash, withFill(dashStyle, band.fill))
				}
			}
			m := res.Means[i]
			s.num(cMean, row, m.Mean, withFill(withBold(numStyle(dec), true), band.fill))
			s.text(cLet, row, m.Letters, styleKey{halign: "center", italic: true, fill: band.fill})
			s.integer(cN, row, m.NSites, band)
			if res.Check >= 0 {
				if m.PercentOfCheck != nil {
					s.num(cPct, row, *m.PercentOfCheck, withFill(styleKey{numFmt: percentFormat}, band.fill))
				} else {
					s.text(cPct, row, dash, withFill(dashStyle, band.fill))
				}
			}
			row++
		}
		// The site means (every entry tested there): how good each site
		// was, the x of the stability regressions. (The check's own row is
		// above; it is not repeated.)
		for j, st := range res.SiteStats {
			s.num(3+j, row, st.GrandMean, styleKey{numFmt: DecimalsFormat(dec), italic: true})
		}
		s.text(1, row, "Site mean", styleKey{italic: true})
		s.text(2, row, "all entries tested there", styleKey{italic: true})
		row++
		if res.LettersWithheld {
			s.textNoWidth(1, row, "LSD letters withheld: the entries' F test is not significant.", noteStyle)
			row++
		}
		for _, wn := range res.Warnings {
			s.para(row, wn)
			row++
		}
		row++
	}
	s.widths[1] = math.Max(s.widths[1], 8)
	s.fitColumns(6, 30)
	s.printSetup(r.opts.Paper, true, r.opts.Name)
	return s.err
}

func (r *seriesReport) writeTrait(name string, i int) error {
	res := r.res[i]
	s := newSheet(r.f, r.st, name)
	dec := res.Trait.Decimals
	if dec < 0 || dec > 6 {
		dec = 2
	}
	title := traitLabel(nonEmpty(res.Trait.Name, res.Trait.Key), res.Trait.Unit)
	s.textNoWidth(1, 1, r.opts.Name+": "+title, titleStyle)
	s.para(2, "Method: "+methodText(res)+". "+res.MethodReason)
	row := 3
	for _, n := range res.Notes {
		s.para(row, n)
		row++
	}
	for _, wn := range res.Warnings {
		s.para(row, "Warning: "+wn)
		row++
	}
	row++
	heads := func(hs ...string) {
		for c, h := range hs {
			k := headNumStyle
			if c == 0 {
				k = headStyle
			}
			s.text(1+c, row, h, k)
		}
		row++
	}
	pOrDash := func(col int, p *float64) {
		if p != nil {
			s.num(col, row, *p, pStyle)
		} else {
			s.text(col, row, dash, dashStyle)
		}
	}
	numPtr := func(col int, v *float64, k styleKey) {
		if v != nil && finiteF(*v) {
			s.num(col, row, *v, k)
		} else {
			s.text(col, row, dash, dashStyle)
		}
	}

	// The series ANOVA.
	s.textNoWidth(1, row, "Analysis of variance across sites", sectionStyle)
	row++
	heads("Source", "df", "Sum of squares", "Mean square", "F", "p")
	for _, l := range res.ANOVA {
		s.text(1, row, export.SeriesSourceLabel(l.Name), proseStyle)
		s.integer(2, row, l.DF, styleKey{})
		s.num(3, row, l.SS, numStyle(4))
		if l.Name != stseries.SourceTotal {
			s.num(4, row, l.MS, numStyle(4))
		}
		if l.HasTest {
			s.num(5, row, l.F, numStyle(3))
			s.num(6, row, l.P, pStyle)
		}
		row++
	}
	row++

	// Means across sites.
	s.textNoWidth(1, row, "Means across sites", sectionStyle)
	row++
	s.textNoWidth(1, row, lettersText(res), noteStyle)
	row++
	heads("Entry", "Mean", "SE", "Sites", "group", "% check", "Name")
	for k, m := range res.Means {
		e := res.Entries[k]
		s.text(1, row, e.Code, withBold(styleKey{}, e.Check))
		s.num(2, row, m.Mean, numStyle(dec))
		s.num(3, row, m.SE, numStyle(dec+1))
		s.integer(4, row, m.NSites, styleKey{})
		s.text(5, row, m.Letters, styleKey{halign: "center", italic: true})
		numPtr(6, m.PercentOfCheck, styleKey{numFmt: percentFormat})
		nm := e.Name
		if e.Check {
			nm = strings.TrimSpace(nm + " (check)")
		}
		s.textNoWidth(7, row, nm, proseStyle)
		row++
	}
	msd := export.MSDLabel(res.Separation, res.Alpha)
	switch {
	case res.Separation == meansep.Tukey && res.HSD != nil:
		s.text(1, row, msd, labelStyle)
		s.num(2, row, *res.HSD, numStyle(dec))
		row++
	case res.Separation != meansep.Tukey && res.LSD != nil:
		s.text(1, row, msd, labelStyle)
		s.num(2, row, *res.LSD, numStyle(dec))
		row++
	}
	s.text(1, row, "Error df", labelStyle)
	s.integer(2, row, res.DFError, styleKey{})
	row++
	s.text(1, row, "Error mean square", labelStyle)
	s.num(2, row, res.MSError, numStyle(4))
	row += 2

	// Each site's own analysis.
	s.textNoWidth(1, row, "Each site's own analysis", sectionStyle)
	row++
	heads("Site", "Entries", "n", "Mean", "CV%", "MSE", "Error df", "p (entries)", "LSD (5%)")
	for _, st := range res.SiteStats {
		s.text(1, row, st.Label, proseStyle)
		s.integer(2, row, st.Entries, styleKey{})
		s.integer(3, row, st.N, styleKey{})
		s.num(4, row, st.GrandMean, numStyle(dec))
		numPtr(5, st.CVPercent, numStyle(1))
		numPtr(6, st.MSE, numStyle(4))
		if st.MSE != nil {
			s.integer(7, row, st.DFError, styleKey{})
		} else {
			s.text(7, row, dash, dashStyle)
		}
		pOrDash(8, st.PTreatment)
		numPtr(9, st.LSD, numStyle(dec))
		if st.LSDVaries {
			s.textNoWidth(10, row, "largest of the pairs (unequal replication)", noteStyle)
		}
		row++
	}
	row++
	if b := res.Bartlett; b != nil {
		s.textNoWidth(1, row, "Equal error variances across sites (Bartlett's test)", sectionStyle)
		row++
		heads("", "K²", "df", "p", "Largest / smallest MSE")
		s.text(1, row, "Bartlett", proseStyle)
		s.num(2, row, b.K2, numStyle(3))
		s.integer(3, row, b.DF, styleKey{})
		s.num(4, row, b.P, pStyle)
		s.num(5, row, b.MSERatio, numStyle(2))
		row++
		s.para(row, fmt.Sprintf("Largest MSE at %s, smallest at %s. %s", b.Largest, b.Smallest, b.Reading))
		row += 2
	}

	// Stability.
	if len(res.Stability) > 0 {
		s.textNoWidth(1, row, "Stability across sites", sectionStyle)
		row++
		s.para(row, "Slope: Finlay–Wilkinson regression of the entry's site means on the site mean (1 = average response to better sites). Ecovalence: Wricke's share of the entry × site sum of squares (small = steady). Ranks: 1 = best at the site.")
		row++
		hs := []string{"Entry", "Slope", "SE of slope", "Deviation MS", "Ecovalence"}
		for _, st := range res.SiteStats {
			hs = append(hs, "Rank "+st.Label)
		}
		heads(hs...)
		for k, st := range res.Stability {
			s.text(1, row, st.Treatment, withBold(styleKey{}, k == res.Check))
			numPtr(2, st.Slope, numStyle(3))
			numPtr(3, st.SlopeSE, numStyle(3))
			numPtr(4, st.DeviationMS, numStyle(4))
			s.num(5, row, st.Ecovalence, numStyle(4))
			for j, rk := range st.Ranks {
				if rk > 0 {
					s.num(6+j, row, rk, styleKey{numFmt: "0.#"})
				} else {
					s.text(6+j, row, dash, dashStyle)
				}
			}
			row++
		}
		row++
	}

	// Head to head.
	if len(res.HeadToHead) > 0 {
		s.textNoWidth(1, row, "Head to head against the check ("+res.Entries[res.Check].Code+")", sectionStyle)
		row++
		s.para(row, "Over the sites where both were tested: how often the entry's mean was higher or lower than the check's, the mean difference (entry − check) and a paired t test over sites.")
		row++
		heads("Entry", "Sites", "Higher", "Lower", "Ties", "Mean difference", "SE", "t", "df", "p", "% of check")
		for _, h := range res.HeadToHead {
			s.text(1, row, h.A, proseStyle)
			s.integer(2, row, h.Sites, styleKey{})
			s.integer(3, row, h.Higher, styleKey{})
			s.integer(4, row, h.Lower, styleKey{})
			s.integer(5, row, h.Ties, styleKey{})
			s.num(6, row, h.MeanDiff, numStyle(dec))
			numPtr(7, h.SE, numStyle(dec+1))
			numPtr(8, h.T, numStyle(3))
			if h.T != nil {
				s.integer(9, row, h.DF, styleKey{})
			} else {
				s.text(9, row, dash, dashStyle)
			}
			pOrDash(10, h.P)
			numPtr(11, h.PercentOfB, styleKey{numFmt: percentFormat})
			row++
		}
		row++
	}
	if len(res.Missing) > 0 {
		s.textNoWidth(1, row, "Entries not tested at every site", sectionStyle)
		row++
		for _, m := range res.Missing {
			s.textNoWidth(1, row, m.Treatment+": not at "+strings.Join(m.Sites, ", "), proseStyle)
			row++
		}
		row++
	}
	s.fitColumns(7, 30)

	// Charts, one under another below the tables.
	if r.charts != nil && s.err == nil {
		c := <-r.charts[i]
		alt := [3]string{"Means across sites of ", "Entry × site table of ", "Response to the site mean of "}
		for k := 0; k < 3; k++ {
			if c.errs[k] != nil {
				s.textNoWidth(1, row, "Chart not drawn: "+c.errs[k].Error(), noteStyle)
				row += 2
				continue
			}
			yes := true
			s.fail(r.f.AddPictureFromBytes(name, cellName(1, row), &excelize.Picture{
				Extension: ".png", File: c.png[k],
				Format: &excelize.GraphicOptions{AltText: alt[k] + title, PrintObject: &yes, LockAspectRatio: true},
			}))
			row += pngRows(c.png[k]) + 1
		}
	}
	s.printSetup(r.opts.Paper, true, r.opts.Name+": "+title)
	return s.err
}

// para writes a long note across columns A–J, wrapped, with the row
// made tall enough for it, so that a sentence does not widen the printed
// page.
func (s *sheet) para(row int, v string) {
	const cols, chars = 10, 120
	s.textNoWidth(1, row, v, styleKey{italic: true, wrap: true, valign: "top"})
	if s.err != nil {
		return
	}
	s.fail(s.f.MergeCell(s.name, cellName(1, row), cellName(cols, row)))
	lines := math.Ceil(displayWidth(v) / chars)
	if lines > 1 {
		s.fail(s.f.SetRowHeight(s.name, row, 15*math.Min(lines, 12)))
	}
}

// pngRows is the number of default-height rows (15 points, 20 px) a PNG
// drawn at chart.Save's resolution covers.
func pngRows(png []byte) int {
	if len(png) < 24 {
		return 20
	}
	h := int(png[20])<<24 | int(png[21])<<16 | int(png[22])<<8 | int(png[23])
	return h/20 + 1
}
