package trial

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// Limits of a factorial treatment structure, checked by Validate.
const (
	MaxFactors      = 3   // most crossed treatment factors
	MinLevels       = 2   // fewest levels of a factor
	MaxLevels       = 50  // most levels of a factor
	MaxLevelCodeLen = 8   // longest level code, in characters
	MaxFactorKeyLen = 16  // longest factor key, in characters
	MaxCombinations = 999 // most treatment combinations
)

// LevelSep joins the level codes of a combination into its treatment code:
// levels N60 and V2 give treatment N60-V2. Level codes cannot contain it.
const LevelSep = "-"

// Factor is one treatment factor of a factorial trial: nitrogen rate,
// variety, tillage. A trial with Factors has as its treatments the
// combinations of their levels.
type Factor struct {
	// Key is short and unique, used as a column header and in term names
	// ("N", "variety"): letters, digits and _ only.
	Key    string
	Name   string // for example "Nitrogen rate"; "" shows the key
	Levels []Level
}

// Level is one level of a factor.
type Level struct {
	Code  string   // short and unique within the factor, for example "N60" or "V1"
	Name  string   // for example "60 kg N/ha" or "Hybrid A"; "" shows the code
	Value *float64 // optional numeric value of the level, for example 60
	Unit  string   // unit of Value, for example "kg N/ha"
}

// Label is the factor's name for display: Name, or Key when it has none.
func (f *Factor) Label() string {
	if f.Name != "" {
		return f.Name
	}
	return f.Key
}

// Label is the level's name for display: Name, or Code when it has none.
func (l *Level) Label() string {
	if l.Name != "" {
		return l.Name
	}
	return l.Code
}

// LevelIndex returns the index of the level with code, or −1.
func (f *Factor) LevelIndex(code string) int {
	for i := range f.Levels {
		if f.Levels[i].Code == code {
			return i
		}
	}
	return -1
}

// CombinationCode is the treatment code of a combination of level codes:
// the codes joined by LevelSep ("N60-V2").
func CombinationCode(levels []string) string { return strings.Join(levels, LevelSep) }

// Combinations returns the treatments of a factorial trial: every
// combination of the factors' levels, in standard order (the first
// factor's level changing slowest: N0-V1, N0-V2, N60-V1, ...). Each
// treatment's Levels holds its level code of every factor, its Code is
// CombinationCode of them and its Name joins the level labels with " × ".
// Every treatment is an entry. Factors without levels give no treatments.
func Combinations(factors []Factor) []Treatment {
	if len(factors) == 0 {
		return nil
	}
	n := 1
	for _, f := range factors {
		n *= len(f.Levels)
	}
	out := make([]Treatment, 0, n)
	idx := make([]int, len(factors))
	for range n {
		codes := make([]string, len(factors))
		names := make([]string, len(factors))
		for k, f := range factors {
			codes[k] = f.Levels[idx[k]].Code
			names[k] = f.Levels[idx[k]].Label()
		}
		out = append(out, Treatment{Code: CombinationCode(codes), Name: strings.Join(names, " × "), Role: RoleEntry, Levels: codes})
		for k := len(factors) - 1; k >= 0; k-- {
			idx[k]++
			if idx[k] < len(factors[k].Levels) {
				break
			}
			idx[k] = 0
		}
	}
	return out
}

// Factorial reports whether the trial's treatments are combinations of
// factors (false: one list of treatments).
func (t *Trial) Factorial() bool { return len(t.Factors) > 0 }

// FactorIndex returns the index in t.Factors of the factor with key, or −1.
func (t *Trial) FactorIndex(key string) int { return factorIndex(t.Factors, key) }

func factorIndex(fs []Factor, key string) int {
	for i := range fs {
		if fs[i].Key == key {
			return i
		}
	}
	return -1
}

// PlotLevels returns, for factor f (an index into t.Factors), the level
// index of every plot in walking order, or nil when f is out of range. A
// plot whose treatment is unknown or has no level of f gets −1.
func (t *Trial) PlotLevels(f int) []int {
	if f < 0 || f >= len(t.Factors) {
		return nil
	}
	byCode := make(map[string]int, len(t.Treatments))
	for _, tr := range t.Treatments {
		li := -1
		if f < len(tr.Levels) {
			li = t.Factors[f].LevelIndex(tr.Levels[f])
		}
		byCode[tr.Code] = li
	}
	out := make([]int, len(t.Plots))
	for i, p := range t.Plots {
		li, ok := byCode[p.Treatment]
		if !ok {
			li = -1
		}
		out[i] = li
	}
	return out
}

// LevelCode returns the level code of factor f (an index into t.Factors)
// of the treatment with code, or "" when there is none.
func (t *Trial) LevelCode(code string, f int) string {
	tr := t.Treatment(code)
	if tr == nil || f < 0 || f >= len(tr.Levels) {
		return ""
	}
	return tr.Levels[f]
}

// TreatmentFor returns the treatment whose level codes are levels (one
// per factor, in factor order), or nil.
func (t *Trial) TreatmentFor(levels []string) *Treatment {
	for i := range t.Treatments {
		if equalStrings(t.Treatments[i].Levels, levels) {
			return &t.Treatments[i]
		}
	}
	return nil
}

func equalStrings(a, b []string) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}

// CheckFactorKey returns nil if key can be a factor key (1 to
// MaxFactorKeyLen characters, ASCII letters, digits and _, starting with
// a letter), or a *ValidationError. It does not check uniqueness.
func CheckFactorKey(key string) error {
	if msg := factorKeyProblem(key); msg != "" {
		return &ValidationError{Field: "Key", Msg: msg}
	}
	return nil
}

func factorKeyProblem(key string) string {
	if key == "" {
		return "a factor needs a short key, for example N or variety"
	}
	if len(key) > MaxFactorKeyLen {
		return fmt.Sprintf("factor key %q is %d characters long; use at most %d", key, len(key), MaxFactorKeyLen)
	}
	for i, r := range key {
		letter := r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z'
		if i == 0 && !letter {
			return fmt.Sprintf("factor key %q must start with a letter", key)
		}
		if !(letter || r >= '0' && r <= '9' || r == '_') {
			return fmt.Sprintf("factor key %q can hold only letters, digits and _ (no spaces, dashes or accents), so that it is safe as a column header", key)
		}
	}
	return ""
}

// reservedKeys are column names of the field book and the analysis that a
// factor key cannot take.
var reservedKeys = map[string]bool{
	"plot": true, "block": true, "row": true, "column": true, "treatment": true,
	"treatment_name": true, "main_plot": true, "sub_plot": true, "strip": true,
	"note": true, "excluded": true, "error": true, "total": true, "residual": true,
}

// CheckLevelCode returns nil if code can be a level code (1 to
// MaxLevelCodeLen characters, no spaces, commas, quotation marks, control
// characters or LevelSep), or a *ValidationError. It does not check
// uniqueness.
func CheckLevelCode(code string) error {
	if msg := levelCodeProblem(code); msg != "" {
		return &ValidationError{Field: "Code", Msg: msg}
	}
	return nil
}

func levelCodeProblem(code string) string {
	if code == "" {
		return "a level needs a code, for example N60 or V1"
	}
	if !utf8.ValidString(code) {
		return fmt.Sprintf("level code %q is not valid text", code)
	}
	if n := utf8.RuneCountInString(code); n > MaxLevelCodeLen {
		return fmt.Sprintf("level code %q is %d characters long; use at most %d", code, n, MaxLevelCodeLen)
	}
	for _, r := range code {
		switch {
		case unicode.IsSpace(r) || r == ',':
			return fmt.Sprintf("level code %q contains a space or a comma; codes cannot contain either", code)
		case string(r) == LevelSep:
			return fmt.Sprintf("level code %q contains %q, which joins the level codes of a combination (N60%sV1); leave it out", code, LevelSep, LevelSep)
		case r == '"':
			return fmt.Sprintf("level code %q contains a quotation mark, which would break exported tables", code)
		case unicode.IsControl(r):
			return fmt.Sprintf("level code %q contains an invisible control character", code)
		}
	}
	return ""
}

// ValidateFactors checks a factorial treatment structure on its own, as a
// form needs while it is edited: 1 to MaxFactors factors with valid,
// distinct keys, each with MinLevels to MaxLevels levels of valid,
// distinct codes and finite values, and at most MaxCombinations
// combinations. It returns nil or a ValidationErrors.
func ValidateFactors(factors []Factor) error {
	var p problems
	p.checkFactors(factors)
	return p.err()
}

func (p *problems) checkFactors(fs []Factor) {
	if len(fs) == 0 {
		return
	}
	if len(fs) > MaxFactors {
		p.add("Factors", "a trial can cross at most %d factors; it has %d. Combine or drop a factor", MaxFactors, len(fs))
	}
	keys := map[string]int{}
	combos := 1
	for i, f := range fs {
		field := "Factors[" + strconv.Itoa(i) + "]"
		if msg := factorKeyProblem(f.Key); msg != "" {
			if f.Key == "" {
				msg = fmt.Sprintf("factor %d has no key; give it a short key, for example N or variety", i+1)
			}
			p.add(field+".Key", "%s", msg)
		} else if reservedKeys[strings.ToLower(f.Key)] {
			p.add(field+".Key", "factor key %q is already a column of the field book; choose another key", f.Key)
		} else if j, dup := keys[strings.ToLower(f.Key)]; dup {
			p.add(field+".Key", "factor key %q is used twice (factors %d and %d); each factor needs its own key", f.Key, j+1, i+1)
		} else {
			keys[strings.ToLower(f.Key)] = i
		}
		switch n := len(f.Levels); {
		case n < MinLevels:
			p.add(field+".Levels", "factor %s has %d level(s); a factor needs at least %d levels to compare", f.Key, n, MinLevels)
		case n > MaxLevels:
			p.add(field+".Levels", "factor %s has %d levels; use at most %d", f.Key, n, MaxLevels)
		}
		combos *= max(len(f.Levels), 1)
		codes := map[string]int{}
		for k, l := range f.Levels {
			lf := fmt.Sprintf("%s.Levels[%d]", field, k)
			if msg := levelCodeProblem(l.Code); msg != "" {
				if l.Code == "" {
					msg = fmt.Sprintf("level %d of factor %s has no code; give it a short code, for example N60 or V1", k+1, f.Key)
				}
				p.add(lf+".Code", "%s", msg)
			} else if j, dup := codes[strings.ToLower(l.Code)]; dup {
				p.add(lf+".Code", "factor %s has level code %q twice (levels %d and %d); each level needs its own code", f.Key, l.Code, j+1, k+1)
			} else {
				codes[strings.ToLower(l.Code)] = k
			}
			if l.Value != nil && (math.IsNaN(*l.Value) || math.IsInf(*l.Value, 0)) {
				p.add(lf+".Value", "level %q of factor %s has no usable value; enter a number or leave it empty", l.Code, f.Key)
			}
		}
	}
	if len(fs) <= MaxFactors && combos > MaxCombinations {
		p.add("Factors", "the factors give %d combinations; use at most %d (fewer levels or fewer factors)", combos, MaxCombinations)
	}
}

// checkCombinations checks that the treatments are exactly the
// combinations of the factors, each once, with the right codes.
func (p *problems) checkCombinations(fs []Factor, ts []Treatment) {
	if len(fs) == 0 {
		for i, tr := range ts {
			if len(tr.Levels) > 0 {
				p.add("Treatments["+strconv.Itoa(i)+"].Levels", "treatment %q has factor levels, but the trial has no factors", tr.Code)
				return
			}
		}
		return
	}
	want := Combinations(fs)
	seen := make(map[string]bool, len(ts))
	for i, tr := range ts {
		f := "Treatments[" + strconv.Itoa(i) + "]"
		if len(tr.Levels) != len(fs) {
			p.add(f+".Levels", "treatment %q has %d factor levels; the trial has %d factors, so it needs one level of each", tr.Code, len(tr.Levels), len(fs))
			return
		}
		for k, code := range tr.Levels {
			if fs[k].LevelIndex(code) < 0 {
				p.add(f+".Levels", "treatment %q has level %q of factor %s, which the factor does not have", tr.Code, code, fs[k].Key)
				return
			}
		}
		if c := CombinationCode(tr.Levels); tr.Code != c {
			p.add(f+".Code", "treatment %q is the combination %s, so its code must be %q", tr.Code, c, c)
			return
		}
		if seen[tr.Code] {
			return // reported as a duplicate code
		}
		seen[tr.Code] = true
	}
	for _, w := range want {
		if !seen[w.Code] {
			p.add("Treatments", "the combination %s of the factors has no treatment; a factorial trial holds every combination", w.Code)
			return
		}
	}
}

// FactorOrder returns the indices into factors in the order the design
// lays them out: for a split plot the main-plot factor, the subplot factor
// and (split-split plot) the sub-subplot factor; for a strip plot the
// factor in horizontal strips, then the one in vertical strips; for the
// other designs the factors in their own order. Unknown keys fall back to
// the factors' order, so the result is always a permutation of
// 0..len(factors)−1.
func (d Design) FactorOrder(factors []Factor) []int {
	out := make([]int, 0, len(factors))
	used := make([]bool, len(factors))
	take := func(i int) {
		if i >= 0 && !used[i] {
			used[i] = true
			out = append(out, i)
		}
	}
	if d.Kind == SplitPlot || d.Kind == StripPlot {
		take(factorIndex(factors, d.MainFactor))
		if d.Kind == SplitPlot && len(out) == 1 {
			take(factorIndex(factors, d.SubFactor))
		}
	}
	for i := range factors {
		take(i)
	}
	return out
}

// SplitSplit reports whether the design is a split-split plot: a split
// plot of three factors.
func (t *Trial) SplitSplit() bool { return t.Design.Kind == SplitPlot && len(t.Factors) == 3 }

func cloneFactors(fs []Factor) []Factor {
	if fs == nil {
		return nil
	}
	out := make([]Factor, len(fs))
	for i, f := range fs {
		if f.Levels != nil {
			ls := make([]Level, len(f.Levels))
			for k, l := range f.Levels {
				l.Value = clonePtr(l.Value)
				ls[k] = l
			}
			f.Levels = ls
		}
		out[i] = f
	}
	return out
}

// Equal reports whether two treatments are the same in every field (rates
// compared by value, level codes one by one).
func (tr Treatment) Equal(o Treatment) bool {
	sameRate := tr.Rate == nil && o.Rate == nil || tr.Rate != nil && o.Rate != nil && *tr.Rate == *o.Rate
	return tr.Code == o.Code && tr.Name == o.Name && tr.Role == o.Role && tr.Description == o.Description &&
		sameRate && tr.RateUnit == o.RateUnit && equalStrings(tr.Levels, o.Levels)
}
