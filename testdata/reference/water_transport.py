#!/usr/bin/python3
"""Reference thermal conductivity and viscosity of liquid water, 1-150 degC,
from Debian's python3-iapws, written as CSV to standard output.

    /usr/bin/python3 testdata/reference/water_transport.py \
        > testdata/reference/water-conductivity-viscosity.csv

The Go test internal/props/conductivity_test.go reads the CSV; it needs no
Python. Each row is IAPWS97(T, P): density from IAPWS-IF97, viscosity from
IAPWS 2008 (R12-08) and thermal conductivity from IAPWS 2011 (R15-11),
including that release's simplified industrial critical enhancement, which
is zero for these states.

Pressure convention (docs/METHOD.md section 3, water properties): 0.101325 MPa,
or 1.01 times the saturation pressure where that is higher (above 99 degC),
so that the water stays liquid.

Values are printed to 12 significant digits so that a last-bit difference
in the platform's maths library does not change the file.
"""
import subprocess

import iapws
from iapws import IAPWS97
from iapws.iapws97 import _PSat_T


def pressure_mpa(tc):
    p = 0.101325
    if tc > 99:
        p = max(p, _PSat_T(tc + 273.15) * 1.01)
    return p


def debian_version(package):
    try:
        out = subprocess.run(["dpkg-query", "-W", "-f=${Version}", package],
                             capture_output=True, text=True, check=True)
        return out.stdout.strip()
    except (OSError, subprocess.CalledProcessError):
        return "not installed from a Debian package"


def main():
    print("# Liquid water: thermal conductivity (IAPWS R15-11) and viscosity (IAPWS R12-08)")
    print("# at IAPWS-IF97 density; written by testdata/reference/water_transport.py")
    print("# python3-iapws %s (Debian package %s): IAPWS97(T=t+273.15, P=p_MPa).k and .mu"
          % (iapws.__version__, debian_version("python3-iapws")))
    print("t_C,p_MPa,rho_kg_m3,k_W_mK,mu_Pa_s")
    for t in range(1, 151):
        p = pressure_mpa(t)
        w = IAPWS97(T=t + 273.15, P=p)
        print("%d,%.12g,%.12g,%.12g,%.12g" % (t, p, w.rho, w.k, w.mu))


if __name__ == "__main__":
    main()
