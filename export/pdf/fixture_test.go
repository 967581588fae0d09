package pdf

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"testing"
	"time"

	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/analysis"
)

// barleyExpected is the part of stats/refdata/barley-1931-rcbd.expected.json the
// tests use (R 4.2.2 results; see stats/refdata/README.md).
type barleyExpected struct {
	ANOVA []struct {
		Source string   `json:"source"`
		DF     int      `json:"df"`
		SS     float64  `json:"ss"`
		MS     float64  `json:"ms"`
		F      *float64 `json:"f"`
	} `json:"anova"`
	GrandMean float64 `json:"grand_mean"`
	CV        float64 `json:"cv_percent"`
	Means     []struct {
		Treatment string  `json:"treatment"`
		LSMean    float64 `json:"ls_mean"`
		SE        float64 `json:"se"`
	} `json:"means"`
	LSD float64 `json:"lsd_05"`
}

func fptr(v float64) *float64 { return &v }

// Title with the characters a Latin-1 PDF font would lose (invented).
const barleyTitle = "Barley – variété test ± × (reference data)"

// barleyTrial is an RCBD trial carrying the 1931 barley yields: 10
// varieties (the first one the check), the 6 sites as blocks.
func barleyTrial(tb testing.TB) (*trial.Trial, barleyExpected) {
	tb.Helper()
	raw, err := refdata.ReadFile("barley-1931-rcbd.csv")
	if err != nil {
		tb.Fatal(err)
	}
	recs, err := csv.NewReader(bytes.NewReader(raw)).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	yield := map[[2]string]float64{}
	var sites, varieties []string
	seen := map[string]bool{}
	for _, r := range recs[1:] {
		v, err := strconv.ParseFloat(r[2], 64)
		if err != nil {
			tb.Fatal(err)
		}
		yield[[2]string{r[0], r[1]}] = v
		if !seen["s"+r[0]] {
			seen["s"+r[0]] = true
			sites = append(sites, r[0])
		}
		if !seen["v"+r[1]] {
			seen["v"+r[1]] = true
			varieties = append(varieties, r[1])
		}
	}
	var exp barleyExpected
	js, err := refdata.ReadFile("barley-1931-rcbd.expected.json")
	if err != nil {
		tb.Fatal(err)
	}
	if err := json.Unmarshal(js, &exp); err != nil {
		tb.Fatal(err)
	}
	var tms []trial.Treatment
	for i, v := range varieties {
		tm := trial.Treatment{Code: fmt.Sprintf("V%02d", i+1), Name: v, Role: trial.RoleEntry}
		if i == 0 {
			tm.Role = trial.RoleCheck
		}
		tms = append(tms, tm)
	}
	t, err := trial.New(trial.NewOptions{
		Title: barleyTitle, Crop: "barley", Season: "1931",
		Site:       trial.Site{Name: "Reference plots"},
		Treatments: tms,
		Design:     trial.Design{Kind: trial.RCBD, Reps: len(sites)},
		Layout:     trial.Layout{PlotLength: 10, PlotWidth: 1.5, HarvestLength: 8, HarvestWidth: 1.5, Alley: 1, PlotsPerRow: 5},
		Traits: []trial.Trait{{Key: "yield", Name: "Yield", Unit: "bu/ac", Kind: trial.Continuous,
			Min: fptr(0), Max: fptr(100), Decimals: 2, HigherBetter: true}},
		Seed: 20260101,
		Now:  time.Date(2026, 3, 1, 9, 0, 0, 0, time.UTC),
	})
	if err != nil {
		tb.Fatal(err)
	}
	name := map[string]string{}
	for _, tm := range tms {
		name[tm.Code] = tm.Name
	}
	for i, p := range t.Plots {
		if err := t.SetValue(i, "yield", yield[[2]string{sites[p.Block-1], name[p.Treatment]}]); err != nil {
			tb.Fatal(err)
		}
	}
	return t, exp
}

func barleyReport(tb testing.TB, opts ReportOptions, vsCheck bool) (*trial.Trial, barleyExpected, []byte) {
	tb.Helper()
	t, exp := barleyTrial(tb)
	res, err := analysis.AnalyzeAll(context.Background(), t, nil, analysis.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	if vsCheck {
		for _, o := range res {
			if o.Result != nil {
				if o.Result.VsCheck, err = analysis.CompareWithCheck(o.Result, "V01"); err != nil {
					tb.Fatal(err)
				}
			}
		}
	}
	var buf bytes.Buffer
	if err := WriteReport(context.Background(), &buf, t, res, opts); err != nil {
		tb.Fatal(err)
	}
	return t, exp, buf.Bytes()
}

// tool returns the path of a command-line tool the test needs, or skips
// the test when it is missing here; make test (.ci/test.sh) sets
// FURLONG_REQUIRE_TOOLS after .ci/setup.sh installed the tools, and then a
// missing tool fails the test.
func tool(tb testing.TB, name, pkg string) string {
	tb.Helper()
	p, err := exec.LookPath(name)
	if err != nil {
		if os.Getenv("FURLONG_REQUIRE_TOOLS") != "" {
			tb.Fatalf("%s is missing but FURLONG_REQUIRE_TOOLS is set (as make test sets it): .ci/setup.sh should have installed %s", name, pkg)
		}
		tb.Skipf("%s is not installed (Debian/Ubuntu package %s; .ci/setup.sh installs it): skipping", name, pkg)
	}
	return p
}

// pdfText extracts the text of a PDF with poppler's pdftotext (-layout keeps
// each table row on one line).
func pdfText(tb testing.TB, data []byte, firstPage, lastPage int) string {
	tb.Helper()
	bin := tool(tb, "pdftotext", "poppler-utils")
	dir := tb.TempDir()
	in := filepath.Join(dir, "in.pdf")
	if err := os.WriteFile(in, data, 0o644); err != nil {
		tb.Fatal(err)
	}
	args := []string{"-layout", "-enc", "UTF-8"}
	if firstPage > 0 {
		args = append(args, "-f", strconv.Itoa(firstPage), "-l", strconv.Itoa(lastPage))
	}
	out, err := exec.Command(bin, append(args, in, "-")...).Output()
	if err != nil {
		tb.Fatalf("pdftotext: %v", err)
	}
	return string(out)
}

// pdfPages renders pages of a PDF as PNG files at dpi with pdftoppm and
// returns their paths.
func pdfPages(tb testing.TB, data []byte, dpi int) []string {
	tb.Helper()
	bin := tool(tb, "pdftoppm", "poppler-utils")
	dir := tb.TempDir()
	in := filepath.Join(dir, "in.pdf")
	if err := os.WriteFile(in, data, 0o644); err != nil {
		tb.Fatal(err)
	}
	if out, err := exec.Command(bin, "-png", "-r", strconv.Itoa(dpi), in, filepath.Join(dir, "page")).CombinedOutput(); err != nil {
		tb.Fatalf("pdftoppm: %v\n%s", err, out)
	}
	pages, err := filepath.Glob(filepath.Join(dir, "page*.png"))
	if err != nil || len(pages) == 0 {
		tb.Fatalf("pdftoppm wrote no pages (%v)", err)
	}
	return pages
}
