//! Activity of water in electrolyte solutions: the Debye–Hückel limiting slope A_φ(T), the
//! Pitzer osmotic coefficient of a single electrolyte with its parameters' temperature
//! dependence ([`pitzer`]), and the ice–water equilibrium that turns a water activity into
//! a freezing point ([`ice`]); Pitzer's equations for mixtures of electrolytes, with mixing
//! parameters θ and ψ and the unsymmetrical terms ([`mixture`], ions by symbol in
//! [`ions`]), and a salt's saturation in a mixture from its own solubility ([`saturation`]), and the
//! freeze concentration of a mixture at one temperature ([`freeze`]). Parameter sets are data ([`ParameterSet`], [`MixingSet`], [`SystemSpec`]),
//! read from `seed-data/models/`; this module only computes.
//!
//! Units: temperatures in K, molality in mol/kg water.

pub mod debye_huckel;
pub mod freeze;
pub mod ice;
pub mod ions;
pub mod mixture;
pub mod pitzer;
pub mod relative_enthalpy;
pub mod saturation;

pub use mixture::{Activity, Coefficients, MixingSet, System, SystemSpec};
pub use pitzer::{ParameterSet, TemperatureForm, osmotic_coefficient, water_activity};

/// The seed's Pitzer system with this key, for tests.
#[cfg(test)]
pub(crate) fn seed_system(key: &str) -> System {
    crate::store::models::mixture_systems(crate::seed_files::SEED_FILES)
        .unwrap()
        .into_iter()
        .find(|s| s.key == key)
        .unwrap()
}
