//! The knots of every solute's curve of one branch, copied one after another into one flat
//! array in catalog order: a screening of many solutes reads them as one stream instead of
//! following each curve's pointers to its branches and their knots. The copies are
//! evaluated by the very code that evaluates a branch ([`BranchView`]).

use crate::engine::snapshot::BuiltCurve;
use crate::science::curve::{BranchView, Knots};

/// Where one curve's knots lie in [`FlatCurves::knots`] (`len` 0: none there) and the
/// range its branch covers, K.
#[derive(Debug, Clone, Copy, Default)]
struct Entry {
    start: u32,
    len: u32,
    range: (f64, f64),
}

/// The flat copies, per solute: of the curve from all data and of the one from reviewed
/// data only.
#[derive(Debug, Default)]
pub struct FlatCurves {
    entries: Vec<[Entry; 2]>,
    knots: Vec<f64>,
}

impl FlatCurves {
    /// Adds the next solute of the catalog. A curve is copied when it has one branch and
    /// no stable range of its own (any other is evaluated as a whole curve); the reviewed
    /// curve shares the copy of the other when both come from the same datasets.
    pub fn push(&mut self, all: Option<&BuiltCurve>, reviewed: Option<&BuiltCurve>) {
        let first = self.copy(all);
        let second = match (all, reviewed) {
            (Some(a), Some(r)) if a.datasets == r.datasets => first,
            _ => self.copy(reviewed),
        };
        self.entries.push([first, second]);
    }

    fn copy(&mut self, built: Option<&BuiltCurve>) -> Entry {
        let Some(view) = built.and_then(|b| b.curve.lone()) else {
            return Entry::default();
        };
        let raw = view.knots.raw();
        match (u32::try_from(self.knots.len()), u32::try_from(raw.len())) {
            (Ok(start), Ok(len)) if view.stable.is_none() => {
                self.knots.extend_from_slice(raw);
                Entry {
                    start,
                    len,
                    range: view.range,
                }
            }
            _ => Entry::default(),
        }
    }

    /// The flat copy of the curve of the solute at `index` in the catalog (from reviewed
    /// data only when `reviewed_only`), when it has one.
    pub fn lone_at(&self, index: usize, reviewed_only: bool) -> Option<BranchView<'_>> {
        let entry = self.entries.get(index)?[usize::from(reviewed_only)];
        let start = entry.start as usize;
        let raw = self.knots.get(start..start + entry.len as usize)?;
        Some(BranchView {
            knots: Knots::new(raw)?,
            range: entry.range,
            stable: None,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::science::curve::{Branch, Curve};
    use std::sync::OnceLock;

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
        let mut flat = FlatCurves::default();
        flat.push(Some(&one), Some(&one));
        flat.push(Some(&two), None);
        let copy = flat.lone_at(0, false).unwrap();
        assert_eq!(copy, flat.lone_at(0, true).unwrap());
        assert_eq!(copy, a.view());
        // Against the whole curve's own evaluation (its checks and stable-branch choice).
        let whole = Curve::single(a.clone());
        for t in [273.15, 280.0, 293.15, 301.7, 313.15] {
            let (branch, w, basis) = whole.evaluate_branch(t, false).unwrap();
            assert_eq!((branch, copy.mass_fraction_and_basis(t)), (0, (w, basis)));
        }
        assert_eq!(flat.knots.len(), 9, "the shared copy is stored once");
        assert!(flat.lone_at(1, false).is_none());
        assert!(flat.lone_at(1, true).is_none());
        assert!(flat.lone_at(2, false).is_none());
    }
}
