#!/usr/bin/python3
"""Regenerates test/fixtures/ljung-box-reference.json: Ljung-Box statistics and autocorrelations of a
few fixed series, computed by statsmodels, so that rigcal's own implementation (src/diagnostics) is
checked against an independent one. The series are synthetic, generated here from fixed seeds; the
tests read the fixture and run without Python.

Run: /usr/bin/python3 scripts/ljung-box-reference.py   (Debian: apt-get install python3-statsmodels)
"""
import json
import math
import os

import numpy as np
import statsmodels
from statsmodels.stats.diagnostic import acorr_ljungbox
from statsmodels.tsa.stattools import acf, q_stat


def lag_rule(n):
    # The same rule as src/diagnostics/lag-rule.ts (testLags): min(10*log10(n), n/4), at least 1.
    return max(1, min(int(math.floor(10 * math.log10(n))), n // 4))


def case(name, x, lags=None):
    x = np.asarray(x, dtype=float)
    missing = bool(np.isnan(x).any())
    n = int(np.sum(~np.isnan(x)))
    lags = lags or lag_rule(n)
    r = acf(x, nlags=lags, fft=False, missing="conservative" if missing else "none")
    if missing:
        # acorr_ljungbox has no missing-value mode: use statsmodels' q_stat (the same Ljung-Box
        # formula) on the missing="conservative" autocorrelation with the number of present samples.
        q, p = q_stat(r[1:], n)
        q_value, p_value = float(q[-1]), float(p[-1])
        how = "statsmodels.tsa.stattools.q_stat on acf(missing='conservative')"
    else:
        table = acorr_ljungbox(x, lags=[lags], return_df=True)
        q_value, p_value = float(table["lb_stat"].iloc[0]), float(table["lb_pvalue"].iloc[0])
        how = "statsmodels.stats.diagnostic.acorr_ljungbox"
    return {
        "name": name,
        "method": how,
        "lags": lags,
        "present": n,
        "q": q_value,
        "pValue": p_value,
        "acf": [float(v) for v in r],
        "series": [None if math.isnan(v) else float(v) for v in x],
    }


def main():
    rng = np.random.default_rng(20260101)
    white = rng.normal(0.0, 1.0, 200)
    e = rng.normal(0.0, 1.0, 400)
    ar1 = np.zeros(400)
    for t in range(1, 400):
        ar1[t] = 0.6 * ar1[t - 1] + e[t]
    t = np.arange(300) * 0.01
    slow = 0.5 * np.sin(2 * math.pi * 0.7 * t) + rng.normal(0.0, 0.3, 300)
    short = rng.normal(0.0, 2.0, 40)
    gappy = rng.normal(0.0, 1.0, 250) + 0.4 * np.sin(np.arange(250) / 5.0)
    gappy[[3, 4, 5, 50, 120, 121, 200, 249]] = np.nan
    cases = [
        case("white-200", white),
        case("ar1-0.6-400", ar1),
        case("sine-plus-noise-300", slow),
        case("short-white-40", short),
        case("white-200-lags-5", white, 5),
        case("gappy-250", gappy),
    ]
    out = {
        "source": "statsmodels %s (Debian python3-statsmodels), numpy %s; synthetic series of our own from seed 20260101"
        % (statsmodels.__version__, np.__version__),
        "script": "scripts/ljung-box-reference.py",
        "cases": cases,
    }
    path = os.path.join(os.path.dirname(__file__), "..", "test", "fixtures", "ljung-box-reference.json")
    with open(path, "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")
    print("wrote", os.path.normpath(path))


if __name__ == "__main__":
    main()
