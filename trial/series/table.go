package series

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math"
	"strings"

	"furlong/trial"
	"furlong/trial/analysis"
)

// TableColumns name the columns of a series table: plot data of many
// sites in one CSV file (site, block, treatment and response columns), or,
// without Block, one row per site and treatment holding the site means.
type TableColumns struct {
	Site      string // required
	Block     string // "" when the rows are site means
	Treatment string // required
	// Responses to analyse; empty means every other column holding only
	// numbers (and empty cells).
	Responses []string
}

// TableTrait is one response column of a series table, ready for Analyze.
type TableTrait struct {
	Trait Trait
	Sites []Site
}

// ReadTable reads a series table (comma-, semicolon- or tab-separated,
// header first; with ';' or tab a decimal comma is accepted). Sites are
// kept in the order they first appear; an empty response cell is missing.
func ReadTable(r io.Reader, c TableColumns) ([]TableTrait, error) {
	data, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	data = bytes.TrimPrefix(data, []byte("\xef\xbb\xbf"))
	sep, mark := sniff(data)
	cr := csv.NewReader(bytes.NewReader(data))
	cr.Comma = sep
	cr.FieldsPerRecord = -1
	cr.ReuseRecord = false
	rows, err := cr.ReadAll()
	if err != nil {
		return nil, fmt.Errorf("the table cannot be read as CSV: %v", err)
	}
	if len(rows) < 2 {
		return nil, errors.New("the table has no rows below its header")
	}
	head := rows[0]
	col := func(name, what string) (int, error) {
		for i, h := range head {
			if strings.EqualFold(strings.TrimSpace(h), strings.TrimSpace(name)) {
				return i, nil
			}
		}
		return -1, fmt.Errorf("the table has no %s column %q (its columns are %s)", what, name, strings.Join(head, ", "))
	}
	if c.Site == "" || c.Treatment == "" {
		return nil, errors.New("name the site and treatment columns of the table")
	}
	siteC, err := col(c.Site, "site")
	if err != nil {
		return nil, err
	}
	trtC, err := col(c.Treatment, "treatment")
	if err != nil {
		return nil, err
	}
	blockC := -1
	if c.Block != "" {
		if blockC, err = col(c.Block, "block"); err != nil {
			return nil, err
		}
	}
	var respC []int
	if len(c.Responses) > 0 {
		for _, name := range c.Responses {
			k, err := col(name, "response")
			if err != nil {
				return nil, err
			}
			respC = append(respC, k)
		}
	} else {
		for k := range head {
			if k == siteC || k == trtC || k == blockC {
				continue
			}
			numeric, any := true, false
			for _, row := range rows[1:] {
				if k >= len(row) || strings.TrimSpace(row[k]) == "" || trial.IsMissingText(row[k]) {
					continue
				}
				if _, err := trial.ParseNumber(row[k], mark); err != nil {
					numeric = false
					break
				}
				any = true
			}
			if numeric && any {
				respC = append(respC, k)
			}
		}
		if len(respC) == 0 {
			return nil, errors.New("the table has no column of numbers to analyse; name one with --response")
		}
	}
	cell := func(row []string, k int) string {
		if k < len(row) {
			return strings.TrimSpace(row[k])
		}
		return ""
	}
	var out []TableTrait
	for _, rc := range respC {
		tt := TableTrait{Trait: Trait{Key: strings.TrimSpace(head[rc]), Name: strings.TrimSpace(head[rc]), HigherBetter: true}}
		siteIdx := map[string]int{}
		type acc struct {
			trt, blk   map[string]int
			d          analysis.Data
			m          SiteMeans
			meansIndex map[string]bool
		}
		var accs []*acc
		for li, row := range rows[1:] {
			line := li + 2
			if len(row) == 1 && strings.TrimSpace(row[0]) == "" {
				continue
			}
			sname, tcode := cell(row, siteC), cell(row, trtC)
			if sname == "" {
				return nil, fmt.Errorf("line %d: the site is empty", line)
			}
			if tcode == "" {
				return nil, fmt.Errorf("line %d: the treatment is empty", line)
			}
			v := math.NaN()
			if s := cell(row, rc); s != "" && !trial.IsMissingText(s) {
				x, err := trial.ParseNumber(s, mark)
				if err != nil {
					return nil, fmt.Errorf("line %d, column %s: %q is not a number", line, head[rc], s)
				}
				v = x
				if dec := decimalsOf(s); dec > tt.Trait.Decimals {
					tt.Trait.Decimals = dec
				}
			}
			j, ok := siteIdx[sname]
			if !ok {
				j = len(accs)
				siteIdx[sname] = j
				a := &acc{trt: map[string]int{}, blk: map[string]int{}, meansIndex: map[string]bool{}}
				a.d = analysis.Data{TraitKey: tt.Trait.Key, TraitName: tt.Trait.Name, HigherBetter: true, Kind: trial.Continuous, Design: trial.RCBD, Lines: true}
				accs = append(accs, a)
				tt.Sites = append(tt.Sites, Site{Label: sname, Site: sname})
			}
			a := accs[j]
			if blockC < 0 {
				if a.meansIndex[tcode] {
					return nil, fmt.Errorf("line %d: %s has a second row for %s; without a block column each row is one site mean (name the block column with --block for plot data)", line, sname, tcode)
				}
				a.meansIndex[tcode] = true
				a.m.Treatments = append(a.m.Treatments, tcode)
				a.m.Names = append(a.m.Names, "")
				a.m.Values = append(a.m.Values, v)
				continue
			}
			b := cell(row, blockC)
			if b == "" {
				return nil, fmt.Errorf("line %d: the block is empty", line)
			}
			ti, ok := a.trt[tcode]
			if !ok {
				ti = len(a.d.Treatments)
				a.trt[tcode] = ti
				a.d.Treatments = append(a.d.Treatments, tcode)
				a.d.Names = append(a.d.Names, "")
				a.d.Checks = append(a.d.Checks, false)
			}
			bi, ok := a.blk[b]
			if !ok {
				bi = len(a.d.BlockLabels)
				a.blk[b] = bi
				a.d.BlockLabels = append(a.d.BlockLabels, "block "+b)
				a.d.Blocks++
			}
			a.d.Treatment = append(a.d.Treatment, ti)
			a.d.Block = append(a.d.Block, bi)
			a.d.Values = append(a.d.Values, v)
			a.d.Plot = append(a.d.Plot, line)
		}
		for j, a := range accs {
			if blockC < 0 {
				m := a.m
				tt.Sites[j].Means = &m
			} else {
				d := a.d
				d.Decimals = tt.Trait.Decimals
				tt.Sites[j].Data = &d
			}
		}
		out = append(out, tt)
	}
	return out, nil
}

// sniff picks the separator from the header line: tab or semicolon (then
// a decimal comma is allowed), else comma (decimal point only).
func sniff(data []byte) (rune, trial.DecimalMark) {
	line, _ := bufio.NewReader(bytes.NewReader(data)).ReadString('\n')
	switch {
	case strings.Count(line, "\t") > strings.Count(line, ",") && strings.Count(line, "\t") >= strings.Count(line, ";"):
		return '\t', trial.PointOrComma
	case strings.Count(line, ";") > strings.Count(line, ","):
		return ';', trial.PointOrComma
	}
	return ',', trial.PointOnly
}

func decimalsOf(s string) int {
	if i := strings.LastIndexAny(s, ".,"); i >= 0 && !strings.ContainsAny(s, "eE") {
		return len(s) - i - 1
	}
	return 0
}
