package chart

import (
	"bytes"
	"fmt"
	"math"
	"regexp"
	"strings"
	"testing"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
)

// Invented scenario: a maize hybrid trial on the fictional Thistlewade
// Farm, RCBD with 4 blocks of 6 plots, one block per field row.

var fixtureLayout = [4][6]string{
	{"H3", "H1", "CHK", "H5", "H2", "H4"},
	{"H2", "H5", "H4", "H1", "CHK", "H3"},
	{"CHK", "H4", "H1", "H3", "H5", "H2"},
	{"H5", "H3", "H2", "CHK", "H4", "H1"},
}

// fixtureEffects are the invented treatment effects (t/ha) added to a block
// effect and a small pattern to make the plot yields.
var fixtureEffects = map[string]float64{"H1": 9.8, "H2": 8.9, "H3": 10.6, "H4": 7.7, "H5": 9.1, "CHK": 8.4}

func fixtureTrial() *trial.Trial {
	t := &trial.Trial{
		Title:  "Thistlewade Farm maize hybrids 2026",
		Crop:   "maize",
		Season: "2026",
		Design: trial.Design{Kind: trial.RCBD, Reps: 4},
	}
	for _, c := range []string{"H1", "H2", "H3", "H4", "H5", "CHK"} {
		role := trial.RoleEntry
		name := "Hybrid " + c[1:]
		if c == "CHK" {
			role, name = trial.RoleCheck, "Farm standard"
		}
		t.Treatments = append(t.Treatments, trial.Treatment{Code: c, Name: name, Role: role})
	}
	yield := trial.Trait{Key: "yield", Name: "Grain yield", Unit: "t/ha", Kind: trial.Continuous, Decimals: 2, HigherBetter: true}
	for b := 0; b < 4; b++ {
		for c := 0; c < 6; c++ {
			code := fixtureLayout[b][c]
			t.Plots = append(t.Plots, trial.Plot{
				Number: 100*(b+1) + c + 1, Block: b + 1, Row: b + 1, Column: c + 1, Treatment: code,
			})
			v := fixtureEffects[code] + 0.3*float64(b) - 0.2*float64((b*7+c*3)%5)
			yield.Values = append(yield.Values, math.Round(v*100)/100)
		}
	}
	yield.Values[9] = trial.Missing // plot 204 missing
	t.Plots[15].Exclusions = []trial.Exclusion{{Trait: "yield", Reason: "flooding"}}
	t.Traits = []trial.Trait{yield}
	return t
}

// fixtureResult is a hand-built analysis result for fixtureTrial: the means
// and letters are invented, not computed.
func fixtureResult() *analysis.Result {
	r := &analysis.Result{
		TraitKey: "yield", TraitName: "Grain yield", Unit: "t/ha", Decimals: 2, HigherBetter: true,
		Design: trial.RCBD, Alpha: 0.05, N: 22, Missing: 1,
		Excluded:        []analysis.Excluded{{Plot: 304, Reason: "flooding"}},
		LSDLettersGiven: true,
	}
	means := []struct {
		code, lsd, tukey string
		mean             float64
	}{
		{"H1", "b", "ab", 9.95}, {"H2", "cd", "bc", 9.02}, {"H3", "a", "a", 10.71},
		{"H4", "e", "c", 7.86}, {"H5", "c", "b", 9.24}, {"CHK", "d", "bc", 8.55},
	}
	for _, m := range means {
		r.Means = append(r.Means, analysis.Mean{
			Treatment: m.code, Check: m.code == "CHK", N: 4, Mean: m.mean, RawMean: m.mean,
			SE: 0.21, BackMean: m.mean, LettersLSD: m.lsd, LettersTukey: m.tukey,
		})
	}
	// Observations: every plot but the missing (index 9) and excluded (15).
	res := []float64{0.12, -0.31, 0.05, 0.22, -0.18, 0.09, -0.02, 0.27, -0.11, -0.25,
		0.14, 0.03, -0.08, 0.19, -0.21, 0.06, 1.35, -0.16, 0.11, -0.04, 0.08, -0.13}
	a := &stats.ANOVA{N: 22, MSE: 0.176, DFError: 13, GrandMean: 9.2}
	for i := 0; i < 24; i++ {
		if i == 9 || i == 15 {
			continue
		}
		r.PlotIndex = append(r.PlotIndex, i)
	}
	for i, e := range res {
		a.Residuals = append(a.Residuals, e)
		a.Fitted = append(a.Fitted, 8+0.1*float64(i))
		a.Leverage = append(a.Leverage, 0.375)
		r.Diagnostics.StandardizedResiduals = append(r.Diagnostics.StandardizedResiduals, e/math.Sqrt(a.MSE*(1-0.375)))
	}
	r.ANOVA = a
	return r
}

// render draws p in format at A4 landscape.
func render(tb testing.TB, p *plot.Plot, format string) []byte {
	tb.Helper()
	var buf bytes.Buffer
	w, h := A4Landscape()
	if err := Save(p, &buf, format, w, h); err != nil {
		tb.Fatalf("Save %s: %v", format, err)
	}
	return buf.Bytes()
}

var svgText = regexp.MustCompile(`(?s)<text[^>]*>(.*?)</text>`)

// svgTexts returns the text elements of an SVG document, unescaped.
func svgTexts(svg []byte) []string {
	var out []string
	for _, m := range svgText.FindAllSubmatch(svg, -1) {
		s := string(m[1])
		s = strings.NewReplacer("&amp;", "&", "&lt;", "<", "&gt;", ">", "&#34;", "\"", "&#39;", "'").Replace(s)
		out = append(out, s)
	}
	return out
}

// countText counts text elements equal to s.
func countText(texts []string, s string) int {
	n := 0
	for _, t := range texts {
		if t == s {
			n++
		}
	}
	return n
}

// countFill counts filled paths of colour hex ("#0072B2").
func countFill(svg []byte, hex string) int {
	return bytes.Count(svg, []byte("fill:"+hex))
}

// bigFixture is an invented RCBD with n treatments (the last two checks)
// and reps blocks stacked one above the other, each block laid out in rows
// of 20 plots; values and letters are invented from a fixed formula.
func bigFixture(n, reps int) (*trial.Trial, *analysis.Result) {
	t := &trial.Trial{Title: "Fictional Marrowdene Station wheat lines 2026", Design: trial.Design{Kind: trial.RCBD, Reps: reps}}
	for i := 0; i < n; i++ {
		role := trial.RoleEntry
		if i >= n-2 {
			role = trial.RoleCheck
		}
		t.Treatments = append(t.Treatments, trial.Treatment{Code: fmt.Sprintf("L%02d", i+1), Name: fmt.Sprintf("Line %d", i+1), Role: role})
	}
	tr := trial.Trait{Key: "yield", Name: "Grain yield", Unit: "t/ha", Decimals: 2, HigherBetter: true}
	const perRow = 20
	rowsPerBlock := (n + perRow - 1) / perRow
	for b := 0; b < reps; b++ {
		for k := 0; k < n; k++ {
			j := (k*7 + b*13) % n // a fixed scramble, not a randomisation
			t.Plots = append(t.Plots, trial.Plot{
				Number: (b+1)*1000 + k + 1, Block: b + 1,
				Row: b*rowsPerBlock + k/perRow + 1, Column: k%perRow + 1,
				Treatment: t.Treatments[j].Code,
			})
			tr.Values = append(tr.Values, 5+float64(j%17)*0.2+float64(b)*0.1)
		}
	}
	t.Traits = []trial.Trait{tr}
	r := &analysis.Result{TraitKey: "yield", TraitName: "Grain yield", Unit: "t/ha", HigherBetter: true, Alpha: 0.05,
		ANOVA: &stats.ANOVA{DFError: (n - 1) * (reps - 1), MSE: 0.1}, LSDLettersGiven: true}
	letters := []string{"a", "ab", "abc", "bcd", "cde", "de", "e"}
	for i, trt := range t.Treatments {
		m := 5 + float64(i%17)*0.2 + 0.1
		r.Means = append(r.Means, analysis.Mean{Treatment: trt.Code, Check: trt.Role == trial.RoleCheck, N: reps,
			Mean: m, RawMean: m, BackMean: m, SE: 0.18, LettersLSD: letters[i%len(letters)], LettersTukey: letters[(i/3)%len(letters)]})
	}
	return t, r
}

func pt(x, y vg.Length) vg.Point { return vg.Point{X: x, Y: y} }

func rectOf(x0, y0, x1, y1 vg.Length) vg.Rectangle {
	return vg.Rectangle{Min: pt(x0, y0), Max: pt(x1, y1)}
}
