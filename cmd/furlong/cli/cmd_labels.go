package cli

import (
	"bytes"
	"context"
	"flag"
	"fmt"
	"path/filepath"
	"strconv"
	"strings"

	"furlong/export/pdf"
	"furlong/trial/trialfile"
)

func init() {
	register(&command{
		name:    "labels",
		summary: "print plot labels with barcodes for stakes and seed bags (PDF)",
		usage:   "furlong labels TRIAL -o LABELS.pdf [--sheet COLSxROWS | --preset NAME] [--barcode code128|qr] [--paper a4|letter] [--top MM --left MM --gap-x MM --gap-y MM --label-size WxH] [--skip N]",
		details: `Writes a label per plot, in walking order (the field book's order), on sheets of labels: the plot
number, the block and treatment code, the trial title and a barcode of the plot number. A scanner
reading the barcode types the plot number and Enter, which the Record step's "Go to plot" box and the
field book's plot column accept.
Sheets: --preset names a common sheet (` + strings.Join(pdf.PresetNames(), ", ") + `);
--sheet COLSxROWS shares the page between the margins out (--top, --left, in mm; 10 and 5 by
default) with --gap-x/--gap-y between labels, or give --label-size WxH in mm. --skip N leaves the
first N labels of the first sheet empty, for a sheet already partly used.`,
		flags: func(env Env) (*flag.FlagSet, func(context.Context, []string) error) {
			o := labelOptions{env: env}
			fs := flag.NewFlagSet("labels", flag.ContinueOnError)
			fs.StringVar(&o.out, "o", "", "write the labels to this `file` (.pdf; required)")
			fs.StringVar(&o.sheet, "sheet", "", "labels per sheet as `COLSxROWS`, for example 3x8")
			fs.StringVar(&o.preset, "preset", "", "a common label sheet: "+strings.Join(pdf.PresetNames(), ", "))
			fs.StringVar(&o.barcode, "barcode", "code128", "barcode: code128 or qr")
			fs.StringVar(&o.paper, "paper", "", "paper size, a4 or letter (default a4, or the preset's)")
			fs.Float64Var(&o.top, "top", -1, "top margin to the first label, in `mm`")
			fs.Float64Var(&o.left, "left", -1, "left margin to the first label, in `mm`")
			fs.Float64Var(&o.gapX, "gap-x", -1, "space between labels across, in `mm`")
			fs.Float64Var(&o.gapY, "gap-y", -1, "space between labels down, in `mm`")
			fs.StringVar(&o.size, "label-size", "", "size of one label as `WxH` in mm, for example 70x36")
			fs.IntVar(&o.skip, "skip", 0, "leave the first `N` labels of the first sheet empty")
			fs.BoolVar(&o.force, "force", false, "replace the output file if it exists")
			return fs, func(ctx context.Context, args []string) error {
				if len(args) != 1 {
					return usagef("labels: give one trial file")
				}
				o.trial = args[0]
				return runLabels(ctx, o)
			}
		},
	})
}

type labelOptions struct {
	env                                       Env
	trial, out, sheet, preset, barcode, paper string
	size                                      string
	top, left, gapX, gapY                     float64
	skip                                      int
	force                                     bool
}

// labelSheet works out the sheet geometry from the options.
func labelSheet(o labelOptions) (pdf.Sheet, error) {
	s := pdf.Sheet{Paper: pdf.A4, Cols: 3, Rows: 8}
	if o.preset != "" {
		p, ok := pdf.SheetPresets[strings.ToLower(o.preset)]
		if !ok {
			return s, usagef("labels: --preset must be one of %s, not %q", strings.Join(pdf.PresetNames(), ", "), o.preset)
		}
		if o.sheet != "" {
			return s, usagef("labels: give --preset or --sheet, not both")
		}
		s = p
	}
	if o.sheet != "" {
		c, r, err := pdf.ParseSheet(o.sheet)
		if err != nil {
			return s, usagef("labels: %s", err)
		}
		s.Cols, s.Rows = c, r
	}
	if o.paper != "" {
		p, err := parsePaper(o.paper)
		if err != nil {
			return s, err
		}
		s.Paper = pdfPaper(p)
	}
	set := func(dst *float64, v float64) {
		if v >= 0 {
			*dst = v
		}
	}
	set(&s.Top, o.top)
	set(&s.Left, o.left)
	set(&s.GapX, o.gapX)
	set(&s.GapY, o.gapY)
	if o.size != "" {
		a, b, ok := strings.Cut(strings.ToLower(o.size), "x")
		w, err1 := strconv.ParseFloat(strings.TrimSpace(a), 64)
		h, err2 := strconv.ParseFloat(strings.TrimSpace(b), 64)
		if !ok || err1 != nil || err2 != nil || !(w > 0) || !(h > 0) {
			return s, usagef("labels: --label-size must be width x height in mm, for example 70x36, not %q", o.size)
		}
		s.Width, s.Height = w, h
	}
	return s, nil
}

// runLabels writes the plot labels of o.trial to o.out.
func runLabels(ctx context.Context, o labelOptions) error {
	if o.out == "" || !strings.EqualFold(filepath.Ext(o.out), ".pdf") {
		return usagef("labels: say where to write the labels with -o LABELS.pdf")
	}
	bc := pdf.Barcode(strings.ToLower(o.barcode))
	if bc != pdf.Code128 && bc != pdf.QR {
		return usagef("labels: --barcode must be code128 or qr, not %q", o.barcode)
	}
	s, err := labelSheet(o)
	if err != nil {
		return err
	}
	t, err := trialfile.Load(o.trial)
	if err != nil {
		return err
	}
	var buf bytes.Buffer
	if err := pdf.WriteLabels(&buf, t, pdf.LabelOptions{Sheet: s, Barcode: bc, Skip: o.skip}); err != nil {
		return err
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	if err := writeFileNew(o.out, buf.Bytes(), o.force); err != nil {
		return err
	}
	fmt.Fprintf(o.env.Stdout, "wrote %d plot labels to %s\n", len(t.Plots), o.out)
	return nil
}
