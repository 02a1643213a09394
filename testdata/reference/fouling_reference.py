#!/usr/bin/python3
"""Independent reference for the heating section over a recorded run of the
SI demo plant (testdata/demo/htst-milk-si.yaml), written from docs/METHOD.md
section 17 (and sections 5, 6.3, 12 for the relations it uses) with water
from Debian's python3-iapws and the fit by Debian's python3-numpy, not from
pasval's code.

Usage: fouling_reference.py RUN.csv   (the demo's columns: time, the holding
tube's three, then heating_product_in, heating_product_out,
heating_medium_in, heating_medium_out, all in degC; flow in L/h; no medium
flow column: the plant's 20000 L/h)

Prints JSON with the keys of the "heating" object of 'pasval logs --json'
that it computes (windows, U, U_clean, the linear fit, the medium-inlet
forecast), times as Unix seconds under keys ending in _s, for
cmd/pasval/heating_test.go to compare.

Method: 60 s windows aligned to multiples of 60 s since the epoch; a window
is left out when a sample in it is diverted or its product flow's range
exceeds 5 % of its mean; the means of the samples that have all four heating
temperatures; q = m cp (out - in), LMTD counterflow, U = q/(A LMTD) with
A = 10 plates x 0.42 m2 (the plates check finds for the sized section: one
pass of 5 + 6 channels); U_clean from plate_pack.rate_pack at the window's
temperatures and flows (fouling 0); R_f = 1/U - 1/U_clean; the linear least-
squares fit against hours from the first window used (numpy.linalg.lstsq)
with covariance s^2 (X'X)^-1; the heating section at the normal rate rated
for a fouling R (U_service = 1/(1/U_clean + R), U_clean from the pack at the
section's temperatures, iterated), R* where the required medium inlet is the
77 degC available, by bisection; t* = (R* - a)/b; sigma by the delta method.
"""
import calendar
import csv
import json
import math
import os
import sys
import time

import numpy

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import line_reference  # noqa: E402  (beside this script)
import plate_pack  # noqa: E402

RHO, CP = 1031.0, 3930.0             # the demo milk's density and specific heat
NORMAL = 10000e-3 / 3600             # m3/s, flow.rate
MEDIUM = 20000e-3 / 3600             # m3/s, heating.medium_rate
AVAILABLE = 77.0                     # degC, heating.medium_inlet
AREA = 10 * 0.42                     # m2
PLATE = dict(line_reference.DEMO_PLATE, fouling=0.0)
WIDTH = 60.0


def read(path):
    samples = []
    with open(path, newline="", encoding="utf-8") as f:
        rows = csv.reader(f)
        next(rows)
        for row in rows:
            t = calendar.timegm(time.strptime(row[0], "%Y-%m-%dT%H:%M:%SZ"))
            heat = None
            if all(x != "" for x in row[4:8]):
                heat = [float(x) for x in row[4:8]]
            samples.append((t, float(row[2]) / 3.6e6 * RHO, row[3] == "1", heat))
    return samples


def windows(samples):
    out = {}
    for t, m, fwd, heat in samples:
        out.setdefault(math.floor(t / WIDTH), []).append((t, m, fwd, heat))
    return [(k, out[k]) for k in sorted(out)]


def rate_window(pin, pout, min_, mout, m):
    rho_w, _ = line_reference.water(min_)
    r = plate_pack.rate_pack(PLATE, {"m": m, "tin": pin, "tout": pout, "passes": 1, "cpp": 5},
                             {"m": MEDIUM * rho_w, "tin": min_, "tout": mout, "passes": 1, "cpp": 6}, line_reference.milk)
    return r["U_clean"]


def required_inlet(rf, pin, pout):
    """The medium inlet the section needs at the normal rate with the fouling rf."""
    c = NORMAL * RHO * CP
    q = c * (pout - pin)
    u = 3000.0
    for _ in range(200):
        tin = max(AVAILABLE, pout + 1)
        for _ in range(200):
            mo, cm = line_reference.medium_out(MEDIUM, tin, q)
            cmin, cmax = min(c, cm), max(c, cm)
            nxt = pin + q / (line_reference.eps_counter(u * AREA / cmin, cmin / cmax) * cmin)
            if abs(nxt - tin) < 1e-12:
                break
            tin = nxt
        mo, _ = line_reference.medium_out(MEDIUM, nxt, q)
        rho_w, _ = line_reference.water(nxt)
        uc = plate_pack.rate_pack(PLATE, {"m": NORMAL * RHO, "tin": pin, "tout": pout, "passes": 1, "cpp": 5},
                                  {"m": MEDIUM * rho_w, "tin": nxt, "tout": mo, "passes": 1, "cpp": 6}, line_reference.milk)["U_clean"]
        un = 1 / (1 / uc + rf)
        if abs(un - u) <= 1e-12 * u:
            break
        u = un
    return nxt


def nearest_rank(x, q):
    s = sorted(x)
    return s[max(0, math.ceil(q * len(s)) - 1)]


def main(path):
    samples = read(path)
    first, last = samples[0][0], samples[-1][0]
    points, skipped = [], {"diverted": 0, "unsteady": 0, "no_reading": 0, "temperature_cross": 0, "pack_not_rated": 0}
    wins = windows(samples)
    for k, ss in wins:
        flows = [m for _, m, _, _ in ss]
        mean = sum(flows) / len(flows)
        heat = [h for _, _, _, h in ss if h is not None]
        if any(not fwd for _, _, fwd, _ in ss):
            skipped["diverted"] += 1
            continue
        if max(flows) - min(flows) > 0.05 * mean:
            skipped["unsteady"] += 1
            continue
        if not heat:
            skipped["no_reading"] += 1
            continue
        pin, pout, min_, mout = (sum(h[i] for h in heat) / len(heat) for i in range(4))
        q = mean * CP * (pout - pin)
        d1, d2 = min_ - pout, mout - pin
        if d1 <= 0 or d2 <= 0 or q <= 0:
            skipped["temperature_cross"] += 1
            continue
        u = q / (AREA * line_reference.lmtd(d1, d2))
        uc = rate_window(pin, pout, min_, mout, mean)
        points.append(((k + 0.5) * WIDTH, u, uc, 1 / u - 1 / uc))
    t0 = points[0][0]
    hours = numpy.array([(p[0] - t0) / 3600 for p in points])
    rf = numpy.array([p[3] for p in points])
    x = numpy.column_stack([numpy.ones(len(hours)), hours])
    (a, b), _, _, _ = numpy.linalg.lstsq(x, rf, rcond=None)
    res = rf - (a + b * hours)
    rss = float(res @ res)
    n = len(points)
    cov = rss / (n - 2) * numpy.linalg.inv(x.T @ x)
    us = [p[1] for p in points]
    hour = lambda lo, hi: [p[1] for p in points if lo <= p[0] <= hi]  # noqa: E731
    fh, lh = hour(first, first + 3600), hour(last - 3600, last)
    # The section at the normal rate: the product from the regenerator's
    # outlet to the tube inlet with heat loss (line_reference.milk_si).
    ref = line_reference.milk_si()["heating"]
    pin, pout = ref["cold_in"], ref["cold_out"]
    now = a + b * hours[-1]
    lo, hi = now, now + 1e-4
    while required_inlet(hi, pin, pout) < AVAILABLE:
        hi += 1e-4
    while hi - lo > 1e-15:
        mid = (lo + hi) / 2
        if required_inlet(mid, pin, pout) >= AVAILABLE:
            hi = mid
        else:
            lo = mid
    rstar = (lo + hi) / 2
    tstar = (rstar - a) / b
    g = numpy.array([-1 / b, -(rstar - a) / b ** 2])
    sigma = math.sqrt(g @ cov @ g)
    out = {
        "windows": len(wins), "windows_used": n, "windows_skipped": skipped,
        "u_W_m2K": {"p05": nearest_rank(us, 0.05), "p50": nearest_rank(us, 0.5), "p95": nearest_rank(us, 0.95),
                    "first_hour": sum(fh) / len(fh), "last_hour": sum(lh) / len(lh)},
        "u_clean_W_m2K": nearest_rank([p[2] for p in points], 0.5),
        "fouling_m2K_W_per_h": b,
        "linear": {"a_m2K_W": a, "b_m2K_W_per_h": b, "points": n, "rms_residual_m2K_W": math.sqrt(rss / n),
                   "aic": n * math.log(rss / n) + 4,
                   "std_errors": {"a_m2K_W": math.sqrt(cov[0][0]), "b_m2K_W_per_h": math.sqrt(cov[1][1])}},
        "forecast": {"medium_inlet_limit_C": AVAILABLE, "required_medium_inlet_now_C": required_inlet(now, pin, pout),
                     "fouling_now_m2K_W": now, "fouling_at_limit_m2K_W": rstar, "sigma_h": sigma},
        "at_s": t0 + tstar * 3600, "clean_before_s": t0 + (tstar - 1.6448536269514722 * sigma) * 3600,
    }
    json.dump(out, sys.stdout, indent=1)


if __name__ == "__main__":
    main(sys.argv[1])
