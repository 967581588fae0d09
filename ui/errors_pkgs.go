package ui

import (
	"errors"
	"fmt"

	"furlong/export/chart"
	"furlong/stats"
	"furlong/trial/analysis"
	"furlong/trial/trialfile"
)

// explainPackages maps the typed and sentinel errors of the file, analysis
// and export packages to messages.
func explainPackages(action string, err error) (message, bool) {
	var perr *trialfile.ParseError
	var ierr *stats.InputError
	where := ""
	if errors.As(err, &perr) && perr.Line > 0 {
		where = fmt.Sprintf(" (line %d, column %d of the file)", perr.Line, perr.Column)
	}
	switch {
	case errors.Is(err, trialfile.ErrNotTrialFile):
		return message{action + ": the file is not a Furlong trial file.", "Check that you chose the right file: Furlong trial files end in .furlong and are written by Furlong. Field books (CSV or xlsx) are imported in the Record step."}, true
	case errors.Is(err, trialfile.ErrNewerVersion):
		return message{action + ": the file was written by a newer version of Furlong.", "Update Furlong to open it."}, true
	case errors.Is(err, trialfile.ErrTruncated):
		return message{action + ": the file ends in the middle; it may have been cut short while being copied or saved.",
			"Open the backup copy NAME.furlong.bak next to it, or copy the file again."}, true
	case errors.Is(err, trialfile.ErrSyntax), errors.Is(err, trialfile.ErrWrongType):
		return message{action + ": the file is damaged" + where + ".",
			"Open the backup copy NAME.furlong.bak next to it. If the file was edited by hand, undo the edit."}, true
	case errors.Is(err, trialfile.ErrDuplicatePlot), errors.Is(err, trialfile.ErrDuplicateTreatment),
		errors.Is(err, trialfile.ErrDuplicateTrait), errors.Is(err, trialfile.ErrUnknownTreatment),
		errors.Is(err, trialfile.ErrUnknownTrait), errors.Is(err, trialfile.ErrValueCount), errors.Is(err, trialfile.ErrValueKind):
		return message{action + ": " + lowerFirst(causeText(err)) + where,
			"The file does not hang together, which Furlong never writes; it may have been edited by hand. Open the backup copy NAME.furlong.bak next to it."}, true
	case errors.Is(err, analysis.ErrNoTrait):
		return message{action + ": the trait is no longer in the trial.", "Choose another trait."}, true
	case errors.As(err, &ierr):
		return message{action + ": " + lowerFirst(ierr.Error()), analysisAdvice(ierr.Kind)}, true
	case errors.Is(err, chart.ErrNoData):
		return message{action + ": there are no values to chart yet.", "Enter data in the Record step first."}, true
	case errors.Is(err, chart.ErrNoLayout):
		return message{action + ": the plots have no place in the field yet.", "Randomise the trial in the Field step first."}, true
	case errors.Is(err, chart.ErrFormat):
		return message{action + ": charts can be saved as PNG, SVG or PDF only.", "Give the file name one of the endings .png, .svg or .pdf."}, true
	case errors.Is(err, errAnalysisFailed), errors.Is(err, errChartFailed):
		return message{action + ": " + lowerFirst(err.Error()), "Check the values of this trait for mistakes; if they look right, report the problem with the trial file."}, true
	}
	return message{}, false
}

// causeText is the innermost message of a ParseError (without its place).
func causeText(err error) string {
	var perr *trialfile.ParseError
	if errors.As(err, &perr) && perr.Err != nil {
		return perr.Err.Error()
	}
	return err.Error()
}

// analysisAdvice says what to do about data the statistics cannot use.
func analysisAdvice(k stats.ErrorKind) string {
	switch k {
	case stats.NoData, stats.TooFewTreatments, stats.EmptyLevel, stats.NoErrorDF:
		return "Enter more values in the Record step, or take back exclusions."
	case stats.ZeroErrorVariance:
		return "Check that the values were not copied from one plot to the others."
	case stats.Confounded:
		return "Too many plots are missing or excluded in the same blocks; enter or restore some of them."
	}
	return "Check the values of this trait in the Record step."
}
