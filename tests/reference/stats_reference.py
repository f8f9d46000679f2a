#!/usr/bin/env python3
"""Reference values for the Soundings statistics tests (shared/stats/reference.test.ts).

Reads a JSON list of cases from stdin and prints a JSON list of results in the same
order. Each case is {"stat": ..., "matrix": [[...]], ...options}; missing ratings are
null. Ratings are integer category codes 0..q-1 (or numbers for ICC/interval alpha).

Where a Debian-packaged library implements the statistic it is used:
  - sklearn.metrics.cohen_kappa_score          Cohen's kappa (unweighted/linear/quadratic)
  - statsmodels.stats.inter_rater.cohens_kappa  its standard error (Fleiss, Cohen & Everitt 1969)
  - statsmodels.stats.inter_rater.fleiss_kappa  Fleiss' kappa (complete data)
    with aggregate_raters
  - statsmodels.stats.proportion.proportion_confint(method="wilson")
  - scipy.special.betainc, scipy.stats.f.ppf, scipy.stats.norm.ppf
No Debian package provides Krippendorff's alpha, Gwet's AC1 / generalised Fleiss SE, or
the ICC with McGraw & Wong intervals, so those are written out below in numpy, on
purpose by a different route than the TypeScript code (alpha from explicit pairs of
values instead of a coincidence matrix; ICC from a least-squares ANOVA; scipy for F).

Needs Debian packages python3-statsmodels and python3-sklearn (which bring
python3-numpy, python3-scipy and python3-pandas).
"""
import itertools
import json
import sys

import numpy as np
from scipy import special, stats
from sklearn.metrics import cohen_kappa_score
from statsmodels.stats.inter_rater import aggregate_raters, cohens_kappa, fleiss_kappa
from statsmodels.stats.proportion import proportion_confint

Z = stats.norm.ppf(0.975)


def clip_ci(value, se):
    return [max(-1.0, value - Z * se), min(1.0, value + Z * se)]


def cohen(case):
    m = case["matrix"]
    q = case["q"]
    pairs = [(a, b) for a, b in m if a is not None and b is not None]
    y1 = [a for a, _ in pairs]
    y2 = [b for _, b in pairs]
    weights = {"unweighted": None, "linear": "linear", "quadratic": "quadratic"}[case["weights"]]
    value = cohen_kappa_score(y1, y2, labels=list(range(q)), weights=weights)
    table = np.zeros((q, q))
    for a, b in pairs:
        table[a, b] += 1
    res = cohens_kappa(table, wt=weights)
    se = float(np.sqrt(res.var_kappa))
    return {"value": float(value), "sm_value": float(res.kappa), "se": se, "ci95": clip_ci(float(value), se)}


def counts_of(case):
    q = case["q"]
    rows = []
    for row in case["matrix"]:
        c = np.zeros(q)
        for v in row:
            if v is not None:
                c[v] += 1
        rows.append(c)
    return np.array(rows)


def gwet_style(counts, kind, q):
    """Gwet (2014) generalised Fleiss kappa / AC1 with linearised variance, f = 0."""
    r = counts.sum(axis=1)
    counts = counts[r >= 1]
    r = r[r >= 1]
    n = len(r)
    two = r >= 2
    n2 = int(two.sum())
    pi = (counts / r[:, None]).mean(axis=0)
    pa_i = np.where(two, (counts * (counts - 1)).sum(axis=1) / np.where(two, r * (r - 1), 1), 0.0)
    pa = pa_i[two].mean()
    if kind == "fleiss":
        pe = float((pi ** 2).sum())
        pe_i = (counts / r[:, None]) @ pi
    else:
        pe = float((pi * (1 - pi)).sum() / (q - 1))
        pe_i = (counts / r[:, None]) @ (1 - pi) / (q - 1)
    value = (pa - pe) / (1 - pe)
    c_i = (n / n2) * (pa_i - pe * two) / (1 - pe)
    star = c_i - 2 * (1 - value) * (pe_i - pe) / (1 - pe)
    se = float(np.sqrt(((star - value) ** 2).sum() / (n * (n - 1))))
    return float(value), se


def fleiss(case):
    counts = counts_of(case)
    value, se = gwet_style(counts, "fleiss", case["q"])
    out = {"value": value, "se": se, "ci95": clip_ci(value, se)}
    if all(v is not None for row in case["matrix"] for v in row):
        table, _ = aggregate_raters(np.array(case["matrix"]), n_cat=case["q"])
        out["sm_value"] = float(fleiss_kappa(table, method="fleiss"))
    return out


def ac1(case):
    value, se = gwet_style(counts_of(case), "ac1", case["q"])
    return {"value": value, "se": se, "ci95": clip_ci(value, se)}


def percent(case):
    shares = []
    for row in case["matrix"]:
        vals = [v for v in row if v is not None]
        if len(vals) < 2:
            continue
        pairs = list(itertools.combinations(vals, 2))
        shares.append(sum(a == b for a, b in pairs) / len(pairs))
    return {"value": float(np.mean(shares)) if shares else None}


def alpha(case):
    """Krippendorff's alpha from explicit pairs of pairable values (Krippendorff 2011, eq. for D_o and D_e)."""
    level = case["level"]
    order = case.get("order")  # category values in order (ordinal ranks)
    units = [[v for v in row if v is not None] for row in case["matrix"]]
    units = [u for u in units if len(u) >= 2]
    values = [v for u in units for v in u]
    n = len(values)
    freq = {c: values.count(c) for c in set(values)}
    cats = sorted(freq) if order is None else order

    def d2(c, k):
        if c == k:
            return 0.0
        if level == "nominal":
            return 1.0
        if level == "interval":
            return float(c - k) ** 2
        if level == "ratio":
            return ((c - k) / (c + k)) ** 2 if c + k != 0 else 0.0
        i, j = sorted((cats.index(c), cats.index(k)))
        s = sum(freq.get(g, 0) for g in cats[i:j + 1])
        return (s - (freq[c] + freq[k]) / 2.0) ** 2

    do = sum(sum(d2(a, b) for a, b in itertools.permutations(u, 2)) / (len(u) - 1) for u in units) / n
    de = sum(d2(a, b) for a, b in itertools.permutations(values, 2)) / (n * (n - 1))
    return {"value": 1.0 - do / de}


def icc(case):
    x = np.array([row for row in case["matrix"] if all(v is not None for v in row)], dtype=float)
    n, k = x.shape
    # Two-way ANOVA by least squares on indicator columns, independent of the
    # mean-difference sums of squares used in the TypeScript code.
    y = x.ravel()
    design_r = np.kron(np.eye(n), np.ones((k, 1)))
    design_c = np.kron(np.ones((n, 1)), np.eye(k))

    def rss(design):
        beta, *_ = np.linalg.lstsq(design, y, rcond=None)
        return float(((y - design @ beta) ** 2).sum())

    sst = float(((y - y.mean()) ** 2).sum())
    ones = np.ones((n * k, 1))
    ssw = rss(design_r)
    ssr = sst - ssw
    ssc = sst - rss(design_c)
    sse = rss(np.hstack([design_r, design_c]))
    msr, msc = ssr / (n - 1), ssc / (k - 1)
    msw, mse = ssw / (n * (k - 1)), sse / ((n - 1) * (k - 1))
    model, unit = case["model"], case["unit"]
    fq = lambda d1, d2: stats.f.ppf(0.975, d1, d2)
    if model in ("oneway", "twoway-mixed"):
        err, df2 = (msw, n * (k - 1)) if model == "oneway" else (mse, (n - 1) * (k - 1))
        f = msr / err
        fl, fu = f / fq(n - 1, df2), f * fq(df2, n - 1)
        if unit == "single":
            return {"value": (msr - err) / (msr + (k - 1) * err),
                    "ci95": [(fl - 1) / (fl + k - 1), (fu - 1) / (fu + k - 1)]}
        return {"value": (msr - err) / msr, "ci95": [1 - 1 / fl, 1 - 1 / fu]}
    rho = (msr - mse) / (msr + (k - 1) * mse + k * (msc - mse) / n)
    a = k * rho / (n * (1 - rho))
    b = 1 + k * rho * (n - 1) / (n * (1 - rho))
    v = (a * msc + b * mse) ** 2 / ((a * msc) ** 2 / (k - 1) + (b * mse) ** 2 / ((n - 1) * (k - 1)))
    fs, fs2 = fq(n - 1, v), fq(v, n - 1)
    if unit == "single":
        value = rho
        lo = n * (msr - fs * mse) / (fs * (k * msc + (k * n - k - n) * mse) + n * msr)
        hi = n * (fs2 * msr - mse) / (k * msc + (k * n - k - n) * mse + n * fs2 * msr)
    else:
        # McGraw & Wong (1996) Table 7, case 2A, average measure, written out directly.
        value = (msr - mse) / (msr + (msc - mse) / n)
        lo = n * (msr - fs * mse) / (fs * (msc - mse) + n * msr)
        hi = n * (fs2 * msr - mse) / (msc - mse + n * fs2 * msr)
    return {"value": float(value), "ci95": [float(lo), float(hi)]}


def wilson(case):
    lo, hi = proportion_confint(case["successes"], case["n"], alpha=1 - case["confidence"], method="wilson")
    return {"ci": [float(lo), float(hi)]}


def dist(case):
    return {
        "betainc": float(special.betainc(case["a"], case["b"], case["x"])),
        "fppf": float(stats.f.ppf(case["p"], case["df1"], case["df2"])),
        "normppf": float(stats.norm.ppf(case["p"])),
    }


HANDLERS = {"cohen": cohen, "fleiss": fleiss, "ac1": ac1, "percent": percent, "alpha": alpha,
            "icc": icc, "wilson": wilson, "dist": dist}


def clean(x):
    """NaN/inf (statistic undefined) become null so the output stays valid JSON."""
    if isinstance(x, dict):
        return {k: clean(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [clean(v) for v in x]
    if isinstance(x, (float, np.floating)):
        return float(x) if np.isfinite(x) else None
    return x


def main():
    cases = json.load(sys.stdin)
    with np.errstate(all="ignore"):
        results = [clean(HANDLERS[c["stat"]](c)) for c in cases]
    json.dump(results, sys.stdout)


if __name__ == "__main__":
    main()
