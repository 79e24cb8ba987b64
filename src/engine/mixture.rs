//! How the solutes of a mixture are checked for solids: the seam between a recipe's
//! composition and the model that says whether each solute stays dissolved.
//!
//! A [`Mixture`] is the solved composition (mass fractions of every solute, the water left).
//! A [`SolidModel`] answers, for one solute of it, whether it stays dissolved over a range,
//! where it saturates, and where ice appears. Two models: Pitzer's equations for the
//! mixture's salts together ([`crate::engine::pitzer_solids`]), chosen by [`model_for`]
//! when one parameter system holds every ion over the temperatures asked; otherwise
//! [`EachOnItsOwn`]: every solute against its own pure-water solubility curve at its amount
//! per kg of the mixture's water, a salt sharing an ion with another solute also by the
//! ideal common-ion estimate ([`crate::engine::common_ion`]); salting effects are left out.

use crate::answer::{Answer, Basis};
use crate::engine::common::{cite_curve, curve_error, curve_of};
use crate::engine::common_ion::{self, Reading};
use crate::engine::error::EvalError;
use crate::engine::snapshot::Snapshot;
use crate::model::{Solute, SoluteKind};
use crate::query::{Name, Options};
use crate::science::bisect::{Until, try_bisect};
use crate::science::freezing::{DILUTE_IONS, ICE_POINT, KF_WATER, molality, within_dilute_limit};
use crate::science::solve::{self, Crossing, Screening};

/// A solution of several solutes, solved: who is in it and how much.
#[derive(Debug, Clone)]
pub struct Mixture<'a> {
    /// The solutes with the name each was written by (for messages).
    pub solutes: Vec<(&'a Solute, Name)>,
    /// Mass fraction of each solute in the solution, in the order of `solutes`.
    pub ws: Vec<f64>,
}

impl Mixture<'_> {
    /// Mass fraction of water in the solution.
    pub fn water(&self) -> f64 {
        1.0 - self.ws.iter().sum::<f64>()
    }

    /// Grams of solute `index` per gram of the solution's water.
    pub fn per_water(&self, index: usize) -> f64 {
        let water = self.water();
        self.ws.get(index).map_or(0.0, |w| w / water)
    }

    /// The mass fraction solute `index` would have alone in the mixture's water: the
    /// loading its own pure-water curve is read at.
    pub fn alone(&self, index: usize) -> f64 {
        let r = self.per_water(index);
        r / (1.0 + r)
    }

    /// Molality of solute `index`, mol per kg of the solution's water.
    pub fn molality(&self, index: usize) -> f64 {
        self.solutes
            .get(index)
            .map_or(0.0, |(s, _)| molality(self.alone(index), s.molar_mass))
    }
}

/// Where ice appears on cooling a mixture, or why it is not said.
#[derive(Debug, Clone, PartialEq)]
pub enum IceLine {
    /// Ice appears below `t_k`; `how` names the method, for a caveat; `basis` says whether
    /// `t_k` is read from a table or computed.
    At { t_k: f64, how: String, basis: Basis },
    /// Not evaluated, with the reason.
    NotEvaluated(String),
}

/// What a model is asked with: the data, the mixture, the statement's options, and the
/// answer it cites its data in.
pub struct Ask<'q, 'a> {
    pub snap: &'q Snapshot,
    pub mixture: &'q Mixture<'a>,
    pub options: &'q Options,
    pub answer: &'q mut Answer,
}

/// A range of temperature (K) and a margin (a share of the solute-to-water ratio).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Limits {
    pub t1: f64,
    pub t2: f64,
    pub margin: f64,
}

/// The model that checks a mixture's solutes for solids.
pub trait SolidModel {
    /// The caveat every answer resting on this model carries.
    fn caveat(&self) -> String;

    /// Whether solute `index` stays dissolved within the limits; cites the data used.
    fn check(&self, ask: &mut Ask, index: usize, at: Limits) -> Result<Screening, EvalError>;

    /// The temperatures where solute `index` is saturated; cites the data used.
    fn saturation(&self, ask: &mut Ask, index: usize) -> Result<Vec<Crossing>, EvalError>;

    /// Where ice appears on cooling the mixture; cites the data used.
    fn ice_line(&self, ask: &mut Ask) -> IceLine;
}

/// Every solute checked against its own solubility in pure water, at its amount per kg of
/// the mixture's water.
#[derive(Debug, Clone, Copy, Default)]
pub struct EachOnItsOwn;

/// The caveat of [`EachOnItsOwn`].
pub const EACH_ON_ITS_OWN: &str = "each solute checked against its own solubility in pure water, a salt sharing an ion with another solute also by the ideal common-ion estimate (the lower decides); other interactions between solutes not accounted for";

fn entry<'m, 'a>(
    mixture: &'m Mixture<'a>,
    index: usize,
) -> Result<&'m (&'a Solute, Name), EvalError> {
    mixture
        .solutes
        .get(index)
        .ok_or_else(|| EvalError::Unanswerable {
            message: "no such solute in the mixture".into(),
            span: Default::default(),
        })
}

impl SolidModel for EachOnItsOwn {
    fn caveat(&self) -> String {
        EACH_ON_ITS_OWN.to_string()
    }

    /// The solute's own curve over the range; for a salt sharing an ion with another solute,
    /// also the ideal common-ion estimate at every temperature of a scan at most 1 K apart
    /// (and at the own curve's limiting temperature), the lower deciding.
    fn check(&self, ask: &mut Ask, index: usize, at: Limits) -> Result<Screening, EvalError> {
        let (solute, name) = entry(ask.mixture, index)?;
        let built = curve_of(ask.snap, solute, name, ask.options)?;
        let w = ask.mixture.alone(index);
        let extrapolate = ask.options.extrapolate;
        let screening =
            solve::stays_dissolved_with(&built.curve, w, at.t1, at.t2, at.margin, extrapolate)
                .map_err(|e| curve_error(e, solute, name.span))?;
        cite_curve(ask.snap, built, solute, ask.answer);
        let Some(shared) = common_ion::shared(ask.mixture, index) else {
            return Ok(screening);
        };
        let mut worst: Option<(f64, Reading)> = None;
        let mut temperatures = grid(at.t1, at.t2);
        temperatures.push(screening.limiting_t_k);
        for t in temperatures {
            let reading = shared
                .at(&built.curve, t, extrapolate)
                .map_err(|e| curve_error(e, solute, name.span))?;
            if worst.as_ref().is_none_or(|(_, w)| reading.here < w.here) {
                worst = Some((t, reading));
            }
        }
        let Some((t_k, reading)) = worst.filter(|(_, r)| r.estimated) else {
            return Ok(screening);
        };
        ask.answer.caveat(common_ion::METHOD);
        ask.answer
            .caveat(shared.caveat(&solute.name, t_k, &reading));
        let m = ask.mixture.molality(index);
        let r = shared.per_100g(reading.here) / 100.0;
        Ok(Screening {
            holds: reading.here >= m * (1.0 + at.margin),
            limiting_t_k: t_k,
            phase: reading.phase,
            limiting_mass_fraction: r / (1.0 + r),
            headroom_pct: (reading.here / m - 1.0) * 100.0,
            basis: reading.basis,
        })
    }

    /// The solute's own crossings; for a salt sharing an ion with another solute, where the
    /// lower of its own curve and the common-ion estimate crosses its amount (a scan at most
    /// 1 K apart over the curve's range, each crossing bisected to 1e-4 K).
    fn saturation(&self, ask: &mut Ask, index: usize) -> Result<Vec<Crossing>, EvalError> {
        let (solute, name) = entry(ask.mixture, index)?;
        let built = curve_of(ask.snap, solute, name, ask.options)?;
        let w = ask.mixture.alone(index);
        if w == 0.0 {
            return Ok(Vec::new());
        }
        if let Some(shared) = common_ion::shared(ask.mixture, index) {
            let m = ask.mixture.molality(index);
            let crossings = common_ion_crossings(&shared, &built.curve, m, ask.options.extrapolate)
                .map_err(|e| curve_error(e, solute, name.span))?;
            ask.answer.caveat(common_ion::METHOD);
            ask.answer.caveat(format!(
                "{} shares {} with other solutes of the recipe: its saturation temperatures are where the lower of its own curve and the common-ion estimate meets its amount",
                solute.name,
                shared.ions.join(" and ")
            ));
            cite_curve(ask.snap, built, solute, ask.answer);
            return Ok(crossings);
        }
        let crossings =
            solve::saturation_temperatures_with(&built.curve, w, ask.options.extrapolate)
                .map_err(|e| curve_error(e, solute, name.span))?;
        cite_curve(ask.snap, built, solute, ask.answer);
        Ok(crossings)
    }

    /// The ideal dilute estimate ([`EachOnItsOwn::ideal_ice_line`]); beyond the dilute
    /// limit, a mixture of one solute gets that solute's own ice line (its freezing data,
    /// [`crate::engine::freezing::ice_line_alone`]), a mixture of several the ice line of
    /// the solutes' own freezing points by the Zdanovskii–Stokes–Robinson rule
    /// ([`crate::engine::mixture_ice::ice_line`]).
    fn ice_line(&self, ask: &mut Ask) -> IceLine {
        let ideal = EachOnItsOwn::ideal_ice_line(ask.mixture);
        let mixture = ask.mixture;
        let IceLine::NotEvaluated(dilute) = &ideal else {
            return ideal;
        };
        let [(_, name)] = mixture.solutes.as_slice() else {
            return match crate::engine::mixture_ice::ice_line(ask) {
                IceLine::NotEvaluated(why) => IceLine::NotEvaluated(format!("{dilute}; {why}")),
                found => found,
            };
        };
        match crate::engine::freezing::ice_line_alone(ask, 0) {
            Ok((t_k, basis)) => IceLine::At {
                t_k,
                basis,
                how: format!(
                    "the only solute, {}, beyond the ideal dilute limit: ice line from its own freezing data at its loading",
                    name.text
                ),
            },
            // One solute: its own reason is the whole reason (the dilute limit's sentence
            // speaks of mixtures).
            Err(alone) => {
                IceLine::NotEvaluated(format!("{} is the only solute: {alone}", name.text))
            }
        }
    }
}

/// Temperatures from `t1` to `t2` (K), at most 1 K apart, both ends included.
pub fn grid(t1: f64, t2: f64) -> Vec<f64> {
    let n = ((t2 - t1).abs().ceil() as usize).clamp(1, 400);
    (0..=n)
        .map(|k| t1 + (t2 - t1) * k as f64 / n as f64)
        .collect()
}

/// Where a salt's solubility in the recipe (the lower of its own curve and the common-ion
/// estimate) crosses its amount `m` (mol/kg water), over the data's range.
fn common_ion_crossings(
    shared: &common_ion::Shared,
    curve: &crate::science::curve::Curve,
    m: f64,
    extrapolate: bool,
) -> Result<Vec<Crossing>, crate::science::ScienceError> {
    // As for a solute alone (`solve::saturation_temperatures_with`): the data's range is
    // searched, through gaps between branches on their end tangents (as `Curve::evaluate`
    // reads them when extrapolating), and a crossing in a gap is kept only with
    // `extrapolate`.
    let (lo, hi) = curve.temperature_range();
    let over = |t: f64| shared.at(curve, t, true).map(|r| m > r.here);
    let ts = grid(lo, hi);
    let mut out = Vec::new();
    let mut prev = (ts[0], over(ts[0])?);
    for &t in &ts[1..] {
        let now = over(t)?;
        if now != prev.1 {
            let below = prev.1;
            let t_k = try_bisect(prev.0, t, Until::Width(1e-4), |x| {
                over(x).map(|o| o == below)
            })?
            .mid();
            if !extrapolate && !curve.covers(t_k) {
                prev = (t, now);
                continue;
            }
            let reading = shared.at(curve, t_k, true)?;
            out.push(Crossing {
                t_k,
                phase: reading.phase,
                rising: below,
                basis: reading.basis,
            });
        }
        prev = (t, now);
    }
    Ok(out)
}

/// Particles per formula unit as a freezing point counts them: a salt its ions (full
/// dissociation), any other solute one.
pub fn particles_per_unit(solute: &Solute) -> u32 {
    match solute.kind {
        SoluteKind::Salt => solute.ions.max(1),
        _ => 1,
    }
}

/// Dissolved particles of a mixture, mol/kg of its water: Σ iₖ·mₖ.
fn particles(mixture: &Mixture) -> f64 {
    (0..mixture.solutes.len())
        .map(|i| f64::from(particles_per_unit(mixture.solutes[i].0)) * mixture.molality(i))
        .sum()
}

impl EachOnItsOwn {
    /// The ideal dilute estimate, ΔT = K_f·Σ iₖ·mₖ (van 't Hoff), only while the solution
    /// holds at most [`DILUTE_IONS`] mol/kg of dissolved particles; beyond that the ice
    /// line of a mixture is read from its solutes' own freezing points
    /// ([`crate::engine::mixture_ice`]).
    pub fn ideal_ice_line(mixture: &Mixture) -> IceLine {
        let particles = particles(mixture);
        if within_dilute_limit(particles) {
            IceLine::At {
                t_k: ICE_POINT - KF_WATER * particles,
                basis: Basis::Computed,
                how: format!(
                    "ice line estimated for an ideal dilute solution (ΔT = K_f·Σ i·m, K_f = {KF_WATER} K·kg/mol, {} mol/kg of dissolved particles)",
                    crate::number::round_significant(particles, 3)
                ),
            }
        } else {
            IceLine::NotEvaluated(format!(
                "the solution holds {} mol/kg of dissolved particles, beyond the ideal dilute limit ({DILUTE_IONS} mol/kg)",
                crate::number::round_significant(particles, 3)
            ))
        }
    }
}

/// The model chosen for a mixture, and why the mixture model was not, when it was not.
pub struct Chosen<'s> {
    pub model: Box<dyn SolidModel + 's>,
    pub note: Option<String>,
}

/// The model for a mixture over `range` (K; `None`: wherever it holds): Pitzer's equations
/// ([`PitzerSolids`](crate::engine::pitzer_solids::PitzerSolids)) when one parameter system
/// holds every ion of the mixture there (or beyond, with `extrapolate`), else
/// [`EachOnItsOwn`] with the reason.
pub fn model_for<'s>(
    snap: &'s Snapshot,
    mixture: &Mixture,
    range: Option<(f64, f64)>,
    extrapolate: bool,
) -> Chosen<'s> {
    match crate::engine::pitzer_solids::choose(snap, mixture, range, extrapolate) {
        Ok(model) => Chosen {
            model: Box::new(model),
            note: None,
        },
        Err(note) => Chosen {
            model: Box::new(EachOnItsOwn),
            note,
        },
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn solute(formula: &str, molar_mass: f64, ions: u32) -> Solute {
        Solute::salt_for_tests(formula, molar_mass, ions)
    }

    #[test]
    fn each_solute_is_read_per_kg_of_the_mixtures_water() {
        let (a, b) = (solute("NaCl", 58.44, 2), solute("KCl", 74.55, 2));
        let name = Name {
            text: String::new(),
            span: Default::default(),
        };
        // By hand: 10 % A and 20 % B leave 70 % water; A alone in that water is
        // 10/(10+70) = 0.125 by mass.
        let m = Mixture {
            solutes: vec![(&a, name.clone()), (&b, name)],
            ws: vec![0.1, 0.2],
        };
        assert!((m.water() - 0.7).abs() < 1e-15);
        assert!((m.alone(0) - 0.125).abs() < 1e-15);
        assert!((m.per_water(1) - 0.2 / 0.7).abs() < 1e-15);
        // Far beyond the dilute limit: no ideal ice line is claimed.
        assert!(matches!(
            EachOnItsOwn::ideal_ice_line(&m),
            IceLine::NotEvaluated(_)
        ));
    }

    #[test]
    fn a_dilute_mixture_gets_the_ideal_ice_line() {
        let a = solute("NaCl", 58.44, 2);
        let name = Name {
            text: String::new(),
            span: Default::default(),
        };
        // 0.05 mol/kg NaCl: 0.1 mol/kg of ions, ΔT = 0.186 K.
        let r = 0.05 * 58.44 / 1000.0;
        let m = Mixture {
            solutes: vec![(&a, name)],
            ws: vec![r / (1.0 + r)],
        };
        let IceLine::At { t_k, .. } = EachOnItsOwn::ideal_ice_line(&m) else {
            panic!("dilute")
        };
        assert!((ICE_POINT - t_k - 0.186).abs() < 1e-9);
    }
}
