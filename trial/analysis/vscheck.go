package analysis

import (
	"fmt"
	"math"
	"strings"

	"furlong/stats/dist"
)

// CheckComparison is every treatment compared with one check by Dunnett's
// single-step many-to-one procedure (Dunnett 1955, J. Am. Stat. Assoc. 50,
// 1096–1121): differences with their model standard errors, simultaneous
// confidence intervals at 1 − Alpha, and adjusted p-values, two-sided and
// one-sided in the trait's better direction.
type CheckComparison struct {
	Check        string // the check's code
	Alpha        float64
	HigherBetter bool
	// Critical is the two-sided simultaneous critical value |t| of the
	// intervals.
	Critical float64
	// Method says how the multivariate t probabilities were computed
	// (dist.ProductMethod: exact; dist.LatticeMethod: to within Error;
	// dist.FactorMethod: approximation), and Error the absolute error bound
	// or estimate of each p-value (NaN for the approximation).
	Method dist.ManyToOneMethod
	Error  float64
	Rows   []CheckRow
}

// CheckRow is one treatment against the check.
type CheckRow struct {
	Treatment string
	Diff      float64 // treatment mean minus check mean
	SE        float64
	// Lower and Upper bound the simultaneous confidence interval.
	Lower, Upper float64
	PTwoSided    float64 // single-step adjusted, two-sided
	PBetter      float64 // single-step adjusted, one-sided in the better direction
	// Verdict is "better", "worse" or "not different" at Alpha, from the
	// two-sided intervals.
	Verdict string
}

// CompareWithCheck compares every other treatment of r with the check
// (a treatment code). The correlations of the comparisons come from the
// model's standard errors of the differences of means, so missing plots are
// accounted for: Cov(d_i, d_j) = (SED²_i,check + SED²_j,check − SED²_ij)/2.
func CompareWithCheck(r *Result, check string) (*CheckComparison, error) {
	ci := -1
	for i, m := range r.Means {
		if m.Treatment == check {
			ci = i
		}
	}
	if ci < 0 {
		codes := make([]string, len(r.Means))
		for i, m := range r.Means {
			codes[i] = m.Treatment
		}
		return nil, &Error{Trait: r.TraitKey, Msg: fmt.Sprintf("there is no treatment %q to compare with (the treatments are %s)", check, strings.Join(codes, ", "))}
	}
	a := r.ANOVA
	if a == nil || a.DFError < 1 || !(a.MSE > 0) {
		return nil, &Error{Trait: r.TraitKey, Msg: "the comparisons with the check need an error mean square with at least one degree of freedom"}
	}
	nt := len(r.Means)
	sedAt := r.SEDMatrix()
	var others []int
	for i := range r.Means {
		if i != ci {
			others = append(others, i)
		}
	}
	k := len(others)
	if k == 0 {
		return nil, &Error{Trait: r.TraitKey, Msg: "there is no treatment besides the check"}
	}
	se := make([]float64, k)
	diff := make([]float64, k)
	for a1, i := range others {
		s := sedAt[i*nt+ci]
		if !(s > 0) {
			return nil, &Error{Trait: r.TraitKey, Msg: fmt.Sprintf("%s cannot be compared with the check %s", r.Means[i].Treatment, check)}
		}
		se[a1] = s
		diff[a1] = r.Means[i].Mean - r.Means[ci].Mean
	}
	corr := make([]float64, k*k)
	for a1, i := range others {
		corr[a1*k+a1] = 1
		for b1 := a1 + 1; b1 < k; b1++ {
			j := others[b1]
			sij := sedAt[i*nt+j]
			c := (se[a1]*se[a1] + se[b1]*se[b1] - sij*sij) / (2 * se[a1] * se[b1])
			corr[a1*k+b1], corr[b1*k+a1] = c, c
		}
	}
	d, err := dist.NewManyToOne(corr, k, float64(a.DFError), 0)
	if err != nil {
		return nil, &Error{Trait: r.TraitKey, Msg: "the comparisons with the check could not be computed: " + err.Error()}
	}
	alpha := r.Alpha
	if !(alpha > 0 && alpha < 1) {
		alpha = DefaultAlpha
	}
	out := &CheckComparison{Check: check, Alpha: alpha, HigherBetter: r.HigherBetter, Method: d.Method(), Error: d.Error()}
	out.Critical = d.Quantile(alpha, true)
	sign := 1.0
	if !r.HigherBetter {
		sign = -1
	}
	for a1, i := range others {
		t := diff[a1] / se[a1]
		row := CheckRow{
			Treatment: r.Means[i].Treatment, Diff: diff[a1], SE: se[a1],
			Lower: diff[a1] - out.Critical*se[a1], Upper: diff[a1] + out.Critical*se[a1],
			PTwoSided: d.Survival(math.Abs(t), true),
			PBetter:   d.Survival(sign*t, false),
		}
		switch {
		case row.Lower > 0 && r.HigherBetter, row.Upper < 0 && !r.HigherBetter:
			row.Verdict = "better"
		case row.Upper < 0 && r.HigherBetter, row.Lower > 0 && !r.HigherBetter:
			row.Verdict = "worse"
		default:
			row.Verdict = "not different"
		}
		out.Rows = append(out.Rows, row)
	}
	return out, nil
}

// CheckOf returns the code of the treatment the entries of r are compared
// with: the result's one check; with no check, the untreated check (a
// crop-protection trial's reference); "" when there is neither, or several
// checks.
func CheckOf(r *Result) string {
	code := ""
	for _, m := range r.Means {
		if m.Check {
			if code != "" {
				return ""
			}
			code = m.Treatment
		}
	}
	if code == "" {
		for _, m := range r.Means {
			if m.Treatment == r.Untreated {
				return m.Treatment
			}
		}
	}
	return code
}
