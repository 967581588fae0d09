// Package series is a trial series: the same entries tested in several
// trials (sites, seasons), summarised across them.
//
// A Series names its trial files and the options of its analysis and is
// kept in a small JSON file of our own (Decode/Encode, with a schema
// version; Load and Save resolve trial paths relative to the series file
// and say which trial file is missing or has changed since it was added).
//
// Analyze takes one Site per trial (a trait's plot data classified by
// trial/analysis, or a table of site means), matches entries by treatment
// code, analyses every site with trial/analysis, tests the homogeneity of
// the site error variances, and analyses the series with stats/series:
// the combined ANOVA of the plots when the series is balanced, otherwise
// the two-stage analysis of the site means. It adds the means across
// sites with letters and percent of check, stability, head-to-head
// comparisons with the check, and warnings. Result is what every view of
// a series renders (the command line, the workbook, the window).
package series
