#!/usr/bin/python3
"""Generate studentized-range-scipy.csv: reference CDF, survival and density
values of the studentised range distribution from scipy.stats.studentized_range.

Run with the Debian python3 (python3-scipy, scipy 1.10.1):

    /usr/bin/python3 gen_srange_fixture.py > studentized-range-scipy.csv

For every (k, df) in the grid, q is taken at the scipy quantiles for the
probabilities in PROBS (the quantile only chooses the evaluation point; the
reference values are scipy's cdf, sf and pdf at that exact q, printed with
17 significant digits).
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
    for k in KS:
        for df in DFS:
            for p in PROBS:
                q = float(sr.ppf(p, k, df))
                if not math.isfinite(q) or q <= 0:
                    continue
                q = float("%.6g" % q)
                c = sr.cdf(q, k, df)
                s = sr.sf(q, k, df)
                d = sr.pdf(q, k, df)
                dfs = "inf" if math.isinf(df) else "%g" % df
                sys.stdout.write("%d,%s,%s,%s,%s,%s\n" % (k, dfs, fmt(q), fmt(c), fmt(s), fmt(d)))
                sys.stdout.flush()


if __name__ == "__main__":
    main()
