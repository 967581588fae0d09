package stats

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"gonum.org/v1/gonum/stat/distuv"
)

// Adjustment is how the p-values of several contrasts are adjusted for
// their number.
type Adjustment string

// The adjustments Contrasts knows.
const (
	// AdjustNone leaves each contrast's p as it is (planned comparisons
	// few in number and chosen before the data were seen).
	AdjustNone Adjustment = "none"
	// Bonferroni multiplies each p by the number of contrasts (capped at 1).
	Bonferroni Adjustment = "bonferroni"
	// Holm is Holm's (1979) step-down form of Bonferroni: the i-th smallest
	// of m p-values is multiplied by m − i + 1, kept monotone (Holm 1979,
	// Scand. J. Statist. 6, 65–70).
	Holm Adjustment = "holm"
	// Scheffe protects every contrast among the means, including those
	// chosen after looking at the data: p = P(F(a, ν) ≥ t²/a) with a the
	// number of means less one (Scheffé 1953, Biometrika 40, 87–104).
	Scheffe Adjustment = "scheffe"
)

// ParseAdjustment reads an adjustment name ("" is AdjustNone).
func ParseAdjustment(s string) (Adjustment, error) {
	switch a := Adjustment(strings.ToLower(strings.TrimSpace(s))); a {
	case "", AdjustNone:
		return AdjustNone, nil
	case Bonferroni, Holm, Scheffe:
		return a, nil
	}
	return "", fmt.Errorf("the adjustment must be none, bonferroni, holm or scheffe, not %q", s)
}

// ContrastSpec is one contrast of means: a name and one coefficient per
// mean, summing to zero.
type ContrastSpec struct {
	Name string
	Coef []float64
}

// ContrastRow is one contrast estimated.
type ContrastRow struct {
	Name     string
	Estimate float64 // Σ c_i m_i
	SE       float64
	DF       int
	T        float64
	P        float64 // two-sided, unadjusted
	// PAdjusted is P adjusted by the Adjustment across all contrasts of
	// the call (equal to P with AdjustNone).
	PAdjusted float64
}

// Contrasts estimates contrasts of n means with their t tests on the error
// degrees of freedom df. sed holds the standard errors of the differences
// of every pair of means, n × n row by row (the model's, so missing plots
// and unequal replication are accounted for). For coefficients that sum to
// zero the variance of the contrast follows from them alone:
//
//	Var(Σ c_i m_i) = −½ Σ_i Σ_j c_i c_j SED²_ij,
//
// since SED²_ij = V_ii + V_jj − 2V_ij and the V_ii terms vanish when Σ c = 0.
// The p-values are then adjusted across the contrasts by adj.
func Contrasts(means, sed []float64, df int, specs []ContrastSpec, adj Adjustment) ([]ContrastRow, error) {
	n := len(means)
	if len(sed) != n*n {
		panic("stats.Contrasts: sed is not n × n")
	}
	if df < 1 {
		return nil, fmt.Errorf("contrasts need an error with at least one degree of freedom")
	}
	if _, err := ParseAdjustment(string(adj)); err != nil {
		return nil, err
	}
	t := distuv.StudentsT{Mu: 0, Sigma: 1, Nu: float64(df)}
	rows := make([]ContrastRow, len(specs))
	for k, s := range specs {
		if len(s.Coef) != n {
			panic("stats.Contrasts: a contrast has the wrong number of coefficients")
		}
		sum, abs := 0.0, 0.0
		est := 0.0
		for i, c := range s.Coef {
			if math.IsNaN(c) || math.IsInf(c, 0) {
				return nil, fmt.Errorf("contrast %q has a coefficient that is not a number", s.Name)
			}
			sum += c
			abs += math.Abs(c)
			est += c * means[i]
		}
		if abs == 0 {
			return nil, fmt.Errorf("contrast %q has no coefficient other than 0", s.Name)
		}
		if math.Abs(sum) > 1e-9*abs {
			return nil, fmt.Errorf("the coefficients of contrast %q add up to %g; they must add up to 0", s.Name, sum)
		}
		v := 0.0
		for i, ci := range s.Coef {
			if ci == 0 {
				continue
			}
			for j, cj := range s.Coef {
				if cj != 0 && i != j {
					d := sed[i*n+j]
					if !(d > 0) {
						return nil, fmt.Errorf("contrast %q uses two means that the analysis could not compare", s.Name)
					}
					v -= ci * cj * d * d / 2
				}
			}
		}
		if !(v > 0) {
			return nil, fmt.Errorf("contrast %q has no standard error", s.Name)
		}
		se := math.Sqrt(v)
		tv := est / se
		rows[k] = ContrastRow{Name: s.Name, Estimate: est, SE: se, DF: df, T: tv, P: math.Min(1, 2*t.Survival(math.Abs(tv)))}
	}
	adjustContrasts(rows, adj, n-1)
	return rows, nil
}

// adjustContrasts fills PAdjusted; a is the number of means less one (the
// dimension of the space of contrasts, for Scheffé).
func adjustContrasts(rows []ContrastRow, adj Adjustment, a int) {
	m := float64(len(rows))
	switch adj {
	case Bonferroni:
		for i := range rows {
			rows[i].PAdjusted = math.Min(1, rows[i].P*m)
		}
	case Holm:
		order := make([]int, len(rows))
		for i := range order {
			order[i] = i
		}
		sort.SliceStable(order, func(x, y int) bool { return rows[order[x]].P < rows[order[y]].P })
		run := 0.0
		for rank, i := range order {
			run = math.Max(run, math.Min(1, rows[i].P*(m-float64(rank))))
			rows[i].PAdjusted = run
		}
	case Scheffe:
		for i := range rows {
			if a < 1 {
				rows[i].PAdjusted = rows[i].P
				continue
			}
			f := distuv.F{D1: float64(a), D2: float64(rows[i].DF)}
			rows[i].PAdjusted = math.Min(1, f.Survival(rows[i].T*rows[i].T/float64(a)))
		}
	default:
		for i := range rows {
			rows[i].PAdjusted = rows[i].P
		}
	}
}
