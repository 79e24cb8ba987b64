"""The peer of satline's batch benchmark: what a formulator might write instead of satline.

Reads the reference exported by `satline export --to csv` and a file of range screenings
(`which salts stay dissolved at L g/100g water from T1 C to T2 C margin M%`, one per line),
and answers each with pandas and SciPy: a PCHIP interpolant per solid phase, the stable
curve as the lowest phase covering each temperature, a 121-point grid over the range, and
the same pass rule as satline. Needs pandas, SciPy and periodictable (solubility ratio at least the loading's times 1 + margin).
Prints one JSON line per statement: the solutes that hold, sorted.

usage: python screen.py REFERENCE.csv STATEMENTS.txt
"""

import json
import re
import sys

import numpy as np
import pandas as pd
import periodictable
from scipy.interpolate import PchipInterpolator

STATEMENT = re.compile(
    r"which salts stay dissolved at ([0-9.]+) g/100g water from (-?[0-9.]+) C to (-?[0-9.]+) C"
    r"(?: margin ([0-9.]+)%)?"
)

def molar_mass(formula):
    """Molar mass, g/mol, from the formula (periodictable's atomic weights)."""
    return periodictable.formula(formula).mass


def to_ratio(row):
    """Grams of solute per gram of water."""
    if row.unit == "g/100g water":
        return row.value / 100.0
    if row.unit == "%w/w":
        return row.value / (100.0 - row.value)
    if row.unit == "mol/kg":
        return row.value * molar_mass(row.formula) / 1000.0
    return np.nan


def curves(reference):
    data = reference[(reference.kind == "salt") & (~reference.retired.astype(bool))]
    data = data[data.review != "rejected"].copy()
    data["ratio"] = data.apply(to_ratio, axis=1)
    out = {}
    for solute, by_solute in data.groupby("name"):
        phases = []
        for _, by_phase in by_solute.groupby("phase"):
            points = by_phase.groupby("temperature")["ratio"].first().sort_index()
            if len(points) < 2:
                continue
            t = points.index.to_numpy(dtype=float)
            phases.append((t[0], t[-1], PchipInterpolator(t, points.to_numpy())))
        if phases:
            out[solute] = phases
    return out


def holds(phases, load, t1, t2, margin):
    grid = np.linspace(t1, t2, 121)
    lowest = np.full(grid.shape, np.inf)
    covered = np.zeros(grid.shape, dtype=bool)
    for lo, hi, f in phases:
        inside = (grid >= lo) & (grid <= hi)
        if inside.any():
            lowest[inside] = np.minimum(lowest[inside], f(grid[inside]))
            covered |= inside
    if not covered.all():
        return None
    return lowest.min() >= load * (1.0 + margin)


def main():
    reference = pd.read_csv(sys.argv[1])
    table = curves(reference)
    with open(sys.argv[2], encoding="utf-8") as statements:
        for line in statements:
            m = STATEMENT.search(line)
            if not m:
                continue
            load = float(m.group(1)) / 100.0
            t1, t2 = float(m.group(2)), float(m.group(3))
            margin = float(m.group(4) or 0.0) / 100.0
            passing = sorted(s for s, p in table.items() if holds(p, load, t1, t2, margin))
            print(json.dumps(passing))


if __name__ == "__main__":
    main()
