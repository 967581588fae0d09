package cli

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"

	"furlong/trial/trialfile"
)

// TestLogCommand adds entries to the demo trial's log with 'furlong log',
// finds them in date order in the file and on the report's Operations
// sheet, removes one, and checks the plain errors that change nothing.
func TestLogCommand(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "demo.furlong")
	if code, _, errs := run(t, "new", "--demo", "-o", path); code != 0 {
		t.Fatalf("new --demo: %d %s", code, errs)
	}
	// The demo's own log (internal/gen): five entries; take them out.
	code, out, _ := run(t, "log", path)
	if code != 0 || !strings.Contains(out, "Log of operations (5)") || !strings.Contains(out, "1  2026-04-02  sowing") {
		t.Fatalf("demo log: %d %q", code, out)
	}
	for i := 0; i < 5; i++ {
		if code, _, errs := run(t, "log", path, "--remove", "1"); code != 0 {
			t.Fatalf("remove: %d %s", code, errs)
		}
	}
	code, out, _ = run(t, "log", path)
	if code != 0 || !strings.Contains(out, "log of operations is empty") {
		t.Fatalf("empty log: %d %q", code, out)
	}
	for _, args := range [][]string{
		{"--add", "application", "--date", "2026-05-14", "--treatments", "HM01,HM02", "--product", "Programme A product 1",
			"--rate", "1.25", "--rate-unit", "L/ha", "--water", "200", "--temp", "14.5", "--wind", "8", "--wind-dir", "SW", "--humidity", "65",
			"--stage", "31", "--scale", "BBCH", "--by", "crew 2"},
		{"--add", "sowing", "--date", "2026-04-02", "--notes", "350 seeds/m²"},
	} {
		code, out, errs := run(t, append([]string{"log", path}, args...)...)
		if code != 0 {
			t.Fatalf("%v: %d %s", args, code, errs)
		}
		if args[1] == "application" && !strings.Contains(out, "Caution: ") {
			t.Errorf("no caution after an application:\n%s", out)
		}
	}
	tr, err := trialfile.Load(path)
	if err != nil {
		t.Fatal(err)
	}
	if len(tr.Operations) != 2 || tr.Operations[0].Kind != "sowing" || tr.Operations[1].Product != "Programme A product 1" ||
		*tr.Operations[1].WaterVolume != 200 || *tr.Operations[1].Humidity != 65 {
		t.Fatalf("log in the file: %+v", tr.Operations)
	}
	for _, tc := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"--add", "application", "--date", "2026-05-20"}, 1, "name of the product"},
		{[]string{"--add", "sowing", "--date", "2 April"}, 2, "YYYY-MM-DD"},
		{[]string{"--add", "sowing"}, 2, "--date"},
		{[]string{"--add", "other", "--date", "2026-05-20", "--treatments", "ZZ"}, 1, `no treatment "ZZ"`},
		{[]string{"--add", "other", "--date", "2026-05-20", "--temp", "warm"}, 2, `--temp "warm"`},
		{[]string{"--remove", "7"}, 1, "the log has 2"},
		{[]string{"--date", "2026-05-20"}, 2, "go with --add"},
	} {
		code, _, errs := run(t, append([]string{"log", path}, tc.args...)...)
		if code != tc.code || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d %q; want %d and %q", tc.args, code, errs, tc.code, tc.want)
		}
	}
	book := filepath.Join(dir, "r.xlsx")
	if code, _, errs := run(t, "report", path, "--traits", "wt", "--no-charts", "--vs-check=false", "-o", book); code != 0 {
		t.Fatalf("report: %d %s", code, errs)
	}
	f, err := excelize.OpenFile(book)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := f.GetRows("Operations")
	if err != nil {
		t.Fatal(err)
	}
	var dates []string
	for _, r := range rows {
		if len(r) > 1 && strings.HasPrefix(r[0], "2026-") {
			dates = append(dates, r[0]+" "+r[1])
		}
	}
	if strings.Join(dates, "|") != "2026-04-02 Sowing|2026-05-14 Application" {
		t.Errorf("Operations sheet rows %v", dates)
	}
	code, out, _ = run(t, "log", path, "--remove", "1")
	if code != 0 || strings.Contains(out, "sowing") || !strings.Contains(out, "Log of operations (1)") || !strings.Contains(out, "1  2026-05-14  application") {
		t.Errorf("remove 1: %d %q", code, out)
	}
}
