package xlsx

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"furlong/export"
	"furlong/stats/refdata"
	"furlong/trial/series"
)

type seriesRef struct {
	Combined []struct {
		Source string   `json:"source"`
		DF     int      `json:"df"`
		SS     float64  `json:"ss"`
		F      *float64 `json:"f"`
		P      *float64 `json:"p"`
	} `json:"combined"`
	Means []struct {
		Treatment string  `json:"treatment"`
		Mean      float64 `json:"mean"`
		SE        float64 `json:"se"`
	} `json:"means"`
	FW []struct {
		Treatment string  `json:"treatment"`
		Slope     float64 `json:"slope"`
	} `json:"finlay_wilkinson"`
}

// fourSitesResult analyses stats/refdata/series-4-sites.csv (R 4.2.2 reference
// set) through trial/series with V1 as the check.
func fourSitesResult(t testing.TB) *series.Result {
	t.Helper()
	f, err := refdata.Open("series-4-sites.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	tt, err := series.ReadTable(f, series.TableColumns{Site: "site", Block: "block", Treatment: "entry", Responses: []string{"yield"}})
	if err != nil {
		t.Fatal(err)
	}
	res, err := series.Analyze(tt[0].Trait, tt[0].Sites, series.Options{Check: "V1"})
	if err != nil {
		t.Fatal(err)
	}
	return res
}

func writeSeriesBook(t testing.TB, res []*series.Result, charts bool) *excelize.File {
	t.Helper()
	var buf bytes.Buffer
	err := WriteSeries(&buf, res, SeriesOptions{Name: "Programme A 2026", Version: "test", Now: time.Date(2026, 12, 3, 0, 0, 0, 0, time.UTC), Charts: charts})
	if err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(&buf)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// rowOf returns the row (1-based) whose first cell is label at or after
// from, 0 when none.
func rowOf(rows [][]string, label string, from int) int {
	for i := from; i < len(rows); i++ {
		if len(rows[i]) > 0 && rows[i][0] == label {
			return i + 1
		}
	}
	return 0
}

func cellFloat(t *testing.T, f *excelize.File, sheet string, col, row int) float64 {
	t.Helper()
	v, err := f.GetCellValue(sheet, cellName(col, row), excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	x, err := strconv.ParseFloat(v, 64)
	if err != nil {
		t.Fatalf("%s!%s = %q, not a number", sheet, cellName(col, row), v)
	}
	return x
}

func TestSeriesWorkbookAgainstR(t *testing.T) {
	t.Parallel()
	var ref seriesRef
	b, err := refdata.ReadFile("series-4-sites.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	res := fourSitesResult(t)
	f := writeSeriesBook(t, []*series.Result{res}, true)
	sheets := f.GetSheetList()
	if len(sheets) != 3 || sheets[0] != SeriesCoverSheet || sheets[1] != SeriesSummarySheet {
		t.Fatalf("sheets %v", sheets)
	}
	trait := sheets[2]
	rows, err := f.GetRows(trait)
	if err != nil {
		t.Fatal(err)
	}
	// The combined ANOVA, R 4.2.2 aov (stats/refdata/README.md).
	at := rowOf(rows, "Source", 0)
	if at == 0 {
		t.Fatal("no ANOVA table")
	}
	for k, l := range ref.Combined {
		row := at + 1 + k
		if got := rows[row-1][0]; got != export.SeriesSourceLabel(l.Source) {
			t.Errorf("ANOVA line %d is %q, want %q", k, got, export.SeriesSourceLabel(l.Source))
		}
		if got := cellFloat(t, f, trait, 2, row); int(got) != l.DF {
			t.Errorf("%s df %g, R %d", l.Source, got, l.DF)
		}
		if got := cellFloat(t, f, trait, 3, row); math.Abs(got-l.SS) > 1e-9*math.Max(1, l.SS) {
			t.Errorf("%s SS %.15g, R %.15g", l.Source, got, l.SS)
		}
		if l.F != nil {
			if got := cellFloat(t, f, trait, 5, row); math.Abs(got-*l.F) > 1e-9**l.F {
				t.Errorf("%s F %.15g, R %.15g", l.Source, got, *l.F)
			}
			if got := cellFloat(t, f, trait, 6, row); math.Abs(got-*l.P) > 1e-9 {
				t.Errorf("%s p %.15g, R %.15g", l.Source, got, *l.P)
			}
		}
	}
	// Means and SEs across sites, R emmeans on lm(site mean ~ site + entry).
	at = rowOf(rows, "Entry", 0)
	for _, m := range ref.Means {
		row := rowOf(rows, m.Treatment, at)
		if row == 0 {
			t.Fatalf("entry %s missing from the means", m.Treatment)
		}
		if got := cellFloat(t, f, trait, 2, row); math.Abs(got-m.Mean) > 1e-9 {
			t.Errorf("%s mean %.15g, R %.15g", m.Treatment, got, m.Mean)
		}
		if got := cellFloat(t, f, trait, 3, row); math.Abs(got-m.SE) > 1e-9 {
			t.Errorf("%s SE %.15g, R %.15g", m.Treatment, got, m.SE)
		}
	}
	// Finlay–Wilkinson slopes, R lm of the entry's site means on the site means.
	at = rowOf(rows, "Stability across sites", 0)
	for _, fw := range ref.FW {
		row := rowOf(rows, fw.Treatment, at)
		if got := cellFloat(t, f, trait, 2, row); math.Abs(got-fw.Slope) > 1e-9 {
			t.Errorf("%s slope %.15g, R %.15g", fw.Treatment, got, fw.Slope)
		}
	}
	// Full precision: every number read back equals the result bit for bit.
	for k, m := range res.Means {
		row := rowOf(rows, res.Entries[k].Code, rowOf(rows, "Entry", 0))
		if got := cellFloat(t, f, trait, 2, row); got != m.Mean {
			t.Errorf("%s mean %v, result %v", res.Entries[k].Code, got, m.Mean)
		}
	}
	// Each site's own statistics.
	at = rowOf(rows, "Site", 0)
	for j, st := range res.SiteStats {
		row := at + 1 + j
		if rows[row-1][0] != st.Label {
			t.Errorf("site row %d is %q, want %q", j, rows[row-1][0], st.Label)
		}
		if got := cellFloat(t, f, trait, 6, row); got != *st.MSE {
			t.Errorf("%s MSE %v, result %v", st.Label, got, *st.MSE)
		}
	}
	pics, err := f.GetPictures(trait, "A1")
	_ = pics
	if err != nil {
		t.Fatal(err)
	}
	cells, err := f.GetPictureCells(trait)
	if err != nil || len(cells) != 3 {
		t.Errorf("%d pictures on the trait sheet (%v), want the 3 charts", len(cells), err)
	}

	// The summary: entries × sites, the site mean of the plots (common
	// practice: the mean of an entry's plots at a balanced site).
	srows, _ := f.GetRows(SeriesSummarySheet)
	head := rowOf(srows, "Entry", 0)
	for i, e := range res.Entries {
		row := rowOf(srows, e.Code, head)
		for j := range res.SiteStats {
			if got := cellFloat(t, f, SeriesSummarySheet, 3+j, row); got != res.Cells[j][i] {
				t.Errorf("summary %s at site %d: %v, want %v", e.Code, j, got, res.Cells[j][i])
			}
		}
		if got := cellFloat(t, f, SeriesSummarySheet, 3+len(res.SiteStats), row); got != res.Means[i].Mean {
			t.Errorf("summary %s mean %v, want %v", e.Code, got, res.Means[i].Mean)
		}
		if got := srows[row-1][4+len(res.SiteStats)-1]; got != res.Means[i].Letters {
			t.Errorf("summary %s letters %q, want %q", e.Code, got, res.Means[i].Letters)
		}
		if got := cellFloat(t, f, SeriesSummarySheet, 6+len(res.SiteStats), row); math.Abs(got-100*res.Means[i].Mean/res.Means[res.Check].Mean) > 1e-9 {
			t.Errorf("summary %s %% check %v", e.Code, got)
		}
	}

	// Under the entries, each site's mean of all its plots (by hand from
	// the CSV: the site is balanced, so the grand mean of its plots), not
	// a second copy of the check's row.
	srow := rowOf(srows, "Site mean", head)
	if srow == 0 || rowOf(srows, "Check mean", head) != 0 {
		t.Fatalf("site mean row %d (and a check mean row?)", srow)
	}
	raw, err := refdata.ReadFile("series-4-sites.csv")
	if err != nil {
		t.Fatal(err)
	}
	recs, err := csv.NewReader(bytes.NewReader(raw)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	siteSum, siteN := map[string]float64{}, map[string]int{}
	for _, r := range recs[1:] {
		y, _ := strconv.ParseFloat(r[4], 64)
		siteSum[r[1]] += y
		siteN[r[1]]++
	}
	for j, st := range res.SiteStats {
		want := siteSum[st.Site] / float64(siteN[st.Site])
		if got := cellFloat(t, f, SeriesSummarySheet, 3+j, srow); math.Abs(got-want) > 1e-9 {
			t.Errorf("site mean of %s: %v, by hand %v", st.Site, got, want)
		}
	}

	// The cover names the method, every site and the cautions.
	crows, _ := f.GetRows(SeriesCoverSheet)
	var cover []string
	for _, r := range crows {
		cover = append(cover, strings.Join(r, " "))
	}
	all := strings.Join(cover, "\n")
	for _, want := range append([]string{"sites random", "combined analysis of the plots", "Farm1", "Farm4"}, export.SeriesCautions...) {
		if !strings.Contains(all, want) {
			t.Errorf("cover lacks %q", want)
		}
	}
}

func TestSeriesWorkbookNoResults(t *testing.T) {
	t.Parallel()
	if err := WriteSeries(&bytes.Buffer{}, nil, SeriesOptions{}); err == nil {
		t.Error("no results: no error")
	}
}
