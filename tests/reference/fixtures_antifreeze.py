"""Freezing points of water–glycol, water–glycerol, water–methanol and water–ethanol solutions from PyPI
CoolProp's incompressible fluids (INCOMP::MPG, MEG, MGL, MMA, MEA: Melinder 2010's fitted
freezing curves), at half mass percents between the whole percents the seed's tables were
entered at, so that satline's interpolation between table points is checked against the
fitted curve itself.
"""
import json
import os

import CoolProp
import CoolProp.CoolProp as CP

# CoolProp fluid -> (satline solute id, highest mass percent checked: the seed table's end)
FLUIDS = {
    "MPG": ("propylene-glycol", 60),
    "MEG": ("ethylene-glycol", 60),
    "MGL": ("glycerol", 60),
    "MMA": ("methanol", 50),
    "MEA": ("ethanol", 60),
}


def rows():
    out = []
    for fluid, (solute, top) in FLUIDS.items():
        for k in range(top):
            w = (k + 0.5) / 100.0
            t = CP.PropsSI("T_freeze", "T", 273.15, "P", 101325, "INCOMP::%s[%.4f]" % (fluid, w))
            out.append({"fluid": fluid, "solute": solute, "mass_fraction": w, "freezing_k": t})
    return out


def write(here):
    data = {
        "versions": {"CoolProp": CoolProp.__version__},
        "source": "CoolProp PropsSI('T_freeze', ..., 'INCOMP::<fluid>[w]'), Melinder 2010, at half mass percents",
        "rows": rows(),
    }
    with open(os.path.join(here, "ice_lines_antifreeze_coolprop.json"), "w", encoding="utf-8") as f:
        json.dump(data, f, indent=1, ensure_ascii=False)
        f.write("\n")


if __name__ == "__main__":
    write(os.path.dirname(os.path.abspath(__file__)))
