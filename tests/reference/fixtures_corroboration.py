"""Corroboration checks of the reference's solubility datasets, written as seed files of
check records (`seed-data/checks/<kind>.toml`, format in seed-data/README.md) that
satline loads like the rest of its data and `cargo test` re-checks
(tests/corroboration.rs recomputes satline's side and compares it with the committed
outside figure).

Checks written here:

heat-sign      The sign of the standard enthalpy of solution at 25 C, from the CRC
               Handbook's standard thermodynamic properties of the crystal and of the
               aqueous ions (both tables as they ship with PyPI `chemicals`):
               dsolH = sum(n_i * dfH(ion_i, aq)) - dfH(crystal), against the sign of the
               curve's slope (satline's apparent heat of solution from the van 't Hoff
               slope, same sign as dw/dT). Meaningful only for an anhydrous solid whose
               saturated solution is dilute (here: at most 1 mol/kg at the check
               temperature), since the CRC value is for infinite dilution; elsewhere the
               record says why it does not apply. A |dsolH| under 2 kJ/mol does not fix a
               sign and is not applicable either.
continuity     Branches of one solute meet at their stated transition (a dataset's
               `stable_range` boundary) within 2 % (relative, in mass fraction), each
               branch evaluated there as satline does (PCHIP, Fritsch-Butland slopes, end
               tangent beyond the data).
second-source  Two datasets of one solute and solid phase from different sources agree
               within their stated uncertainty (the larger relative uncertainty of their
               points) or, where none is stated, within satline's conflict tolerance of 5 %.

A failing check needs a person's explanation (EXPLANATIONS below, keyed by the check's
full key); `satline check` counts a failing check without one as a problem.
"""
import glob
import math
import os
import re
import tomllib

import chemicals
import pandas as pd
import periodictable
import scipy
from chemicals.identifiers import CAS_from_any
from scipy.interpolate import PchipInterpolator

HERE = os.path.dirname(os.path.abspath(__file__))
SEED = os.path.normpath(os.path.join(HERE, "..", "..", "seed-data"))
CHEMICALS_DIR = os.path.dirname(chemicals.__file__)

TOOL = (
    f"tests/reference/make_fixtures.py (fixtures_corroboration.py); chemicals {chemicals.__version__}, "
    f"scipy {scipy.__version__}, periodictable {periodictable.__version__}, pandas {pd.__version__}"
)

R = 8.314462618  # J/(mol K), CODATA 2018
WATER = 18.015  # g/mol, as satline's science::units::WATER_MOLAR_MASS
DILUTE_MOL_PER_KG = 1.0
SIGN_THRESHOLD_KJ = 2.0
CONTINUITY_PCT = 2.0
CONFLICT_PCT = 5.0

CRC_REFERENCE = (
    "CRC Handbook of Chemistry and Physics, 95th ed. (2014): enthalpies of formation of the "
    f"crystal and the aqueous ions (tables shipped with chemicals {chemicals.__version__})"
)

# Ion formulas of the CRC aqueous-ion table by the plain names the seed uses.
CATIONS = {
    "sodium": ("Na+", 1), "potassium": ("K+", 1), "lithium": ("Li+", 1),
    "ammonium": ("NH4+", 1), "calcium": ("Ca+2", 2), "magnesium": ("Mg+2", 2),
    "barium": ("Ba+2", 2), "zinc": ("Zn+2", 2), "copper(II)": ("Cu+2", 2),
    "strontium": ("Sr+2", 2), "manganese(II)": ("Mn+2", 2), "iron(II)": ("Fe+2", 2),
    "rubidium": ("Rb+", 1), "caesium": ("Cs+", 1), "silver": ("Ag+", 1),
    "nickel(II)": ("Ni+2", 2), "cobalt(II)": ("Co+2", 2), "aluminium": ("Al+3", 3),
}
ANIONS = {
    "chloride": ("Cl-", 1), "bromide": ("Br-", 1), "iodide": ("I-", 1), "fluoride": ("F-", 1),
    "nitrate": ("NO3-", 1), "nitrite": ("NO2-", 1), "sulfate": ("SO4-2", 2),
    "carbonate": ("CO3-2", 2), "hydrogen carbonate": ("HCO3-", 1), "hydroxide": ("OH-", 1),
    "chlorate": ("ClO3-", 1), "perchlorate": ("ClO4-", 1), "permanganate": ("MnO4-", 1),
    "dihydrogen phosphate": ("H2PO4-", 1), "hydrogen phosphate": ("HPO4-2", 2),
    "phosphate": ("PO4-3", 3), "acetate": ("CH3COO-", 1), "formate": ("CHOO-", 1),
    "thiosulfate": ("S2O3-2", 2), "sulfite": ("SO3-2", 2), "hydrogen sulfite": ("HSO3-", 1),
    "hydrogen sulfate": ("HSO4-", 1), "iodate": ("IO3-", 1), "bromate": ("BrO3-", 1),
    "chromate": ("CrO4-2", 2), "dichromate": ("Cr2O7-2", 2), "oxalate": ("C2O4-2", 2),
    "diphosphate": ("P2O7-4", 4), "tetraborate": ("B4O7-2", 2), "molybdate": ("MoO4-2", 2),
    "metaborate": ("BO2-", 1), "persulfate": ("S2O8-2", 2),
}

# Explanations of failing checks, written by a person who looked at the data: full check
# key -> why the check fails and why the data stay as they are.
EXPLANATIONS = {
    "borax/perry-7-decahydrate/continuity-perry-7-pentahydrate": (
        "The pentahydrate's table begins at 70 C, so its value at the 60.8 C transition is its end "
        "tangent carried back 9.2 K along a branch that steepens with temperature; the decahydrate's "
        "is carried only 0.8 K. A gap of about 3 % over such an extrapolation does not show a fault "
        "in either table."
    ),
    "lithium-nitrate/perry-7-trihydrate/continuity-perry-7-anhydrous": (
        "The trihydrate's table stops at 20 C, and the branch rises steeply towards the trihydrate's "
        "melting near 29.9 C; its end tangent carried 9.9 K falls far short there. The gap is the "
        "missing last stretch of the trihydrate branch, not a disagreement of the tabulated points."
    ),
    "strontium-nitrate/perry-7-tetrahydrate/continuity-perry-7-anhydrous": (
        "The anhydrous branch's table begins at 40 C, so its value at the 31.3 C transition is its "
        "end tangent carried back 8.7 K; a gap of about 2.3 %, just over the 2 % tolerance, is "
        "within what that extrapolation can resolve."
    ),
    "calcium-nitrate/perry-7-tetrahydrate/continuity-perry-7-anhydrous": (
        "The tetrahydrate's stated end (42.7 C) is not where the anhydrous branch begins: the "
        "branches between about 42.7 C and 51 C (lower hydrates) are not in the reference, and the "
        "anhydrous branch extrapolated from 60 C down to 42.7 C is not a value of the data. The gap "
        "is a missing branch, not a fault of either table."
    ),
    "sodium-carbonate/perry-7-decahydrate/continuity-crc-97-monohydrate": (
        "Between the decahydrate (to 32.0 C) and the monohydrate (from 35.4 C) lies the "
        "heptahydrate's short branch, which is not in the reference; at 32.0 C the monohydrate's "
        "value is its end tangent carried back 8 K from 40 C, below its own stable range. The gap "
        "is the missing heptahydrate branch, not a disagreement of the tables."
    ),
    "sodium-dihydrogen-phosphate/perry-7-dihydrate/continuity-perry-7-monohydrate": (
        "The monohydrate branch is one tabulated point (50 C), which satline holds flat; it cannot "
        "follow the branch's rise down to the 40.8 C transition. The gap asks for more points of "
        "the monohydrate, not a correction of either table."
    ),
    "sodium-dihydrogen-phosphate/perry-7-monohydrate/continuity-perry-7-anhydrous": (
        "The monohydrate branch is one tabulated point (50 C), held flat up to the 57.4 C "
        "transition, while the solubility keeps rising; the anhydrous branch's tangent is carried "
        "back 2.6 K from 60 C. The gap asks for more points of the monohydrate."
    ),
    "sodium-acetate/perry-7-trihydrate/continuity-perry-7-anhydrous": (
        "The trihydrate branch climbs steeply towards its incongruent melting near 58 C, and the "
        "table stops at 50 C; its end tangent from 50 C falls short of the steep last stretch. "
        "The gap lies in the extrapolation over 8 K, not in the tabulated points."
    ),
    "calcium-chloride/perry-7-hexahydrate/continuity-linke-seidell-tetrahydrate": (
        "The hexahydrate's table stops at 20 C, and the branch rises steeply towards the "
        "hexahydrate's melting near 30 C; its end tangent carried 9.8 K to the 29.8 C transition "
        "reaches about 46.7 %w/w where the solution saturated with both solids holds about 50 %w/w "
        "(the tetrahydrate's 30 C point). The gap is the missing last stretch of the hexahydrate "
        "branch, not a disagreement of the tabulated points."
    ),
    "calcium-chloride/linke-seidell-tetrahydrate/continuity-perry-7-dihydrate": (
        "The tetrahydrate's two points (30 and 40 C) give a straight branch, which cannot follow its "
        "steepening towards the tetrahydrate's melting near 45 C; the dihydrate's value at 45.3 C is "
        "its end tangent carried back 14.7 K from 60 C. A gap of about 2.5 % over these "
        "extrapolations does not show a fault in either table."
    ),
    "disodium-hydrogen-phosphate/perry-7-dodecahydrate/continuity-perry-7-heptahydrate": (
        "The heptahydrate branch is one tabulated point (40 C), which satline holds flat down to the "
        "35.4 C transition, although the solubility falls steeply below 40 C; the dodecahydrate's "
        "value there is its end tangent carried 5.4 K from 30 C. The gap asks for more points of "
        "both hydrates near the transition, not a correction of either table."
    ),
    "disodium-hydrogen-phosphate/perry-7-heptahydrate/continuity-perry-7-dihydrate": (
        "The heptahydrate branch is one tabulated point (40 C), held flat up to the 48.1 C "
        "transition while the solubility keeps rising steeply; the dihydrate's table begins at 50 C, "
        "1.9 K away. The gap asks for more points of the heptahydrate."
    ),
    "sodium-sulfate/perry-7-decahydrate/continuity-perry-7-anhydrous": (
        "The decahydrate branch is steep (solubility doubles from 20 C to 30 C) and the table stops "
        "at 30 C; the end tangent carried 2.4 K to the 32.38 C transition, and the anhydrous "
        "branch's carried back from 40 C, give a gap of a few per cent that the tabulated points "
        "do not show. An entry at the transition itself would settle it."
    ),
}


def load_seed():
    solutes = []
    for path in sorted(glob.glob(os.path.join(SEED, "solutes", "*.toml"))):
        with open(path, "rb") as f:
            solutes.append(tomllib.load(f))
    return solutes


def kelvin(t, unit):
    return {"C": t + 273.15, "K": t, "F": (t - 32.0) * 5.0 / 9.0 + 273.15}[unit]


def molar_mass(formula):
    return periodictable.formula(formula.replace("·", "+")).mass


def mass_fraction(unit, v, m):
    if unit == "g/100g water":
        return v / (100.0 + v)
    if unit == "%w/w":
        return v / 100.0
    if unit == "w":
        return v
    if unit == "mol/kg":
        return v * m / (1000.0 + v * m)
    if unit == "x":
        return v * m / (v * m + (1.0 - v) * WATER)
    raise ValueError(unit)


def live(dataset):
    return not dataset.get("retired", False) and dataset.get("review", "unreviewed") != "rejected"


class BranchCurve:
    """A dataset's branch as satline evaluates it: PCHIP inside, end tangent outside."""

    def __init__(self, solute, dataset):
        m = molar_mass(solute["formula"])
        pts = dataset["points"]
        self.t = [kelvin(p[0], dataset["temperature_unit"]) for p in pts]
        self.w = [mass_fraction(dataset["unit"], p[1], m) for p in pts]
        self.p = PchipInterpolator(self.t, self.w, extrapolate=False) if len(pts) > 1 else None
        self.dp = self.p.derivative() if self.p is not None else None

    def range(self):
        return self.t[0], self.t[-1]

    def at(self, t_k):
        if self.p is None:
            return self.w[0], 0.0
        lo, hi = self.range()
        if t_k < lo:
            d = float(self.dp(lo))
            return self.w[0] + d * (t_k - lo), d
        if t_k > hi:
            d = float(self.dp(hi))
            return self.w[-1] + d * (t_k - hi), d
        return float(self.p(t_k)), float(self.dp(t_k))


def apparent_heat_kj(curve, m, t_k):
    """satline's apparent heat of solution (science::heat::heat_of_solution)."""
    w, dw = curve.at(t_k)
    a = w / m
    b = (1.0 - w) / WATER
    x = a / (a + b)
    dx_dw = (b / m + a / WATER) / ((a + b) ** 2)
    return R * t_k * t_k * dx_dw * dw / x / 1000.0, w


def fmt(v):
    if isinstance(v, float):  # numpy floats too
        v = float(v)
        return repr(round(v, 6))
    return str(v)


def toml_string(s):
    return '"' + s.replace("\\", "\\\\").replace('"', '\\"') + '"'


def record(check):
    lines = ["", "[[check]]"]
    for key in ("subject", "record", "key", "kind", "reference", "other", "method", "temperature_k",
                "figure", "satline_figure", "unit", "tolerance", "tolerance_unit", "verdict",
                "explanation", "tool"):
        v = check.get(key)
        if v is None:
            continue
        lines.append(f"{key} = {toml_string(v) if isinstance(v, str) else fmt(v)}")
    return "\n".join(lines)


def ions_of(solute):
    """[(ion formula, count)] of a salt from its cation and anion names, checked against its
    formula; None when the seed's names are not in the maps or do not add up."""
    c, a = CATIONS.get(solute.get("cation")), ANIONS.get(solute.get("anion"))
    if c is None or a is None:
        return None
    lcm = c[1] * a[1] // math.gcd(c[1], a[1])
    nc, na = lcm // c[1], lcm // a[1]
    def ion_formula(f):
        return re.sub(r"[+-]\d*$", "", f).replace("CHOO", "HCOO")

    total = periodictable.formula(f"({ion_formula(c[0])}){nc}({ion_formula(a[0])}){na}")
    if abs(total.mass - molar_mass(solute["formula"])) > 1e-6:
        return None
    return [(c[0], nc), (a[0], na)]


def heat_sign_checks(solutes):
    crystals = pd.read_csv(
        os.path.join(CHEMICALS_DIR, "Heat Capacity", "CRC Standard Thermodynamic Properties of Chemical Substances.tsv"),
        sep="\t", index_col=0)
    ions = pd.read_csv(
        os.path.join(CHEMICALS_DIR, "Electrolytes", "CRC Thermodynamic Properties of Aqueous Ions.tsv"),
        sep="\t").set_index("Formula")
    out = []
    for s in solutes:
        if s["kind"] == "gas":
            continue
        m = molar_mass(s["formula"])
        for d in filter(live, s.get("dataset", [])):
            subject = f"{s['id']}/{d['key']}"
            check = {
                "subject": subject, "key": "heat-sign", "kind": "heat-sign",
                "reference": CRC_REFERENCE,
                "method": (
                    "dsolH = sum of dfH of the aqueous ions - dfH of the crystal at 25 C "
                    "(infinite dilution); its sign against the sign of the curve's slope, "
                    "taken as satline's apparent heat of solution (van 't Hoff) at the check "
                    f"temperature; meaningful for an anhydrous solid saturating at most "
                    f"{DILUTE_MOL_PER_KG:g} mol/kg with |dsolH| of at least {SIGN_THRESHOLD_KJ:g} kJ/mol"
                ),
                "unit": "kJ/mol", "tolerance": SIGN_THRESHOLD_KJ,
                "tolerance_unit": "kJ/mol (smallest |dsolH| whose sign is taken)",
                "tool": TOOL,
            }
            curve = BranchCurve(s, d)
            lo, hi = curve.range()
            t_k = min(max(298.15, lo), hi)
            check["temperature_k"] = round(t_k, 2)
            if len(d["points"]) > 1:
                heat, w = apparent_heat_kj(curve, m, t_k)
                check["satline_figure"] = heat
                molality = 1000.0 * w / (m * (1.0 - w))
            else:
                heat, molality = None, None
            reasons = []
            if "·" in d["phase"]:
                reasons.append(
                    f"the solid is a hydrate ({d['phase']}); the CRC enthalpies are of the anhydrous crystal")
            if s["kind"] != "salt":
                reasons.append(
                    "a molecular solute: the CRC table of aqueous species that ships with chemicals holds ions only")
            ion_list = ions_of(s) if s["kind"] == "salt" else None
            if s["kind"] == "salt" and ion_list is None:
                reasons.append("its ions are not mapped to the CRC table of aqueous ions")
            dsol = None
            if not reasons:
                try:
                    cas = CAS_from_any(s["name"])
                except Exception:  # a name chemicals does not know
                    cas = None
                hfs = crystals["Hfs"].get(cas) if cas is not None else None
                hfi = [ions["Hf(aq)"].get(ion) for ion, _ in ion_list]
                if hfs is None or pd.isna(hfs) or any(h is None or pd.isna(h) for h in hfi):
                    reasons.append("the CRC tables lack the crystal's or an ion's enthalpy of formation")
                else:
                    dsol = (sum(n * h for (_, n), h in zip(ion_list, hfi)) - hfs) / 1000.0
                    check["figure"] = float(dsol)
            if heat is None:
                reasons.append("a single point gives no slope")
            elif molality is not None and molality > DILUTE_MOL_PER_KG:
                reasons.append(
                    f"the saturated solution holds {molality:.2f} mol/kg at {t_k - 273.15:.2f} C, far from the "
                    "infinite dilution the CRC value describes")
            if dsol is not None and abs(dsol) < SIGN_THRESHOLD_KJ:
                reasons.append(f"dsolH = {dsol:.2f} kJ/mol is too close to zero for its sign to decide")
            if reasons:
                check["verdict"] = "not-applicable"
                text = "; ".join(reasons)
                if dsol is not None and heat is not None:
                    agree = (dsol > 0) == (heat > 0)
                    text += f" (indicative only: the signs {'agree' if agree else 'differ'})"
                check["explanation"] = text[0].upper() + text[1:]
            else:
                check["verdict"] = "pass" if (dsol > 0) == (heat > 0) else "fail"
            if check["verdict"] == "fail":
                explanation = EXPLANATIONS.get(f"{subject}/heat-sign")
                if explanation:
                    check["explanation"] = explanation
            out.append(check)
    return out


def continuity_checks(solutes):
    out = []
    for s in solutes:
        branches = [d for d in s.get("dataset", []) if live(d) and d["points"]]
        branches.sort(key=lambda d: kelvin(d["points"][0][0], d["temperature_unit"]))
        for low, high in zip(branches, branches[1:]):
            if low["phase"] == high["phase"]:
                continue
            t = None
            if low.get("stable_range"):
                t = kelvin(low["stable_range"][1], low["temperature_unit"])
            elif high.get("stable_range"):
                t = kelvin(high["stable_range"][0], high["temperature_unit"])
            subject = f"{s['id']}/{low['key']}"
            other = f"{s['id']}/{high['key']}"
            check = {
                "subject": subject, "key": f"continuity-{high['key']}", "kind": "continuity",
                "reference": f"the branch {other} ({high['phase']}) of the same solute",
                "other": other,
                "method": (
                    "both branches evaluated at their stated transition as satline evaluates them "
                    "(PCHIP inside the data, the end tangent beyond); relative gap in mass fraction"
                ),
                "unit": "w", "tolerance": CONTINUITY_PCT, "tolerance_unit": "%", "tool": TOOL,
            }
            if t is None:
                check["verdict"] = "not-applicable"
                check["explanation"] = (
                    "No transition temperature is stated (stable_range) for these branches, so "
                    "where they should meet is not known")
                out.append(check)
                continue
            w_low, _ = BranchCurve(s, low).at(t)
            w_high, _ = BranchCurve(s, high).at(t)
            gap = abs(w_low - w_high) / ((w_low + w_high) / 2.0) * 100.0
            check.update({"temperature_k": round(t, 4), "figure": w_high, "satline_figure": w_low})
            check["verdict"] = "pass" if gap <= CONTINUITY_PCT else "fail"
            if check["verdict"] == "fail":
                explanation = EXPLANATIONS.get(f"{subject}/{check['key']}")
                if explanation:
                    check["explanation"] = explanation
            out.append(check)
    return out


def second_source_checks(solutes):
    out = []
    for s in solutes:
        m = molar_mass(s["formula"])
        datasets = [d for d in s.get("dataset", []) if live(d)]
        for i, a in enumerate(datasets):
            for b in datasets[i + 1:]:
                if a["phase"] != b["phase"] or a["source"] == b["source"]:
                    continue
                ta = [kelvin(p[0], a["temperature_unit"]) for p in a["points"]]
                wa = [mass_fraction(a["unit"], p[1], m) for p in a["points"]]
                tb = [kelvin(p[0], b["temperature_unit"]) for p in b["points"]]
                wb = [mass_fraction(b["unit"], p[1], m) for p in b["points"]]
                worst, at = None, None
                for t, w in zip(ta, wa):
                    if not (tb[0] <= t <= tb[-1]) or len(tb) < 2:
                        continue
                    k = max(j for j in range(len(tb) - 1) if tb[j] <= t)
                    k = min(k, len(tb) - 2)
                    wo = wb[k] + (wb[k + 1] - wb[k]) * (t - tb[k]) / (tb[k + 1] - tb[k])
                    off = abs(w - wo) / wo * 100.0
                    if worst is None or off > worst:
                        worst, at = off, t
                stated = [p[2] / p[1] * 100.0 for d in (a, b) for p in d["points"] if len(p) > 2 and p[1]]
                tol = max(stated) if stated else CONFLICT_PCT
                subject = f"{s['id']}/{a['key']}"
                other = f"{s['id']}/{b['key']}"
                check = {
                    "subject": subject, "key": f"second-source-{b['key']}", "kind": "second-source",
                    "reference": f"the dataset {other} (source {b['source']})", "other": other,
                    "method": (
                        "largest relative difference in mass fraction over the points of one inside "
                        "the other's range, the other interpolated by straight lines"),
                    "unit": "%", "tolerance": tol,
                    "tolerance_unit": "%" + ("" if stated else " (satline's conflict tolerance; no uncertainty stated)"),
                    "tool": TOOL,
                }
                if worst is None:
                    check["verdict"] = "not-applicable"
                    check["explanation"] = "The two datasets do not overlap in temperature"
                else:
                    check.update({"temperature_k": round(at, 4), "figure": 0.0, "satline_figure": worst})
                    check["verdict"] = "pass" if worst <= tol else "fail"
                    if check["verdict"] == "fail":
                        explanation = EXPLANATIONS.get(f"{subject}/{check['key']}")
                        if explanation:
                            check["explanation"] = explanation
                out.append(check)
    return out


def write_check_files(module, tool, subject_words, kinds):
    """Writes seed-data/checks/<kind>.toml for each (kind, checks) of `kinds`, with the
    header naming the writing module and the tools' versions; returns the verdict counts."""
    os.makedirs(os.path.join(SEED, "checks"), exist_ok=True)
    counts = {}
    for kind, checks in kinds:
        header = (
            f"# Corroboration checks of kind {kind}, written by tests/reference/make_fixtures.py\n"
            f"# ({module}; {tool.split('; ', 1)[1]}). Do not edit by hand: rerun the script.\n"
            f"# Each record compares {subject_words} with something outside it; none makes data reviewed.\n"
        )
        with open(os.path.join(SEED, "checks", f"{kind}.toml"), "w", encoding="utf-8") as f:
            f.write(header + "\n".join(record(c) for c in checks) + "\n")
        counts[kind] = {v: sum(c["verdict"] == v for c in checks) for v in ("pass", "fail", "not-applicable")}
    return counts


def write_checks():
    """Writes seed-data/checks/{heat-sign,continuity,second-source}.toml."""
    solutes = load_seed()
    return write_check_files("fixtures_corroboration.py", TOOL, "one dataset", (
        ("heat-sign", heat_sign_checks(solutes)),
        ("continuity", continuity_checks(solutes)),
        ("second-source", second_source_checks(solutes)),
    ))


if __name__ == "__main__":
    print(write_checks())
