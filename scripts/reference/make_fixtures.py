#!/usr/bin/env python3
"""Reference fixtures for ohmbook's modelling and cleaning primitives.

Writes JSON files into test/fixtures/reference/ that the vitest suites read, so CI needs
neither Python nor R. Every input array is generated here from a fixed seed and written into
the fixture next to the expected outputs, so the TypeScript tests use exactly these inputs.

Reference libraries (Debian packages): numpy, mpmath (high-precision t quantiles), scipy (scipy.stats.t, scipy.signal.savgol_coeffs,
scipy.signal.savgol_filter, scipy.optimize), statsmodels (OLS, WLS, get_prediction).

Rerun (from the repository root):
    apt-get install -y python3-scipy python3-statsmodels python3-mpmath
    /usr/bin/python3 scripts/reference/make_fixtures.py
Use Debian's /usr/bin/python3 explicitly: a pyenv python earlier on PATH may lack these packages.
The library versions used are recorded in each fixture's "generator" block.
"""
import json
import os
import sys

import mpmath as mp
import numpy as np
import scipy
import statsmodels
import statsmodels.api as sm
from scipy import optimize, signal, stats

OUT = os.path.join(os.path.dirname(__file__), "..", "..", "test", "fixtures", "reference")
GENERATOR = {
    "script": "scripts/reference/make_fixtures.py",
    "python": sys.version.split()[0],
    "numpy": np.__version__,
    "scipy": scipy.__version__,
    "statsmodels": statsmodels.__version__,
    "mpmath": mp.__version__,
}


def write(name, payload):
    payload = {"generator": GENERATOR, **payload}
    path = os.path.join(OUT, name)
    with open(path, "w") as f:
        json.dump(payload, f, indent=1)
        f.write("\n")
    print("wrote", os.path.normpath(path))


def tolist(a):
    return [float(v) for v in np.asarray(a).ravel()]


# ---------------------------------------------------------------- Student t
def student_t():
    dfs = [1, 2, 3, 4.5, 5, 10, 30, 100, 1000, 8750]
    ps = [1e-9, 0.001, 0.025, 0.1, 0.4, 0.6, 0.9, 0.95, 0.975, 0.995, 0.999999]
    # scipy 1.10's t.ppf is off by up to ~4e-9 (e.g. p=0.1, df=3: its own cdf at the returned
    # point is 0.10000000036), so quantiles are solved to 40 digits with mpmath on the exact
    # incomplete-beta form; scipy's value is kept beside it for comparison.
    mp.mp.dps = 40

    def t_quantile(p, df):
        q = min(p, 1 - p)
        f = lambda t: mp.betainc(mp.mpf(df) / 2, mp.mpf(1) / 2, 0, df / (df + t * t), regularized=True) / 2 - mp.mpf(q)
        t = mp.findroot(f, abs(stats.t.ppf(p, df)))
        return float(t if p > 0.5 else -t)

    quantiles = [{"p": p, "df": df, "t": t_quantile(p, df), "scipyPpf": float(stats.t.ppf(p, df))}
                 for df in dfs for p in ps]
    ts = [-40.0, -3.0, -1.0, -0.1, 0.0, 0.5, 2.0, 6.0]
    cdf = [{"t": t, "df": df, "cdf": float(stats.t.cdf(t, df)), "twoSidedP": float(2 * stats.t.sf(abs(t), df))}
           for df in dfs for t in ts]
    write("student-t.json", {"source": "quantiles: mpmath findroot on betainc (40 digits); cdf: scipy.stats.t.cdf / sf", "quantiles": quantiles, "cdf": cdf})


# ---------------------------------------------------------------- OLS / WLS
def ols_case(name, x, y, intercept, weights=None, predict_at=None, levels=(0.8, 0.95)):
    X = sm.add_constant(x, has_constant="add") if intercept else x
    model = sm.WLS(y, X, weights=weights) if weights is not None else sm.OLS(y, X)
    res = model.fit()
    preds = []
    for row in predict_at or []:
        ex = np.atleast_2d(np.concatenate([[1.0], row]) if intercept else np.asarray(row, dtype=float))
        for level in levels:
            kw = {"weights": np.array([1.0])} if weights is not None else {}
            fr = res.get_prediction(ex, **kw).summary_frame(alpha=1 - level)
            preds.append({
                "x": tolist(row), "level": level,
                "fit": float(fr["mean"].iloc[0]),
                "seMean": float(fr["mean_se"].iloc[0]),
                "lower": float(fr["obs_ci_lower"].iloc[0]),
                "upper": float(fr["obs_ci_upper"].iloc[0]),
            })
    return {
        "name": name,
        "intercept": intercept,
        "x": [tolist(r) for r in np.atleast_2d(x.T).T] if x.ndim == 2 else [[float(v)] for v in x],
        "y": tolist(y),
        "weights": None if weights is None else tolist(weights),
        "expected": {
            "coefficients": tolist(res.params),
            "standardErrors": tolist(res.bse),
            "tValues": tolist(res.tvalues),
            "pValues": tolist(res.pvalues),
            "residualStdError": float(np.sqrt(res.scale)),
            "rSquared": float(res.rsquared),
            "adjRSquared": float(res.rsquared_adj),
            "dfResidual": float(res.df_resid),
            "sse": float(res.ssr),
        },
        "predictions": preds,
    }


def ols():
    rng = np.random.default_rng(20240601)
    cases = []
    # Simple regression: monthly use vs temperature.
    t = np.sort(rng.uniform(25, 85, 14))
    y = 400 - 3.2 * t + rng.normal(0, 12, t.size)
    cases.append(ols_case("simple", t.reshape(-1, 1), y, True, predict_at=[[20.0], [55.0], [90.0]]))
    # Ill-conditioned: T and T² with T far from zero (cond(X) ~ 1e5).
    t2 = rng.uniform(30, 90, 40)
    X2 = np.column_stack([t2, t2 ** 2, rng.normal(0, 1, t2.size)])
    y2 = 50 + 0.8 * t2 - 0.01 * t2 ** 2 + 3 * X2[:, 2] + rng.normal(0, 0.5, t2.size)
    cases.append(ols_case("quadratic-offset", X2, y2, True, predict_at=[[60.0, 3600.0, 0.5]]))
    # Through the origin.
    x3 = rng.uniform(1, 10, 9)
    y3 = 2.5 * x3 + rng.normal(0, 0.3, x3.size)
    cases.append(ols_case("no-intercept", x3.reshape(-1, 1), y3, False, predict_at=[[5.0]]))
    # Weighted by billing days.
    t4 = rng.uniform(20, 80, 12)
    days = rng.integers(27, 35, 12).astype(float)
    y4 = 120 + 1.5 * np.maximum(t4 - 60, 0) + rng.normal(0, 4, 12) / np.sqrt(days / 30)
    cases.append(ols_case("weighted", t4.reshape(-1, 1), y4, True, weights=days, predict_at=[[40.0], [75.0]]))
    write("ols.json", {"source": "statsmodels OLS/WLS fit() and get_prediction().summary_frame()", "cases": cases})


# ---------------------------------------------------------------- change-point
def design(kind, t, bps):
    if kind == "3PH":
        cols = [np.minimum(t - bps[0], 0)]
    elif kind == "3PC":
        cols = [np.maximum(t - bps[0], 0)]
    elif kind == "4P":
        cols = [np.minimum(t - bps[0], 0), np.maximum(t - bps[0], 0)]
    elif kind == "5P":
        cols = [np.minimum(t - bps[0], 0), np.maximum(t - bps[1], 0)]
    else:
        raise ValueError(kind)
    return sm.add_constant(np.column_stack(cols), has_constant="add")


def sse(kind, t, y, w, bps):
    X = design(kind, t, bps)
    return float(sm.WLS(y, X, weights=w).fit().ssr)


def best_breakpoints(kind, t, y, w, min_pts=3):
    """Segment rule as in ohmbook: at least min_pts temperatures at or below the lower
    breakpoint and at or above the upper one.
    Exact search: on each interval between sorted temperatures the active set is fixed and
    SSE is smooth in the breakpoint, so a bounded 1-D minimisation per interval (or a bounded
    2-D one per pair of intervals for 5P) finds the global minimum."""
    s = np.sort(t)
    n = s.size
    knots = s[min_pts - 1: n - min_pts + 1]
    intervals = [(knots[i], knots[i + 1]) for i in range(len(knots) - 1)]
    best = (np.inf, None)
    if kind != "5P":
        for a, b in intervals:
            r = optimize.minimize_scalar(lambda v: sse(kind, t, y, w, [v]), bounds=(a, b), method="bounded",
                                         options={"xatol": 1e-10})
            for v, f in ((r.x, r.fun), (a, sse(kind, t, y, w, [a])), (b, sse(kind, t, y, w, [b]))):
                if f < best[0] and np.sum(t <= v) >= min_pts and np.sum(t >= v) >= min_pts:
                    best = (f, [float(v)])
    else:
        for i, (a1, b1) in enumerate(intervals):
            for a2, b2 in intervals[i:]:
                x0 = [(a1 + b1) / 2, (a2 + b2) / 2]
                if x0[0] >= x0[1]:
                    continue
                r = optimize.minimize(lambda v: sse(kind, t, y, w, v), x0, method="L-BFGS-B",
                                      bounds=[(a1, b1), (a2, b2)], options={"ftol": 1e-15, "gtol": 1e-12})
                v = r.x
                if v[0] < v[1] and r.fun < best[0] and np.sum(t <= v[0]) >= min_pts and np.sum(t >= v[1]) >= min_pts:
                    best = (float(r.fun), [float(v[0]), float(v[1])])
    return best[1], best[0]


def change_point():
    rng = np.random.default_rng(1050)
    cases = []
    specs = [
        ("3PH", lambda T: 60 + 3.0 * np.maximum(56 - T, 0), 4.0, False),
        ("3PH", lambda T: 60 + 3.0 * np.maximum(56 - T, 0), 4.0, True),
        ("3PC", lambda T: 80 + 4.5 * np.maximum(T - 64, 0), 5.0, False),
        ("4P", lambda T: 90 + 4.0 * np.minimum(T - 58, 0) * -1 + 1.0 * np.maximum(T - 58, 0) * -1, 3.0, False),
        ("5P", lambda T: 70 + 3.5 * np.maximum(52 - T, 0) + 5.0 * np.maximum(T - 68, 0), 4.0, False),
    ]
    for kind, truth, noise, weighted in specs:
        t = np.round(rng.uniform(22, 88, 24), 3)
        days = rng.integers(28, 33, t.size).astype(float)
        y = truth(t) + rng.normal(0, noise, t.size)
        w = days if weighted else np.ones(t.size)
        bps, best_sse = best_breakpoints(kind, t, y, w)
        X = design(kind, t, bps)
        res = (sm.WLS(y, X, weights=w) if weighted else sm.OLS(y, X)).fit()
        cases.append({
            "kind": kind, "weighted": weighted,
            "temp": tolist(t), "usePerDay": tolist(y), "days": tolist(days),
            "minPointsPerSegment": 3,
            "expected": {
                "breakpoints": bps, "sse": best_sse,
                "coefficients": tolist(res.params), "standardErrors": tolist(res.bse),
                "tValues": tolist(res.tvalues), "fitted": tolist(res.fittedvalues),
            },
        })
    write("change-point.json", {
        "source": "breakpoints: scipy.optimize bounded minimisation of SSE per data interval; "
                  "coefficients: statsmodels OLS/WLS with the breakpoints fixed",
        "cases": cases,
    })


# ---------------------------------------------------------------- Savitzky–Golay
def savgol():
    coeffs = []
    for w, k, d, pos in [(5, 2, 0, None), (7, 2, 0, None), (9, 2, 0, None), (5, 2, 1, None), (7, 2, 1, None),
                         (5, 3, 1, None), (7, 3, 2, None), (11, 4, 0, None), (21, 6, 1, None), (25, 5, 3, None),
                         (7, 2, 0, 1), (9, 3, 1, 0), (5, 4, 0, None)]:
        c = signal.savgol_coeffs(w, k, deriv=d, pos=pos, use="dot")
        coeffs.append({"window": w, "order": k, "deriv": d, "pos": pos, "coefficients": tolist(c)})
    rng = np.random.default_rng(1964)
    x = np.linspace(0, 6, 60)
    values = 10 + 3 * np.sin(x) + 0.5 * x + rng.normal(0, 0.3, x.size)
    filters = []
    for w, k, d, delta in [(7, 2, 0, 1.0), (11, 3, 1, 0.5), (5, 2, 2, 1.0), (9, 4, 0, 1.0), (15, 2, 1, 1.0)]:
        out = signal.savgol_filter(values, w, k, deriv=d, delta=delta, mode="interp")
        filters.append({"window": w, "order": k, "deriv": d, "delta": delta, "mode": "interp", "output": tolist(out)})
    write("savitzky-golay.json", {
        "source": "scipy.signal.savgol_coeffs(use='dot') and savgol_filter(mode='interp')",
        "coefficients": coeffs, "values": tolist(values), "filters": filters,
    })


if __name__ == "__main__":
    os.makedirs(OUT, exist_ok=True)
    student_t()
    ols()
    change_point()
    savgol()
