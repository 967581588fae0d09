package cli

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"sort"
	"strconv"
	"strings"

	"furlong/export"
	"furlong/stats"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// responseOptions are the flags of "furlong response".
type responseOptions struct {
	Out        io.Writer
	Path       string
	Trait      string // trial files: the trait (default: every trait)
	Rate       string // CSV: the column of rates
	Block      string // CSV: the block column (RCBD)
	Response   string // CSV: the response column (default: every numeric column)
	PriceRatio float64
	LeaveOut   string // treatment codes left out of the trend
	Format     string
}

func init() {
	register(&command{
		name:    "response",
		summary: "response to rates: trends, response curves and the economic optimum",
		usage: `furlong response TRIAL [--trait KEY] [--leave-out CODE,...] [--price-ratio R] [--format text|json]
furlong response FILE.csv --rate COL [--block COL] [--response COL] [--price-ratio R] [--format text|json]`,
		details: `For a rate trial (each treatment a rate of one input, such as kg N/ha): splits the treatment sum of
squares into linear and quadratic trends on the actual rates (unequal spacing allowed) and the rest
(lack of fit), each tested against the design's error; fits linear, quadratic, linear-plateau and
quadratic-plateau curves to the treatment means (plateau models by exact least squares with the join
point profiled) and compares them (R², residual SD, AIC).

In a trial file the rates are the treatments' rates (furlong new --rates, or the Treatments tab);
treatments without a rate, or named in --leave-out, are left out of the trend (for example an
untreated control of a product trial).

--price-ratio is the price of one unit of input in units of produce, in response units per rate unit:
for yields in t/ha and rates in kg/ha, 0.006 means 6 kg of grain pay for 1 kg of input; in US units
0.1 bu/lb. With it, each model's economic optimum rate (where the fitted slope equals the ratio,
capped at the join point, within the tested rates), the yield there, the margin curve
(response − ratio × rate) and a table of the optimum at half to one and a half times the ratio.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := responseOptions{Out: env.Stdout}
			fs := flag.NewFlagSet("response", flag.ContinueOnError)
			fs.StringVar(&o.Trait, "trait", "", "trial files: the trait `key` (default: every trait)")
			fs.StringVar(&o.Rate, "rate", "", "CSV: the `column` of rates")
			fs.StringVar(&o.Block, "block", "", "CSV: the block `column` (RCBD); without it a completely randomised design")
			fs.StringVar(&o.Response, "response", "", "CSV: the response `column` (default: every numeric column)")
			fs.Float64Var(&o.PriceRatio, "price-ratio", 0, "price of a unit of input in units of produce (response units per rate unit)")
			fs.StringVar(&o.LeaveOut, "leave-out", "", "treatment `codes` left out of the trend, comma-separated")
			fs.StringVar(&o.Format, "format", "text", "output: text or json")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("response: give one trial file or CSV table")
				}
				o.Path = args[0]
				return runResponse(ctx, o)
			}
		},
	})
}

// responseJSON is one trait's response analysis; its keys are part of the
// CLI's contract (README).
type responseJSON struct {
	Trait       string              `json:"trait"`
	Unit        string              `json:"unit,omitempty"`
	RateUnit    string              `json:"rate_unit,omitempty"`
	Error       string              `json:"error,omitempty"`
	Rates       []responseRateJSON  `json:"rates,omitempty"`
	LeftOut     []string            `json:"left_out,omitempty"`
	Contrasts   []responseTrendJSON `json:"contrasts,omitempty"`
	Models      []responseModelJSON `json:"models,omitempty"`
	BestModel   string              `json:"best_model,omitempty"`
	PriceRatio  *float64            `json:"price_ratio,omitempty"`
	Sensitivity []responseSensJSON  `json:"sensitivity,omitempty"`
	Margin      []responseCurveJSON `json:"margin_curve,omitempty"`
	Notes       []string            `json:"notes,omitempty"`
	Caution     string              `json:"caution,omitempty"`
}

type responseRateJSON struct {
	Treatment string  `json:"treatment"`
	Rate      float64 `json:"rate"`
	N         int     `json:"n"`
	Mean      float64 `json:"mean"`
	SE        float64 `json:"se"`
}

type responseTrendJSON struct {
	Source string  `json:"source"`
	DF     int     `json:"df"`
	SS     float64 `json:"ss"`
	MS     float64 `json:"ms"`
	F      float64 `json:"f"`
	P      float64 `json:"p"`
}

type responseModelJSON struct {
	Model        string    `json:"model"`
	Coefficients []float64 `json:"coefficients"`
	SE           []float64 `json:"se"`
	RSquared     float64   `json:"r_squared"`
	RMSE         *float64  `json:"rmse"`
	AIC          float64   `json:"aic"`
	JoinPoint    *float64  `json:"join_point"`
	JoinPointSE  *float64  `json:"join_point_se,omitempty"`
	Plateau      *float64  `json:"plateau"`
	Optimum      *float64  `json:"optimum_rate"`
	EconOptimum  *float64  `json:"economic_optimum_rate"`
	EconYield    *float64  `json:"yield_at_economic_optimum"`
	EconAtEdge   *bool     `json:"economic_optimum_at_edge,omitempty"`
	ResidualDF   int       `json:"df_residual"`
	ResidualSS   float64   `json:"rss"`
}

type responseSensJSON struct {
	PriceRatio float64 `json:"price_ratio"`
	Model      string  `json:"model"`
	Rate       float64 `json:"economic_optimum_rate"`
	Yield      float64 `json:"yield_at_economic_optimum"`
}

type responseCurveJSON struct {
	Rate     float64 `json:"rate"`
	Response float64 `json:"response"`
	Margin   float64 `json:"margin"`
}

func runResponse(ctx context.Context, o responseOptions) error {
	if o.Format != "text" && o.Format != "json" {
		return usagef("response: --format must be text or json, not %q", o.Format)
	}
	if o.PriceRatio < 0 || math.IsInf(o.PriceRatio, 0) || math.IsNaN(o.PriceRatio) {
		return usagef("response: --price-ratio must be a positive number")
	}
	var out []responseJSON
	var err error
	if isCSV(o.Path) {
		out, err = responseCSV(ctx, o)
	} else {
		out, err = responseTrial(ctx, o)
	}
	if err != nil {
		return err
	}
	if o.Format == "json" {
		enc := json.NewEncoder(o.Out)
		enc.SetIndent("", "  ")
		return enc.Encode(map[string]any{"traits": out})
	}
	for i, r := range out {
		if i > 0 {
			fmt.Fprintln(o.Out)
		}
		writeResponseText(o.Out, r)
	}
	return nil
}

// responseSeries is one trait's treatment means at their rates.
type responseSeries struct {
	codes []string
	rates []float64
	res   *analysis.Result
	idx   []int // indices in res.Means
}

func responseTrial(ctx context.Context, o responseOptions) ([]responseJSON, error) {
	if o.Rate != "" || o.Block != "" || o.Response != "" {
		return nil, usagef("response: --rate, --block and --response are for CSV tables; a trial file has its own")
	}
	t, err := trialfile.Load(o.Path)
	if err != nil {
		return nil, err
	}
	leave := map[string]bool{}
	for _, c := range strings.Split(o.LeaveOut, ",") {
		if c = strings.TrimSpace(c); c != "" {
			if t.Treatment(c) == nil {
				return nil, usagef("response: --leave-out: the trial has no treatment %q", c)
			}
			leave[c] = true
		}
	}
	rateOf := map[string]float64{}
	var leftOut []string
	unit := ""
	for _, tr := range t.Treatments {
		switch {
		case leave[tr.Code]:
			leftOut = append(leftOut, tr.Code)
		case tr.Rate == nil:
			leftOut = append(leftOut, tr.Code)
		default:
			rateOf[tr.Code] = *tr.Rate
			if unit == "" {
				unit = tr.RateUnit
			} else if tr.RateUnit != "" && tr.RateUnit != unit {
				return nil, fmt.Errorf("the treatments' rates are in different units (%s and %s): give every rate in one unit", unit, tr.RateUnit)
			}
		}
	}
	if len(rateOf) < 3 {
		return nil, fmt.Errorf("%s: a response analysis needs at least 3 treatments with a rate, and this trial has %d; give each treatment its rate (furlong new --rates, or the Treatments tab)", o.Path, len(rateOf))
	}
	var keys []string
	if o.Trait != "" {
		keys = []string{o.Trait}
	}
	outcomes, err := analysis.AnalyzeAll(ctx, t, keys, analysis.Options{})
	if err != nil {
		return nil, err
	}
	var out []responseJSON
	for _, oc := range outcomes {
		r := responseJSON{Trait: oc.Key, RateUnit: unit, LeftOut: leftOut}
		if oc.Err != nil {
			r.Error = Message(oc.Err)
			out = append(out, r)
			continue
		}
		s := responseSeries{res: oc.Result}
		for i, m := range oc.Result.Means {
			if x, ok := rateOf[m.Treatment]; ok {
				s.codes, s.rates, s.idx = append(s.codes, m.Treatment), append(s.rates, x), append(s.idx, i)
			}
		}
		r.Unit = oc.Result.Unit
		fillResponse(&r, s, o.PriceRatio)
		out = append(out, r)
	}
	return out, nil
}

func responseCSV(ctx context.Context, o responseOptions) ([]responseJSON, error) {
	if o.Trait != "" || o.LeaveOut != "" {
		return nil, usagef("response: --trait and --leave-out are for trial files; use --response and leave rows out of the table")
	}
	if o.Rate == "" {
		return nil, usagef("response: say which column holds the rates with --rate COL")
	}
	ao := analyzeOptions{treatment: o.Rate, block: o.Block}
	if o.Response != "" {
		ao.responses = []string{o.Response}
	}
	outcomes, err := analyzeCSV(ctx, ao, o.Path, analysis.Options{})
	if err != nil {
		return nil, err
	}
	var out []responseJSON
	for _, oc := range outcomes {
		r := responseJSON{Trait: oc.Key}
		if oc.Err != nil {
			r.Error = Message(oc.Err)
			out = append(out, r)
			continue
		}
		s := responseSeries{res: oc.Result}
		for i, m := range oc.Result.Means {
			x, err := trial.ParseNumber(m.Treatment, trial.PointOrComma)
			if err != nil {
				return nil, fmt.Errorf("%s: the rate %q in column %s is not a number", o.Path, m.Treatment, o.Rate)
			}
			s.codes, s.rates, s.idx = append(s.codes, m.Treatment), append(s.rates, x), append(s.idx, i)
		}
		fillResponse(&r, s, o.PriceRatio)
		out = append(out, r)
	}
	return out, nil
}

// fillResponse computes the trends, models and economics of one series.
func fillResponse(r *responseJSON, s responseSeries, ratio float64) {
	res := s.res
	order := make([]int, len(s.rates))
	for i := range order {
		order[i] = i
	}
	sort.SliceStable(order, func(a, b int) bool { return s.rates[order[a]] < s.rates[order[b]] })
	means := make([]float64, len(order))
	rates := make([]float64, len(order))
	for k, i := range order {
		m := res.Means[s.idx[i]]
		rates[k], means[k] = s.rates[i], m.Mean
		r.Rates = append(r.Rates, responseRateJSON{Treatment: s.codes[i], Rate: s.rates[i], N: m.N, Mean: m.Mean, SE: m.SE})
	}
	if res.Transform != stats.NoTransform {
		r.Notes = append(r.Notes, "The trait was analysed on a transformed scale; the trends and curves are on that scale.")
	}
	a := res.ANOVA
	cov, err := meansCovariance(res, s, order)
	if err == nil && a != nil {
		lines, err := stats.PolynomialTrend(means, cov, rates, a.MSE, a.DFError)
		if err != nil {
			r.Notes = append(r.Notes, Message(err))
		}
		for _, l := range lines {
			r.Contrasts = append(r.Contrasts, responseTrendJSON{Source: l.Source, DF: l.DF, SS: l.SS, MS: l.MS, F: l.F, P: l.P})
		}
	} else if err != nil {
		r.Notes = append(r.Notes, err.Error())
	}
	models, notes, err := stats.FitResponse(rates, means)
	if err != nil {
		r.Error = Message(err)
		return
	}
	r.Notes = append(r.Notes, notes...)
	if ratio > 0 {
		r.PriceRatio = &ratio
		r.Caution = export.EconomicCautionText()
	}
	bestAIC := math.Inf(1)
	var best *stats.ResponseModel
	for i := range models {
		m := models[i]
		j := responseModelJSON{
			Model: m.Model, Coefficients: m.Coef, SE: m.SE, RSquared: m.RSquared, RMSE: m.RMSE, AIC: m.AIC,
			JoinPoint: m.Join, JoinPointSE: m.JoinSE, Plateau: m.Plateau, ResidualDF: m.DF, ResidualSS: m.RSS,
		}
		if v, ok := m.AgronomicOptimum(); ok {
			j.Optimum = &v
		}
		if ratio > 0 {
			x, edge := m.EconomicOptimum(ratio)
			y := m.Predict(x)
			j.EconOptimum, j.EconYield, j.EconAtEdge = &x, &y, &edge
			for _, f := range []float64{0.5, 0.75, 1, 1.25, 1.5} {
				xr, _ := m.EconomicOptimum(ratio * f)
				r.Sensitivity = append(r.Sensitivity, responseSensJSON{PriceRatio: ratio * f, Model: m.Model, Rate: xr, Yield: m.Predict(xr)})
			}
		}
		r.Models = append(r.Models, j)
		if m.DF > 0 && m.AIC < bestAIC {
			bestAIC, best = m.AIC, &models[i]
		}
	}
	if best != nil {
		r.BestModel = best.Model
		if ratio > 0 {
			const points = 21
			for k := 0; k < points; k++ {
				x := best.Low + (best.High-best.Low)*float64(k)/(points-1)
				y := best.Predict(x)
				r.Margin = append(r.Margin, responseCurveJSON{Rate: x, Response: y, Margin: y - ratio*x})
			}
		}
	}
	if len(models) > 0 && len(rates) < 5 {
		r.Notes = append(r.Notes, "With fewer than 5 rates the plateau models are poorly determined; compare them with care.")
	}
}

// meansCovariance returns the covariance of the series' means divided by
// the error variance, from the analysis' standard errors: Var(m_i) = SE_i²
// and Cov(m_i, m_j) = (SE_i² + SE_j² − SED_ij²)/2.
func meansCovariance(res *analysis.Result, s responseSeries, order []int) ([]float64, error) {
	a := res.ANOVA
	if a == nil || !(a.MSE > 0) {
		return nil, errors.New("The trends need an error mean square, and this analysis has none.")
	}
	sed, nt := res.SEDMatrix(), len(res.Means)
	n := len(order)
	cov := make([]float64, n*n)
	for a1, i := range order {
		mi := res.Means[s.idx[i]]
		cov[a1*n+a1] = mi.SE * mi.SE / a.MSE
		for b1 := a1 + 1; b1 < n; b1++ {
			mj := res.Means[s.idx[order[b1]]]
			d := sed[s.idx[i]*nt+s.idx[order[b1]]]
			if !(d > 0) {
				return nil, fmt.Errorf("The analysis has no comparison of %s and %s, so the trends cannot be computed.", mi.Treatment, mj.Treatment)
			}
			v := (mi.SE*mi.SE + mj.SE*mj.SE - d*d) / (2 * a.MSE)
			cov[a1*n+b1], cov[b1*n+a1] = v, v
		}
	}
	return cov, nil
}

func writeResponseText(w io.Writer, r responseJSON) {
	title := "Response of " + r.Trait
	if r.RateUnit != "" {
		title += " to rate (" + r.RateUnit + ")"
	}
	fmt.Fprintln(w, title)
	fmt.Fprintln(w, strings.Repeat("=", len([]rune(title))))
	if r.Error != "" {
		fmt.Fprintf(w, "Not analysed: %s\n", r.Error)
		return
	}
	fmt.Fprintf(w, "%-12s %10s %4s %12s %10s\n", "treatment", "rate", "n", "mean", "SE")
	for _, x := range r.Rates {
		fmt.Fprintf(w, "%-12s %10g %4d %12.4g %10.3g\n", x.Treatment, x.Rate, x.N, x.Mean, x.SE)
	}
	if len(r.LeftOut) > 0 {
		fmt.Fprintf(w, "Left out of the trend: %s\n", strings.Join(r.LeftOut, ", "))
	}
	if len(r.Contrasts) > 0 {
		fmt.Fprintf(w, "\n%-12s %4s %12s %12s %9s %9s\n", "trend", "df", "SS", "MS", "F", "p")
		for _, c := range r.Contrasts {
			fmt.Fprintf(w, "%-12s %4d %12.5g %12.5g %9.3f %9s\n", strings.ReplaceAll(c.Source, "_", " "), c.DF, c.SS, c.MS, c.F, stats.FormatP(c.P))
		}
	}
	if len(r.Models) > 0 {
		fmt.Fprintf(w, "\n%-18s %-34s %7s %9s %9s %10s %10s\n", "model", "y = a + b·x + c·x²", "R²", "resid SD", "AIC", "join", "optimum")
		for _, m := range r.Models {
			coef := make([]string, len(m.Coefficients))
			for i, c := range m.Coefficients {
				coef[i] = strconv.FormatFloat(c, 'g', 5, 64)
			}
			fmt.Fprintf(w, "%-18s %-34s %7.4f %9s %9.2f %10s %10s\n", m.Model, strings.Join(coef, ", "), m.RSquared, optG(m.RMSE), m.AIC, optG(m.JoinPoint), optG(m.Optimum))
		}
		if r.BestModel != "" {
			fmt.Fprintf(w, "Lowest AIC: %s.\n", r.BestModel)
		}
	}
	if r.PriceRatio != nil {
		fmt.Fprintf(w, "\nEconomic optimum at a price ratio of %g (response units per rate unit):\n", *r.PriceRatio)
		for _, m := range r.Models {
			edge := ""
			if m.EconAtEdge != nil && *m.EconAtEdge {
				edge = " (an end of the tested rates)"
			}
			fmt.Fprintf(w, "  %-18s rate %8.4g, response %8.4g%s\n", m.Model, *m.EconOptimum, *m.EconYield, edge)
		}
		// The optimum rate at other price ratios: one row per model.
		var ratios []float64
		rows := map[string][]float64{}
		for _, s := range r.Sensitivity {
			if len(rows) == 0 || s.Model == r.Sensitivity[0].Model {
				ratios = append(ratios, s.PriceRatio)
			}
			rows[s.Model] = append(rows[s.Model], s.Rate)
		}
		fmt.Fprintf(w, "\nOptimum rate at other price ratios:\n%-18s", "price ratio")
		for _, x := range ratios {
			fmt.Fprintf(w, " %9.4g", x)
		}
		fmt.Fprintln(w)
		for _, m := range r.Models {
			fmt.Fprintf(w, "%-18s", m.Model)
			for _, x := range rows[m.Model] {
				fmt.Fprintf(w, " %9.4g", x)
			}
			fmt.Fprintln(w)
		}
	}
	for _, n := range r.Notes {
		fmt.Fprintf(w, "Note: %s\n", n)
	}
	if r.Caution != "" {
		fmt.Fprintf(w, "\n%s\n", r.Caution)
	}
}

func optG(v *float64) string {
	if v == nil {
		return "–"
	}
	return strconv.FormatFloat(*v, 'g', 5, 64)
}
