package xlsx

import (
	"bytes"
	"context"
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"
	"unicode/utf16"

	"github.com/xuri/excelize/v2"

	"furlong/export"
	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

func TestReportSummaryNumbers(t *testing.T) {
	t.Parallel()
	tr, exp := barleyTrial(t)
	res := barleyResults(t, tr)
	f, _ := writeReport(t, tr, res, ReportOptions{Method: meansep.LSD, Version: "test"})
	sum := export.NewSummary(tr, res, nil, meansep.LSD, 0.05)
	yield := res[0].Result
	yieldTrt, _ := yield.ANOVA.Treatment()

	head := findRow(t, f, SummarySheet, 1, "Treatment")
	if head == 0 {
		t.Fatal("summary has no header row")
	}
	// Trait groups start at D: mean and letters ("group"), and % of check
	// for the traits that show it, under the trait's name.
	groupCol := make([]int, len(sum.Traits))
	col := 4
	for j, st := range sum.Traits {
		groupCol[j] = col
		if got := textAt(t, f, SummarySheet, cell(col, head-1)); got != traitLabel(st.Name, st.Unit) {
			t.Errorf("header of trait %d = %q, want %q", j, got, traitLabel(st.Name, st.Unit))
		}
		if got := textAt(t, f, SummarySheet, cell(col+1, head)); got != "group" {
			t.Errorf("letters column of trait %d headed %q", j, got)
		}
		col += 2
		if st.CheckMean != nil {
			col++
		}
	}
	if sum.Traits[0].CheckMean == nil || sum.Traits[1].CheckMean != nil {
		t.Fatal("by default only the yield shows % of check")
	}
	checkMean := 0.0
	for _, m := range yield.Means {
		if m.Check {
			checkMean = m.Mean
		}
	}
	for i, m := range yield.Means {
		row := head + 1 + i
		if got := textAt(t, f, SummarySheet, cell(1, row)); got != m.Treatment {
			t.Fatalf("row %d: treatment %q, want %q", row, got, m.Treatment)
		}
		// The stored number is the analysis' mean exactly: full float64
		// precision, not the 2 decimals shown.
		if got := numberAt(t, f, SummarySheet, cell(4, row)); got != m.BackMean {
			t.Errorf("%s mean = %v, want %v", m.Treatment, got, m.BackMean)
		}
		// And against the R reference (stats/refdata, emmeans least-squares mean).
		if got := numberAt(t, f, SummarySheet, cell(4, row)); !near(got, exp.Means[i].LSMean, 1e-12) {
			t.Errorf("%s mean = %v, R gives %v", m.Treatment, got, exp.Means[i].LSMean)
		}
		if got := textAt(t, f, SummarySheet, cell(5, row)); got != m.LettersLSD {
			t.Errorf("%s letters = %q, want %q", m.Treatment, got, m.LettersLSD)
		}
		role := textAt(t, f, SummarySheet, cell(3, row))
		if (role == "check") != m.Check {
			t.Errorf("%s role %q, check %v", m.Treatment, role, m.Check)
		}
		// Yield as % of the check: 100 × mean / check mean (common practice).
		pctCol := 6
		if got, want := numberAt(t, f, SummarySheet, cell(pctCol, row)), 100*m.Mean/checkMean; !near(got, want, 1e-14) {
			t.Errorf("%s %% of check = %v, want %v", m.Treatment, got, want)
		}
		// The all-missing trait (column after the three analysed ones) shows a dash.
		if got := textAt(t, f, SummarySheet, cell(groupCol[4], row)); got != "—" {
			t.Errorf("all-missing trait shows %q, want a dash", got)
		}
	}
	// The statistics block: one row per trait, a column per statistic.
	stat := findRow(t, f, SummarySheet, 1, "Statistics of each trait") + 2
	if got := textAt(t, f, SummarySheet, cell(1, stat)); got != traitLabel(sum.Traits[0].Name, sum.Traits[0].Unit) {
		t.Fatalf("first statistics row is %q", got)
	}
	for i, want := range []struct {
		label string
		v     float64
		ref   float64
	}{
		{"Grand mean", yield.ANOVA.GrandMean, exp.GrandMean},
		{"CV%", yield.ANOVA.CVPercent, exp.CV},
		{"LSD (0.05)", *yield.LSD, exp.LSD},
		{"p", yieldTrt.P, *exp.ANOVA[1].P},
	} {
		c := []int{4, 5, 6, 9}[i] // the LSD spans F–H
		if got := textAt(t, f, SummarySheet, cell(c, stat-1)); got != want.label {
			t.Errorf("statistics column %d: %q, want %q", c, got, want.label)
		}
		got := numberAt(t, f, SummarySheet, cell(c, stat))
		if got != want.v {
			t.Errorf("%s = %v, want %v", want.label, got, want.v)
		}
		if !near(got, want.ref, 1e-6) {
			t.Errorf("%s = %v, R gives %v", want.label, got, want.ref)
		}
	}
	// Number formats: means one decimal finer than the trait's 2 (common
	// practice), and <0.001 for p.
	if got := cellFormat(t, f, SummarySheet, cell(4, head+1)); got != "0.000" {
		t.Errorf("mean number format %q, want 0.000", got)
	}
	if got := cellFormat(t, f, SummarySheet, cell(9, stat)); got != PFormat {
		t.Errorf("p number format %q, want %q", got, PFormat)
	}
	// The shown value through excelize's own formatter (RawCellValue off).
	if got, _ := f.GetCellValue(SummarySheet, cell(4, head+1)); got != strconv.FormatFloat(yield.Means[0].BackMean, 'f', 3, 64) {
		t.Errorf("shown mean %q", got)
	}
}

// cellFormat returns the custom number format of a cell.
func cellFormat(tb testing.TB, f *excelize.File, sheet, c string) string {
	tb.Helper()
	id, err := f.GetCellStyle(sheet, c)
	if err != nil {
		tb.Fatal(err)
	}
	st, err := f.GetStyle(id)
	if err != nil {
		tb.Fatal(err)
	}
	if st.CustomNumFmt == nil {
		return ""
	}
	return *st.CustomNumFmt
}

func TestReportTraitSheet(t *testing.T) {
	t.Parallel()
	tr, exp := barleyTrial(t)
	res := barleyResults(t, tr)
	f, _ := writeReport(t, tr, res, ReportOptions{Method: meansep.Tukey})
	r := res[0].Result
	sh := "Yield"
	head := findRow(t, f, sh, 1, "Source")
	if head == 0 {
		t.Fatal("no ANOVA table")
	}
	for i, src := range r.ANOVA.Sources {
		row := head + 1 + i
		if got := textAt(t, f, sh, cell(1, row)); got != export.SourceName(src) {
			t.Errorf("source %d = %q", i, got)
		}
		if got := numberAt(t, f, sh, cell(2, row)); got != float64(src.DF) {
			t.Errorf("%s df = %v", src.Name, got)
		}
		if got := numberAt(t, f, sh, cell(3, row)); got != src.SS {
			t.Errorf("%s SS = %v, want %v", src.Name, got, src.SS)
		}
		if src.Role != stats.RoleTotal {
			if got := numberAt(t, f, sh, cell(4, row)); got != src.MS {
				t.Errorf("%s MS = %v", src.Name, got)
			}
		}
		if src.HasTest {
			if got := numberAt(t, f, sh, cell(5, row)); got != src.F {
				t.Errorf("%s F = %v", src.Name, got)
			}
			if got := numberAt(t, f, sh, cell(6, row)); got != src.P {
				t.Errorf("%s p = %v", src.Name, got)
			}
		} else if got := textAt(t, f, sh, cell(5, row)); got != "" {
			t.Errorf("%s has F %q; the error and total lines have no test", src.Name, got)
		}
	}
	// Against R (car::Anova type II, stats/refdata): variety SS and F.
	if got := numberAt(t, f, sh, cell(3, head+1)); !near(got, exp.ANOVA[1].SS, 1e-12) {
		t.Errorf("treatment SS %v, R gives %v", got, exp.ANOVA[1].SS)
	}
	mh := findRow(t, f, sh, 1, "Treatment")
	for i, m := range r.Means {
		row := mh + 1 + i
		if got := textAt(t, f, sh, cell(1, row)); got != m.Treatment {
			t.Fatalf("means row %d = %q", i, got)
		}
		for c, want := range map[int]float64{3: float64(m.N), 4: m.BackMean, 5: *m.Lower, 6: *m.Upper, 8: m.RawMean, 9: m.SE} {
			if got := numberAt(t, f, sh, cell(c, row)); got != want {
				t.Errorf("%s column %d = %v, want %v", m.Treatment, c, got, want)
			}
		}
		// The limits are the LS mean ± t(0.975, error df)·SE (t from the R
		// reference file, stats/refdata).
		if lo := m.Mean - exp.TCrit*m.SE; !near(*m.Lower, lo, 1e-9) {
			t.Errorf("%s lower limit %v, want %v", m.Treatment, *m.Lower, lo)
		}
		if got := textAt(t, f, sh, cell(7, row)); got != m.LettersTukey {
			t.Errorf("%s letters %q", m.Treatment, got)
		}
	}
	// Each statistic is the analysis' value exactly and, where the R
	// reference file has it (stats/refdata: R 4.2.2 lm/emmeans; hsd_05 with
	// scipy's studentized_range; relative efficiency by Gomez & Gomez 1984,
	// section 2.2.3), agrees with R to 1e-9; ref 0 means no reference value.
	for _, want := range []struct {
		label  string
		v, ref float64
	}{
		{"Grand mean", r.ANOVA.GrandMean, exp.GrandMean}, {"CV%", r.ANOVA.CVPercent, exp.CV},
		{"R²", r.ANOVA.RSquared, 1 - exp.ANOVA[len(exp.ANOVA)-1].SS/exp.TotalSS},
		{"SE of a mean", deref(r.ANOVA.SEMean), exp.Means[0].SE}, {"SED", deref(r.ANOVA.SED), 0}, {"HSD (0.05)", *r.HSD, exp.HSD},
		{"Relative efficiency of blocking", deref(r.ANOVA.RelativeEfficiency), exp.RE},
	} {
		row := findRow(t, f, sh, 1, want.label)
		if row == 0 {
			t.Errorf("no %s line", want.label)
			continue
		}
		got := numberAt(t, f, sh, cell(2, row))
		if got != want.v {
			t.Errorf("%s = %v, want %v", want.label, got, want.v)
		}
		if want.ref != 0 && !near(got, want.ref, 1e-9) {
			t.Errorf("%s = %v, R reference gives %v", want.label, got, want.ref)
		}
	}
	// The Shapiro–Wilk reading is given in words with its p (R 4.2.2
	// shapiro.test on the residuals: p = 0.018746, stats/refdata).
	rows, _ := f.GetRows(sh)
	var all strings.Builder
	for _, r := range rows {
		all.WriteString(strings.Join(r, " ") + "\n")
	}
	if !strings.Contains(all.String(), "Shapiro–Wilk") || !strings.Contains(all.String(), "p = 0.019") {
		t.Errorf("trait sheet lacks the Shapiro–Wilk reading:\n%s", all.String())
	}
	if strings.Contains(all.String(), "NaN") {
		t.Error("trait sheet shows NaN")
	}
}

// TestReportCoverCautions: the cover carries the three cautions every report
// must show (a project requirement, not an outside fact): one site-year is
// not a recommendation, follow the product label and local regulations, seek
// licensed advice. The topics are checked as literal phrases, not against
// the Cautions variable, so the test fails if the wording loses one.
func TestReportCoverCautions(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	f, _ := writeReport(t, tr, barleyResults(t, tr), ReportOptions{})
	rows, err := f.GetRows(CoverSheet)
	if err != nil {
		t.Fatal(err)
	}
	var cover []string
	for _, r := range rows {
		cover = append(cover, strings.Join(r, " "))
	}
	text := strings.Join(cover, "\n")
	for _, want := range []string{"Cautions", "one site and one season", "not a recommendation", "product label", "local regulations", "licensed adviser"} {
		if !strings.Contains(text, want) {
			t.Errorf("cover sheet lacks %q:\n%s", want, text)
		}
	}
}

func TestReportAllMissingTrait(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	res := barleyResults(t, tr)
	f, _ := writeReport(t, tr, res, ReportOptions{})
	if idx, _ := f.GetSheetIndex("Lodging"); idx < 0 {
		t.Fatalf("no sheet for the all-missing trait; sheets %v", f.GetSheetList())
	}
	if got := textAt(t, f, "Lodging", "A3"); !strings.Contains(got, export.NoValues) {
		t.Errorf("all-missing trait sheet says %q", got)
	}
	// A trait with no result at all is reported too, not a failure.
	f2, _ := writeReport(t, tr, res[:1], ReportOptions{Traits: []string{"yield", "lodge"}})
	if got := textAt(t, f2, "Lodging", "A3"); !strings.Contains(got, "not analysed") {
		t.Errorf("unanalysed trait sheet says %q", got)
	}
}

// validSheetName applies Excel's rules for sheet names, as documented by
// Microsoft ("Rename a worksheet": at most 31 characters; not blank; none of
// / \ ? * : [ ]; not beginning or ending with an apostrophe; not "History").
func validSheetName(s string) bool {
	n := len(utf16.Encode([]rune(s)))
	return n > 0 && n <= 31 && !strings.ContainsAny(s, `/\?*:[]`) &&
		!strings.HasPrefix(s, "'") && !strings.HasSuffix(s, "'") && !strings.EqualFold(s, "History")
}

func TestSheetNamesHostile(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	// More hostile names: duplicates by case, reserved, quotes, empty, the
	// fixed sheets' names, brackets and astral-plane letters (invented).
	extra := []string{"yield", "YIELD", "History", "'quoted'", "", "Data", "Summary", "[a]*?\\b", strings.Repeat("𝔸", 40), "   "}
	for i, n := range extra {
		key := "x" + strconv.Itoa(i)
		tr.Traits = append(tr.Traits, trial.Trait{Key: key, Name: n, Kind: trial.Continuous, Values: make([]float64, len(tr.Plots))})
	}
	res := barleyResults(t, tr)[:4]
	f, _ := writeReport(t, tr, res, ReportOptions{})
	names := f.GetSheetList()
	if len(names) != 4+len(tr.Traits) {
		t.Fatalf("%d sheets, want %d: %q", len(names), 4+len(tr.Traits), names)
	}
	seen := map[string]bool{}
	for _, n := range names {
		if !validSheetName(n) {
			t.Errorf("invalid sheet name %q", n)
		}
		k := strings.ToLower(n)
		if seen[k] {
			t.Errorf("sheet name %q repeated (case-insensitively)", n)
		}
		seen[k] = true
	}
	for _, want := range []string{"Ertrag-Fläche- Σ", "收获"} {
		if !seen[strings.ToLower(want)] {
			t.Errorf("no sheet %q in %q", want, names)
		}
	}
	// Hostile-named traits carry the same numbers as yield.
	for _, sh := range []string{"Ertrag-Fläche- Σ", "收获"} {
		mh := findRow(t, f, sh, 1, "Treatment")
		if got := numberAt(t, f, sh, cell(4, mh+1)); got != res[0].Result.Means[0].Mean {
			t.Errorf("%s first mean %v", sh, got)
		}
	}
}

func TestSheetNamer(t *testing.T) {
	t.Parallel()
	n := newSheetNamer()
	for _, c := range []struct{ in, want string }{
		{"Yield", "Yield"},
		{"yield", "yield (2)"},
		{"a/b:c", "a-b-c"},
		{"history", "history (2)"},
		{"''", "Sheet"},
		{strings.Repeat("x", 40), strings.Repeat("x", 31)},
		{strings.Repeat("x", 40), strings.Repeat("x", 27) + " (2)"},
	} {
		if got := n.name(c.in, ""); got != c.want || !validSheetName(got) {
			t.Errorf("name(%q) = %q, want %q", c.in, got, c.want)
		}
	}
}

func TestReportDataSheet(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	// Plot 3 missing, plot 5 excluded (hail).
	tr.Traits[0].Values[2] = trial.Missing
	tr.Plots[4].Exclusions = []trial.Exclusion{{Reason: "hail"}}
	tr.Plots[6].Note = "bird damage"
	f, _ := writeReport(t, tr, barleyResults(t, tr), ReportOptions{})
	rows, err := f.GetRows(DataSheet, excelize.Options{RawCellValue: true})
	if err != nil {
		t.Fatal(err)
	}
	head := rows[0]
	if head[0] != "Plot" || head[6] != "yield (bu/ac)" || head[len(head)-2] != "Excluded" {
		t.Fatalf("data header %q", head)
	}
	for i, p := range tr.Plots {
		row := i + 2
		if got := numberAt(t, f, DataSheet, cell(1, row)); got != float64(p.Number) {
			t.Errorf("row %d plot %v, want %d", row, got, p.Number)
		}
		if got := numberAt(t, f, DataSheet, cell(3, row)); got != float64(p.Row) {
			t.Errorf("row %d field row %v", row, got)
		}
		v := tr.Traits[0].Values[i]
		if trial.IsMissing(v) {
			// A missing value is an empty cell, not zero.
			if got := textAt(t, f, DataSheet, cell(7, row)); got != "" {
				t.Errorf("missing value written as %q", got)
			}
			continue
		}
		if got := numberAt(t, f, DataSheet, cell(7, row)); got != v {
			t.Errorf("plot %d yield %v, want %v", p.Number, got, v)
		}
	}
	if got := textAt(t, f, DataSheet, cell(len(head)-1, 6)); got != "hail" {
		t.Errorf("excluded plot marked %q", got)
	}
	if got := textAt(t, f, DataSheet, cell(len(head), 8)); got != "bird damage" {
		t.Errorf("note %q", got)
	}
}

func TestReportFieldMap(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	f, _ := writeReport(t, tr, barleyResults(t, tr), ReportOptions{})
	colour := map[string]string{}
	for i, tm := range tr.Treatments {
		colour[tm.Code] = OkabeIto[i%8]
	}
	maxRow := 0
	for _, p := range tr.Plots {
		maxRow = max(maxRow, p.Row)
	}
	for _, p := range tr.Plots {
		// Field row 1 at the bottom, as on the printed map (common practice):
		// the highest field row is on sheet row 4, under the column labels.
		c := cell(1+p.Column, 4+maxRow-p.Row)
		want := strconv.Itoa(p.Number) + "\n" + p.Treatment
		if got := textAt(t, f, FieldMapSheet, c); got != want {
			t.Errorf("map %s = %q, want %q", c, got, want)
		}
		id, _ := f.GetCellStyle(FieldMapSheet, c)
		st, _ := f.GetStyle(id)
		if len(st.Fill.Color) == 0 || !strings.EqualFold(strings.TrimPrefix(st.Fill.Color[0], "#"), colour[p.Treatment]) {
			t.Errorf("plot %d fill %v, want %s", p.Number, st.Fill.Color, colour[p.Treatment])
		}
	}
}

// The palette is Okabe & Ito (2008), "Color Universal Design" (hex values
// from memory); the font chosen on each fill must reach the WCAG 2.1 contrast
// of at least 4.5:1 for normal text (WCAG 2.1, success criterion 1.4.3; the
// relative-luminance and contrast-ratio formulas are WCAG 2.1's own
// definitions, from memory).
func TestFieldMapContrast(t *testing.T) {
	t.Parallel()
	want := []string{"E69F00", "56B4E9", "009E73", "F0E442", "0072B2", "D55E00", "CC79A7", "000000"}
	for i, hex := range want {
		if OkabeIto[i] != hex {
			t.Errorf("palette[%d] = %s, want %s", i, OkabeIto[i], hex)
		}
		l, lf := luminance(hex), luminance(fontFor(hex))
		ratio := (math.Max(l, lf) + 0.05) / (math.Min(l, lf) + 0.05)
		if ratio < 4.5 {
			t.Errorf("%s with font %s: contrast %.2f < 4.5", hex, fontFor(hex), ratio)
		}
	}
	// WCAG's extremes: black on white is 21:1.
	if got := (luminance("FFFFFF") + 0.05) / (luminance("000000") + 0.05); math.Abs(got-21) > 1e-12 {
		t.Errorf("white/black contrast %v, want 21", got)
	}
	if fontFor("000000") != "FFFFFF" || fontFor("0072B2") != "FFFFFF" || fontFor("F0E442") != "000000" {
		t.Error("font colours on black, blue or yellow fills")
	}
}

func TestReportPrintSetup(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	f, _ := writeReport(t, tr, barleyResults(t, tr), ReportOptions{Paper: Letter})
	for _, sh := range f.GetSheetList() {
		pl, err := f.GetPageLayout(sh)
		if err != nil {
			t.Fatal(err)
		}
		if pl.FitToWidth == nil || *pl.FitToWidth != 1 || pl.FitToHeight == nil || *pl.FitToHeight != 0 {
			t.Errorf("%s: fit to width %v height %v", sh, pl.FitToWidth, pl.FitToHeight)
		}
		// Paper size codes, ECMA-376 Part 1 §18.3.1.64: 1 is Letter.
		if pl.Size == nil || *pl.Size != 1 {
			t.Errorf("%s: paper %v, want Letter (1)", sh, pl.Size)
		}
		if sh != CoverSheet && (pl.Orientation == nil || *pl.Orientation != "landscape") {
			t.Errorf("%s: orientation %v", sh, pl.Orientation)
		}
		props, err := f.GetSheetProps(sh)
		if err != nil {
			t.Fatal(err)
		}
		if props.FitToPage == nil || !*props.FitToPage {
			t.Errorf("%s: fit to page not set", sh)
		}
		hf, err := f.GetHeaderFooter(sh)
		if err != nil {
			t.Fatal(err)
		}
		// "&" in the title is doubled in a header (ECMA-376 §18.3.1.39).
		if !strings.Contains(hf.OddHeader, "Barley variety test && demo") {
			t.Errorf("%s: header %q", sh, hf.OddHeader)
		}
	}
	panes, err := f.GetPanes(SummarySheet)
	if err != nil {
		t.Fatal(err)
	}
	if !panes.Freeze || panes.YSplit != 5 {
		t.Errorf("summary panes %+v", panes)
	}
	// Column widths fit: the name column of the summary is at least as wide
	// as its longest name.
	w, _ := f.GetColWidth(SummarySheet, "B")
	if w < float64(len("Wisconsin_No_38")) {
		t.Errorf("summary name column width %v", w)
	}
}

func TestReportProgressCancel(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	res := barleyResults(t, tr)
	var calls [][2]int
	writeReport(t, tr, res, ReportOptions{Progress: func(d, n int) { calls = append(calls, [2]int{d, n}) }})
	total := 4 + len(tr.Traits)
	if len(calls) != total || calls[total-1] != [2]int{total, total} {
		t.Errorf("progress calls %v", calls)
	}
	ctx, cancel := context.WithCancel(context.Background())
	var b strings.Builder
	err := WriteReport(ctx, &b, tr, res, ReportOptions{Progress: func(d, n int) {
		if d == 2 {
			cancel()
		}
	}})
	if !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled report returned %v", err)
	}
	if b.Len() != 0 {
		t.Error("cancelled report wrote output")
	}
}

func TestReportCharts(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	f, _ := writeReport(t, tr, barleyResults(t, tr), ReportOptions{Charts: true, Method: meansep.Tukey})
	for _, sh := range []string{"Yield", "收获"} {
		head := findRow(t, f, sh, 1, "Treatment")
		rows, err := f.GetRows(sh)
		if err != nil {
			t.Fatal(err)
		}
		// The chart sits right of the means table (one free column), never
		// over its last columns.
		c := cell(len(rows[head-1])+2, head)
		pics, err := f.GetPictures(sh, c)
		if err != nil {
			t.Fatal(err)
		}
		// A PNG file starts with the signature 89 50 4E 47 0D 0A 1A 0A (PNG
		// specification, ISO/IEC 15948, section 5.2).
		if len(pics) != 1 || !bytes.HasPrefix(pics[0].File, []byte("\x89PNG\r\n\x1a\n")) {
			all, _ := f.GetPictureCells(sh)
			t.Errorf("%s: %d pictures at %s (pictures at %v)", sh, len(pics), c, all)
		}
	}
	cells, err := f.GetPictureCells("Lodging")
	if err != nil || len(cells) != 0 {
		t.Errorf("all-missing trait has pictures %v (%v)", cells, err)
	}
}

func TestReportTransformed(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	r, err := analysis.Analyze(tr, "yield", analysis.Options{Transform: stats.Log})
	if err != nil {
		t.Fatal(err)
	}
	f, _ := writeReport(t, tr, []analysis.Outcome{{Key: "yield", Result: r}}, ReportOptions{Traits: []string{"yield"}})
	// Back-transformed means with back-transformed limits lead; the log
	// scale LS mean, raw mean and SE come after the % of check.
	mh := findRow(t, f, "Yield", 1, "Treatment")
	for c, want := range map[int]string{4: "Mean", 5: "Lower 95%", 6: "Upper 95%", 8: "% of check", 9: "LS mean (log)", 11: "SE (log)"} {
		if got := textAt(t, f, "Yield", cell(c, mh)); got != want {
			t.Errorf("column %d header %q, want %q", c, got, want)
		}
	}
	head := findRow(t, f, SummarySheet, 1, "Treatment")
	for i, m := range r.Means {
		if got := numberAt(t, f, "Yield", cell(9, mh+1+i)); got != m.Mean {
			t.Errorf("%s LS mean (log scale) %v, want %v", m.Treatment, got, m.Mean)
		}
		if got := numberAt(t, f, "Yield", cell(4, mh+1+i)); got != m.BackMean {
			t.Errorf("%s back-transformed %v, want %v", m.Treatment, got, m.BackMean)
		}
		// exp(LS mean ± t·SE) on the log scale (no offset: no zeros).
		if got := numberAt(t, f, "Yield", cell(6, mh+1+i)); !near(got, math.Exp(m.Mean+(m.Mean-math.Log(*m.Lower))), 1e-9) || got != *m.Upper {
			t.Errorf("%s upper limit %v", m.Treatment, got)
		}
		// The summary leads with the original scale.
		if got := numberAt(t, f, SummarySheet, cell(4, head+1+i)); got != m.BackMean {
			t.Errorf("%s summary mean %v, want %v", m.Treatment, got, m.BackMean)
		}
	}
}

// TestReportDerivedLatin writes the report of an invented Latin square with a
// derived adjusted-yield trait: the data sheet holds the derived values as
// the trial computes them (trial.TraitValues), the summary takes the derived
// trait as the yield for the percentage of the check, and the field map
// outlines the square's rows.
func TestReportDerivedLatin(t *testing.T) {
	t.Parallel()
	var tms []trial.Treatment
	for i := 0; i < 4; i++ {
		tms = append(tms, trial.Treatment{Code: "T" + strconv.Itoa(i+1), Name: "Entry " + strconv.Itoa(i+1), Role: trial.RoleEntry})
	}
	tms[0].Role = trial.RoleCheck
	tr, err := trial.New(trial.NewOptions{
		Title: "Latin square demo", Crop: "maize", Treatments: tms,
		Design: trial.Design{Kind: trial.Latin},
		Traits: []trial.Trait{
			{Key: "wt", Name: "Plot weight", Unit: "kg", Kind: trial.Continuous, Decimals: 2},
			{Key: "mst", Name: "Moisture", Unit: "%", Kind: trial.Percent, Decimals: 1},
			trial.AdjustedYieldTrait("gy", "wt", "mst", "maize", "t/ha"),
		},
		Seed: 11,
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range tr.Plots {
		code, _ := strconv.Atoi(p.Treatment[1:])
		tr.SetValue(i, "wt", 8+0.5*float64(code)+0.1*float64(p.Row))
		tr.SetValue(i, "mst", 18+0.3*float64(p.Column))
	}
	tr.SetValue(5, "wt", trial.Missing)
	outs, err := analysis.AnalyzeAll(context.Background(), tr, nil, analysis.Options{})
	if err != nil {
		t.Fatal(err)
	}
	f, _ := writeReport(t, tr, outs, ReportOptions{Charts: true})
	want, err := tr.TraitValues("gy")
	if err != nil {
		t.Fatal(err)
	}
	for i := range tr.Plots {
		c := cell(9, i+2)
		if trial.IsMissing(want[i]) {
			if got := textAt(t, f, DataSheet, c); got != "" {
				t.Errorf("plot %d: missing derived yield written as %q", tr.Plots[i].Number, got)
			}
			continue
		}
		if got := numberAt(t, f, DataSheet, c); got != want[i] {
			t.Errorf("plot %d derived yield %v, want %v", tr.Plots[i].Number, got, want[i])
		}
	}
	head := findRow(t, f, SummarySheet, 1, "Treatment")
	// The derived yield's group (after wt and mst) has mean, group, % check.
	if name := textAt(t, f, SummarySheet, cell(4+2*2, head-1)); !strings.Contains(name, tr.Traits[2].Name) {
		t.Errorf("third trait group headed %q", name)
	}
	if pct := textAt(t, f, SummarySheet, cell(4+2*2+2, head)); pct != "% check" {
		t.Errorf("percentage column %q", pct)
	}
	if got := numberAt(t, f, SummarySheet, cell(4+2*2+2, head+1)); math.Abs(got-100) > 1e-12 {
		t.Errorf("check at %v%% of itself", got)
	}
}

// TestReportLayoutDetails: the cover's count headers align right over
// their right-aligned numbers, and every legend row of the field map has
// one height (common practice in table layout).
func TestReportLayoutDetails(t *testing.T) {
	t.Parallel()
	tr, _ := barleyTrial(t)
	f, _ := writeReport(t, tr, barleyResults(t, tr), ReportOptions{})
	head := findRow(t, f, CoverSheet, 1, "Trait")
	if head == 0 {
		t.Fatal("no plots-used table")
	}
	align := func(c string) string {
		id, err := f.GetCellStyle(CoverSheet, c)
		if err != nil {
			t.Fatal(err)
		}
		st, err := f.GetStyle(id)
		if err != nil || st.Alignment == nil {
			return ""
		}
		return st.Alignment.Horizontal
	}
	for col := 2; col <= 4; col++ {
		if got := align(cell(col, head)); got != "right" {
			t.Errorf("cover header column %d aligned %q, want right", col, got)
		}
	}
	lg := findRow(t, f, FieldMapSheet, 1, "Legend")
	if lg == 0 {
		t.Fatal("no legend")
	}
	for i := range tr.Treatments {
		h, err := f.GetRowHeight(FieldMapSheet, lg+2+i)
		if err != nil {
			t.Fatal(err)
		}
		if h != legendRowHeight {
			t.Errorf("legend row %d is %v pt high, want %v", i, h, legendRowHeight)
		}
		if got := textAt(t, f, FieldMapSheet, cell(2, lg+2+i)); got != tr.Treatments[i].Code {
			t.Errorf("legend row %d shows %q", i, got)
		}
	}
}
