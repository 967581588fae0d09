package cli

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
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

func responseTrial(ctx context.Context, o responseOptions) ([]responseJSON, error) {
	if o.Rate != "" || o.Block != "" || o.Response != "" {
		return nil, usagef("response: --rate, --block and --response are for CSV tables; a trial file has its own")
	}
	t, err := trialfile.Load(o.Path)
	if err != nil {
		return nil, err
	}
	// The trial's saved settings (the window's Response view), unless the
	// flags say otherwise.
	leave, ratio := t.Analysis.Response.LeaveOut, t.Analysis.Response.PriceRatio
	if o.LeaveOut != "" {
		leave = nil
		for _, c := range strings.Split(o.LeaveOut, ",") {
			if c = strings.TrimSpace(c); c != "" {
				if t.Treatment(c) == nil {
					return nil, usagef("response: --leave-out: the trial has no treatment %q", c)
				}
				leave = append(leave, c)
			}
		}
	}
	if o.PriceRatio > 0 {
		ratio = o.PriceRatio
	}
	rates, err := analysis.RatesOf(t, leave)
	if err != nil {
		return nil, fmt.Errorf("%s: %w", o.Path, err)
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
		out = append(out, responseOf(oc, rates, ratio))
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
		rates := analysis.Rates{Of: map[string]float64{}}
		if oc.Err == nil {
			for _, m := range oc.Result.Means {
				x, err := trial.ParseNumber(m.Treatment, trial.PointOrComma)
				if err != nil {
					return nil, fmt.Errorf("%s: the rate %q in column %s is not a number", o.Path, m.Treatment, o.Rate)
				}
				rates.Of[m.Treatment] = x
			}
		}
		out = append(out, responseOf(oc, rates, o.PriceRatio))
	}
	return out, nil
}

// responseOf is one trait's response analysis (analysis.ResponseOf) in the
// CLI's JSON shape.
func responseOf(oc analysis.Outcome, rates analysis.Rates, ratio float64) responseJSON {
	r := responseJSON{Trait: oc.Key, RateUnit: rates.Unit, LeftOut: rates.LeftOut}
	if oc.Err != nil {
		r.Error = Message(oc.Err)
		return r
	}
	a, err := analysis.ResponseOf(oc.Result, rates, ratio)
	r.Unit = a.Unit
	for _, p := range a.Points {
		r.Rates = append(r.Rates, responseRateJSON{Treatment: p.Treatment, Rate: p.Rate, N: p.N, Mean: p.Mean, SE: p.SE})
	}
	r.Notes = a.Notes
	for _, l := range a.Trends {
		r.Contrasts = append(r.Contrasts, responseTrendJSON{Source: l.Source, DF: l.DF, SS: l.SS, MS: l.MS, F: l.F, P: l.P})
	}
	if err != nil {
		r.Error = Message(err)
		return r
	}
	if a.PriceRatio > 0 {
		r.PriceRatio = &a.PriceRatio
		r.Caution = export.EconomicCautionText()
	}
	for _, m := range a.Models {
		j := responseModelJSON{
			Model: m.Model, Coefficients: m.Coef, SE: m.SE, RSquared: m.RSquared, RMSE: m.RMSE, AIC: m.AIC,
			JoinPoint: m.Join, JoinPointSE: m.JoinSE, Plateau: m.Plateau, ResidualDF: m.DF, ResidualSS: m.RSS,
			Optimum: m.Optimum, EconOptimum: m.Econ, EconYield: m.EconYield,
		}
		if m.Econ != nil {
			edge := m.AtEdge
			j.EconAtEdge = &edge
		}
		r.Models = append(r.Models, j)
	}
	for _, s := range a.Sensitivity {
		r.Sensitivity = append(r.Sensitivity, responseSensJSON{PriceRatio: s.PriceRatio, Model: s.Model, Rate: s.Rate, Yield: s.Yield})
	}
	for _, p := range a.Margin {
		r.Margin = append(r.Margin, responseCurveJSON{Rate: p.Rate, Response: p.Response, Margin: p.Margin})
	}
	r.BestModel = a.Best
	return r
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
