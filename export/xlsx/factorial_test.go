package xlsx

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"math"
	"strconv"
	"testing"

	"github.com/xuri/excelize/v2"

	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/analysis"
)

// oatsSplitTrial lays Yates's oats (stats/refdata/oats-split.csv) out as a
// split-plot trial with variety on main plots.
func oatsSplitTrial(t *testing.T) *trial.Trial {
	t.Helper()
	f, err := refdata.Open("oats-split.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	code := map[string]string{"Victory": "Vic", "Golden.rain": "GRain", "Marvellous": "Marv"}
	yield := map[[3]string]float64{}
	blocks := map[string]int{}
	for _, r := range rows[1:] {
		if _, ok := blocks[r[1]]; !ok {
			blocks[r[1]] = len(blocks) + 1
		}
		v, err := strconv.ParseFloat(r[4], 64)
		if err != nil {
			t.Fatal(err)
		}
		yield[[3]string{strconv.Itoa(blocks[r[1]]), code[r[2]], r[3]}] = v
	}
	tr, err := trial.New(trial.NewOptions{
		Title: "Oats split plot",
		Factors: []trial.Factor{
			{Key: "variety", Levels: []trial.Level{{Code: "Vic", Name: "Victory"}, {Code: "GRain", Name: "Golden.rain"}, {Code: "Marv", Name: "Marvellous"}}},
			{Key: "nitrogen", Levels: []trial.Level{{Code: "0.0cwt"}, {Code: "0.2cwt"}, {Code: "0.4cwt"}, {Code: "0.6cwt"}}},
		},
		Design: trial.Design{Kind: trial.SplitPlot, Reps: 6, MainFactor: "variety"},
		Traits: []trial.Trait{{Key: "yield", Kind: trial.Continuous, HigherBetter: true}},
		Seed:   11,
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range tr.Plots {
		y, ok := yield[[3]string{strconv.Itoa(p.Block), tr.LevelCode(p.Treatment, 0), tr.LevelCode(p.Treatment, 1)}]
		if !ok {
			t.Fatalf("plot %d has no yield", p.Number)
		}
		if err := tr.SetValue(i, "yield", y); err != nil {
			t.Fatal(err)
		}
	}
	return tr
}

// The trait sheet of a split plot shows the strata ANOVA and the SEDs of
// R 4.2.2 on Yates's oats (stats/refdata/oats-split.expected.json), the
// two-way table of means and the interaction chart.
func TestReportSplitPlotSheet(t *testing.T) {
	t.Parallel()
	tr := oatsSplitTrial(t)
	res, err := analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil || res[0].Err != nil {
		t.Fatal(err, res[0].Err)
	}
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, tr, res, ReportOptions{Charts: true, Version: "test"}); err != nil {
		t.Fatal(err)
	}
	f, err := excelize.OpenReader(&buf)
	if err != nil {
		t.Fatal(err)
	}
	sheet := ""
	for _, n := range f.GetSheetList() {
		if n != CoverSheet && n != SummarySheet && n != DataSheet && n != FieldMapSheet {
			sheet = n
		}
	}
	rows, err := f.GetRows(sheet, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	raw, err := refdata.ReadFile("oats-split.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		ANOVA []struct {
			Source string  `json:"source"`
			DF     int     `json:"df"`
			SS     float64 `json:"ss"`
		} `json:"anova"`
		SED map[string]float64 `json:"sed"`
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	names := map[string]string{"block": "Blocks", "variety": "variety", "error_a": "Error (a)", "nitrogen": "nitrogen",
		"variety:nitrogen": "variety × nitrogen", "error_b": "Error (b)", "total": "Total"}
	find := func(label string) []string {
		for _, r := range rows {
			if len(r) > 0 && r[0] == label {
				return r
			}
		}
		return nil
	}
	for _, want := range ref.ANOVA {
		r := find(names[want.Source])
		if len(r) < 3 {
			t.Errorf("no ANOVA row for %s", want.Source)
			continue
		}
		ss, err := strconv.ParseFloat(r[2], 64)
		if err != nil || math.Abs(ss-want.SS) > 1e-6*want.SS || r[1] != strconv.Itoa(want.DF) {
			t.Errorf("%s: row %v, want df %d SS %v", want.Source, r, want.DF, want.SS)
		}
	}
	// SEDs by their labels (two variety levels = "main", ...).
	labels := map[string]string{"main": "two variety levels", "sub": "two nitrogen levels",
		"sub_within_main": "two nitrogen levels at the same variety level", "main_within_sub": "two variety levels at the same nitrogen level"}
	for k, v := range ref.SED {
		r := find(labels[k])
		if len(r) < 2 {
			t.Errorf("no SED row %q", labels[k])
			continue
		}
		got, err := strconv.ParseFloat(r[1], 64)
		if err != nil || math.Abs(got-v) > 1e-9*v {
			t.Errorf("SED %s = %v, want %v", k, r[1], v)
		}
	}
	if find("variety \\ nitrogen") == nil {
		t.Error("no two-way table of means")
	}
	cells, err := f.GetPictureCells(sheet)
	if err != nil {
		t.Fatal(err)
	}
	pics := len(cells)
	if pics != 2 {
		t.Errorf("%d charts on the sheet, want the means chart and the interaction chart", pics)
	}
}
