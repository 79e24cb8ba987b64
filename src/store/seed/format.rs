//! The TOML shapes of the seed files, as written in seed-data/README.md. Unknown fields are
//! refused so a misspelt field is reported rather than silently dropped.

use serde::Deserialize;

use crate::model::{Provenance, Review, SoluteKind, SourceKind};

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct SourcesFile {
    #[serde(default)]
    pub(super) source: Vec<RawSource>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawSource {
    pub(super) key: String,
    pub(super) kind: SourceKind,
    pub(super) title: String,
    pub(super) authors: String,
    pub(super) publisher: Option<String>,
    pub(super) edition: Option<String>,
    pub(super) year: Option<i32>,
    pub(super) locator: Option<String>,
    pub(super) doi: Option<String>,
    pub(super) isbn: Option<String>,
    pub(super) url: Option<String>,
    pub(super) note: Option<String>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawSolute {
    pub(super) id: String,
    pub(super) name: String,
    pub(super) formula: String,
    pub(super) kind: SoluteKind,
    #[serde(default)]
    pub(super) synonyms: Vec<String>,
    #[serde(default)]
    pub(super) tags: Vec<String>,
    pub(super) cation: Option<String>,
    pub(super) anion: Option<String>,
    pub(super) ions: Option<u32>,
    pub(super) hazard: Option<String>,
    #[serde(default)]
    pub(super) dataset: Vec<RawDataset>,
    #[serde(default)]
    pub(super) henry: Vec<RawHenry>,
    pub(super) freezing: Option<RawFreezing>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawDataset {
    pub(super) key: String,
    pub(super) source: String,
    pub(super) phase: String,
    pub(super) phase_name: String,
    pub(super) unit: String,
    pub(super) temperature_unit: String,
    pub(super) provenance: Provenance,
    pub(super) review: Review,
    pub(super) note: Option<String>,
    pub(super) points: Vec<toml::Value>,
    pub(super) stable_range: Option<toml::Value>,
    /// Written by `satline export` for a retired dataset; absent means not retired.
    #[serde(default)]
    pub(super) retired: bool,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawHenry {
    pub(super) key: String,
    pub(super) source: String,
    pub(super) provenance: Provenance,
    pub(super) review: Review,
    pub(super) form: String,
    pub(super) note: Option<String>,
    pub(super) convention: Option<String>,
    pub(super) value: Option<f64>,
    pub(super) reference_temperature_k: Option<f64>,
    pub(super) temperature_term_k: Option<f64>,
    pub(super) a: Option<f64>,
    pub(super) b: Option<f64>,
    pub(super) c: Option<f64>,
    pub(super) d: Option<f64>,
    pub(super) scale_k: Option<f64>,
    pub(super) reference_pressure_pa: Option<f64>,
    pub(super) t_min_k: Option<f64>,
    pub(super) t_max_k: Option<f64>,
}

#[derive(Deserialize)]
#[serde(deny_unknown_fields)]
pub(super) struct RawFreezing {
    pub(super) key: String,
    pub(super) source: String,
    pub(super) provenance: Provenance,
    pub(super) review: Review,
    pub(super) unit: String,
    pub(super) temperature_unit: String,
    pub(super) points: Vec<toml::Value>,
    pub(super) eutectic: Option<toml::Value>,
    pub(super) note: Option<String>,
}
