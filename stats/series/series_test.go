package series

import (
	"math"
	"slices"
	"strconv"
	"testing"

	"furlong/stats/refdata"

	"gonum.org/v1/gonum/mathext"
	"gonum.org/v1/gonum/stat"
)

type refLine struct {
	Source string   `json:"source"`
	DF     int      `json:"df"`
	SS     float64  `json:"ss"`
	F      *float64 `json:"f"`
	P      *float64 `json:"p"`
}

type refMean struct {
	Treatment string  `json:"treatment"`
	Mean      float64 `json:"mean"`
	LSMean    float64 `json:"ls_mean"`
	SE        float64 `json:"se"`
}

func readCSV(t *testing.T, name string) [][]string {
	t.Helper()
	return refdata.CSV(t, name)[1:]
}

func readJSON(t *testing.T, name string, v any) {
	t.Helper()
	refdata.JSON(t, name, v)
}

func index(names []string, s string) ([]string, int) {
	if i := slices.Index(names, s); i >= 0 {
		return names, i
	}
	return append(names, s), len(names)
}

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.Abs(got-want) > tol*math.Max(1, math.Abs(want)) {
		t.Errorf("%s = %.12g, want %.12g", what, got, want)
	}
}

// fourSites reads series-4-sites.csv as Plots and the entry names.
func fourSites(t *testing.T) (Plots, []string) {
	var sites, entries []string
	var p Plots
	for _, r := range readCSV(t, "series-4-sites.csv") {
		var si, ei int
		sites, si = index(sites, r[1])
		entries, ei = index(entries, r[3])
		b, _ := strconv.Atoi(r[2])
		y, _ := strconv.ParseFloat(r[4], 64)
		p.Response = append(p.Response, y)
		p.Site = append(p.Site, si)
		p.Block = append(p.Block, b-1)
		p.Entry = append(p.Entry, ei)
		p.Blocks = max(p.Blocks, b)
	}
	p.Sites, p.Entries = len(sites), len(entries)
	return p, entries
}

// TestCombinedFourSites checks the combined ANOVA, the means across sites
// and their SEs against R 4.2.2 (series-4-sites.expected.json: aov with
// entry tested against entry × site; lm + emmeans on the site means).
func TestCombinedFourSites(t *testing.T) {
	p, entries := fourSites(t)
	var ref struct {
		Combined []refLine `json:"combined"`
		Means    []refMean `json:"means"`
		FW       []struct {
			Treatment string  `json:"treatment"`
			Slope     float64 `json:"slope"`
		} `json:"finlay_wilkinson"`
	}
	readJSON(t, "series-4-sites.expected.json", &ref)
	r, err := Combined(p, SitesRandom)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range ref.Combined {
		var found bool
		for _, got := range r.ANOVA {
			if got.Name != want.Source {
				continue
			}
			found = true
			if got.DF != want.DF {
				t.Errorf("%s df = %d, want %d", want.Source, got.DF, want.DF)
			}
			near(t, want.Source+" ss", got.SS, want.SS, 1e-10)
			if want.F != nil {
				if !got.HasTest {
					t.Errorf("%s has no F test", want.Source)
					continue
				}
				near(t, want.Source+" F", got.F, *want.F, 1e-10)
				near(t, want.Source+" p", got.P, *want.P, 1e-9)
			}
		}
		if !found {
			t.Errorf("no line %q", want.Source)
		}
	}
	for _, want := range ref.Means {
		i := slices.Index(entries, want.Treatment)
		near(t, want.Treatment+" mean", r.Means[i].Mean, want.Mean, 1e-12)
		near(t, want.Treatment+" se", r.Means[i].SE, want.SE, 1e-10)
	}
	// The two-stage analysis of the same (balanced) site means gives the
	// same means and SEs (R: lm(site mean ~ site + entry) + emmeans).
	ts, err := TwoStage(r.Cells, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range ref.Means {
		i := slices.Index(entries, want.Treatment)
		near(t, want.Treatment+" two-stage mean", ts.Means[i].Mean, want.Mean, 1e-12)
		near(t, want.Treatment+" two-stage se", ts.Means[i].SE, want.SE, 1e-10)
	}
	st, err := StabilityOf(r.Cells, false)
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range ref.FW {
		i := slices.Index(entries, want.Treatment)
		near(t, want.Treatment+" slope", *st[i].Slope, want.Slope, 1e-10)
	}
	// Sites fixed: entries against the pooled error (R's aov table: MS
	// entry / MS error from the same lines).
	fx, err := Combined(p, SitesFixed)
	if err != nil {
		t.Fatal(err)
	}
	var msEntry, msErr float64
	for _, l := range ref.Combined {
		switch l.Source {
		case "treatment":
			msEntry = l.SS / float64(l.DF)
		case "error":
			msErr = l.SS / float64(l.DF)
		}
	}
	tr, _ := fx.ANOVA.Treatment()
	near(t, "fixed-sites F", tr.F, msEntry/msErr, 1e-10)
	if fx.DF != 40 {
		t.Errorf("fixed-sites error df = %d, want 40", fx.DF)
	}
}

// barley reads the 1931 barley site means (Immer et al. 1934, R
// lattice::barley) as cells[site][variety].
func barley(t *testing.T, name string) ([][]float64, []string) {
	var sites, vars []string
	type cell struct {
		s, v int
		y    float64
	}
	var cs []cell
	for _, r := range readCSV(t, name) {
		var si, vi int
		sites, si = index(sites, r[0])
		vars, vi = index(vars, r[1])
		y := math.NaN()
		if r[2] != "NA" {
			y, _ = strconv.ParseFloat(r[2], 64)
		}
		cs = append(cs, cell{si, vi, y})
	}
	cells := make([][]float64, len(sites))
	for j := range cells {
		cells[j] = make([]float64, len(vars))
	}
	for _, c := range cs {
		cells[c.s][c.v] = c.y
	}
	return cells, vars
}

// TestTwoStageBarley checks the two-stage analysis of a table of site
// means, complete and with two means missing, against R 4.2.2's RCBD
// analysis with sites as blocks (aov, emmeans) of Immer et al.'s (1934)
// barley yields, 1931 (R lattice::barley).
func TestTwoStageBarley(t *testing.T) {
	for _, name := range []string{"barley-1931-rcbd", "barley-1931-rcbd-missing"} {
		t.Run(name, func(t *testing.T) {
			cells, vars := barley(t, name+".csv")
			var ref struct {
				Anova []refLine              `json:"anova"`
				MSE   float64                `json:"mse"`
				DF    int                    `json:"df_error"`
				Means []refMean              `json:"means"`
				Pairs []struct{ SE float64 } `json:"pairs"`
			}
			readJSON(t, name+".expected.json", &ref)
			r, err := TwoStage(cells, nil)
			if err != nil {
				t.Fatal(err)
			}
			tr, _ := r.ANOVA.Treatment()
			near(t, "entry ss", tr.SS, ref.Anova[1].SS, 1e-10)
			near(t, "entry F", tr.F, *ref.Anova[1].F, 1e-10)
			near(t, "entry p", tr.P, *ref.Anova[1].P, 1e-8)
			near(t, "site ss", r.ANOVA[0].SS, ref.Anova[0].SS, 1e-10)
			near(t, "interaction ms", r.MS, ref.Anova[2].SS/float64(ref.Anova[2].DF), 1e-10)
			if r.DF != ref.Anova[2].DF {
				t.Errorf("df = %d, want %d", r.DF, ref.Anova[2].DF)
			}
			for _, want := range ref.Means {
				i := slices.Index(vars, want.Treatment)
				near(t, want.Treatment+" mean", r.Means[i].Mean, want.LSMean, 1e-10)
				near(t, want.Treatment+" se", r.Means[i].SE, want.SE, 1e-9)
			}
			// The weighted analysis with equal weights is the unweighted one.
			w := make([][]float64, len(cells))
			for j := range w {
				w[j] = make([]float64, len(cells[j]))
				for i := range w[j] {
					w[j][i] = 2.5
				}
			}
			rw, err := TwoStage(cells, w)
			if err != nil {
				t.Fatal(err)
			}
			trw, _ := rw.ANOVA.Treatment()
			near(t, "weighted F (equal weights)", trw.F, tr.F, 1e-9)
			for i := range r.Means {
				near(t, "weighted mean", rw.Means[i].Mean, r.Means[i].Mean, 1e-10)
				near(t, "weighted se", rw.Means[i].SE, r.Means[i].SE, 1e-9)
				for j := 0; j < i; j++ {
					near(t, "weighted pair se", rw.PairSE(i, j), r.PairSE(i, j), 1e-9)
				}
			}
		})
	}
}

// TestStabilityByDefinition checks Finlay–Wilkinson slopes and Wricke's
// ecovalence on the complete barley table against their definitions
// computed here independently: gonum's stat.LinearRegression of each
// variety's site means on the site means (Finlay & Wilkinson 1963), and
// W_i = Σ_j (y_ij − ȳ_i. − ȳ_.j + ȳ..)² (Wricke 1962).
func TestStabilityByDefinition(t *testing.T) {
	cells, _ := barley(t, "barley-1931-rcbd.csv")
	st, err := StabilityOf(cells, false)
	if err != nil {
		t.Fatal(err)
	}
	s, e := len(cells), len(cells[0])
	siteMean := make([]float64, s)
	entryMean := make([]float64, e)
	var g float64
	for j := range cells {
		for i := range cells[j] {
			siteMean[j] += cells[j][i] / float64(e)
			entryMean[i] += cells[j][i] / float64(s)
			g += cells[j][i] / float64(s*e)
		}
	}
	var sumW float64
	for i := 0; i < e; i++ {
		y := make([]float64, s)
		var w float64
		for j := range cells {
			y[j] = cells[j][i]
			w += sq(cells[j][i] - entryMean[i] - siteMean[j] + g)
		}
		sumW += w
		_, beta := stat.LinearRegression(siteMean, y, nil, false)
		near(t, "slope", *st[i].Slope, beta, 1e-10)
		near(t, "ecovalence", st[i].Ecovalence, w, 1e-9)
	}
	// The ecovalences add up to the entry × site sum of squares (R's
	// residual SS of the RCBD analysis with sites as blocks).
	near(t, "sum of ecovalences", sumW, 878.085148831828, 1e-10)
}

// TestHeadToHead checks the paired comparison over sites against a t test
// worked out here from the differences (common practice: the paired t).
func TestHeadToHead(t *testing.T) {
	cells := [][]float64{{5, 4}, {6, 6.5}, {7, 5}, {4, 3}}
	h := Compare2(cells, 0, 1)
	if h.Sites != 4 || h.Higher != 3 || h.Lower != 1 || h.Ties != 0 {
		t.Fatalf("counts %+v", h)
	}
	d := []float64{1, -0.5, 2, 1}
	m, sd := stat.MeanStdDev(d, nil)
	near(t, "mean diff", h.MeanDiff, m, 1e-15)
	near(t, "t", *h.T, m/(sd/2), 1e-12)
	// Two-sided p of Student's t by the incomplete-beta identity
	// P(|T| > t) = I_{ν/(ν+t²)}(ν/2, 1/2) (Abramowitz & Stegun 26.7.1).
	nu := 3.0
	tv := *h.T
	near(t, "p", *h.P, mathext.RegIncBeta(nu/2, 0.5, nu/(nu+tv*tv)), 1e-12)
}

func TestRanks(t *testing.T) {
	// common practice: rank 1 = best, ties share the average rank.
	got := ranks([]float64{3, math.NaN(), 5, 3, 1}, false)
	want := []float64{2.5, math.NaN(), 1, 2.5, 4}
	for i := range want {
		if !(got[i] == want[i] || math.IsNaN(got[i]) && math.IsNaN(want[i])) {
			t.Fatalf("ranks = %v, want %v", got, want)
		}
	}
}

func TestCombinedRefusesUnbalanced(t *testing.T) {
	p, _ := fourSites(t)
	p.Response[5] = math.NaN()
	if _, err := Combined(p, SitesRandom); err != ErrNotBalanced {
		t.Fatalf("err = %v, want ErrNotBalanced", err)
	}
}
