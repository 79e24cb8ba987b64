//! What a screening of many solutes reads of each, laid out one solute after another in
//! catalog order: the solute's kind and molar mass, what its curves rest on (present,
//! typed from memory, unreviewed, one source), and the knots of every curve of one branch
//! copied into one flat array. A screening reads them as one stream instead of following
//! each solute's and curve's pointers; the copies are evaluated by the very code that
//! evaluates a branch ([`BranchView`]).

use crate::engine::snapshot::BuiltCurve;
use crate::model::{Solute, SoluteKind};
use crate::science::curve::{BranchView, Knots};

/// What a curve rests on, as [`BuiltCurve`] says it, kept beside the flat copy.
#[derive(Debug, Clone, Copy, Default, PartialEq, Eq)]
pub struct CurveFacts {
    /// Whether the solute has this curve at all.
    pub present: bool,
    pub from_memory: bool,
    pub unreviewed: bool,
    /// The source every dataset of the curve cites, when they all cite one.
    pub one_source: Option<u32>,
}

/// One curve of a solute: where its knots lie in [`FlatCurves::knots`] (`len` 0: none
/// there), the range its branch covers, K, and what it rests on.
#[derive(Debug, Clone, Copy, Default)]
struct Entry {
    start: u32,
    len: u32,
    range: (f64, f64),
    facts: CurveFacts,
}

/// One solute: its kind and molar mass, and its curve from all data and from reviewed data
/// only.
#[derive(Debug, Clone, Copy)]
struct FlatSolute {
    kind: SoluteKind,
    molar_mass: f64,
    curves: [Entry; 2],
}

/// A solute as a screening reads it (see [`FlatCurves::solute_at`]).
#[derive(Debug, Clone, Copy)]
pub struct ScreenedSolute<'a> {
    pub kind: SoluteKind,
    pub molar_mass: f64,
    pub facts: CurveFacts,
    /// The flat copy of the curve, when it has one branch and no stable range of its own.
    pub lone: Option<BranchView<'a>>,
}

/// The flat records, per solute in catalog order.
#[derive(Debug, Default)]
pub struct FlatCurves {
    solutes: Vec<FlatSolute>,
    knots: Vec<f64>,
}

impl FlatCurves {
    /// Adds the next solute of the catalog. A curve is copied when it has one branch and
    /// no stable range of its own (any other is evaluated as a whole curve); the reviewed
    /// curve shares the copy of the other when both come from the same datasets.
    pub fn push(
        &mut self,
        solute: &Solute,
        all: Option<&BuiltCurve>,
        reviewed: Option<&BuiltCurve>,
    ) {
        let first = self.copy(all);
        let second = match (all, reviewed) {
            (Some(a), Some(r)) if a.datasets == r.datasets => Entry {
                facts: facts(r),
                ..first
            },
            _ => self.copy(reviewed),
        };
        self.solutes.push(FlatSolute {
            kind: solute.kind,
            molar_mass: solute.molar_mass,
            curves: [first, second],
        });
    }

    fn copy(&mut self, built: Option<&BuiltCurve>) -> Entry {
        let Some(built) = built else {
            return Entry::default();
        };
        let facts = facts(built);
        let Some(view) = built.curve.lone() else {
            return Entry {
                facts,
                ..Entry::default()
            };
        };
        let raw = view.knots.raw();
        match (u32::try_from(self.knots.len()), u32::try_from(raw.len())) {
            (Ok(start), Ok(len)) if view.stable.is_none() => {
                self.knots.extend_from_slice(raw);
                Entry {
                    start,
                    len,
                    range: view.range,
                    facts,
                }
            }
            _ => Entry {
                facts,
                ..Entry::default()
            },
        }
    }

    /// The solute at `index` in the catalog as a screening reads it, with its curve from
    /// reviewed data only when `reviewed_only`.
    pub fn solute_at(&self, index: usize, reviewed_only: bool) -> Option<ScreenedSolute<'_>> {
        let solute = self.solutes.get(index)?;
        let entry = solute.curves[usize::from(reviewed_only)];
        let start = entry.start as usize;
        let lone = self
            .knots
            .get(start..start + entry.len as usize)
            .and_then(Knots::new)
            .map(|knots| BranchView {
                knots,
                range: entry.range,
                stable: None,
            });
        Some(ScreenedSolute {
            kind: solute.kind,
            molar_mass: solute.molar_mass,
            facts: entry.facts,
            lone,
        })
    }
}

fn facts(built: &BuiltCurve) -> CurveFacts {
    CurveFacts {
        present: true,
        from_memory: built.from_memory,
        unreviewed: built.unreviewed,
        one_source: built.one_source.and_then(|s| u32::try_from(s).ok()),
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::curve::{Branch, Curve};
    use std::sync::OnceLock;

    fn lone(flat: &FlatCurves, index: usize, reviewed_only: bool) -> Option<BranchView<'_>> {
        flat.solute_at(index, reviewed_only)?.lone
    }

    fn built(curve: Curve, datasets: Vec<usize>) -> BuiltCurve {
        BuiltCurve {
            curve,
            datasets,
            from_memory: false,
            unreviewed: false,
            one_source: None,
            citing: OnceLock::new(),
        }
    }

    #[test]
    fn a_copy_evaluates_as_its_branch_and_curves_of_several_branches_are_not_copied() {
        // Invented demo data.
        let a = Branch::new("A", &[(273.15, 0.10), (293.15, 0.20), (313.15, 0.35)]).unwrap();
        let b = Branch::new("B", &[(283.15, 0.15), (303.15, 0.18)]).unwrap();
        let one = built(Curve::single(a.clone()), vec![0]);
        let two = built(Curve::new(vec![a.clone(), b]).unwrap(), vec![1, 2]);
        let solute = Solute::salt_for_tests("A", 100.0, 2);
        let mut flat = FlatCurves::default();
        flat.push(&solute, Some(&one), Some(&one));
        flat.push(&solute, Some(&two), None);
        let copy = lone(&flat, 0, false).unwrap();
        assert_eq!(copy, lone(&flat, 0, true).unwrap());
        assert_eq!(copy, a.view());
        // Against the whole curve's own evaluation (its checks and stable-branch choice).
        let whole = Curve::single(a.clone());
        for t in [273.15, 280.0, 293.15, 301.7, 313.15] {
            let (branch, w, basis) = whole.evaluate_branch(t, false).unwrap();
            assert_eq!((branch, copy.mass_fraction_and_basis(t)), (0, (w, basis)));
        }
        assert_eq!(flat.knots.len(), 9, "the shared copy is stored once");
        assert!(lone(&flat, 1, false).is_none());
        assert!(lone(&flat, 1, true).is_none());
        assert!(lone(&flat, 2, false).is_none());
        // What each curve rests on is kept beside it, copied or not.
        let first = flat.solute_at(0, true).unwrap();
        assert_eq!((first.kind, first.molar_mass), (SoluteKind::Salt, 100.0));
        assert!(first.facts.present);
        assert!(flat.solute_at(1, false).unwrap().facts.present);
        assert!(!flat.solute_at(1, true).unwrap().facts.present);
    }
}
