package ui

import (
	"context"
	"io"

	"furlong/export/pdf"
	"furlong/export/xlsx"
	"furlong/trial"
	"furlong/trial/analysis"
)

// pdfPaper is the PDF paper size of the Report step's choice.
func pdfPaper(p xlsx.Paper) pdf.Paper {
	if p == xlsx.Letter {
		return pdf.Letter
	}
	return pdf.A4
}

// exportReportPDF writes the season report as a PDF document, with the
// same choices as the workbook.
func (r *reportStep) exportReportPDF() {
	opts, keys := r.reportOptions()
	if len(keys) == 0 {
		r.state.SetText("Choose at least one trait for the report.")
		return
	}
	snap := cloneTrial(r.u.doc.t)
	name := safeFileName(snap.Title) + " report.pdf"
	r.u.exportDialog("season report", name, []string{".pdf"}, true, func(ctx context.Context, w io.Writer, _ string, progress func(int, int)) error {
		return writeReportPDF(ctx, w, snap, keys, opts, progress)
	})
}

// writeReportPDF analyses the chosen traits of a snapshot and writes the
// PDF season report, each entry compared with the trial's check when it
// has one.
func writeReportPDF(ctx context.Context, w io.Writer, t *trial.Trial, keys []string, opts xlsx.ReportOptions, progress func(int, int)) error {
	results, err := analysis.AnalyzeAll(ctx, t, keys, analysis.Options{Alpha: opts.Alpha, Method: opts.Method})
	if err != nil {
		return err
	}
	steps := len(keys)
	for i, o := range results {
		if o.Result != nil {
			if code := analysis.CheckOf(o.Result); code != "" && !o.Result.IsFactorial() {
				if vc, err := analysis.CompareWithCheck(o.Result, code); err == nil {
					o.Result.VsCheck = vc
				}
			}
		}
		if err := ctx.Err(); err != nil {
			return err
		}
		if progress != nil {
			progress(i+1, 2*steps+1)
		}
	}
	return pdf.WriteReport(ctx, w, t, results, pdf.ReportOptions{
		Method: opts.Method, Alpha: opts.Alpha, Traits: keys, Version: opts.Version,
		Charts: opts.Charts, Paper: pdfPaper(opts.Paper),
		Progress: func(done, total int) {
			if progress != nil && total > 0 {
				progress(steps+done*(steps+1)/total, 2*steps+1)
			}
		},
	})
}
