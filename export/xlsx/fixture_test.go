package xlsx

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/xuri/excelize/v2"

	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/analysis"
)

// barleyExpected is the part of stats/refdata/barley-1931-rcbd.expected.json the
// tests use (R 4.2.2 results for Immer, Hayes & Powers 1934; see
// stats/refdata/README.md).
type barleyExpected struct {
	ANOVA []struct {
		Source string   `json:"source"`
		DF     int      `json:"df"`
		SS     float64  `json:"ss"`
		MS     float64  `json:"ms"`
		F      *float64 `json:"f"`
		P      *float64 `json:"p"`
	} `json:"anova"`
	TotalSS   float64 `json:"total_ss_corrected"`
	DFError   int     `json:"df_error"`
	MSE       float64 `json:"mse"`
	GrandMean float64 `json:"grand_mean"`
	CV        float64 `json:"cv_percent"`
	Means     []struct {
		Treatment string  `json:"treatment"`
		N         int     `json:"n"`
		RawMean   float64 `json:"raw_mean"`
		LSMean    float64 `json:"ls_mean"`
		SE        float64 `json:"se"`
	} `json:"means"`
	LSD     float64           `json:"lsd_05"`
	TCrit   float64           `json:"t_crit_975"`
	HSD     float64           `json:"hsd_05"`
	Letters map[string]string `json:"letters_tukey_example"`
	Shapiro struct {
		W float64 `json:"w"`
		P float64 `json:"p"`
	} `json:"shapiro_residuals"`
	RE float64 `json:"relative_efficiency_vs_crd"`
}

func loadBarley(tb testing.TB) (sites, varieties []string, yield map[[2]string]float64, exp barleyExpected) {
	tb.Helper()
	raw, err := refdata.ReadFile("barley-1931-rcbd.csv")
	if err != nil {
		tb.Fatal(err)
	}
	recs, err := csv.NewReader(bytes.NewReader(raw)).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	yield = make(map[[2]string]float64)
	seenS, seenV := map[string]bool{}, map[string]bool{}
	for _, r := range recs[1:] {
		v, err := strconv.ParseFloat(r[2], 64)
		if err != nil {
			tb.Fatal(err)
		}
		yield[[2]string{r[0], r[1]}] = v
		if !seenS[r[0]] {
			seenS[r[0]] = true
			sites = append(sites, r[0])
		}
		if !seenV[r[1]] {
			seenV[r[1]] = true
			varieties = append(varieties, r[1])
		}
	}
	js, err := refdata.ReadFile("barley-1931-rcbd.expected.json")
	if err != nil {
		tb.Fatal(err)
	}
	if err := json.Unmarshal(js, &exp); err != nil {
		tb.Fatal(err)
	}
	return sites, varieties, yield, exp
}

func fptr(v float64) *float64 { return &v }

// Hostile trait names for sheet naming (invented for the test).
const (
	hostileA = "Ertrag/Fläche: Σ"
	hostileB = "收获"
	hostileC = "A very long trait name that goes on well beyond the thirty-one character limit"
)

// barleyTrial is an RCBD trial carrying the 1931 barley yields: 10
// varieties, the 6 sites as blocks. It has the yield trait, traits with
// hostile names holding the same values, and an all-missing trait.
func barleyTrial(tb testing.TB) (*trial.Trial, barleyExpected) {
	tb.Helper()
	sites, varieties, yield, exp := loadBarley(tb)
	var tms []trial.Treatment
	for i, v := range varieties {
		tm := trial.Treatment{Code: fmt.Sprintf("V%02d", i+1), Name: v, Role: trial.RoleEntry}
		if i == 0 {
			tm.Role = trial.RoleCheck
		}
		tms = append(tms, tm)
	}
	mk := func(key, name string) trial.Trait {
		return trial.Trait{Key: key, Name: name, Unit: "bu/ac", Kind: trial.Continuous, Min: fptr(0), Max: fptr(100), Decimals: 2, HigherBetter: true}
	}
	t, err := trial.New(trial.NewOptions{
		Title: "Barley variety test & demo (reference data)", Crop: "barley", Season: "1931",
		Site:         trial.Site{Name: "Reference plots", Latitude: fptr(46.5), Longitude: fptr(-95.5), Soil: "loam", PreviousCrop: "fallow"},
		Investigator: "Test author", Objective: "Exercise the report",
		Treatments: tms,
		Design:     trial.Design{Kind: trial.RCBD, Reps: len(sites)},
		Layout:     trial.Layout{PlotLength: 10, PlotWidth: 1.5, HarvestLength: 8, HarvestWidth: 1.5, Alley: 1, PlotsPerRow: 5},
		Traits: []trial.Trait{
			mk("yield", "Yield"), mk("ef", hostileA), mk("sh", hostileB), mk("long", hostileC),
			{Key: "lodge", Name: "Lodging", Unit: "1-9", Kind: trial.Score, Min: fptr(1), Max: fptr(9)},
		},
		Seed: 20260101,
		Now:  time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		tb.Fatal(err)
	}
	name := make(map[string]string)
	for _, tm := range tms {
		name[tm.Code] = tm.Name
	}
	for i, p := range t.Plots {
		v, ok := yield[[2]string{sites[p.Block-1], name[p.Treatment]}]
		if !ok {
			tb.Fatalf("no yield for plot %d", p.Number)
		}
		for _, k := range []string{"yield", "ef", "sh", "long"} {
			if err := t.SetValue(i, k, v); err != nil {
				tb.Fatal(err)
			}
		}
	}
	return t, exp
}

var barley struct {
	once sync.Once
	out  []analysis.Outcome
	err  error
}

// barleyResults returns the real analysis of every trait of the barley
// trial (made once and shared: tests only read it); the all-missing trait
// carries the reason it has no analysis. t must hold the barley values.
func barleyResults(tb testing.TB, _ *trial.Trial) []analysis.Outcome {
	tb.Helper()
	barley.once.Do(func() {
		tr, _ := barleyTrial(tb)
		barley.out, barley.err = analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	})
	if barley.err != nil {
		tb.Fatal(barley.err)
	}
	return barley.out
}

// writeReport writes the report and opens it again.
func writeReport(tb testing.TB, t *trial.Trial, res []analysis.Outcome, opts ReportOptions) (*excelize.File, []byte) {
	tb.Helper()
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, t, res, opts); err != nil {
		tb.Fatal(err)
	}
	f, err := excelize.OpenReader(bytes.NewReader(buf.Bytes()))
	if err != nil {
		tb.Fatal(err)
	}
	tb.Cleanup(func() { f.Close() })
	return f, buf.Bytes()
}

// numberAt returns the number stored in a cell, failing unless the cell is a
// number cell: its type attribute absent or "n" (ECMA-376 Part 1,
// §18.18.11 ST_CellType, default n).
func numberAt(tb testing.TB, f *excelize.File, sheet, cell string) float64 {
	tb.Helper()
	typ, err := f.GetCellType(sheet, cell)
	if err != nil {
		tb.Fatal(err)
	}
	if typ != excelize.CellTypeUnset && typ != excelize.CellTypeNumber {
		tb.Fatalf("%s!%s: cell type %v, want a number", sheet, cell, typ)
	}
	s, err := f.GetCellValue(sheet, cell, excelize.Options{RawCellValue: true})
	if err != nil {
		tb.Fatal(err)
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		tb.Fatalf("%s!%s: %q is not a number", sheet, cell, s)
	}
	return v
}

func textAt(tb testing.TB, f *excelize.File, sheet, cell string) string {
	tb.Helper()
	s, err := f.GetCellValue(sheet, cell, excelize.Options{RawCellValue: true})
	if err != nil {
		tb.Fatal(err)
	}
	return s
}

// findRow returns the first row whose cell in column col holds text, 0 when
// none does.
func findRow(tb testing.TB, f *excelize.File, sheet string, col int, text string) int {
	tb.Helper()
	rows, err := f.GetRows(sheet, excelize.Options{RawCellValue: true})
	if err != nil {
		tb.Fatal(err)
	}
	for i, r := range rows {
		if col-1 < len(r) && strings.TrimSpace(r[col-1]) == text {
			return i + 1
		}
	}
	return 0
}

func cell(col, row int) string { return cellName(col, row) }

func near(a, b, rel float64) bool {
	return math.Abs(a-b) <= rel*math.Max(1, math.Max(math.Abs(a), math.Abs(b)))
}
