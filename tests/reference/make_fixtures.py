#!/usr/bin/env python3
"""Writes the reference fixtures that satline's science tests compare against.

Sources (general-purpose reference libraries from PyPI; versions used to write the
committed fixtures):
    periodictable 2.1.0   molar masses of formulas
    gsw           3.6.23  TEOS-10: O2 solubility in air-saturated water, O2sol_SP_pt
    iapws         1.5.5   IAPWS-95: saturation pressure and density of pure water
    thermo        0.6.1   Laliberté's solution densities (fixtures_density.py)

Run:  python3 -m venv venv && venv/bin/pip install periodictable gsw iapws
      venv/bin/python tests/reference/make_fixtures.py
`cargo test` reads only the JSON written here; it never needs Python.
"""
import json
import os

import fixtures_corroboration

import gsw
import iapws
import periodictable

import fixtures_density
from iapws import IAPWS95

HERE = os.path.dirname(os.path.abspath(__file__))

VERSIONS = {
    "periodictable": periodictable.__version__,
    "gsw": gsw.__version__,
    "iapws": iapws.__version__,
}

# satline spelling -> periodictable spelling (periodictable writes hydrates as `+nH2O`).
FORMULAS = {
    "NaCl": "NaCl",
    "KCl": "KCl",
    "KNO3": "KNO3",
    "(NH4)2SO4": "(NH4)2SO4",
    "C12H22O11": "C12H22O11",
    "Na2SO4": "Na2SO4",
    "Na2SO4·10H2O": "Na2SO4+10H2O",
    "CuSO4·5H2O": "CuSO4+5H2O",
    "Ca(NO3)2·4H2O": "Ca(NO3)2+4H2O",
    "KAl(SO4)2·12H2O": "KAl(SO4)2+12H2O",
    "MgSO4·7H2O": "MgSO4+7H2O",
    "CaCl2·6H2O": "CaCl2+6H2O",
    "Na2CO3·10H2O": "Na2CO3+10H2O",
    "K2Cr2O7": "K2Cr2O7",
    "NaHCO3": "NaHCO3",
    "KH2PO4": "KH2PO4",
    "Na2HPO4·12H2O": "Na2HPO4+12H2O",
    "C6H12O6": "C6H12O6",
    "CO(NH2)2": "CO(NH2)2",
    "Pb(NO3)2": "Pb(NO3)2",
    "BaCl2·2H2O": "BaCl2+2H2O",
    "AgNO3": "AgNO3",
    "HgCl2": "HgCl2",
    "O2": "O2",
    "CO2": "CO2",
    "N2": "N2",
    "H2O": "H2O",
    "UO2(NO3)2·6H2O": "UO2(NO3)2+6H2O",
    "Th(NO3)4": "Th(NO3)4",
    "Bi(NO3)3·5H2O": "Bi(NO3)3+5H2O",
}


def molar_masses():
    return [
        {"formula": ours, "molar_mass_g_per_mol": periodictable.formula(theirs).mass}
        for ours, theirs in FORMULAS.items()
    ]


def elements():
    # Element masses Z = 1..92 as periodictable tabulates them (for elements without a
    # standard atomic weight it gives the mass of a long-lived isotope).
    return [
        {"symbol": el.symbol, "z": el.number, "mass_g_per_mol": el.mass}
        for el in periodictable.elements
        if 1 <= el.number <= 92
    ]


def oxygen():
    # O2 in fresh water (practical salinity 0) in equilibrium with water-saturated air at
    # 1 atm total pressure, TEOS-10 gsw.O2sol_SP_pt, umol/kg of solution.
    return [
        {"t_c": float(t), "o2_umol_per_kg": float(gsw.O2sol_SP_pt(0.0, float(t)))}
        for t in range(0, 41, 5)
    ]


def water():
    rows = []
    for t in range(0, 101, 5):
        t_k = 273.16 if t == 0 else t + 273.15  # IAPWS-95 saturation starts at the triple point
        sat = IAPWS95(T=t_k, x=0)
        row = {"t_k": t_k, "saturation_pressure_pa": sat.P * 1e6}
        if t < 100:
            row["density_t_k"] = t + 273.15
            row["density_kg_per_m3_at_1atm"] = IAPWS95(T=t + 273.15, P=0.101325).rho
        rows.append(row)
    return rows


def main():
    fixtures = {
        "molar_masses.json": {"versions": VERSIONS, "source": "periodictable", "rows": molar_masses()},
        "elements.json": {"versions": VERSIONS, "source": "periodictable element masses", "rows": elements()},
        "oxygen_gsw.json": {
            "versions": VERSIONS,
            "source": "gsw.O2sol_SP_pt(SP=0, pt=t), umol/kg",
            "rows": oxygen(),
        },
        "water_iapws95.json": {
            "versions": VERSIONS,
            "source": "iapws.IAPWS95: saturation pressure (x=0) and density at 0.101325 MPa",
            "rows": water(),
        },
    }
    fixtures["densities_laliberte.json"] = fixtures_density.densities()
    for name, data in fixtures.items():
        with open(os.path.join(HERE, name), "w", encoding="utf-8") as f:
            json.dump(data, f, indent=1, ensure_ascii=False)
            f.write("\n")
    __import__("fixtures_phase").write(HERE)  # phase diagram: pytzer, CoolProp
    __import__("fixtures_mixtures").write(HERE)  # mixed electrolytes: pytzer
    __import__("fixtures_mixtures_subzero").write(HERE)  # mixtures below 0 C: pytzer
    __import__("fixtures_mixture_solubility").write(HERE)  # salts in brines at 25 C: pytzer
    __import__("fixtures_buffers").write(HERE)  # acid-base dissociation constants: pytzer
    fixtures_corroboration.write_checks()
    __import__("fixtures_brine_checks").write_checks()  # ice lines, water activity, density ranges
    __import__("fixtures_thermochemistry").write_all()
    __import__("fixtures_salting").write(HERE)  # O2 in seawater: gsw
    __import__("fixtures_antifreeze").write(HERE)  # glycol, glycerol, methanol ice lines: CoolProp
    __import__("fixtures_mixture_ice").write(HERE)  # ice lines of mixtures by Pitzer: pytzer


if __name__ == "__main__":
    main()
