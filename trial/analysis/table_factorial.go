package analysis

import (
	"fmt"
	"strings"

	"furlong/trial"
)

// factorColumns finds the columns of the crossed treatment factors of a
// table, the main-plot factor first.
func factorColumns(c TableColumns, hline int, newLevel func(string) (*level, error)) ([]*level, error) {
	if c.Treatment != "" {
		return nil, &TableError{Line: hline, Msg: "give either a treatment column or the factor columns, not both (the factors' combinations are the treatments)"}
	}
	if len(c.Factors) > 3 {
		return nil, &TableError{Line: hline, Msg: fmt.Sprintf("give one, two or three factor columns (there are %d)", len(c.Factors))}
	}
	if c.MainPlot != "" && c.Strip {
		return nil, &TableError{Line: hline, Msg: "a table is either a split plot (a main-plot factor) or a strip plot, not both"}
	}
	var out []*level
	main := -1
	for i, name := range c.Factors {
		l, err := newLevel(name)
		if err != nil {
			return nil, err
		}
		for _, o := range out {
			if o.col == l.col {
				return nil, &TableError{Line: hline, Column: l.name, Msg: "this column is named twice as a factor; name each factor once"}
			}
		}
		if c.MainPlot != "" && strings.EqualFold(strings.TrimSpace(c.MainPlot), l.name) {
			main = i
		}
		out = append(out, l)
	}
	if c.MainPlot != "" && main < 0 {
		return nil, &TableError{Line: hline, Msg: fmt.Sprintf("the main-plot factor %q is not one of the factor columns (%s); name it with --factor too", c.MainPlot, strings.Join(c.Factors, ", "))}
	}
	if main > 0 {
		// The main-plot factor first, the others in their order after it.
		rest := append(append([]*level(nil), out[:main]...), out[main+1:]...)
		out = append([]*level{out[main]}, rest...)
	}
	return out, nil
}

// factorTable is the treatment structure read from a table's factor
// columns.
type factorTable struct {
	design     trial.DesignKind
	factors    []FactorData
	treatments []string // combination codes, first factor slowest
	treatment  []int    // per row
}

// combinations makes the treatments of a factorial table: the level
// combinations present, in standard order (first factor slowest).
func combinations(facs []*level, c TableColumns, blk *level) (*factorTable, error) {
	ft := &factorTable{design: trial.CRD}
	if blk != nil {
		ft.design = trial.RCBD
	}
	switch {
	case c.MainPlot != "":
		if blk == nil {
			return nil, &TableError{Msg: "a split plot needs its blocks: name the block column with --block"}
		}
		if len(facs) < 2 {
			return nil, &TableError{Msg: "a split plot needs a main-plot factor and a subplot factor: give two or three --factor columns"}
		}
		ft.design = trial.SplitPlot
	case c.Strip:
		if blk == nil {
			return nil, &TableError{Msg: "a strip plot needs its blocks: name the block column with --block"}
		}
		if len(facs) != 2 {
			return nil, &TableError{Msg: fmt.Sprintf("a strip plot needs exactly two factors, one in each direction (there are %d)", len(facs))}
		}
		ft.design = trial.StripPlot
	}
	for _, f := range facs {
		if len(f.names) < 2 {
			return nil, &TableError{Column: f.name, Msg: fmt.Sprintf("factor %s has only one level (%s), so there is nothing to compare; give it at least two levels", f.name, strings.Join(f.names, ""))}
		}
		for _, n := range f.names {
			if strings.Contains(n, ":") {
				// Effects join factor names with ":"; a level holding one
				// would read as two factors.
				return nil, &TableError{Column: f.name, Msg: fmt.Sprintf("level %q contains a colon, which joins factors in effect names; rename the level", n)}
			}
		}
		ft.factors = append(ft.factors, FactorData{Key: f.name, Levels: f.names, Index: f.index})
	}
	rows := len(facs[0].index)
	index := map[int]int{}
	var present []int
	key := func(i int) int {
		k := 0
		for _, f := range facs {
			k = k*len(f.names) + f.index[i]
		}
		return k
	}
	for i := range rows {
		k := key(i)
		if _, ok := index[k]; !ok {
			index[k] = 0
			present = append(present, k)
		}
	}
	// Standard order: by combination number.
	for a := 1; a < len(present); a++ {
		for b := a; b > 0 && present[b] < present[b-1]; b-- {
			present[b], present[b-1] = present[b-1], present[b]
		}
	}
	seen := map[string]bool{}
	for t, k := range present {
		index[k] = t
		levels := make([]string, len(facs))
		rem := k
		for f := len(facs) - 1; f >= 0; f-- {
			n := len(facs[f].names)
			levels[f] = facs[f].names[rem%n]
			rem /= n
		}
		code := trial.CombinationCode(levels)
		if seen[code] {
			return nil, &TableError{Msg: fmt.Sprintf("two level combinations both read %q; rename levels so that no level code contains %q", code, trial.LevelSep)}
		}
		seen[code] = true
		ft.treatments = append(ft.treatments, code)
	}
	ft.treatment = make([]int, rows)
	for i := range rows {
		ft.treatment[i] = index[key(i)]
	}
	return ft, nil
}
