#!/usr/bin/python3
"""Generate studentized-range-scipy.csv: reference CDF, survival and density
values of the studentised range distribution from scipy.stats.studentized_range.

Run with the Debian python3 (python3-scipy, scipy 1.10.1):

    /usr/bin/python3 gen_srange_fixture.py > studentized-range-scipy.csv

For every (k, df) in the grid, q is taken at the scipy quantiles for the
probabilities in PROBS (the quantile only chooses the evaluation point; the
reference values are scipy's cdf, sf and pdf at that exact q, printed with
17 significant digits).

A point is dropped when scipy's own cdf/sf at the returned quantile misses
the requested tail probability by more than 1% (relative): there scipy's
quadrature has failed (it happens for df = 1 at tail probabilities near 1e-7,
where scipy returns a survival of about 5e-11 whatever k is). scipy's pdf is
written for information only: in the extreme upper tail at df = 1 it is
wrong (for k = 2, df = 1, q = 7407 it gives 3.6e-33, while the exact value
from the t relation is about 1.6e-8), so the Go tests use cdf and sf only.
"""
import math
import sys

import scipy
from scipy.stats import studentized_range as sr

KS = [2, 3, 5, 10, 20, 50, 100, 300, 1000]
DFS = [1, 2, 3, 5, 10, 20, 60, 120, 880, 1e4, math.inf]
PROBS = [1e-6, 0.01, 0.1, 0.5, 0.9, 0.99, 0.9999, 1 - 1e-7]


def fmt(x):
    return repr(float(x))


def main():
    sys.stdout.write("# scipy %s scipy.stats.studentized_range\n" % scipy.__version__)
    sys.stdout.write("k,df,q,cdf,sf,pdf\n")
    seen = set()
    for k in KS:
        for df in DFS:
            for p in PROBS:
                q = float(sr.ppf(p, k, df))
                if not math.isfinite(q) or q <= 0:
                    continue
                q = float("%.6g" % q)
                if (k, df, q) in seen:
                    continue
                seen.add((k, df, q))
                c = sr.cdf(q, k, df)
                s = sr.sf(q, k, df)
                tail = min(p, 1 - p)
                got = c if p <= 0.5 else s
                if abs(got - tail) > 0.01 * tail:
                    sys.stderr.write("dropped k=%d df=%g p=%g q=%g\n" % (k, df, p, q))
                    continue
                d = sr.pdf(q, k, df)
                dfs = "inf" if math.isinf(df) else "%g" % df
                sys.stdout.write("%d,%s,%s,%s,%s,%s\n" % (k, dfs, fmt(q), fmt(c), fmt(s), fmt(d)))
                sys.stdout.flush()


if __name__ == "__main__":
    main()
