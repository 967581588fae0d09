// Package dist provides the studentized range distribution, which gonum's
// distuv lacks, for Tukey's honestly significant difference test: its
// distribution function, survival function, density and quantiles, and a
// precomputed survival table for evaluating many Tukey-adjusted p-values
// with the same number of means and error degrees of freedom.
package dist
