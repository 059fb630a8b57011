#!/usr/bin/env python3
"""Reference fixtures for ohmbook's variable-base degree-day regression
(src/model/degreeDayRegression.ts).

Writes test/fixtures/reference/degree-day-regression.json. Inputs are generated here from a
fixed seed and written into the fixture beside the expected outputs, so the TypeScript tests
use exactly these inputs and CI needs no Python.

For each case: invented billing periods, each with a short run of hourly temperatures (°C) and
billing days; degree-days per day are the mean over the hours of max(0, base − T) (heating) and
max(0, T − base) (cooling), i.e. integration of the hourly values divided by 24 h per day.
Expected values:
- at the stated fixed base(s): statsmodels WLS (weights = billing days) fit() and
  get_prediction(..., weights=w0).summary_frame() for the observation interval;
- the searched base (heating-only and cooling-only cases): a dense scan of SSE(base) at 0.001 °C
  refined by scipy.optimize.minimize_scalar (bounded) around the best scan point, under the
  constraint that the slope is positive.

Rerun (from the repository root):
    apt-get install -y python3-scipy python3-statsmodels
    /usr/bin/python3 scripts/reference/make_degree_day_fixtures.py
Use Debian's /usr/bin/python3 explicitly: a pyenv python earlier on PATH may lack these packages.
"""
import json
import os
import sys

import numpy as np
import scipy
import statsmodels
import statsmodels.api as sm
from scipy import optimize

OUT = os.path.join(os.path.dirname(__file__), "..", "..", "test", "fixtures", "reference")
GENERATOR = {
    "script": "scripts/reference/make_degree_day_fixtures.py",
    "python": sys.version.split()[0],
    "numpy": np.__version__,
    "scipy": scipy.__version__,
    "statsmodels": statsmodels.__version__,
}


def tolist(a):
    return [float(v) for v in np.asarray(a).ravel()]


def hdd_per_day(temps, base):
    return float(np.mean(np.maximum(base - np.asarray(temps), 0.0)))


def cdd_per_day(temps, base):
    return float(np.mean(np.maximum(np.asarray(temps) - base, 0.0)))


def design(form, periods, th, tc):
    cols = []
    if form in ("HO", "HC"):
        cols.append([hdd_per_day(p, th) for p in periods])
    if form in ("CO", "HC"):
        cols.append([cdd_per_day(p, tc) for p in periods])
    return sm.add_constant(np.column_stack(cols), has_constant="add")


def make_periods(rng, n, hours):
    """n periods over three years of months; hourly temps = seasonal mean + daily swing + noise."""
    periods = []
    for i in range(n):
        mean = 11 + 13 * np.sin(2 * np.pi * (i - 3.5) / 12)
        h = np.arange(hours)
        temps = mean + 5 * np.sin(2 * np.pi * (h - 9) / 24) + rng.normal(0, 3, hours)
        periods.append(np.round(temps, 2))
    return periods


def searched_base(form, periods, y, w, lo=5.0, hi=25.0):
    def sse(b):
        X = design(form, periods, b, b)
        res = sm.WLS(y, X, weights=w).fit()
        return float(res.ssr) if res.params[1] > 0 else np.inf

    grid = np.round(np.arange(lo, hi + 1e-9, 0.001), 3)
    # A dense scan with plain numpy for speed: closed-form weighted simple regression.
    best = (np.inf, None)
    sw = w.sum()
    yb = (w * y).sum() / sw
    for b in grid:
        x = np.array([hdd_per_day(p, b) if form == "HO" else cdd_per_day(p, b) for p in periods])
        xb = (w * x).sum() / sw
        sxx = (w * (x - xb) ** 2).sum()
        if sxx <= 0:
            continue
        sxy = (w * (x - xb) * (y - yb)).sum()
        if sxy / sxx <= 0:
            continue
        s = (w * (y - yb) ** 2).sum() - sxy * sxy / sxx
        if s < best[0]:
            best = (s, float(b))
    b0 = best[1]
    r = optimize.minimize_scalar(sse, bounds=(max(lo, b0 - 0.002), min(hi, b0 + 0.002)), method="bounded",
                                 options={"xatol": 1e-9})
    return (float(r.x), float(r.fun)) if r.fun < best[0] else (b0, float(best[0]))


def case(name, form, rng, n, hours, truth, noise, th, tc, search):
    periods = make_periods(rng, n, hours)
    days = rng.integers(28, 34, n).astype(float)
    hdd_true = np.array([hdd_per_day(p, truth["th"]) for p in periods]) if "th" in truth else 0
    cdd_true = np.array([cdd_per_day(p, truth["tc"]) for p in periods]) if "tc" in truth else 0
    y = truth["b0"] + truth.get("bh", 0) * hdd_true + truth.get("bc", 0) * cdd_true
    y = np.round(y + rng.normal(0, noise, n) / np.sqrt(days / 30), 4)
    X = design(form, periods, th, tc)
    res = sm.WLS(y, X, weights=days).fit()
    new = make_periods(rng, 3, hours)
    preds = []
    for p, w0 in zip(new, [30.0, 28.0, 33.0]):
        ex = design(form, [p], th, tc)
        fr = res.get_prediction(ex, weights=np.array([w0])).summary_frame(alpha=0.01)
        preds.append({"temps": tolist(p), "days": w0, "level": 0.99, "fit": float(fr["mean"].iloc[0]),
                      "seMean": float(fr["mean_se"].iloc[0]),
                      "lower": float(fr["obs_ci_lower"].iloc[0]), "upper": float(fr["obs_ci_upper"].iloc[0])})
    out = {
        "name": name, "form": form,
        "periods": [{"temps": tolist(p), "days": float(d), "usePerDay": float(v)} for p, d, v in zip(periods, days, y)],
        "fixedBases": {"heatingBase": th, "coolingBase": tc},
        "expected": {
            "coefficients": tolist(res.params), "standardErrors": tolist(res.bse), "tValues": tolist(res.tvalues),
            "residualStdError": float(np.sqrt(res.scale)), "dfResidual": float(res.df_resid), "sse": float(res.ssr),
            "rSquared": float(res.rsquared), "fitted": tolist(res.fittedvalues),
            "regressors": [tolist(r[1:]) for r in X],
        },
        "predictions": preds,
    }
    if search:
        base, s = searched_base(form, periods, y, days)
        out["searched"] = {"base": base, "sse": s, "range": [5.0, 25.0]}
    return out


def main():
    rng = np.random.default_rng(1986)
    cases = [
        case("heating-only", "HO", rng, 30, 48, {"b0": 40, "bh": 6, "th": 15.5}, 3.0, 15.5, None, True),
        case("cooling-only", "CO", rng, 30, 48, {"b0": 300, "bc": 25, "tc": 18}, 15.0, None, 18.0, True),
        case("heating-and-cooling", "HC", rng, 36, 48, {"b0": 500, "bh": 20, "th": 14, "bc": 30, "tc": 19}, 20.0,
             14.0, 19.0, False),
    ]
    payload = {"generator": GENERATOR,
               "source": "statsmodels WLS (weights = billing days) at fixed bases; searched base by dense scan + "
                         "scipy.optimize.minimize_scalar",
               "cases": cases}
    path = os.path.join(OUT, "degree-day-regression.json")
    with open(path, "w") as f:
        json.dump(payload, f, indent=1)
        f.write("\n")
    print("wrote", os.path.normpath(path))


if __name__ == "__main__":
    main()
