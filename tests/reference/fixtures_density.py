"""Solution densities by Laliberté's model from PyPI `thermo` (thermo.electrochem, which
implements M. Laliberté, J. Chem. Eng. Data 54 (2009) 1725 with the published coefficients
of its data file), for every solute seed-data/densities.toml holds: at 0, 20 and 40 °C where
that temperature lies in the solute's fitted range and at the ends of that range (some sets
cover only a few kelvin), over its valid mass fractions (up to 0.95 for a set fitted up to
the pure liquid, w_max = 1, since satline refuses a "solution" of no water); and a few
mixtures, for the additive rule.
"""
import os
import tomllib

import thermo
from thermo import electrochem

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))

# Two- and three-solute mixtures at 20 °C: (solute ids, mass fractions).
MIXTURES = [
    (["sodium-chloride", "potassium-chloride"], [0.05, 0.05]),
    (["sodium-chloride", "sucrose"], [0.009, 0.05]),
    (["sodium-chloride", "potassium-chloride", "magnesium-sulfate"], [0.03, 0.02, 0.04]),
]


def _cas_by_name():
    electrochem._load_electrochem_data()
    data = electrochem.Laliberte_data
    return {str(data.loc[cas]["Name"]).strip(): cas for cas in data.index}


def densities():
    with open(os.path.join(ROOT, "seed-data", "densities.toml"), "rb") as f:
        sets = tomllib.load(f)["density"]
    cas = _cas_by_name()
    by_solute = {d["solute"]: cas[d["table_name"]] for d in sets}
    rows = []
    for d in sets:
        inside = [t for t in (0.0, 20.0, 40.0) if d["t_min"] <= t <= d["t_max"]]
        for t_c in sorted(set(inside + [float(d["t_min"]), float(d["t_max"])])):
            top = d["w_max"] if d["w_max"] < 1.0 else 0.95
            for k in range(0, 9):
                w = top * k / 8.0
                rho = electrochem.Laliberte_density(t_c + 273.15, [w], [by_solute[d["solute"]]])
                rows.append({"solutes": [d["solute"]], "w": [w], "t_c": t_c, "kg_per_m3": float(rho)})
    for solutes, ws in MIXTURES:
        rho = electrochem.Laliberte_density(293.15, ws, [by_solute[s] for s in solutes])
        rows.append({"solutes": solutes, "w": ws, "t_c": 20.0, "kg_per_m3": float(rho)})
    return {
        "versions": {"thermo": thermo.__version__},
        "source": "thermo.electrochem.Laliberte_density(T, ws, CASRNs), kg/m3",
        "rows": rows,
    }
