// Package diag checks the assumptions behind the analysis of variance of a
// field trial: normality of the residuals (Shapiro–Wilk), equal variances
// between treatments (Levene's test with median centring, Bartlett's test),
// additivity of block and treatment effects (Tukey's one degree of freedom
// test), and outlying plots (standardised residuals). Readings turns the
// numbers into plain-language warnings for the trial manager.
//
// Inputs are plain values (residuals, group indices, leverages), so the
// package does not depend on how the model was fitted. It imports only the
// standard library and gonum.
package diag
