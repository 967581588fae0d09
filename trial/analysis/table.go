package analysis

import (
	"fmt"
	"math"
	"strconv"
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

// ParseTable turns a table of strings (header row first) into one Data per
// response column. Treatment, block, row and column labels are taken in
// the order they first appear; empty response cells (and NA, N/A, ".") are
// missing values.
func ParseTable(rows [][]string, c TableColumns) ([]*Data, error) {
	if len(rows) < 2 {
		return nil, &TableError{Msg: "the table needs a header row and at least one row of data"}
	}
	header := rows[0]
	find := func(name string) (int, error) {
		for i, h := range header {
			if strings.EqualFold(strings.TrimSpace(h), strings.TrimSpace(name)) {
				return i, nil
			}
		}
		return -1, &TableError{Line: 1, Msg: fmt.Sprintf("there is no column %q (the columns are %s)", name, strings.Join(header, ", "))}
	}
	ti, err := find(c.Treatment)
	if err != nil {
		return nil, err
	}
	factorCols := map[int]bool{ti: true}
	design := trial.CRD
	bi, ri, ci := -1, -1, -1
	if c.Block != "" {
		if bi, err = find(c.Block); err != nil {
			return nil, err
		}
		factorCols[bi] = true
		design = trial.RCBD
	}
	if c.Row != "" || c.Column != "" {
		if ri, err = find(c.Row); err != nil {
			return nil, err
		}
		if ci, err = find(c.Column); err != nil {
			return nil, err
		}
		factorCols[ri], factorCols[ci] = true, true
		design = trial.Latin
	}
	data := rows[1:]
	var resp []int
	if len(c.Responses) > 0 {
		for _, name := range c.Responses {
			i, err := find(name)
			if err != nil {
				return nil, err
			}
			if factorCols[i] {
				return nil, &TableError{Line: 1, Column: name, Msg: "this column is a factor and cannot also be a response"}
			}
			resp = append(resp, i)
		}
	} else {
		for i := range header {
			if factorCols[i] {
				continue
			}
			numeric, any := true, false
			for _, row := range data {
				if i >= len(row) || isMissingCell(row[i]) {
					continue
				}
				any = true
				if _, ok := parseNumber(row[i]); !ok {
					numeric = false
					break
				}
			}
			if numeric && any {
				resp = append(resp, i)
			}
		}
		if len(resp) == 0 {
			return nil, &TableError{Line: 1, Msg: "no column holds numbers to analyse; name one with --response"}
		}
	}

	labels := func(col int) ([]int, []string, error) {
		idx := make([]int, len(data))
		var names []string
		seen := map[string]int{}
		for r, row := range data {
			v := ""
			if col < len(row) {
				v = strings.TrimSpace(row[col])
			}
			if v == "" {
				return nil, nil, &TableError{Line: r + 2, Column: header[col], Msg: "the cell is empty; every row needs a label here"}
			}
			k, ok := seen[v]
			if !ok {
				k = len(names)
				seen[v] = k
				names = append(names, v)
			}
			idx[r] = k
		}
		return idx, names, nil
	}
	trt, trtNames, err := labels(ti)
	if err != nil {
		return nil, err
	}
	var blk, row, col []int
	var blkNames, rowNames, colNames []string
	if bi >= 0 {
		if blk, blkNames, err = labels(bi); err != nil {
			return nil, err
		}
	}
	if ri >= 0 {
		if row, rowNames, err = labels(ri); err != nil {
			return nil, err
		}
		if col, colNames, err = labels(ci); err != nil {
			return nil, err
		}
		if len(rowNames) != len(trtNames) || len(colNames) != len(trtNames) {
			return nil, &TableError{Msg: fmt.Sprintf("a Latin square needs as many rows and columns as treatments: the table has %d treatments, %d rows and %d columns", len(trtNames), len(rowNames), len(colNames))}
		}
	}

	var out []*Data
	for _, ri := range resp {
		d := &Data{
			TraitKey: header[ri], TraitName: header[ri], Decimals: 2, HigherBetter: true,
			Kind: trial.Continuous, Design: design, Treatments: trtNames,
			Treatment: trt, Block: blk, Blocks: len(blkNames), BlockLabels: blkNames,
			Row: row, Column: col, Rows: len(rowNames), Cols: len(colNames),
			Lines: true,
		}
		d.Values = make([]float64, len(data))
		d.Plot = make([]int, len(data))
		for r, rw := range data {
			d.Plot[r] = r + 2 // the file line, for messages
			cell := ""
			if ri < len(rw) {
				cell = strings.TrimSpace(rw[ri])
			}
			if isMissingCell(cell) {
				d.Values[r] = math.NaN()
				continue
			}
			v, ok := parseNumber(cell)
			if !ok {
				return nil, &TableError{Line: r + 2, Column: header[ri], Msg: fmt.Sprintf("%q is not a number", cell)}
			}
			d.Values[r] = v
		}
		out = append(out, d)
	}
	return out, nil
}

// isMissingCell reports whether a cell stands for a missing value: empty,
// or one of the usual markers NA, N/A and "." (common practice in
// statistics packages' CSV files).
func isMissingCell(s string) bool {
	switch strings.ToUpper(strings.TrimSpace(s)) {
	case "", "NA", "N/A", ".":
		return true
	}
	return false
}

// parseNumber reads a finite decimal number, with a point or a comma as the
// decimal mark (a comma only when there is no point).
func parseNumber(s string) (float64, bool) {
	s = strings.TrimSpace(s)
	if strings.Contains(s, ",") && !strings.Contains(s, ".") && strings.Count(s, ",") == 1 {
		s = strings.Replace(s, ",", ".", 1)
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, false
	}
	return v, true
}
