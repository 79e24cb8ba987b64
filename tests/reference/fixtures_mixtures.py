"""Fixtures of Pitzer's model for mixed electrolytes: every ion's activity coefficient, the
osmotic coefficient and the water activity of a few mixtures, from PyPI pytzer with a
library built here of the very parameter functions named after the papers whose figures
seed-data/models/ stores (same A-phi, Clegg, Rard & Pitzer 1994, and the same J(x), Harvie's
Chebyshev method as Pitzer 1991 ch. 3 describes it).

Systems (satline key -> pytzer functions):
    harvie-moller-weare-1984   the *_HMW84 functions at 298.15 K (Na-K-Mg-Ca-Cl-SO4)
    greenberg-moller-1989-na-k-cl   bC_Na_Cl_M88, bC_K_Cl_GM89, theta_K_Na_GM89,
                               psi_K_Na_Cl_GM89 (273.15 to 523.15 K)

Called from make_fixtures.py: write(HERE). Versions are recorded in the file.
"""
import json
import os

import jax

jax.config.update("jax_enable_x64", True)

import pytzer as pz  # noqa: E402
from pytzer.libraries import Library  # noqa: E402

P = pz.parameters

HMW_IONS = ["Na", "K", "Mg", "Ca", "Cl", "SO4"]
CATIONS = {"Na", "K", "Mg", "Ca"}


def hmw84_library():
    lib = Library(name="harvie-moller-weare-1984")
    lib.update_Aphi(pz.debyehueckel.Aosm_CRP94)
    lib.update_func_J(pz.unsymmetrical.Harvie)
    for c in ["Na", "K", "Mg", "Ca"]:
        for a in ["Cl", "SO4"]:
            lib.update_ca(c, a, getattr(P, "bC_%s_%s_HMW84" % (c, a)))
    for name in dir(P):
        if not name.endswith("_HMW84"):
            continue
        parts = name.split("_")
        kind, ions = parts[0], parts[1:-1]
        if not set(ions) <= set(HMW_IONS):
            continue
        func = getattr(P, name)
        if kind == "theta":
            if ions[0] in CATIONS:
                lib.update_cc(ions[0], ions[1], func)
            else:
                lib.update_aa(ions[0], ions[1], func)
        elif kind == "psi":
            if ions[1] in CATIONS:
                lib.update_cca(ions[0], ions[1], ions[2], func)
            else:
                lib.update_caa(ions[0], ions[1], ions[2], func)
    return lib


def gm89_library():
    lib = Library(name="greenberg-moller-1989-na-k-cl")
    lib.update_Aphi(pz.debyehueckel.Aosm_CRP94)
    lib.update_func_J(pz.unsymmetrical.Harvie)
    lib.update_ca("Na", "Cl", P.bC_Na_Cl_M88)
    lib.update_ca("K", "Cl", P.bC_K_Cl_GM89)
    lib.update_cc("K", "Na", P.theta_K_Na_GM89)
    lib.update_cca("K", "Na", "Cl", P.psi_K_Na_Cl_GM89)
    return lib


# Seawater-like: the major ions of standard seawater at salinity 35 (mol/kg water),
# rounded, chloride balancing the charge; then twice and four times as strong.
SEAWATER = {"Na": 0.4860, "K": 0.0106, "Mg": 0.0547, "Ca": 0.0107, "Cl": 0.5688, "SO4": 0.0293}

HMW84_CASES = [
    ("NaCl+KCl 1+1", {"Na": 1.0, "K": 1.0, "Cl": 2.0}),
    ("NaCl+KCl 4+1.5", {"Na": 4.0, "K": 1.5, "Cl": 5.5}),
    ("NaCl+MgCl2 1+0.5", {"Na": 1.0, "Mg": 0.5, "Cl": 2.0}),
    ("NaCl+MgCl2 3+1", {"Na": 3.0, "Mg": 1.0, "Cl": 5.0}),
    ("NaCl+Na2SO4 1+0.5", {"Na": 2.0, "Cl": 1.0, "SO4": 0.5}),
    ("NaCl+Na2SO4 3+1", {"Na": 5.0, "Cl": 3.0, "SO4": 1.0}),
    ("NaCl+CaCl2 2+1", {"Na": 2.0, "Ca": 1.0, "Cl": 4.0}),
    ("seawater-like", SEAWATER),
    ("seawater-like x2", {k: 2 * v for k, v in SEAWATER.items()}),
    ("seawater-like x4", {k: 4 * v for k, v in SEAWATER.items()}),
]

GM89_CASES = [
    ("NaCl+KCl 1+1", {"Na": 1.0, "K": 1.0, "Cl": 2.0}),
    ("NaCl+KCl 4+1.5", {"Na": 4.0, "K": 1.5, "Cl": 5.5}),
    ("NaCl+KCl 0.2+2", {"Na": 0.2, "K": 2.0, "Cl": 2.2}),
]


def rows_of(system, lib, cases, temps):
    model = pz.set_library(pz, lib).model
    rows = []
    for t in temps:
        for label, given in cases:
            solutes = {ion: given.get(ion, 0.0) for ion in list(lib.cations) + list(lib.anions)}
            ln_g = model.log_activity_coefficients(solutes, t, 10.1325)
            rows.append({
                "system": system,
                "case": label,
                "temperature_k": t,
                "molalities": given,
                "ln_activity_coefficients": {k: float(v) for k, v in ln_g.items() if k in given},
                "osmotic_coefficient": float(model.osmotic_coefficient(solutes, t, 10.1325)),
                "water_activity": float(model.activity_water(solutes, t, 10.1325)),
            })
    return rows


def write(here):
    rows = rows_of("harvie-moller-weare-1984", hmw84_library(), HMW84_CASES, [298.15])
    rows += rows_of("greenberg-moller-1989-na-k-cl", gm89_library(), GM89_CASES, [273.15, 298.15, 323.15])
    data = {
        "versions": {"pytzer": pz.__version__, "jax": jax.__version__},
        "source": "pytzer.model.log_activity_coefficients, osmotic_coefficient and activity_water with a Library of Aosm_CRP94, unsymmetrical.Harvie and the named parameter functions, 10.1325 dbar",
        "rows": rows,
    }
    with open(os.path.join(here, "mixtures_pytzer.json"), "w", encoding="utf-8") as f:
        json.dump(data, f, indent=1, ensure_ascii=False)
        f.write("\n")


if __name__ == "__main__":
    write(os.path.dirname(os.path.abspath(__file__)))
