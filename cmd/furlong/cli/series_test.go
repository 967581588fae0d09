package cli

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/xuri/excelize/v2"
	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"

	"furlong/export/xlsx"
	"furlong/stats/refdata"
	"furlong/trial/series"
)

// The series reference data come from stats/refdata (README there):
// series-4-sites (R 4.2.2 aov, lm and emmeans on a seeded 4-site RCBD
// series, refdata round2) and the 1931 half of Immer, Hayes & Powers
// (1934), J. Am. Soc. Agron. 26, 403–419, as shipped in R's lattice::barley
// (R 4.2.2 aov and emmeans with sites as blocks).

type seriesRefLine struct {
	Source string   `json:"source"`
	DF     int      `json:"df"`
	SS     float64  `json:"ss"`
	F      *float64 `json:"f"`
	P      *float64 `json:"p"`
}

type seriesRef struct {
	Combined []seriesRefLine `json:"combined"`
	ANOVA    []seriesRefLine `json:"anova"`
	Means    []struct {
		Treatment string  `json:"treatment"`
		Mean      float64 `json:"mean"`
		LSMean    float64 `json:"ls_mean"`
		SE        float64 `json:"se"`
	} `json:"means"`
	FW []struct {
		Treatment string  `json:"treatment"`
		Slope     float64 `json:"slope"`
	} `json:"finlay_wilkinson"`
}

// seriesOut is the JSON of "furlong series --format json" as the README
// documents it.
type seriesOut struct {
	Traits []struct {
		Trait  string `json:"trait"`
		Method string `json:"method"`
		Sites  []struct {
			Site      string   `json:"site"`
			N         int      `json:"n"`
			GrandMean float64  `json:"grand_mean"`
			MSE       *float64 `json:"mse"`
			DFError   int      `json:"df_error"`
			CV        *float64 `json:"cv_percent"`
			P         *float64 `json:"p_treatment"`
			LSD       *float64 `json:"lsd"`
		} `json:"sites"`
		SitesEffect string `json:"sites_effect"`
		Weighted    bool   `json:"weighted"`
		Bartlett    *struct {
			K2       float64 `json:"k2"`
			P        float64 `json:"p"`
			MSERatio float64 `json:"mse_ratio"`
			Reading  string  `json:"reading"`
		} `json:"bartlett"`
		ANOVA []struct {
			Source string   `json:"source"`
			DF     int      `json:"df"`
			SS     float64  `json:"ss"`
			MS     *float64 `json:"ms"`
			F      *float64 `json:"f"`
			P      *float64 `json:"p"`
		} `json:"anova"`
		Means []struct {
			Treatment      string   `json:"treatment"`
			Mean           float64  `json:"mean"`
			SE             float64  `json:"se"`
			NSites         int      `json:"n_sites"`
			Letters        string   `json:"letters"`
			PercentOfCheck *float64 `json:"percent_of_check"`
		} `json:"means"`
		Stability []struct {
			Treatment  string   `json:"treatment"`
			Slope      *float64 `json:"slope"`
			SlopeSE    *float64 `json:"slope_se"`
			DevMS      *float64 `json:"deviation_ms"`
			Ecovalence float64  `json:"ecovalence"`
		} `json:"stability"`
		HeadToHead []struct {
			Treatment string   `json:"treatment"`
			Versus    string   `json:"versus"`
			Sites     int      `json:"sites"`
			Higher    int      `json:"higher"`
			Lower     int      `json:"lower"`
			MeanDiff  float64  `json:"mean_diff"`
			P         *float64 `json:"p"`
		} `json:"head_to_head"`
		Missing []struct {
			Treatment string   `json:"treatment"`
			Sites     []string `json:"sites"`
		} `json:"missing"`
		Warnings []string `json:"warnings"`
	} `json:"traits"`
	Cautions []string `json:"cautions"`
}

func readSeriesRef(t *testing.T, name string) seriesRef {
	t.Helper()
	var r seriesRef
	refdata.JSON(t, name, &r)
	return r
}

// runSeriesCmd runs "furlong series ARGS" and returns its standard output,
// standard error and exit code.
func runSeriesCmd(t *testing.T, args ...string) (string, string, int) {
	t.Helper()
	var out, errb bytes.Buffer
	code := Main(context.Background(), append([]string{"series"}, args...), Env{Stdout: &out, Stderr: &errb, Version: "test"})
	return out.String(), errb.String(), code
}

func seriesJSON(t *testing.T, args ...string) seriesOut {
	t.Helper()
	out, errs, code := runSeriesCmd(t, append(args, "--format", "json")...)
	if code != ExitOK {
		t.Fatalf("series %v: exit %d: %s", args, code, errs)
	}
	var got seriesOut
	if err := json.Unmarshal([]byte(out), &got); err != nil {
		t.Fatalf("series JSON: %v\n%s", err, out)
	}
	if len(got.Traits) != 1 {
		t.Fatalf("%d traits, want 1", len(got.Traits))
	}
	return got
}

func nearRel(a, b, tol float64) bool { return math.Abs(a-b) <= tol*math.Max(1, math.Abs(b)) }

// checkFourSites compares the JSON of the 4-site series with R 4.2.2
// (refdata round2 series-4-sites: aov(yield ~ site + site:block + entry +
// entry:site) with entry tested against entry × site; emmeans on the site
// means; Finlay–Wilkinson slopes by lm).
func checkFourSites(t *testing.T, label string, got seriesOut) {
	t.Helper()
	want := readSeriesRef(t, "series-4-sites.expected.json")
	tr := got.Traits[0]
	if tr.Method != "combined" || tr.SitesEffect != "random" {
		t.Errorf("%s: method %q sites %q, want combined, random (every entry in every block at every site)", label, tr.Method, tr.SitesEffect)
	}
	for _, w := range want.Combined {
		found := false
		for _, l := range tr.ANOVA {
			if l.Source != w.Source {
				continue
			}
			found = true
			if l.DF != w.DF || !nearRel(l.SS, w.SS, 1e-9) {
				t.Errorf("%s %s: df %d ss %.12g, want %d %.12g (R aov)", label, w.Source, l.DF, l.SS, w.DF, w.SS)
			}
			if w.F != nil && (l.F == nil || !nearRel(*l.F, *w.F, 1e-9) || !nearRel(*l.P, *w.P, 1e-7)) {
				t.Errorf("%s %s: F %v p %v, want %g %g (R aov)", label, w.Source, l.F, l.P, *w.F, *w.P)
			}
		}
		if !found {
			t.Errorf("%s: no ANOVA line %q", label, w.Source)
		}
	}
	if len(tr.Means) != len(want.Means) {
		t.Fatalf("%s: %d means, want %d", label, len(tr.Means), len(want.Means))
	}
	for _, w := range want.Means {
		ok := false
		for _, m := range tr.Means {
			if m.Treatment == w.Treatment {
				ok = true
				if !nearRel(m.Mean, w.Mean, 1e-9) || !nearRel(m.SE, w.SE, 1e-9) || m.NSites != 4 {
					t.Errorf("%s %s: mean %.12g se %.12g sites %d, want %.12g %.12g 4 (R emmeans)", label, w.Treatment, m.Mean, m.SE, m.NSites, w.Mean, w.SE)
				}
				// Percent of the check V1 from R's means (common practice: 100 × mean / check mean).
				if m.PercentOfCheck == nil || !nearRel(*m.PercentOfCheck, 100*w.Mean/want.Means[0].Mean, 1e-9) {
					t.Errorf("%s %s: percent of check %v", label, w.Treatment, m.PercentOfCheck)
				}
			}
		}
		if !ok {
			t.Errorf("%s: no mean of %s", label, w.Treatment)
		}
	}
	for _, w := range want.FW {
		ok := false
		for _, s := range tr.Stability {
			if s.Treatment == w.Treatment {
				ok = true
				if s.Slope == nil || !nearRel(*s.Slope, w.Slope, 1e-9) {
					t.Errorf("%s %s: slope %v, want %g (R lm)", label, w.Treatment, s.Slope, w.Slope)
				}
			}
		}
		if !ok {
			t.Errorf("%s: no stability of %s", label, w.Treatment)
		}
	}
	// 4 sites, each an RCBD of 6 entries × 3 blocks: 18 plots and
	// (6−1)(3−1) = 10 error df (common practice); Bartlett on 4 variances.
	if len(tr.Sites) != 4 {
		t.Fatalf("%s: %d sites", label, len(tr.Sites))
	}
	for _, s := range tr.Sites {
		if s.N != 18 || s.DFError != 10 || s.MSE == nil || s.CV == nil || s.P == nil || s.LSD == nil {
			t.Errorf("%s site %+v: want 18 plots, 10 error df, MSE, CV, p and LSD", label, s)
		}
	}
	if tr.Bartlett == nil || tr.Bartlett.Reading == "" || tr.Bartlett.MSERatio < 1 {
		t.Errorf("%s: Bartlett %+v", label, tr.Bartlett)
	}
	// Head to head with the check: every other entry, each at 4 sites,
	// higher + lower + ties = sites (common practice).
	if len(tr.HeadToHead) != 5 {
		t.Errorf("%s: %d head-to-head lines, want 5", label, len(tr.HeadToHead))
	}
	for _, h := range tr.HeadToHead {
		if h.Versus != "V1" || h.Sites != 4 || h.Higher+h.Lower > 4 || h.P == nil {
			t.Errorf("%s head to head %+v", label, h)
		}
	}
	if len(got.Cautions) == 0 {
		t.Errorf("%s: no cautions in the JSON", label)
	}
}

func TestSeriesCSVFourSites(t *testing.T) {
	t.Parallel()
	got := seriesJSON(t, refdata.File(t, "series-4-sites.csv"), "--site", "site", "--block", "block", "--treatment", "entry", "--response", "yield", "--check", "V1")
	checkFourSites(t, "CSV", got)
}

// TestSeriesBarley checks the two-stage analysis of a table of site means
// against R 4.2.2 aov and emmeans on Immer, Hayes & Powers (1934), 1931
// (lattice::barley): with sites as blocks the RCBD ANOVA is the two-stage
// analysis; complete and with two site means missing.
func TestSeriesBarley(t *testing.T) {
	t.Parallel()
	for _, name := range []string{"barley-1931-rcbd", "barley-1931-rcbd-missing"} {
		want := readSeriesRef(t, name+".expected.json")
		got := seriesJSON(t, refdata.File(t, name+".csv"), "--site", "site", "--treatment", "variety")
		tr := got.Traits[0]
		if tr.Method != "two-stage" || tr.Weighted {
			t.Errorf("%s: method %q weighted %v, want an unweighted two-stage analysis (site means)", name, tr.Method, tr.Weighted)
		}
		src := map[string]string{"site": "site", "variety": "treatment", "Residuals": "treatment:site"}
		for _, w := range want.ANOVA {
			found := false
			for _, l := range tr.ANOVA {
				if l.Source == src[w.Source] {
					found = true
					if l.DF != w.DF || !nearRel(l.SS, w.SS, 1e-6) {
						t.Errorf("%s %s: df %d ss %.10g, want %d %.10g (R aov)", name, l.Source, l.DF, l.SS, w.DF, w.SS)
					}
				}
			}
			if !found {
				t.Errorf("%s: no line %q", name, src[w.Source])
			}
		}
		for _, w := range want.Means {
			found := false
			for _, m := range tr.Means {
				if m.Treatment == w.Treatment {
					found = true
					if !nearRel(m.Mean, w.LSMean, 1e-6) || !nearRel(m.SE, w.SE, 1e-6) {
						t.Errorf("%s %s: mean %.10g se %.10g, want %.10g %.10g (R emmeans)", name, w.Treatment, m.Mean, m.SE, w.LSMean, w.SE)
					}
				}
			}
			if !found {
				t.Errorf("%s: no mean of %s", name, w.Treatment)
			}
		}
		if missing := strings.HasSuffix(name, "missing"); missing != (len(tr.Missing) == 2) {
			t.Errorf("%s: missing entries %+v", name, tr.Missing)
		}
	}
}

// TestSeriesText checks that the text output states the method, the
// sites assumption, the per-site table and the cautions.
func TestSeriesText(t *testing.T) {
	t.Parallel()
	out, errs, code := runSeriesCmd(t, refdata.File(t, "barley-1931-rcbd-missing.csv"), "--site", "site", "--treatment", "variety", "--check", "Glabron")
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	for _, want := range []string{"Method: two-stage", "Sites random", "Weighting: none", "CV%", "Bartlett", "ANOVA across sites", "treatment:site",
		"% of check", "Stability", "ecovalence", "Head to head with the check Glabron", "not tested everywhere", "Cautions:", "not a recommendation"} {
		if !strings.Contains(out, want) {
			t.Errorf("text output lacks %q:\n%s", want, out)
		}
	}
}

// writeFourSiteTrials lays out the 4-site reference series as 4 trial
// files (furlong new, fieldbook, import) holding the same plot values and
// returns their paths.
func writeFourSiteTrials(t *testing.T, dir string) []string {
	t.Helper()
	b, err := refdata.ReadFile("series-4-sites.csv")
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	// rows: plot, site, block, entry, yield
	values := map[string]map[string]string{} // site -> block/entry -> yield
	var sites []string
	for _, r := range rows[1:] {
		if values[r[1]] == nil {
			values[r[1]] = map[string]string{}
			sites = append(sites, r[1])
		}
		values[r[1]][r[2]+"/"+r[3]] = r[4]
	}
	var paths []string
	for i, site := range sites {
		path := filepath.Join(dir, strings.ToLower(site)+".furlong")
		run := func(args ...string) {
			t.Helper()
			var out, errb bytes.Buffer
			if code := Main(context.Background(), args, Env{Stdout: &out, Stderr: &errb}); code != ExitOK {
				t.Fatalf("%v: exit %d: %s", args, code, errb.String())
			}
		}
		run("new", "-o", path, "--design", "rcbd", "--treatments", "V1*,V2,V3,V4,V5,V6", "--reps", "3",
			"--seed", strconv.Itoa(100+i), "--traits", "yield:t/ha", "--site", site, "--season", "2026")
		book := filepath.Join(dir, site+"-book.csv")
		run("fieldbook", path, "-o", book)
		fb, err := os.ReadFile(book)
		if err != nil {
			t.Fatal(err)
		}
		brows, err := csv.NewReader(bytes.NewReader(fb)).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		// header: plot, block, row, column, treatment, treatment_name, yield
		for _, r := range brows[1:] {
			v, ok := values[site][r[1]+"/"+r[4]]
			if !ok {
				t.Fatalf("%s: no value for block %s entry %s", site, r[1], r[4])
			}
			r[len(r)-1] = v
		}
		var nb bytes.Buffer
		cw := csv.NewWriter(&nb)
		cw.WriteAll(brows)
		if err := os.WriteFile(book, nb.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
		run("import", path, book)
		paths = append(paths, path)
	}
	return paths
}

// TestSeriesTrialFiles runs the command on 4 trial files holding the
// reference series' plots: the same combined analysis as R's (see
// checkFourSites), the check taken from the trials, a series file saved
// and reopened, and the workbook written.
func TestSeriesTrialFiles(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	paths := writeFourSiteTrials(t, dir)
	got := seriesJSON(t, paths...)
	checkFourSites(t, "trial files", got)
	if s := got.Traits[0].Sites[0].Site; s != "Farm1" {
		t.Errorf("first site %q, want Farm1 (from the trial's details)", s)
	}

	// --save, then reopen the series file: the same numbers.
	sf := filepath.Join(dir, "region"+series.FileExt)
	if _, errs, code := runSeriesCmd(t, append(paths, "--save", sf, "--sites", "fixed")...); code != ExitOK {
		t.Fatalf("--save: exit %d: %s", code, errs)
	}
	again := seriesJSON(t, sf)
	if again.Traits[0].SitesEffect != "fixed" {
		t.Errorf("reopened series: sites %q, want fixed (saved with the series)", again.Traits[0].SitesEffect)
	}
	again = seriesJSON(t, sf, "--sites", "random")
	checkFourSites(t, "series file", again)

	// A trial gone: the series file says which.
	if err := os.Remove(paths[2]); err != nil {
		t.Fatal(err)
	}
	_, errs, code := runSeriesCmd(t, sf)
	if code != ExitFailure || !strings.Contains(errs, filepath.Base(paths[2])) {
		t.Errorf("missing trial: exit %d, %q; want exit 1 naming %s", code, errs, filepath.Base(paths[2]))
	}
}

func TestSeriesWorkbook(t *testing.T) {
	t.Parallel()
	out := filepath.Join(t.TempDir(), "series.xlsx")
	_, errs, code := runSeriesCmd(t, refdata.File(t, "series-4-sites.csv"), "--site", "site", "--block", "block", "--treatment", "entry", "--check", "V1", "-o", out)
	if code != ExitOK {
		t.Fatalf("exit %d: %s", code, errs)
	}
	f, err := excelize.OpenFile(out)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sheets := strings.Join(f.GetSheetList(), "|")
	for _, want := range []string{xlsx.SeriesCoverSheet, xlsx.SeriesSummarySheet, "yield"} {
		if !strings.Contains(sheets, want) {
			t.Errorf("sheets %s: no %q", sheets, want)
		}
	}
}

// TestSeriesErrors checks the messages and exit codes of mistakes.
func TestSeriesErrors(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	four := refdata.File(t, "series-4-sites.csv")
	overlap := filepath.Join(dir, "overlap.csv")
	// Two sites sharing 1 of 4 entries (common practice: a series compares the same entries).
	os.WriteFile(overlap, []byte("site,trt,y\nA,x1,1\nA,x2,2\nA,x3,3\nA,x4,4\nB,x1,1.5\nB,y2,2\nB,y3,3\nB,y4,4\n"), 0o644)
	run := func(args ...string) (string, string, int) {
		var out, errb bytes.Buffer
		code := Main(context.Background(), args, Env{Stdout: &out, Stderr: &errb})
		return out.String(), errb.String(), code
	}
	a := filepath.Join(dir, "a.furlong")
	b := filepath.Join(dir, "b.furlong")
	c := filepath.Join(dir, "c.furlong")
	run("new", "-o", a, "--treatments", "4", "--reps", "3", "--seed", "1", "--traits", "yield:t/ha")
	run("new", "-o", b, "--treatments", "4", "--reps", "3", "--seed", "2", "--traits", "yield:bu/ac")
	run("new", "-o", c, "--treatments", "4", "--reps", "3", "--seed", "3", "--traits", "height:cm")
	for _, tc := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"series"}, ExitUsage, "give two or more trial files"},
		{[]string{"series", a}, ExitUsage, "at least two trial files"},
		{[]string{"series", a, filepath.Join(dir, "nowhere.furlong")}, ExitFailure, "cannot find"},
		{[]string{"series", a, b}, ExitFailure, "different units"},
		{[]string{"series", a, c}, ExitFailure, "no trait in common"},
		{[]string{"series", a, c, "--trait", "yield"}, ExitFailure, "has no trait"},
		{[]string{"series", overlap, "--site", "site", "--treatment", "trt"}, ExitFailure, "shares only 1 of its 4 entries"},
		{[]string{"series", four, "--treatment", "entry"}, ExitUsage, "needs --site"},
		{[]string{"series", four, "--site", "site", "--treatment", "entry", "-o", filepath.Join(dir, "x.pdf")}, ExitUsage, "must end in .xlsx"},
		{[]string{"series", four, "--site", "site", "--treatment", "entry", "--format", "xml"}, ExitUsage, "--format must be"},
		{[]string{"series", four, "--site", "site", "--treatment", "entry", "--sites", "some"}, ExitUsage, "--sites must be"},
		{[]string{"series", four, "--site", "site", "--treatment", "entry", "--method", "duncan"}, ExitUsage, "--method must be"},
		{[]string{"series", a, b, "--site", "site"}, ExitUsage, "are for a CSV table"},
	} {
		_, errs, code := run(tc.args...)
		if code != tc.code || !strings.Contains(errs, tc.want) {
			t.Errorf("%v: exit %d %q; want exit %d with %q", tc.args[1:], code, errs, tc.code, tc.want)
		}
	}
}

// TestSeriesVersus: --versus V2,V3 adds V2 against V3 head to head, worked
// by hand from the CSV's plots: each site's entry means, their differences
// d, and the paired t = mean(d)/(sd(d)/√n) on n−1 df (common practice),
// its two-sided p from gonum's Student's t; the check lines stay.
func TestSeriesVersus(t *testing.T) {
	t.Parallel()
	path := refdata.File(t, "series-4-sites.csv")
	got := seriesJSON(t, path, "--site", "site", "--block", "block", "--treatment", "entry", "--response", "yield", "--check", "V1", "--versus", "V2,V3")
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(f).ReadAll()
	f.Close()
	if err != nil {
		t.Fatal(err)
	}
	sum, n := map[[2]string]float64{}, map[[2]string]int{}
	var sites []string
	for _, r := range rows[1:] {
		y, _ := strconv.ParseFloat(r[4], 64)
		k := [2]string{r[1], r[3]}
		if !slices.Contains(sites, r[1]) {
			sites = append(sites, r[1])
		}
		sum[k] += y
		n[k]++
	}
	var d []float64
	higher := 0
	for _, s := range sites {
		a, b := sum[[2]string{s, "V2"}]/float64(n[[2]string{s, "V2"}]), sum[[2]string{s, "V3"}]/float64(n[[2]string{s, "V3"}])
		d = append(d, a-b)
		if a > b {
			higher++
		}
	}
	mean, sd := stat.MeanStdDev(d, nil)
	tv := mean / (sd / math.Sqrt(float64(len(d))))
	p := 2 * distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(len(d) - 1)}.Survival(math.Abs(tv))
	hh := got.Traits[0].HeadToHead
	if len(hh) != 6 {
		t.Fatalf("%d head-to-head lines, want 5 against the check and the pair", len(hh))
	}
	h := hh[5]
	if h.Treatment != "V2" || h.Versus != "V3" || h.Sites != len(sites) || h.Higher != higher || math.Abs(h.MeanDiff-mean) > 1e-9 || h.P == nil || math.Abs(*h.P-p) > 1e-9 {
		t.Errorf("V2 vs V3: %+v (p %v); by hand diff %.6f, higher %d, p %.6f", h, h.P, mean, higher, p)
	}
	for _, bad := range []string{"V2", "V2,V2", "V2,ZZ"} {
		if _, errs, code := runSeriesCmd(t, path, "--site", "site", "--block", "block", "--treatment", "entry", "--response", "yield", "--versus", bad); code != ExitUsage || !strings.Contains(errs, "--versus") {
			t.Errorf("--versus %q: exit %d, %q", bad, code, errs)
		}
	}
}

// With -o the workbook is what was asked for: one line says where it went;
// --format prints the analysis as well (common practice for commands that
// write a file).
func TestSeriesWorkbookOnly(t *testing.T) {
	t.Parallel()
	path := refdata.File(t, "series-4-sites.csv")
	out := filepath.Join(t.TempDir(), "s.xlsx")
	args := []string{path, "--site", "site", "--block", "block", "--treatment", "entry", "--response", "yield", "--check", "V1", "-o", out}
	stdout, errs, code := runSeriesCmd(t, args...)
	if code != ExitOK || strings.TrimSpace(stdout) != "wrote the series workbook for 1 trait to "+out {
		t.Fatalf("exit %d, stdout %q, stderr %q", code, stdout, errs)
	}
	if _, err := os.Stat(out); err != nil {
		t.Fatal(err)
	}
	args[len(args)-1] = filepath.Join(t.TempDir(), "t.xlsx")
	stdout, _, code = runSeriesCmd(t, append(args, "--format", "text")...)
	if code != ExitOK || !strings.Contains(stdout, "Head to head") {
		t.Errorf("with --format text: exit %d, %q", code, stdout)
	}
}
