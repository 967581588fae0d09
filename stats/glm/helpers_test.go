package glm

import (
	"encoding/csv"
	"math"
	"sort"
	"strconv"
	"testing"

	"furlong/stats/refdata"
)

// loadCSV reads a reference table from stats/refdata: the named factor columns
// (levels sorted as R sorts them), an optional block column and the
// response (empty cells are missing plots).
func loadCSV(t *testing.T, name string, factors []string, block, response string) Model {
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
	col := map[string]int{}
	for i, h := range rows[0] {
		col[h] = i
	}
	mk := func(name string) Factor {
		c, ok := col[name]
		if !ok {
			t.Fatalf("no column %s", name)
		}
		set := map[string]bool{}
		for _, r := range rows[1:] {
			set[r[c]] = true
		}
		var lv []string
		for l := range set {
			lv = append(lv, l)
		}
		sort.Strings(lv)
		pos := map[string]int{}
		for i, l := range lv {
			pos[l] = i
		}
		fa := Factor{Name: name, Levels: lv}
		for _, r := range rows[1:] {
			fa.Index = append(fa.Index, pos[r[c]])
		}
		return fa
	}
	var m Model
	for _, fn := range factors {
		m.Factors = append(m.Factors, mk(fn))
	}
	if block != "" {
		b := mk(block)
		m.Block = &b
	}
	rc := col[response]
	for _, r := range rows[1:] {
		if r[rc] == "" || r[rc] == "NA" {
			m.Response = append(m.Response, math.NaN())
			continue
		}
		v, err := strconv.ParseFloat(r[rc], 64)
		if err != nil {
			t.Fatal(err)
		}
		m.Response = append(m.Response, v)
	}
	return m
}

type refLine struct {
	Source string   `json:"source"`
	DF     float64  `json:"df"`
	DFDen  float64  `json:"df_den"`
	SS     *float64 `json:"ss"`
	F      *float64 `json:"f"`
	P      *float64 `json:"p"`
}

type refMean struct {
	Levels map[string]string `json:"levels"`
	Mean   float64           `json:"mean"`
	SE     float64           `json:"se"`
}

type reference struct {
	Anova   []refLine            `json:"anova"`
	SED     map[string]float64   `json:"sed"`
	VC      map[string]float64   `json:"variance_components"`
	Effects map[string][]refMean `json:"effects"`
}

func loadRef(t *testing.T, name string) reference {
	t.Helper()
	var r reference
	refdata.JSON(t, name, &r)
	return r
}

func near(got, want, rel float64) bool {
	return math.Abs(got-want) <= rel*math.Max(1, math.Abs(want))
}

// findMean returns the mean of effect e at the named levels.
func findMean(m Model, e *Effect, levels map[string]string) (Mean, bool) {
	for _, mn := range e.Means {
		ok := true
		for a, f := range e.Factors {
			if m.Factors[f].Levels[mn.Levels[a]] != levels[m.Factors[f].Name] {
				ok = false
			}
		}
		if ok {
			return mn, true
		}
	}
	return Mean{}, false
}

// checkAgainst compares the ANOVA lines and the means of every effect
// with a reference file.
func checkAgainst(t *testing.T, m Model, r *Result, ref reference, rel, meanRel float64) {
	t.Helper()
	for _, rl := range ref.Anova {
		l, ok := r.Line(rl.Source)
		if !ok {
			t.Errorf("no line %s", rl.Source)
			continue
		}
		if float64(l.DF) != rl.DF {
			t.Errorf("%s df = %d, want %g", rl.Source, l.DF, rl.DF)
		}
		if rl.SS != nil && (!l.HasSS || !near(l.SS, *rl.SS, rel)) {
			t.Errorf("%s SS = %.10g, want %.10g", rl.Source, l.SS, *rl.SS)
		}
		if rl.F != nil {
			if !l.HasTest || !near(l.F, *rl.F, rel) || !near(l.P, *rl.P, rel) {
				t.Errorf("%s F = %.10g p = %.6g, want %.10g %.6g", rl.Source, l.F, l.P, *rl.F, *rl.P)
			}
		} else if l.HasTest && rl.Source != "block" {
			t.Errorf("%s has a test, reference has none", rl.Source)
		}
		if rl.DFDen != 0 && !near(l.DFDen, rl.DFDen, rel) {
			t.Errorf("%s df_den = %.10g, want %.10g", rl.Source, l.DFDen, rl.DFDen)
		}
	}
	for name, means := range ref.Effects {
		e, ok := r.Effect(name)
		if !ok {
			t.Errorf("no effect %s", name)
			continue
		}
		for _, rm := range means {
			mn, ok := findMean(m, e, rm.Levels)
			if !ok || !mn.Estimable {
				t.Errorf("%s %v: no mean", name, rm.Levels)
				continue
			}
			if !near(mn.Mean, rm.Mean, meanRel) || !near(mn.SE, rm.SE, meanRel) {
				t.Errorf("%s %v: mean %.10g se %.10g, want %.10g %.10g", name, rm.Levels, mn.Mean, mn.SE, rm.Mean, rm.SE)
			}
		}
	}
}
