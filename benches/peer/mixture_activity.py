"""Peer of benches/mixture.rs: the same work with PyPI pytzer (same parameter functions,
Aosm_CRP94, Harvie's J): the activity coefficients of the 6-ion mixture, and the
saturation indices of its 8 solids at 100 temperatures. Prints microseconds per call as
`peer activity_us=... saturation_us=...`. Run by the bench when SATLINE_PEER_PYTHON names
a Python with pytzer; never by `cargo test`.
"""
import os
import sys
import time

import numpy as np

sys.path.insert(0, os.path.join(os.path.dirname(__file__), "..", "..", "tests", "reference"))
import fixtures_mixtures  # noqa: E402  (the HMW84 library of the fixtures)
import pytzer as pz  # noqa: E402

MIX = {k: 2 * v for k, v in fixtures_mixtures.SEAWATER.items()}
# Solids: (ions with counts, waters).
SOLIDS = [
    ({"Na": 1, "Cl": 1}, 0), ({"K": 1, "Cl": 1}, 0), ({"Mg": 1, "Cl": 2}, 6),
    ({"Ca": 1, "Cl": 2}, 6), ({"Na": 2, "SO4": 1}, 10), ({"K": 2, "SO4": 1}, 0),
    ({"Mg": 1, "SO4": 1}, 7), ({"Ca": 1, "SO4": 1}, 2),
]


def main():
    model = pz.set_library(pz, fixtures_mixtures.hmw84_library()).model
    solutes = {k: np.array(v) for k, v in MIX.items()}
    lg = model.log_activity_coefficients
    aw = model.activity_water
    lg(solutes, 298.15, 10.1325)  # compile
    aw(solutes, 298.15, 10.1325)
    n = 200
    t0 = time.perf_counter()
    for _ in range(n):
        out = lg(solutes, 298.15, 10.1325)
        float(out["Na"])
    activity_us = (time.perf_counter() - t0) / n * 1e6
    temps = np.full(100, 298.15)
    t0 = time.perf_counter()
    for t in temps:
        g = lg(solutes, float(t), 10.1325)
        w = float(np.log(aw(solutes, float(t), 10.1325)))
        for ions, waters in SOLIDS:
            sum(c * (np.log(MIX[i]) + float(g[i])) for i, c in ions.items()) + waters * w
    saturation_us = (time.perf_counter() - t0) * 1e6
    print(f"peer activity_us={activity_us:.1f} saturation_us={saturation_us:.1f}")


if __name__ == "__main__":
    main()
