//! Heats of solution from thermochemical tables, and the enthalpy cycle that explains them:
//! the crystal pulled apart into gaseous ions (the lattice enthalpy, by a Born–Haber cycle or
//! the Kapustinskii equation), then the ions hydrated.
//!
//! All enthalpies are kJ/mol of formula units of the solid, at 298.15 K. The functions take
//! the reference's [`Thermochemistry`] records and name every record they used, so an
//! answer can cite them.

use crate::model::Provenance;
use crate::model::thermo::{ThermoQuantity, ThermoState, ThermoValue, Thermochemistry};

/// kJ/mol per eV: e·N_A/1000, exact since the 2019 SI (CODATA 2018).
pub const KJ_PER_MOL_PER_EV: f64 = 96.485_332_12;

/// An ion satline knows how to find in a salt's formula.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Ion {
    /// As the tables write it: `Na+`, `Ca+2`, `SO4-2`.
    pub species: &'static str,
    /// As a formula writes it: `Na`, `SO4`, `C2H3O2` (acetate).
    pub body: &'static str,
    pub charge: i8,
    /// The element of a monatomic ion (for the Born–Haber cycle).
    pub element: Option<&'static str>,
}

const fn ion(species: &'static str, body: &'static str, charge: i8, mono: bool) -> Ion {
    Ion {
        species,
        body,
        charge,
        element: if mono { Some(body) } else { None },
    }
}

/// The cations and anions of the salts in the reference (chemistry, not data).
pub const IONS: &[Ion] = &[
    ion("Li+", "Li", 1, true),
    ion("Na+", "Na", 1, true),
    ion("K+", "K", 1, true),
    ion("NH4+", "NH4", 1, false),
    ion("Mg+2", "Mg", 2, true),
    ion("Ca+2", "Ca", 2, true),
    ion("Ba+2", "Ba", 2, true),
    ion("Zn+2", "Zn", 2, true),
    ion("Cu+2", "Cu", 2, true),
    ion("Cl-", "Cl", -1, true),
    ion("Br-", "Br", -1, true),
    ion("I-", "I", -1, true),
    ion("OH-", "OH", -1, false),
    ion("NO3-", "NO3", -1, false),
    ion("SO4-2", "SO4", -2, false),
    ion("CO3-2", "CO3", -2, false),
    ion("HCO3-", "HCO3", -1, false),
    ion("ClO3-", "ClO3", -1, false),
    ion("MnO4-", "MnO4", -1, false),
    ion("H2PO4-", "H2PO4", -1, false),
    ion("HPO4-2", "HPO4", -2, false),
    ion("PO4-3", "PO4", -3, false),
    ion("CH3COO-", "C2H3O2", -1, false),
];

/// Splits `BaCl2·2H2O` into (`BaCl2`, 2); an anhydrous formula has 0 waters.
pub fn split_hydrate(formula: &str) -> (&str, f64) {
    match formula.split_once('·') {
        Some((salt, water)) => {
            let n = water.strip_suffix("H2O").unwrap_or("");
            let n = if n.is_empty() {
                Some(1.0)
            } else {
                n.parse::<f64>().ok()
            };
            match n {
                Some(n) if n > 0.0 => (salt, n),
                _ => (formula, 0.0),
            }
        }
        None => (formula, 0.0),
    }
}

/// Reads `BODY`, `BODYn` or `(BODY)n` at the start of `s`: (count, rest).
fn take(s: &str, body: &str) -> Option<(u32, usize)> {
    let (after, grouped) = if let Some(rest) = s.strip_prefix('(') {
        (rest.strip_prefix(body)?.strip_prefix(')')?, true)
    } else {
        (s.strip_prefix(body)?, false)
    };
    let digits = after.chars().take_while(char::is_ascii_digit).count();
    if grouped && digits == 0 {
        return None;
    }
    let n = if digits == 0 {
        1
    } else {
        after[..digits].parse().ok()?
    };
    Some((n, s.len() - after.len() + digits))
}

/// The ions of an anhydrous salt's formula with their counts, e.g. `CaCl2` → Ca+2 ×1,
/// Cl- ×2, when it is one known cation and one known anion in charge balance.
pub fn dissociate(formula: &str) -> Option<Vec<(Ion, u32)>> {
    let cations = IONS.iter().filter(|i| i.charge > 0);
    for cation in cations {
        let Some((nc, used)) = take(formula, cation.body) else {
            continue;
        };
        let rest = &formula[used..];
        for anion in IONS.iter().filter(|i| i.charge < 0) {
            if let Some((na, used)) = take(rest, anion.body)
                && used == rest.len()
                && i64::from(nc) * i64::from(cation.charge)
                    == i64::from(na) * -i64::from(anion.charge)
            {
                return Some(vec![(*cation, nc), (*anion, na)]);
            }
        }
    }
    None
}

/// A sum of tabulated terms, with the records it used.
#[derive(Debug, Clone, PartialEq)]
pub struct Worked<'a> {
    pub kj_per_mol: f64,
    pub used: Vec<&'a ThermoValue>,
}

impl Worked<'_> {
    /// True when any record it used was typed from memory.
    pub fn from_memory(&self) -> bool {
        self.used
            .iter()
            .any(|v| v.provenance == Provenance::FromMemory)
    }

    /// The distinct source keys it rests on, in first-use order.
    pub fn sources(&self) -> Vec<&str> {
        let mut keys: Vec<&str> = Vec::new();
        for v in &self.used {
            if !keys.contains(&v.source.as_str()) {
                keys.push(&v.source);
            }
        }
        keys
    }
}

/// The standard enthalpy of solution at infinite dilution at 298.15 K of one crystal:
///
/// ΔH°sol = Σ ν·ΔfH°(ion, aq) + n·ΔfH°(H2O, l) − ΔfH°(crystal)
///
/// (Hess's law; a hydrate's n waters join the solvent as liquid water). For a molecular
/// solid the aqueous term is the undissociated solute's. The crystal's value is taken from
/// the same source as the aqueous values where that source has it. `None` when a term is
/// missing from the tables.
pub fn standard_heat_of_solution<'a>(
    thermo: &'a Thermochemistry,
    crystal: &str,
) -> Option<Worked<'a>> {
    let (salt, waters) = split_hydrate(crystal);
    let mut used: Vec<&ThermoValue> = Vec::new();
    let mut sum = 0.0;
    match dissociate(salt) {
        Some(ions) => {
            for (ion, n) in ions {
                let v = thermo.first(
                    ThermoQuantity::Formation,
                    Some(ThermoState::Aqueous),
                    ion.species,
                )?;
                sum += f64::from(n) * v.value;
                used.push(v);
            }
        }
        None => {
            let v = thermo.first(ThermoQuantity::Formation, Some(ThermoState::Aqueous), salt)?;
            sum += v.value;
            used.push(v);
        }
    }
    if waters > 0.0 {
        let v = thermo.first(ThermoQuantity::Formation, Some(ThermoState::Liquid), "H2O")?;
        sum += waters * v.value;
        used.push(v);
    }
    let crystals = thermo.find(
        ThermoQuantity::Formation,
        Some(ThermoState::Crystal),
        crystal,
    );
    let same_source = crystals
        .iter()
        .find(|c| used.iter().any(|u| u.source == c.source))
        .or(crystals.first())?;
    sum -= same_source.value;
    used.push(same_source);
    Some(Worked {
        kj_per_mol: sum,
        used,
    })
}

/// The standard enthalpy of solution of a gas at 298.15 K: ΔH°sol = ΔfH°(aq) − ΔfH°(g), both
/// from one source (Hess's law).
pub fn gas_standard_heat_of_solution<'a>(
    thermo: &'a Thermochemistry,
    formula: &str,
) -> Option<Worked<'a>> {
    let aq = thermo.first(
        ThermoQuantity::Formation,
        Some(ThermoState::Aqueous),
        formula,
    )?;
    let gas = thermo
        .find(ThermoQuantity::Formation, Some(ThermoState::Gas), formula)
        .into_iter()
        .find(|g| g.source == aq.source)?;
    Some(Worked {
        kj_per_mol: aq.value - gas.value,
        used: vec![aq, gas],
    })
}

/// How the lattice enthalpy (the cycle's first step) was found.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum LatticeMethod {
    /// From the tables by a Born–Haber cycle.
    BornHaber,
    /// Estimated by the Kapustinskii equation from ionic radii.
    Kapustinskii,
}

impl LatticeMethod {
    pub fn as_str(self) -> &'static str {
        match self {
            LatticeMethod::BornHaber => "Born-Haber cycle",
            LatticeMethod::Kapustinskii => "Kapustinskii estimate",
        }
    }
}

/// Lattice enthalpy of an anhydrous binary salt of monatomic ions by the Born–Haber cycle:
///
/// ΔH_L = Σ_cations ν·[ΔfH°(M, g) + Σ IE] + Σ_anions ν·[ΔfH°(X, g) − EA] − ΔfH°(MX, cr)
///
/// with ionisation energies and electron affinities (eV → kJ/mol) taken as enthalpies: the
/// thermal corrections (a few kJ/mol, ±5/2·RT per electron) are left out, as in the usual
/// textbook cycle (e.g. Atkins' Physical Chemistry, the Born–Haber cycle). Positive: the
/// enthalpy taken up to pull one mole of crystal apart into gaseous ions.
pub fn born_haber_lattice<'a>(thermo: &'a Thermochemistry, salt: &str) -> Option<Worked<'a>> {
    let ions = dissociate(salt)?;
    let crystal = thermo.first(ThermoQuantity::Formation, Some(ThermoState::Crystal), salt)?;
    let mut used = vec![crystal];
    let mut sum = -crystal.value;
    for (ion, n) in ions {
        let element = ion.element?;
        let atom = thermo.first(ThermoQuantity::Formation, Some(ThermoState::Gas), element)?;
        used.push(atom);
        let mut per_ion = atom.value;
        if ion.charge > 0 {
            for stage in 1..=ion.charge.unsigned_abs() {
                let ie = thermo.ionisation(element, stage)?;
                per_ion += ie.value * KJ_PER_MOL_PER_EV;
                used.push(ie);
            }
        } else {
            if ion.charge != -1 {
                return None;
            }
            let ea = thermo.first(ThermoQuantity::ElectronAffinity, None, element)?;
            per_ion -= ea.value * KJ_PER_MOL_PER_EV;
            used.push(ea);
        }
        sum += f64::from(n) * per_ion;
    }
    Some(Worked {
        kj_per_mol: sum,
        used,
    })
}

/// The Kapustinskii equation (A. F. Kapustinskii, Q. Rev. Chem. Soc. 10 (1956) 283):
///
/// ΔH_L ≈ K·ν·|z+|·|z−| / (r+ + r−) · (1 − d/(r+ + r−)),
/// K = 1.2025×10⁻⁴ J·m/mol, d = 3.45×10⁻¹¹ m,
///
/// ν ions per formula unit, radii in pm; kJ/mol. An estimate, typically within a few
/// percent of Born–Haber values for simple salts, worse for complex ions.
pub fn kapustinskii(
    ions_per_formula: f64,
    z_plus: f64,
    z_minus: f64,
    r_plus_pm: f64,
    r_minus_pm: f64,
) -> f64 {
    let r = r_plus_pm + r_minus_pm;
    1.2025e5 * ions_per_formula * z_plus.abs() * z_minus.abs() / r * (1.0 - 34.5 / r)
}

/// [`kapustinskii`] for a salt from the stored radii (ionic radii of monatomic ions,
/// thermochemical radii of polyatomic ones).
pub fn kapustinskii_lattice<'a>(thermo: &'a Thermochemistry, salt: &str) -> Option<Worked<'a>> {
    let ions = dissociate(salt)?;
    let (cation, nc) = ions.first().copied()?;
    let (anion, na) = ions.get(1).copied()?;
    let rc = thermo.first(ThermoQuantity::Radius, None, cation.species)?;
    let ra = thermo.first(ThermoQuantity::Radius, None, anion.species)?;
    Some(Worked {
        kj_per_mol: kapustinskii(
            f64::from(nc + na),
            f64::from(cation.charge),
            f64::from(anion.charge),
            rc.value,
            ra.value,
        ),
        used: vec![rc, ra],
    })
}

/// The enthalpy cycle of dissolving a salt: lattice enthalpy (crystal → gaseous ions), then
/// hydration of the ions; their sum estimates ΔHsol at infinite dilution.
#[derive(Debug, Clone, PartialEq)]
pub struct Cycle<'a> {
    pub lattice: Worked<'a>,
    pub method: LatticeMethod,
    /// Σ ν·ΔhydH°(ion), from single-ion values on one absolute scale.
    pub hydration: Worked<'a>,
    /// lattice + hydration.
    pub kj_per_mol: f64,
    /// A rough one-sided size of the error of the sum: the sum is a small difference of
    /// two large numbers, each uncertain by a few percent.
    pub expected_error: f64,
}

/// The cycle for an anhydrous salt: Born–Haber where the tables allow, otherwise
/// Kapustinskii; hydration from the stored single-ion enthalpies. `None` when a needed
/// figure is missing.
pub fn cycle<'a>(thermo: &'a Thermochemistry, salt: &str) -> Option<Cycle<'a>> {
    let ions = dissociate(salt)?;
    let mut hydration = Worked {
        kj_per_mol: 0.0,
        used: Vec::new(),
    };
    for (ion, n) in &ions {
        let v = thermo.first(ThermoQuantity::Hydration, None, ion.species)?;
        hydration.kj_per_mol += f64::from(*n) * v.value;
        hydration.used.push(v);
    }
    let (lattice, method) = match born_haber_lattice(thermo, salt) {
        Some(w) => (w, LatticeMethod::BornHaber),
        None => (
            kapustinskii_lattice(thermo, salt)?,
            LatticeMethod::Kapustinskii,
        ),
    };
    // Single-ion hydration enthalpies carry about ±1-2% each (Marcus's scale); a
    // Born–Haber lattice about ±1%; a Kapustinskii one about ±10% (a few percent for simple
    // salts, much worse for small doubly charged cations with large complex anions).
    let lattice_error = match method {
        LatticeMethod::BornHaber => 0.01,
        LatticeMethod::Kapustinskii => 0.10,
    } * lattice.kj_per_mol.abs();
    let expected_error = (lattice_error.powi(2) + (0.015 * hydration.kj_per_mol).powi(2)).sqrt();
    Some(Cycle {
        kj_per_mol: lattice.kj_per_mol + hydration.kj_per_mol,
        lattice,
        method,
        hydration,
        expected_error,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::Review;

    fn value(
        quantity: ThermoQuantity,
        state: Option<ThermoState>,
        stage: Option<u8>,
        species: &str,
        v: f64,
    ) -> ThermoValue {
        ThermoValue {
            file: "t".into(),
            quantity,
            state,
            stage,
            species: species.into(),
            value: v,
            source: "s".into(),
            provenance: Provenance::Compiled,
            review: Review::Unreviewed,
            note: None,
        }
    }

    #[test]
    fn formulas_split_into_their_ions() {
        let names = |f: &str| {
            dissociate(f).map(|v| {
                v.iter()
                    .map(|(i, n)| format!("{}x{n}", i.species))
                    .collect::<Vec<_>>()
                    .join(" ")
            })
        };
        assert_eq!(names("NaCl").as_deref(), Some("Na+x1 Cl-x1"));
        assert_eq!(names("CaCl2").as_deref(), Some("Ca+2x1 Cl-x2"));
        assert_eq!(names("(NH4)2SO4").as_deref(), Some("NH4+x2 SO4-2x1"));
        assert_eq!(names("Ca(OH)2").as_deref(), Some("Ca+2x1 OH-x2"));
        assert_eq!(names("KClO3").as_deref(), Some("K+x1 ClO3-x1"));
        assert_eq!(names("NH4H2PO4").as_deref(), Some("NH4+x1 H2PO4-x1"));
        assert_eq!(names("NaC2H3O2").as_deref(), Some("Na+x1 CH3COO-x1"));
        assert_eq!(names("K2HPO4").as_deref(), Some("K+x2 HPO4-2x1"));
        // Out of charge balance, unknown ions, molecular solids: none.
        assert_eq!(names("NaCl2"), None);
        assert_eq!(names("Na3C6H5O7"), None);
        assert_eq!(names("CH4N2O"), None);
        assert_eq!(split_hydrate("BaCl2·2H2O"), ("BaCl2", 2.0));
        assert_eq!(split_hydrate("LiCl·H2O"), ("LiCl", 1.0));
        assert_eq!(split_hydrate("K2CO3·1.5H2O"), ("K2CO3", 1.5));
        assert_eq!(split_hydrate("KCl"), ("KCl", 0.0));
    }

    #[test]
    fn hess_law_counts_ions_and_hydrate_water() {
        // Invented figures.
        let mut t = Thermochemistry::default();
        let f = ThermoQuantity::Formation;
        t.values
            .push(value(f, Some(ThermoState::Aqueous), None, "Ca+2", -500.0));
        t.values
            .push(value(f, Some(ThermoState::Aqueous), None, "Cl-", -100.0));
        t.values
            .push(value(f, Some(ThermoState::Liquid), None, "H2O", -300.0));
        t.values
            .push(value(f, Some(ThermoState::Crystal), None, "CaCl2", -800.0));
        t.values.push(value(
            f,
            Some(ThermoState::Crystal),
            None,
            "CaCl2·2H2O",
            -1380.0,
        ));
        let anhydrous = standard_heat_of_solution(&t, "CaCl2").unwrap();
        assert!((anhydrous.kj_per_mol - (-700.0 + 800.0)).abs() < 1e-9);
        let hydrate = standard_heat_of_solution(&t, "CaCl2·2H2O").unwrap();
        assert!((hydrate.kj_per_mol - (-700.0 - 600.0 + 1380.0)).abs() < 1e-9);
        assert_eq!(hydrate.used.len(), 4);
        assert!(standard_heat_of_solution(&t, "MgCl2").is_none());
    }

    #[test]
    fn kapustinskii_by_hand() {
        // NaCl with r+ = 102 pm, r− = 181 pm: 1.2025e5·2/283·(1 − 34.5/283) = 746.2 kJ/mol.
        let u = kapustinskii(2.0, 1.0, -1.0, 102.0, 181.0);
        assert!((u - 746.2).abs() < 0.1, "{u}");
    }
}
