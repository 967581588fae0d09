package ui

import (
	"context"
	"io"

	"furlong/export/pdf"
	"furlong/export/xlsx"
	"furlong/trial"
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
// PDF season report (analyseForReport: each entry compared with the trial's
// check when it has one, and the saved contrasts).
func writeReportPDF(ctx context.Context, w io.Writer, t *trial.Trial, keys []string, opts xlsx.ReportOptions, progress func(int, int)) error {
	results, err := analyseForReport(ctx, t, keys, opts)
	if err != nil {
		return err
	}
	steps := len(keys)
	if progress != nil {
		progress(steps, 2*steps+1)
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
