#!/usr/bin/python3
"""Independent, vectorised reference for pasval margins on the SI demo
(testdata/demo/htst-milk-si.yaml), written with Debian's python3-numpy from
docs/METHOD.md sections 7-10 and 14, not from pasval's code.

The demo's nominal values and its uncertainty block are written out below
(SI). The model of each sample: viscosity at the setpoint (ln mu linear in T
between the points); Reynolds number; fastest-to-mean ratio (2 below Re 4000,
(n+1)(2n+1)/(2n^2) with n = 0.790 ln Re - 1.64 above); the worst flow up to
the seal (the seal, or just below Re 4000 with the laminar ratio); the judged
temperature (setpoint less the sensor accuracy); the legal table (some row at
or below it whose time the fastest particle holds, never interpolated); the
log reduction t_min / D(T_judged) (the demo takes no heat-loss credit); the
tube slope; and the heat-loss refusal (the heater's target at most 10 K above
the setpoint).

Two modes:
  margins_numpy.py [--samples N] [--seed S]
      draws its own samples with numpy (uniform; triangular; normal with
      sigma = tolerance/2, drawn again beyond 1.5 tolerances or a bound) and
      prints, as JSON, the summary of pasval's "monte_carlo" block.
  margins_numpy.py --check-dump FILE.csv
      reads the samples pasval drew (pasval margins --dump-samples FILE.csv),
      computes every sample's outcome and prints, as JSON, the largest
      relative difference from pasval's and the number of verdicts that differ.
"""
import argparse
import csv
import json
import math
import sys

import numpy as np

INCH = 0.0254
# The SI demo, nominal (SI units; temperatures in degC).
NOMINAL = {
    "flow.max_rate": 11000e-3 / 3600,     # m3/s, volumetric
    "flow.rate": 10000e-3 / 3600,
    "product.density": 1031.0,
    "product.specific_heat": 3930.0,
    "process.hold_setpoint": 72.5,
    "holding_tube.sanitary_tube": 2 * INCH,  # the outer diameter
    "holding_tube.length": 34.0,
    "holding_tube.rise": 0.8,
    "holding_tube.ambient": 20.0,
    "holding_tube.outer_coefficient": 12.0,
    "product.viscosity[0].value": 3.1e-3, "product.viscosity[1].value": 1.35e-3,
    "product.viscosity[2].value": 0.72e-3, "product.viscosity[3].value": 0.64e-3,
    "organisms[0].D": 11.67, "organisms[0].D_temperature": 71.0, "organisms[0].z": 7.11,
    "organisms[1].D": 0.9, "organisms[1].D_temperature": 71.7, "organisms[1].z": 6.3,
}
VISCOSITY_AT = [4.0, 40.0, 72.5, 80.0]
WALL = 0.065 * INCH
SENSOR_ACCURACY = 0.25
MIN_SLOPE = 0.25 / 12
LEGAL = [(72.0, 15.0), (89.0, 1.0), (90.0, 0.5)]
ORGANISMS = ["M. paratuberculosis", "Listeria monocytogenes"]
REQUIRED = {1: 5.0}                       # organism index: required log reduction
TOL = 1e-9                                # pasval's one tolerance rule (docs/METHOD.md section 1.5)
# The demo's uncertainty block: field, relative?, tolerance, distribution.
UNCERTAINTY = [
    ("flow.max_rate", True, 0.015, "uniform"),
    ("process.hold_setpoint", False, 0.2, "normal"),
    ("holding_tube.sanitary_tube", False, 0.2e-3, "normal"),
    ("holding_tube.length", False, 0.05, "triangular"),
    ("product.density", True, 0.005, "uniform"),
    ("product.viscosity[2].value", True, 0.10, "uniform"),
    ("holding_tube.ambient", False, 5.0, "uniform"),
    ("holding_tube.outer_coefficient", True, 0.50, "uniform"),
    ("organisms[0].D", True, 0.20, "normal"),
    ("organisms[1].D", True, 0.20, "normal"),
    ("organisms[1].z", False, 0.5, "normal"),
]
# Physical bounds of the fields above (docs/METHOD.md section 14.1).
BOUNDS = {"process.hold_setpoint": (30.0, 150.0), "holding_tube.ambient": (-math.inf, math.inf),
          "holding_tube.outer_coefficient": (0.0, math.inf)}


def model(x):
    """x: dict of field -> array (or scalar). Returns t_min, [LR per organism], {check: pass array}."""
    n = len(next(v for v in x.values() if np.ndim(v) > 0))
    g = {k: np.broadcast_to(np.asarray(v, dtype=float), (n,)) for k, v in {**NOMINAL, **x}.items()}
    rho, setp = g["product.density"], g["process.hold_setpoint"]
    q = g["flow.max_rate"] * rho / rho               # the tube's volumetric flow: mass flow over density
    od = g["holding_tube.sanitary_tube"]
    d = od - 2 * WALL
    length = g["holding_tube.length"]
    # viscosity at the setpoint: ln mu linear in T between points, ends held
    ln_mu = np.stack([np.log(g["product.viscosity[%d].value" % i]) for i in range(4)])
    mu = np.empty(n)
    at = VISCOSITY_AT
    lo = setp <= at[0]
    hi = setp >= at[-1]
    mu[lo] = np.exp(ln_mu[0][lo])
    mu[hi] = np.exp(ln_mu[-1][hi])
    for i in range(len(at) - 1):
        m = (~lo) & (~hi) & (setp > at[i]) & (setp <= at[i + 1])
        f = (setp[m] - at[i]) / (at[i + 1] - at[i])
        mu[m] = np.exp(ln_mu[i][m] + f * (ln_mu[i + 1][m] - ln_mu[i][m]))
    area = math.pi * d * d / 4
    v = q / area
    re = rho * v * d / mu
    npow = 0.790 * np.log(np.maximum(re, 1000.0)) - 1.64
    ratio = np.where(re >= 4000, (npow + 1) * (2 * npow + 1) / (2 * npow * npow), 2.0)
    t_seal = length / v / ratio
    v4 = 4000 * mu / (rho * d)
    t_below = length / v4 / 2.0
    below = (v4 * area <= q) & (t_below < t_seal)
    t_min = np.where(below, t_below, t_seal)
    # heat loss refusal at the normal rate (the heater's target)
    k = g["holding_tube.outer_coefficient"] * math.pi * od / (g["flow.rate"] * rho * g["product.specific_heat"])
    t_in = g["holding_tube.ambient"] + (setp - g["holding_tube.ambient"]) * np.exp(k * length)
    if not np.all(t_in - setp <= 10):
        raise SystemExit("heat loss refused")
    tj = setp - SENSOR_ACCURACY
    lr = []
    for i in range(len(ORGANISMS)):
        dj = g["organisms[%d].D" % i] * 10 ** ((g["organisms[%d].D_temperature" % i] - tj) / g["organisms[%d].z" % i])
        lr.append(t_min / dj)
    met = np.zeros(n, dtype=bool)
    for temp, time in LEGAL:
        met |= (temp <= tj + 1e-9) & (time - t_min <= TOL * time)
    checks = {"tube-slope": g["holding_tube.rise"] / length - MIN_SLOPE >= -TOL * MIN_SLOPE, "holding-time": met}
    for i, req in REQUIRED.items():
        checks["log-reduction (%s)" % ORGANISMS[i]] = lr[i] - req >= -TOL * req
    return t_min, lr, checks


def draw(rng, n):
    x = {}
    for field, rel, tol, dist in UNCERTAINTY:
        nom = NOMINAL[field]
        a = tol * abs(nom) if rel else tol
        if dist == "uniform":
            x[field] = nom + a * (2 * rng.random(n) - 1)
        elif dist == "triangular":
            x[field] = nom + a * (rng.random(n) + rng.random(n) - 1)
        else:
            lo, hi = BOUNDS.get(field, (0.0, math.inf))
            out = np.full(n, np.nan)
            todo = np.arange(n)
            while todo.size:
                z = rng.standard_normal(todo.size)
                val = nom + a / 2 * z
                ok = (np.abs(z) <= 3) & (val >= lo) & (val <= hi) & ((val > 0) | (lo != 0.0))
                out[todo[ok]] = val[ok]
                todo = todo[~ok]
            x[field] = out
    return x


def percentiles(v):
    n = len(v)
    ranks = [(n * p + 99) // 100 - 1 for p in (1, 5, 50)]
    part = np.partition(v, ranks)
    return {"p01": float(part[ranks[0]]), "p05": float(part[ranks[1]]), "p50": float(part[ranks[2]])}


def summary(n, seed):
    rng = np.random.default_rng(seed)
    t_min, lr, checks = model(draw(rng, n))
    out = {"samples": n, "seed": seed, "checks": []}
    for name, ok in checks.items():
        p = float(np.count_nonzero(ok)) / n
        out["checks"].append({"check": name, "probability": p, "standard_error": math.sqrt(p * (1 - p) / n)})
    allok = np.logical_and.reduce(list(checks.values()))
    p = float(np.count_nonzero(allok)) / n
    out["all_checks"] = {"probability": p, "standard_error": math.sqrt(p * (1 - p) / n)}
    out["min_residence_s"] = percentiles(t_min)
    out["log_reduction_by_organism"] = {ORGANISMS[i]: percentiles(v) for i, v in enumerate(lr)}
    return out


def check_dump(path):
    with open(path, newline="") as f:
        rows = list(csv.reader(f))
    head, data = rows[0], np.array(rows[1:], dtype=float)
    col = {h: data[:, i] for i, h in enumerate(head)}
    x = {field: col[field] for field, _, _, _ in UNCERTAINTY}
    t_min, lr, checks = model(x)
    worst = float(np.max(np.abs(t_min - col["min_residence_s"]) / np.abs(col["min_residence_s"])))
    for i, name in enumerate(ORGANISMS):
        ref = col["log_reduction:" + name]
        worst = max(worst, float(np.max(np.abs(lr[i] - ref) / np.abs(ref))))
    differ = 0
    for name, ok in checks.items():
        differ += int(np.count_nonzero(ok != (col["pass:" + name] == 1)))
    return {"samples": len(data), "max_relative_difference": worst, "verdicts_differing": differ,
            "checks": sorted(checks)}


def main():
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--samples", type=int, default=100000)
    ap.add_argument("--seed", type=int, default=14)
    ap.add_argument("--check-dump")
    a = ap.parse_args()
    out = check_dump(a.check_dump) if a.check_dump else summary(a.samples, a.seed)
    json.dump(out, sys.stdout, indent=2)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
