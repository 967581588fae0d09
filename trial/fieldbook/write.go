package fieldbook

import (
	"bufio"
	"encoding/csv"
	"errors"
	"io"
	"math"
	"strconv"
	"strings"

	"furlong/trial"
)

// Fixed column names of a field book, in order.
const (
	ColPlot          = "plot"
	ColBlock         = "block"
	ColRow           = "row"
	ColColumn        = "column"
	ColTreatment     = "treatment"
	ColTreatmentName = "treatment_name"
)

var fixedColumns = []string{ColPlot, ColBlock, ColRow, ColColumn, ColTreatment, ColTreatmentName}

// Options control how WriteCSV writes a field book. The zero value writes
// comma-separated cells, decimal points and LF line ends.
type Options struct {
	// Comma is the cell separator: ',' (the default when 0), ';' or '\t'.
	Comma rune
	// DecimalComma writes "5,23" instead of "5.23", as spreadsheets in
	// many European locales expect. With a comma separator such cells are
	// quoted.
	DecimalComma bool
	// CRLF ends lines with \r\n.
	CRLF bool
	// BOM starts the file with a UTF-8 byte order mark, which some
	// spreadsheets need to recognise UTF-8.
	BOM bool
}

// Rows returns the field book of t as a table: the header row, then one row
// per plot in walking order. Values are written in full precision with a
// decimal point; missing values are empty cells.
func Rows(t *trial.Trial) [][]string {
	return rows(t, false)
}

func rows(t *trial.Trial, decimalComma bool) [][]string {
	var stored []int
	header := append([]string(nil), fixedColumns...)
	header = append(header, DesignColumns(t)...)
	for j, tr := range t.Traits {
		if tr.Derived != nil {
			continue
		}
		stored = append(stored, j)
		header = append(header, tr.Key)
	}
	names := make(map[string]string, len(t.Treatments))
	for _, tr := range t.Treatments {
		names[tr.Code] = tr.Name
	}
	out := make([][]string, 0, len(t.Plots)+1)
	out = append(out, header)
	for i, p := range t.Plots {
		r := make([]string, 0, len(header))
		r = append(r, strconv.Itoa(p.Number), strconv.Itoa(p.Block), strconv.Itoa(p.Row), strconv.Itoa(p.Column), p.Treatment, names[p.Treatment])
		r = append(r, DesignCells(t, p)...)
		for _, j := range stored {
			v := math.NaN()
			if i < len(t.Traits[j].Values) {
				v = t.Traits[j].Values[i]
			}
			s := formatValue(v)
			if decimalComma {
				s = strings.Replace(s, ".", ",", 1)
			}
			r = append(r, s)
		}
		out = append(out, r)
	}
	return out
}

// formatValue writes v in the shortest form that reads back to the same
// float64 ("" for a missing value): plain decimals, exponent form only
// below 1e-6 and from 1e21.
func formatValue(v float64) string {
	if trial.IsMissing(v) {
		return ""
	}
	if a := math.Abs(v); a != 0 && (a < 1e-6 || a >= 1e21) {
		return strconv.FormatFloat(v, 'e', -1, 64)
	}
	return strconv.FormatFloat(v, 'f', -1, 64)
}

// WriteCSV writes the field book of t (see Rows) as CSV.
func WriteCSV(w io.Writer, t *trial.Trial, opts Options) error {
	comma := opts.Comma
	if comma == 0 {
		comma = ','
	}
	if comma != ',' && comma != ';' && comma != '\t' {
		return errors.New("the separator must be a comma, a semicolon or a tab")
	}
	bw := bufio.NewWriter(w)
	if opts.BOM {
		bw.WriteString("\ufeff")
	}
	cw := csv.NewWriter(bw)
	cw.Comma = comma
	cw.UseCRLF = opts.CRLF
	if err := cw.WriteAll(rows(t, opts.DecimalComma)); err != nil {
		return err
	}
	return bw.Flush()
}
