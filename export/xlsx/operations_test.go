package xlsx

import (
	"strings"
	"testing"
	"time"

	"furlong/export"
	"furlong/trial"
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
