"""Fixtures for the heat-of-solution and dissolving-temperature checks.

Written with the PyPI packages chemicals (CRC tables of standard thermodynamic properties of
crystals and of aqueous ions), thermo (Laliberté's heat-capacity correlation) and iapws
(IAPWS-95 heat capacity of water); versions are recorded in the file. satline carries the
CRC figures over as seed data; this computes ΔH°sol = Σ ν·ΔfH°(ion, aq) − ΔfH°(crystal)
straight from the library's own tables, so the Rust test compares the stored figures and our
arithmetic against them.
"""
import json
import os

import chemicals
import iapws
import thermo
from chemicals.heat_capacity import CRC_standard_data
from iapws import IAPWS95
from chemicals.elements import molecular_weight, simple_formula_parser
from scipy.integrate import quad
from scipy.optimize import brentq
from thermo.electrochem import CRC_aqueous_thermodynamics, Laliberte_heat_capacity, Laliberte_heat_capacity_i, Laliberte_data

HERE = os.path.dirname(os.path.abspath(__file__))

# satline formula -> (CRC crystal name, {CRC ion formula: count}, waters of a hydrate)
SALTS = {
    "NaCl": ("Sodium chloride", {"Na+": 1, "Cl-": 1}, 0),
    "KCl": ("Potassium chloride", {"K+": 1, "Cl-": 1}, 0),
    "LiCl": ("Lithium chloride", {"Li+": 1, "Cl-": 1}, 0),
    "CaCl2": ("Calcium chloride", {"Ca+2": 1, "Cl-": 2}, 0),
    "MgCl2": ("Magnesium chloride", {"Mg+2": 1, "Cl-": 2}, 0),
    "BaCl2": ("Barium chloride", {"Ba+2": 1, "Cl-": 2}, 0),
    "BaCl2·2H2O": ("Barium chloride dihydrate", {"Ba+2": 1, "Cl-": 2}, 2),
    "NaOH": ("Sodium hydroxide", {"Na+": 1, "OH-": 1}, 0),
    "Ca(OH)2": ("Calcium hydroxide", {"Ca+2": 1, "OH-": 2}, 0),
    "NH4NO3": ("Ammonium nitrate", {"NH4+": 1, "NO3-": 1}, 0),
    "NH4Cl": ("Ammonium chloride", {"NH4+": 1, "Cl-": 1}, 0),
    "(NH4)2SO4": ("Ammonium sulfate", {"NH4+": 2, "SO4-2": 1}, 0),
    "KNO3": ("Potassium nitrate", {"K+": 1, "NO3-": 1}, 0),
    "NaNO3": ("Sodium nitrate", {"Na+": 1, "NO3-": 1}, 0),
    "Ca(NO3)2": ("Calcium nitrate", {"Ca+2": 1, "NO3-": 2}, 0),
    "KBr": ("Potassium bromide", {"K+": 1, "Br-": 1}, 0),
    "KI": ("Potassium iodide", {"K+": 1, "I-": 1}, 0),
    "NaBr": ("Sodium bromide", {"Na+": 1, "Br-": 1}, 0),
    "NaI": ("Sodium iodide", {"Na+": 1, "I-": 1}, 0),
    "K2SO4": ("Potassium sulfate", {"K+": 2, "SO4-2": 1}, 0),
    "Na2SO4": ("Sodium sulfate", {"Na+": 2, "SO4-2": 1}, 0),
    "Li2SO4": ("Lithium sulfate", {"Li+": 2, "SO4-2": 1}, 0),
    "MgSO4": ("Magnesium sulfate", {"Mg+2": 1, "SO4-2": 1}, 0),
    "ZnSO4": ("Zinc sulfate", {"Zn+2": 1, "SO4-2": 1}, 0),
    "CuSO4": ("Copper(II) sulfate", {"Cu+2": 1, "SO4-2": 1}, 0),
    "K2CO3": ("Potassium carbonate", {"K+": 2, "CO3-2": 1}, 0),
    "Na2CO3": ("Sodium carbonate", {"Na+": 2, "CO3-2": 1}, 0),
    "Li2CO3": ("Lithium carbonate", {"Li+": 2, "CO3-2": 1}, 0),
    "NaHCO3": ("Sodium hydrogen carbonate", {"Na+": 1, "HCO3-": 1}, 0),
    "KClO3": ("Potassium chlorate", {"K+": 1, "ClO3-": 1}, 0),
    "KMnO4": ("Potassium permanganate", {"K+": 1, "MnO4-": 1}, 0),
    "KH2PO4": ("Potassium dihydrogen phosphate", {"K+": 1, "H2PO4-": 1}, 0),
    "Na2HPO4": ("Sodium hydrogen phosphate", {"Na+": 2, "HPO4-2": 1}, 0),
    "NaC2H3O2": ("Sodium acetate", {"Na+": 1, "CH3COO-": 1}, 0),
}


def crystal_hf(name):
    rows = CRC_standard_data[CRC_standard_data["Chemical"] == name]
    assert len(rows) == 1, name
    return float(rows["Hfs"].iloc[0])


def ion_hf(formula):
    rows = CRC_aqueous_thermodynamics[CRC_aqueous_thermodynamics["Formula"] == formula]
    assert len(rows) == 1, formula
    return float(rows["Hf(aq)"].iloc[0])


def standard_heats():
    water = float(CRC_standard_data[CRC_standard_data["Chemical"] == "Water"]["Hfl"].iloc[0])
    out = []
    for ours, (name, ions, waters) in SALTS.items():
        dh = sum(n * ion_hf(f) for f, n in ions.items()) + waters * water - crystal_hf(name)
        out.append({"crystal": ours, "standard_heat_kj_per_mol": dh / 1000.0})
    return out


def laliberte():
    rows = []
    for formula, cas in [("CaCl2", "10043-52-4"), ("NaOH", "1310-73-2"), ("KCl", "7447-40-7")]:
        d = Laliberte_data.loc[cas]
        a = [float(d["a1"]), float(d["a2"]), float(d["a3"]), float(d["a4"]), float(d["a5"]), float(d["a6"])]
        for t_c, w in [(25.0, 0.1), (40.0, 0.2), (60.0, 0.25)]:
            cp_i = Laliberte_heat_capacity_i(t_c + 273.15, 1.0 - w, *a) / 1000.0
            rows.append({"solute": formula, "t_c": t_c, "w_solute": w, "solute_cp_j_per_g_k": cp_i})
    return rows


def water_cp():
    rows = []
    for t in range(0, 100, 10):
        rows.append({"t_c": t, "cp_j_per_g_k": IAPWS95(T=t + 273.15, P=0.101325).cp})
    sat = IAPWS95(T=373.15, x=0)
    rows.append({"t_c": 100, "cp_j_per_g_k": sat.cp})
    return rows


# satline Pitzer set key -> (pytzer parameter function name, cation, anion, ν_M, ν_X,
# highest molality), for L_φ at 25 C.
PITZER_SETS = {
    "greenberg-moller-1989-cacl2": ("bC_Ca_Cl_GM89", "Ca", "Cl", 1, 2, 6.0),
    "greenberg-moller-1989-kcl": ("bC_K_Cl_GM89", "K", "Cl", 1, 1, 4.8),
    "moller-1988-nacl": ("bC_Na_Cl_M88", "Na", "Cl", 1, 1, 6.0),
}
R = 8.314462618


def relative_enthalpy_models():
    """pytzer models (the parameter functions of the papers satline stores, Clegg-Rard-Pitzer
    A-phi) keyed by satline set, for L_φ = −R·T²·∂(G_ex/(w RT))/∂T / m by jax's autodiff."""
    import jax

    jax.config.update("jax_enable_x64", True)
    import pytzer as pz
    from pytzer.libraries import Library

    models = {}
    for key, (func, cat, an, nc, na, mmax) in PITZER_SETS.items():
        lib = Library(name=key)
        lib.update_Aphi(pz.debyehueckel.Aosm_CRP94)
        lib.update_ca(cat, an, getattr(pz.parameters, func))

        # set_library changes pytzer's one global model: set it again before each use.
        def l_phi(m, t=298.15, lib=lib, cat=cat, an=an, nc=nc, na=na):
            model = pz.set_library(pz, lib).model
            g = lambda tk: model.Gibbs_nRT({cat: nc * m, an: na * m}, tk, 10.1325)
            return float(-R * t * t * jax.grad(g)(t) / m)

        models[key] = (l_phi, mmax)
    return models


def relative_enthalpies(models):
    rows = []
    for key, (l_phi, mmax) in models.items():
        for m in [0.1, 0.5, 1.0, 2.0, 3.0, 4.0, 6.0]:
            if m <= mmax:
                rows.append({"set": key, "temperature_k": 298.15, "molality": m, "l_phi_j_per_mol": l_phi(m)})
    return rows


# Batches for the dissolving-temperature check: (formula, CAS number, grams of solid, grams
# of water, start in C).
BATCHES = [
    ("CaCl2", "10043-52-4", 300.0, 1000.0, 20.0),
    ("NaOH", "1310-73-2", 100.0, 1000.0, 20.0),
    ("NH4NO3", "6484-52-2", 300.0, 1000.0, 20.0),
    ("KCl", "7447-40-7", 30.0, 100.0, 25.0),
]


# Solutes whose batch heat is the integral heat ΔH°sol + L_φ(m), by their Pitzer set.
INTEGRAL = {"CaCl2": "greenberg-moller-1989-cacl2", "KCl": "greenberg-moller-1989-kcl"}


def batch_temperatures(models):
    """The temperature a batch reaches with no heat exchanged, computed independently: the
    heat −n·ΔH°sol (ΔH°sol from chemicals' CRC tables, molar mass from chemicals) equals the
    integral of the solution's heat capacity (thermo's Laliberte_heat_capacity, water
    included by its own correlation) from the start to the end temperature, solved with
    scipy's brentq."""
    heats = {r["crystal"]: r["standard_heat_kj_per_mol"] for r in standard_heats()}
    rows = []
    for formula, cas, solid_g, water_g, start_c in BATCHES:
        mw = molecular_weight(simple_formula_parser(formula))
        molality = solid_g / mw / (water_g / 1000.0)
        l_phi = models[INTEGRAL[formula]][0](molality) if formula in INTEGRAL else 0.0
        q_j = -solid_g / mw * (heats[formula] * 1000.0 + l_phi)
        total_kg = (solid_g + water_g) / 1000.0
        w = solid_g / (solid_g + water_g)

        def cp(t_k):
            return Laliberte_heat_capacity(t_k, [w], [cas])  # J/(kg K)

        def balance(t_end_c):
            t0, t1 = start_c + 273.15, t_end_c + 273.15
            return total_kg * quad(cp, t0, t1)[0] - q_j

        end_c = brentq(balance, start_c - 40.0, start_c + 75.0)
        rows.append({
            "solute": formula, "solid_g": solid_g, "water_g": water_g, "start_c": start_c,
            "molar_mass": mw, "standard_heat_kj_per_mol": heats[formula],
            "l_phi_j_per_mol": l_phi, "end_c": end_c,
        })
    return rows


def thermochemistry_fixtures():
    import pytzer

    versions = {"chemicals": chemicals.__version__, "thermo": thermo.__version__, "iapws": iapws.__version__}
    models = relative_enthalpy_models()
    return {
        "thermochemistry_chemicals.json": {
            "versions": versions,
            "source": "chemicals: CRC Standard Thermodynamic Properties of Chemical Substances (Hfs, Hfl) and "
            "thermo.electrochem.CRC_aqueous_thermodynamics (Hf(aq)); ΔH°sol = Σ ν·ΔfH°(ion, aq) + n·ΔfH°(H2O, l) − ΔfH°(crystal), kJ/mol",
            "rows": standard_heats(),
        },
        "heat_capacity_reference.json": {
            "versions": versions,
            "source": "thermo.electrochem.Laliberte_heat_capacity_i (Laliberté 2009), J/(g K); iapws.IAPWS95 cp of water at 0.101325 MPa (100 C: saturated liquid), J/(g K)",
            "laliberte": laliberte(),
            "water": water_cp(),
        },
        "dissolving_batches.json": {
            "versions": {**versions, "scipy": __import__("scipy").__version__, "pytzer": pytzer.__version__},
            "source": "adiabatic batch temperature: -n·(ΔH°sol + L_φ(m)) (chemicals CRC tables; L_φ by pytzer for CaCl2 and KCl, "
            "0 for the others) = (m_water + m_solid)·∫Cp dT with "
            "thermo.electrochem.Laliberte_heat_capacity (water by Laliberté's own correlation), solved by scipy.optimize.brentq",
            "rows": batch_temperatures(models),
        },
        "relative_enthalpy_pytzer.json": {
            "versions": {**versions, "pytzer": pytzer.__version__},
            "source": "L_φ = −R·T²·∂(G_ex/(w_w RT))/∂T / m, J/mol, at 298.15 K: pytzer's Gibbs_nRT with the parameter "
            "functions of the papers (GM89, M88) and Aosm_CRP94, differentiated by jax",
            "rows": relative_enthalpies(models),
        },
    }


def write_all():
    for name, data in thermochemistry_fixtures().items():
        with open(os.path.join(HERE, name), "w", encoding="utf-8") as f:
            json.dump(data, f, indent=1, ensure_ascii=False)
            f.write("\n")


if __name__ == "__main__":
    write_all()
