//! The engine's snapshot: the catalog plus, for every solid solute, its solubility curve
//! built once from its datasets (all data, and reviewed data only), so statements never
//! rebuild an interpolant.

use std::collections::HashMap;
use std::sync::{Arc, OnceLock};

use crate::answer::screened::ScreenNames;
use crate::catalog::Catalog;
use crate::engine::common::Citing;
use crate::model::{Dataset, Provenance, Review};
use crate::science::acid_base::{AcidSystem, BufferForm};
use crate::science::activity::{ParameterSet, System};
use crate::science::curve::{Branch, Curve};
use crate::science::salting_out::Sechenov;

use super::flat_curves::{FlatCurves, ScreenedSolute};

/// A curve and the datasets it was built from (indices into `Catalog::datasets`).
#[derive(Debug, Clone)]
pub struct BuiltCurve {
    pub curve: Curve,
    pub datasets: Vec<usize>,
    /// Whether any of `datasets` is typed from memory, or unreviewed: kept here so that a
    /// screening of many solutes reads no dataset to count them.
    pub from_memory: bool,
    pub unreviewed: bool,
    /// The source every one of `datasets` cites, when they all cite one (its position in
    /// `Catalog::sources`).
    pub one_source: Option<usize>,
    /// What citing the curve adds to an answer, made the first time it is cited (see
    /// `common::cite_curve`): the same for every statement, so it is formatted once.
    pub(super) citing: OnceLock<Citing>,
}

/// The curves of one solute.
#[derive(Debug, Clone, Default)]
pub struct SoluteCurves {
    /// From every dataset that is not retired or rejected.
    pub all: Option<BuiltCurve>,
    /// From reviewed datasets only.
    pub reviewed: Option<BuiltCurve>,
}

/// The catalog with curves ready to evaluate.
#[derive(Debug)]
pub struct Snapshot {
    pub catalog: Catalog,
    /// The curves of each solute, in the order of `Catalog::solutes` (a screening walks
    /// them side by side without hashing ids).
    curves: Vec<SoluteCurves>,
    /// The curves of one branch copied into flat arrays, in the order of `curves`.
    flat: FlatCurves,
    /// The names a screening's compact rows refer to (solutes and their curves' phases).
    screen_names: Arc<ScreenNames>,
    /// Each source's citation, in the order of `Catalog::sources`, formatted once.
    citations: Vec<String>,
    /// Solute id → index into `curves`.
    curve_index: HashMap<String, usize>,
    /// Every name a person may type for a solute (names, ids, formulas, synonyms), sorted.
    names: Vec<String>,
    /// The activity model's parameter sets (`seed-data/models/`), compiled in.
    models: Vec<ParameterSet>,
    /// The mixture model's systems (sets and mixing parameters fitted together), compiled in.
    systems: Vec<System>,
    /// The acid-base records of buffers (`[[acid]]` in `seed-data/models/`), compiled in.
    acids: Vec<AcidSystem>,
    /// The Sechenov parameters of ions and gases (`[[salting_ion]]`, `[[salting_gas]]`),
    /// compiled in.
    salting: (Vec<Sechenov>, Vec<Sechenov>),
}

/// Ranks datasets of one phase: reviewed before unreviewed, then measured or compiled data
/// before derived before from-memory, then by key (stable).
fn preference(dataset: &Dataset) -> (u8, u8, &str) {
    let review = match dataset.review {
        Review::Reviewed => 0,
        Review::Unreviewed => 1,
        Review::Rejected => 2,
    };
    let provenance = match dataset.provenance {
        Provenance::Measured | Provenance::Compiled => 0,
        Provenance::Derived => 1,
        Provenance::FromMemory => 2,
    };
    (review, provenance, dataset.key.as_str())
}

/// Builds one curve from the chosen datasets: one branch per solid phase, the preferred
/// dataset of each phase. A dataset whose points do not make a branch is left out.
fn build(catalog: &Catalog, indices: &[usize]) -> Option<BuiltCurve> {
    let datasets = catalog.datasets();
    let mut by_phase: Vec<(&str, usize)> = Vec::new();
    for &i in indices {
        let phase = datasets[i].phase.formula.as_str();
        match by_phase.iter_mut().find(|(p, _)| *p == phase) {
            Some(slot) => {
                if preference(&datasets[i]) < preference(&datasets[slot.1]) {
                    slot.1 = i;
                }
            }
            None => by_phase.push((phase, i)),
        }
    }
    let mut branches = Vec::new();
    let mut used = Vec::new();
    for (phase, i) in by_phase {
        // The other datasets of the phase join the preferred one where it has no points.
        let mut others: Vec<usize> = indices
            .iter()
            .copied()
            .filter(|&j| j != i && datasets[j].phase.formula == phase)
            .collect();
        others.sort_by(|&a, &b| preference(&datasets[a]).cmp(&preference(&datasets[b])));
        let other_refs: Vec<&Dataset> = others.iter().map(|&j| &datasets[j]).collect();
        let branch = Branch::from_datasets(&datasets[i], &other_refs)
            .or_else(|_| Branch::from_dataset(&datasets[i]));
        if let Ok(branch) = branch {
            branches.push(branch);
            used.push(i);
            used.extend(others);
        }
    }
    let curve = Curve::new(branches).ok()?;
    let of = |i: &usize| &catalog.datasets()[*i];
    let first_source = used.first().map(|i| of(i).source.as_str());
    Some(BuiltCurve {
        curve,
        from_memory: used
            .iter()
            .any(|i| of(i).provenance == Provenance::FromMemory),
        unreviewed: used.iter().any(|i| of(i).review == Review::Unreviewed),
        one_source: first_source
            .filter(|key| used.iter().all(|i| of(i).source == *key))
            .and_then(|key| catalog.source_position(key)),
        datasets: used,
        citing: OnceLock::new(),
    })
}

impl Snapshot {
    pub fn new(catalog: Catalog) -> Snapshot {
        let mut curves = Vec::with_capacity(catalog.solutes().len());
        let mut curve_index = HashMap::new();
        let mut names = Vec::new();
        let mut screen_names = ScreenNames::default();
        // Datasets grouped by solute in one pass (in catalog order), so building the
        // snapshot stays linear in the size of the catalog.
        let mut by_solute: HashMap<&str, Vec<usize>> = HashMap::new();
        for (i, d) in catalog.datasets().iter().enumerate() {
            if d.review != Review::Rejected {
                by_solute.entry(d.solute.as_str()).or_default().push(i);
            }
        }
        for solute in catalog.solutes() {
            names.push(solute.name.clone());
            names.push(solute.id.clone());
            names.push(solute.formula.clone());
            names.extend(solute.synonyms.iter().cloned());
            let usable: Vec<usize> = by_solute
                .get(solute.id.as_str())
                .cloned()
                .unwrap_or_default();
            let reviewed: Vec<usize> = usable
                .iter()
                .copied()
                .filter(|&i| catalog.datasets()[i].review == Review::Reviewed)
                .collect();
            // The last solute of an id wins, as in the catalog's own index.
            curve_index.insert(solute.id.clone(), curves.len());
            let solute_curves = SoluteCurves {
                all: build(&catalog, &usable),
                reviewed: build(&catalog, &reviewed),
            };
            let phases = |c: &Option<BuiltCurve>| -> Vec<String> {
                c.iter()
                    .flat_map(|c| c.curve.branches.iter().map(|b| b.phase.clone()))
                    .collect()
            };
            screen_names.push(
                &solute.name,
                phases(&solute_curves.all),
                phases(&solute_curves.reviewed),
            );
            curves.push(solute_curves);
        }
        names.sort();
        names.dedup();
        // Copied once more, now that nothing else is being built: each solute's curves are
        // then allocated one after another in catalog order, so a screening that walks the
        // solutes in that order reads memory forwards (the processor fetches ahead) instead
        // of jumping to wherever the curve was built beside the names and datasets.
        let curves: Vec<SoluteCurves> = curves.to_vec();
        let mut flat = FlatCurves::default();
        for (solute, c) in catalog.solutes().iter().zip(&curves) {
            flat.push(solute, c.all.as_ref(), c.reviewed.as_ref());
        }
        // The compiled-in model files are checked by the tests (store::models); a bad one
        // would leave the activity model without parameters, never stop the engine.
        let models =
            crate::store::models::parameter_sets(crate::seed_files::SEED_FILES).unwrap_or_default();
        let systems = crate::store::models::mixture_systems(crate::seed_files::SEED_FILES)
            .unwrap_or_default();
        let acids =
            crate::store::models::acid_systems(crate::seed_files::SEED_FILES).unwrap_or_default();
        let salting =
            crate::store::models::salting_out(crate::seed_files::SEED_FILES).unwrap_or_default();
        let citations = catalog
            .sources()
            .iter()
            .map(crate::catalog::citation)
            .collect();
        Snapshot {
            catalog,
            citations,
            curves,
            flat,
            screen_names: Arc::new(screen_names),
            curve_index,
            names,
            models,
            systems,
            acids,
            salting,
        }
    }

    /// The Sechenov parameter of an ion (by its symbol, `Na`), if the model files hold one.
    pub fn salting_ion(&self, symbol: &str) -> Option<&Sechenov> {
        self.salting.0.iter().find(|i| i.key == symbol)
    }

    /// The Sechenov parameters of a gas (by its solute id), if the model files hold them.
    pub fn salting_gas(&self, id: &str) -> Option<&Sechenov> {
        self.salting.1.iter().find(|g| g.key == id)
    }

    /// The acid-base records (water's own among them, key `water`).
    pub fn acids(&self) -> &[AcidSystem] {
        &self.acids
    }

    /// Water's ionization record, when the model files have one.
    pub fn water(&self) -> Option<&AcidSystem> {
        self.acids.iter().find(|a| a.key == "water")
    }

    /// The buffer a recipe names (`sodium phosphate`), with its acid.
    pub fn buffer_named(&self, name: &str) -> Option<(&AcidSystem, &BufferForm)> {
        self.acids
            .iter()
            .find_map(|a| a.buffer_named(name).map(|b| (a, b)))
    }

    /// Every buffer name the model files give, for did-you-mean.
    pub fn buffer_names(&self) -> Vec<&str> {
        self.acids
            .iter()
            .flat_map(|a| {
                a.buffer
                    .iter()
                    .flat_map(|b| b.names.iter().map(String::as_str))
            })
            .collect()
    }

    /// The activity-model parameter sets of an electrolyte (by formula), those reaching
    /// the lowest temperatures first.
    pub fn models_for(&self, formula: &str) -> Vec<&ParameterSet> {
        let mut sets: Vec<&ParameterSet> = self
            .models
            .iter()
            .filter(|s| s.electrolyte == formula)
            .collect();
        sets.sort_by(|a, b| a.t_min_k.total_cmp(&b.t_min_k));
        sets
    }

    /// The mixture model's systems, as the model files list them.
    pub fn systems(&self) -> &[System] {
        &self.systems
    }

    /// The curve of a solute, from all data or reviewed data only.
    pub fn curve(&self, solute_id: &str, reviewed_only: bool) -> Option<&BuiltCurve> {
        self.curve_at(*self.curve_index.get(solute_id)?, reviewed_only)
    }

    /// The curve of the solute at `index` in `Catalog::solutes`.
    pub fn curve_at(&self, index: usize, reviewed_only: bool) -> Option<&BuiltCurve> {
        let curves = self.curves.get(index)?;
        if reviewed_only {
            curves.reviewed.as_ref()
        } else {
            curves.all.as_ref()
        }
    }

    /// The solute at `index` in `Catalog::solutes` as a screening reads it: its kind,
    /// molar mass, what its curve rests on and the flat copy of a curve of one branch (see
    /// [`FlatCurves`]).
    pub fn screened_at(&self, index: usize, reviewed_only: bool) -> Option<ScreenedSolute<'_>> {
        self.flat.solute_at(index, reviewed_only)
    }

    /// The citation of the source at `position` in `Catalog::sources`.
    pub fn citation_at(&self, position: usize) -> Option<&str> {
        self.citations.get(position).map(String::as_str)
    }

    /// The names a screening's compact rows refer to.
    pub fn screen_names(&self) -> &Arc<ScreenNames> {
        &self.screen_names
    }

    pub fn names(&self) -> &[String] {
        &self.names
    }
}
