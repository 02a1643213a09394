#!/usr/bin/python3
"""Independent reference for plate-pack ratings with water on both sides,
written from the relations in docs/METHOD.md section 12 (plate packs) with
water properties from Debian's python3-iapws, not from pasval's code.

    /usr/bin/python3 testdata/reference/plate_pack.py \
        > testdata/reference/plate-pack-water.csv

Long CSV: case,key,value. Keys without a prefix are inputs; "out." keys are
results. Two kinds of case:
  pack-*     the pack at given inlet and outlet temperatures (RatePlatePack)
  coupled-*  a counterflow section rated from its two inlets with constant
             capacity rates, U iterated with the pack (RateWithPack)
The Go test regen/platepack_test.go reads the CSV; it needs no Python.

Relations: d_h = 2b/Phi; v = m/(n_pass rho b w); Re = rho v d_h/mu;
Pr = cp mu/k; Darcy xi by Martin, VDI Heat Atlas form (0.18, 0.36, 3.8);
Nu = 0.122 Pr^(1/3) (mu/mu_w)^(1/6) (xi Re^2 sin 2phi)^0.374; h = Nu k/d_h;
U_clean = 1/(1/h_p + t/k_w + 1/h_o); U_service = 1/(1/U_clean + R_f);
wall temperature of side s: T_s - U_clean (T_s - T_o)/h_s, iterated;
dp = xi (passes L_p/d_h) rho v^2/2 + 1.4 passes rho v_port^2/2.
Water at 0.101325 MPa, or 1.01 p_sat above 99 degC.
"""
import math
import subprocess

import iapws
from iapws import IAPWS97
from iapws.iapws97 import _PSat_T


def water(tc):
    p = 0.101325
    if tc > 99:
        p = max(p, _PSat_T(tc + 273.15) * 1.01)
    w = IAPWS97(T=tc + 273.15, P=p)
    return {"rho": w.rho, "cp": w.cp * 1000.0, "k": w.k, "mu": w.mu}


def darcy_vdi(re, phi):
    if re < 2000:
        x0, x1 = 64.0 / re, 597.0 / re + 3.85
    else:
        x0, x1 = (1.8 * math.log10(re) - 1.5) ** -2, 39.0 * re ** -0.289
    c = math.cos(phi)
    r = c / math.sqrt(0.18 * math.tan(phi) + 0.36 * math.sin(phi) + x0 / c) + (1 - c) / math.sqrt(3.8 * x1)
    return r ** -2


def rate_pack(g, side_p, side_o, fluid_p=water, fluid_o=water):
    """g: geometry; side: dict(m, tin, tout, passes, cpp); fluid: t -> dict(rho,
    cp, k, mu), water unless given (Newtonian). Returns results."""
    phi = math.radians(g["phi_deg"])
    b, w = g["b_mm"] / 1000, g["w_m"]
    dh = 2 * b / g["Phi"]
    sides = []
    for s, fluid in ((side_p, fluid_p), (side_o, fluid_o)):
        t = (s["tin"] + s["tout"]) / 2
        pr = fluid(t)
        v = s["m"] / (s["cpp"] * pr["rho"] * b * w)
        re = pr["rho"] * v * dh / pr["mu"]
        sides.append({"t": t, "p": pr, "v": v, "re": re, "Pr": pr["cp"] * pr["mu"] / pr["k"],
                      "xi": darcy_vdi(re, phi), "muw": pr["mu"], "s": s, "fluid": fluid})
    for _ in range(100):
        for x in sides:
            x["nu"] = 0.122 * x["Pr"] ** (1 / 3) * (x["p"]["mu"] / x["muw"]) ** (1 / 6) * \
                (x["xi"] * x["re"] ** 2 * math.sin(2 * phi)) ** 0.374
            x["h"] = x["nu"] * x["p"]["k"] / dh
        uc = 1 / (1 / sides[0]["h"] + g["t_mm"] / 1000 / g["kw"] + 1 / sides[1]["h"])
        new = []
        for i, x in enumerate(sides):
            o = sides[1 - i]
            x["tw"] = x["t"] - uc * (x["t"] - o["t"]) / x["h"]
            new.append(x["fluid"](x["tw"])["mu"])
        done = all(abs(n / x["muw"] - 1) < 1e-13 for n, x in zip(new, sides))
        for n, x in zip(new, sides):
            x["muw"] = n
        if done:
            break
    us = 1 / (1 / uc + g["fouling"])
    out = {"U_clean": uc, "U_service": us}
    port = math.pi * (g["dport_mm"] / 1000) ** 2 / 4
    for tag, x in zip(("p", "o"), sides):
        s, rho = x["s"], x["p"]["rho"]
        vp = s["m"] / rho / port
        dp = x["xi"] * s["passes"] * g["Lp_m"] / dh * rho * x["v"] ** 2 / 2 + 1.4 * s["passes"] * rho * vp ** 2 / 2
        out.update({"v_" + tag: x["v"], "Re_" + tag: x["re"], "Pr_" + tag: x["Pr"], "xi_" + tag: x["xi"],
                    "Nu_" + tag: x["nu"], "h_" + tag: x["h"], "Tw_" + tag: x["tw"], "dp_" + tag: dp})
    return out


def eps_counter(ntu, cr):
    if abs(1 - cr) < 1e-9:
        return ntu / (1 + ntu)
    e = math.exp(-ntu * (1 - cr))
    return (1 - e) / (1 - cr * e)


def coupled(g, c, side_p, side_o, fluid_p=water, fluid_o=water):
    """Counterflow, constant capacities; the stream with the hotter inlet gives heat."""
    plates = side_p["passes"] * side_p["cpp"] + side_o["passes"] * side_o["cpp"] - 1
    area = plates * c["plate_area"]
    cmin, cmax = min(c["C_p"], c["C_o"]), max(c["C_p"], c["C_o"])
    u = 3000.0
    for _ in range(200):
        # q > 0 when the other side is the hotter one
        q = eps_counter(u * area / cmin, cmin / cmax) * cmin * (side_o["tin"] - side_p["tin"])
        side_p["tout"] = side_p["tin"] + q / c["C_p"]
        side_o["tout"] = side_o["tin"] - q / c["C_o"]
        r = rate_pack(g, side_p, side_o, fluid_p, fluid_o)
        if abs(r["U_service"] - u) <= 1e-12 * u:
            break
        u = r["U_service"]
    r.update({"T_out_p": side_p["tout"], "T_out_o": side_o["tout"], "duty": abs(q)})
    return r


GEOMETRY = {"phi_deg": 60, "b_mm": 3, "Phi": 1.17, "w_m": 0.45, "Lp_m": 0.8, "t_mm": 0.6,
            "kw": 16, "dport_mm": 100, "fouling": 3e-5}


def geometry(**kw):
    g = dict(GEOMETRY)
    g.update(kw)
    return g


PACK_CASES = [
    ("pack-regenerator", geometry(),
     {"m": 2.8, "tin": 5, "tout": 66, "passes": 8, "cpp": 7},
     {"m": 2.8, "tin": 72, "tout": 11, "passes": 8, "cpp": 7}),
    ("pack-heating-30deg", geometry(phi_deg=30),
     {"m": 2.8, "tin": 66, "tout": 72.5, "passes": 4, "cpp": 7},
     {"m": 5.0, "tin": 80, "tout": 76.4, "passes": 4, "cpp": 7}),
    ("pack-laminar-45deg", geometry(phi_deg=45, fouling=0),
     {"m": 0.25, "tin": 10, "tout": 40, "passes": 2, "cpp": 5},
     {"m": 0.3, "tin": 60, "tout": 35, "passes": 2, "cpp": 5}),
    ("pack-unequal-65deg", geometry(phi_deg=65, b_mm=2.5, Phi=1.2),
     {"m": 8.0, "tin": 20, "tout": 6, "passes": 1, "cpp": 10},
     {"m": 6.0, "tin": 1, "tout": 19.6, "passes": 1, "cpp": 9}),
]

COUPLED_CASES = [
    ("coupled-regenerator", geometry(), {"C_p": 2.8 * 4180, "C_o": 2.8 * 4180, "plate_area": 0.42},
     {"m": 2.8, "tin": 5, "passes": 8, "cpp": 7}, {"m": 2.8, "tin": 72, "passes": 8, "cpp": 7}),
    ("coupled-cooler-unequal", geometry(phi_deg=45), {"C_p": 2.8 * 3900, "C_o": 4.0 * 4200, "plate_area": 0.42},
     {"m": 2.8, "tin": 25, "passes": 1, "cpp": 13}, {"m": 4.0, "tin": 1, "passes": 1, "cpp": 12}),
]


def debian_version(package):
    try:
        out = subprocess.run(["dpkg-query", "-W", "-f=${Version}", package],
                             capture_output=True, text=True, check=True)
        return out.stdout.strip()
    except (OSError, subprocess.CalledProcessError):
        return "not installed from a Debian package"


def emit(case, inputs, outputs):
    for k, v in inputs.items():
        print("%s,%s,%.12g" % (case, k, v))
    for k, v in outputs.items():
        print("%s,out.%s,%.12g" % (case, k, v))


def main():
    print("# Plate packs with water on both sides: an independent reference for regen's plate-pack rating")
    print("# written by testdata/reference/plate_pack.py; water from python3-iapws %s (Debian package %s)"
          % (iapws.__version__, debian_version("python3-iapws")))
    print("case,key,value")
    for case, g, p, o in PACK_CASES:
        inputs = dict(g)
        for tag, s in (("p", p), ("o", o)):
            inputs.update({k + "_" + tag: v for k, v in s.items()})
        emit(case, inputs, rate_pack(g, p, o))
    for case, g, c, p, o in COUPLED_CASES:
        inputs = dict(g)
        inputs.update(c)
        for tag, s in (("p", p), ("o", o)):
            inputs.update({k + "_" + tag: v for k, v in s.items()})
        emit(case, inputs, coupled(g, c, dict(p), dict(o)))


if __name__ == "__main__":
    main()
