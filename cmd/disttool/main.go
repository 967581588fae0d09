// Command disttool holds the steps of `make dist` (.ci/dist.sh) and of its
// check (.ci/distcheck.sh) that need more than the shell:
//
//	disttool ico IMAGE.png OUT.ico        the Windows icon, every usual size, from Icon.png
//	disttool zip OUT.zip DIR              a zip of DIR (DIR's name the top folder), sorted, fixed times
//	disttool exe FILE.exe VERSION BUILD   check a Windows executable: x86-64, console program,
//	                                      an icon, a manifest and a version resource VERSION.BUILD
//	disttool cells FILE.xlsx              open a workbook and print every sheet's cells
//	disttool shot FILE.png                check that a screenshot shows more than a blank screen
//
// It is a build tool, not part of the program, and is never shipped.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/xuri/excelize/v2"
)

const usage = `usage:
  disttool ico IMAGE.png OUT.ico
  disttool zip OUT.zip DIR
  disttool exe FILE.exe VERSION BUILD
  disttool cells FILE.xlsx
  disttool shot FILE.png`

func main() {
	if err := run(os.Args[1:], os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "disttool:", err)
		if errors.Is(err, errUsage) {
			fmt.Fprintln(os.Stderr, usage)
			os.Exit(2)
		}
		os.Exit(1)
	}
}

var errUsage = errors.New("wrong command line")

func run(args []string, out io.Writer) error {
	if len(args) == 0 {
		return errUsage
	}
	want := map[string]int{"ico": 2, "zip": 2, "exe": 3, "cells": 1, "shot": 1}
	n, ok := want[args[0]]
	if !ok || len(args)-1 != n {
		return errUsage
	}
	a := args[1:]
	switch args[0] {
	case "ico":
		return writeIconFile(a[0], a[1])
	case "zip":
		return zipDir(a[0], a[1], sourceDate())
	case "exe":
		build, err := strconv.Atoi(a[2])
		if err != nil {
			return fmt.Errorf("build number %q is not a whole number", a[2])
		}
		b, err := os.ReadFile(a[0])
		if err != nil {
			return err
		}
		info, err := checkExe(b, a[1], build)
		if err != nil {
			return fmt.Errorf("%s: %w", a[0], err)
		}
		fmt.Fprintf(out, "%s: %s\n", a[0], info)
		return nil
	case "cells":
		return printCells(a[0], out)
	case "shot":
		info, err := checkShot(a[0])
		if err != nil {
			return fmt.Errorf("%s: %w", a[0], err)
		}
		fmt.Fprintf(out, "%s: %s\n", a[0], info)
		return nil
	}
	return errUsage
}

// sourceDate is the time stamp of every file in the zip: SOURCE_DATE_EPOCH
// when set (reproducible builds), else the start of today in UTC, so that
// two builds of the same day give the same file.
func sourceDate() time.Time {
	if s := os.Getenv("SOURCE_DATE_EPOCH"); s != "" {
		if n, err := strconv.ParseInt(s, 10, 64); err == nil {
			return time.Unix(n, 0).UTC()
		}
	}
	return time.Now().UTC().Truncate(24 * time.Hour)
}

// printCells opens a workbook and prints, sheet by sheet, every non-empty
// cell as "sheet!A1<TAB>value" (the value as stored, a date or time as
// "(a date or time)"): a report that excelize cannot read, or one without
// sheets, fails. Two builds of the program that write the same report
// print the same lines.
func printCells(path string, out io.Writer) error {
	f, err := excelize.OpenFile(path)
	if err != nil {
		return fmt.Errorf("%s does not open: %w", path, err)
	}
	defer f.Close()
	sheets := f.GetSheetList()
	if len(sheets) == 0 {
		return fmt.Errorf("%s has no sheets", path)
	}
	for _, s := range sheets {
		rows, err := f.GetRows(s, excelize.Options{RawCellValue: true})
		if err != nil {
			return fmt.Errorf("%s, sheet %q: %w", path, s, err)
		}
		fmt.Fprintf(out, "# sheet %s: %d rows\n", s, len(rows))
		for r, row := range rows {
			for c, v := range row {
				if v == "" {
					continue
				}
				ref, _ := excelize.CoordinatesToCellName(c+1, r+1)
				if isDate(f, s, ref) {
					// The report's own date and time: the same report made a
					// minute later differs only here.
					v = "(a date or time)"
				}
				fmt.Fprintf(out, "%s!%s\t%s\n", s, ref, strings.ReplaceAll(v, "\n", `\n`))
			}
		}
	}
	return nil
}

// isDate tells whether a cell is shown as a date or a time: a built-in
// number format 14–22 or 45–47 (ECMA-376 Part 1, 18.8.30 numFmt), or a
// custom format with day, month, year, hour or second codes outside quotes
// and brackets (common practice).
func isDate(f *excelize.File, sheet, ref string) bool {
	id, err := f.GetCellStyle(sheet, ref)
	if err != nil || id == 0 {
		return false
	}
	st, err := f.GetStyle(id)
	if err != nil || st == nil {
		return false
	}
	if (st.NumFmt >= 14 && st.NumFmt <= 22) || (st.NumFmt >= 45 && st.NumFmt <= 47) {
		return true
	}
	if st.CustomNumFmt == nil {
		return false
	}
	quoted, bracket := false, false
	for _, r := range strings.ToLower(*st.CustomNumFmt) {
		switch {
		case r == '"':
			quoted = !quoted
		case quoted:
		case r == '[':
			bracket = true
		case r == ']':
			bracket = false
		case bracket:
		case strings.ContainsRune("dmyhs", r):
			return true
		}
	}
	return false
}
