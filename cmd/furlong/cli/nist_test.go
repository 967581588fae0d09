package cli

import (
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/refdata"
)

// nistDir, a folder of stats/refdata, holds the eleven NIST StRD one-way
// ANOVA datasets with their certified values (NIST Statistical Reference
// Datasets, ANOVA section; provenance in stats/refdata/README.md).
const nistDir = "nist-strd-anova"

// digitsOf is the log relative error: the number of correct significant
// digits of got against the certified value, capped at 15 (the certified
// values are printed to 15 digits).
func digitsOf(got, cert float64) float64 {
	if got == cert {
		return 15
	}
	return math.Min(15, math.Max(0, -math.Log10(math.Abs(got-cert)/math.Abs(cert))))
}

func nistCertified(t *testing.T) map[string]map[string]string {
	t.Helper()
	b, err := refdata.ReadFile(nistDir + "/certified.json")
	if err != nil {
		t.Fatal(err)
	}
	var cert map[string]map[string]string
	if err := json.Unmarshal(b, &cert); err != nil {
		t.Fatal(err)
	}
	return cert
}

// nistDigits returns the fewest correct digits among the between and within
// sums of squares and mean squares and F of an analyze JSON result, against
// NIST's certified values.
func nistDigits(t *testing.T, name string, cert map[string]string, out string) (float64, string) {
	t.Helper()
	var doc struct {
		Traits []struct {
			ANOVA []refANOVA `json:"anova"`
		} `json:"traits"`
	}
	if err := json.Unmarshal([]byte(out), &doc); err != nil || len(doc.Traits) != 1 {
		t.Fatalf("%s: analyze JSON: %v (%d traits)", name, err, len(doc.Traits))
	}
	got := map[string]float64{}
	for _, l := range doc.Traits[0].ANOVA {
		switch l.Source {
		case "treatment":
			got["between_ss"], got["between_ms"] = l.SS, l.MS
			if l.F != nil {
				got["f"] = *l.F
			}
		case "error":
			got["within_ss"], got["within_ms"] = l.SS, l.MS
		}
	}
	least, line := 15.0, ""
	for _, k := range []string{"between_ss", "within_ss", "between_ms", "within_ms", "f"} {
		c, err := strconv.ParseFloat(cert[k], 64)
		if err != nil {
			t.Fatalf("%s %s: %v", name, k, err)
		}
		d := digitsOf(got[k], c)
		least = math.Min(least, d)
		line += " " + k + "=" + strconv.FormatFloat(d, 'f', 1, 64)
	}
	return least, line
}

// TestNISTThroughAnalyzeCSV: every NIST StRD one-way set, analysed as a user
// would (`furlong analyze FILE.csv`), gives at least 13 correct digits of the
// sums of squares, mean squares and F against NIST's certified values. The
// hardest sets (SmLs07–09: values such as 1000000000000.4 differing in the
// last digit) lose all but about 4 digits when the text is parsed to float64
// before any arithmetic; the analysis removes the values' shared digits in
// exact decimal first (trial.SharedDigits).
func TestNISTThroughAnalyzeCSV(t *testing.T) {
	t.Parallel()
	cert := nistCertified(t)
	for _, name := range []string{"SiRstv", "SmLs01", "SmLs02", "SmLs03", "AtmWtAg", "SmLs04", "SmLs05", "SmLs06", "SmLs07", "SmLs08", "SmLs09"} {
		code, out, errOut := run(t, "analyze", refdata.File(t, nistDir+"/"+name+".csv"), "--treatment", "group", "--response", "value", "--format", "json")
		if code != 0 {
			t.Fatalf("%s: exit %d: %s", name, code, errOut)
		}
		least, line := nistDigits(t, name, cert[name], out)
		t.Logf("%-8s digits:%s", name, line)
		if least < 13 {
			t.Errorf("%s: only %.1f correct digits through analyze; want at least 13", name, least)
		}
	}
}

// TestNISTThroughFieldBook: the same 13 digits when the values reach the
// analysis the field-office way: a CRD trial made with `furlong new`, its
// field book filled with NIST SmLs07's values (9 groups of 21, as certified
// by NIST StRD), `furlong import`, then `furlong analyze TRIAL`. The values
// are stored in the trial file as typed and read back from it.
func TestNISTThroughFieldBook(t *testing.T) {
	t.Parallel()
	cert := nistCertified(t)
	dir := t.TempDir()
	tr := filepath.Join(dir, "nist.furlong")
	if code, _, e := run(t, "new", "-o", tr, "--design", "crd", "--treatments", "9", "--reps", "21", "--seed", "7", "--traits", "value"); code != 0 {
		t.Fatal(e)
	}
	book := filepath.Join(dir, "book.csv")
	if code, _, e := run(t, "fieldbook", tr, "-o", book); code != 0 {
		t.Fatal(e)
	}
	src, err := refdata.ReadFile(nistDir + "/SmLs07.csv")
	if err != nil {
		t.Fatal(err)
	}
	groups := map[string][]string{} // group -> values as NIST prints them
	for _, line := range strings.Split(strings.TrimSpace(string(src)), "\n")[1:] {
		g, v, _ := strings.Cut(strings.TrimSpace(line), ",")
		groups[g] = append(groups[g], v)
	}
	b, err := os.ReadFile(book)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(b)), "\n")
	var filled strings.Builder
	filled.WriteString(lines[0] + "\n")
	for _, line := range lines[1:] {
		cells := strings.Split(line, ",")
		g := strconv.Itoa(mustAtoi(t, strings.TrimPrefix(cells[4], "T"))) // T01..T09 -> group 1..9
		v := groups[g][0]
		groups[g] = groups[g][1:]
		filled.WriteString(line + v + "\n")
	}
	if err := os.WriteFile(book, []byte(filled.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, _, e := run(t, "import", tr, book); code != 0 {
		t.Fatal(e)
	}
	code, out, e := run(t, "analyze", tr, "--format", "json")
	if code != 0 {
		t.Fatal(e)
	}
	least, line := nistDigits(t, "SmLs07 via field book", cert["SmLs07"], out)
	t.Logf("SmLs07 via field book digits:%s", line)
	if least < 13 {
		t.Errorf("SmLs07 through new/fieldbook/import/analyze: only %.1f correct digits; want at least 13", least)
	}
}

func mustAtoi(t *testing.T, s string) int {
	t.Helper()
	n, err := strconv.Atoi(s)
	if err != nil {
		t.Fatal(err)
	}
	return n
}
