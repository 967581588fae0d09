// Package series analyses a series of trials: the same entries tested at
// several sites (or seasons), summarised across them.
//
// Like package stats it knows nothing of trials: inputs are responses with
// site, block and entry level indices, or a table of site means; outputs
// are tables. It imports gonum and the lower stats packages.
//
// # Combined analysis
//
// Combined analyses balanced plot data (every entry in every block of
// every site, the same number of blocks everywhere) with the classic
// combined analysis of variance of a series of randomised complete block
// trials (Gomez & Gomez 1984, Statistical Procedures for Agricultural
// Research, 2nd ed., ch. 8; Cochran & Cox 1957, Experimental Designs,
// §14.1):
//
//	site                 s−1
//	blocks within site   s(r−1)
//	entry                e−1
//	entry × site         (e−1)(s−1)
//	pooled error         s(r−1)(e−1)
//
// With sites random (the default: the sites stand for the region the
// entries are grown in) the entries are tested against the entry × site
// mean square and a mean's standard error is √(MS(entry×site)/(rs)); with
// sites fixed they are tested against the pooled error.
//
// # Two-stage analysis
//
// TwoStage analyses a table of site means (stage 1 done per site, for
// example each trial's least-squares means), complete or not, by the
// additive model mean = site + entry + residual, whose residual is the
// entry × site interaction and the error of the comparisons across sites
// (Smith, Cullis & Thompson 2005, J. Agric. Sci. 143, 449–462, describe the
// approach). Unweighted by default; optionally each mean is weighted by
// the inverse of its stage-1 variance.
//
// # Stability
//
// Finlay & Wilkinson (1963), Aust. J. Agric. Res. 14, 742–754: each
// entry's site means regressed on the site index (the mean of all entries
// at the site); Wricke's (1962) ecovalence: an entry's share of the
// entry × site sum of squares.
package series
