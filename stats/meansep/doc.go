// Package meansep separates treatment means after an analysis of variance:
// all pairwise differences with their standard errors, confidence
// intervals, unadjusted (LSD) and Tukey-adjusted p-values, the least and
// honestly significant differences of balanced trials, and compact letter
// displays in which treatments sharing a letter do not differ
// significantly.
//
// Inputs are plain values — least-squares means, a function giving the
// standard error of each difference, the error degrees of freedom — so the
// package is independent of how the model was fitted; *stats.ANOVA
// satisfies PairSEer.
package meansep
