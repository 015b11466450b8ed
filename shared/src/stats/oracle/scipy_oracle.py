#!/usr/bin/python3
"""Live reference oracle for the Ratewarden statistics core.

Reads {"cases": [{"id": ..., "kind": ..., ...}]} as JSON on stdin and prints
{"results": [{"id": ..., ...values}]} computed with SciPy (Debian's python3-scipy), so the
TypeScript core can be compared with an independent, general-purpose numeric library.
Run with Debian's interpreter: /usr/bin/python3 scipy_oracle.py < cases.json
Infinite values are written as the strings "Infinity"/"-Infinity", undefined as null.
"""
import json
import math
import sys

from scipy import optimize, stats
from scipy.stats import contingency


def enc(x):
    if x is None:
        return None
    x = float(x)
    if math.isnan(x):
        return None
    if math.isinf(x):
        return "Infinity" if x > 0 else "-Infinity"
    return x


def poisson_exact(x, conf):
    alpha = 1 - conf
    # Garwood 1936: chi-square quantiles / 2
    lower = 0.0 if x == 0 else stats.chi2.ppf(alpha / 2, 2 * x) / 2
    upper = stats.chi2.ppf(1 - alpha / 2, 2 * x + 2) / 2
    return lower, upper


def poisson_midp(x, conf):
    half = (1 - conf) / 2
    lo_eq = lambda mu: stats.poisson.sf(x, mu) + stats.poisson.pmf(x, mu) / 2 - half
    up_eq = lambda mu: stats.poisson.cdf(x - 1, mu) + stats.poisson.pmf(x, mu) / 2 - half
    el, eu = poisson_exact(x, conf)
    lower = 0.0 if x == 0 else optimize.brentq(lo_eq, el, x, xtol=1e-300, rtol=1e-15, maxiter=500)
    upper = optimize.brentq(up_eq, max(x, 1e-300), eu, xtol=1e-300, rtol=1e-15, maxiter=500)
    return lower, upper


def binom_midp_odds(a, m, conf):
    half = (1 - conf) / 2
    lo_eq = lambda t: stats.binom.sf(a, m, 1 / (1 + math.exp(-t))) + stats.binom.pmf(a, m, 1 / (1 + math.exp(-t))) / 2 - half
    up_eq = lambda t: stats.binom.cdf(a - 1, m, 1 / (1 + math.exp(-t))) + stats.binom.pmf(a, m, 1 / (1 + math.exp(-t))) / 2 - half

    def bracket(f):
        lo, hi = -1.0, 1.0
        while f(lo) * f(hi) > 0:
            lo, hi = lo * 2, hi * 2
        return lo, hi

    lower = 0.0 if a == 0 else math.exp(optimize.brentq(lo_eq, *bracket(lo_eq), xtol=1e-14, rtol=1e-15, maxiter=500))
    upper = math.inf if a == m else math.exp(optimize.brentq(up_eq, *bracket(up_eq), xtol=1e-14, rtol=1e-15, maxiter=500))
    return lower, upper


def rates(c):
    a, t1, b, t0, conf = c["a"], c["t1"], c["b"], c["t0"], c["conf"]
    m = a + b
    alpha = 1 - conf
    z = stats.norm.ppf(1 - alpha / 2)
    ratio = t0 / t1
    # exact conditional: Clopper-Pearson via beta.ppf
    pl = 0.0 if a == 0 else stats.beta.ppf(alpha / 2, a, b + 1)
    pu = 1.0 if b == 0 else stats.beta.ppf(1 - alpha / 2, a + 1, b)
    exact = (pl / (1 - pl) * ratio, math.inf if pu == 1 else pu / (1 - pu) * ratio)
    mid = binom_midp_odds(a, m, conf)
    p0 = t1 / (t1 + t0)
    lower_tail = stats.binom.cdf(a, m, p0)
    upper_tail = stats.binom.sf(a - 1, m, p0)
    pmf = stats.binom.pmf(a, m, p0)
    out = {
        "exactLower": exact[0], "exactUpper": exact[1],
        "midPLower": mid[0] * ratio, "midPUpper": mid[1] * ratio,
        "pExact": min(1.0, 2 * min(lower_tail, upper_tail)),
        "pMidP": min(1.0, 2 * min(lower_tail - pmf / 2, upper_tail - pmf / 2)),
        "pExactMinLikelihood": stats.binomtest(a, m, p0).pvalue,
    }
    if a > 0 and b > 0:
        irr = (a / t1) / (b / t0)
        se = math.sqrt(1 / a + 1 / b)
        out.update({"estimate": irr, "waldLower": irr * math.exp(-z * se), "waldUpper": irr * math.exp(z * se),
                    "pWald": 2 * stats.norm.sf(abs(math.log(irr) / se))})
    ird = a / t1 - b / t0
    se_d = math.sqrt(a / t1 ** 2 + b / t0 ** 2)
    out.update({"ird": ird, "irdLower": ird - z * se_d, "irdUpper": ird + z * se_d, "irdP": 2 * stats.norm.sf(abs(ird / se_d))})
    return out


def poisson(c):
    lo, up = poisson_exact(c["x"], c["conf"])
    mlo, mup = poisson_midp(c["x"], c["conf"])
    e = c.get("expected", 1.0)
    return {"exactLower": lo / e, "exactUpper": up / e, "midPLower": mlo / e, "midPUpper": mup / e}


def risks(c):
    a, b, cc, d, conf = c["a"], c["b"], c["c"], c["d"], c["conf"]
    n1, n0 = a + b, cc + d
    alpha = 1 - conf
    z = stats.norm.ppf(1 - alpha / 2)
    table = [[a, b], [cc, d]]
    out = {}
    w1 = stats.binomtest(a, n1).proportion_ci(confidence_level=conf, method="wilson")
    w0 = stats.binomtest(cc, n0).proportion_ci(confidence_level=conf, method="wilson")
    p1, p0 = a / n1, cc / n0
    rd = p1 - p0
    # Newcombe (1998) method 10 from SciPy's Wilson limits
    out["newcombeLower"] = rd - math.sqrt((p1 - w1.low) ** 2 + (w0.high - p0) ** 2)
    out["newcombeUpper"] = rd + math.sqrt((w1.high - p1) ** 2 + (p0 - w0.low) ** 2)
    if a > 0 and cc > 0:
        rr = contingency.relative_risk(a, n1, cc, n0)
        ci = rr.confidence_interval(confidence_level=conf)
        out.update({"rr": rr.relative_risk, "katzLower": ci.low, "katzUpper": ci.high})
    if min(a, b, cc, d) > 0:
        o = contingency.odds_ratio(table, kind="sample")
        ci = o.confidence_interval(confidence_level=conf)
        out.update({"or": o.statistic, "woolfLower": ci.low, "woolfUpper": ci.high})
    o = contingency.odds_ratio(table, kind="conditional")
    ci = o.confidence_interval(confidence_level=conf)
    out.update({"orExact": o.statistic, "orExactLower": ci.low, "orExactUpper": ci.high})
    out["pFisher"] = stats.fisher_exact(table).pvalue
    if min(n1, n0, a + cc, b + d) > 0:
        out["chi2"] = contingency.chi2_contingency(table, correction=False)[0]
        out["pChi2"] = contingency.chi2_contingency(table, correction=False)[1]
        out["chi2Yates"] = contingency.chi2_contingency(table, correction=True)[0]
        out["pChi2Yates"] = contingency.chi2_contingency(table, correction=True)[1]
    return out


HANDLERS = {"rates": rates, "poisson": poisson, "risks": risks}


def main():
    cases = json.load(sys.stdin)["cases"]
    results = []
    for c in cases:
        values = HANDLERS[c["kind"]](c)
        results.append({"id": c["id"], **{k: enc(v) for k, v in values.items()}})
    json.dump({"scipy": __import__("scipy").__version__, "results": results}, sys.stdout)


if __name__ == "__main__":
    main()
