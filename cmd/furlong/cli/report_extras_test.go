package cli

import (
	"encoding/json"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/xuri/excelize/v2"
)

// TestReportContrastMatchesAnalyze runs 'furlong analyze --contrast' and
// 'furlong report --contrast' on the demo trial: the workbook's contrasts
// table carries the same estimate, SE and adjusted p as the JSON, and the
// summary gives each entry's reading against the check. (The numbers
// themselves are checked against R in stats and trial/analysis; here the
// two commands must agree.)
func TestReportContrastMatchesAnalyze(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	trialPath := filepath.Join(dir, "demo.furlong")
	if code, _, errs := run(t, "new", "--demo", "-o", trialPath); code != 0 {
		t.Fatalf("new --demo: %d %s", code, errs)
	}
	cons := []string{"--contrast", "new=HM01,HM02 vs CHK", "--contrast", "one=HM01:1,HM02:-1", "--adjust", "holm"}
	code, out, errs := run(t, append([]string{"analyze", trialPath, "--trait", "wt", "--format", "json"}, cons...)...)
	if code != 0 {
		t.Fatalf("analyze: %d %s", code, errs)
	}
	var doc struct {
		Traits []struct {
			Key       string `json:"key"`
			Contrasts []struct {
				Name      string  `json:"name"`
				Estimate  float64 `json:"estimate"`
				SE        float64 `json:"se"`
				DF        int     `json:"df"`
				PAdjusted float64 `json:"p_adjusted"`
			} `json:"contrasts"`
			VsCheck []struct {
				Treatment string  `json:"treatment"`
				Diff      float64 `json:"diff"`
			} `json:"vs_check"`
		} `json:"traits"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil {
		t.Fatal(err)
	}
	if len(doc.Traits) != 1 || len(doc.Traits[0].Contrasts) != 2 || len(doc.Traits[0].VsCheck) != 9 {
		t.Fatalf("analyze JSON: %+v", doc.Traits)
	}
	book := filepath.Join(dir, "r.xlsx")
	code, _, errs = run(t, append([]string{"report", trialPath, "--traits", "wt", "--no-charts", "-o", book}, cons...)...)
	if code != 0 {
		t.Fatalf("report: %d %s", code, errs)
	}
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows("Plot weight", excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	find := func(first string) []string {
		for _, r := range rows {
			if len(r) > 0 && r[0] == first {
				return r
			}
		}
		return nil
	}
	for _, c := range doc.Traits[0].Contrasts {
		r := find(c.Name)
		if len(r) < 8 {
			t.Fatalf("no contrast row %q in the workbook", c.Name)
		}
		for i, want := range []float64{c.Estimate, c.SE, float64(c.DF), c.PAdjusted} {
			col := []int{2, 3, 4, 7}[i]
			if got := atof(t, r[col]); got != want {
				t.Errorf("%s column %d: workbook %v, JSON %v", c.Name, col+1, got, want)
			}
		}
	}
	for _, v := range doc.Traits[0].VsCheck {
		// The treatment's first row is its means line; the one with the
		// difference is in the table against the check.
		found := false
		for _, r := range rows {
			if len(r) > 2 && r[0] == v.Treatment && r[2] != "" && atof(t, r[2]) == v.Diff {
				found = true
			}
		}
		if !found {
			t.Errorf("%s: no difference %v from the check in the workbook", v.Treatment, v.Diff)
		}
	}
	sum, err := f.GetRows("Summary")
	if err != nil {
		t.Fatal(err)
	}
	if len(sum) < 5 || len(sum[4]) < 6 || sum[4][5] != "vs check" {
		t.Errorf("summary heads %v, want a vs check column after mean and group", sum[min(4, len(sum)-1)])
	}
}

func atof(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("%q is not a number", s)
	}
	return v
}
