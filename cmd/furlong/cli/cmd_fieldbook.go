package cli

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"furlong/export/xlsx"
	"furlong/trial"
	"furlong/trial/fieldbook"
	"furlong/trial/trialfile"
)

func init() {
	register(&command{
		name:    "fieldbook",
		summary: "write the field book (CSV or xlsx) for recording plot data",
		usage:   "furlong fieldbook TRIAL -o BOOK.csv|BOOK.xlsx [--sep comma|semicolon|tab] [--decimal-comma] [--paper a4|letter]",
		details: `Writes one row per plot in walking order: plot, block, row, column, treatment, treatment_name,
then one column per recorded trait (empty, or the values already entered). The crew fills it in
and 'furlong import' reads it back. The xlsx form checks entries as they are typed (each trait's
valid range) and prints with the header on every page.
For spreadsheets set to a European locale, --sep semicolon --decimal-comma writes what they expect.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := fieldbookOptions{env: env}
			fs := flag.NewFlagSet("fieldbook", flag.ContinueOnError)
			fs.StringVar(&o.out, "o", "", "write the field book to this `file` (.csv or .xlsx; required)")
			fs.StringVar(&o.sep, "sep", "comma", "CSV cell separator: comma, semicolon or tab")
			fs.BoolVar(&o.decimalComma, "decimal-comma", false, "CSV: write decimal commas (5,23)")
			fs.StringVar(&o.paper, "paper", "a4", "xlsx: paper size, a4 or letter")
			fs.BoolVar(&o.force, "force", false, "replace the output file if it exists")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("fieldbook: give one trial file")
				}
				o.trial = args[0]
				return runFieldbook(ctx, o)
			}
		},
	})
	register(&command{
		name:    "import",
		summary: "read plot values from a filled-in field book into a trial",
		usage:   "furlong import TRIAL BOOK.csv|BOOK.xlsx [--overwrite] [--dry-run]",
		details: `Reads values back by plot number. First it reports what it would change: matched plots, unknown
plot numbers, duplicated rows, cells that are not numbers, values outside a trait's valid range,
and cells that would overwrite a different value already in the trial.

Nothing is changed, and the exit status is 1, while the report holds errors (unknown plots,
duplicated rows, cells that are not numbers, a different treatment than the trial's layout), or
while values would be overwritten without --overwrite. Values outside a trait's range are imported
and listed as warnings. Empty cells leave the trial's value as it is.
When the import goes ahead the trial is saved safely (the previous file is kept as TRIAL.bak).
Comma, semicolon and tab separated files are read (UTF-8, UTF-16 or Windows-1252 text, any line
endings, a "sep=;" first line); blank lines and empty cells past the last column are ignored.
Decimal commas are read in semicolon- and tab-separated books; in a comma-separated book a comma
inside a number ("8,490") is refused as ambiguous unless --decimal-comma is given. NA, N/A and "."
count as empty cells. An xlsx book is read from its first sheet (the report names it): cells show
what the spreadsheet shows (a percentage as a percentage); dates and true/false are refused.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			fs := flag.NewFlagSet("import", flag.ContinueOnError)
			o := importOptions{env: env}
			fs.BoolVar(&o.overwrite, "overwrite", false, "replace values already in the trial with different ones from the book")
			fs.BoolVar(&o.dryRun, "dry-run", false, "only print the report; change nothing")
			fs.BoolVar(&o.decimalComma, "decimal-comma", false, "CSV: the comma-separated book has decimal commas in quoted cells (\"5,23\")")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 2 {
					return usagef("import: give the trial file and the field book")
				}
				o.trial, o.book = args[0], args[1]
				return runImport(ctx, o)
			}
		},
	})
}

// fieldbookOptions are the choices of 'furlong fieldbook'.
type fieldbookOptions struct {
	env                    Env
	trial, out, sep, paper string
	decimalComma, force    bool
}

// runFieldbook writes the field book of o.trial to o.out (CSV or xlsx).
func runFieldbook(ctx context.Context, o fieldbookOptions) error {
	if o.out == "" {
		return usagef("fieldbook: say where to write the field book with -o FILE")
	}
	t, err := trialfile.Load(o.trial)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	switch strings.ToLower(filepath.Ext(o.out)) {
	case ".xlsx":
		p, err := parsePaper(o.paper)
		if err != nil {
			return err
		}
		err = xlsx.WriteFieldBook(&buf, t, xlsx.FieldBookOptions{Paper: p})
		if err != nil {
			return err
		}
	case ".csv", ".txt", ".tsv":
		fo := fieldbook.Options{DecimalComma: o.decimalComma}
		switch o.sep {
		case "comma", ",":
			fo.Comma = ','
		case "semicolon", ";":
			fo.Comma = ';'
		case "tab":
			fo.Comma = '\t'
		default:
			return usagef("fieldbook: --sep must be comma, semicolon or tab")
		}
		if err := fieldbook.WriteCSV(&buf, t, fo); err != nil {
			return err
		}
	default:
		return usagef("fieldbook: the output must end in .csv (or .txt, .tsv) or .xlsx")
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	if err := writeFileNew(o.out, buf.Bytes(), o.force); err != nil {
		return err
	}
	fmt.Fprintf(o.env.Stdout, "wrote the field book for %d plots to %s\n", len(t.Plots), o.out)
	return nil
}

func parsePaper(s string) (xlsx.Paper, error) {
	switch strings.ToLower(s) {
	case "a4":
		return xlsx.A4, nil
	case "letter":
		return xlsx.Letter, nil
	}
	return 0, usagef("--paper must be a4 or letter")
}

// readBook reads a CSV or xlsx field book.
func readBook(path string, o fieldbook.ReadOptions) (*fieldbook.Book, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	var b *fieldbook.Book
	if strings.EqualFold(filepath.Ext(path), ".xlsx") {
		b, err = xlsx.ReadBook(bufio.NewReader(f))
	} else {
		b, err = fieldbook.ReadBook(f, o)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: %w", path, err)
	}
	return b, nil
}

// importOptions are the choices of 'furlong import'.
type importOptions struct {
	env                             Env
	trial, book                     string
	overwrite, dryRun, decimalComma bool
}

// runImport reads the values of the field book o.book into the trial
// o.trial. The read-modify-write of the trial holds the trial file's
// exclusive lock (trialfile.Update), so two imports at once, or an import
// and a save in the window, never lose each other's values. A trial open
// in a window is named on stderr, and the import goes ahead.
func runImport(ctx context.Context, o importOptions) error {
	env, trialPath, bookPath, overwrite, dry := o.env, o.trial, o.book, o.overwrite, o.dryRun
	if _, err := os.Stat(trialPath); err != nil {
		return err
	}
	book, err := readBook(bookPath, fieldbook.ReadOptions{DecimalComma: o.decimalComma})
	if err != nil {
		return err
	}
	warnOpen(env, trialPath)
	var n int
	nothing := false
	err = trialfile.Update(ctx, trialPath, func(t *trial.Trial) error {
		plan, err := fieldbook.PlanBook(t, book)
		if err != nil {
			return fmt.Errorf("%s: %w", bookPath, err)
		}
		if err := plan.WriteReport(env.Stdout, overwrite); err != nil {
			return err
		}
		if plan.HasErrors(overwrite) {
			msg := "nothing was imported: fix the errors listed above and run the import again"
			if len(plan.Errors()) == 0 {
				msg = "nothing was imported: some cells would replace different values already in the trial; check them, then run again with --overwrite to replace them"
			}
			return &ExitError{Code: ExitFailure, Msg: msg}
		}
		if len(plan.Changes()) == 0 {
			nothing = true
			return errLeaveAsIs
		}
		if dry {
			return errLeaveAsIs
		}
		if err := ctx.Err(); err != nil {
			return err
		}
		n, err = plan.Apply(t, overwrite)
		if err != nil {
			return err
		}
		if n == 0 {
			nothing = true
			return errLeaveAsIs
		}
		touch(t)
		return nil
	})
	var ee *ExitError
	switch {
	case errors.Is(err, errLeaveAsIs) && nothing:
		fmt.Fprintln(env.Stdout, "the trial file was left as it was")
		return nil
	case errors.Is(err, errLeaveAsIs):
		fmt.Fprintln(env.Stdout, "dry run: the trial was not changed")
		return nil
	case errors.As(err, &ee), errors.Is(err, context.Canceled):
		return err
	case err != nil && n > 0:
		// The values were applied to the copy in memory, but the file could
		// not be written: say plainly that the import did not happen.
		return fmt.Errorf("nothing was imported: %s; the trial file is as it was before the import", Message(err))
	case err != nil:
		return err
	}
	fmt.Fprintf(env.Stdout, "imported %d values into %s (the previous file is kept as %s.bak)\n", n, trialPath, trialPath)
	return nil
}

// errLeaveAsIs ends a trialfile.Update without saving.
var errLeaveAsIs = errors.New("nothing to save")

// warnOpen says on stderr when a Furlong window has the trial open.
func warnOpen(env Env, path string) {
	p, err := trialfile.ReadPresence(path)
	if err != nil || p == nil || p.Mine {
		return
	}
	if p.Stale {
		fmt.Fprintf(env.Stderr, "note: %s was marked as open in a Furlong window by %s; that window seems to be gone, so the mark is ignored\n", path, p)
		return
	}
	fmt.Fprintf(env.Stderr, "warning: %s is open in a Furlong window (%s). The import goes ahead and saves the file; that window finds the new values when it saves or reloads the trial\n", path, p)
}

func touch(t *trial.Trial) { t.Modified = nowFunc() }

// writeFileNew writes data to path, refusing to replace an existing file
// unless force is set.
func writeFileNew(path string, data []byte, force bool) error {
	if !force {
		if _, err := os.Stat(path); err == nil {
			return fmt.Errorf("%s already exists; choose another name or add --force to replace it", path)
		}
	}
	tmp, err := os.CreateTemp(filepath.Dir(path), ".furlong-out-*")
	if err != nil {
		return err
	}
	// CreateTemp makes the file private; an export is an ordinary document.
	if err := tmp.Chmod(0o644); err != nil {
		tmp.Close()
		os.Remove(tmp.Name())
		return err
	}
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		os.Remove(tmp.Name())
		return err
	}
	if err := tmp.Close(); err != nil {
		os.Remove(tmp.Name())
		return err
	}
	return os.Rename(tmp.Name(), path)
}
