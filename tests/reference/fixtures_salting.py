"""Oxygen in seawater against oxygen in fresh water, from PyPI `gsw` (TEOS-10):
gsw.O2sol_SP_pt (Garcia & Gordon 1992's fit, umol/kg of solution) at practical salinity 35
and 0, each turned into a concentration per litre with gsw.rho, for the salting out of
oxygen by seawater's ions (tests/salting_out.rs).

Seawater's major ions are given as five salts in mol per kg of water, made from the
Reference Composition of F. J. Millero, R. Feistel, D. G. Wright and T. J. McDougall,
Deep-Sea Research I 55 (2008) 50-72 (mol per kg of seawater at SP = 35; the figures typed
from memory of its table, not read from it): Na+ 0.46890, Mg2+ 0.05282, Ca2+ 0.01028,
K+ 0.01021, Cl- 0.54586, SO4-2 0.02824 (the minor ions, 0.4 % of the salt, left out). As
salts: Na2SO4 the sulfate, MgCl2, CaCl2 and KCl their cations, NaCl the sodium left.
"""
import json
import os

import gsw

PER_KG_SEAWATER = {"Na": 0.46890, "Mg": 0.05282, "Ca": 0.01028, "K": 0.01021, "SO4": 0.02824}


def rows():
    sa = float(gsw.SA_from_SP(35.0, 0.0, 0.0, 0.0))
    water = 1.0 - sa / 1000.0  # kg of water per kg of seawater
    ions = {k: v / water for k, v in PER_KG_SEAWATER.items()}
    salts = {
        "Na2SO4": ions["SO4"],
        "MgCl2": ions["Mg"],
        "CaCl2": ions["Ca"],
        "KCl": ions["K"],
        "NaCl": ions["Na"] - 2.0 * ions["SO4"],
    }
    out = []
    for t in range(15, 36, 5):
        t = float(t)
        rho_sea = float(gsw.rho(sa, gsw.CT_from_pt(sa, t), 0.0))
        rho_fresh = float(gsw.rho(0.0, gsw.CT_from_pt(0.0, t), 0.0))
        sea = float(gsw.O2sol_SP_pt(35.0, t)) * rho_sea
        fresh = float(gsw.O2sol_SP_pt(0.0, t)) * rho_fresh
        out.append({"t_c": t, "ratio_per_litre": sea / fresh})
    return {"salts_mol_per_kg_water": salts, "rows": out}


def write(here):
    data = {
        "versions": {"gsw": gsw.__version__},
        "source": "gsw.O2sol_SP_pt(SP, pt) * gsw.rho(SA, CT, 0) at SP 35 over the same at SP 0",
        **rows(),
    }
    with open(os.path.join(here, "oxygen_seawater_gsw.json"), "w", encoding="utf-8") as f:
        json.dump(data, f, indent=1, ensure_ascii=False)
        f.write("\n")
