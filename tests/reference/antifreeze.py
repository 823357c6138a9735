#!/usr/bin/env python3
"""Reference data for burrow's antifreeze properties, from CoolProp.

Writes tests/reference/antifreeze.csv, read by tests/fluids.rs.

Sources behind the numbers (independent of burrow's own sources):
- pure water: CoolProp "Water" (HEOS backend: IAPWS-95 equation of state,
  IAPWS 2008 viscosity, IAPWS 2011 thermal conductivity) at 101325 Pa;
  freezing point from CoolProp's IAPWS melting line at 101325 Pa;
- aqueous propylene glycol, ethylene glycol, ethanol: CoolProp incompressible
  mixtures INCOMP::MPG, INCOMP::MEG, INCOMP::MEA (mass-fraction based fits of
  A. Melinder, "Properties of secondary working fluids for indirect systems",
  IIR 2010).

Grid: glycols at mass fractions 0.1-0.5 by 0.1, ethanol at 0.05, 0.1-0.4 by
0.1, water alone; temperatures from the first whole degree at least 1 K above
CoolProp's freezing point, then every multiple of 5 degC up to the top of
burrow's valid range: 80 degC for water and the glycols (CoolProp accepts
MPG/MEG up to 100 degC), 40 degC for ethanol (MEA's limit).

Usage (needs `pip install CoolProp`; run from the crate root):
    python3 tests/reference/antifreeze.py
"""

import csv
import math
import os

import CoolProp
import CoolProp.CoolProp as CP

P_ATM = 101325.0
T0 = 273.15
HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "antifreeze.csv")

# burrow mixture name -> (CoolProp incompressible code, mass fractions, top degC)
SOLUTIONS = {
    "propylene-glycol": ("MPG", [0.1, 0.2, 0.3, 0.4, 0.5], 80.0),
    "ethylene-glycol": ("MEG", [0.1, 0.2, 0.3, 0.4, 0.5], 80.0),
    "ethanol": ("MEA", [0.05, 0.1, 0.2, 0.3, 0.4], 40.0),
}


def temperatures_from(freeze_c, top_c):
    """Whole degrees: first >= freeze + 1 K, then multiples of 5 up to top."""
    first = math.ceil(freeze_c + 1.0)
    temps = [first]
    t = 5 * math.floor(first / 5) + 5
    while t <= top_c:
        if t > first:
            temps.append(t)
        t += 5
    return temps


def props(fluid, t_c):
    T = t_c + T0
    return (
        CP.PropsSI("D", "T", T, "P", P_ATM, fluid),
        CP.PropsSI("C", "T", T, "P", P_ATM, fluid),
        CP.PropsSI("L", "T", T, "P", P_ATM, fluid),
        CP.PropsSI("V", "T", T, "P", P_ATM, fluid),
    )


def main():
    rows = []
    water = CP.AbstractState("HEOS", "Water")
    water_freeze_c = water.melting_line(CoolProp.iT, CoolProp.iP, P_ATM) - T0
    for t_c in temperatures_from(water_freeze_c, 80.0):
        rows.append(("water", 0.0, t_c, water_freeze_c) + props("Water", t_c))
    for name, (code, fractions, top_c) in SOLUTIONS.items():
        for x in fractions:
            fluid = "INCOMP::%s[%g]" % (code, x)
            freeze_c = CP.PropsSI("T_freeze", "T", 293.15, "P", P_ATM, fluid) - T0
            for t_c in temperatures_from(freeze_c, top_c):
                rows.append((name, x, t_c, freeze_c) + props(fluid, t_c))
    with open(OUT, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        f.write("# CoolProp %s; see antifreeze.py for sources and grid\n" % CoolProp.__version__)
        w.writerow(["mixture", "mass_fraction", "t_c", "freezing_point_c", "density", "cp", "k", "mu"])
        for r in rows:
            w.writerow([r[0], "%g" % r[1], "%g" % r[2], "%.4f" % r[3],
                        "%.5f" % r[4], "%.3f" % r[5], "%.6f" % r[6], "%.6e" % r[7]])
    print("wrote %d rows to %s" % (len(rows), OUT))


if __name__ == "__main__":
    main()
