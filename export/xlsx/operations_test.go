package xlsx

import (
	"context"
	"strings"
	"testing"
	"time"

	"furlong/export"
	"furlong/trial"
	"furlong/trial/analysis"
)

// TestReportOperationsSheet: a trial with a log gets an Operations sheet
// after the field map, one row per entry in date order with the values as
// recorded, the crop-protection caution over an application, and a line
// on the cover; a trial without one gets no such sheet.
func TestReportOperationsSheet(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	f0, _ := writeReport(t, tr, barleyResults(t, tr), ReportOptions{})
	if idx, _ := f0.GetSheetIndex(OperationsSheet); idx != -1 {
		t.Fatal("an Operations sheet without a log")
	}
	day := func(m time.Month, d int) time.Time { return time.Date(2026, m, d, 0, 0, 0, 0, time.UTC) }
	for _, op := range []trial.Operation{
		{Kind: trial.OpApplication, Date: day(5, 14), Treatments: []string{"V02"}, Product: "Programme B", Rate: fptr(0.8), RateUnit: "L/ha",
			WaterVolume: fptr(150), Temperature: fptr(12), Wind: fptr(6), WindDirection: "N", Humidity: fptr(70), GrowthStage: "32", Scale: "BBCH"},
		{Kind: trial.OpSowing, Date: day(4, 1)},
	} {
		if err := tr.AddOperation(op); err != nil {
			t.Fatal(err)
		}
	}
	f, _ := writeReport(t, tr, barleyResults(t, tr), ReportOptions{})
	sheets := f.GetSheetList()
	if sheets[len(sheets)-1] != OperationsSheet || sheets[len(sheets)-2] != FieldMapSheet {
		t.Fatalf("sheets %v: want Operations after the field map", sheets)
	}
	head := findRow(t, f, OperationsSheet, 1, "Date")
	if head == 0 {
		t.Fatal("no column heads")
	}
	for i, h := range export.OperationColumns {
		if got := textAt(t, f, OperationsSheet, cell(1+i, head)); got != h {
			t.Errorf("head %d %q, want %q", i+1, got, h)
		}
	}
	if got := textAt(t, f, OperationsSheet, cell(1, head+1)) + " " + textAt(t, f, OperationsSheet, cell(2, head+1)); got != "2026-04-01 Sowing" {
		t.Errorf("first entry %q", got)
	}
	r := head + 2
	for c, want := range map[int]string{2: "Application", 3: "V02", 4: "Programme B", 5: "0.8 L/ha", 8: "12 °C, wind 6 km/h N, RH 70 %", 9: "BBCH 32"} {
		if got := textAt(t, f, OperationsSheet, cell(c, r)); got != want {
			t.Errorf("column %d: %q, want %q", c, got, want)
		}
	}
	if got := numberAt(t, f, OperationsSheet, cell(6, r)); got != 150 {
		t.Errorf("water %v, want 150 as a number", got)
	}
	if findRow(t, f, OperationsSheet, 1, "Caution: "+export.ProtectionCautionText()) == 0 {
		t.Error("no caution over the application")
	}
	rows, _ := f.GetRows(CoverSheet)
	found := false
	for _, row := range rows {
		found = found || strings.Contains(strings.Join(row, " "), "2 entries, from 1 April 2026 to 14 May 2026")
	}
	if !found {
		t.Error("the cover does not mention the log")
	}
}

// TestReportProgressChart: a trial with an assessment series and its AUDPC
// gets the chart over the season once, on the AUDPC trait's sheet.
func TestReportProgressChart(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	yield, err := tr.TraitValues("yield")
	if err != nil {
		t.Fatal(err)
	}
	for k, day := range []int{1, 15} {
		v := make([]float64, len(yield))
		for i := range v {
			v[i] = yield[i] * float64(k+1) / 4 // invented scores that grow over the season
		}
		tr.Traits = append(tr.Traits, trial.Trait{Key: []string{"s1", "s2"}[k], Name: []string{"Score 1", "Score 2"}[k], Unit: "%", Kind: trial.Percent,
			Min: fptr(0), Max: fptr(100), Decimals: 1, Values: v, Assessed: time.Date(2026, 6, day, 0, 0, 0, 0, time.UTC), Assessment: &trial.Assessment{Series: "sc"}})
	}
	au := trial.AUDPCTrait("au", "sc", "%", false)
	au.Values = make([]float64, len(yield))
	tr.Traits = append(tr.Traits, au)
	keys := []string{"s1", "s2", "au"}
	res, err := analysisOf(tr, keys)
	if err != nil {
		t.Fatal(err)
	}
	f, _ := writeReport(t, tr, res, ReportOptions{Charts: true, Traits: keys})
	for _, sh := range []string{"Score 1", "Score 2", au.Name} {
		has := findRow(t, f, sh, 1, "Series sc over the season") != 0
		if has != (sh == au.Name) {
			t.Errorf("%s: chart over the season %v", sh, has)
		}
	}
	pics, err := f.GetPictureCells(au.Name)
	if err != nil || len(pics) < 2 {
		t.Errorf("AUDPC sheet pictures %v (%v): want the means chart and the chart over the season", pics, err)
	}
}

func analysisOf(t *trial.Trial, keys []string) ([]analysis.Outcome, error) {
	return analysis.AnalyzeAll(context.Background(), t, keys, analysis.Options{})
}
