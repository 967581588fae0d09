package cli

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/refdata"
)

// TestFactorialExactDecimals: warp breaks (R datasets::warpbreaks, R 4.2.2
// lm + car::Anova type II in stats/refdata) shifted to 1000000000000 +
// breaks/10, written as decimal text ("1000000000002.6"), as a factorial
// CSV: the decimal offset is taken away exactly before the fit (as for one
// list of treatments, NIST StRD's lesson), so every sum of squares is R's
// divided by 100 to 1e-9 and the means are 10¹² + R's means/10. Parsed to
// float64 first, such values keep only about 4 digits of their
// differences.
func TestFactorialExactDecimals(t *testing.T) {
	t.Parallel()
	f, err := refdata.Open("warpbreaks-factorial.csv")
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	b.WriteString("plot,wool,tension,breaks\n")
	for _, r := range rows[1:] {
		n, _ := strconv.Atoi(r[3])
		if n >= 100 {
			t.Fatalf("breaks %d: the text below holds two digits", n)
		}
		// "100000000000" then the tens digit: 10¹² + n/10 as typed.
		b.WriteString(r[0] + "," + r[1] + "," + r[2] + ",100000000000" + strconv.Itoa(n/10) + "." + strconv.Itoa(n%10) + "\n")
	}
	path := filepath.Join(t.TempDir(), "wb.csv")
	if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	raw, err := refdata.ReadFile("warpbreaks-factorial.expected.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Anova []struct {
			Source string  `json:"source"`
			SS     float64 `json:"ss"`
		} `json:"anova"`
	}
	if err := json.Unmarshal(raw, &ref); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr := run(t, "analyze", path, "--factor", "wool", "--factor", "tension", "--response", "breaks", "--format", "json")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	var out struct {
		Traits []struct {
			Anova []struct {
				Source string  `json:"source"`
				SS     float64 `json:"ss"`
			} `json:"anova"`
			GrandMean float64 `json:"grand_mean"`
		} `json:"traits"`
	}
	if err := json.Unmarshal([]byte(stdout), &out); err != nil {
		t.Fatal(err)
	}
	found := 0
	for _, l := range ref.Anova {
		for _, g := range out.Traits[0].Anova {
			if g.Source == l.Source {
				found++
				if math.Abs(g.SS-l.SS/100) > 1e-9*l.SS/100 {
					t.Errorf("%s: SS %.15g, R/100 %.15g", l.Source, g.SS, l.SS/100)
				}
			}
		}
	}
	if found != len(ref.Anova) {
		t.Errorf("%d of R's %d lines found", found, len(ref.Anova))
	}
	// The grand mean on the values' own scale: 10¹² + mean(breaks)/10
	// (mean 28.1481…, by hand from the data); float64 holds 10¹² to 1.2e-4.
	sum := 0.0
	for _, r := range rows[1:] {
		n, _ := strconv.ParseFloat(r[3], 64)
		sum += n
	}
	want := 1e12 + sum/float64(len(rows)-1)/10
	if g := out.Traits[0].GrandMean; math.Abs(g-want) > 2.5e-4 {
		t.Errorf("grand mean %.6f, want %.6f", g, want)
	}
}
