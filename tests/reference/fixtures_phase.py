"""Fixtures of the salt-water phase diagram: Pitzer osmotic coefficients and water
activities of single electrolytes (PyPI pytzer, with the very parameter functions named
after the papers whose figures seed-data/models/ stores, and Møller's 1988 A-phi), and the
freezing curves of brines from PyPI CoolProp's incompressible fluids (Melinder 2010).

Called from make_fixtures.py: write(HERE). Versions are recorded in each file.
"""
import json
import os

import jax

jax.config.update("jax_enable_x64", True)

import CoolProp  # noqa: E402
import CoolProp.CoolProp as CP  # noqa: E402
import pytzer as pz  # noqa: E402
from pytzer.libraries import Library  # noqa: E402
from pytzer.parameters import spencer1990  # noqa: E402

# satline set key -> (pytzer parameter function, cation, anion, cation count, anion count,
# temperatures K, highest molality)
SETS = {
    "pitzer-mayorga-1973-nacl": (pz.parameters.bC_Na_Cl_PM73, "Na", "Cl", 1, 1, [298.15], 6.0),
    "pitzer-mayorga-1973-kcl": (pz.parameters.bC_K_Cl_PM73, "K", "Cl", 1, 1, [298.15], 4.8),
    "pitzer-mayorga-1973-licl": (pz.parameters.bC_Li_Cl_PM73, "Li", "Cl", 1, 1, [298.15], 6.0),
    "pitzer-mayorga-1973-nh4no3": (pz.parameters.bC_NH4_NO3_PM73, "NH4", "NO3", 1, 1, [298.15], 6.0),
    "pitzer-mayorga-1973-cacl2": (pz.parameters.bC_Ca_Cl_PM73, "Ca", "Cl", 1, 2, [298.15], 2.5),
    "pitzer-mayorga-1973-mgcl2": (pz.parameters.bC_Mg_Cl_PM73, "Mg", "Cl", 1, 2, [298.15], 4.5),
    "pitzer-mayorga-1973-na2so4": (pz.parameters.bC_Na_SO4_PM73, "Na", "SO4", 2, 1, [298.15], 4.0),
    "moller-1988-nacl": (pz.parameters.bC_Na_Cl_M88, "Na", "Cl", 1, 1, [273.15, 298.15, 323.15], 6.0),
    "greenberg-moller-1989-kcl": (pz.parameters.bC_K_Cl_GM89, "K", "Cl", 1, 1, [273.15, 298.15, 323.15], 4.8),
    "greenberg-moller-1989-cacl2": (pz.parameters.bC_Ca_Cl_GM89, "Ca", "Cl", 1, 2, [298.15, 323.15], 6.0),
    "spencer-moller-weare-1990-mgcl2": (spencer1990.bC_Mg_Cl_SMW90, "Mg", "Cl", 1, 2, [263.15, 273.15, 298.15], 5.0),
}

MOLALITIES = [0.1, 0.5, 1.0, 2.0, 3.0, 4.0, 5.0, 6.0]

# CoolProp fluid -> (satline solute formula, highest mass fraction checked: the fluid's
# range, capped at the eutectic composition where the freezing curve ends)
BRINES = {
    "MNA": ("NaCl", 0.23),
    "MCA": ("CaCl2", 0.29),
    "MMG": ("MgCl2", 0.20),
    "MKC": ("K2CO3", 0.39),
    "MLI": ("LiCl", 0.22),
    "MKA": ("CH3COOK", 0.44),
    "MKF": ("HCOOK", 0.47),
}


def pitzer():
    rows = []
    for key, (func, cat, an, nc, na, temps, mmax) in SETS.items():
        lib = Library(name=key)
        lib.update_Aphi(pz.debyehueckel.Aosm_CRP94)
        lib.update_ca(cat, an, func)
        model = pz.set_library(pz, lib).model
        for t in temps:
            for m in MOLALITIES:
                if m > mmax:
                    continue
                solutes = {cat: nc * m, an: na * m}
                rows.append({
                    "set": key,
                    "temperature_k": t,
                    "molality": m,
                    "osmotic_coefficient": float(model.osmotic_coefficient(solutes, t, 10.1325)),
                    "water_activity": float(model.activity_water(solutes, t, 10.1325)),
                })
    return rows


def ice_lines():
    rows = []
    for fluid, (formula, wmax) in BRINES.items():
        name = "INCOMP::" + fluid
        w = 0.01
        while w <= wmax + 1e-9:
            t = CP.PropsSI("T_freeze", "T", 273.15, "P", 101325, "%s[%.4f]" % (name, w))
            rows.append({"fluid": fluid, "solute": formula, "mass_fraction": round(w, 4), "freezing_k": t})
            w += 0.01
    return rows


def write(here):
    versions = {"pytzer": pz.__version__, "jax": jax.__version__, "CoolProp": CoolProp.__version__}
    files = {
        "pitzer_pytzer.json": {
            "versions": versions,
            "source": "pytzer.model.osmotic_coefficient and activity_water, one electrolyte, library of Aosm_CRP94 and the named parameter function, 10.1325 dbar",
            "rows": pitzer(),
        },
        "ice_lines_coolprop.json": {
            "versions": versions,
            "source": "CoolProp PropsSI('T_freeze', ..., 'INCOMP::<fluid>[w]'), Melinder 2010 brines",
            "rows": ice_lines(),
        },
    }
    for name, data in files.items():
        with open(os.path.join(here, name), "w", encoding="utf-8") as f:
            json.dump(data, f, indent=1, ensure_ascii=False)
            f.write("\n")


if __name__ == "__main__":
    write(os.path.dirname(os.path.abspath(__file__)))
