#!/usr/bin/python3
"""Independent reference for a run review of the SI demo plant
(testdata/demo/htst-milk-si.yaml), written from docs/METHOD.md §13 and §7
with the Python standard library only, not from pasval's code.

Usage: run_reference.py RUN.csv   (first columns: time, hold_outlet_temperature [°C],
flow_rate [L/h], forward, any others ignored; RFC 3339 times in UTC)

Prints JSON with the keys of 'pasval logs --json' (summary, events, drops),
SI, for cmd/pasval/logs_test.go to compare. It walks each parcel back through
the held intervals directly (O(n x tube) work: fine for a shift).
"""
import csv
import datetime
import json
import math
import sys

# The SI demo plant, as entered (testdata/demo/htst-milk-si.yaml).
INCH = 0.0254
D = 2 * INCH - 2 * 0.065 * INCH  # 2 in sanitary tube, 0.065 in wall (docs/METHOD.md §7.1)
AREA = math.pi * D * D / 4
LENGTH = 34.0  # m
RHO = 1031.0  # kg/m3, density as entered: the same at the raw inlet and in the tube
VISCOSITY = [(4.0, 3.1e-3), (40.0, 1.35e-3), (72.5, 0.72e-3), (80.0, 0.64e-3)]  # degC, Pa s
SETPOINT = 72.5
SENSOR_ACCURACY = 0.25  # K, process.sensor_accuracy: each parcel judged again with the reading this much lower (§13.4)
MAX_FLOW = 11000.0 / 3.6e6  # m3/s
ORGANISMS = [  # name, D (s), D temperature (degC), z (K), required log reduction (0: none)
    ("M. paratuberculosis", 11.67, 71.0, 7.11, 0.0),
    ("Listeria monocytogenes", 0.9, 71.7, 6.3, 5.0),
]
LEGAL = [(72.0, 15.0), (89.0, 1.0), (90.0, 0.5)]  # degC, s

# The tolerances pasval states (docs/METHOD.md §1.5 and §13): a reading equal
# to a limit is not past it.
TEMP_TOL = 1e-9  # K
FLOW_TOL = 1e-12  # relative
LEGAL_TOL = 1e-9  # relative, of the row time
GAP_FACTOR = 5
MEDIAN_WINDOW = 4096


def viscosity(t):
    """ln(mu) linear in T between the points, the nearest end held outside (§4)."""
    pts = VISCOSITY
    if t <= pts[0][0]:
        return pts[0][1]
    if t >= pts[-1][0]:
        return pts[-1][1]
    for (t0, m0), (t1, m1) in zip(pts, pts[1:]):
        if t0 <= t <= t1:
            f = (t - t0) / (t1 - t0)
            return math.exp(math.log(m0) + f * (math.log(m1) - math.log(m0)))
    raise ValueError(t)


def fastest_speed(q, t):
    """u_max = r v (§7.2-7.4): laminar below Re 4000 (r = 2), else Petukhov's n_p; mu at min(t, setpoint) (§13.4)."""
    if q <= 0:
        return 0.0
    v = q / AREA
    re = RHO * v * D / viscosity(min(t, SETPOINT))  # the colder of reading and setpoint (§13.4)
    if re < 4000:
        r = 2.0
    else:
        n = 0.790 * math.log(re) - 1.64
        r = (n + 1) * (2 * n + 1) / (2 * n * n)
    return r * v


def d_value(org, t):
    _, d, tref, z, _ = org
    return d * 10 ** ((tref - t) / z)


def legal_met(t, res):
    return any(rt <= t + 1e-9 and rtime - res <= LEGAL_TOL * rtime for rt, rtime in LEGAL)


def read(path):
    samples = []
    with open(path, newline="", encoding="utf-8") as f:
        rows = csv.reader(f)
        next(rows)
        for row in rows:
            ts, temp, flow, fwd = row[:4]  # further columns (the heating section's) are not read
            when = datetime.datetime.strptime(ts, "%Y-%m-%dT%H:%M:%SZ").replace(tzinfo=datetime.timezone.utc)
            samples.append((when.timestamp(), float(temp), float(flow) / 3.6e6, fwd == "1"))
    return samples


def clock(s):
    """A time from the first sample as RFC 3339 (ORIGIN: the first sample's Unix time)."""
    return datetime.datetime.fromtimestamp(ORIGIN + s, datetime.timezone.utc).strftime("%Y-%m-%dT%H:%M:%SZ")


ORIGIN = 0.0


def number(v):
    return None if math.isinf(v) or math.isnan(v) else v


def main(path):
    s = read(path)
    n = len(s)
    # Times from the first sample: a residence is a difference of times, and
    # Unix seconds in a float (steps of 0.24 us in 2026) would lose its last
    # digits (docs/METHOD.md §13.4).
    global ORIGIN
    ORIGIN = origin = s[0][0]
    times = [x[0] - origin for x in s]
    s = [(t,) + x[1:] for t, x in zip(times, s)]
    speeds = [fastest_speed(x[2], x[1]) for x in s]
    positive = [b - a for a, b in zip(times, times[1:]) if b > a][:MEDIAN_WINDOW]
    positive.sort()
    k = len(positive)
    median = positive[k // 2] if k % 2 else (positive[k // 2 - 1] + positive[k // 2]) / 2
    threshold = GAP_FACTOR * median

    def residence(i):
        """t_i - tau_0 with the integral of u over [tau_0, t_i] = L (§13.4)."""
        rest = LENGTH
        for j in range(i - 1, -1, -1):
            d = times[j + 1] - times[j]
            if speeds[j] * d >= rest:
                return times[i] - (times[j + 1] - rest / speeds[j])
            rest -= speeds[j] * d
        return times[i] - times[0] + rest / speeds[0] if speeds[0] > 0 else math.inf

    summ = dict(forward=0.0, diverted=0.0, fwd_vol=0.0, div_vol=0.0, min_t=math.inf, max_q=-math.inf,
                min_res=math.inf, min_lr=[math.inf] * len(ORGANISMS), gaps=0,
                short=0, short_low=0, min_lr_low=[math.inf] * len(ORGANISMS))
    events, drops = [], []
    ev, drop = None, None

    def close_event():
        nonlocal ev
        if ev is None:
            return
        e = ev
        ev = None
        if e["class"] == "gap":
            e["kind"], e["verdict"] = "gap", "no record"
            summ["gaps"] += 1
        else:
            if e["class"] == "lethality":
                e["kind"] = "lethality"
            elif e["temp"] and e["flow"]:
                e["kind"] = "temperature+flow"
            else:
                e["kind"] = "temperature" if e["temp"] else "flow"
            e["verdict"] = "limits met" if e["all_met"] else "product at risk"
        events.append(e)

    for i, (t, temp, q, fwd) in enumerate(s):
        d = times[i + 1] - t if i + 1 < n else 0.0
        vol = q * d if q > 0 else 0.0
        res = residence(i)
        lrs = [res / d_value(o, temp) for o in ORGANISMS]
        if fwd:
            summ["forward"] += d
            summ["fwd_vol"] += vol
            summ["min_t"] = min(summ["min_t"], temp)
            summ["max_q"] = max(summ["max_q"], q)
            summ["min_res"] = min(summ["min_res"], res)
            summ["min_lr"] = [min(a, b) for a, b in zip(summ["min_lr"], lrs)]
        else:
            summ["diverted"] += d
            summ["div_vol"] += vol
        below = temp < SETPOINT - TEMP_TOL
        # Drops below the setpoint (§13.5).
        if drop is not None and not below:
            drop["end"], drop["recovered"] = t, True
            drop = None
        if below:
            if drop is None:
                drop = dict(start=t, end=t, recovered=False, min_t=temp, forward_below=False, divert_after=None)
                drops.append(drop)
            drop["end"] = t
            drop["min_t"] = min(drop["min_t"], temp)
            if fwd:
                drop["forward_below"] = True
            elif drop["divert_after"] is None:
                drop["divert_after"] = t - drop["start"]
        if not fwd:
            close_event()
            continue
        gap = d > threshold
        over = q > MAX_FLOW * (1 + FLOW_TOL)
        legal = legal_met(temp, res)
        req = all(not (o[4] > 0) or lr >= o[4] for o, lr in zip(ORGANISMS, lrs))
        # The same parcel with the reading lowered by the sensor accuracy (the residence as recorded).
        low = temp - SENSOR_ACCURACY
        lrs_low = [res / d_value(o, low) for o in ORGANISMS]
        short_low = not legal_met(low, res) or not all(not (o[4] > 0) or lr >= o[4] for o, lr in zip(ORGANISMS, lrs_low))
        summ["short"] += (not legal or not req)
        summ["short_low"] += short_low
        summ["min_lr_low"] = [min(a, b) for a, b in zip(summ["min_lr_low"], lrs_low)]
        if gap:
            cls = "gap"
        elif below or over:
            cls = "limit"
        elif not legal or not req:
            cls = "lethality"
        else:
            close_event()
            continue
        if ev is not None and ev["class"] != cls:
            close_event()
        if ev is None:
            ev = {"class": cls, "start": t, "duration": 0.0, "volume": 0.0, "min_t": math.inf, "max_q": -math.inf,
                  "min_lr": [math.inf] * len(ORGANISMS), "min_res": math.inf, "min_sample_res": math.inf,
                  "legal": not gap, "at_risk": 0.0, "temp": False, "flow": False, "all_met": True, "drop": None,
                  "short_low": 0, "min_lr_low": [math.inf] * len(ORGANISMS)}
        ev["end"] = t + d
        ev["duration"] += d
        ev["volume"] += vol
        ev["min_t"] = min(ev["min_t"], temp)
        ev["max_q"] = max(ev["max_q"], q)
        ev["min_res"] = min(ev["min_res"], res)
        if speeds[i] > 0:
            ev["min_sample_res"] = min(ev["min_sample_res"], LENGTH / speeds[i])
        ev["min_lr"] = [min(a, b) for a, b in zip(ev["min_lr"], lrs)]
        ev["min_lr_low"] = [min(a, b) for a, b in zip(ev["min_lr_low"], lrs_low)]
        ev["short_low"] += short_low
        if gap:
            ev["at_risk"] += vol
            continue
        if below:
            ev["temp"] = True
            if ev["drop"] is None:
                ev["drop"] = drop
        ev["flow"] = ev["flow"] or over
        if not legal:
            ev["legal"] = False
        if not legal or not req:
            ev["all_met"] = False
            ev["at_risk"] += vol
    close_event()

    names = [o[0] for o in ORGANISMS]
    out = {
        "summary": {
            "rows": n, "start": clock(times[0]), "end": clock(times[-1]),
            "forward_s": summ["forward"], "diverted_s": summ["diverted"],
            "forward_volume_L": summ["fwd_vol"] * 1e3, "diverted_volume_L": summ["div_vol"] * 1e3,
            "min_forward_temperature_C": number(summ["min_t"]), "max_forward_flow_L_h": number(summ["max_q"] * 3.6e6),
            "min_forward_log_reduction": number(summ["min_lr"][0]),
            "min_forward_log_reduction_by_organism": dict(zip(names, map(number, summ["min_lr"]))),
            "min_forward_residence_s": number(summ["min_res"]), "gaps": summ["gaps"],
            "samples_short": summ["short"], "sensor_low_K": SENSOR_ACCURACY, "samples_short_at_sensor_low": summ["short_low"],
            "min_forward_log_reduction_at_sensor_low": number(summ["min_lr_low"][0]),
            "min_forward_log_reduction_at_sensor_low_by_organism": dict(zip(names, map(number, summ["min_lr_low"]))),
            "median_interval_s": median, "gap_threshold_s": threshold,
        },
        "events": [{
            "kind": e["kind"], "start": clock(e["start"]), "end": clock(e["end"]), "duration_s": e["duration"],
            "min_temperature_C": e["min_t"], "max_flow_L_h": e["max_q"] * 3.6e6, "volume_L": e["volume"] * 1e3,
            "min_log_reduction": number(e["min_lr"][0]),
            "min_log_reduction_by_organism": dict(zip(names, map(number, e["min_lr"]))),
            "min_residence_s": number(e["min_res"]), "min_sample_residence_s": number(e["min_sample_res"]),
            "legal_row_met": e["legal"], "verdict": e["verdict"], "at_risk_volume_L": e["at_risk"] * 1e3,
            "divert_after_s": e["drop"]["divert_after"] if e["drop"] is not None else None,
            "samples_short_at_sensor_low": e["short_low"], "min_log_reduction_at_sensor_low": number(e["min_lr_low"][0]),
            "min_log_reduction_at_sensor_low_by_organism": dict(zip(names, map(number, e["min_lr_low"]))),
        } for e in events],
        "drops": [{
            "start": clock(d["start"]), "end": clock(d["end"]), "recovered": d["recovered"],
            "min_temperature_C": d["min_t"], "forward_below_setpoint": d["forward_below"],
            "divert_after_s": d["divert_after"],
        } for d in drops],
    }
    json.dump(out, sys.stdout, indent=1)
    print()


if __name__ == "__main__":
    main(sys.argv[1])
