#!/usr/bin/python3
"""Independent reference for the two demo plants, written from the textbook
relations (LMTD, effectiveness-NTU; Incropera et al. 2007, ch. 11) with water
properties from Debian's python3-iapws (IAPWS-IF97), not from pasval's code.

Prints JSON: for each demo, per section the duty (W), the four temperatures
(degC), LMTD (K), NTU, effectiveness, area (m2) and plates, and for a section
with a plate pack its U, film coefficients, Reynolds numbers, velocities and
pressure drops. The Go test cmd/pasval/reference_test.go compares pasval's
--json output with it.

The SI demo's plate packs are rated with plate_pack.py (beside this script:
Martin's correlation as docs/METHOD.md section 12 states it), the product as
a fluid of constant density, specific heat and conductivity whose viscosity
is interpolated in ln mu between the entered points.

Conventions from docs/METHOD.md §3.5 and §6: water volumetric rates convert to
mass at the inlet temperature; cp at the mean of inlet and outlet, iterated;
water at 0.101325 MPa (1.01 p_sat above 100 degC).
"""
import json
import math
import os
import sys

from iapws.iapws97 import _Region1, _PSat_T

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import plate_pack  # noqa: E402  (beside this script)

GAL = 3.785411784e-3
LB = 0.45359237
FT = 0.3048
BTU = 1055.05585262


def water(tc):
    p = 0.101325
    if tc > 99:
        p = max(p, _PSat_T(tc + 273.15) * 1.01)
    r = _Region1(tc + 273.15, p)
    return 1.0 / r["v"], r["cp"] * 1000.0


def eps_counter(ntu, cr):
    if abs(1 - cr) < 1e-9:
        return ntu / (1 + ntu)
    e = math.exp(-ntu * (1 - cr))
    return (1 - e) / (1 - cr * e)


def lmtd(d1, d2):
    if abs(d1 - d2) < 1e-9 * d1:
        return d1
    return (d1 - d2) / math.log(d1 / d2)


def medium_out(vdot, t_in, q):
    """Outlet of a water stream giving q watts (negative q: it takes heat)."""
    rho, _ = water(t_in)
    m = vdot * rho
    out = t_in
    for _ in range(200):
        _, cp = water((t_in + out) / 2)
        nxt = t_in - q / (m * cp)
        if abs(nxt - out) < 1e-12:
            break
        out = nxt
    return nxt, m * cp


def section(q, hin, hout, cin, cout, ch, cc, u, plate):
    lm = lmtd(hin - cout, hout - cin)
    a = q / (u * lm)
    cmin = min(ch, cc)
    return {"duty_W": q, "lmtd_K": lm, "area_m2": a, "plates": math.ceil(a / plate - 1e-9),
            "eff": q / (cmin * (hin - cin)), "hot_in": hin, "hot_out": hout, "cold_in": cin, "cold_out": cout}


MILK_VISCOSITY = [(4.0, 3.1e-3), (40.0, 1.35e-3), (72.5, 0.72e-3), (80.0, 0.64e-3)]


def milk(t):
    """The SI demo's milk: entered density, cp and conductivity; ln mu linear
    in T between the entered points, the nearest end held outside."""
    pts = MILK_VISCOSITY
    if t <= pts[0][0]:
        mu = pts[0][1]
    elif t >= pts[-1][0]:
        mu = pts[-1][1]
    else:
        for (t1, m1), (t2, m2) in zip(pts, pts[1:]):
            if t1 <= t <= t2:
                mu = math.exp(math.log(m1) + (t - t1) / (t2 - t1) * (math.log(m2) - math.log(m1)))
                break
    return {"rho": 1031.0, "cp": 3930.0, "k": 0.58, "mu": mu}


DEMO_PLATE = dict(plate_pack.GEOMETRY)  # 60 deg, 3 mm, 1.17, 0.45 m, 0.8 m, 0.6 mm, 16 W/(m K), 100 mm, 3e-5


def pack_figures(r):
    return {"u_clean": r["U_clean"], "u_service": r["U_service"], "h_p": r["h_p"], "h_o": r["h_o"], "re_p": r["Re_p"], "re_o": r["Re_o"], "v_p": r["v_p"], "v_o": r["v_o"],
            "dp_p": r["dp_p"], "dp_o": r["dp_o"]}


def milk_si():
    rho, cp = 1031.0, 3930.0
    c = 10000e-3 / 3600 * rho * cp
    m = 10000e-3 / 3600 * rho
    raw, sp, target = 5.0, 72.5, 4.0
    # Holding-tube heat loss (docs/METHOD.md §8): the heater must deliver the tube
    # inlet at the normal rate, T_in = Ta + (T_set - Ta) exp(h pi Do L / (m cp)),
    # with h = 12 W/(m2 K), Do = 2 in, L = 34 m, Ta = 20 degC.
    heat_out = 20 + (sp - 20) * math.exp(12 * math.pi * 2 * 0.0254 * 34 / (m * cp))
    out = {}
    # Regeneration, rated from its layout (8 passes of 7 channels a side: 111
    # plates of 0.42 m2), U from the plate pack, iterated with the rating.
    r = plate_pack.coupled(DEMO_PLATE, {"C_p": c, "C_o": c, "plate_area": 0.42},
                           {"m": m, "tin": raw, "passes": 8, "cpp": 7}, {"m": m, "tin": sp, "passes": 8, "cpp": 7}, milk, milk)
    rawout, pastout = r["T_out_p"], r["T_out_o"]
    q = c * (rawout - raw)
    s = section(q, sp, pastout, raw, rawout, c, c, r["U_service"], 0.42)
    s.update({"plates": 111, "area_m2": 111 * 0.42, "ntu": r["U_service"] * 111 * 0.42 / c, "u": r["U_service"]})
    s.update(pack_figures(r))
    out["regeneration"] = s
    # Heating, sized with the entered U and fouling; the passes are the fewest
    # whose plates (5 + 6 channels a pass) give the area; the pack is rated at
    # the section's temperatures.
    u = 1 / (1 / 3800 + 3e-5)
    q = c * (heat_out - rawout)
    mo, cm = medium_out(20000e-3 / 3600, 77.0, q)
    s = section(q, 77.0, mo, rawout, heat_out, cm, c, u, 0.42)
    s["ntu"] = u * s["area_m2"] / min(c, cm)
    passes = max(1, math.ceil((s["plates"] + 1) / (5 + 6)))
    s["plates"] = passes * (5 + 6) - 1
    rho_w, _ = water(77.0)
    r = plate_pack.rate_pack(DEMO_PLATE, {"m": m, "tin": rawout, "tout": heat_out, "passes": passes, "cpp": 5},
                             {"m": 20000e-3 / 3600 * rho_w, "tin": 77.0, "tout": mo, "passes": passes, "cpp": 6}, milk)
    s["u"] = u
    s.update(pack_figures(r))
    out["heating"] = s
    q = c * (pastout - target)
    mo, cm = medium_out(25000e-3 / 3600, 1.0, -q)
    s = section(q, pastout, target, 1.0, mo, c, cm, 3000, 0.35)
    s["ntu"] = 3000 * s["area_m2"] / min(c, cm)
    out["cooling"] = s
    return out


def f2c(f):
    return (f - 32) * 5 / 9


def cider_us():
    rho = 65.2 * LB / FT ** 3
    cp = 0.91 * BTU / LB * 9 / 5
    c = 18 * GAL / 60 * rho * cp
    raw, sp = f2c(40), f2c(161)
    plate = 2.7 * FT ** 2
    uus = BTU / 3600 / FT ** 2 * 9 / 5
    out = {}
    # regeneration, rated: 40 plates
    ntu = 520 * uus * 40 * plate / c
    e = eps_counter(ntu, 1)
    rawout, pastout = raw + e * (sp - raw), sp - e * (sp - raw)
    out["regeneration"] = {"eff": e, "cold_out": rawout, "hot_out": pastout, "duty_W": c * (rawout - raw)}
    # heating, rated: required medium inlet by fixed point
    q = c * (sp - rawout)
    a, u = 8 * plate, 560 * uus
    vdot = 40 * GAL / 60
    tin = sp + 1
    for _ in range(200):
        mo, cm = medium_out(vdot, tin, q)
        cmin, cmax = min(c, cm), max(c, cm)
        nxt = rawout + q / (eps_counter(u * a / cmin, cmin / cmax) * cmin)
        if abs(nxt - tin) < 1e-11:
            tin = nxt
            break
        tin = nxt
    mo, cm = medium_out(vdot, tin, q)
    out["heating"] = {"hot_in": tin, "hot_out": mo, "duty_W": q}
    # cooling stage 1, rated: chilled water 35 F, 30 gpm, 10 plates, U 500
    t = pastout
    tm = f2c(35)
    rho_w, _ = water(tm)
    m = 30 * GAL / 60 * rho_w
    a, u = 10 * plate, 500 * uus
    mout = tm
    for _ in range(200):
        _, cpw = water((tm + mout) / 2)
        cm = m * cpw
        cmin, cmax = min(c, cm), max(c, cm)
        q = eps_counter(u * a / cmin, cmin / cmax) * cmin * (t - tm)
        nxt = tm + q / cm
        if abs(nxt - mout) < 1e-12:
            break
        mout = nxt
    t1 = t - q / c
    out["cooling: chilled water"] = {"cold_out": nxt, "hot_out": t1, "duty_W": q}
    # cooling stage 2, rated: glycol 28 F, 12 gpm, 6 plates, U 430, constant properties
    cg = 12 * GAL / 60 * 64.6 * LB / FT ** 3 * 0.89 * BTU / LB * 9 / 5
    a, u = 6 * plate, 430 * uus
    cmin, cmax = min(c, cg), max(c, cg)
    q = eps_counter(u * a / cmin, cmin / cmax) * cmin * (t1 - f2c(28))
    out["cooling: glycol trim"] = {"hot_out": t1 - q / c, "cold_out": f2c(28) + q / cg, "duty_W": q}
    return out


if __name__ == "__main__":
    json.dump({"htst-milk-si": milk_si(), "cider-us": cider_us()}, sys.stdout, indent=1)
