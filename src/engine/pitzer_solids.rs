//! The mixture model for recipes of salts: Pitzer's equations for the recipe's liquid, and
//! each salt's solubility product K(T) from the reference's own pure-water curve.
//!
//! For the solid a solute's curve names at T (hydrates included), ln K(T) is the ion
//! activity product Π(m·γ)^ν · a_w^n where the salt alone saturates pure water
//! ([`Solid::ln_k_from_solubility`]); in the recipe's liquid the saturation ratio
//! ln Ω = ln IAP − ln K says whether it crystallises, and the salt's solubility in that
//! liquid (the other solutes as they are) is the molality where ln Ω reaches 0. Common-ion
//! and salting effects follow from the same data the single-salt answers use.
//!
//! The model is chosen ([`choose`]) only when one parameter system holds every ion of the
//! recipe over the temperatures asked (or `extrapolate` is given, and the answer says the
//! model is used beyond its range); otherwise the caller falls back to each solute on its
//! own and says why. It is general over the system's ions: any electrolyte whose ions a
//! system holds enters it the same way.

use crate::engine::common::{celsius, cite_curve, cite_source, curve_error, curve_of};
use crate::engine::error::EvalError;
use crate::engine::mixture::{Ask, IceLine, Limits, Mixture, SolidModel, grid};
use crate::engine::snapshot::Snapshot;
use crate::model::SoluteKind;
use crate::science::ScienceError;
use crate::science::activity::debye_huckel::A_PHI_RANGE_K;
use crate::science::activity::ice::ln_water_activity_of_ice;
use crate::science::activity::ions::electrolyte;
use crate::science::activity::saturation::Solid;
use crate::science::activity::{Coefficients, System};
use crate::science::bisect::{Until, try_bisect};
use crate::science::curve::Basis;
use crate::science::formula::parse_formula;
use crate::science::freezing::{ICE_POINT, molality};
use crate::science::solve::{Crossing, Screening};

/// A recipe's salts in one Pitzer system.
#[derive(Debug, Clone)]
pub struct PitzerSolids<'s> {
    pub system: &'s System,
    /// Each solute's electrolyte in the system's ions (anhydrous), in the mixture's order.
    pub salts: Vec<Solid>,
    /// Molality of every ion of the system in the recipe's liquid, mol/kg water.
    pub ions: Vec<f64>,
    /// True when the model is used beyond the system's published temperatures (asked for).
    pub extrapolate: bool,
}

/// Why the mixture model was not used, for a caveat (`None` when the recipe has no salt
/// any system knows, where the model has nothing to say).
pub type NotChosen = Option<String>;

fn names(list: &[String]) -> String {
    list.join(", ")
}

/// The system for `mixture` over `range` (K; `None`: any), or why there is none.
pub fn choose<'s>(
    snap: &'s Snapshot,
    mixture: &Mixture,
    range: Option<(f64, f64)>,
    extrapolate: bool,
) -> Result<PitzerSolids<'s>, NotChosen> {
    let systems = snap.systems();
    let mut uncovered = Vec::new();
    let mut read = Vec::new();
    for (solute, _) in &mixture.solutes {
        let e = (solute.kind == SoluteKind::Salt)
            .then(|| electrolyte(&solute.formula))
            .flatten()
            .filter(|e| {
                systems
                    .iter()
                    .any(|s| s.index(e.cation).is_some() && s.index(e.anion).is_some())
            });
        match e {
            Some(_) => read.push(solute.formula.clone()),
            None => uncovered.push(solute.name.clone()),
        }
    }
    if read.is_empty() {
        return Err(None);
    }
    if !uncovered.is_empty() {
        return Err(Some(format!(
            "Pitzer's equations for mixtures not used: no parameter system covers {} (a salt whose ions no system holds, or not a salt); every solute checked on its own",
            names(&uncovered)
        )));
    }
    let mut candidates: Vec<&System> = systems
        .iter()
        .filter(|s| {
            mixture
                .solutes
                .iter()
                .all(|(solute, _)| Solid::of(s, &solute.formula, 0).is_some())
        })
        .collect();
    if candidates.is_empty() {
        return Err(Some(format!(
            "Pitzer's equations for mixtures not used: no one parameter system holds every ion of {}; every solute checked on its own",
            names(&read)
        )));
    }
    // The widest range first.
    candidates.sort_by(|a, b| (b.t_max_k - b.t_min_k).total_cmp(&(a.t_max_k - a.t_min_k)));
    // Asked for no range (a saturation temperature is searched over the data), a system of
    // one temperature cannot serve: no temperature can be searched in it.
    let within = |s: &System| match range {
        Some((t1, t2)) => s.covers(t1) && s.covers(t2),
        None => s.t_max_k - s.t_min_k >= 1.0,
    };
    let in_a_phi = |(t1, t2): (f64, f64)| in_a_phi_range(t1) && in_a_phi_range(t2);
    let (system, beyond) = match candidates.iter().find(|s| within(s)) {
        Some(s) => (*s, false),
        None if extrapolate && range.is_none_or(in_a_phi) => (candidates[0], true),
        None if range.is_none() => {
            let s = candidates[0];
            return Err(Some(format!(
                "Pitzer's equations for mixtures not used: the parameter system {} holds at {} C only, where no saturation temperature can be searched; every solute checked on its own (add `extrapolate` to use the model beyond its range)",
                s.name,
                celsius(s.t_min_k)
            )));
        }
        None => {
            let s = candidates[0];
            return Err(Some(format!(
                "Pitzer's equations for mixtures not used: the parameter system {} holds from {} C to {} C, not over the whole range asked; every solute checked on its own (add `extrapolate` to use the model beyond its range)",
                s.name,
                celsius(s.t_min_k),
                celsius(s.t_max_k)
            )));
        }
    };
    let salts: Vec<Solid> = mixture
        .solutes
        .iter()
        .filter_map(|(solute, _)| Solid::of(system, &solute.formula, 0))
        .collect();
    let mut ions = vec![0.0; system.ions.len()];
    for (index, salt) in salts.iter().enumerate() {
        salt.add(&mut ions, mixture.molality(index));
    }
    Ok(PitzerSolids {
        system,
        salts,
        ions,
        extrapolate: beyond,
    })
}

/// True inside A_φ's range (0.01 K leeway, as [`System::covers`]).
fn in_a_phi_range(t_k: f64) -> bool {
    t_k >= A_PHI_RANGE_K.0 - 0.01 && t_k <= A_PHI_RANGE_K.1 + 0.01
}

/// A solid's solubility product at one temperature, from its solute's curve.
pub struct Product {
    pub solid: Solid,
    pub ln_k: f64,
    pub phase: String,
    pub basis: Basis,
}

/// Ionic strength of `molalities` in `system`'s ions.
fn ionic_strength(system: &System, molalities: &[f64]) -> f64 {
    0.5 * system
        .ions
        .iter()
        .zip(molalities)
        .map(|((_, z), m)| m * f64::from(z * z))
        .sum::<f64>()
}

fn unanswerable(message: String) -> EvalError {
    EvalError::Unanswerable {
        message,
        span: Default::default(),
    }
}

impl PitzerSolids<'_> {
    /// The system's parameters at `t_k`: inside its range, or beyond it when the model is
    /// extrapolated (never beyond A_φ's own range).
    pub fn coefficients(&self, t_k: f64) -> Result<Coefficients, String> {
        if self.system.covers(t_k) {
            return self.system.at(t_k).map_err(|e| e.to_string());
        }
        if self.extrapolate && in_a_phi_range(t_k) {
            return Ok(self.system.at_unchecked(t_k));
        }
        Err(format!(
            "{} C is outside the Pitzer system {} ({} C to {} C)",
            celsius(t_k),
            self.system.name,
            celsius(self.system.t_min_k),
            celsius(self.system.t_max_k)
        ))
    }

    /// The lowest and highest temperature the model answers at, K.
    pub fn span_k(&self) -> (f64, f64) {
        if self.extrapolate {
            A_PHI_RANGE_K
        } else {
            (self.system.t_min_k, self.system.t_max_k)
        }
    }

    /// The solubility product of solute `index`'s solid at `t_k` (the phase its curve
    /// names there), from its solubility in pure water.
    pub fn product(
        &self,
        ask: &Ask,
        index: usize,
        t_k: f64,
        c: &Coefficients,
    ) -> Result<Product, EvalError> {
        let (solute, name) = entry(ask.mixture, index)?;
        let built = curve_of(ask.snap, solute, name, ask.options)?;
        let e = built
            .curve
            .evaluate(t_k, ask.options.extrapolate)
            .map_err(|e| curve_error(e, solute, name.span))?;
        let waters = parse_formula(&e.phase).map_or(0.0, |f| f.hydrate_water());
        let salt = self
            .salts
            .get(index)
            .copied()
            .ok_or_else(|| unanswerable("no such solute in the mixture".into()))?;
        let solid = Solid { waters, ..salt };
        let m_sat = molality(e.mass_fraction, solute.molar_mass);
        let ln_k = solid.ln_k_from_solubility(c, m_sat).map_err(|e| {
            unanswerable(format!(
                "{}: no solubility product at {} C from its solubility in pure water: {e}",
                solute.name,
                celsius(t_k)
            ))
        })?;
        let basis = if self.system.covers(t_k) {
            e.basis
        } else {
            Basis::Extrapolated
        };
        Ok(Product {
            solid,
            ln_k,
            phase: e.phase,
            basis,
        })
    }

    /// ln Ω of solute `index`'s solid in the recipe's liquid at `t_k`.
    fn ln_omega(&self, ask: &Ask, index: usize, t_k: f64) -> Result<(f64, Product), EvalError> {
        let c = self.coefficients(t_k).map_err(unanswerable)?;
        let p = self.product(ask, index, t_k, &c)?;
        let a = c
            .activity(&self.ions)
            .map_err(|e| unanswerable(format!("the recipe's liquid: {e}")))?;
        Ok((p.solid.ln_ion_activity_product(&self.ions, &a) - p.ln_k, p))
    }

    /// Solute `index`'s solubility (mol/kg water) in the recipe's liquid at `t_k`, the other
    /// solutes as they are; true with it when the salt does not saturate within the
    /// system's ionic-strength limit (the figure is then that limit, a lower bound).
    fn solubility(&self, ask: &Ask, index: usize, t_k: f64) -> Result<(f64, bool), EvalError> {
        let c = self.coefficients(t_k).map_err(unanswerable)?;
        let p = self.product(ask, index, t_k, &c)?;
        let mut background = self.ions.clone();
        p.solid.add(&mut background, -ask.mixture.molality(index));
        for m in &mut background {
            *m = m.max(0.0);
        }
        let per_mol = ionic_strength(self.system, &p.solid.alone(background.len(), 1.0));
        let room = self.system.ionic_strength_max - ionic_strength(self.system, &background);
        // Just inside the limit, so rounding never steps over it.
        let m_max = room / per_mol * (1.0 - 1e-9);
        match p.solid.solubility_in(&c, &background, p.ln_k, m_max) {
            Ok(m) => Ok((m, false)),
            // Still below saturation at the system's ionic-strength limit: the solubility
            // is at least that much (a lower bound, said in a caveat).
            Err(ScienceError::OutsideModel(_)) if m_max > 0.0 => Ok((m_max, true)),
            Err(e) => Err(unanswerable(format!(
                "{}: its solubility in the recipe's liquid at {} C: {e}",
                ask.mixture.solutes[index].0.name,
                celsius(t_k)
            ))),
        }
    }

    /// Cites solute `index`'s curve and the system's sources.
    pub fn cite(&self, ask: &mut Ask, index: usize) -> Result<(), EvalError> {
        let (solute, name) = entry(ask.mixture, index)?;
        let built = curve_of(ask.snap, solute, name, ask.options)?;
        cite_curve(ask.snap, built, solute, ask.answer);
        for source in &self.system.sources {
            cite_source(ask.snap, source, ask.answer);
        }
        Ok(())
    }
}

fn entry<'m, 'a>(
    mixture: &'m Mixture<'a>,
    index: usize,
) -> Result<&'m (&'a crate::model::Solute, crate::query::Name), EvalError> {
    mixture
        .solutes
        .get(index)
        .ok_or_else(|| unanswerable("no such solute in the mixture".into()))
}

impl SolidModel for PitzerSolids<'_> {
    fn caveat(&self) -> String {
        let beyond = if self.extrapolate {
            format!(
                "; used beyond the system's published range ({} C to {} C), as asked with `extrapolate`",
                celsius(self.system.t_min_k),
                celsius(self.system.t_max_k)
            )
        } else {
            String::new()
        };
        format!(
            "salts checked together by Pitzer's equations for mixtures ({}){beyond}: each salt's solubility product from its own solubility in pure water, its solubility here with the other solutes as they are",
            self.system.name
        )
    }

    /// Scans ln Ω over the range (at most 1 K apart); the salt's solubility in the recipe's
    /// liquid where ln Ω is highest decides.
    fn check(&self, ask: &mut Ask, index: usize, at: Limits) -> Result<Screening, EvalError> {
        let m = ask.mixture.molality(index);
        let mut worst: Option<(f64, f64)> = None;
        for t in grid(at.t1, at.t2) {
            let (ln_omega, _) = self.ln_omega(ask, index, t)?;
            if worst.is_none_or(|(w, _)| ln_omega > w) {
                worst = Some((ln_omega, t));
            }
        }
        let (_, t_k) = worst.ok_or_else(|| unanswerable("an empty range".into()))?;
        let (solubility, at_least) = self.solubility(ask, index, t_k)?;
        let c = self.coefficients(t_k).map_err(unanswerable)?;
        let p = self.product(ask, index, t_k, &c)?;
        let solute = ask.mixture.solutes[index].0;
        let r = solubility * solute.molar_mass / 1000.0;
        self.cite(ask, index)?;
        if at_least {
            ask.answer.caveat(format!(
                "{}: does not saturate within the ionic strength the Pitzer system is answered to ({} mol/kg); its solubility shown is a lower bound for that solid phase",
                solute.name, self.system.ionic_strength_max
            ));
        }
        Ok(Screening {
            holds: solubility >= m * (1.0 + at.margin),
            limiting_t_k: t_k,
            phase: p.phase,
            limiting_mass_fraction: r / (1.0 + r),
            headroom_pct: (solubility / m - 1.0) * 100.0,
            basis: p.basis,
        })
    }

    /// Where ln Ω crosses 0 within the model's and the curve's temperatures: a scan at most
    /// 1 K apart, each crossing bisected to 1e-4 K.
    fn saturation(&self, ask: &mut Ask, index: usize) -> Result<Vec<Crossing>, EvalError> {
        if ask.mixture.molality(index) == 0.0 {
            return Ok(Vec::new());
        }
        let (solute, name) = entry(ask.mixture, index)?;
        let built = curve_of(ask.snap, solute, name, ask.options)?;
        let (c_lo, c_hi) = if ask.options.extrapolate {
            built.curve.extrapolation_window()
        } else {
            built.curve.temperature_range()
        };
        let (m_lo, m_hi) = self.span_k();
        let (lo, hi) = (c_lo.max(m_lo), c_hi.min(m_hi));
        if lo > c_lo + 0.01 || hi < c_hi - 0.01 {
            ask.answer.caveat(format!(
                "{}: saturation searched only from {} C to {} C, where both its data and the parameter system {} can be used{}",
                solute.name,
                celsius(lo),
                celsius(hi.max(lo)),
                self.system.name,
                if self.extrapolate {
                    " (beyond its published range, as asked)"
                } else {
                    ""
                }
            ));
        }
        let mut out = Vec::new();
        if lo >= hi {
            self.cite(ask, index)?;
            return Ok(out);
        }
        let f = |t: f64| self.ln_omega(ask, index, t).map(|(v, _)| v);
        let ts = grid(lo, hi);
        let mut prev = (ts[0], f(ts[0])?);
        for &t in &ts[1..] {
            // Where the model cannot be had any more (a salt's saturated solution beyond the
            // ionic strength the system is answered to), the search stops there and says so.
            let v = match f(t) {
                Ok(v) => v,
                Err(e) => {
                    let why = e.to_string();
                    let prefix = format!("{}: ", solute.name);
                    ask.answer.caveat(format!(
                        "{}: saturation searched only up to {} C; beyond, {}",
                        solute.name,
                        celsius(prev.0),
                        why.strip_prefix(&prefix).unwrap_or(&why)
                    ));
                    break;
                }
            };
            if (prev.1 > 0.0) != (v > 0.0) {
                let fa_positive = prev.1 > 0.0;
                let t_k = try_bisect(prev.0, t, Until::Width(1e-4), |m| {
                    f(m).map(|v| (v > 0.0) == fa_positive)
                })?
                .mid();
                let (_, p) = self.ln_omega(ask, index, t_k)?;
                out.push(Crossing {
                    t_k,
                    phase: p.phase,
                    rising: fa_positive,
                    basis: p.basis,
                });
            }
            prev = (t, v);
        }
        self.cite(ask, index)?;
        Ok(out)
    }

    /// Where the liquid's water activity equals that of water over ice, scanning down from
    /// 0 °C at most 0.5 K apart and bisecting to 1e-4 K.
    fn ice_line(&self, _ask: &mut Ask) -> IceLine {
        match ice_line_of(self, &self.ions) {
            Ok(t_k) => IceLine::At {
                t_k,
                basis: Basis::Computed,
                how: format!(
                    "ice line from the water activity of the whole mixture by Pitzer's equations ({}) and the ice–water equilibrium",
                    self.system.name
                ),
            },
            Err(why) => IceLine::NotEvaluated(why),
        }
    }
}

/// The temperature (K) where a liquid of `ions` (mol/kg) starts to freeze, or why it is not
/// said.
pub fn ice_line_of(model: &PitzerSolids, ions: &[f64]) -> Result<f64, String> {
    let (lo, _) = model.span_k();
    let g = |t: f64| -> Result<f64, String> {
        let c = model.coefficients(t)?;
        let a = c.activity(ions).map_err(|e| e.to_string())?;
        Ok(a.ln_water - ln_water_activity_of_ice(t))
    };
    if lo >= ICE_POINT {
        return Err(format!(
            "the Pitzer system {} holds from {} C up, above this mixture's ice line",
            model.system.name,
            celsius(lo)
        ));
    }
    let ts = grid(ICE_POINT, lo.max(A_PHI_RANGE_K.0));
    let fine: Vec<f64> = ts
        .windows(2)
        .flat_map(|w| [w[0], 0.5 * (w[0] + w[1])])
        .chain(ts.last().copied())
        .collect();
    let mut prev = (ICE_POINT, g(ICE_POINT)?);
    for &t in &fine[1..] {
        let v = g(t)?;
        if v >= 0.0 {
            let bracket = try_bisect(t, prev.0, Until::Width(1e-4), |m| g(m).map(|v| v >= 0.0))?;
            return Ok(bracket.mid());
        }
        prev = (t, v);
    }
    Err(format!(
        "the ice line lies below {} C, the lowest temperature of the Pitzer system {}",
        celsius(lo),
        model.system.name
    ))
}
