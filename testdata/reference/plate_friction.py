#!/usr/bin/python3
"""Reference Darcy friction factors of chevron-plate channels by Martin's 1999
form, from Debian's python3-fluids, written as CSV to standard output.

    /usr/bin/python3 testdata/reference/plate_friction.py \
        > testdata/reference/plate-friction-martin1999.csv

The Go test regen/plate_test.go reads the CSV; it needs no Python.

Careful: python3-fluids 1.0.22 takes the chevron angle of
friction_plate_Martin_1999(Re, plate_enlargement_factor) in radians, in the
parameter misnamed plate_enlargement_factor. Its friction_plate_Martin_VDI
uses 0.28 where the Darcy form of Martin's 0.045 is 4 x 0.045 = 0.18, so the
VDI form is checked against values computed from the formula instead.
"""
import math
import subprocess

import fluids
from fluids import friction_plate_Martin_1999

REYNOLDS = [100, 200, 500, 1041, 1999, 2000, 5000, 10000, 20000, 100000]
ANGLES_DEG = [10, 20, 30, 45, 60, 70, 80]


def debian_version(package):
    try:
        out = subprocess.run(["dpkg-query", "-W", "-f=${Version}", package],
                             capture_output=True, text=True, check=True)
        return out.stdout.strip()
    except (OSError, subprocess.CalledProcessError):
        return "not installed from a Debian package"


def main():
    print("# Darcy friction factor, Martin 1999 form (4 x Fanning), chevron angle from the main flow direction")
    print("# written by testdata/reference/plate_friction.py")
    print("# python3-fluids %s (Debian package %s): friction_plate_Martin_1999(Re, radians(phi_deg))"
          % (fluids.__version__, debian_version("python3-fluids")))
    print("Re,phi_deg,darcy")
    for re in REYNOLDS:
        for phi in ANGLES_DEG:
            print("%g,%g,%.12g" % (re, phi, friction_plate_Martin_1999(re, math.radians(phi))))


if __name__ == "__main__":
    main()
