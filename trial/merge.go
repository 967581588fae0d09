package trial

import (
	"errors"
	"fmt"
	"math"
	"reflect"
	"strings"
	"time"
)

// ErrNotMergeable is wrapped by the error of MergeValues when the two
// versions differ in a way that cannot be merged plot by plot.
var ErrNotMergeable = errors.New("the two versions of the trial cannot be merged")

// ConflictKind says what a Conflict is about.
type ConflictKind string

const (
	ConflictValue     ConflictKind = "value"     // a recorded value of one plot and trait
	ConflictNote      ConflictKind = "note"      // the note of one plot
	ConflictExclusion ConflictKind = "exclusion" // whether (and why) a plot is left out of a trait
)

// Conflict is one place where both versions changed the same thing in
// different ways since the common base. The merged trial holds Mine there
// until ApplyResolution says otherwise.
type Conflict struct {
	Kind ConflictKind
	// Plot is the plot's number (as on the stake).
	Plot int
	// Trait is the trait's key: of the value (ConflictValue) or of the
	// exclusion ("" for an exclusion from every trait); empty for a note.
	Trait string
	// Base, Mine and Theirs are the values (ConflictValue); Missing (NaN)
	// means no value.
	Base, Mine, Theirs float64
	// BaseText, MineText and TheirsText are the note, or the reason of the
	// exclusion (ConflictNote, ConflictExclusion); nil means no note, or
	// not excluded.
	BaseText, MineText, TheirsText *string
}

// String describes the conflict in plain words, "yours" being Mine and
// "on disk" Theirs.
func (c Conflict) String() string {
	num := func(v float64) string {
		if IsMissing(v) {
			return "no value"
		}
		return fmt.Sprint(v)
	}
	text := func(s *string, absent string) string {
		if s == nil {
			return absent
		}
		return fmt.Sprintf("%q", *s)
	}
	switch c.Kind {
	case ConflictNote:
		return fmt.Sprintf("plot %d, note: yours %s, on disk %s (was %s)", c.Plot, text(c.MineText, "none"), text(c.TheirsText, "none"), text(c.BaseText, "none"))
	case ConflictExclusion:
		what := "every trait"
		if c.Trait != "" {
			what = c.Trait
		}
		return fmt.Sprintf("plot %d, left out of %s: yours %s, on disk %s (was %s)", c.Plot, what, text(c.MineText, "included"), text(c.TheirsText, "included"), text(c.BaseText, "included"))
	}
	return fmt.Sprintf("plot %d, %s: yours %s, on disk %s (was %s)", c.Plot, c.Trait, num(c.Mine), num(c.Theirs), num(c.Base))
}

// MergeValues merges two versions of a trial that were both changed from
// base: mine (for example the window's copy) and theirs (the file as it is
// on disk now). Recorded values merge per plot and trait, notes per plot
// and exclusions per plot and trait: a change on one side only is taken,
// the same change on both sides is taken once, and different changes on
// both sides are a Conflict (the merged trial holds mine's version there;
// see ApplyResolution). Clearing a value is a change like any other.
//
// Everything else (title, site, treatments, design, layout, trait
// settings) merges field by field: a field changed on one side only is
// taken from that side. A trait added on one side only is kept; a trait
// removed on one side is removed when the other side did not change it.
// Differences that cannot be merged give an error wrapping
// ErrNotMergeable with a plain message: the plots differ between mine and
// theirs (numbers, order, positions or treatments, as after randomising
// again), both changed the same setting differently, or one side removed
// a trait the other changed. The inputs are not modified.
func MergeValues(base, mine, theirs *Trial) (*Trial, []Conflict, error) {
	if base == nil || mine == nil || theirs == nil {
		return nil, nil, fmt.Errorf("%w: a version is missing", ErrNotMergeable)
	}
	if len(mine.Plots) != len(theirs.Plots) {
		return nil, nil, notMergeable("the two versions have different plots (%d and %d)", len(mine.Plots), len(theirs.Plots))
	}
	for i := range mine.Plots {
		if !samePlotPlace(mine.Plots[i], theirs.Plots[i]) {
			return nil, nil, notMergeable("the plots differ between the two versions (plot %d: number, position or treatment, as after randomising again)", mine.Plots[i].Number)
		}
	}
	out := mine.Clone()
	if err := mergeFields(reflect.ValueOf(out).Elem(), reflect.ValueOf(base).Elem(), reflect.ValueOf(mine).Elem(), reflect.ValueOf(theirs).Elem(),
		map[string]bool{"Plots": true, "Traits": true, "Modified": true}, trialFieldWords, "the trial's "); err != nil {
		return nil, nil, err
	}
	if theirs.Modified.After(mine.Modified) {
		out.Modified = theirs.Modified
	}
	m := &merger{base: base, mine: mine, theirs: theirs, out: out, baseIdx: make(map[int]int, len(base.Plots))}
	for i, p := range base.Plots {
		m.baseIdx[p.Number] = i
	}
	if err := m.traits(); err != nil {
		return nil, nil, err
	}
	m.plots()
	for _, p := range out.Plots {
		if out.TreatmentIndex(p.Treatment) < 0 {
			return nil, nil, notMergeable("plot %d is of treatment %q, which the merged trial no longer has", p.Number, p.Treatment)
		}
	}
	// Fields taken from theirs share memory with it: copy once more.
	return out.Clone(), m.conflicts, nil
}

func notMergeable(format string, args ...any) error {
	return fmt.Errorf("%w: %s; reload the file, or save your version under another name", ErrNotMergeable, fmt.Sprintf(format, args...))
}

// samePlotPlace compares two plots but for their note and exclusions.
func samePlotPlace(a, b Plot) bool {
	a.Note, b.Note = "", ""
	a.Exclusions, b.Exclusions = nil, nil
	return same(reflect.ValueOf(a), reflect.ValueOf(b))
}

var trialFieldWords = map[string]string{
	"Site": "site details", "Created": "creation date", "Random": "randomisation",
}

var traitFieldWords = map[string]string{
	"Min": "valid minimum", "Max": "valid maximum", "Assessed": "assessment date",
	"HigherBetter": "direction (higher is better)", "Derived": "formula",
}

// mergeFields merges the exported fields of the structs b (base), m and t
// into out, field by field, skipping the names in skip.
func mergeFields(out, b, m, t reflect.Value, skip map[string]bool, words map[string]string, prefix string) error {
	typ := out.Type()
	for i := range typ.NumField() {
		f := typ.Field(i)
		if !f.IsExported() || skip[f.Name] {
			continue
		}
		bv, mv, tv := b.Field(i), m.Field(i), t.Field(i)
		switch {
		case same(mv, tv), same(tv, bv):
			// mine's value stays in out
		case same(mv, bv):
			out.Field(i).Set(tv)
		default:
			w := words[f.Name]
			if w == "" {
				w = strings.ToLower(f.Name)
			}
			return notMergeable("both versions changed the %s%s in different ways", prefix, w)
		}
	}
	return nil
}

var timeType = reflect.TypeFor[time.Time]()

// same compares two values deeply: times as instants, floats with NaN
// equal to NaN, nil and empty slices alike.
func same(a, b reflect.Value) bool {
	if a.Type() == timeType {
		return a.Interface().(time.Time).Equal(b.Interface().(time.Time))
	}
	switch a.Kind() {
	case reflect.Float32, reflect.Float64:
		x, y := a.Float(), b.Float()
		return x == y || math.IsNaN(x) && math.IsNaN(y)
	case reflect.Pointer, reflect.Interface:
		if a.IsNil() || b.IsNil() {
			return a.IsNil() == b.IsNil()
		}
		return same(a.Elem(), b.Elem())
	case reflect.Slice, reflect.Array:
		if a.Len() != b.Len() {
			return false
		}
		for i := range a.Len() {
			if !same(a.Index(i), b.Index(i)) {
				return false
			}
		}
		return true
	case reflect.Struct:
		for i := range a.NumField() {
			if a.Type().Field(i).IsExported() && !same(a.Field(i), b.Field(i)) {
				return false
			}
		}
		return true
	case reflect.Map:
		return reflect.DeepEqual(a.Interface(), b.Interface())
	}
	return a.Equal(b)
}

func sameValue(x, y float64) bool { return x == y || IsMissing(x) && IsMissing(y) }

type merger struct {
	base, mine, theirs, out *Trial
	baseIdx                 map[int]int // plot number → index in base
	conflicts               []Conflict
}

// baseValues returns base's values of trait key aligned with mine's plots
// (Missing where base lacks the trait or the plot).
func (m *merger) baseValues(key string) []float64 {
	vs := make([]float64, len(m.mine.Plots))
	bt := m.base.Trait(key)
	for i, p := range m.mine.Plots {
		vs[i] = Missing
		if bt == nil || bt.Derived != nil {
			continue
		}
		if j, ok := m.baseIdx[p.Number]; ok && j < len(bt.Values) {
			vs[i] = bt.Values[j]
		}
	}
	return vs
}

// changed reports whether trait tr differs from base's trait of its key
// (settings or values); a trait base lacks counts as changed.
func (m *merger) changed(tr *Trait) bool {
	bt := m.base.Trait(tr.Key)
	if bt == nil {
		return true
	}
	a, b := *tr, *bt
	a.Values, b.Values = nil, nil
	if !same(reflect.ValueOf(a), reflect.ValueOf(b)) {
		return true
	}
	if tr.Derived != nil {
		return false
	}
	bv := m.baseValues(tr.Key)
	for i, v := range tr.Values {
		if i < len(bv) && !sameValue(v, bv[i]) {
			return true
		}
	}
	return false
}

func (m *merger) traits() error {
	var out []Trait
	for i := range m.mine.Traits {
		mt := &m.mine.Traits[i]
		tt := m.theirs.Trait(mt.Key)
		inBase := m.base.Trait(mt.Key) != nil
		switch {
		case tt == nil && !inBase:
			out = append(out, cloneTrait(*mt)) // added by mine
		case tt == nil:
			if m.changed(mt) {
				return notMergeable("trait %q was removed in the version on disk but changed in yours", mt.Key)
			}
			// removed on disk, unchanged here: removed
		default:
			tr, err := m.trait(mt, tt)
			if err != nil {
				return err
			}
			out = append(out, tr)
		}
	}
	for i := range m.theirs.Traits {
		tt := &m.theirs.Traits[i]
		if m.mine.Trait(tt.Key) != nil {
			continue
		}
		if m.base.Trait(tt.Key) == nil {
			out = append(out, cloneTrait(*tt)) // added on disk
		} else if m.changed(tt) {
			return notMergeable("trait %q was removed in your version but changed in the version on disk", tt.Key)
		}
	}
	m.out.Traits = out
	return nil
}

// trait merges a trait both sides have.
func (m *merger) trait(mt, tt *Trait) (Trait, error) {
	out := cloneTrait(*mt)
	bt := m.base.Trait(mt.Key)
	if bt == nil {
		// Added on both sides: the settings must agree.
		bt = &Trait{}
		a, b := *mt, *tt
		a.Values, b.Values = nil, nil
		if !same(reflect.ValueOf(a), reflect.ValueOf(b)) {
			return out, notMergeable("both versions added a trait %q, with different settings", mt.Key)
		}
	}
	if err := mergeFields(reflect.ValueOf(&out).Elem(), reflect.ValueOf(bt).Elem(), reflect.ValueOf(mt).Elem(), reflect.ValueOf(tt).Elem(),
		map[string]bool{"Values": true, "Key": true}, traitFieldWords, fmt.Sprintf("trait %q's ", mt.Key)); err != nil {
		return out, err
	}
	if (mt.Derived == nil) != (tt.Derived == nil) {
		return out, notMergeable("trait %q is computed in one version and recorded in the other", mt.Key)
	}
	if out.Derived != nil {
		out.Values = nil
		return out, nil
	}
	bv := m.baseValues(mt.Key)
	for i := range out.Values {
		b, x, y := bv[i], mt.Values[i], tt.Values[i]
		switch {
		case sameValue(x, y), sameValue(y, b):
			// mine's value stays
		case sameValue(x, b):
			out.Values[i] = y
		default:
			m.conflicts = append(m.conflicts, Conflict{Kind: ConflictValue, Plot: m.mine.Plots[i].Number, Trait: mt.Key, Base: b, Mine: x, Theirs: y})
		}
	}
	return out, nil
}

func strPtr(s string) *string { return &s }

func sameText(a, b *string) bool {
	if a == nil || b == nil {
		return a == nil && b == nil
	}
	return *a == *b
}

func noteOf(p *Plot) *string {
	if p == nil || p.Note == "" {
		return nil
	}
	return strPtr(p.Note)
}

// exclusionOf returns the reason plot p is left out of trait key (nil when
// it is not).
func exclusionOf(p *Plot, key string) *string {
	if p == nil {
		return nil
	}
	for _, e := range p.Exclusions {
		if e.Trait == key {
			return strPtr(e.Reason)
		}
	}
	return nil
}

// plots merges notes and exclusions per plot.
func (m *merger) plots() {
	for i := range m.out.Plots {
		mp, tp := &m.mine.Plots[i], &m.theirs.Plots[i]
		var bp *Plot
		if j, ok := m.baseIdx[mp.Number]; ok {
			bp = &m.base.Plots[j]
		}
		op := &m.out.Plots[i]
		// Note.
		if n, c := merge3(noteOf(bp), noteOf(mp), noteOf(tp)); c {
			m.conflicts = append(m.conflicts, Conflict{Kind: ConflictNote, Plot: mp.Number, BaseText: noteOf(bp), MineText: noteOf(mp), TheirsText: noteOf(tp)})
		} else if n == nil {
			op.Note = ""
		} else {
			op.Note = *n
		}
		// Exclusions, by trait key: mine's order, then new ones on disk.
		var keys []string
		seen := map[string]bool{}
		for _, list := range [][]Exclusion{mp.Exclusions, tp.Exclusions} {
			for _, e := range list {
				if !seen[e.Trait] {
					seen[e.Trait] = true
					keys = append(keys, e.Trait)
				}
			}
		}
		if bp != nil {
			for _, e := range bp.Exclusions {
				if !seen[e.Trait] {
					seen[e.Trait] = true
					keys = append(keys, e.Trait)
				}
			}
		}
		var ex []Exclusion
		for _, k := range keys {
			if k != "" && m.out.Trait(k) == nil {
				continue // the trait is gone
			}
			b, x, y := exclusionOf(bp, k), exclusionOf(mp, k), exclusionOf(tp, k)
			r, c := merge3(b, x, y)
			if c {
				m.conflicts = append(m.conflicts, Conflict{Kind: ConflictExclusion, Plot: mp.Number, Trait: k, BaseText: b, MineText: x, TheirsText: y})
			}
			if r != nil {
				ex = append(ex, Exclusion{Trait: k, Reason: *r})
			}
		}
		op.Exclusions = ex
	}
}

// merge3 merges one text three ways; on a conflict it returns mine's and true.
func merge3(b, x, y *string) (*string, bool) {
	switch {
	case sameText(x, y), sameText(y, b):
		return x, false
	case sameText(x, b):
		return y, false
	}
	return x, true
}

// ApplyResolution settles conflict c in merged, a trial from MergeValues:
// with takeMine it keeps (or puts back) mine's version, otherwise it takes
// theirs. It fails only when merged has no such plot or trait.
func ApplyResolution(merged *Trial, c Conflict, takeMine bool) error {
	i := merged.PlotIndexByNumber(c.Plot)
	if i < 0 {
		return fmt.Errorf("the merged trial has no plot %d", c.Plot)
	}
	p := &merged.Plots[i]
	switch c.Kind {
	case ConflictValue:
		j := merged.TraitIndex(c.Trait)
		if j < 0 || merged.Traits[j].Derived != nil || i >= len(merged.Traits[j].Values) {
			return fmt.Errorf("the merged trial has no recorded trait %q", c.Trait)
		}
		v := c.Theirs
		if takeMine {
			v = c.Mine
		}
		merged.Traits[j].Values[i] = v
	case ConflictNote:
		s := c.TheirsText
		if takeMine {
			s = c.MineText
		}
		p.Note = ""
		if s != nil {
			p.Note = *s
		}
	case ConflictExclusion:
		if c.Trait != "" && merged.TraitIndex(c.Trait) < 0 {
			return fmt.Errorf("the merged trial has no trait %q", c.Trait)
		}
		s := c.TheirsText
		if takeMine {
			s = c.MineText
		}
		k := -1
		for n, e := range p.Exclusions {
			if e.Trait == c.Trait {
				k = n
			}
		}
		switch {
		case s == nil && k >= 0:
			p.Exclusions = append(p.Exclusions[:k:k], p.Exclusions[k+1:]...)
		case s != nil && k >= 0:
			p.Exclusions[k].Reason = *s
		case s != nil:
			p.Exclusions = append(p.Exclusions, Exclusion{Trait: c.Trait, Reason: *s})
		}
	default:
		return fmt.Errorf("unknown kind of conflict %q", c.Kind)
	}
	return nil
}
