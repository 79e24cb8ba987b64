//! Activity of water in electrolyte solutions: the Debye–Hückel limiting slope A_φ(T), the
//! Pitzer osmotic coefficient of a single electrolyte with its parameters' temperature
//! dependence ([`pitzer`]), and the ice–water equilibrium that turns a water activity into
//! a freezing point ([`ice`]). Parameter sets are data ([`ParameterSet`]), read from
//! `seed-data/models/`; this module only computes.
//!
//! Units: temperatures in K, molality in mol/kg water.

pub mod debye_huckel;
pub mod ice;
pub mod pitzer;
pub mod relative_enthalpy;

pub use pitzer::{ParameterSet, TemperatureForm, osmotic_coefficient, water_activity};
