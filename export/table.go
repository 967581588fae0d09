// Package export holds the tables that every Furlong report format shares:
// the summary of treatment means across traits, the choice of the yield trait
// and each entry's yield as a percentage of the check, and the plain-language
// reading of an analysis' diagnostics. The writers for particular formats
// live in sub-packages (export/xlsx, export/chart).
package export

import (
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"

	"furlong/stats"
	"furlong/stats/meansep"
	"furlong/trial"
	"furlong/trial/analysis"
)

// NoValues is the reason given for a trait whose outcome has neither a
// result nor an error.
const NoValues = "no values recorded for this trait yet"

// Reason returns the plain-language reason a trait has no analysis, or "" when
// it has one.
func Reason(o analysis.Outcome) string {
	switch {
	case o.Result != nil && o.Err == nil:
		return ""
	case o.Err != nil:
		// The trait is named where the reason is shown; give the sentence
		// without the "key: " prefix an analysis.Error carries.
		var ae *analysis.Error
		if errors.As(o.Err, &ae) && ae.Msg != "" {
			return ae.Msg
		}
		return o.Err.Error()
	default:
		return NoValues
	}
}

// Summary is the table most trial reports lead with: one row per treatment,
// one column per trait with the mean and its letters, and the lines of
// statistics under the means.
type Summary struct {
	Method meansep.Method
	Alpha  float64
	Traits []SummaryTrait
	Rows   []SummaryRow
}

// HasPercentOfCheck reports whether any trait of the summary shows its means
// as percentages of the check.
func (s *Summary) HasPercentOfCheck() bool {
	for _, st := range s.Traits {
		if st.CheckMean != nil {
			return true
		}
	}
	return false
}

// SummaryTrait is one trait column of a Summary.
type SummaryTrait struct {
	Key, Name, Unit string
	Decimals        int              // of the recorded values
	MeanDecimals    int              // of its means (analysis.MeanDecimals)
	Result          *analysis.Result // nil when the trait could not be analysed
	Reason          string           // why there is no Result
	// CheckMean is the mean of the check entries when the trait shows
	// percentages of the check (the user's choice, trial.Trial.
	// ShowsPercentOfCheck), nil otherwise; the cells then carry them.
	CheckMean *float64

	GrandMean float64
	CVPercent float64
	// MSD is the least significant difference (LSD) or honestly significant
	// difference (HSD) at Alpha, by Method; nil when replication is unequal.
	MSD *float64
	// MSDRange is the range of the pairwise LSDs or HSDs, the yardstick
	// when replication is unequal; nil when there is no comparison.
	MSDRange *analysis.Range
	// P is the p-value of the treatment F test; HasP is false when the
	// ANOVA has no treatment test.
	P    float64
	HasP bool
	// VsCheck is the comparison of every entry with the check (Dunnett)
	// when the analysis carries one, nil otherwise; the cells then carry
	// each entry's reading.
	VsCheck *analysis.CheckComparison
}

// SummaryRow is one treatment of a Summary.
type SummaryRow struct {
	Treatment string // code
	Name      string
	Check     bool
	Cells     []SummaryCell // one per Summary.Traits
}

// SummaryCell is the mean of one treatment for one trait.
type SummaryCell struct {
	OK      bool    // false when the trait has no analysis or no mean for the treatment
	Mean    float64 // on the original scale (back-transformed when the analysis was transformed)
	Letters string  // mean separation letters by the summary's method; "" when withheld
	// PercentOfCheck is the mean as a percentage of the trait's check mean,
	// nil when the trait does not show it.
	PercentOfCheck *float64
	// VsCheck is the entry's reading against the check when the trait has
	// the comparison: VsBetter, VsWorse, VsNotDifferent, or VsIsCheck for
	// the check itself; "" otherwise.
	VsCheck string
}

// Readings of an entry against the check in a summary cell: short, for a
// column beside the means.
const (
	VsBetter       = "better"
	VsWorse        = "worse"
	VsNotDifferent = "ns"
	VsIsCheck      = "check"
)

// HasVsCheck reports whether any trait of the summary compares the entries
// with the check.
func (s *Summary) HasVsCheck() bool {
	for _, st := range s.Traits {
		if st.VsCheck != nil {
			return true
		}
	}
	return false
}

// VsCheckNote explains the summary's column of readings against the check.
func (s *Summary) VsCheckNote() string {
	for _, st := range s.Traits {
		if vc := st.VsCheck; vc != nil {
			level := strconv.FormatFloat(100*(1-vc.Alpha), 'f', -1, 64) + "%"
			return "vs check: each entry against the check by Dunnett's comparisons; better or worse (in each trait's better direction) where the simultaneous " + level + " interval of the difference leaves out zero, ns where it does not. The trait sheets give the differences, intervals and p-values."
		}
	}
	return ""
}

// MSDText writes a least significant difference for a table: the single
// value with dec decimals, or when the pairs have their own (unequal
// replication, or a split or strip plot's comparisons that mix strata) the
// range of the pairwise values, "0.48–0.55 (by pair)", so that the reader
// keeps a yardstick; "–" when there is neither.
func MSDText(msd *float64, rng *analysis.Range, dec int) string {
	f := func(v float64) string { return strconv.FormatFloat(v, 'f', dec, 64) }
	switch {
	case msd != nil && finite(*msd):
		return f(*msd)
	case rng != nil && finite(rng.Min) && finite(rng.Max):
		lo, hi := f(rng.Min), f(rng.Max)
		if lo == hi {
			return lo + " (by pair)"
		}
		return lo + "–" + hi + " (by pair)"
	}
	return "–"
}

// MSDLabel names the minimum significant difference of the method:
// "LSD (0.05)" or "HSD (0.05)".
func MSDLabel(m meansep.Method, alpha float64) string {
	name := "LSD"
	if m == meansep.Tukey {
		name = "HSD"
	}
	return fmt.Sprintf("%s (%s)", name, strconv.FormatFloat(alpha, 'f', -1, 64))
}

// Letters returns the letters of mean m by method.
func Letters(m analysis.Mean, method meansep.Method) string {
	if method == meansep.Tukey {
		return m.LettersTukey
	}
	return m.LettersLSD
}

// MSD returns the LSD or HSD of r by method, nil when replication is unequal.
func MSD(r *analysis.Result, method meansep.Method) *float64 {
	if method == meansep.Tukey {
		return r.HSD
	}
	return r.LSD
}

// MSDRange returns the range of the pairwise LSDs or HSDs of r by method.
func MSDRange(r *analysis.Result, method meansep.Method) *analysis.Range {
	if method == meansep.Tukey {
		return r.HSDRange
	}
	return r.LSDRange
}

// YieldTrait returns the index in traits of the trial's yield trait, -1
// when there is none (the rule is trial.YieldTrait).
func YieldTrait(traits []trial.Trait) int { return trial.YieldTrait(traits) }

// FindTrait returns the index of the trait with key in t, -1 when absent.
func FindTrait(t *trial.Trial, key string) int {
	for i := range t.Traits {
		if t.Traits[i].Key == key {
			return i
		}
	}
	return -1
}

// ReportTraits returns the traits of t that a report covers: those listed in
// keys, in that order, or every trait of t when keys is empty. Unknown keys
// are skipped.
func ReportTraits(t *trial.Trial, keys []string) []trial.Trait {
	if len(keys) == 0 {
		return append([]trial.Trait(nil), t.Traits...)
	}
	var out []trial.Trait
	seen := make(map[string]bool)
	for _, k := range keys {
		if seen[k] {
			continue
		}
		seen[k] = true
		if i := FindTrait(t, k); i >= 0 {
			out = append(out, t.Traits[i])
		}
	}
	return out
}

// LookupOutcome returns the outcome for trait key in results.
func LookupOutcome(results []analysis.Outcome, key string) (analysis.Outcome, bool) {
	for _, r := range results {
		if r.Key == key {
			return r, true
		}
		if r.Key == "" && r.Result != nil && r.Result.TraitKey == key {
			return r, true
		}
	}
	return analysis.Outcome{}, false
}

// NewSummary builds the summary table of the traits of t listed in keys
// (every trait when empty) from their results, separating means by method
// ("" for the trial's remembered method). A trait with no result, or whose
// result carries an error, has a column with no means and its Reason set.
// Percentages of the check come from the results (analysis.Result.
// CheckMean), for the traits the user chose.
func NewSummary(t *trial.Trial, results []analysis.Outcome, keys []string, method meansep.Method, alpha float64) *Summary {
	if method == "" {
		method = meansep.Method(t.MeanSeparation())
	}
	traits := ReportTraits(t, keys)
	s := &Summary{Method: method, Alpha: alpha}
	s.Traits = make([]SummaryTrait, len(traits))
	for j, tr := range traits {
		st := SummaryTrait{Key: tr.Key, Name: tr.Name, Unit: tr.Unit, Decimals: tr.Decimals,
			MeanDecimals: analysis.MeanDecimals(tr.Decimals)}
		if st.Name == "" {
			st.Name = tr.Key
		}
		r, ok := LookupOutcome(results, tr.Key)
		switch {
		case !ok:
			st.Reason = "this trait was not analysed"
		case Reason(r) != "":
			st.Reason = Reason(r)
		default:
			st.Result = r.Result
			if a := r.Result.ANOVA; a != nil {
				st.GrandMean = a.GrandMean
				st.CVPercent = a.CVPercent
			}
			st.MSD = MSD(r.Result, method)
			st.MSDRange = MSDRange(r.Result, method)
			st.CheckMean = r.Result.CheckMean
			if vc := r.Result.VsCheck; vc != nil && len(vc.Rows) > 0 {
				st.VsCheck = vc
			}
			if src, ok := r.Result.ANOVA.Treatment(); ok && src.HasTest {
				st.P, st.HasP = src.P, true
			}
		}
		s.Traits[j] = st
	}

	s.Rows = make([]SummaryRow, len(t.Treatments))
	for i, tm := range t.Treatments {
		row := SummaryRow{Treatment: tm.Code, Name: tm.Name, Check: tm.Role == trial.RoleCheck}
		row.Cells = make([]SummaryCell, len(s.Traits))
		for j, st := range s.Traits {
			if st.Result == nil {
				continue
			}
			for _, m := range st.Result.Means {
				if m.Treatment == tm.Code {
					if finite(m.BackMean) {
						row.Cells[j] = SummaryCell{OK: true, Mean: m.BackMean, Letters: Letters(m, method), PercentOfCheck: m.PercentOfCheck,
							VsCheck: vsReading(st.VsCheck, tm.Code)}
					}
					break
				}
			}
		}
		s.Rows[i] = row
	}

	return s
}

// vsReading is the summary reading of entry code against the check.
func vsReading(vc *analysis.CheckComparison, code string) string {
	if vc == nil {
		return ""
	}
	if code == vc.Check {
		return VsIsCheck
	}
	for _, r := range vc.Rows {
		if r.Treatment == code {
			switch r.Verdict {
			case "better":
				return VsBetter
			case "worse":
				return VsWorse
			}
			return VsNotDifferent
		}
	}
	return ""
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// ExclusionReason returns why plot p is left out of the analysis of the
// trait with key, "" when it is not. Reasons of several exclusions are
// joined with "; ".
func ExclusionReason(p trial.Plot, key string) string {
	var reasons []string
	for _, e := range p.Exclusions {
		if e.Trait == "" || e.Trait == key {
			r := strings.TrimSpace(e.Reason)
			if r == "" {
				r = "excluded"
			}
			reasons = append(reasons, r)
		}
	}
	return strings.Join(reasons, "; ")
}

// PlotExclusions returns every exclusion reason of plot p, for all traits,
// "" when the plot has none.
func PlotExclusions(p trial.Plot) string {
	var reasons []string
	for _, e := range p.Exclusions {
		r := strings.TrimSpace(e.Reason)
		if r == "" {
			r = "excluded"
		}
		if e.Trait != "" {
			r = e.Trait + ": " + r
		}
		reasons = append(reasons, r)
	}
	return strings.Join(reasons, "; ")
}

// SourceName is the label of an ANOVA line for people, from its role:
// "Treatments", "Blocks", "Rows", "Columns", "Error", "Total"; lines of
// other roles (factors, interactions, strata) show their own name with a
// capital.
func SourceName(s stats.Source) string {
	switch s.Role {
	case stats.RoleTreatment:
		return "Treatments"
	case stats.RoleBlock:
		return "Blocks"
	case stats.RoleRow:
		return "Rows"
	case stats.RoleColumn:
		return "Columns"
	case stats.RoleError:
		return "Error"
	case stats.RoleTotal:
		return "Total"
	}
	n := s.Name
	if n == "" {
		return "—"
	}
	return strings.ToUpper(n[:1]) + n[1:]
}

// AdjustmentText says in words how the p-values of a set of contrasts were
// adjusted: "p not adjusted", "p adjusted by Holm", ...
func AdjustmentText(adj stats.Adjustment) string {
	switch adj {
	case stats.Bonferroni:
		return "p adjusted by Bonferroni"
	case stats.Holm:
		return "p adjusted by Holm"
	case stats.Scheffe:
		return "p adjusted by Scheffé (protects contrasts chosen after looking at the data)"
	}
	return "p not adjusted"
}
