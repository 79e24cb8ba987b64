"""Corroboration checks of the reference's freezing tables and solubility curves against
outside figures, written as seed files of check records (`seed-data/checks/<kind>.toml`,
format in seed-data/README.md) and re-checked by `cargo test` (tests/corroboration.rs).

Checks written here:

ice-line        A brine's tabulated freezing points against the freezing curve of the same
                brine in PyPI CoolProp's incompressible fluids (INCOMP::MNA, MCA, MMG, MKC,
                MLI, MKA, MKF: Å. Melinder, Properties of Secondary Working Fluids for
                Indirect Systems, IIR 2010), over the fluid's range: the largest difference
                in K, within 0.5 K. A table that was itself entered from Melinder's curves
                is compared too, but the comparison checks only its entry, so its verdict
                is not-applicable (it corroborates nothing), with the figure kept.
water-activity  A freezing table against the freezing points implied by the water activity of
                a published Pitzer parameter set valid below 0 C, as PyPI pytzer computes it
                (the parameter function named after the paper), through the ice-water
                equilibrium (the same relation and constants as satline's
                science::activity::ice): the largest difference in K, within 0.5 K. Only
                sets valid at the table's temperatures count; the others are said.
density-range   Laliberte's density fits (seed-data/densities.toml) were made to measured
                solutions, which were not supersaturated: the highest mass fraction a fit
                covers should not exceed the solubility (anhydrous mass fraction) at some
                temperature of the fit's range. Compared with the highest stable solubility
                over the range where the curve has data, within 2 %. A weak check (it bounds
                the curve from below only), said so in its method.

A failing check needs a person's explanation (EXPLANATIONS below, keyed by the check's
full key); `satline check` counts a failing check without one as a problem.
"""
import math
import os
import tomllib

import CoolProp
import CoolProp.CoolProp as CP
import jax

jax.config.update("jax_enable_x64", True)

import pytzer as pz  # noqa: E402
from pytzer.libraries import Library  # noqa: E402
from pytzer.parameters import spencer1990  # noqa: E402
from scipy.optimize import brentq  # noqa: E402

from fixtures_corroboration import (  # noqa: E402
    SEED, BranchCurve, kelvin, live, load_seed, mass_fraction, molar_mass, write_check_files,
)

TOOL = (
    "tests/reference/make_fixtures.py (fixtures_brine_checks.py); "
    f"CoolProp {CoolProp.__version__}, pytzer {pz.__version__}, jax {jax.__version__}"
)

ICE_TOLERANCE_K = 0.5
DENSITY_TOLERANCE_PCT = 2.0

# CoolProp fluid by the seed's solute id, with the fluid's highest mass fraction.
FLUIDS = {
    "sodium-chloride": ("MNA", 0.23),
    "calcium-chloride": ("MCA", 0.29),
    "magnesium-chloride": ("MMG", 0.20),
    "potassium-carbonate": ("MKC", 0.39),
    "lithium-chloride": ("MLI", 0.22),
    "potassium-acetate": ("MKA", 0.44),
    "potassium-formate": ("MKF", 0.47),
}
MELINDER = (
    "Å. Melinder, Properties of Secondary Working Fluids for Indirect Systems, IIR (2010): the "
    f"brine's fitted freezing curve as PyPI CoolProp {CoolProp.__version__} distributes it "
    "(PropsSI('T_freeze', ..., 'INCOMP::{fluid}[w]'))"
)

# Pitzer sets valid below 0 C that pytzer holds, by solute id: (parameter function, paper,
# cation, anion, cation count, anion count, lowest K, highest K).
LOW_T_SETS = {
    "magnesium-chloride": (
        spencer1990.bC_Mg_Cl_SMW90,
        "R. J. Spencer, N. Møller and J. H. Weare, Geochim. Cosmochim. Acta 54 (1990) 575 (Mg-Cl "
        "parameters, valid -54 to 25 C)",
        "Mg", "Cl", 1, 2, 219.15, 298.15,
    ),
}

# Ice-water equilibrium, as in src/science/activity/ice.rs (CRC Handbook, 97th ed.; values as
# commonly printed, from memory).
R = 8.314462618
T0 = 273.15
FUSION = 6010.0
DELTA_CP = 37.89

EXPLANATIONS = {
    "magnesium-chloride/melinder-2010/water-activity": (
        "Melinder's fitted freezing curve and the Spencer-Møller-Weare parameters are fits to "
        "different measurements: they agree within 0.2 K up to 8 %w/w and at 19-20 %w/w, and "
        "differ by up to about 1.0 K between 11 and 17 %w/w. The largest difference, 1.5 K, is at "
        "the eutectic (21 %w/w, -33.6 C), a value commonly printed for this system and entered "
        "from memory: the model puts the ice line at that composition near -32.1 C. Neither the "
        "recalled eutectic nor the model is known to be the better one there until a person reads "
        "the compilation; satline answers from the tabulated curve first and says so."
    ),
    "iron-sulfate/perry-7/density-range": (
        "The density fit covers 15 to 25 C and solutions up to w = 0.2332, 2.1 % above the "
        "highest tabulated solubility in that range (w = 0.2285, at 25 C): just beyond the 2 % "
        "tolerance. Either the most concentrated measured solution was slightly supersaturated or "
        "the tabulated value "
        "is about 2 % low; a second source for iron(II) sulfate's solubility would settle it."
    ),
}


def ln_aw_ice(t_k):
    return (FUSION * (1.0 / T0 - 1.0 / t_k) + DELTA_CP * (math.log(t_k / T0) + T0 / t_k - 1.0)) / R


def table_points(solute):
    """The freezing table's (w, K) points with the eutectic as a last point, as satline
    builds its tabulated ice line."""
    f = solute["freezing"]
    m = molar_mass(solute["formula"])
    pts = [(mass_fraction(f["unit"], p[0], m), kelvin(p[1], f["temperature_unit"])) for p in f["points"]]
    e = f.get("eutectic")
    if e is not None:
        we = mass_fraction(f["unit"], e[0], m)
        if not pts or we > pts[-1][0]:
            pts.append((we, kelvin(e[1], f["temperature_unit"])))
    return pts


def ice_line_checks(solutes):
    out = []
    for s in solutes:
        if "freezing" not in s or s["id"] not in FLUIDS:
            continue
        fluid, w_top = FLUIDS[s["id"]]
        f = s["freezing"]
        subject = f"{s['id']}/{f['key']}"
        worst = None
        for w, t in table_points(s):
            if w <= 0.0 or w > w_top + 1e-9:
                continue
            ref = CP.PropsSI("T_freeze", "T", 273.15, "P", 101325, "INCOMP::%s[%.6f]" % (fluid, w))
            if worst is None or abs(t - ref) > abs(worst[1] - worst[2]):
                worst = (w, t, ref)
        check = {
            "subject": subject, "record": "freezing", "key": "ice-line", "kind": "ice-line",
            "reference": MELINDER.replace("{fluid}", fluid),
            "method": (
                f"the table's freezing points up to {w_top * 100:g} %w/w (the fluid's range) against "
                "the fitted curve at the same mass fractions; the largest difference in K "
                "(temperature_k: the tabulated point where it lies; figure: the curve's freezing "
                "point there; satline_figure: the table's)"
            ),
            "unit": "K", "tolerance": ICE_TOLERANCE_K, "tolerance_unit": "K", "tool": TOOL,
        }
        if worst is None:
            check["verdict"] = "not-applicable"
            check["explanation"] = "No tabulated point lies within the fluid's range"
            out.append(check)
            continue
        w, t, ref = worst
        check.update({"temperature_k": round(t, 4), "figure": round(ref, 4), "satline_figure": round(t, 4)})
        diff = abs(t - ref)
        if f["source"] == "melinder-2010":
            check["verdict"] = "not-applicable"
            check["explanation"] = (
                f"The table was entered from this very curve (source melinder-2010), so the "
                f"comparison (largest difference {diff:.3f} K, at {w * 100:.1f} %w/w) checks only "
                "its entry and corroborates nothing"
            )
        else:
            check["verdict"] = "pass" if diff <= ICE_TOLERANCE_K else "fail"
            if check["verdict"] == "fail" and f"{subject}/ice-line" in EXPLANATIONS:
                check["explanation"] = EXPLANATIONS[f"{subject}/ice-line"]
        out.append(check)
    return out


def pytzer_freezing_k(model, cat, an, nc, na, molality, lo, hi):
    solutes = {cat: nc * molality, an: na * molality}

    def gap(t):
        return math.log(float(model.activity_water(solutes, t, 10.1325))) - ln_aw_ice(t)

    return brentq(gap, lo, hi, xtol=1e-7)


def water_activity_checks(solutes):
    out = []
    for s in solutes:
        if "freezing" not in s:
            continue
        f = s["freezing"]
        subject = f"{s['id']}/{f['key']}"
        check = {
            "subject": subject, "record": "freezing", "key": "water-activity", "kind": "water-activity",
            "unit": "K", "tolerance": ICE_TOLERANCE_K, "tolerance_unit": "K", "tool": TOOL,
        }
        if s["id"] not in LOW_T_SETS:
            check["reference"] = f"a Pitzer parameter set valid below 0 C, as PyPI pytzer {pz.__version__} holds them"
            check["method"] = "not made: see the explanation"
            check["verdict"] = "not-applicable"
            check["explanation"] = (
                f"pytzer {pz.__version__} holds no Pitzer parameters for {s['formula']} valid at the "
                "table's temperatures (below 0 C), so no freezing point can be implied from a "
                "published water activity"
            )
            out.append(check)
            continue
        func, paper, cat, an, nc, na, lo, hi = LOW_T_SETS[s["id"]]
        lib = Library(name=s["id"])
        lib.update_Aphi(pz.debyehueckel.Aosm_CRP94)
        lib.update_ca(cat, an, func)
        model = pz.set_library(pz, lib).model
        m_g = molar_mass(s["formula"])
        worst = None
        for w, t in table_points(s):
            if w <= 0.0 or t < lo:
                continue
            molality = 1000.0 * w / (m_g * (1.0 - w))
            ref = pytzer_freezing_k(model, cat, an, nc, na, molality, lo, T0)
            if worst is None or abs(t - ref) > abs(worst[1] - worst[2]):
                worst = (w, t, ref)
        check["reference"] = (
            f"{paper}: the water activity as PyPI pytzer {pz.__version__} computes it "
            f"({func.__name__}, Debye-Hückel A-phi of Aosm_CRP94)"
        )
        check["method"] = (
            "at each tabulated composition, the temperature where the set's water activity equals "
            "that of water over ice (ln a_w = [dH (1/T0 - 1/T) + dCp (ln(T/T0) + T0/T - 1)]/R, "
            "dH = 6010 J/mol, dCp = 37.89 J/(mol K), as satline's science::activity::ice), against "
            "the table; the largest difference in K (temperature_k: the tabulated point where it "
            "lies; figure: the model's freezing point there; satline_figure: the table's)"
        )
        w, t, ref = worst
        check.update({"temperature_k": round(t, 4), "figure": round(ref, 4), "satline_figure": round(t, 4)})
        check["verdict"] = "pass" if abs(t - ref) <= ICE_TOLERANCE_K else "fail"
        if check["verdict"] == "fail" and f"{subject}/water-activity" in EXPLANATIONS:
            check["explanation"] = EXPLANATIONS[f"{subject}/water-activity"]
        out.append(check)
    return out


def stable_at(solute, datasets, t_k):
    """(dataset, w) of the stable branch at t_k, as satline picks it from single datasets:
    among the datasets whose stable range (or else tabulated span) holds t_k, the one whose
    stable range is stated and holds t_k, else the least soluble; None where none covers."""
    covering = []
    for d in datasets:
        lo, hi = BranchCurve(solute, d).range()
        sr = d.get("stable_range")
        if sr is not None:
            lo = min(lo, kelvin(sr[0], d["temperature_unit"]))
            hi = max(hi, kelvin(sr[1], d["temperature_unit"]))
        if lo - 1e-9 <= t_k <= hi + 1e-9:
            declared = sr is not None and kelvin(sr[0], d["temperature_unit"]) <= t_k <= kelvin(sr[1], d["temperature_unit"])
            covering.append((d, BranchCurve(solute, d).at(t_k)[0], declared))
    if not covering:
        return None
    if any(c[2] for c in covering):
        covering = [c for c in covering if c[2]]
    d, w, _ = min(covering, key=lambda c: c[1])
    return d, w


def density_range_checks(solutes):
    with open(os.path.join(SEED, "densities.toml"), "rb") as f:
        densities = tomllib.load(f)["density"]
    by_id = {s["id"]: s for s in solutes}
    out = []
    for dens in densities:
        s = by_id.get(dens["solute"])
        if s is None:
            continue
        datasets = [d for d in s.get("dataset", []) if live(d) and len(d["points"]) >= 1]
        if not datasets:
            continue
        lo, hi = dens["t_min"] + 273.15, dens["t_max"] + 273.15
        best = None
        steps = max(1, int(round((hi - lo) / 0.5)))
        for i in range(steps + 1):
            t = lo + (hi - lo) * i / steps
            found = stable_at(s, datasets, t)
            if found is not None and (best is None or found[1] > best[2]):
                best = (t, found[0], found[1])
        reference = (
            f"the density fit of M. Laliberté, J. Chem. Eng. Data 54 (2009) 1725 (solutions to "
            f"w = {dens['w_max']:.4f}, {dens['t_min']:g} to {dens['t_max']:g} C)"
        )
        method = (
            "the fit's highest mass fraction (figure) against the highest stable solubility, as "
            "anhydrous mass fraction, over the fit's temperatures where the curve has data "
            "(satline_figure, at temperature_k): measured solutions were not supersaturated, so it "
            "should not be exceeded by more than the tolerance. Bounds the curve from below only"
        )
        if best is None:
            continue  # the curve has no data in the fit's range: nothing to compare with
        t, d, w = best
        check = {
            "subject": f"{s['id']}/{d['key']}", "key": "density-range", "kind": "density-range",
            "reference": reference, "method": method, "temperature_k": round(t, 4),
            "figure": dens["w_max"], "satline_figure": w, "unit": "w",
            "tolerance": DENSITY_TOLERANCE_PCT, "tolerance_unit": "%", "tool": TOOL,
        }
        over = (dens["w_max"] - w) / w * 100.0
        covered_to = max(
            (BranchCurve(s, x).range()[1] for x in datasets), default=lo)
        if over <= DENSITY_TOLERANCE_PCT:
            check["verdict"] = "pass"
        elif covered_to < hi - 0.5:
            check["verdict"] = "not-applicable"
            check["explanation"] = (
                f"The fit reaches w = {dens['w_max']:.4f}, {over:.1f} % above the highest solubility "
                f"found, but the tabulated solubility data stop at {covered_to - 273.15:.1f} C while the fit "
                f"runs to {dens['t_max']:g} C: its most concentrated solutions may be hotter than the data"
            )
        else:
            check["verdict"] = "fail"
            key = f"{check['subject']}/density-range"
            if key in EXPLANATIONS:
                check["explanation"] = EXPLANATIONS[key]
        out.append(check)
    return out


def write_checks():
    """Writes seed-data/checks/{ice-line,water-activity,density-range}.toml."""
    solutes = load_seed()
    return write_check_files("fixtures_brine_checks.py", TOOL, "one stored record", (
        ("ice-line", ice_line_checks(solutes)),
        ("water-activity", water_activity_checks(solutes)),
        ("density-range", density_range_checks(solutes)),
    ))


if __name__ == "__main__":
    print(write_checks())
