package analysis

import (
	"context"
	"fmt"
	"io"
	"math"
	"strings"

	"furlong/trial"
)

// TableColumns names the columns of a plain data table (a CSV file with a
// header row) to analyse.
type TableColumns struct {
	Treatment string // required
	Block     string // an RCBD
	Row       string // with Column: a Latin square
	Column    string
	// Responses to analyse; empty means every column that is not a factor
	// and holds only numbers (and empty cells).
	Responses []string
	// Factors, instead of Treatment, are 1 to 3 columns of crossed
	// treatment factors (a factorial); MainPlot names the one on main
	// plots (a split plot, needs Block), Strip makes a strip plot of two
	// factors (the first horizontal, needs Block). See factorial.go.
	Factors  []string
	MainPlot string
	Strip    bool
	// Covariate names a column of numbers every response is adjusted for
	// by analysis of covariance (Data.Covariate); it is not analysed
	// itself.
	Covariate string
}

// TableError is a problem in a data table, with its line (1 = header) and
// column.
type TableError struct {
	Line   int    // 1 is the header line; 0 when no line applies
	Column string // the column's header, "" when no column applies
	Msg    string // the problem, in plain words
}

// Error returns the problem led by its line and column.
func (e *TableError) Error() string {
	switch {
	case e.Line > 0 && e.Column != "":
		return fmt.Sprintf("line %d, column %s: %s", e.Line, e.Column, e.Msg)
	case e.Line > 0:
		return fmt.Sprintf("line %d: %s", e.Line, e.Msg)
	}
	return e.Msg
}

// RowSource gives a table's rows one at a time, the header first, each with
// its line in the file; io.EOF ends the table. fieldbook.Reader is one.
type RowSource interface {
	Read() (line int, cells []string, err error)
}

// sliceSource is a RowSource over rows held in memory (row i is line i+1).
type sliceSource struct {
	rows [][]string
	i    int
}

func (s *sliceSource) Read() (int, []string, error) {
	for s.i < len(s.rows) {
		r := s.rows[s.i]
		s.i++
		for _, c := range r {
			if strings.TrimSpace(c) != "" {
				return s.i, r, nil
			}
		}
	}
	return 0, nil, io.EOF
}

// ParseTable turns a table of strings (header row first) into one Data per
// response column, as ReadTable does; numbers may have a decimal point or
// comma.
func ParseTable(rows [][]string, c TableColumns) ([]*Data, error) {
	return ReadTable(context.Background(), &sliceSource{rows: rows}, trial.PointOrComma, c)
}

// level gives factor labels indices in the order they first appear.
type level struct {
	col   int
	name  string // the column's header
	index []int
	names []string
	seen  map[string]int
}

func (l *level) add(cell string, line int) error {
	v := strings.TrimSpace(cell)
	if v == "" {
		return &TableError{Line: line, Column: l.name, Msg: "the cell is empty; every row needs a label here"}
	}
	k, ok := l.seen[v]
	if !ok {
		k = len(l.names)
		l.seen[v] = k
		l.names = append(l.names, v)
	}
	l.index = append(l.index, k)
	return nil
}

// response is one column of numbers being read.
type response struct {
	col      int
	name     string
	values   []float64
	any      bool // a number was seen
	explicit bool // named by the caller: a cell that is not a number is an error
	dropped  bool // found not to hold numbers (columns chosen automatically)
}

// ReadTable reads a data table (a CSV file with a header row) row by row
// into one Data per response column. Only compact columns are kept: a level
// index per factor cell and a float64 per response cell, never the text,
// so a table of a million rows needs tens of megabytes, not gigabytes.
//
// Treatment, block, row and column labels are taken in the order they first
// appear. Response cells are read by trial.ParseNumber with mark; cells that
// trial.IsMissingText calls missing (empty, NA, N/A, ".") are missing values.
// Without c.Responses every column that is not a factor and holds only
// numbers and missing values is a response. A row with cells past the
// header that are not empty is refused (a decimal comma may have split a
// number in two). Reading stops when ctx is done.
func ReadTable(ctx context.Context, src RowSource, mark trial.DecimalMark, c TableColumns) ([]*Data, error) {
	hline, header, err := src.Read()
	if err == io.EOF {
		return nil, &TableError{Msg: "the table needs a header row and at least one row of data"}
	}
	if err != nil {
		return nil, err
	}
	header = append([]string(nil), header...)
	for i := range header {
		header[i] = strings.TrimSpace(header[i])
	}
	find := func(name string) (int, error) {
		for i, h := range header {
			if strings.EqualFold(h, strings.TrimSpace(name)) {
				return i, nil
			}
		}
		return -1, &TableError{Line: hline, Msg: fmt.Sprintf("there is no column %q (the columns are %s)", name, strings.Join(header, ", "))}
	}
	newLevel := func(name string) (*level, error) {
		i, err := find(name)
		if err != nil {
			return nil, err
		}
		return &level{col: i, name: header[i], seen: map[string]int{}}, nil
	}
	var trt *level
	var factors, facs []*level
	if len(c.Factors) > 0 {
		if facs, err = factorColumns(c, hline, newLevel); err != nil {
			return nil, err
		}
		factors = append(factors, facs...)
	} else {
		if trt, err = newLevel(c.Treatment); err != nil {
			return nil, err
		}
		factors = []*level{trt}
	}
	design := trial.CRD
	var blk, row, col *level
	if c.Block != "" {
		if blk, err = newLevel(c.Block); err != nil {
			return nil, err
		}
		factors = append(factors, blk)
		design = trial.RCBD
	}
	if c.Row != "" || c.Column != "" {
		if facs != nil {
			return nil, &TableError{Line: hline, Msg: "a Latin square cannot hold crossed treatment factors here; give --block for randomised complete blocks, or leave the blocks out"}
		}
		if row, err = newLevel(c.Row); err != nil {
			return nil, err
		}
		if col, err = newLevel(c.Column); err != nil {
			return nil, err
		}
		factors = append(factors, row, col)
		design = trial.Latin
	}
	isFactor := map[int]bool{}
	for _, f := range factors {
		isFactor[f.col] = true
	}
	var resp []*response
	var covResp *response
	if c.Covariate != "" {
		i, err := find(c.Covariate)
		if err != nil {
			return nil, err
		}
		if isFactor[i] {
			return nil, &TableError{Line: hline, Column: header[i], Msg: "this column is a factor and cannot also be the covariate"}
		}
		covResp = &response{col: i, name: header[i], explicit: true}
		isFactor[i] = true // not a response
	}
	if len(c.Responses) > 0 {
		for _, name := range c.Responses {
			i, err := find(name)
			if err != nil {
				return nil, err
			}
			if isFactor[i] {
				return nil, &TableError{Line: hline, Column: header[i], Msg: "this column is a factor and cannot also be a response"}
			}
			resp = append(resp, &response{col: i, name: header[i], explicit: true})
		}
	} else {
		for i, h := range header {
			if !isFactor[i] && h != "" {
				resp = append(resp, &response{col: i, name: h})
			}
		}
	}
	var lines []int
	for n := 0; ; n++ {
		if n%4096 == 0 {
			if err := ctx.Err(); err != nil {
				return nil, err
			}
		}
		line, cells, err := src.Read()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, err
		}
		for k := len(header); k < len(cells); k++ {
			if strings.TrimSpace(cells[k]) != "" {
				return nil, &TableError{Line: line, Msg: fmt.Sprintf("the row has %d cells but the header has %d; a decimal comma in a comma-separated file may have split a number in two (put such numbers in quotes, or separate the cells with semicolons)", len(cells), len(header))}
			}
		}
		cell := func(i int) string {
			if i < len(cells) {
				return cells[i]
			}
			return ""
		}
		for _, f := range factors {
			if err := f.add(cell(f.col), line); err != nil {
				return nil, err
			}
		}
		lines = append(lines, line)
		for _, r := range append(resp, covResp) {
			if r == nil || r.dropped {
				continue
			}
			text := strings.TrimSpace(cell(r.col))
			if trial.IsMissingText(text) {
				r.values = append(r.values, math.NaN())
				continue
			}
			v, err := trial.ParseNumber(text, mark)
			if err != nil {
				if r.explicit {
					return nil, &TableError{Line: line, Column: r.name, Msg: err.Error()}
				}
				r.dropped, r.values = true, nil
				continue
			}
			r.any = true
			r.values = append(r.values, v)
		}
	}
	if len(lines) == 0 {
		return nil, &TableError{Msg: "the table needs a header row and at least one row of data"}
	}
	kept := resp[:0]
	for _, r := range resp {
		if !r.dropped && (r.any || r.explicit) {
			kept = append(kept, r)
		}
	}
	if len(kept) == 0 {
		return nil, &TableError{Line: hline, Msg: "no column holds numbers to analyse; name one with --response"}
	}
	var fd *factorTable
	if facs != nil {
		if fd, err = combinations(facs, c, blk); err != nil {
			return nil, err
		}
	}
	if row != nil && (len(row.names) != len(trt.names) || len(col.names) != len(trt.names)) {
		return nil, &TableError{Msg: fmt.Sprintf("a Latin square needs as many rows and columns as treatments: the table has %d treatments, %d rows and %d columns", len(trt.names), len(row.names), len(col.names))}
	}
	var out []*Data
	for _, r := range kept {
		d := &Data{
			TraitKey: r.name, TraitName: r.name, Decimals: 2, HigherBetter: true,
			Kind: trial.Continuous, Design: design, Values: r.values, Plot: lines,
			Lines: true,
		}
		if fd != nil {
			d.Treatments, d.Treatment, d.Factors, d.Design = fd.treatments, fd.treatment, fd.factors, fd.design
		} else {
			d.Treatments, d.Treatment = trt.names, trt.index
		}
		if blk != nil {
			d.Block, d.Blocks, d.BlockLabels = blk.index, len(blk.names), blk.names
		}
		if row != nil {
			d.Row, d.Column, d.Rows, d.Cols = row.index, col.index, len(row.names), len(col.names)
		}
		if covResp != nil {
			d.Covariate, d.CovariateKey, d.CovariateName = covResp.values, covResp.name, covResp.name
		}
		out = append(out, d)
	}
	return out, nil
}
