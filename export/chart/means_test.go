package chart

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"furlong/stats"
	"furlong/stats/meansep"
)

// hexEntry and hexCheck are the bar fills of entries and checks as the SVG
// backend writes them.
const (
	hexEntry = "#0072B2"
	hexCheck = "#E69F00"
)

func TestMeansChartSVG(t *testing.T) {
	t.Parallel()
	tr, r := fixtureTrial(), fixtureResult()
	p, err := Means(tr, r, MeansOptions{Letters: meansep.Tukey})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	texts := svgTexts(svg)
	// One bar per treatment: 5 entry bars and 1 check bar, plus one key
	// swatch of each.
	if got := countFill(svg, hexEntry); got != 5+1 {
		t.Errorf("%d entry fills, want 5 bars + 1 key swatch", got)
	}
	if got := countFill(svg, hexCheck); got != 1+1 {
		t.Errorf("%d check fills, want 1 bar + 1 key swatch", got)
	}
	// Every Tukey letter string of the fixture is written once ("bc" twice).
	for _, m := range r.Means {
		want := 0
		for _, o := range r.Means {
			if o.LettersTukey == m.LettersTukey {
				want++
			}
		}
		if got := countText(texts, m.LettersTukey); got != want {
			t.Errorf("letters %q appear %d times, want %d", m.LettersTukey, got, want)
		}
	}
	for _, want := range []string{
		"Grain yield (t/ha)", "Thistlewade Farm maize hybrids 2026", "Entry", "Check",
		"Error bars: ± 1 SE", "Treatment (ordered by mean, highest first)",
	} {
		if countText(texts, want) != 1 {
			t.Errorf("text %q missing; have %q", want, texts)
		}
	}
	// Tick labels in order of the means, highest first (yield: higher is
	// better): H3 10.71, H1 9.95, H5 9.24, H2 9.02, CHK 8.55, H4 7.86.
	var ticks []string
	for _, s := range texts {
		if slices.Contains([]string{"H1", "H2", "H3", "H4", "H5", "CHK"}, s) {
			ticks = append(ticks, s)
		}
	}
	if want := []string{"H3", "H1", "H5", "H2", "CHK", "H4"}; !slices.Equal(ticks, want) {
		t.Errorf("tick order %v, want %v", ticks, want)
	}
}

func TestMeanBarsErrorBars(t *testing.T) {
	t.Parallel()
	r := fixtureResult()
	bars, _, _, err := meanBars(r, MeansOptions{ErrorBars: ConfidenceInterval, Order: AsListed})
	if err != nil {
		t.Fatal(err)
	}
	// t(0.975; 13 df) = 2.160 (Student's t table, e.g. Gomez & Gomez 1984,
	// appendix C; from memory to 3 decimals); SE 0.21.
	half := 2.160 * 0.21
	for i, b := range bars {
		m := r.Means[i]
		if b.code != m.Treatment {
			t.Fatalf("bar %d is %s, want %s (AsListed)", i, b.code, m.Treatment)
		}
		if math.Abs(b.top-(m.Mean+half)) > 0.0005 || math.Abs(b.low-(m.Mean-half)) > 0.0005 {
			t.Errorf("%s: CI [%g, %g], want %g ± %g", b.code, b.low, b.top, m.Mean, half)
		}
	}
	bars, _, _, err = meanBars(r, MeansOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, b := range bars {
		if math.Abs(b.top-b.y-0.21) > 1e-12 || math.Abs(b.y-b.low-0.21) > 1e-12 {
			t.Errorf("%s: SE bar [%g, %g] around %g, want ± 0.21", b.code, b.low, b.top, b.y)
		}
	}
	p, err := Means(nil, r, MeansOptions{ErrorBars: ConfidenceInterval})
	if err != nil {
		t.Fatal(err)
	}
	if texts := svgTexts(render(t, p, "svg")); countText(texts, "Error bars: 95% confidence interval") != 1 {
		t.Errorf("CI key text missing: %q", texts)
	}

	r.ANOVA.DFError = 0
	if _, err := Means(nil, r, MeansOptions{ErrorBars: ConfidenceInterval}); !errors.Is(err, ErrNoDF) {
		t.Errorf("CI without error df: %v, want ErrNoDF", err)
	}
}

func TestMeansLettersWithheld(t *testing.T) {
	t.Parallel()
	r := fixtureResult()
	r.LSDLettersGiven = false
	for i := range r.Means {
		r.Means[i].LettersLSD = ""
	}
	p, err := Means(fixtureTrial(), r, MeansOptions{Letters: meansep.LSD})
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(render(t, p, "svg"))
	found := false
	for _, s := range texts {
		if strings.HasPrefix(s, "LSD letters withheld") {
			found = true
		}
		if strings.HasPrefix(s, "Letters:") {
			t.Errorf("letters key %q shown although letters are withheld", s)
		}
	}
	if !found {
		t.Errorf("no withheld note; texts %q", texts)
	}
}

func TestMeansOrderLowerBetterAndPoints(t *testing.T) {
	t.Parallel()
	r := fixtureResult()
	r.HigherBetter = false
	bars, _, _, err := meanBars(r, MeansOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, b := range bars {
		got = append(got, b.code)
	}
	if want := []string{"H4", "CHK", "H2", "H5", "H1", "H3"}; !slices.Equal(got, want) {
		t.Errorf("lower-is-better order %v, want %v", got, want)
	}
	bars, _, _, _ = meanBars(r, MeansOptions{Order: ByCode})
	got = got[:0]
	for _, b := range bars {
		got = append(got, b.code)
	}
	if want := []string{"CHK", "H1", "H2", "H3", "H4", "H5"}; !slices.Equal(got, want) {
		t.Errorf("code order %v, want %v", got, want)
	}
	p, err := Means(nil, r, MeansOptions{Points: true})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	if got := countText(svgTexts(svg), "H4"); got != 1 {
		t.Errorf("points chart: tick label H4 appears %d times, want 1", got)
	}
}

func TestMeansBackTransformed(t *testing.T) {
	t.Parallel()
	r := fixtureResult()
	r.Transform = stats.Sqrt
	for i := range r.Means {
		m := &r.Means[i]
		m.Mean = 3 + 0.1*float64(i)
		m.BackMean = m.Mean * m.Mean // √y, no offset
		m.SE = 0.1
	}
	bars, notes, _, err := meanBars(r, MeansOptions{Order: AsListed})
	if err != nil {
		t.Fatal(err)
	}
	// Hand-computed: mean 3 ± 0.1 on the square-root scale is 9 with the
	// bar from 2.9² = 8.41 to 3.1² = 9.61.
	if b := bars[0]; math.Abs(b.y-9) > 1e-12 || math.Abs(b.low-8.41) > 1e-12 || math.Abs(b.top-9.61) > 1e-12 {
		t.Errorf("back-transformed bar %+v, want 9 in [8.41, 9.61]", b)
	}
	if len(notes) == 0 || !strings.Contains(notes[0], "square-root scale") {
		t.Errorf("notes %q lack the transformation", notes)
	}

	// ln(y+1) when the data held zeros: the offset is recovered from the
	// back-transformed means.
	r.Transform = stats.Log
	for i := range r.Means {
		m := &r.Means[i]
		m.BackMean = math.Exp(m.Mean) - 1
	}
	bars, _, _, _ = meanBars(r, MeansOptions{Order: AsListed})
	if want := math.Exp(3.1) - 1; math.Abs(bars[0].top-want) > 1e-9 {
		t.Errorf("log bar top %g, want e^3.1 − 1 = %g", bars[0].top, want)
	}
}

func TestMeansNoData(t *testing.T) {
	t.Parallel()
	r := fixtureResult()
	r.Means[2].N = 0
	r.Means[2].Mean = math.NaN()
	_, notes, _, err := meanBars(r, MeansOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Contains(notes, "Not shown (no data): H3") {
		t.Errorf("notes %q lack the treatment without data", notes)
	}
	r.Means = nil
	if _, err := Means(nil, r, MeansOptions{}); !errors.Is(err, ErrNoData) {
		t.Errorf("no means: %v, want ErrNoData", err)
	}
}

func TestMeansManyTreatments(t *testing.T) {
	t.Parallel()
	tr, r := bigFixture(300, 2)
	p, err := Means(tr, r, MeansOptions{Letters: meansep.LSD})
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	if got := countFill(svg, hexEntry); got != 298+1 {
		t.Errorf("%d entry fills, want 298 bars + 1 key swatch", got)
	}
	if got := countFill(svg, hexCheck); got != 2+1 {
		t.Errorf("%d check fills, want 2 bars + 1 key swatch", got)
	}
	texts := svgTexts(svg)
	for _, code := range []string{"L01", "L150", "L300"} {
		if countText(texts, code) != 1 {
			t.Errorf("tick label %q missing", code)
		}
	}
}

func TestLessCode(t *testing.T) {
	t.Parallel()
	// Natural ordering of codes, common practice: numbers by value.
	for _, c := range []struct {
		a, b string
		less bool
	}{
		{"T2", "T10", true}, {"T10", "T2", false}, {"T02", "T2", false}, {"T2", "T02", true},
		{"A", "B", true}, {"CHK", "H1", true}, {"L9", "L10", true}, {"T1a", "T1b", true}, {"T1", "T1", false},
	} {
		if got := lessCode(c.a, c.b); got != c.less {
			t.Errorf("lessCode(%q, %q) = %v, want %v", c.a, c.b, got, c.less)
		}
	}
}
