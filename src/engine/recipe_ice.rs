//! The part of a recipe's answer below 0 °C: where ice appears in the range (a row, or a
//! refusal when it cannot be said), and the part of the range where the liquid is still the
//! recipe as made (from the ice line up).

use std::collections::BTreeMap;

use serde_json::json;

use crate::answer::{Answer, ICE_ROW, Row};
use crate::engine::common::celsius;
use crate::engine::error::EvalError;
use crate::engine::mixture::{Ask, IceLine, Limits, SolidModel};
use crate::query::Span;
use crate::science::freezing::ICE_POINT;

/// The ice line's part of a range reaching below 0 °C: where ice forms in it, if it does (a
/// row and a caveat), or a refusal when it cannot be said.
pub(super) fn ice_in_range(
    ask: &mut Ask,
    model: &dyn SolidModel,
    t1: f64,
    span: Span,
) -> Result<Option<f64>, EvalError> {
    if t1 >= ICE_POINT {
        return Ok(None);
    }
    match model.ice_line(ask) {
        IceLine::At { t_k, how, basis } => {
            ask.answer.caveat(how);
            let forms = t_k > t1;
            ask.answer.rows.push(Row {
                solute: Some("ice".into()),
                quantity: Some(ICE_ROW.into()),
                value: Some(celsius(t_k)),
                unit: Some("C".into()),
                basis: Some(basis),
                holds: Some(!forms),
                ..Row::default()
            });
            Ok(forms.then_some(t_k))
        }
        IceLine::NotEvaluated(why) => Err(EvalError::Unanswerable {
            message: format!(
                "the range reaches below 0 C, where ice may form, and {why}; ask from 0 C up"
            ),
            span,
        }),
    }
}

/// The part of the range where the liquid is the recipe as made: all of it, or from the ice
/// line up when ice forms in it (below the ice line ice takes water out of the liquid, and a
/// solute's amount per kg of water is no longer the recipe's; `freezing of NAME at T`
/// follows that). Says so when it cuts the range.
pub(super) fn above_the_ice(answer: &mut Answer, at: Limits, ice: Option<f64>) -> Limits {
    let Some(t_ice) = ice else {
        return at;
    };
    answer.caveat(format!(
        "the solutes are checked from the ice line ({} C) up: below it ice takes water out of the liquid, which is then no longer the recipe as made (`freezing of NAME at T` follows it)",
        celsius(t_ice)
    ));
    Limits {
        t1: t_ice.min(at.t2),
        ..at
    }
}

/// The ice row of `which solids form`, for a range reaching below 0 °C, and the ice line when
/// ice forms in the range.
pub(super) fn ice_row(model: &dyn SolidModel, ask: &mut Ask, t1: f64) -> (Row, Option<f64>) {
    let (temperature_c, holds, extra, ice) = match model.ice_line(ask) {
        IceLine::At { t_k, how, .. } => {
            ask.answer.caveat(how);
            let forms = if t_k > t1 {
                format!("below {} C", celsius(t_k))
            } else {
                "no".to_string()
            };
            (
                Some(celsius(t_k)),
                Some(t_k <= t1),
                BTreeMap::from([("forms".to_string(), json!(forms))]),
                (t_k > t1).then_some(t_k),
            )
        }
        IceLine::NotEvaluated(why) => (
            None,
            None,
            BTreeMap::from([
                ("forms".to_string(), json!("not evaluated")),
                ("reason".to_string(), json!(why)),
            ]),
            None,
        ),
    };
    let row = Row {
        solute: Some("ice".into()),
        quantity: Some("solid".into()),
        phase: Some("ice".into()),
        temperature_c,
        holds,
        extra,
        ..Row::default()
    };
    (row, ice)
}
