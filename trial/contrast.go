package trial

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Contrast is a planned comparison of treatment means saved with the trial
// ("all programmes vs untreated", "early vs late timing"). It is given
// either by two groups of treatments (the mean of First minus the mean of
// Second, each treatment of a group weighted equally) or by a coefficient
// for each treatment named (Terms, the others 0), the coefficients summing
// to zero. Exactly one of the two forms is set.
type Contrast struct {
	Name          string
	First, Second []string // treatment codes
	Terms         []ContrastTerm
}

// ContrastTerm is one treatment's coefficient in a contrast.
type ContrastTerm struct {
	Treatment string
	Weight    float64
}

// IsGroups reports whether the contrast is given by two groups.
func (c Contrast) IsGroups() bool { return len(c.Terms) == 0 }

// Weights returns the contrast's coefficient of every treatment of codes (in
// that order), checking it: a name, treatments the trial has, groups that
// are not empty and do not share a treatment, coefficients that add up to
// zero. The errors are plain sentences.
func (c Contrast) Weights(codes []string) ([]float64, error) {
	name := strings.TrimSpace(c.Name)
	if name == "" {
		return nil, fmt.Errorf("a contrast needs a name")
	}
	at := make(map[string]int, len(codes))
	for i, code := range codes {
		at[code] = i
	}
	w := make([]float64, len(codes))
	seen := map[string]string{}
	find := func(code, where string) (int, error) {
		i, ok := at[code]
		if !ok {
			return 0, fmt.Errorf("contrast %q: there is no treatment %q (the treatments are %s)", name, code, strings.Join(codes, ", "))
		}
		if prev, dup := seen[code]; dup {
			if prev != where {
				return 0, fmt.Errorf("contrast %q: treatment %s is on both sides", name, code)
			}
			return 0, fmt.Errorf("contrast %q: treatment %s is named twice", name, code)
		}
		seen[code] = where
		return i, nil
	}
	if c.IsGroups() {
		if len(c.First) == 0 || len(c.Second) == 0 {
			return nil, fmt.Errorf("contrast %q: both groups need at least one treatment (for example \"A,B vs C\")", name)
		}
		for _, g := range []struct {
			codes []string
			sign  float64
			where string
		}{{c.First, 1, "first"}, {c.Second, -1, "second"}} {
			for _, code := range g.codes {
				i, err := find(code, g.where)
				if err != nil {
					return nil, err
				}
				w[i] = g.sign / float64(len(g.codes))
			}
		}
		return w, nil
	}
	sum, abs := 0.0, 0.0
	for _, term := range c.Terms {
		i, err := find(term.Treatment, "terms")
		if err != nil {
			return nil, err
		}
		if math.IsNaN(term.Weight) || math.IsInf(term.Weight, 0) {
			return nil, fmt.Errorf("contrast %q: the coefficient of %s is not a number", name, term.Treatment)
		}
		w[i] = term.Weight
		sum += term.Weight
		abs += math.Abs(term.Weight)
	}
	if abs == 0 {
		return nil, fmt.Errorf("contrast %q: every coefficient is 0", name)
	}
	if math.Abs(sum) > 1e-9*abs {
		return nil, fmt.Errorf("contrast %q: the coefficients add up to %s; they must add up to 0 (for example A:1,B:1,C:-2)", name, strconv.FormatFloat(sum, 'g', 6, 64))
	}
	return w, nil
}

// ParseContrast reads a contrast as the command line and the window write
// it: "NAME=A,B vs C" (the mean of A and B against C) or "NAME=A:1,B:1,C:-2"
// (coefficients). Without "NAME=" the contrast is named by its definition.
// Treatment codes are not checked here (see Contrast.Weights).
func ParseContrast(s string) (Contrast, error) {
	s = strings.TrimSpace(s)
	name, def, ok := strings.Cut(s, "=")
	if !ok {
		name, def = s, s
	}
	name, def = strings.TrimSpace(name), strings.TrimSpace(def)
	if name == "" {
		return Contrast{}, fmt.Errorf("%q: the contrast needs a name before the = sign", s)
	}
	if def == "" {
		return Contrast{}, fmt.Errorf("contrast %q: nothing after the = sign; write groups (\"A,B vs C\") or coefficients (\"A:1,B:1,C:-2\")", name)
	}
	c := Contrast{Name: name}
	if lhs, rhs, ok := cutVs(def); ok {
		c.First, c.Second = splitCodes(lhs), splitCodes(rhs)
		if len(c.First) == 0 || len(c.Second) == 0 {
			return Contrast{}, fmt.Errorf("contrast %q: both groups need at least one treatment (for example \"A,B vs C\")", name)
		}
		return c, nil
	}
	for _, part := range splitCodes(def) {
		code, wt, ok := strings.Cut(part, ":")
		code = strings.TrimSpace(code)
		if !ok || code == "" {
			return Contrast{}, fmt.Errorf("contrast %q: %q is neither two groups (\"A,B vs C\") nor coefficients (\"A:1,B:1,C:-2\")", name, def)
		}
		v, err := ParseNumber(strings.TrimSpace(wt), PointOnly)
		if err != nil {
			return Contrast{}, fmt.Errorf("contrast %q: the coefficient of %s, %q, is not a number", name, code, strings.TrimSpace(wt))
		}
		c.Terms = append(c.Terms, ContrastTerm{Treatment: code, Weight: v})
	}
	if len(c.Terms) == 0 {
		return Contrast{}, fmt.Errorf("contrast %q: no treatments given", name)
	}
	return c, nil
}

// cutVs splits a definition at the word "vs" (or "vs.", any case).
func cutVs(s string) (string, string, bool) {
	f := strings.Fields(s)
	for i, w := range f {
		if lw := strings.ToLower(w); lw == "vs" || lw == "vs." {
			return strings.Join(f[:i], " "), strings.Join(f[i+1:], " "), true
		}
	}
	return "", "", false
}

func splitCodes(s string) []string {
	var out []string
	for _, p := range strings.Split(s, ",") {
		if p = strings.TrimSpace(p); p != "" {
			out = append(out, p)
		}
	}
	return out
}

// Definition returns the contrast's definition in the form ParseContrast
// reads (without the name).
func (c Contrast) Definition() string {
	if c.IsGroups() {
		return strings.Join(c.First, ",") + " vs " + strings.Join(c.Second, ",")
	}
	parts := make([]string, len(c.Terms))
	for i, t := range c.Terms {
		parts[i] = t.Treatment + ":" + strconv.FormatFloat(t.Weight, 'g', -1, 64)
	}
	return strings.Join(parts, ",")
}

// String returns "NAME=DEFINITION".
func (c Contrast) String() string { return c.Name + "=" + c.Definition() }

// SetContrast checks c against the trial's treatments and saves it,
// replacing a saved contrast of the same name or adding it at the end.
func (t *Trial) SetContrast(c Contrast) error {
	c.Name = strings.TrimSpace(c.Name)
	if _, err := c.Weights(t.TreatmentCodes()); err != nil {
		return err
	}
	for i := range t.Analysis.Contrasts {
		if t.Analysis.Contrasts[i].Name == c.Name {
			t.Analysis.Contrasts[i] = c
			return nil
		}
	}
	t.Analysis.Contrasts = append(t.Analysis.Contrasts, c)
	return nil
}

// RemoveContrast removes the saved contrast of that name.
func (t *Trial) RemoveContrast(name string) error {
	for i, c := range t.Analysis.Contrasts {
		if c.Name == name {
			t.Analysis.Contrasts = append(t.Analysis.Contrasts[:i:i], t.Analysis.Contrasts[i+1:]...)
			return nil
		}
	}
	var names []string
	for _, c := range t.Analysis.Contrasts {
		names = append(names, c.Name)
	}
	if len(names) == 0 {
		return fmt.Errorf("the trial has no saved contrasts")
	}
	return fmt.Errorf("the trial has no contrast %q (it has %s)", name, strings.Join(names, ", "))
}

// TreatmentCodes returns the treatments' codes in the trial's order.
func (t *Trial) TreatmentCodes() []string {
	out := make([]string, len(t.Treatments))
	for i, tr := range t.Treatments {
		out[i] = tr.Code
	}
	return out
}
