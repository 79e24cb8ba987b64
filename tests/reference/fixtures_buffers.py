"""Fixtures of acid-base dissociation constants from PyPI pytzer (pytzer.dissociation), the
thermodynamic constants (I = 0) of the papers named in each series, at 0, 5, ..., 40 C:

    H2PO4_MP98   phosphoric acid, second step   Millero & Pierrot (1998)
    H2CO3_PB82   carbonic acid, first step      Plummer & Busenberg (1982)
    HCO3_PB82    carbonic acid, second step     Plummer & Busenberg (1982)
    trisH_BH61   Tris (TrisH+ = Tris + H+)      Bates & Hetzer (1961)

pytzer gives ln K; the fixture holds pK = -ln K / ln 10. `cargo test --test
buffers_reference` compares satline's pK(T) (van 't Hoff with a constant heat-capacity
change, seed-data/models/acid-base-goldberg-2002.toml) with these.

Called from make_fixtures.py: write(HERE). Versions are recorded in the file.
"""
import json
import math
import os

import pytzer as pz
import pytzer.dissociation as dissociation

SERIES = [
    ("phosphoric-acid", 2, "H2PO4_MP98", "Millero & Pierrot (1998), Aquatic Geochemistry 4, 153-199"),
    ("carbonic-acid", 1, "H2CO3_PB82", "Plummer & Busenberg (1982), Geochim. Cosmochim. Acta 46, 1011-1040"),
    ("carbonic-acid", 2, "HCO3_PB82", "Plummer & Busenberg (1982), Geochim. Cosmochim. Acta 46, 1011-1040"),
    ("tris", 1, "trisH_BH61", "Bates & Hetzer (1961), J. Phys. Chem. 65, 667-671"),
]


def write(here):
    series = []
    for acid, step, function, paper in SERIES:
        fn = getattr(dissociation, function)
        points = []
        for t_c in range(0, 45, 5):
            t_k = 273.15 + t_c
            points.append({"t_c": t_c, "pk": -float(fn(T=t_k)) / math.log(10.0)})
        series.append(
            {
                "acid": acid,
                "step": step,
                "function": f"pytzer.dissociation.{function}",
                "paper": paper,
                "points": points,
            }
        )
    data = {
        "versions": {"pytzer": pz.__version__},
        "source": "pytzer.dissociation: ln K of the named papers' equations at I = 0; pK = -ln K / ln 10",
        "series": series,
    }
    with open(os.path.join(here, "buffers_pytzer.json"), "w", encoding="utf-8") as f:
        json.dump(data, f, indent=1, ensure_ascii=False)
        f.write("\n")


if __name__ == "__main__":
    write(os.path.dirname(os.path.abspath(__file__)))
