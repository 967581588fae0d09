package analysis

import (
	"context"
	"encoding/csv"
	"encoding/json"
	"math"
	"strconv"
	"strings"
	"testing"

	"furlong/stats/refdata"
	"furlong/trial"
	"furlong/trial/trialfile"
)

const (
	nitrogenCSV     = "nitrogen-rates.csv"
	nitrogenJSON    = "nitrogen-rates.expected.json"
	nitrogenFixture = "nitrogen-rates.furlong"
)

// TestNitrogenFixture: the trial file other packages' tests load holds the
// reference CSV's yields, plot by plot (stats/refdata/README.md).
func TestNitrogenFixture(t *testing.T) {
	t.Parallel()
	f, err := refdata.Open(nitrogenCSV)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	want := map[[2]string]float64{}
	for _, r := range rows[1:] {
		y, _ := strconv.ParseFloat(r[3], 64)
		want[[2]string{r[1], "N" + r[2]}] = y
	}
	tr, err := trialfile.Load(refdata.File(t, nitrogenFixture))
	if err != nil {
		t.Fatal(err)
	}
	vals, err := tr.TraitValues("yield")
	if err != nil {
		t.Fatal(err)
	}
	if len(tr.Plots) != len(want) {
		t.Fatalf("%d plots, the CSV has %d", len(tr.Plots), len(want))
	}
	for i, p := range tr.Plots {
		if w, ok := want[[2]string{strconv.Itoa(p.Block), p.Treatment}]; !ok || vals[i] != w {
			t.Errorf("plot %d (block %d, %s): %v, CSV %v", p.Number, p.Block, p.Treatment, vals[i], w)
		}
	}
}

type nitrogenRef struct {
	Contrasts []struct {
		Source string  `json:"source"`
		DF     int     `json:"df"`
		SS     float64 `json:"ss"`
		F      float64 `json:"f"`
		P      float64 `json:"p"`
	} `json:"contrasts"`
	Q struct {
		Coef    []float64 `json:"coefficients"`
		Optimum float64   `json:"economic_optimum_rate"`
	} `json:"quadratic"`
	QP struct {
		Coef    []float64 `json:"coefficients"`
		Join    float64   `json:"join_point"`
		Optimum float64   `json:"economic_optimum_rate"`
	} `json:"quadratic_plateau"`
}

// TestResponseOfAgainstR: the response analysis of the nitrogen trial
// against R 4.2.2 (aov with contr.poly on the rates, lm on the means, the
// profiled quadratic-plateau, the optimum at a price ratio of 0.008).
func TestResponseOfAgainstR(t *testing.T) {
	t.Parallel()
	b, err := refdata.ReadFile(nitrogenJSON)
	if err != nil {
		t.Fatal(err)
	}
	var ref nitrogenRef
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	tr, err := trialfile.Load(refdata.File(t, nitrogenFixture))
	if err != nil {
		t.Fatal(err)
	}
	oc, err := AnalyzeAll(context.Background(), tr, nil, Options{})
	if err != nil || oc[0].Err != nil {
		t.Fatal(err, oc[0].Err)
	}
	rates, err := RatesOf(tr, nil)
	if err != nil {
		t.Fatal(err)
	}
	r, err := ResponseOf(oc[0].Result, rates, 0.008)
	if err != nil {
		t.Fatal(err)
	}
	if r.RateUnit != "kg N/ha" || len(r.Points) != 5 || r.Points[0].Rate != 0 || r.Points[4].Rate != 200 {
		t.Fatalf("points %+v, unit %q", r.Points, r.RateUnit)
	}
	if len(r.Trends) != len(ref.Contrasts) {
		t.Fatalf("%d trend lines, R %d", len(r.Trends), len(ref.Contrasts))
	}
	for i, c := range ref.Contrasts {
		g := r.Trends[i]
		if g.Source != c.Source || g.DF != c.DF || math.Abs(g.SS-c.SS) > 1e-9*c.SS || math.Abs(g.F-c.F) > 1e-8*c.F || math.Abs(g.P-c.P) > 1e-7*c.P { // p near 1e-9: the F tail agrees with R to 2e-8 relative
			t.Errorf("%s: %+v; R %+v", c.Source, g, c)
		}
	}
	fits := map[string]ResponseFit{}
	for _, m := range r.Models {
		fits[m.Model] = m
	}
	q, qp := fits["quadratic"], fits["quadratic-plateau"]
	for i, c := range ref.Q.Coef {
		if math.Abs(q.Coef[i]-c) > 1e-9*math.Max(1, math.Abs(c)) {
			t.Errorf("quadratic coefficient %d: %.12g, R %.12g", i, q.Coef[i], c)
		}
	}
	if q.Econ == nil || math.Abs(*q.Econ-ref.Q.Optimum) > 1e-7 {
		t.Errorf("quadratic optimum %v, R %g", q.Econ, ref.Q.Optimum)
	}
	if qp.Join == nil || math.Abs(*qp.Join-ref.QP.Join) > 1e-5 || qp.Econ == nil || math.Abs(*qp.Econ-ref.QP.Optimum) > 1e-5 {
		t.Errorf("quadratic-plateau join %v optimum %v; R %g %g", qp.Join, qp.Econ, ref.QP.Join, ref.QP.Optimum)
	}
	// The economic optimum by hand from the quadratic's coefficients:
	// x* = (ratio − b) / (2c) (common practice: where the slope b + 2cx
	// equals the price ratio).
	if hand := (0.008 - q.Coef[1]) / (2 * q.Coef[2]); math.Abs(*q.Econ-hand) > 1e-9 {
		t.Errorf("quadratic optimum %v, by hand %v", *q.Econ, hand)
	}
	// Sensitivity: one row per model per factor; the ratio itself gives the
	// optimum above; a dearer input never raises the optimum.
	if len(r.Sensitivity) != len(r.Models)*len(SensitivityFactors) {
		t.Fatalf("%d sensitivity rows", len(r.Sensitivity))
	}
	prev := map[string]float64{}
	for _, s := range r.Sensitivity {
		if p, ok := prev[s.Model]; ok && s.Rate > p+1e-9 {
			t.Errorf("%s: optimum %g at ratio %g above %g at a cheaper ratio", s.Model, s.Rate, s.PriceRatio, p)
		}
		prev[s.Model] = s.Rate
		if s.Model == "quadratic" && s.PriceRatio == 0.008 && math.Abs(s.Rate-ref.Q.Optimum) > 1e-7 {
			t.Errorf("sensitivity at the ratio itself %g, R %g", s.Rate, ref.Q.Optimum)
		}
	}
	if b := r.BestFit(); b == nil || len(r.Margin) != 21 || r.Margin[0].Rate != b.Low || r.Margin[20].Rate != b.High {
		t.Errorf("best %v, margin %d points", r.Best, len(r.Margin))
	}
	for _, p := range r.Margin {
		if math.Abs(p.Margin-(p.Response-0.008*p.Rate)) > 1e-12 {
			t.Errorf("margin at %g: %g, response %g", p.Rate, p.Margin, p.Response)
		}
	}

	// Without a price ratio there is no economics at all.
	r, err = ResponseOf(oc[0].Result, rates, 0)
	if err != nil || r.PriceRatio != 0 || len(r.Sensitivity) != 0 || len(r.Margin) != 0 || r.Models[0].Econ != nil {
		t.Errorf("without a ratio: %v, %+v", err, r)
	}
}

// TestRatesOf: the rate series refuses mixed units and too few rates in
// words, and leaves out treatments without a rate or named.
func TestRatesOf(t *testing.T) {
	t.Parallel()
	f := func(v float64) *float64 { return &v }
	tr := &trial.Trial{Treatments: []trial.Treatment{
		{Code: "A", Rate: f(0), RateUnit: "kg/ha"}, {Code: "B", Rate: f(40), RateUnit: "kg/ha"},
		{Code: "C", Rate: f(80), RateUnit: "kg/ha"}, {Code: "D", Rate: f(120)}, {Code: "U"},
	}}
	r, err := RatesOf(tr, []string{"D"})
	if err != nil || len(r.Of) != 3 || r.Unit != "kg/ha" || len(r.LeftOut) != 2 || r.LeftOut[0] != "D" || r.LeftOut[1] != "U" {
		t.Errorf("rates %+v, %v", r, err)
	}
	if _, err := RatesOf(tr, []string{"A", "B"}); err == nil {
		t.Error("two rates accepted")
	}
	tr.Treatments[3].RateUnit = "L/ha"
	if _, err := RatesOf(tr, nil); err == nil || !strings.Contains(err.Error(), "different units") {
		t.Errorf("mixed units: %v", err)
	}
}

// TestOatsFixture: the oats split-plot trial file (stats/refdata) holds
// Yates's yields of oats-split.csv, plot by plot (block, variety, nitrogen).
func TestOatsFixture(t *testing.T) {
	t.Parallel()
	recs := refdata.CSV(t, "oats-split.csv")
	code := map[string]string{"Victory": "Vic", "Golden.rain": "GRain", "Marvellous": "Marv"}
	blocks := map[string]int{}
	want := map[[3]string]float64{}
	for _, r := range recs[1:] {
		if _, ok := blocks[r[1]]; !ok {
			blocks[r[1]] = len(blocks) + 1
		}
		y, _ := strconv.ParseFloat(r[4], 64)
		want[[3]string{strconv.Itoa(blocks[r[1]]), code[r[2]], r[3]}] = y
	}
	tr, err := trialfile.Load(refdata.File(t, "oats-split.furlong"))
	if err != nil {
		t.Fatal(err)
	}
	vals, err := tr.TraitValues("yield")
	if err != nil {
		t.Fatal(err)
	}
	if len(tr.Plots) != len(want) || tr.Design.Kind != trial.SplitPlot {
		t.Fatalf("%d plots (%s), the CSV has %d", len(tr.Plots), tr.Design.Kind, len(want))
	}
	for i, p := range tr.Plots {
		k := [3]string{strconv.Itoa(p.Block), tr.LevelCode(p.Treatment, 0), tr.LevelCode(p.Treatment, 1)}
		if w, ok := want[k]; !ok || vals[i] != w {
			t.Errorf("plot %d %v: %v, CSV %v", p.Number, k, vals[i], w)
		}
	}
}
