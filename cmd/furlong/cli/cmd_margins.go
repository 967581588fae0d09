package cli

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"os"
	"strings"

	"furlong/export"
	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

func init() {
	register(&command{
		name:    "margins",
		summary: "margins over input cost per treatment, compared with letters",
		usage: `furlong margins TRIAL [--price P] [--currency CUR] [--trait KEY] [--cost "CODE=PRODUCT[+APPLICATION]"]...
                [--method lsd|tukey] [--alpha 0.05] [--save] [--format text|json]`,
		details: `Works out each treatment's margin over input cost: the gross return (the produce price times
the treatment's mean of the yield trait, or --trait) less its input cost per unit area (product and
application), and compares the margins with letters by the same rules as the means. The margin's SE
is the price times the mean's SE (the costs are fixed amounts), so a difference of two margins has
the price times the SED of the means; the letters are protected by an F test that all margins are
equal. Prices are yours: nothing is built in.

--price is the price of one unit of the trait's unit of produce (per t for a yield in t/ha);
--currency a label for the amounts (e.g. EUR). --cost "N100=42.5+12" gives a treatment's product
cost (42.5) and application cost (12), per unit area; "CODE=+12" an application cost only. A rate
treatment without a product cost is costed at its rate times the input price that the trial's price
ratio implies (ratio × produce price; see 'furlong response'). The trial's saved prices (the window's
Compare, Margins tab) are used unless a flag gives another; --save writes the prices given into the
trial (under its lock; the previous file is kept as TRIAL.bak).`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := marginsOptions{env: env}
			fs := flag.NewFlagSet("margins", flag.ContinueOnError)
			fs.Float64Var(&o.price, "price", 0, "price of one unit of produce (per unit of the trait's unit, e.g. per t)")
			fs.StringVar(&o.currency, "currency", "", "a label for the amounts, e.g. EUR")
			fs.StringVar(&o.trait, "trait", "", "the trait `key` the return is worked out from (default: the yield trait)")
			fs.Var(&o.costs, "cost", "a treatment's cost per unit area: \"CODE=PRODUCT+APPLICATION\" or \"CODE=+APPLICATION\" (repeatable)")
			fs.StringVar(&o.method, "method", "", "letters: lsd or tukey (default: the trial's remembered method)")
			fs.Float64Var(&o.alpha, "alpha", analysis.DefaultAlpha, "significance level of the letters")
			fs.BoolVar(&o.save, "save", false, "save the prices given in the trial file")
			fs.StringVar(&o.format, "format", "text", "output: text or json")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("margins: give one trial file")
				}
				o.trial = args[0]
				fs.Visit(func(f *flag.Flag) { o.priceSet = o.priceSet || f.Name == "price" })
				return runMargins(ctx, o)
			}
		},
	})
}

type marginsOptions struct {
	env                            Env
	trial, currency, trait, method string
	format                         string
	price, alpha                   float64
	costs                          stringList
	save, priceSet                 bool
}

// marginsJSON is the JSON of 'furlong margins'; its keys are part of the
// CLI's contract (README).
type marginsJSON struct {
	Trait      string          `json:"trait"`
	Unit       string          `json:"unit,omitempty"`
	Currency   string          `json:"currency,omitempty"`
	Price      float64         `json:"price"`
	InputPrice *float64        `json:"input_price,omitempty"`
	RateUnit   string          `json:"rate_unit,omitempty"`
	F          float64         `json:"f"`
	DF1        int             `json:"df_treatment"`
	DF         int             `json:"df_error"`
	P          float64         `json:"p"`
	Method     string          `json:"method"`
	Alpha      float64         `json:"alpha"`
	Margins    []marginRowJSON `json:"margins"`
	Notes      []string        `json:"notes,omitempty"`
	Caution    string          `json:"caution"`
}

type marginRowJSON struct {
	Treatment   string  `json:"treatment"`
	Mean        float64 `json:"mean"`
	SE          float64 `json:"se"`
	Gross       float64 `json:"gross_return"`
	Product     float64 `json:"product_cost"`
	Application float64 `json:"application_cost"`
	Cost        float64 `json:"cost"`
	CostFrom    string  `json:"cost_from"`
	Margin      float64 `json:"margin"`
	MarginSE    float64 `json:"margin_se"`
	Letters     string  `json:"letters"`
}

// parseCost reads "CODE=PRODUCT+APPLICATION", "CODE=PRODUCT" or
// "CODE=+APPLICATION".
func parseCost(s string) (trial.TreatmentCost, error) {
	code, amounts, ok := strings.Cut(s, "=")
	code = strings.TrimSpace(code)
	if !ok || code == "" {
		return trial.TreatmentCost{}, usagef("margins: --cost %q: write CODE=PRODUCT+APPLICATION, for example N100=42.5+12", s)
	}
	c := trial.TreatmentCost{Treatment: code}
	prod, app, hasApp := strings.Cut(amounts, "+")
	if p := strings.TrimSpace(prod); p != "" {
		v, err := trial.ParseNumber(p, trial.PointOrComma)
		if err != nil || v < 0 {
			return c, usagef("margins: --cost %q: the product cost %q is not a positive number", s, p)
		}
		c.Product = &v
	}
	if hasApp {
		v, err := trial.ParseNumber(strings.TrimSpace(app), trial.PointOrComma)
		if err != nil || v < 0 {
			return c, usagef("margins: --cost %q: the application cost %q is not a positive number", s, app)
		}
		c.Application = v
	}
	if c.Product == nil && !hasApp {
		return c, usagef("margins: --cost %q gives no amount", s)
	}
	return c, nil
}

// applyEconomics puts the prices given on the command line into e.
func (o marginsOptions) applyEconomics(t *trial.Trial, costs []trial.TreatmentCost) (trial.Economics, error) {
	e := t.Economics.Clone()
	if o.priceSet {
		e.ProducePrice = o.price
	}
	if o.currency != "" {
		e.Currency = o.currency
	}
	if o.trait != "" {
		e.Trait = o.trait
	}
	for _, c := range costs {
		if old := e.Cost(c.Treatment); old != nil {
			*old = c
		} else {
			e.Costs = append(e.Costs, c)
		}
	}
	if msg := t.EconomicsProblem(e); msg != "" {
		return e, &ExitError{Code: ExitFailure, Msg: "nothing was changed: " + msg}
	}
	return e, nil
}

func runMargins(ctx context.Context, o marginsOptions) error {
	if o.format != "text" && o.format != "json" {
		return usagef("margins: --format must be text or json, not %q", o.format)
	}
	if !(o.alpha > 0 && o.alpha < 1) {
		return usagef("margins: --alpha must be between 0 and 1, for example 0.05")
	}
	var costs []trial.TreatmentCost
	for _, s := range o.costs {
		c, err := parseCost(s)
		if err != nil {
			return err
		}
		costs = append(costs, c)
	}
	var t *trial.Trial
	if o.save {
		if _, err := os.Stat(o.trial); err != nil {
			return err
		}
		warnOpen(o.env, o.trial)
		err := trialfile.Update(ctx, o.trial, func(u *trial.Trial) error {
			e, err := o.applyEconomics(u, costs)
			if err != nil {
				return err
			}
			u.Economics = e
			touch(u)
			t = u.Clone()
			return nil
		})
		if err != nil {
			return err
		}
		fmt.Fprintf(o.env.Stderr, "saved the prices in %s (the previous file is kept as %s.bak)\n", o.trial, o.trial)
	} else {
		var err error
		if t, err = trialfile.Load(o.trial); err != nil {
			return err
		}
		e, err := o.applyEconomics(t, costs)
		if err != nil {
			return err
		}
		t.Economics = e
	}
	key := t.EconomicsTrait()
	if key == "" {
		return fmt.Errorf("%s: the trial has no yield trait; say which trait the return is worked out from with --trait KEY", o.trial)
	}
	m := meansep.Method(t.MeanSeparation())
	if o.method != "" {
		var err error
		if m, err = parseMethod(o.method); err != nil {
			return err
		}
	}
	r, err := analysis.Analyze(t, key, analysis.Options{Alpha: o.alpha, Method: m})
	if err != nil {
		return err
	}
	mg, err := analysis.MarginsOf(t, r)
	if err != nil {
		if err == analysis.ErrNoPrice {
			return usagef("margins: give the price of the produce with --price P (per %s), or save it in the trial", unitOf(r.Unit))
		}
		return fmt.Errorf("%s: %w", o.trial, err)
	}
	out := marginsToJSON(mg)
	if o.format == "json" {
		enc := json.NewEncoder(o.env.Stdout)
		enc.SetIndent("", "  ")
		return enc.Encode(out)
	}
	writeMarginsText(o.env.Stdout, out)
	return nil
}

func marginsToJSON(m *analysis.Margins) marginsJSON {
	j := marginsJSON{Trait: m.Trait, Unit: m.Unit, Currency: m.Currency, Price: m.Price, RateUnit: m.RateUnit,
		F: m.F, DF1: m.DF1, DF: m.DF, P: m.P, Method: string(m.Method), Alpha: m.Alpha, Notes: m.Notes,
		Caution: export.EconomicCautionText()}
	if m.InputPrice > 0 {
		v := m.InputPrice
		j.InputPrice = &v
	}
	for _, r := range m.Rows {
		j.Margins = append(j.Margins, marginRowJSON{Treatment: r.Treatment, Mean: r.Mean, SE: r.SE, Gross: r.Gross,
			Product: r.Product, Application: r.Application, Cost: r.Cost, CostFrom: r.CostFrom, Margin: r.Margin,
			MarginSE: r.MarginSE, Letters: r.Letters})
	}
	return j
}

func writeMarginsText(w io.Writer, m marginsJSON) {
	cur := m.Currency
	if cur == "" {
		cur = "money"
	}
	title := fmt.Sprintf("Margin over input cost, %s (%s at %g %s per %s)", m.Trait, m.Unit, m.Price, cur, unitOf(m.Unit))
	fmt.Fprintln(w, title)
	fmt.Fprintln(w, strings.Repeat("=", len([]rune(title))))
	if m.InputPrice != nil {
		fmt.Fprintf(w, "Rate treatments without a product cost are costed at %.4g %s per %s (the trial's price ratio × the produce price).\n", *m.InputPrice, cur, unitOf(m.RateUnit))
	}
	fmt.Fprintf(w, "%-12s %10s %10s %10s %10s %10s %10s  %-8s %s\n", "treatment", "mean", "gross", "product", "applic.", "margin", "SE", "letters", "cost")
	for _, r := range m.Margins {
		fmt.Fprintf(w, "%-12s %10.4g %10.2f %10.2f %10.2f %10.2f %10.2f  %-8s %s\n", r.Treatment, r.Mean, r.Gross, r.Product, r.Application, r.Margin, r.MarginSE, r.Letters, r.CostFrom)
	}
	fmt.Fprintf(w, "Equal margins: F = %.3f on %d and %d df, p %s; letters by %s at α = %g (higher margins first).\n", m.F, m.DF1, m.DF, stats.FormatP(m.P), methodName(m.Method), m.Alpha)
	for _, n := range m.Notes {
		fmt.Fprintf(w, "Note: %s\n", n)
	}
	fmt.Fprintf(w, "\n%s\n", m.Caution)
}

// unitOf is the unit of produce of a per-area unit: "t" for "t/ha".
func unitOf(u string) string {
	if a, _, ok := strings.Cut(u, "/"); ok && a != "" {
		return a
	}
	if u == "" {
		return "produce"
	}
	return u
}

func methodName(m string) string {
	if m == string(meansep.Tukey) {
		return "Tukey's HSD"
	}
	return "the protected LSD"
}
