package fieldbook

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"

	"furlong/trial"
)

// Severity grades an issue found while checking a field book.
type Severity int

const (
	// Info is a remark: nothing is wrong.
	Info Severity = iota
	// Warning is imported as it is, but deserves a look.
	Warning
	// Conflict is a cell that would replace a different stored value; it
	// blocks the import unless overwriting is allowed.
	Conflict
	// Error blocks the import.
	Error
)

// String returns the severity's name.
func (s Severity) String() string {
	switch s {
	case Info:
		return "note"
	case Warning:
		return "warning"
	case Conflict:
		return "conflict"
	case Error:
		return "error"
	}
	return "severity " + strconv.Itoa(int(s))
}

// Issue is one finding of Plan.
type Issue struct {
	Severity Severity
	// Line is the table row (the CSV line, counted from 1); 0 when the
	// issue is not about one row.
	Line int
	// Plot is the plot number; 0 when the issue is not about one plot.
	Plot int
	// Column is the header text of the cell's column, Trait the key of its
	// trait; empty when not about one cell.
	Column, Trait string
	// Text is the cell as written in the book.
	Text string
	// Old is the value stored in the trial, New the book's value; NaN
	// when missing or not applicable.
	Old, New float64
	// Message says what is the matter, in a sentence.
	Message string
}

// String renders the issue on one line: severity, line, plot, trait and
// the message (which gives old and new values where they matter).
func (i Issue) String() string {
	var b strings.Builder
	b.WriteString(i.Severity.String())
	b.WriteString(": ")
	var place []string
	if i.Line > 0 {
		place = append(place, "line "+strconv.Itoa(i.Line))
	}
	if i.Plot != 0 {
		place = append(place, "plot "+strconv.Itoa(i.Plot))
	}
	if i.Trait != "" {
		place = append(place, i.Trait)
	} else if i.Column != "" {
		place = append(place, "column "+strconv.Quote(i.Column))
	}
	if len(place) > 0 {
		b.WriteString(strings.Join(place, ", "))
		b.WriteString(": ")
	}
	b.WriteString(i.Message)
	return b.String()
}

// Change is one value an import sets.
type Change struct {
	Line       int     // table row, counted from 1
	Plot       int     // plot number
	PlotIndex  int     // index in Trial.Plots
	Trait      string  // trait key
	TraitIndex int     // index in Trial.Traits
	Old, New   float64 // Old is NaN when the value was missing
	// Overwrite is set when New replaces a different stored value.
	Overwrite bool
}

// ImportPlan is the checked outcome of importing a field book into a
// trial, made by Plan.
type ImportPlan struct {
	issues  []Issue
	changes []Change
	rows    int
	matched int
	same    int
	numbers []int             // plot numbers of the trial planned against
	mark    trial.DecimalMark // how the book's numbers are read
	keys    []string          // trait keys of the trial planned against
}

// Issues returns every finding in the order found.
func (p *ImportPlan) Issues() []Issue { return append([]Issue(nil), p.issues...) }

func (p *ImportPlan) bySeverity(s Severity) []Issue {
	var out []Issue
	for _, i := range p.issues {
		if i.Severity == s {
			out = append(out, i)
		}
	}
	return out
}

// Errors returns the findings that block the import whatever the overwrite
// setting. Conflicts are listed apart (see Conflicts).
func (p *ImportPlan) Errors() []Issue { return p.bySeverity(Error) }

// Conflicts returns the cells that would replace a different stored value.
func (p *ImportPlan) Conflicts() []Issue { return p.bySeverity(Conflict) }

// Warnings returns findings that do not block the import.
func (p *ImportPlan) Warnings() []Issue { return p.bySeverity(Warning) }

// Notes returns remarks: empty cells left as they are, plots missing from
// the book.
func (p *ImportPlan) Notes() []Issue { return p.bySeverity(Info) }

// Changes returns the values the import sets, overwrites included.
func (p *ImportPlan) Changes() []Change { return append([]Change(nil), p.changes...) }

// Matched returns the number of trial plots found in the book.
func (p *ImportPlan) Matched() int { return p.matched }

// HasErrors reports whether the import is blocked: by errors, or by
// conflicts when overwrite is false.
func (p *ImportPlan) HasErrors(overwrite bool) bool {
	for _, i := range p.issues {
		if i.Severity == Error || (i.Severity == Conflict && !overwrite) {
			return true
		}
	}
	return false
}

type column struct {
	header string
	fixed  string // one of the fixed column names, or ""
	trait  int    // index in Trial.Traits, -1 for none
	factor int    // index in Trial.Factors of a factor column, -1 for none
	unit   string // ColMainPlot, ColSubPlot or ColStrip, or ""
}

// Plan checks a field book table (first non-empty row the header) against
// t and returns what an import would do. It returns an error only when the
// table cannot be a field book at all: it is empty or has no plot column.
// Plan does not change t.
//
// Columns: "plot" is required. "block", "row", "column" and "treatment",
// when present, are compared with the trial: a different block, row or
// column is a warning, a different treatment an error (the book belongs to
// another layout). "treatment_name" is not checked. A trait column is
// matched by the trait key, ignoring case; a heading that starts with the
// key followed by a space or "(" matches too ("yield (t/ha) 0-20"). Other
// columns are ignored with a warning. Headings are matched in the order:
// fixed names, keys in their exact case, keys in any case, key prefixes
// (the longest key first).
//
// Cells: an empty cell leaves the stored value as it is (it does not erase
// it). A cell that is not a number, or impossible for its trait's kind (a
// count of 2.5, a percentage of 130) is an error; a value outside the
// trait's valid range is imported with a warning; a value that differs
// from a stored value is a conflict. Numbers are read by trial.ParseNumber
// (decimal commas "5,23" too; PlanBook follows the book's Mark), and a cell
// that trial.IsMissingText calls missing (NA, N/A, ".") counts as empty.
func Plan(t *trial.Trial, rows [][]string) (*ImportPlan, error) {
	return PlanBook(t, &Book{Rows: rows, Mark: trial.PointOrComma})
}

// Book is a field book as read from a file: its rows, the rule for its
// numbers, and what the reader has to say about it.
type Book struct {
	// Rows are the book's lines, row i being line i+1 (nil for a line that
	// holds nothing); the first row that is not empty is the header.
	Rows [][]string
	// Mark is the decimal mark rule for the numbers (Reader.Mark).
	Mark trial.DecimalMark
	// Notes are said in the report, such as the encoding or the sheet read.
	Notes []string
	// Problems are cells the reader could not turn into text faithfully
	// (a date or a true/false cell of a workbook); Plan reports them as
	// errors when they fall in a trait column.
	Problems []CellProblem
}

// CellProblem is a cell of a book that cannot be read as a value.
type CellProblem struct {
	Line, Column int    // row index + 1 in Book.Rows, and cell index in the row
	Msg          string // what the cell holds and where, in plain words
}

// PlanBook is Plan for a book read by ReadBook or a workbook reader: it
// reads numbers by b.Mark, says b.Notes and reports b.Problems.
func PlanBook(t *trial.Trial, b *Book) (*ImportPlan, error) {
	rows := b.Rows
	if t == nil {
		return nil, errors.New("there is no trial to import into")
	}
	h := -1
	for i, r := range rows {
		if !blank(r) {
			h = i
			break
		}
	}
	if h < 0 {
		return nil, errors.New("the field book is empty")
	}
	p := &ImportPlan{numbers: make([]int, len(t.Plots)), keys: make([]string, len(t.Traits)), mark: b.Mark}
	for _, n := range b.Notes {
		p.add(Issue{Severity: Info, Message: n})
	}
	problems := map[[2]int]string{}
	for _, cp := range b.Problems {
		problems[[2]int{cp.Line, cp.Column}] = cp.Msg
	}
	for i, pl := range t.Plots {
		p.numbers[i] = pl.Number
	}
	for j, tr := range t.Traits {
		p.keys[j] = tr.Key
	}
	cols, err := p.mapHeader(t, rows[h], h+1)
	if err != nil {
		return nil, err
	}
	byNumber := make(map[int]int, len(t.Plots))
	for i, pl := range t.Plots {
		if _, dup := byNumber[pl.Number]; !dup {
			byNumber[pl.Number] = i
		}
	}
	plotCol := -1
	for c, col := range cols {
		if col.fixed == ColPlot {
			plotCol = c
		}
	}
	seen := make(map[int]int) // plot index → line
	empty := make([]int, len(t.Traits))
	for r := h + 1; r < len(rows); r++ {
		row := rows[r]
		if blank(row) {
			continue
		}
		line := r + 1
		p.rows++
		// Empty cells past the last one that holds something are ignored
		// (spreadsheets write them).
		for len(row) > len(cols) && strings.TrimSpace(row[len(row)-1]) == "" {
			row = row[:len(row)-1]
		}
		if len(row) > len(cols) {
			// Cells would be shifted: often an unquoted decimal comma in a
			// comma-separated file ("12,5" read as 12 and 5).
			p.add(Issue{Severity: Error, Line: line, Message: fmt.Sprintf("the row has %d cells but the header has %d; a decimal comma in a comma-separated file may have split a number in two. The row is not imported", len(row), len(cols))})
			continue
		}
		cell := func(c int) string {
			if c < len(row) {
				return strings.TrimSpace(row[c])
			}
			return ""
		}
		text := cell(plotCol)
		if text == "" {
			p.add(Issue{Severity: Error, Line: line, Column: rows[h][plotCol], Message: "the row has no plot number"})
			continue
		}
		num, err := trial.ParseNumber(text, trial.PointOrComma)
		if err != nil || num != math.Trunc(num) || math.Abs(num) > 1<<53 {
			p.add(Issue{Severity: Error, Line: line, Column: rows[h][plotCol], Text: text, Message: fmt.Sprintf("%q is not a plot number", text)})
			continue
		}
		number := int(num)
		pi, ok := byNumber[number]
		if !ok {
			p.add(Issue{Severity: Error, Line: line, Plot: number, Text: text, Message: "the trial has no plot with this number"})
			continue
		}
		if first, dup := seen[pi]; dup {
			p.add(Issue{Severity: Error, Line: line, Plot: number, Text: text, Message: fmt.Sprintf("this plot is also on line %d; this row is not imported", first)})
			continue
		}
		seen[pi] = line
		p.matched++
		pl := t.Plots[pi]
		for c, col := range cols {
			text := cell(c)
			switch {
			case col.fixed == ColTreatment:
				if text != "" && text != pl.Treatment {
					p.add(Issue{Severity: Error, Line: line, Plot: number, Column: col.header, Text: text,
						Message: fmt.Sprintf("the book gives treatment %q but the trial has %q on this plot: the book belongs to another layout", text, pl.Treatment)})
				}
			case col.fixed == ColBlock || col.fixed == ColRow || col.fixed == ColColumn:
				want := map[string]int{ColBlock: pl.Block, ColRow: pl.Row, ColColumn: pl.Column}[col.fixed]
				if text != "" {
					if v, err := trial.ParseNumber(text, trial.PointOrComma); err != nil || v != float64(want) {
						p.add(Issue{Severity: Warning, Line: line, Plot: number, Column: col.header, Text: text,
							Message: fmt.Sprintf("the book gives %s %q but the trial has %d", col.fixed, text, want)})
					}
				}
			case col.factor >= 0:
				if want := t.LevelCode(pl.Treatment, col.factor); text != "" && !strings.EqualFold(text, want) {
					p.add(Issue{Severity: Error, Line: line, Plot: number, Column: col.header, Text: text,
						Message: fmt.Sprintf("the book gives level %q of factor %s but the trial has %q on this plot: the book belongs to another layout", text, t.Factors[col.factor].Key, want)})
				}
			case col.unit != "":
				if want := unitNumber(pl, col.unit); text != "" {
					if v, err := trial.ParseNumber(text, trial.PointOrComma); err != nil || v != float64(want) {
						p.add(Issue{Severity: Warning, Line: line, Plot: number, Column: col.header, Text: text,
							Message: fmt.Sprintf("the book gives %s %q but the trial has %d", strings.ReplaceAll(col.unit, "_", " "), text, want)})
					}
				}
			case col.trait >= 0:
				if msg, bad := problems[[2]int{line, c}]; bad {
					tr := t.Traits[col.trait]
					p.add(Issue{Severity: Error, Line: line, Plot: number, Column: col.header, Trait: tr.Key, Text: text, Message: msg})
					continue
				}
				p.cell(t, col, line, pi, text, empty)
			}
		}
	}
	for j, n := range empty {
		if n > 0 {
			p.add(Issue{Severity: Info, Trait: t.Traits[j].Key, Message: fmt.Sprintf("%d empty %s: %s (an empty cell does not erase a value)", n, plural(n, "cell", "cells"), plural(n, "the trial's value is left as it is", "the trial's values are left as they are"))})
		}
	}
	var absent []int
	for i, pl := range t.Plots {
		if _, ok := seen[i]; !ok {
			absent = append(absent, pl.Number)
		}
	}
	if len(absent) <= maxAbsentListed {
		for _, n := range absent {
			p.add(Issue{Severity: Info, Plot: n, Message: "not in the field book; its values are left as they are"})
		}
	} else {
		// One line for a partial book, not one per plot.
		nums := make([]string, 0, maxAbsentListed)
		for _, n := range absent[:maxAbsentListed] {
			nums = append(nums, strconv.Itoa(n))
		}
		p.add(Issue{Severity: Info, Message: fmt.Sprintf("%d plots are not in the field book (%s, ...); their values are left as they are", len(absent), strings.Join(nums, ", "))})
	}
	return p, nil
}

// maxAbsentListed is how many plots missing from a field book are named
// one per line; more are summed up in one line.
const maxAbsentListed = 5

// add records an issue that is not about a value: Old and New are NaN.
func (p *ImportPlan) add(i Issue) {
	i.Old, i.New = math.NaN(), math.NaN()
	p.issues = append(p.issues, i)
}

// cell checks one trait cell and records the change it makes.
func (p *ImportPlan) cell(t *trial.Trial, col column, line, pi int, text string, empty []int) {
	tr := t.Traits[col.trait]
	number := t.Plots[pi].Number
	old := tr.Values[pi]
	base := Issue{Line: line, Plot: number, Column: col.header, Trait: tr.Key, Text: text}
	with := func(s Severity, v float64, msg string) Issue {
		i := base
		i.Severity, i.Old, i.New, i.Message = s, old, v, msg
		return i
	}
	if trial.IsMissingText(text) {
		empty[col.trait]++
		if !trial.IsMissing(old) {
			p.issues = append(p.issues, with(Info, math.NaN(), fmt.Sprintf("the cell is empty; the stored value %s is kept", show(old))))
		}
		return
	}
	v, err := trial.ParseNumber(text, p.mark)
	if err != nil {
		msg := err.Error() + " (leave the cell empty, or write NA, for a missing value)"
		if p.mark == trial.PointOnly && strings.Contains(text, ",") {
			msg = err.Error() + "; if the whole file uses decimal commas, import it in decimal-comma mode"
		}
		p.issues = append(p.issues, with(Error, math.NaN(), msg))
		return
	}
	if why := tr.Kind.Problem(v); why != "" {
		p.issues = append(p.issues, with(Error, v, fmt.Sprintf("%s %s", show(v), why)))
		return
	}
	if tr.Min != nil && v < *tr.Min {
		p.issues = append(p.issues, with(Warning, v, fmt.Sprintf("%s is below the valid minimum %s; it is imported", show(v), show(*tr.Min))))
	} else if tr.Max != nil && v > *tr.Max {
		p.issues = append(p.issues, with(Warning, v, fmt.Sprintf("%s is above the valid maximum %s; it is imported", show(v), show(*tr.Max))))
	}
	if !trial.IsMissing(old) && old == v && math.Signbit(old) == math.Signbit(v) {
		p.same++
		return
	}
	c := Change{Line: line, Plot: number, PlotIndex: pi, Trait: tr.Key, TraitIndex: col.trait, Old: old, New: v}
	if !trial.IsMissing(old) {
		c.Overwrite = true
		p.issues = append(p.issues, with(Conflict, v, fmt.Sprintf("%s would replace the stored value %s", show(v), show(old))))
	}
	p.changes = append(p.changes, c)
}

// mapHeader matches the header cells to fixed columns and traits.
func (p *ImportPlan) mapHeader(t *trial.Trial, header []string, line int) ([]column, error) {
	cols := make([]column, len(header))
	fixedAt := map[string]int{}
	traitAt := map[int]int{}
	for c, raw := range header {
		name := strings.TrimSpace(raw)
		cols[c] = column{header: name, trait: -1, factor: -1}
		if name == "" {
			continue
		}
		if f, unit, ok := designColumn(t, name); ok {
			key := "unit " + unit
			if f >= 0 {
				key = "factor " + strconv.Itoa(f)
			}
			if prev, dup := fixedAt[key]; dup {
				return nil, fmt.Errorf("line %d: columns %d and %d are both headed %q", line, prev+1, c+1, name)
			}
			fixedAt[key] = c
			cols[c].factor, cols[c].unit = f, unit
			continue
		}
		lower := strings.ToLower(name)
		if contains(fixedColumns, lower) {
			if prev, dup := fixedAt[lower]; dup {
				return nil, fmt.Errorf("line %d: columns %d and %d are both headed %q", line, prev+1, c+1, name)
			}
			fixedAt[lower] = c
			cols[c].fixed = lower
			continue
		}
		j := matchTrait(t, name)
		if j < 0 {
			p.add(Issue{Severity: Warning, Line: line, Column: name, Message: fmt.Sprintf("column %q is not a trait of this trial; it is ignored", name)})
			continue
		}
		if t.Traits[j].Derived != nil {
			p.add(Issue{Severity: Warning, Line: line, Column: name, Trait: t.Traits[j].Key, Message: fmt.Sprintf("trait %q is computed from other traits; the column is ignored", t.Traits[j].Key)})
			continue
		}
		if prev, dup := traitAt[j]; dup {
			p.add(Issue{Severity: Error, Line: line, Column: name, Trait: t.Traits[j].Key, Message: fmt.Sprintf("columns %q and %q both hold trait %q", header[prev], name, t.Traits[j].Key)})
			continue
		}
		if len(t.Traits[j].Values) != len(t.Plots) {
			p.add(Issue{Severity: Error, Line: line, Column: name, Trait: t.Traits[j].Key, Message: fmt.Sprintf("trait %q does not have one value per plot in the trial; it cannot take data", t.Traits[j].Key)})
			continue
		}
		traitAt[j] = c
		cols[c].trait = j
	}
	if _, ok := fixedAt[ColPlot]; !ok {
		return nil, fmt.Errorf("line %d: the field book has no %q column", line, ColPlot)
	}
	return cols, nil
}

// matchTrait finds the trait a heading names, or -1.
func matchTrait(t *trial.Trial, name string) int {
	for j, tr := range t.Traits {
		if tr.Key != "" && tr.Key == name {
			return j
		}
	}
	for j, tr := range t.Traits {
		if tr.Key != "" && strings.EqualFold(tr.Key, name) {
			return j
		}
	}
	best, bestLen := -1, 0
	for j, tr := range t.Traits {
		k := len(tr.Key)
		if k == 0 || k >= len(name) || k <= bestLen {
			continue
		}
		if strings.EqualFold(name[:k], tr.Key) && (name[k] == ' ' || name[k] == '(') {
			best, bestLen = j, k
		}
	}
	return best
}

// Apply carries out the plan on t, which must be the trial the plan was
// made for, unchanged since. It refuses, changing nothing, while the plan
// has errors, or conflicts and overwrite is false, or when t has changed.
// It returns the number of values set.
func (p *ImportPlan) Apply(t *trial.Trial, overwrite bool) (changed int, err error) {
	if p.HasErrors(overwrite) {
		e, c := len(p.Errors()), len(p.Conflicts())
		switch {
		case e > 0:
			return 0, fmt.Errorf("the field book has %d %s; nothing was imported", e, plural(e, "error", "errors"))
		default:
			return 0, fmt.Errorf("%d %s would replace stored values; nothing was imported (allow overwriting to import them)", c, plural(c, "cell", "cells"))
		}
	}
	stale := errors.New("the trial has changed since the field book was checked; nothing was imported. Check the field book again")
	if t == nil || len(t.Plots) != len(p.numbers) || len(t.Traits) != len(p.keys) {
		return 0, stale
	}
	for i, n := range p.numbers {
		if t.Plots[i].Number != n {
			return 0, stale
		}
	}
	for j, k := range p.keys {
		if t.Traits[j].Key != k {
			return 0, stale
		}
	}
	for _, c := range p.changes {
		vs := t.Traits[c.TraitIndex].Values
		if c.PlotIndex >= len(vs) || t.Traits[c.TraitIndex].Derived != nil {
			return 0, stale
		}
		cur := vs[c.PlotIndex]
		if trial.IsMissing(cur) != trial.IsMissing(c.Old) || (!trial.IsMissing(cur) && math.Float64bits(cur) != math.Float64bits(c.Old)) {
			return 0, stale
		}
	}
	for _, c := range p.changes {
		t.Traits[c.TraitIndex].Values[c.PlotIndex] = c.New
		changed++
	}
	return changed, nil
}

// Report writes the plan as plain text: a summary, then one line per
// finding, errors first, as it stands when overwriting is not allowed.
func (p *ImportPlan) Report(w io.Writer) error { return p.WriteReport(w, false) }

// WriteReport is Report for an import that will (overwrite true) or will
// not replace values already stored: its closing line says what happens.
func (p *ImportPlan) WriteReport(w io.Writer, overwrite bool) error {
	over := 0
	for _, c := range p.changes {
		if c.Overwrite {
			over++
		}
	}
	var b strings.Builder
	fmt.Fprintf(&b, "Field book: %d %s, %d %s matched, %d %s to import", p.rows, plural(p.rows, "row", "rows"),
		p.matched, plural(p.matched, "plot", "plots"), len(p.changes), plural(len(p.changes), "value", "values"))
	if over > 0 {
		fmt.Fprintf(&b, " (%d replacing stored values)", over)
	}
	if p.same > 0 {
		fmt.Fprintf(&b, ", %d unchanged", p.same)
	}
	b.WriteString(".\n")
	for _, s := range []Severity{Error, Conflict, Warning, Info} {
		for _, i := range p.issues {
			if i.Severity == s {
				b.WriteString(i.String())
				b.WriteByte('\n')
			}
		}
	}
	switch {
	case p.HasErrors(true):
		b.WriteString("Nothing can be imported until the errors are corrected.\n")
	case p.HasErrors(overwrite):
		fmt.Fprintf(&b, "Nothing is imported unless overwriting is allowed: %d stored %s would be replaced.\n", over, plural(over, "value", "values"))
	case over > 0:
		fmt.Fprintf(&b, "Ready to import; %d stored %s will be replaced.\n", over, plural(over, "value", "values"))
	case len(p.changes) == 0:
		b.WriteString("Nothing to import: no cell holds a value the trial does not already have (empty cells leave the trial's values as they are).\n")
	default:
		b.WriteString("Ready to import.\n")
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// show formats a value for a message; never "NaN".
func show(v float64) string {
	if trial.IsMissing(v) {
		return "missing"
	}
	return formatValue(v)
}

func plural(n int, one, many string) string {
	if n == 1 {
		return one
	}
	return many
}

func blank(r []string) bool {
	for _, c := range r {
		if strings.TrimSpace(c) != "" {
			return false
		}
	}
	return true
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
