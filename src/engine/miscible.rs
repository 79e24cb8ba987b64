//! A liquid that mixes with water in all proportions (a glycol, glycerol, ethanol) in a
//! recipe: it has no saturation limit, so it is named as staying in the liquid rather than
//! refusing the statement; beside other solutes it is a co-solvent, which is said.

use std::collections::BTreeMap;

use serde_json::json;

use crate::answer::Row;
use crate::engine::common::miscible;
use crate::engine::mixture::Ask;
use crate::model::Solute;

/// What a solute that mixes with water in all proportions (and has no solubility data) is
/// said to form: none — it has no saturation limit, and stays in the liquid.
const MISCIBLE: &str = "none: mixes with water in all proportions (miscible)";

/// For a miscible solute, adds its row (the `key` column says it forms no solid) and the
/// caveats, and says true: the caller passes over it.
pub(super) fn miscible_named(
    ask: &mut Ask,
    solute: &Solute,
    quantity: &'static str,
    key: &str,
) -> bool {
    if !miscible(ask.snap, solute) {
        return false;
    }
    let row = miscible_row(ask, solute, quantity, key);
    ask.answer.rows.push(row);
    true
}

/// The row of a miscible solute, and the caveat on the solutes beside it (once).
fn miscible_row(ask: &mut Ask, solute: &Solute, quantity: &'static str, key: &str) -> Row {
    let others = ask
        .mixture
        .solutes
        .iter()
        .filter(|(s, _)| !miscible(ask.snap, s))
        .count();
    crate::engine::common::hazard(solute, ask.answer);
    if others > 0 {
        ask.answer.caveat(format!(
            "{} mixes with water in all proportions and stays in the liquid; the other solutes are read against their solubility in pure water, and a salt is usually less soluble in water mixed with an organic liquid (not accounted for: confirm by test)",
            solute.name
        ));
    }
    Row {
        holds: (key == "forms").then_some(true),
        extra: BTreeMap::from([(key.to_string(), json!(MISCIBLE))]),
        ..super::recipe::solute_row(solute, quantity)
    }
}
