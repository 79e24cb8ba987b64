"""Fixtures of salts' solubilities in mixtures at 25 C, predicted by PyPI pytzer from the same
data satline uses: the solubility product of halite (NaCl) and sylvite (KCl) taken where
each alone saturates pure water at the reference's own curve value at 25 C
(seed-data/solutes/*.toml, dataset crc-97), then

    NaCl in MgCl2 and in CaCl2 brines   Harvie, Moller & Weare (1984) library
    the NaCl-KCl-H2O invariant point    Greenberg & Moller (1989) library (the system
                                        satline chooses for Na-K-Cl at 25 C)

(the libraries of fixtures_mixtures.py: Aosm_CRP94, Harvie's J). An independent solver and
implementation of the same equations and data: it checks satline's solubility products,
its solubility search and its unit conversions, not the data themselves.

Called from make_fixtures.py: write(HERE). Versions are recorded in the file.
"""
import json
import os
import tomllib

import jax
import numpy as np
import periodictable
from scipy.optimize import brentq, fsolve

import fixtures_mixtures
import pytzer as pz

SEED = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "seed-data", "solutes")
BRINES = [0.5, 1.0, 2.0, 3.0, 4.0]


def curve_at_25(file):
    with open(os.path.join(SEED, file), "rb") as f:
        data = tomllib.load(f)
    crc = next(d for d in data["dataset"] if d["key"] == "crc-97")
    assert crc["unit"] == "%w/w"
    w = next(v for t, v in crc["points"] if t == 25) / 100.0
    return w


def molality(w, formula):
    return w / (1.0 - w) / periodictable.formula(formula).mass * 1000.0


def ln_iap(model, ions, salt):
    """ln of the ion activity product of a 1:1 chloride `salt` (its cation) in `ions`."""
    solutes = {k: np.array(float(v)) for k, v in ions.items()}
    g = model.log_activity_coefficients(solutes, 298.15, 10.1325)
    return float(np.log(ions[salt]) + g[salt] + np.log(ions["Cl"]) + g["Cl"])


def with_all(lib, given):
    out = {ion: 0.0 for ion in list(lib.cations) + list(lib.anions)}
    out.update(given)
    return out


def nacl_in_brines(rows):
    lib = fixtures_mixtures.hmw84_library()
    model = pz.set_library(pz, lib).model
    w = curve_at_25("sodium-chloride.toml")
    m_sat = molality(w, "NaCl")
    ln_k = ln_iap(model, with_all(lib, {"Na": m_sat, "Cl": m_sat}), "Na")
    for cation, formula in [("Mg", "MgCl2"), ("Ca", "CaCl2")]:
        for mb in BRINES:
            def excess(m):
                ions = with_all(lib, {"Na": m, cation: mb, "Cl": m + 2 * mb})
                return ln_iap(model, ions, "Na") - ln_k
            m = brentq(excess, 1e-6, 8.0, xtol=1e-12)
            rows.append({
                "system": "harvie-moller-weare-1984",
                "salt": "NaCl",
                "brine": formula,
                "brine_molality": mb,
                "solubility_mol_kg": m,
                "pure_water_mass_fraction": w,
            })


def invariant_point(rows):
    lib = fixtures_mixtures.gm89_library()
    model = pz.set_library(pz, lib).model
    w_na, w_k = curve_at_25("sodium-chloride.toml"), curve_at_25("potassium-chloride.toml")
    m_na, m_k = molality(w_na, "NaCl"), molality(w_k, "KCl")
    k_na = ln_iap(model, with_all(lib, {"Na": m_na, "Cl": m_na}), "Na")
    k_k = ln_iap(model, with_all(lib, {"K": m_k, "Cl": m_k}), "K")

    def f(x):
        ions = with_all(lib, {"Na": x[0], "K": x[1], "Cl": x[0] + x[1]})
        return [ln_iap(model, ions, "Na") - k_na, ln_iap(model, ions, "K") - k_k]

    na, k = fsolve(f, [5.1, 2.1], xtol=1e-12)
    rows.append({
        "system": "greenberg-moller-1989-na-k-cl",
        "salt": "NaCl+KCl",
        "invariant_nacl_mol_kg": float(na),
        "invariant_kcl_mol_kg": float(k),
        "pure_water_mass_fractions": [w_na, w_k],
    })


def write(here):
    jax.config.update("jax_enable_x64", True)
    rows = []
    nacl_in_brines(rows)
    invariant_point(rows)
    data = {
        "versions": {"pytzer": pz.__version__, "jax": jax.__version__, "periodictable": periodictable.__version__},
        "source": "pytzer.model.log_activity_coefficients with the libraries of fixtures_mixtures.py, 298.15 K, 10.1325 dbar; ln K from the reference's 25 C solubilities; scipy brentq and fsolve",
        "rows": rows,
    }
    with open(os.path.join(here, "mixture_solubility_pytzer.json"), "w", encoding="utf-8") as f:
        json.dump(data, f, indent=1, ensure_ascii=False)
        f.write("\n")


if __name__ == "__main__":
    write(os.path.dirname(os.path.abspath(__file__)))
