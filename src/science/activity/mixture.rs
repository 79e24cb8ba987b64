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
    /// Index tables made once by [`System::build`]: every pair of like-signed ions with a θ
    /// or unequal charges (`theta` the index into `thetas` that holds for it, the last one
    /// named), and every ψ once (`psi` the index into `psis`).
    likes: Vec<LikeIndex>,
    triplets: Vec<TripletIndex>,
}

/// Two ions of one sign whose mixing terms are not zero.
#[derive(Debug, Clone, Copy)]
struct LikeIndex {
    i: usize,
    j: usize,
    theta: Option<usize>,
}

/// Two ions of one sign (`i < j`) and one of the other, with their ψ.
#[derive(Debug, Clone, Copy)]
struct TripletIndex {
    i: usize,
    j: usize,
    k: usize,
    psi: usize,
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
            likes: Vec::new(),
            triplets: Vec::new(),
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
        system.index_tables();
        Ok(system)
    }

    /// Fills [`System::likes`] and [`System::triplets`]: a parameter named twice counts
    /// once (the last one named holds, as a table written in order would keep it).
    fn index_tables(&mut self) {
        let n = self.ions.len();
        let sign = |i: usize| self.ions[i].1.signum();
        let charge = |i: usize| self.ions[i].1;
        let mut likes = Vec::new();
        let mut triplets = Vec::new();
        for i in 0..n {
            for j in (i + 1)..n {
                if sign(i) == 0 || sign(i) != sign(j) {
                    continue;
                }
                let theta = self
                    .thetas
                    .iter()
                    .rposition(|(a, b, _)| (*a, *b) == (i, j) || (*a, *b) == (j, i));
                if theta.is_some() || charge(i) != charge(j) {
                    likes.push(LikeIndex { i, j, theta });
                }
                for k in (0..n).filter(|&k| sign(k) != 0 && sign(k) != sign(i)) {
                    let psi = self.psis.iter().rposition(|(a, b, c, _)| {
                        *c == k && ((*a, *b) == (i, j) || (*a, *b) == (j, i))
                    });
                    if let Some(psi) = psi {
                        triplets.push(TripletIndex { i, j, k, psi });
                    }
                }
            }
        }
        self.likes = likes;
        self.triplets = triplets;
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
        let mut c = Coefficients::default();
        self.evaluate_into(t_k, &mut c);
        c
    }

    /// The parameters at `t_k` written into `c` (its buffers reused, so a scan over
    /// temperatures allocates nothing after the first): every temperature function is
    /// evaluated here, once per temperature. No range check.
    pub fn evaluate_into(&self, t_k: f64, c: &mut Coefficients) {
        c.z.clear();
        c.z.extend(self.ions.iter().map(|(_, z)| f64::from(*z)));
        c.a_phi = a_phi(t_k);
        c.ionic_strength_max = self.ionic_strength_max;
        c.pairs.clear();
        c.pairs.extend(self.pairs.iter().map(|p| {
            let s = &p.set;
            let zz = f64::from(s.cation_charge * s.anion_charge);
            PairAt {
                cation: p.cation,
                anion: p.anion,
                beta0: s.beta0.at(t_k),
                beta1: s.beta1.at(t_k),
                beta2: s.beta2.at(t_k),
                c: s.c_phi.at(t_k) / (2.0 * zz.sqrt()),
                alpha1: s.alpha1,
                alpha2: s.alpha2,
            }
        }));
        c.likes.clear();
        c.likes.extend(self.likes.iter().map(|l| {
            let (zi, zj) = (
                self.ions[l.i].1.unsigned_abs(),
                self.ions[l.j].1.unsigned_abs(),
            );
            LikeAt {
                i: l.i,
                j: l.j,
                theta: l.theta.map_or(0.0, |k| self.thetas[k].2.at(t_k)),
                charges: (zi != zj).then_some((zi, zj)),
            }
        }));
        c.triplets.clear();
        c.triplets.extend(self.triplets.iter().map(|t| TripletAt {
            i: t.i,
            j: t.j,
            k: t.k,
            psi: self.psis[t.psi].3.at(t_k),
        }));
    }
}

/// One cation–anion pair's parameters at one temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
struct PairAt {
    cation: usize,
    anion: usize,
    beta0: f64,
    beta1: f64,
    beta2: f64,
    /// C = Cφ / (2√|z_c z_a|).
    c: f64,
    alpha1: f64,
    alpha2: f64,
}

/// Two ions of one sign at one temperature: θ, and their charges when unequal (then the
/// unsymmetrical terms Eθ, Eθ' apply).
#[derive(Debug, Clone, Copy, PartialEq)]
struct LikeAt {
    i: usize,
    j: usize,
    theta: f64,
    charges: Option<(u32, u32)>,
}

/// ψ of two ions of one sign (`i`, `j`) and one of the other (`k`) at one temperature.
#[derive(Debug, Clone, Copy, PartialEq)]
struct TripletAt {
    i: usize,
    j: usize,
    k: usize,
    psi: f64,
}

/// The largest product of two like charges whose J(x) is kept per composition (charges up
/// to 4); beyond it Eθ is evaluated pair by pair.
const MAX_CHARGE_PRODUCT: usize = 16;

/// A system's parameters at one temperature, as lists of the terms that are not zero (each
/// pair, each like-signed pair, each ψ once): ready to evaluate many compositions, with no
/// allocation per composition ([`Coefficients::activity_into`]).
#[derive(Debug, Clone, Default)]
pub struct Coefficients {
    z: Vec<f64>,
    a_phi: f64,
    ionic_strength_max: f64,
    pairs: Vec<PairAt>,
    likes: Vec<LikeAt>,
    triplets: Vec<TripletAt>,
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
    /// An activity of `n` ions to be filled by [`Coefficients::activity_into`] (pure water
    /// until then).
    pub fn new(n: usize) -> Activity {
        Activity {
            ln_gamma: vec![0.0; n],
            osmotic: 1.0,
            ln_water: 0.0,
            ionic_strength: 0.0,
        }
    }

    /// The water activity a_w.
    pub fn water_activity(&self) -> f64 {
        self.ln_water.exp()
    }
}

/// g(x) = 2[1 − (1 + x)e^{−x}]/x², with `e` = e^{−x}.
fn g_with(x: f64, e: f64) -> f64 {
    2.0 * (1.0 - (1.0 + x) * e) / (x * x)
}

/// g'(x) = −2[1 − (1 + x + x²/2)e^{−x}]/x², with `e` = e^{−x}.
fn g_prime_with(x: f64, e: f64) -> f64 {
    -2.0 * (1.0 - (1.0 + x + 0.5 * x * x) * e) / (x * x)
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
    // One power per call: dz/dx from it (x^{-0.8} = x^{0.2}/x, x^{-1.1} = x^{-0.1}/x).
    let (ak, z, dz) = if x < 1.0 {
        let p = x.powf(0.2);
        (&HARVIE_I, 4.0 * p - 2.0, 0.8 * p / x)
    } else {
        let p = x.powf(-0.1);
        (&HARVIE_II, 40.0 / 9.0 * p - 22.0 / 9.0, -4.0 / 9.0 * p / x)
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
    e_theta_with(zi, zj, ionic, s, |zz| harvie_j(s * zz))
}

/// Eθ and Eθ' from J and J' at x = s·z_a z_b, given by `j` for the product z_a z_b.
fn e_theta_with(
    zi: f64,
    zj: f64,
    ionic: f64,
    s: f64,
    mut j: impl FnMut(f64) -> (f64, f64),
) -> (f64, f64) {
    let (xij, xii, xjj) = (s * zi * zj, s * zi * zi, s * zj * zj);
    let (jij, dij) = j(zi * zj);
    let (jii, dii) = j(zi * zi);
    let (jjj, djj) = j(zj * zj);
    let e = zi * zj / (4.0 * ionic) * (jij - 0.5 * jii - 0.5 * jjj);
    let e_prime = -e / ionic
        + zi * zj / (8.0 * ionic * ionic) * (xij * dij - 0.5 * xii * dii - 0.5 * xjj * djj);
    (e, e_prime)
}

impl Coefficients {
    /// The number of ions.
    pub fn len(&self) -> usize {
        self.z.len()
    }

    /// True for a system of no ions.
    pub fn is_empty(&self) -> bool {
        self.z.is_empty()
    }

    /// The activity of a composition: `molalities` of every ion of the system (mol/kg, in
    /// the order of [`System::ions`]; zero for ions not present). Refused for a negative or
    /// non-finite molality, a solution that is not electrically neutral (within 1e-6 of its
    /// charge), or an ionic strength above the system's.
    pub fn activity(&self, molalities: &[f64]) -> Result<Activity, ScienceError> {
        let mut out = Activity::new(self.len());
        self.checked_activity_into(molalities, &mut out)?;
        Ok(out)
    }

    /// [`Coefficients::activity`] into `out` (its buffer reused).
    pub fn checked_activity_into(
        &self,
        molalities: &[f64],
        out: &mut Activity,
    ) -> Result<(), ScienceError> {
        if molalities.len() != self.len() {
            return Err(ScienceError::OutsideModel(format!(
                "{} molalities given for a system of {} ions",
                molalities.len(),
                self.len()
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
        self.activity_into(molalities, out);
        if out.ionic_strength > self.ionic_strength_max {
            return Err(ScienceError::OutsideModel(format!(
                "ionic strength {:.2} mol/kg is beyond the {:.1} mol/kg the parameter system is answered to",
                out.ionic_strength, self.ionic_strength_max
            )));
        }
        Ok(())
    }

    /// [`Coefficients::activity`] with no checks (the caller keeps to the model's range).
    pub fn activity_unchecked(&self, m: &[f64]) -> Activity {
        let mut out = Activity::new(self.len());
        self.activity_into(m, &mut out);
        out
    }

    /// [`Coefficients::activity_unchecked`] into `out`, allocating nothing (`out` sized to
    /// the system's ions once). One pass over each list of terms: every pair's B, B', B^φ
    /// and C feed F, the osmotic sum and the ln γ of both its ions; every like-signed pair's
    /// Φ, Φ', Φ^φ likewise; every ψ its three ions; J(x) once per product of like charges.
    pub fn activity_into(&self, m: &[f64], out: &mut Activity) {
        let n = self.len();
        let z = &self.z;
        out.ln_gamma.clear();
        out.ln_gamma.resize(n, 0.0);
        let mut ionic = 0.0;
        let mut total = 0.0;
        let mut big_z = 0.0;
        for (m, z) in m.iter().zip(z) {
            ionic += m * z * z;
            total += m;
            big_z += m * z.abs();
        }
        ionic *= 0.5;
        if ionic <= 0.0 {
            out.osmotic = 1.0;
            out.ln_water = 0.0;
            out.ionic_strength = 0.0;
            return;
        }
        let lg = &mut out.ln_gamma;
        let root = ionic.sqrt();
        let a_phi = self.a_phi;
        let mut f = -a_phi * (root / (1.0 + B * root) + 2.0 / B * (1.0 + B * root).ln());
        let mut sum_mc_ma_c = 0.0;
        let mut osm = -a_phi * ionic * root / (1.0 + B * root);
        for p in &self.pairs {
            let (mc, ma) = (m[p.cation], m[p.anion]);
            let (x1, x2) = (p.alpha1 * root, p.alpha2 * root);
            let e1 = (-x1).exp();
            let mut bv = p.beta0 + p.beta1 * g_with(x1, e1);
            let mut bp = p.beta1 * g_prime_with(x1, e1);
            let mut bf = p.beta0 + p.beta1 * e1;
            if p.beta2 != 0.0 && x2 > 0.0 {
                let e2 = (-x2).exp();
                bv += p.beta2 * g_with(x2, e2);
                bp += p.beta2 * g_prime_with(x2, e2);
                bf += p.beta2 * e2;
            }
            let mm = mc * ma;
            f += mm * bp / ionic;
            sum_mc_ma_c += mm * p.c;
            osm += mm * (bf + big_z * p.c);
            let counter = 2.0 * bv + big_z * p.c;
            lg[p.cation] += ma * counter;
            lg[p.anion] += mc * counter;
        }
        // J(x) and J'(x) at x = s·z_i z_j, kept by the product of charges.
        let s = 6.0 * a_phi * root;
        let mut j_cache = [(f64::NAN, 0.0); MAX_CHARGE_PRODUCT + 1];
        let mut j_of = |zz: f64| {
            let k = zz as usize;
            if k > MAX_CHARGE_PRODUCT {
                return harvie_j(s * zz);
            }
            if j_cache[k].0.is_nan() {
                j_cache[k] = harvie_j(s * zz);
            }
            j_cache[k]
        };
        for l in &self.likes {
            let (e, ep) = match l.charges {
                Some((zi, zj)) => e_theta_with(f64::from(zi), f64::from(zj), ionic, s, &mut j_of),
                None => (0.0, 0.0),
            };
            let (mi, mj) = (m[l.i], m[l.j]);
            let phi = l.theta + e;
            let mm = mi * mj;
            f += mm * ep;
            osm += mm * (phi + ionic * ep);
            lg[l.i] += 2.0 * mj * phi;
            lg[l.j] += 2.0 * mi * phi;
        }
        for t in &self.triplets {
            let (mi, mj, mk) = (m[t.i], m[t.j], m[t.k]);
            osm += mi * mj * mk * t.psi;
            lg[t.i] += mj * mk * t.psi;
            lg[t.j] += mi * mk * t.psi;
            lg[t.k] += mi * mj * t.psi;
        }
        for (v, zi) in lg.iter_mut().zip(z) {
            *v += zi * zi * f + zi.abs() * sum_mc_ma_c;
        }
        let osmotic = 1.0 + 2.0 / total * osm;
        out.osmotic = osmotic;
        out.ln_water = -osmotic * total * WATER_KG_PER_MOL;
        out.ionic_strength = ionic;
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::activity::pitzer::test_set;

    fn constant(v: f64) -> TemperatureForm {
        TemperatureForm::Constant(v)
    }

    /// The system of NaCl, MgCl2 and Na2SO4 with every mixing set given.
    fn built(key: &str, sets: &[ParameterSet], mix: &[MixingSet]) -> System {
        let spec = SystemSpec {
            key: key.into(),
            name: key.into(),
            source: "s".into(),
            note: None,
            ionic_strength_max: 20.0,
            sets: vec!["nacl".into(), "mgcl2".into(), "na2so4".into()],
            mixing: mix.iter().map(|m| m.key.clone()).collect(),
        };
        System::build(&spec, sets, mix).unwrap()
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

    /// Harvie, Møller & Weare (1984)'s figures for NaCl, MgCl2 and Na2SO4 (the same as
    /// seed-data/models/pitzer-harvie-moller-weare-1984.toml).
    fn hmw_sets() -> Vec<ParameterSet> {
        vec![
            test_set("nacl", "NaCl", 1, 1, 1, 1, [0.0765, 0.2644, 0.00127]),
            test_set("mgcl2", "MgCl2", 2, 1, 1, 2, [0.35235, 1.6815, 0.00519]),
            test_set("na2so4", "Na2SO4", 1, 2, 2, 1, [0.01958, 1.113, 0.00497]),
        ]
    }

    /// Na–Mg–Cl–SO4: the sets of [`hmw_sets`] and their θ, ψ from the same paper.
    fn system() -> System {
        let sets = hmw_sets();
        let mix = vec![
            mixing("t-mg-na", &["Mg", "Na"], 0.07),
            mixing("p-mg-na-cl", &["Mg", "Na", "Cl"], -0.012),
            mixing("t-cl-so4", &["Cl", "SO4"], 0.02),
            mixing("p-na-cl-so4", &["Na", "Cl", "SO4"], 0.0014),
        ];
        built("test", &sets, &mix)
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
        let nacl = test_set("nacl", "NaCl", 1, 1, 1, 1, [0.0765, 0.2644, 0.00127]);
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

    /// A θ or ψ named twice (in either order of its like ions) counts once, the last one
    /// named holding; the answer written into a used buffer equals a fresh one.
    #[test]
    fn a_parameter_named_twice_counts_once_and_buffers_are_reused() {
        let base = system();
        let sets = hmw_sets();
        let mix = vec![
            mixing("t-mg-na-old", &["Na", "Mg"], 0.5),
            mixing("t-mg-na", &["Mg", "Na"], 0.07),
            mixing("p-mg-na-cl-old", &["Na", "Mg", "Cl"], 0.3),
            mixing("p-mg-na-cl", &["Mg", "Na", "Cl"], -0.012),
            mixing("t-cl-so4", &["Cl", "SO4"], 0.02),
            mixing("p-na-cl-so4", &["Na", "Cl", "SO4"], 0.0014),
        ];
        let twice = built("twice", &sets, &mix);
        let m = molalities(
            &base,
            &[("Na", 2.0), ("Mg", 0.7), ("Cl", 2.4), ("SO4", 0.5)],
        );
        let want = base.at(298.15).unwrap().activity(&m).unwrap();
        let mut c = Coefficients::default();
        let mut out = Activity::new(1);
        // A buffer used first for another composition and temperature.
        twice.evaluate_into(298.15, &mut c);
        c.activity_into(&molalities(&twice, &[("Na", 1.0), ("Cl", 1.0)]), &mut out);
        twice.evaluate_into(298.15, &mut c);
        c.activity_into(&m, &mut out);
        assert_eq!(out.ln_gamma.len(), want.ln_gamma.len());
        for (a, b) in out.ln_gamma.iter().zip(&want.ln_gamma) {
            assert!((a - b).abs() < 1e-14, "{a} {b}");
        }
        assert!((out.osmotic - want.osmotic).abs() < 1e-14);
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
        let sets = vec![test_set(
            "nacl",
            "NaCl",
            1,
            1,
            1,
            1,
            [0.0765, 0.2644, 0.00127],
        )];
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
