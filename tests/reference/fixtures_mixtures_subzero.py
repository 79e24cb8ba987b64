"""Fixtures of Pitzer's model for mixtures below 0 C, where recipes are frozen: every ion's
activity coefficient, the osmotic coefficient and the water activity from PyPI pytzer,
with libraries of the very parameter functions seed-data/models/ stores.

Systems (satline key -> pytzer functions):
    spencer-moller-weare-1990-mg-cl   bC_Mg_Cl_SMW90 (Spencer, Moller & Weare 1990), inside
                                      its temperatures
    greenberg-moller-1989-na-k-cl     as in fixtures_mixtures.py, evaluated below its 0 C
                                      lower bound: the use satline makes of it with
                                      `extrapolate` (rows marked "extrapolated")

Called from make_fixtures.py: write(HERE). Versions are recorded in the file.
"""
import json
import os

import jax

import fixtures_mixtures
import pytzer as pz
from pytzer.libraries import Library

P = pz.parameters


def smw90_mg_cl_library():
    lib = Library(name="spencer-moller-weare-1990-mg-cl")
    lib.update_Aphi(pz.debyehueckel.Aosm_CRP94)
    lib.update_func_J(pz.unsymmetrical.Harvie)
    lib.update_ca("Mg", "Cl", P.bC_Mg_Cl_SMW90)
    return lib


MG_CL_CASES = [
    ("MgCl2 0.5", {"Mg": 0.5, "Cl": 1.0}),
    ("MgCl2 1.5", {"Mg": 1.5, "Cl": 3.0}),
    ("MgCl2 2.5", {"Mg": 2.5, "Cl": 5.0}),
]

TEMPERATURES = [263.15, 253.15]


def write(here):
    rows = fixtures_mixtures.rows_of(
        "spencer-moller-weare-1990-mg-cl", smw90_mg_cl_library(), MG_CL_CASES, TEMPERATURES
    )
    extrapolated = fixtures_mixtures.rows_of(
        "greenberg-moller-1989-na-k-cl",
        fixtures_mixtures.gm89_library(),
        fixtures_mixtures.GM89_CASES,
        TEMPERATURES,
    )
    for row in extrapolated:
        row["extrapolated"] = True
    data = {
        "versions": {"pytzer": pz.__version__, "jax": jax.__version__},
        "source": "pytzer.model.log_activity_coefficients, osmotic_coefficient and activity_water with a Library of Aosm_CRP94, unsymmetrical.Harvie and the named parameter functions, 10.1325 dbar, at -10 and -20 C",
        "rows": rows + extrapolated,
    }
    with open(os.path.join(here, "mixtures_subzero_pytzer.json"), "w", encoding="utf-8") as f:
        json.dump(data, f, indent=1, ensure_ascii=False)
        f.write("\n")


if __name__ == "__main__":
    write(os.path.dirname(os.path.abspath(__file__)))
