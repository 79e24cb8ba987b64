//! Pitzer's equations for a mixture of electrolytes: every ion's activity coefficient, the
//! osmotic coefficient and the water activity of a solution of several salts.
//!
//! Equations: C. E. Harvie, N. Møller & J. H. Weare, Geochim. Cosmochim. Acta 48 (1984)
//! 723–751, eqs. 1–9 (the form of K. S. Pitzer, in *Activity Coefficients in Electrolyte
//! Solutions*, 2nd ed., CRC Press 1991, ch. 3), with M cations c, X anions a:
//!
//! φ − 1 = (2/Σmᵢ)[−A_φ I^{3/2}/(1 + b√I) + ΣΣ m_c m_a (B^φ_ca + Z C_ca)
//!         + Σ_{c<c'} m_c m_c' (Φ^φ_cc' + Σ_a m_a ψ_cc'a) + Σ_{a<a'} m_a m_a' (Φ^φ_aa' + Σ_c m_c ψ_aa'c)],
//! ln γ_M = z_M² F + Σ_a m_a (2B_Ma + Z C_Ma) + Σ_c m_c (2Φ_Mc + Σ_a m_a ψ_Mca)
//!          + Σ_{a<a'} m_a m_a' ψ_Maa' + |z_M| ΣΣ m_c m_a C_ca (and alike for an anion),
//! F = −A_φ[√I/(1 + b√I) + (2/b) ln(1 + b√I)] + ΣΣ m_c m_a B'_ca + Σ m_c m_c' Φ'_cc' + Σ m_a m_a' Φ'_aa',
//!
//! with Z = Σ mᵢ|zᵢ|, C_ca = Cφ_ca / (2√|z_c z_a|), B^φ = β0 + β1 e^{−α1√I} + β2 e^{−α2√I},
//! B = β0 + β1 g(α1√I) + β2 g(α2√I), B' = [β1 g'(α1√I) + β2 g'(α2√I)]/I,
//! g(x) = 2[1 − (1 + x)e^{−x}]/x², g'(x) = −2[1 − (1 + x + x²/2)e^{−x}]/x²;
//! Φ = θ + Eθ(I), Φ' = Eθ'(I), Φ^φ = θ + Eθ + I·Eθ' for ions of one sign;
//! and ln a_w = −φ Σmᵢ M_w.
//!
//! The unsymmetrical mixing terms (K. S. Pitzer, J. Solution Chem. 4 (1975) 249–265, eqs.
//! 16–17), for ions of one sign and different charge:
//! Eθ_ij = (z_i z_j / 4I)[J(x_ij) − ½J(x_ii) − ½J(x_jj)], x_ij = 6 z_i z_j A_φ √I,
//! Eθ'_ij = −Eθ_ij/I + (z_i z_j / 8I²)[x_ij J'(x_ij) − ½x_ii J'(x_ii) − ½x_jj J'(x_jj)];
//! J(x) and J'(x) by Harvie's Chebyshev expansion ([`harvie_j`]).
//!
//! Parameters are data: [`ParameterSet`] for each cation–anion pair, [`MixingSet`] for each
//! θ and ψ, joined by a [`SystemSpec`] into a [`System`] (all read from
//! `seed-data/models/`). This module only computes.

use serde::Deserialize;

use super::debye_huckel::{A_PHI_RANGE_K, a_phi};
use super::ions::{charge, electrolyte};
use super::pitzer::{B, ParameterSet, TemperatureForm, WATER_KG_PER_MOL};
use crate::science::error::ScienceError;

/// A published mixing parameter: θ for two ions of one sign, ψ for two ions of one sign and
/// one of the other.
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct MixingSet {
    /// Stable key, e.g. `harvie-moller-weare-1984-theta-k-na`.
    pub key: String,
    /// Two ion symbols (θ) or three (ψ), as [`super::ions::IONS`] writes them.
    pub ions: Vec<String>,
    /// Key of the publication in `sources.toml`.
    pub source: String,
    pub provenance: String,
    pub review: String,
    #[serde(default)]
    pub note: Option<String>,
    pub value: TemperatureForm,
    /// Temperatures the parameter was fitted over, K.
    pub t_min_k: f64,
    pub t_max_k: f64,
}

/// A published system: which single-electrolyte sets and mixing parameters are used
/// together (a model is fitted as a whole; sets from different papers are not mixed
/// unless the paper did).
#[derive(Debug, Clone, PartialEq, Deserialize)]
#[serde(deny_unknown_fields)]
pub struct SystemSpec {
    pub key: String,
    /// How answers name it: `Harvie, Moller & Weare (1984), Na-K-Mg-Ca-Cl-SO4 at 25 C`.
    pub name: String,
    pub source: String,
    #[serde(default)]
    pub note: Option<String>,
    /// The highest ionic strength answered, mol/kg.
    pub ionic_strength_max: f64,
    /// Keys of [`ParameterSet`]s.
    pub sets: Vec<String>,
    /// Keys of [`MixingSet`]s.
    pub mixing: Vec<String>,
}

/// A cation–anion pair's parameters.
#[derive(Debug, Clone)]
struct Pair {
    cation: usize,
    anion: usize,
    set: ParameterSet,
}

/// A system resolved: its ions, and each parameter by the ions it joins.
#[derive(Debug, Clone)]
pub struct System {
    pub key: String,
    pub name: String,
    /// Ion symbols and charges, in the order activity coefficients are given.
    pub ions: Vec<(&'static str, i32)>,
    /// The temperatures every parameter of the system holds at, K.
    pub t_min_k: f64,
    pub t_max_k: f64,
    pub ionic_strength_max: f64,
    /// Keys of every set and mixing parameter used, and their sources, for citing.
    pub set_keys: Vec<String>,
    pub sources: Vec<String>,
    pairs: Vec<Pair>,
    thetas: Vec<(usize, usize, TemperatureForm)>,
    psis: Vec<(usize, usize, usize, TemperatureForm)>,
}

impl System {
    /// Joins the sets `spec` names; a message says what does not fit (a key not found, an
    /// electrolyte whose formula is not one cation and one anion this module knows, a
    /// mixing parameter over ions the system does not hold or of the wrong signs).
    pub fn build(
        spec: &SystemSpec,
        sets: &[ParameterSet],
        mixing: &[MixingSet],
    ) -> Result<System, String> {
        let mut system = System {
            key: spec.key.clone(),
            name: spec.name.clone(),
            ions: Vec::new(),
            t_min_k: A_PHI_RANGE_K.0,
            t_max_k: A_PHI_RANGE_K.1,
            ionic_strength_max: spec.ionic_strength_max,
            set_keys: Vec::new(),
            sources: vec![spec.source.clone()],
            pairs: Vec::new(),
            thetas: Vec::new(),
            psis: Vec::new(),
        };
        if !(spec.ionic_strength_max.is_finite() && spec.ionic_strength_max > 0.0) {
            return Err("ionic_strength_max must be positive".into());
        }
        for key in &spec.sets {
            let set = sets
                .iter()
                .find(|s| &s.key == key)
                .ok_or_else(|| format!("set \"{key}\" is not in the model files"))?;
            let e = electrolyte(&set.electrolyte).ok_or_else(|| {
                format!(
                    "set \"{key}\": {} is not one cation and one anion the mixture model knows",
                    set.electrolyte
                )
            })?;
            let charges_agree = charge(e.cation).map(i32::unsigned_abs) == Some(set.cation_charge)
                && charge(e.anion).map(i32::unsigned_abs) == Some(set.anion_charge);
            if !charges_agree {
                return Err(format!(
                    "set \"{key}\": its charges do not match {}",
                    set.electrolyte
                ));
            }
            let cation = system.ion(e.cation);
            let anion = system.ion(e.anion);
            if system
                .pairs
                .iter()
                .any(|p| p.cation == cation && p.anion == anion)
            {
                return Err(format!(
                    "set \"{key}\": a second set for {}",
                    set.electrolyte
                ));
            }
            system.narrow(set.t_min_k, set.t_max_k, &set.key, &set.source);
            system.pairs.push(Pair {
                cation,
                anion,
                set: set.clone(),
            });
        }
        for key in &spec.mixing {
            let p = mixing
                .iter()
                .find(|s| &s.key == key)
                .ok_or_else(|| format!("mixing parameter \"{key}\" is not in the model files"))?;
            let mut idx = Vec::new();
            for symbol in &p.ions {
                let i = system
                    .ions
                    .iter()
                    .position(|(s, _)| s == symbol)
                    .ok_or_else(|| {
                        format!("mixing parameter \"{key}\": no set of the system holds {symbol}")
                    })?;
                idx.push(i);
            }
            let z = |i: usize| system.ions[i].1;
            match idx.as_slice() {
                [i, j] if i != j && z(*i).signum() == z(*j).signum() => {
                    system.thetas.push((*i, *j, p.value.clone()));
                }
                [i, j, k] => {
                    // Two of one sign and one of the other, in any order.
                    let (like, other) = if z(*i).signum() == z(*j).signum() {
                        ((*i, *j), *k)
                    } else if z(*i).signum() == z(*k).signum() {
                        ((*i, *k), *j)
                    } else {
                        ((*j, *k), *i)
                    };
                    if like.0 == like.1 || z(like.0).signum() == z(other).signum() {
                        return Err(format!(
                            "mixing parameter \"{key}\": ψ needs two different ions of one sign and one of the other"
                        ));
                    }
                    system.psis.push((like.0, like.1, other, p.value.clone()));
                }
                _ => {
                    return Err(format!(
                        "mixing parameter \"{key}\": θ needs two different ions of one sign, ψ three ions"
                    ));
                }
            }
            system.narrow(p.t_min_k, p.t_max_k, &p.key, &p.source);
        }
        if system.t_min_k > system.t_max_k {
            return Err("its sets share no temperature".into());
        }
        Ok(system)
    }

    /// The index of ion `symbol`, added if new.
    fn ion(&mut self, symbol: &'static str) -> usize {
        if let Some(i) = self.ions.iter().position(|(s, _)| *s == symbol) {
            return i;
        }
        self.ions.push((symbol, charge(symbol).unwrap_or(0)));
        self.ions.len() - 1
    }

    fn narrow(&mut self, lo: f64, hi: f64, key: &str, source: &str) {
        self.t_min_k = self.t_min_k.max(lo);
        self.t_max_k = self.t_max_k.min(hi);
        self.set_keys.push(key.to_string());
        if !self.sources.iter().any(|s| s == source) {
            self.sources.push(source.to_string());
        }
    }

    /// The position of ion `symbol` in [`System::ions`].
    pub fn index(&self, symbol: &str) -> Option<usize> {
        self.ions.iter().position(|(s, _)| *s == symbol)
    }

    /// True when the system holds at `t_k` (0.01 K leeway, for systems at one temperature).
    pub fn covers(&self, t_k: f64) -> bool {
        t_k >= self.t_min_k - 0.01 && t_k <= self.t_max_k + 0.01
    }

    /// The system's parameters evaluated at `t_k`; refused outside its temperatures.
    pub fn at(&self, t_k: f64) -> Result<Coefficients, ScienceError> {
        if !(t_k.is_finite() && t_k > 0.0) {
            return Err(ScienceError::NotPositive {
                what: "temperature (K)",
                value: t_k,
            });
        }
        if !self.covers(t_k) {
            return Err(ScienceError::OutsideModel(format!(
                "the Pitzer system {} holds from {:.2} K to {:.2} K; asked {:.2} K",
                self.key, self.t_min_k, self.t_max_k, t_k
            )));
        }
        Ok(self.at_unchecked(t_k))
    }

    /// [`System::at`] with no range check.
    pub fn at_unchecked(&self, t_k: f64) -> Coefficients {
        let n = self.ions.len();
        let mut c = Coefficients {
            n,
            z: self.ions.iter().map(|(_, z)| f64::from(*z)).collect(),
            a_phi: a_phi(t_k),
            ionic_strength_max: self.ionic_strength_max,
            pair: vec![None; n * n],
            theta: vec![0.0; n * n],
            psi: vec![0.0; n * n * n],
        };
        for p in &self.pairs {
            let s = &p.set;
            let zz = f64::from(s.cation_charge * s.anion_charge);
            c.pair[p.cation * n + p.anion] = Some(PairAt {
                beta0: s.beta0.at(t_k),
                beta1: s.beta1.at(t_k),
                beta2: s.beta2.at(t_k),
                c: s.c_phi.at(t_k) / (2.0 * zz.sqrt()),
                alpha1: s.alpha1,
                alpha2: s.alpha2,
            });
        }
        for (i, j, v) in &self.thetas {
            let v = v.at(t_k);
            c.theta[i * n + j] = v;
            c.theta[j * n + i] = v;
        }
        for (i, j, k, v) in &self.psis {
            let v = v.at(t_k);
            c.psi[(i * n + j) * n + k] = v;
            c.psi[(j * n + i) * n + k] = v;
        }
        c
    }
}

/// One cation–anion pair's parameters at one temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
struct PairAt {
    beta0: f64,
    beta1: f64,
    beta2: f64,
    /// C = Cφ / (2√|z_c z_a|).
    c: f64,
    alpha1: f64,
    alpha2: f64,
}

/// A system's parameters at one temperature, by ion index: ready to evaluate many
/// compositions.
#[derive(Debug, Clone)]
pub struct Coefficients {
    n: usize,
    z: Vec<f64>,
    a_phi: f64,
    ionic_strength_max: f64,
    /// `[cation * n + anion]`.
    pair: Vec<Option<PairAt>>,
    /// `[i * n + j]`, symmetric.
    theta: Vec<f64>,
    /// `[(i * n + j) * n + k]` for i, j of one sign and k of the other; symmetric in i, j.
    psi: Vec<f64>,
}

/// What the model gives for one composition.
#[derive(Debug, Clone, PartialEq)]
pub struct Activity {
    /// ln γ of every ion of the system, in the order of [`System::ions`].
    pub ln_gamma: Vec<f64>,
    /// The osmotic coefficient φ.
    pub osmotic: f64,
    /// ln a_w.
    pub ln_water: f64,
    /// Ionic strength, mol/kg.
    pub ionic_strength: f64,
}

impl Activity {
    /// The water activity a_w.
    pub fn water_activity(&self) -> f64 {
        self.ln_water.exp()
    }
}

/// g(x) = 2[1 − (1 + x)e^{−x}]/x².
fn g(x: f64) -> f64 {
    2.0 * (1.0 - (1.0 + x) * (-x).exp()) / (x * x)
}

/// g'(x) = −2[1 − (1 + x + x²/2)e^{−x}]/x².
fn g_prime(x: f64) -> f64 {
    -2.0 * (1.0 - (1.0 + x + 0.5 * x * x) * (-x).exp()) / (x * x)
}

/// Chebyshev coefficients of Harvie's method for J(x), highest order first: Pitzer (1991)
/// ch. 3, Table B-1, the columns a_k(I) for x < 1 and a_k(II) for x ≥ 1. Transcribed from
/// PyPI pytzer 0.6.0 (`unsymmetrical._Harvie_raw`), compiled.
const HARVIE_I: [f64; 21] = [
    -0.000_000_000_010_991,
    -0.000_000_000_002_563,
    0.000_000_000_001_943,
    0.000_000_000_046_333,
    -0.000_000_000_050_847,
    -0.000_000_000_821_969,
    0.000_000_001_229_405,
    0.000_000_013_522_610,
    -0.000_000_025_267_769,
    -0.000_000_202_099_617,
    0.000_000_396_566_462,
    0.000_002_937_706_971,
    -0.000_004_537_895_710,
    -0.000_045_036_975_204,
    0.000_036_583_601_823,
    0.000_636_874_599_598,
    0.000_388_260_636_404,
    -0.007_299_499_690_937,
    -0.029_779_077_456_514,
    -0.060_076_477_753_119,
    1.925_154_014_814_667,
];
const HARVIE_II: [f64; 21] = [
    0.000_000_000_237_816,
    -0.000_000_002_849_257,
    -0.000_000_006_944_757,
    0.000_000_004_558_555,
    0.000_000_080_779_570,
    0.000_000_216_991_779,
    -0.000_000_250_453_880,
    -0.000_003_548_684_306,
    -0.000_004_583_768_938,
    0.000_034_682_122_751,
    0.000_087_294_451_594,
    -0.000_242_107_641_309,
    -0.000_887_171_310_131,
    0.001_130_378_079_086,
    0.006_519_840_398_744,
    -0.001_668_087_945_272,
    -0.036_552_745_910_311,
    -0.028_796_057_604_906,
    0.150_044_637_187_895,
    0.462_762_985_338_493,
    0.628_023_320_520_852,
];

/// J(x) and J'(x) of the unsymmetrical mixing terms by Harvie's Chebyshev expansion
/// (Pitzer 1991, ch. 3, eqs. B-21 to B-30): z = 4x^{1/5} − 2 for x < 1, z = (40/9)x^{−1/10}
/// − 22/9 otherwise; Clenshaw's recurrence b_k = z·b_{k+1} − b_{k+2} + a_k and its
/// derivative d_k = b_{k+1} + z·d_{k+1} − d_{k+2}; J = x/4 − 1 + (b_0 − b_2)/2,
/// J' = 1/4 + (dz/dx)(d_0 − d_2)/2. J(0) = 0.
pub fn harvie_j(x: f64) -> (f64, f64) {
    if x <= 0.0 || !x.is_finite() {
        return (0.0, 0.0);
    }
    let (ak, z, dz) = if x < 1.0 {
        (&HARVIE_I, 4.0 * x.powf(0.2) - 2.0, 0.8 * x.powf(-0.8))
    } else {
        (
            &HARVIE_II,
            40.0 / 9.0 * x.powf(-0.1) - 22.0 / 9.0,
            -4.0 / 9.0 * x.powf(-1.1),
        )
    };
    let (mut b0, mut b1, mut b2) = (0.0, 0.0, 0.0);
    let (mut d0, mut d1, mut d2) = (0.0, 0.0, 0.0);
    for a in ak {
        b2 = b1;
        b1 = b0;
        d2 = d1;
        d1 = d0;
        b0 = z * b1 - b2 + a;
        d0 = b1 + z * d1 - d2;
    }
    (
        0.25 * x - 1.0 + 0.5 * (b0 - b2),
        0.25 + 0.5 * dz * (d0 - d2),
    )
}

/// Eθ and Eθ' of two ions of one sign with charges `zi`, `zj` (magnitudes), at ionic
/// strength `ionic` (> 0) and A_φ `a_phi`. Zero for equal charges.
pub fn e_theta(zi: f64, zj: f64, ionic: f64, a_phi: f64) -> (f64, f64) {
    if zi == zj || ionic <= 0.0 {
        return (0.0, 0.0);
    }
    let s = 6.0 * a_phi * ionic.sqrt();
    let (xij, xii, xjj) = (s * zi * zj, s * zi * zi, s * zj * zj);
    let (jij, dij) = harvie_j(xij);
    let (jii, dii) = harvie_j(xii);
    let (jjj, djj) = harvie_j(xjj);
    let e = zi * zj / (4.0 * ionic) * (jij - 0.5 * jii - 0.5 * jjj);
    let e_prime = -e / ionic
        + zi * zj / (8.0 * ionic * ionic) * (xij * dij - 0.5 * xii * dii - 0.5 * xjj * djj);
    (e, e_prime)
}

impl Coefficients {
    /// The number of ions.
    pub fn len(&self) -> usize {
        self.n
    }

    /// True for a system of no ions.
    pub fn is_empty(&self) -> bool {
        self.n == 0
    }

    /// The activity of a composition: `molalities` of every ion of the system (mol/kg, in
    /// the order of [`System::ions`]; zero for ions not present). Refused for a negative or
    /// non-finite molality, a solution that is not electrically neutral (within 1e-6 of its
    /// charge), or an ionic strength above the system's.
    pub fn activity(&self, molalities: &[f64]) -> Result<Activity, ScienceError> {
        if molalities.len() != self.n {
            return Err(ScienceError::OutsideModel(format!(
                "{} molalities given for a system of {} ions",
                molalities.len(),
                self.n
            )));
        }
        if let Some(m) = molalities.iter().find(|m| !(m.is_finite() && **m >= 0.0)) {
            return Err(ScienceError::InvalidComposition {
                value: *m,
                unit: "mol/kg",
                why: "a molality must be zero or positive",
            });
        }
        let charge: f64 = molalities.iter().zip(&self.z).map(|(m, z)| m * z).sum();
        let scale: f64 = molalities
            .iter()
            .zip(&self.z)
            .map(|(m, z)| m * z.abs())
            .sum();
        if charge.abs() > 1e-6 * scale.max(1.0) {
            return Err(ScienceError::OutsideModel(format!(
                "the ions are not electrically neutral (net charge {charge:.3e} mol/kg)"
            )));
        }
        let a = self.activity_unchecked(molalities);
        if a.ionic_strength > self.ionic_strength_max {
            return Err(ScienceError::OutsideModel(format!(
                "ionic strength {:.2} mol/kg is beyond the {:.1} mol/kg the parameter system is answered to",
                a.ionic_strength, self.ionic_strength_max
            )));
        }
        Ok(a)
    }

    /// [`Coefficients::activity`] with no checks (the caller keeps to the model's range).
    pub fn activity_unchecked(&self, m: &[f64]) -> Activity {
        let n = self.n;
        let z = &self.z;
        let ionic: f64 = 0.5 * m.iter().zip(z).map(|(m, z)| m * z * z).sum::<f64>();
        let total: f64 = m.iter().sum();
        if ionic <= 0.0 {
            return Activity {
                ln_gamma: vec![0.0; n],
                osmotic: 1.0,
                ln_water: 0.0,
                ionic_strength: 0.0,
            };
        }
        let big_z: f64 = m.iter().zip(z).map(|(m, z)| m * z.abs()).sum();
        let root = ionic.sqrt();
        let a_phi = self.a_phi;
        let f_gamma = -a_phi * (root / (1.0 + B * root) + 2.0 / B * (1.0 + B * root).ln());
        // Pair terms at this ionic strength: B, B', B^φ, C by [c * n + a].
        let mut b = vec![0.0; n * n];
        let mut b_prime = vec![0.0; n * n];
        let mut b_phi = vec![0.0; n * n];
        let mut cc = vec![0.0; n * n];
        for (idx, p) in self.pair.iter().enumerate() {
            let Some(p) = p else { continue };
            let (x1, x2) = (p.alpha1 * root, p.alpha2 * root);
            let (mut bv, mut bp, mut bf) = (p.beta0 + p.beta1 * g(x1), p.beta1 * g_prime(x1), {
                p.beta0 + p.beta1 * (-x1).exp()
            });
            if p.beta2 != 0.0 && x2 > 0.0 {
                bv += p.beta2 * g(x2);
                bp += p.beta2 * g_prime(x2);
                bf += p.beta2 * (-x2).exp();
            }
            b[idx] = bv;
            b_prime[idx] = bp / ionic;
            b_phi[idx] = bf;
            cc[idx] = p.c;
        }
        // Mixing of like-signed ions: Φ, Φ', Φ^φ by [i * n + j].
        let mut phi_mix = vec![0.0; n * n];
        let mut phi_mix_prime = vec![0.0; n * n];
        let mut phi_mix_phi = vec![0.0; n * n];
        for i in 0..n {
            for j in 0..n {
                if i == j || z[i].signum() != z[j].signum() {
                    continue;
                }
                let (e, ep) = e_theta(z[i].abs(), z[j].abs(), ionic, a_phi);
                let t = self.theta[i * n + j];
                phi_mix[i * n + j] = t + e;
                phi_mix_prime[i * n + j] = ep;
                phi_mix_phi[i * n + j] = t + e + ionic * ep;
            }
        }
        // F and the sums shared by every ion.
        let mut f = f_gamma;
        let mut sum_mc_ma_c = 0.0;
        let mut osm = -a_phi * ionic * root / (1.0 + B * root);
        for c in (0..n).filter(|&c| z[c] > 0.0) {
            for a in (0..n).filter(|&a| z[a] < 0.0) {
                let mm = m[c] * m[a];
                let idx = c * n + a;
                f += mm * b_prime[idx];
                sum_mc_ma_c += mm * cc[idx];
                osm += mm * (b_phi[idx] + big_z * cc[idx]);
            }
        }
        for i in 0..n {
            for j in (i + 1)..n {
                if z[i].signum() != z[j].signum() {
                    continue;
                }
                let mm = m[i] * m[j];
                f += mm * phi_mix_prime[i * n + j];
                let mut term = phi_mix_phi[i * n + j];
                for k in (0..n).filter(|&k| z[k].signum() != z[i].signum()) {
                    term += m[k] * self.psi[(i * n + j) * n + k];
                }
                osm += mm * term;
            }
        }
        let osmotic = 1.0 + 2.0 / total * osm;
        let mut ln_gamma = vec![0.0; n];
        for (i, lg) in ln_gamma.iter_mut().enumerate() {
            let zi = z[i];
            let mut v = zi * zi * f + zi.abs() * sum_mc_ma_c;
            // Counter-ions: 2B + Z·C.
            for k in (0..n).filter(|&k| z[k].signum() != zi.signum()) {
                let idx = if zi > 0.0 { i * n + k } else { k * n + i };
                v += m[k] * (2.0 * b[idx] + big_z * cc[idx]);
            }
            // Like-signed ions: 2Φ + Σ m ψ over counter-ions.
            for j in (0..n).filter(|&j| j != i && z[j].signum() == zi.signum()) {
                let mut term = 2.0 * phi_mix[i * n + j];
                for k in (0..n).filter(|&k| z[k].signum() != zi.signum()) {
                    term += m[k] * self.psi[(i * n + j) * n + k];
                }
                v += m[j] * term;
            }
            // Pairs of counter-ions: ψ_{k l i}.
            for k in (0..n).filter(|&k| z[k].signum() != zi.signum()) {
                for l in ((k + 1)..n).filter(|&l| z[l].signum() == z[k].signum()) {
                    v += m[k] * m[l] * self.psi[(k * n + l) * n + i];
                }
            }
            *lg = v;
        }
        Activity {
            ln_gamma,
            osmotic,
            ln_water: -osmotic * total * WATER_KG_PER_MOL,
            ionic_strength: ionic,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn constant(v: f64) -> TemperatureForm {
        TemperatureForm::Constant(v)
    }

    fn set(
        key: &str,
        formula: &str,
        zc: u32,
        za: u32,
        nc: u32,
        na: u32,
        b: [f64; 3],
    ) -> ParameterSet {
        ParameterSet {
            key: key.into(),
            electrolyte: formula.into(),
            source: "s".into(),
            provenance: "compiled".into(),
            review: "unreviewed".into(),
            note: None,
            cation_charge: zc,
            anion_charge: za,
            cation_count: nc,
            anion_count: na,
            beta0: constant(b[0]),
            beta1: constant(b[1]),
            beta2: constant(0.0),
            c_phi: constant(b[2]),
            alpha1: 2.0,
            alpha2: 0.0,
            t_min_k: 298.15,
            t_max_k: 298.15,
            molality_max: 6.0,
        }
    }

    fn mixing(key: &str, ions: &[&str], v: f64) -> MixingSet {
        MixingSet {
            key: key.into(),
            ions: ions.iter().map(|s| s.to_string()).collect(),
            source: "s".into(),
            provenance: "compiled".into(),
            review: "unreviewed".into(),
            note: None,
            value: constant(v),
            t_min_k: 298.15,
            t_max_k: 298.15,
        }
    }

    /// Na–Mg–Cl–SO4 with Harvie, Møller & Weare (1984)'s figures for NaCl, MgCl2, Na2SO4
    /// and their θ, ψ (the same as seed-data/models/pitzer-harvie-moller-weare-1984.toml).
    fn system() -> System {
        let sets = vec![
            set("nacl", "NaCl", 1, 1, 1, 1, [0.0765, 0.2644, 0.00127]),
            set("mgcl2", "MgCl2", 2, 1, 1, 2, [0.35235, 1.6815, 0.00519]),
            set("na2so4", "Na2SO4", 1, 2, 2, 1, [0.01958, 1.113, 0.00497]),
        ];
        let mix = vec![
            mixing("t-mg-na", &["Mg", "Na"], 0.07),
            mixing("p-mg-na-cl", &["Mg", "Na", "Cl"], -0.012),
            mixing("t-cl-so4", &["Cl", "SO4"], 0.02),
            mixing("p-na-cl-so4", &["Na", "Cl", "SO4"], 0.0014),
        ];
        let spec = SystemSpec {
            key: "test".into(),
            name: "test".into(),
            source: "s".into(),
            note: None,
            ionic_strength_max: 20.0,
            sets: vec!["nacl".into(), "mgcl2".into(), "na2so4".into()],
            mixing: mix.iter().map(|m| m.key.clone()).collect(),
        };
        System::build(&spec, &sets, &mix).unwrap()
    }

    fn molalities(s: &System, given: &[(&str, f64)]) -> Vec<f64> {
        let mut m = vec![0.0; s.ions.len()];
        for (ion, v) in given {
            m[s.index(ion).unwrap()] = *v;
        }
        m
    }

    #[test]
    fn one_salt_gives_the_single_electrolyte_osmotic_coefficient() {
        let s = system();
        let c = s.at(298.15).unwrap();
        let nacl = set("nacl", "NaCl", 1, 1, 1, 1, [0.0765, 0.2644, 0.00127]);
        for m in [0.1, 1.0, 3.0, 6.0] {
            let a = c
                .activity(&molalities(&s, &[("Na", m), ("Cl", m)]))
                .unwrap();
            let single = super::super::pitzer::phi_unchecked(&nacl, m, 298.15);
            assert!(
                (a.osmotic - single).abs() < 1e-12,
                "{m}: {} {single}",
                a.osmotic
            );
        }
    }

    #[test]
    fn harvie_j_matches_its_derivative_and_the_limits() {
        // J'(x) against a central difference, on both sides of the break at x = 1.
        for x in [0.01, 0.3, 0.9, 1.1, 5.0, 40.0] {
            let h = 1e-6 * x;
            let numeric = (harvie_j(x + h).0 - harvie_j(x - h).0) / (2.0 * h);
            let (_, d) = harvie_j(x);
            assert!(
                (numeric - d).abs() < 1e-6 * d.abs().max(1.0),
                "{x}: {numeric} {d}"
            );
        }
        // The defining integral, Pitzer (1975) eq. 47's J(x) = (1/x)∫₀^∞ [1 + q + q²/2 − e^q] y² dy,
        // q = −(x/y)e^{−y}, by Simpson's rule (integrand x²/2 at y = 0).
        for x in [0.05f64, 0.5, 1.0, 3.0, 20.0] {
            let f = |y: f64| {
                if y == 0.0 {
                    return x * x / 2.0;
                }
                let q = -(x / y) * (-y).exp();
                (1.0 + q + q * q / 2.0 - q.exp()) * y * y
            };
            let (n, top) = (20_000, 60.0);
            let h = top / f64::from(n);
            let mut sum = f(0.0) + f(top);
            for k in 1..n {
                sum += f(f64::from(k) * h) * if k % 2 == 1 { 4.0 } else { 2.0 };
            }
            let integral = sum * h / 3.0 / x;
            let (j, _) = harvie_j(x);
            assert!(
                (j - integral).abs() < 1e-6 * integral.max(1e-3),
                "{x}: {j} {integral}"
            );
        }
        assert_eq!(harvie_j(0.0), (0.0, 0.0));
    }

    /// Gibbs–Duhem: scaling every molality by λ, d[λ Σm⁰ (φ − 1)]/dλ = Σ λ m⁰ᵢ d ln γᵢ/dλ.
    /// Holds only when ln γ and φ come from one excess Gibbs energy, so it checks every term.
    #[test]
    fn activity_and_osmotic_coefficients_obey_gibbs_duhem() {
        let s = system();
        let c = s.at(298.15).unwrap();
        let m0 = molalities(&s, &[("Na", 2.0), ("Mg", 0.7), ("Cl", 2.4), ("SO4", 0.5)]);
        let total: f64 = m0.iter().sum();
        let at = |l: f64| c.activity_unchecked(&m0.iter().map(|m| m * l).collect::<Vec<_>>());
        for l in [0.05, 0.5, 1.0, 2.0] {
            let h = 1e-5 * l;
            let (up, down) = (at(l + h), at(l - h));
            let lhs = ((l + h) * total * (up.osmotic - 1.0)
                - (l - h) * total * (down.osmotic - 1.0))
                / (2.0 * h);
            let rhs: f64 = (0..m0.len())
                .map(|i| l * m0[i] * (up.ln_gamma[i] - down.ln_gamma[i]) / (2.0 * h))
                .sum();
            assert!(
                (lhs - rhs).abs() < 1e-6 * lhs.abs().max(1.0),
                "{l}: {lhs} {rhs}"
            );
        }
    }

    #[test]
    fn bad_compositions_and_temperatures_are_refused() {
        let s = system();
        assert!(matches!(s.at(273.15), Err(ScienceError::OutsideModel(_))));
        let c = s.at(298.15).unwrap();
        assert!(
            c.activity(&molalities(&s, &[("Na", 1.0)])).is_err(),
            "not neutral"
        );
        assert!(
            c.activity(&molalities(&s, &[("Na", -1.0), ("Cl", -1.0)]))
                .is_err()
        );
        assert!(c.activity(&[1.0]).is_err());
        let too_strong = molalities(&s, &[("Mg", 10.0), ("SO4", 10.0)]);
        assert!(c.activity(&too_strong).is_err(), "I = 40");
        let pure = c.activity(&vec![0.0; s.ions.len()]).unwrap();
        assert_eq!((pure.osmotic, pure.water_activity()), (1.0, 1.0));
    }

    #[test]
    fn a_system_that_does_not_fit_is_refused_with_a_reason() {
        let sets = vec![set("nacl", "NaCl", 1, 1, 1, 1, [0.0765, 0.2644, 0.00127])];
        let mut spec = SystemSpec {
            key: "x".into(),
            name: "x".into(),
            source: "s".into(),
            note: None,
            ionic_strength_max: 6.0,
            sets: vec!["nacl".into(), "kcl".into()],
            mixing: vec![],
        };
        let e = System::build(&spec, &sets, &[]).unwrap_err();
        assert!(e.contains("\"kcl\""), "{e}");
        spec.sets = vec!["nacl".into()];
        spec.mixing = vec!["t".into()];
        let e = System::build(&spec, &sets, &[mixing("t", &["K", "Na"], 0.0)]).unwrap_err();
        assert!(e.contains("holds K"), "{e}");
        let e = System::build(&spec, &sets, &[mixing("t", &["Na", "Cl"], 0.0)]).unwrap_err();
        assert!(e.contains("θ needs"), "{e}");
    }
}
