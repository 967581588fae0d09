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

// TestAnalyzeExtremeUnits: the barley RCBD (Immer, Hayes & Powers 1934; see
// stats/refdata/README.md) with its yields
// multiplied by 1e-160 and by 1e100 analyses like the original: text and
// JSON output, no "NaN" anywhere, the same treatment F (F does not depend
// on the unit: a property of the ANOVA).
func TestAnalyzeExtremeUnits(t *testing.T) {
	t.Parallel()
	src := refdata.File(t, "barley-1931-rcbd.csv")
	f, err := os.Open(src)
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	args := []string{"--treatment", "variety", "--block", "site", "--response", "yield"}
	analyseJSON := func(path string) jsonTrait {
		t.Helper()
		code, out, stderr := run(t, append([]string{"analyze", path, "--format", "json"}, args...)...)
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", path, code, stderr)
		}
		var got gotJSON
		if err := json.Unmarshal([]byte(out), &got); err != nil || len(got.Traits) != 1 {
			t.Fatalf("%s: output is not one trait of JSON: %v\n%s", path, err, out)
		}
		return got.Traits[0]
	}
	ref := analyseJSON(src)
	for _, scale := range []float64{1e-160, 1e100} {
		path := filepath.Join(t.TempDir(), "scaled.csv")
		var b strings.Builder
		w := csv.NewWriter(&b)
		for i, r := range rows {
			r = append([]string(nil), r...)
			if i > 0 {
				v, err := strconv.ParseFloat(r[2], 64)
				if err != nil {
					t.Fatal(err)
				}
				r[2] = strconv.FormatFloat(v*scale, 'g', -1, 64)
			}
			_ = w.Write(r)
		}
		w.Flush()
		if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, stderr := run(t, append([]string{"analyze", path}, args...)...)
		if code != 0 || strings.Contains(out, "NaN") || strings.Contains(out, "Inf") {
			t.Errorf("scale %g: exit %d, text output:\n%s\n%s", scale, code, out, stderr)
		}
		got := analyseJSON(path)
		for i := range got.ANOVA {
			g, w := got.ANOVA[i], ref.ANOVA[i]
			if (g.F == nil) != (w.F == nil) || (g.F != nil && math.Abs(*g.F-*w.F) > 1e-9**w.F) {
				t.Errorf("scale %g: %s F %v, want %v", scale, g.Source, g.F, w.F)
			}
		}
	}
}
