package chart

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"slices"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/stat"

	"furlong/stats/refdata"
	"furlong/stats/series"
)

// fourSiteSeries reads stats/refdata/series-4-sites.csv (R 4.2.2 reference
// set, see stats/refdata/README.md) into a Series analysed with sites random,
// with its plot-level cell means computed here.
func fourSiteSeries(t *testing.T) (*Series, *series.Result) {
	t.Helper()
	f, err := refdata.Open("series-4-sites.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var sites, entries []string
	idx := func(names *[]string, s string) int {
		if i := slices.Index(*names, s); i >= 0 {
			return i
		}
		*names = append(*names, s)
		return len(*names) - 1
	}
	var p series.Plots
	for _, r := range rows[1:] {
		si, ei := idx(&sites, r[1]), idx(&entries, r[3])
		b, _ := strconv.Atoi(r[2])
		y, _ := strconv.ParseFloat(r[4], 64)
		p.Response = append(p.Response, y)
		p.Site, p.Entry, p.Block = append(p.Site, si), append(p.Entry, ei), append(p.Block, b-1)
		p.Blocks = max(p.Blocks, b)
	}
	p.Sites, p.Entries = len(sites), len(entries)
	res, err := series.Combined(p, series.SitesRandom)
	if err != nil {
		t.Fatal(err)
	}
	sep, err := res.Separate(0.05, false, false)
	if err != nil {
		t.Fatal(err)
	}
	st, err := series.StabilityOf(res.Cells, false)
	if err != nil {
		t.Fatal(err)
	}
	check := slices.Index(entries, "V1")
	return &Series{
		Name: "Programme A 2026", Trait: "Yield (t/ha)", Entries: entries, Sites: sites,
		Cells: res.Cells, Means: res.Means, Letters: sep.LSD.Letters, LetterMethod: "LSD",
		Stability: st, Check: check, SitesNote: "sites random",
	}, res
}

func TestSeriesResponseAgainstR(t *testing.T) {
	t.Parallel()
	s, _ := fourSiteSeries(t)
	var ref struct {
		FW []struct {
			Treatment string  `json:"treatment"`
			Slope     float64 `json:"slope"`
		} `json:"finlay_wilkinson"`
	}
	b, err := refdata.ReadFile("series-4-sites.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	lines, index, err := ResponseLines(s)
	if err != nil {
		t.Fatal(err)
	}
	if len(lines) != len(ref.FW) {
		t.Fatalf("%d lines, want %d", len(lines), len(ref.FW))
	}
	for _, l := range lines {
		code := s.Entries[l.Entry]
		i := slices.IndexFunc(ref.FW, func(r struct {
			Treatment string  `json:"treatment"`
			Slope     float64 `json:"slope"`
		}) bool {
			return r.Treatment == code
		})
		if i < 0 {
			t.Fatalf("entry %s not in the reference", code)
		}
		// R 4.2.2 lm(entry site mean ~ site mean), see stats/refdata/README.md.
		if math.Abs(l.Slope-ref.FW[i].Slope) > 1e-9 {
			t.Errorf("%s slope %.12g, R %.12g", code, l.Slope, ref.FW[i].Slope)
		}
		// The line is the least-squares line of the points: gonum's
		// stat.LinearRegression (a general-purpose reference) on the same
		// points gives the same intercept.
		xs, ys := make([]float64, len(l.Points)), make([]float64, len(l.Points))
		for k, pt := range l.Points {
			xs[k], ys[k] = pt.X, pt.Y
		}
		a, _ := stat.LinearRegression(xs, ys, nil, false)
		if math.Abs(a-l.Intercept) > 1e-9 {
			t.Errorf("%s intercept %.12g, least squares %.12g", code, l.Intercept, a)
		}
		if !l.Highlighted {
			t.Errorf("%s grey with only %d entries", code, len(s.Entries))
		}
	}
	// The site index of a complete table is the mean of the entries at the
	// site (Finlay & Wilkinson 1963).
	for si, row := range s.Cells {
		if math.Abs(index[si]-stat.Mean(row, nil)) > 1e-12 {
			t.Errorf("site %d index %g, mean %g", si, index[si], stat.Mean(row, nil))
		}
	}
	p, err := Response(s)
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(render(t, p, "svg"))
	for _, want := range []string{"1:1 (slope 1)", "V1 (check): slope " + strconv.FormatFloat(ref.FW[0].Slope, 'f', 2, 64)} {
		if countText(texts, want) != 1 {
			t.Errorf("text %q missing; have %q", want, texts)
		}
	}
}

func TestSeriesResponseGreysTheRest(t *testing.T) {
	t.Parallel()
	s, _ := fourSiteSeries(t)
	// Twelve entries: the six again under other codes, so more than eight.
	for si := range s.Cells {
		s.Cells[si] = append(s.Cells[si], s.Cells[si]...)
		for i := range s.Cells[si][6:] {
			s.Cells[si][6+i] += 0.1 * float64(i+si)
		}
	}
	for i := 0; i < 6; i++ {
		s.Entries = append(s.Entries, "X"+strconv.Itoa(i))
	}
	st, err := series.StabilityOf(s.Cells, false)
	if err != nil {
		t.Fatal(err)
	}
	s.Stability = st
	s.Highlight = []int{7}
	lines, _, err := ResponseLines(s)
	if err != nil {
		t.Fatal(err)
	}
	var hl []string
	for _, l := range lines {
		if l.Highlighted {
			hl = append(hl, s.Entries[l.Entry])
		}
	}
	if !slices.Equal(hl, []string{"V1", "X1"}) {
		t.Errorf("highlighted %v, want the check V1 and the chosen X1", hl)
	}
	p, err := Response(s)
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(render(t, p, "svg"))
	if countText(texts, "Other entries (10)") != 1 {
		t.Errorf("no key of the ten grey entries; have %q", texts)
	}
}

func TestSeriesHeatMapValues(t *testing.T) {
	t.Parallel()
	s, _ := fourSiteSeries(t)
	s.Cells[2][3] = math.NaN() // one entry not tested at one site
	for _, pct := range []bool{false, true} {
		p, err := SeriesHeatMap(s, SeriesHeatMapOptions{PercentOfCheck: pct, Order: ByCode})
		if err != nil {
			t.Fatal(err)
		}
		texts := svgTexts(render(t, p, "svg"))
		// Every tested cell is written with its value: the site mean of
		// the plots (or 100 × entry / check at the site, common practice).
		for si, row := range s.Cells {
			for e, v := range row {
				if math.IsNaN(v) {
					continue
				}
				want := strconv.FormatFloat(v, 'f', 2, 64)
				if pct {
					want = strconv.FormatFloat(100*v/row[s.Check], 'f', 1, 64)
				}
				if countText(texts, want) < 1 {
					t.Errorf("pct %v: cell %s/%s %q not written", pct, s.Sites[si], s.Entries[e], want)
				}
			}
		}
		if countText(texts, "Not tested (1)") != 1 {
			t.Errorf("pct %v: missing cell not in the key; have %q", pct, texts)
		}
	}
	s.Check = -1
	if _, err := SeriesHeatMap(s, SeriesHeatMapOptions{PercentOfCheck: true}); err == nil {
		t.Error("percent of check without a check: no error")
	}
}

func TestSeriesMeansChart(t *testing.T) {
	t.Parallel()
	s, res := fourSiteSeries(t)
	p, err := SeriesMeans(s, MeansOptions{Points: true})
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(render(t, p, "svg"))
	for i, l := range s.Letters {
		want := 0
		for _, o := range s.Letters {
			if o == l {
				want++
			}
		}
		if got := countText(texts, l); got < want {
			t.Errorf("entry %s letters %q appear %d times, want %d", s.Entries[i], l, got, want)
		}
	}
	// Ticks in order of the across-site means (R emmeans, stats/refdata), highest first.
	var ticks []string
	for _, tx := range texts {
		if slices.Contains(s.Entries, tx) {
			ticks = append(ticks, tx)
		}
	}
	for i := 1; i < len(ticks); i++ {
		a, b := slices.Index(s.Entries, ticks[i-1]), slices.Index(s.Entries, ticks[i])
		if res.Means[a].Mean < res.Means[b].Mean {
			t.Errorf("tick %s (%g) before %s (%g)", ticks[i-1], res.Means[a].Mean, ticks[i], res.Means[b].Mean)
		}
	}
	if !slices.ContainsFunc(texts, func(s string) bool { return strings.Contains(s, "Means across 4 sites (sites random)") }) {
		t.Errorf("no subtitle; have %q", texts)
	}
	s.Cells = s.Cells[:2]
	if _, err := SeriesMeans(s, MeansOptions{}); err != ErrSeriesShape {
		t.Errorf("mismatched table: %v, want ErrSeriesShape", err)
	}
}
