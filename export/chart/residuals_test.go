package chart

import (
	"errors"
	"math"
	"strings"
	"testing"

	"furlong/stats"
	"furlong/trial/analysis"
)

// normalCDF is Φ(x) = erfc(−x/√2)/2, independent of gonum's quantile code.
func normalCDF(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }

func TestBlomQuantiles(t *testing.T) {
	t.Parallel()
	// Blom's plotting positions (i − 3/8)/(n + 1/4), common practice
	// (Blom 1958); for n = 5, computed by hand: 5/42, 13/42, 1/2, 29/42,
	// 37/42.
	x := []float64{0.4, -1.2, 2.5, 0, -0.3}
	q, order := blomQuantiles(x)
	wantOrder := []int{1, 4, 3, 0, 2}
	wantP := []float64{5.0 / 42, 13.0 / 42, 0.5, 29.0 / 42, 37.0 / 42}
	// Normal scores to two decimals, from memory of printed tables of Blom
	// scores: −1.18, −0.50, 0, 0.50, 1.18.
	wantQ2 := []float64{-1.18, -0.50, 0, 0.50, 1.18}
	for i := range q {
		if order[i] != wantOrder[i] {
			t.Errorf("order[%d] = %d, want %d", i, order[i], wantOrder[i])
		}
		if got := normalCDF(q[i]); math.Abs(got-wantP[i]) > 1e-12 {
			t.Errorf("Φ(q[%d]) = %.15f, want Blom position %.15f", i, got, wantP[i])
		}
		if math.Abs(q[i]-wantQ2[i]) > 0.005 {
			t.Errorf("q[%d] = %.4f, want %.2f", i, q[i], wantQ2[i])
		}
	}
	// Symmetry: the positions are symmetric about 1/2.
	if math.Abs(q[0]+q[4]) > 1e-12 || math.Abs(q[1]+q[3]) > 1e-12 {
		t.Errorf("quantiles not symmetric: %v", q)
	}
}

func TestQuartileLine(t *testing.T) {
	t.Parallel()
	// Sample quartiles of 1..8 by Hyndman & Fan (1996) definition 7 (R's
	// default): h = 7·0.25 = 1.75 → 2.75; h = 5.25 → 6.25 (hand-computed).
	sorted := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	if got := quantile7(sorted, 0.25); got != 2.75 {
		t.Errorf("Q1 = %g, want 2.75", got)
	}
	if got := quantile7(sorted, 0.75); got != 6.25 {
		t.Errorf("Q3 = %g, want 6.25", got)
	}
	// Φ⁻¹(0.75) = 0.6744897501960817 (standard normal upper quartile: 0.6745
	// in printed normal tables, the full digits from memory; the test's own
	// normalCDF, math.Erfc based, confirms it here): slope 3.5/(2·0.67449),
	// intercept 4.5 by symmetry.
	if p := normalCDF(0.6744897501960817); math.Abs(p-0.75) > 1e-15 {
		t.Fatalf("Φ(0.6744897501960817) = %.17g, want 0.75", p)
	}
	b0, b1 := quartileLine(sorted)
	if want := 3.5 / (2 * 0.6744897501960817); math.Abs(b1-want) > 1e-12 {
		t.Errorf("slope = %.15g, want %.15g", b1, want)
	}
	if math.Abs(b0-4.5) > 1e-12 {
		t.Errorf("intercept = %.15g, want 4.5", b0)
	}
}

func TestResidualsChart(t *testing.T) {
	t.Parallel()
	tr, r := fixtureTrial(), fixtureResult()
	p, err := Residuals(tr, r)
	if err != nil {
		t.Fatal(err)
	}
	texts := svgTexts(render(t, p, "svg"))
	// Observation 17 (residual 1.35, standardised 1.35/√(0.176·0.625) =
	// 4.07 by hand) is plot 401: the only one beyond ±3.
	if countText(texts, "plot 401") != 1 {
		t.Errorf("outlier label \"plot 401\" missing; texts: %q", texts)
	}
	for _, s := range texts {
		if strings.HasPrefix(s, "plot ") && s != "plot 401" {
			t.Errorf("unexpected outlier label %q", s)
		}
	}
	for _, want := range []string{"Standardised residual", "Fitted value (t/ha)"} {
		if countText(texts, want) != 1 {
			t.Errorf("axis title %q missing", want)
		}
	}

	// Without the analysis's standardised residuals the chart computes
	// r/√(MSE·(1−h)) itself (the definition in stats.ANOVA.Leverage).
	r.Diagnostics.StandardizedResiduals = nil
	d, err := residualsOf(tr, r)
	if err != nil {
		t.Fatal(err)
	}
	if want := 1.35 / math.Sqrt(0.176*0.625); math.Abs(d.std[16]-want) > 1e-12 {
		t.Errorf("standardised residual = %g, want %g", d.std[16], want)
	}
	if d.labels[16] != "plot 401" {
		t.Errorf("label = %q, want plot 401", d.labels[16])
	}
}

func TestQQChart(t *testing.T) {
	t.Parallel()
	tr, r := fixtureTrial(), fixtureResult()
	p, err := QQ(tr, r)
	if err != nil {
		t.Fatal(err)
	}
	svg := render(t, p, "svg")
	texts := svgTexts(svg)
	for _, want := range []string{"Theoretical normal quantile", "Standardised residual (ordered)", "plot 401"} {
		if countText(texts, want) != 1 {
			t.Errorf("text %q missing", want)
		}
	}
}

func TestResidualsTooFew(t *testing.T) {
	t.Parallel()
	r := &analysis.Result{ANOVA: &stats.ANOVA{Residuals: []float64{1, -1}, Fitted: []float64{2, 3}}}
	if _, err := Residuals(nil, r); !errors.Is(err, ErrTooFewResiduals) {
		t.Errorf("Residuals with 2 observations: %v, want ErrTooFewResiduals", err)
	}
	if _, err := QQ(nil, &analysis.Result{}); !errors.Is(err, ErrTooFewResiduals) {
		t.Errorf("QQ without ANOVA: %v, want ErrTooFewResiduals", err)
	}
}
