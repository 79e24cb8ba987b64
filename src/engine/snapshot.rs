//! The engine's snapshot: the catalog plus, for every solid solute, its solubility curve
//! built once from its datasets (all data, and reviewed data only), so statements never
//! rebuild an interpolant.

use std::collections::HashMap;

use crate::catalog::Catalog;
use crate::model::{Dataset, Provenance, Review};
use crate::science::curve::{Branch, Curve};

/// A curve and the datasets it was built from (indices into `Catalog::datasets`).
#[derive(Debug, Clone)]
pub struct BuiltCurve {
    pub curve: Curve,
    pub datasets: Vec<usize>,
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
    curves: HashMap<String, SoluteCurves>,
    /// Every name a person may type for a solute (names, ids, formulas, synonyms), sorted.
    names: Vec<String>,
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
    for (_, i) in by_phase {
        if let Ok(branch) = Branch::from_dataset(&datasets[i]) {
            branches.push(branch);
            used.push(i);
        }
    }
    let curve = Curve::new(branches).ok()?;
    Some(BuiltCurve {
        curve,
        datasets: used,
    })
}

impl Snapshot {
    pub fn new(catalog: Catalog) -> Snapshot {
        let mut curves = HashMap::new();
        let mut names = Vec::new();
        for solute in catalog.solutes() {
            names.push(solute.name.clone());
            names.push(solute.id.clone());
            names.push(solute.formula.clone());
            names.extend(solute.synonyms.iter().cloned());
            let usable: Vec<usize> = catalog
                .datasets()
                .iter()
                .enumerate()
                .filter(|(_, d)| d.solute == solute.id && d.review != Review::Rejected)
                .map(|(i, _)| i)
                .collect();
            let reviewed: Vec<usize> = usable
                .iter()
                .copied()
                .filter(|&i| catalog.datasets()[i].review == Review::Reviewed)
                .collect();
            curves.insert(
                solute.id.clone(),
                SoluteCurves {
                    all: build(&catalog, &usable),
                    reviewed: build(&catalog, &reviewed),
                },
            );
        }
        names.sort();
        names.dedup();
        Snapshot {
            catalog,
            curves,
            names,
        }
    }

    /// The curve of a solute, from all data or reviewed data only.
    pub fn curve(&self, solute_id: &str, reviewed_only: bool) -> Option<&BuiltCurve> {
        let curves = self.curves.get(solute_id)?;
        if reviewed_only {
            curves.reviewed.as_ref()
        } else {
            curves.all.as_ref()
        }
    }

    pub fn names(&self) -> &[String] {
        &self.names
    }
}
