#!/usr/bin/env python3
"""Reference fixtures for ohmbook's interval (hourly) baseline models.

Writes test/fixtures/reference/interval-towt.json. The time-of-week-and-temperature design
(hour-of-week indicators, piecewise-linear temperature components per occupancy mode, knot
thinning, occupancy from the residuals of a temperature-only fit) is built here independently
of the TypeScript code, from the written rules in src/model/interval/towt.ts, and fitted with
statsmodels OLS. The inputs are generated from a fixed seed and stored in the fixture, so the
vitest suite (test/model/interval/towt.test.ts) uses exactly these numbers; CI needs no Python.

Rerun (from the repository root), with Debian's Python and packages:
    apt-get install -y python3-numpy python3-statsmodels
    /usr/bin/python3 scripts/reference/make_interval_fixtures.py
"""
import json
import os
import sys

import numpy as np
import statsmodels
import statsmodels.api as sm

OUT = os.path.join(os.path.dirname(__file__), "..", "..", "test", "fixtures", "reference")
GENERATOR = {
    "script": "scripts/reference/make_interval_fixtures.py",
    "python": sys.version.split()[0],
    "numpy": np.__version__,
    "statsmodels": statsmodels.__version__,
}

KNOTS_C = [(f - 32) * 5 / 9 for f in [40, 50, 60, 70, 80]]


def components(t, knots):
    """Piecewise-linear split: min(t, k0), clipped segment widths, max(t - k_last, 0)."""
    if not knots:
        return [t]
    out = [min(t, knots[0])]
    for j in range(1, len(knots)):
        out.append(min(max(t - knots[j - 1], 0.0), knots[j] - knots[j - 1]))
    out.append(max(t - knots[-1], 0.0))
    return out


def select_knots(temps, knots, min_points):
    ks = list(knots)
    while ks:
        counts = [0] * (len(ks) + 1)
        for t in temps:
            counts[sum(1 for k in ks if t >= k)] += 1
        thin = next((i for i, c in enumerate(counts) if c < min_points), None)
        if thin is None:
            break
        del ks[0 if thin == 0 else thin - 1]
    return ks


def towt_case(name, seed, weeks, temp_mean, temp_swing, min_points, threshold):
    rng = np.random.RandomState(seed)
    n = 168 * weeks
    i = np.arange(n)
    how = i % 168
    hod = how % 24
    dow = how // 24
    day = i // 24
    holiday = np.isin(day, [9, 24]).astype(int)
    temp = (temp_mean + temp_swing * np.sin(2 * np.pi * day / (7 * weeks))
            + 5 * np.sin(2 * np.pi * (hod - 9) / 24) + rng.normal(0, 1.5, n))
    occupied_true = ((dow < 5) & (hod >= 7) & (hod < 19) & (holiday == 0)).astype(float)
    y = (20 + 30 * occupied_true + 1.8 * np.maximum(temp - 18, 0) * (1 + occupied_true)
         + 1.2 * np.maximum(10 - temp, 0) + rng.normal(0, 2.0, n))

    # Occupancy from the temperature-only fit (intercept + components on all rows).
    knots_all = select_knots(temp, KNOTS_C, min_points)
    x0 = sm.add_constant(np.array([components(t, knots_all) for t in temp]), has_constant="add")
    r0 = sm.OLS(y, x0).fit().resid
    occ = np.zeros(168, dtype=int)
    for h in range(168):
        sel = how == h
        if sel.sum() > 0 and (r0[sel] > 0).mean() > threshold:
            occ[h] = 1

    row_occ = occ[how] == 1
    knots_o = select_knots(temp[row_occ], KNOTS_C, min_points) if row_occ.any() else []
    knots_u = select_knots(temp[~row_occ], KNOTS_C, min_points) if (~row_occ).any() else []
    n_o = len(knots_o) + 1 if row_occ.any() else 0
    n_u = len(knots_u) + 1 if (~row_occ).any() else 0
    hol_occ = int((row_occ & (holiday == 1)).sum())
    use_hol = hol_occ >= 8 and hol_occ < int(row_occ.sum())
    hours = sorted(set(how.tolist()))
    k = len(hours) + n_o + n_u + (1 if use_hol else 0)
    X = np.zeros((n, k))
    for r in range(n):
        X[r, hours.index(how[r])] = 1
        if row_occ[r]:
            X[r, len(hours):len(hours) + n_o] = components(temp[r], knots_o)
            if use_hol and holiday[r]:
                X[r, k - 1] = 1
        elif n_u:
            X[r, len(hours) + n_o:len(hours) + n_o + n_u] = components(temp[r], knots_u)
    fit = sm.OLS(y, X).fit()
    return {
        "name": name,
        "minPointsPerSegment": min_points,
        "occupancyThreshold": threshold,
        "hourOfWeek": how.tolist(),
        "holiday": holiday.tolist(),
        "tempC": [float(v) for v in temp],
        "kwh": [float(v) for v in y],
        "expected": {
            "occupied": occ.tolist(),
            "knotsOccupiedC": knots_o,
            "knotsUnoccupiedC": knots_u,
            "useHoliday": bool(use_hol),
            "coefficients": [float(v) for v in fit.params],
            "standardErrors": [float(v) for v in fit.bse],
            "residualStdError": float(np.sqrt(fit.scale)),
            "fitted": [float(v) for v in fit.fittedvalues],
        },
    }


def main():
    cases = [
        # Mild climate, all knots survive in both modes.
        towt_case("six-weeks-wide-range", 11, 6, 14.0, 12.0, 20, 0.65),
        # Cold climate: the upper knots have too few points and are dropped.
        towt_case("four-weeks-cold", 23, 4, 2.0, 4.0, 20, 0.65),
    ]
    payload = {"generator": GENERATOR, "knotsC": KNOTS_C, "cases": cases}
    path = os.path.join(OUT, "interval-towt.json")
    with open(path, "w") as f:
        json.dump(payload, f, indent=1)
        f.write("\n")
    print("wrote", os.path.normpath(path))
    for c in cases:
        e = c["expected"]
        print(c["name"], "occupied", sum(e["occupied"]), "knots", len(e["knotsOccupiedC"]), len(e["knotsUnoccupiedC"]), "holiday", e["useHoliday"], "k", len(e["coefficients"]))


main()
