package analysis

import (
	"context"
	"encoding/csv"
	"math"
	"strconv"
	"testing"

	"furlong/stats"
	"furlong/stats/refdata"
	"furlong/trial"
)

// oatsTrial lays Yates's oats out as a split-plot trial (variety on main
// plots, nitrogen on subplots, 6 blocks) and records each plot's yield from
// stats/refdata/NAME.csv by its block, variety and nitrogen.
func oatsTrial(t *testing.T, name string) *trial.Trial {
	t.Helper()
	f, err := refdata.Open(name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	yield := map[[3]string]float64{}
	blocks := map[string]int{}
	for _, r := range rows[1:] {
		if _, ok := blocks[r[1]]; !ok {
			blocks[r[1]] = len(blocks) + 1
		}
		v := math.NaN()
		if r[4] != "" {
			if v, err = strconv.ParseFloat(r[4], 64); err != nil {
				t.Fatal(err)
			}
		}
		yield[[3]string{strconv.Itoa(blocks[r[1]]), r[2], r[3]}] = v
	}
	lv := func(codes ...string) []trial.Level {
		var out []trial.Level
		for _, c := range codes {
			out = append(out, trial.Level{Code: c})
		}
		return out
	}
	tr, err := trial.New(trial.NewOptions{
		Title: "Oats split plot",
		Factors: []trial.Factor{
			{Key: "variety", Levels: []trial.Level{{Code: "Vic", Name: "Victory"}, {Code: "GRain", Name: "Golden.rain"}, {Code: "Marv", Name: "Marvellous"}}},
			{Key: "nitrogen", Levels: lv("0.0cwt", "0.2cwt", "0.4cwt", "0.6cwt")},
		},
		Design: trial.Design{Kind: trial.SplitPlot, Reps: 6, MainFactor: "variety"},
		Traits: []trial.Trait{{Key: "yield", Kind: trial.Continuous, HigherBetter: true}},
		Seed:   7,
	})
	if err != nil {
		t.Fatal(err)
	}
	for i, p := range tr.Plots {
		v := varietyName[tr.LevelCode(p.Treatment, 0)]
		n := tr.LevelCode(p.Treatment, 1)
		y, ok := yield[[3]string{strconv.Itoa(p.Block), v, n}]
		if !ok {
			t.Fatalf("plot %d: no yield for block %d %s %s", p.Number, p.Block, v, n)
		}
		if math.IsNaN(y) {
			continue
		}
		if err := tr.SetValue(i, "yield", y); err != nil {
			t.Fatal(err)
		}
	}
	return tr
}

// varietyName and varietyCode map the trial's level codes (at most 8
// characters) to the data's variety names.
var varietyName = map[string]string{"Vic": "Victory", "GRain": "Golden.rain", "Marv": "Marvellous"}
var varietyCode = map[string]string{"Victory": "Vic", "Golden.rain": "GRain", "Marvellous": "Marv"}

type oatsRef struct {
	ANOVA []struct {
		Source string   `json:"source"`
		DF     int      `json:"df"`
		SS     *float64 `json:"ss"`
		F      *float64 `json:"f"`
		P      *float64 `json:"p"`
		DFDen  *float64 `json:"df_den"`
	} `json:"anova"`
	SED                map[string]float64 `json:"sed"`
	VarianceComponents map[string]float64 `json:"variance_components"`
	Effects            map[string][]struct {
		Levels map[string]string `json:"levels"`
		Mean   float64           `json:"mean"`
		SE     float64           `json:"se"`
	} `json:"effects"`
}

func nearRel(got, want, tol float64) bool {
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

// A split-plot trial is analysed with its strata, through AnalyzeAll as
// the window and the report do, and agrees with R 4.2.2 on Yates's oats
// (stats/refdata/oats-split.expected.json: aov with Error(block/variety), SEDs,
// lmer means; oats-split-missing: lmer REML, lmerTest, emmeans).
func TestSplitPlotTrialOats(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name     string
		method   string
		tol, lsm float64
	}{
		{"oats-split", "sums of squares", 1e-9, 1e-6},
		{"oats-split-missing", "REML", 1e-5, 1e-5},
	} {
		t.Run(c.name, func(t *testing.T) {
			t.Parallel()
			tr := oatsTrial(t, c.name+".csv")
			var ref oatsRef
			refdata.JSON(t, c.name+".expected.json", &ref)
			out, err := AnalyzeAll(context.Background(), tr, nil, Options{})
			if err != nil || out[0].Err != nil {
				t.Fatal(err, out[0].Err)
			}
			r := out[0].Result
			fr := r.Factorial
			if fr == nil || fr.Design != "split-plot" || fr.Method != c.method {
				t.Fatalf("factorial part %+v", fr)
			}
			for _, want := range ref.ANOVA {
				l := fr.Line(want.Source)
				if l == nil {
					t.Errorf("no line %s", want.Source)
					continue
				}
				if l.DF != want.DF || (want.SS != nil) != (l.SS != nil) ||
					want.SS != nil && !nearRel(*l.SS, *want.SS, c.tol) ||
					want.F != nil && (l.F == nil || !nearRel(*l.F, *want.F, c.tol)) ||
					want.P != nil && (l.P == nil || math.Abs(*l.P-*want.P) > c.tol) {
					t.Errorf("%s: got df %d ss %v f %v p %v", want.Source, l.DF, l.SS, l.F, l.P)
				}
			}
			// Roles of the strata lines (Gomez & Gomez 1984, ch. 3: the
			// main-plot factor against error (a), the rest against (b)).
			if l := fr.Line("variety"); c.method != "REML" && (l.Role != stats.RoleFactor || l.ErrorTerm != "error_a") {
				t.Errorf("variety line %+v", l)
			}
			if l := fr.Line("error_a"); c.method != "REML" && l.Role != stats.RoleErrorStratum {
				t.Errorf("error_a line %+v", l)
			}
			for k, v := range ref.SED {
				found := false
				for _, s := range fr.SEDs {
					if s.Key == k {
						found = nearRel(s.SED, v, c.tol)
					}
				}
				if !found {
					t.Errorf("sed %s, want %v", k, v)
				}
			}
			for k, v := range ref.VarianceComponents {
				found := false
				for _, comp := range fr.Components {
					if comp.Name == k {
						found = nearRel(comp.Variance, v, c.lsm)
					}
				}
				if !found {
					t.Errorf("component %s, want %v", k, v)
				}
			}
			// The combination means (Result.Means, one per treatment of
			// the trial) are the variety:nitrogen means of R.
			for _, want := range ref.Effects["variety:nitrogen"] {
				code := trial.CombinationCode([]string{varietyCode[want.Levels["variety"]], want.Levels["nitrogen"]})
				ok := false
				for _, m := range r.Means {
					if m.Treatment == code {
						ok = nearRel(m.Mean, want.Mean, c.lsm) && nearRel(m.SE, want.SE, c.lsm)
					}
				}
				if !ok {
					t.Errorf("mean of %s, want %v ± %v", code, want.Mean, want.SE)
				}
			}
			for name, means := range ref.Effects {
				e := fr.Effect(name)
				if e == nil {
					t.Errorf("no effect %s", name)
					continue
				}
				for _, want := range means {
					ok := false
					for _, m := range e.Means {
						match := len(m.Levels) == len(e.Factors)
						for k, f := range e.Factors {
							w := want.Levels[f]
							if f == "variety" {
								w = varietyCode[w]
							}
							match = match && w == m.Levels[k]
						}
						if match {
							ok = m.Mean != nil && nearRel(*m.Mean, want.Mean, c.lsm) && nearRel(*m.SE, want.SE, c.lsm)
						}
					}
					if !ok {
						t.Errorf("%s at %v, want %v ± %v", name, want.Levels, want.Mean, want.SE)
					}
				}
			}
			if len(r.Means) != 12 || r.ANOVA == nil || r.ANOVA.DFError < 1 {
				t.Errorf("one-list view: %d means, ANOVA %+v", len(r.Means), r.ANOVA)
			}
		})
	}
}
