"""Fixtures for the ice line of a mixture from its solutes' own freezing points (satline's
science::mixture_ice, the Zdanovskii-Stokes-Robinson rule): a thermodynamic model of the
mixture, Pitzer's equations as PyPI pytzer computes them, gives both sides.

For each system it writes
    binaries  each salt alone: the molality whose water activity equals that of water over
              ice at T (its freezing curve by the model), every 0.25 K from -0.25 C down;
    mixtures  a few mixtures of the two salts: their freezing point by the same model (the
              mixture's water activity, with the mixing parameters, equal to ice's).
The test feeds the binaries to satline as freezing tables and compares satline's ice line
of each mixture with the model's: the difference is the rule's own error against a model
that includes how the ions act on each other, with no difference in the data.

Systems (parameter functions of pytzer 0.6.0, named after their papers):
    na-k-cl    fixtures_mixtures.gm89_library(): bC_Na_Cl_M88, bC_K_Cl_GM89, theta_K_Na_GM89,
               psi_K_Na_Cl_GM89 (Moller 1988; Greenberg & Moller 1989), evaluated a few
               kelvin below their 0 C lower bound, the same functions on both sides
    na-mg-cl   bC_Na_Cl_M88, bC_Mg_Cl_SMW90 (Spencer, Moller & Weare 1990, -60 to 25 C),
               theta_Mg_Na_HMW84, psi_Mg_Na_Cl_HMW84 (Harvie, Moller & Weare 1984, 25 C
               values held constant)

The ice-water equilibrium is the relation and constants of satline's science::activity::ice
(fixtures_brine_checks.ln_aw_ice). Called from make_fixtures.py: write(HERE).
"""
import json
import math
import os

import jax

jax.config.update("jax_enable_x64", True)

import pytzer as pz  # noqa: E402
from pytzer.libraries import Library  # noqa: E402
from scipy.optimize import brentq  # noqa: E402

import fixtures_mixtures  # noqa: E402
from fixtures_brine_checks import ln_aw_ice  # noqa: E402

P = pz.parameters
PRESSURE_DBAR = 10.1325


def na_mg_cl_library():
    lib = Library(name="na-mg-cl")
    lib.update_Aphi(pz.debyehueckel.Aosm_CRP94)
    lib.update_func_J(pz.unsymmetrical.Harvie)
    lib.update_ca("Na", "Cl", P.bC_Na_Cl_M88)
    lib.update_ca("Mg", "Cl", P.bC_Mg_Cl_SMW90)
    lib.update_cc("Mg", "Na", P.theta_Mg_Na_HMW84)
    lib.update_cca("Mg", "Na", "Cl", P.psi_Mg_Na_Cl_HMW84)
    return lib


# salt -> (cation, cations per formula unit); every anion is Cl.
SALTS = {"NaCl": ("Na", 1), "KCl": ("K", 1), "MgCl2": ("Mg", 2)}

SYSTEMS = [
    # (key, library, salts, lowest temperature of the binaries in C, mixtures in mol/kg)
    ("na-k-cl", fixtures_mixtures.gm89_library, ["NaCl", "KCl"], -10.0,
     [(1.0, 0.5), (1.5, 1.0), (0.5, 1.5), (2.0, 0.5), (0.3, 0.3)]),
    ("na-mg-cl", na_mg_cl_library, ["NaCl", "MgCl2"], -16.0,
     [(1.0, 0.3), (0.5, 0.8), (1.5, 0.5), (2.0, 0.2), (0.3, 0.3)]),
]


def ions_of(lib, amounts):
    """Molalities of every ion of the library for {salt: molality}."""
    ions = {ion: 0.0 for ion in list(lib.cations) + list(lib.anions)}
    for salt, m in amounts.items():
        cation, n_cl = SALTS[salt]
        ions[cation] += m
        ions["Cl"] += n_cl * m
    return ions


def freezing_k(model, lib, amounts):
    def gap(t):
        aw = float(model.activity_water(ions_of(lib, amounts), t, PRESSURE_DBAR))
        return math.log(aw) - ln_aw_ice(t)

    return brentq(gap, 273.15 - 40.0, 273.15, xtol=1e-8)


def binary_at(model, lib, salt, t_k):
    """The molality of `salt` alone whose freezing point is t_k."""
    def gap(m):
        aw = float(model.activity_water(ions_of(lib, {salt: m}), t_k, PRESSURE_DBAR))
        return math.log(aw) - ln_aw_ice(t_k)

    return brentq(gap, 1e-9, 8.0, xtol=1e-12)


def system_rows(key, make_lib, salts, lowest_c, mixtures):
    lib = make_lib()
    model = pz.set_library(pz, lib).model
    steps = int(round(-lowest_c / 0.25))
    binaries = {}
    for salt in salts:
        rows = [[0.0, 273.15]]
        for k in range(1, steps + 1):
            t_k = 273.15 - 0.25 * k
            rows.append([binary_at(model, lib, salt, t_k), t_k])
        binaries[salt] = rows
    cases = []
    for m1, m2 in mixtures:
        amounts = {salts[0]: m1, salts[1]: m2}
        cases.append({"molalities": amounts, "freezing_k": freezing_k(model, lib, amounts)})
    return {"key": key, "salts": salts, "binaries": binaries, "mixtures": cases}


def write(here):
    data = {
        "versions": {"pytzer": pz.__version__, "jax": jax.__version__},
        "source": (
            "pytzer.model.activity_water with a Library of Aosm_CRP94, unsymmetrical.Harvie and "
            "the named parameter functions, 10.1325 dbar; freezing where ln a_w equals that of "
            "water over ice (dH = 6010 J/mol, dCp = 37.89 J/(mol K), as satline's "
            "science::activity::ice), by scipy.optimize.brentq; binaries in [molality, K] rows"
        ),
        "systems": [system_rows(*s) for s in SYSTEMS],
    }
    with open(os.path.join(here, "mixture_ice_pytzer.json"), "w", encoding="utf-8") as f:
        json.dump(data, f, indent=1, ensure_ascii=False)
        f.write("\n")


if __name__ == "__main__":
    write(os.path.dirname(os.path.abspath(__file__)))
