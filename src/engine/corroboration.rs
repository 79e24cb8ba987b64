//! What answers say about the corroboration of the data they rest on: "corroborated by …"
//! for a dataset with a passing check, "not corroborated" for one without, and the
//! explanation of a failing check. A check never makes data reviewed.

use crate::answer::Answer;
use crate::engine::snapshot::{BuiltCurve, Snapshot};
use crate::model::{Dataset, Solute, Verdict};

/// Caveats on the corroboration of the datasets behind `built`.
pub fn corroboration_caveat(
    snap: &Snapshot,
    built: &BuiltCurve,
    solute: &Solute,
    answer: &mut Answer,
) {
    let datasets = snap.catalog.datasets();
    let used: Vec<&Dataset> = built.datasets.iter().map(|&i| &datasets[i]).collect();
    caveat_for(snap, &used, solute, answer);
}

/// Caveats on the corroboration of `datasets` (of one solute): one per corroborated
/// dataset, one per failing check, one naming the datasets not corroborated.
pub fn caveat_for(snap: &Snapshot, datasets: &[&Dataset], solute: &Solute, answer: &mut Answer) {
    let mut corroborated = Vec::new();
    let mut not = Vec::new();
    for dataset in datasets {
        let checks = snap.catalog.checks_of(&dataset.key);
        let passing: Vec<String> = checks
            .iter()
            .filter(|c| c.verdict == Verdict::Pass)
            .map(|c| format!("the {} check against {}", c.kind, c.reference))
            .collect();
        if passing.is_empty() {
            // Two datasets of one solid (e.g. a branch and its eutectic point) name it once.
            if !not.contains(&dataset.phase.formula) {
                not.push(dataset.phase.formula.clone());
            }
        } else {
            corroborated.push(format!(
                "{} corroborated by {}",
                dataset.phase.formula,
                passing.join("; ")
            ));
        }
        for c in checks.iter().filter(|c| c.verdict == Verdict::Fail) {
            answer.caveat(format!(
                "{}: data of {} fail the {} check against {}: {}",
                solute.name,
                dataset.phase.formula,
                c.kind,
                c.reference,
                c.explanation.as_deref().unwrap_or("not yet explained")
            ));
        }
    }
    for text in corroborated {
        answer.caveat(format!("{}: data of {text}", solute.name));
    }
    if !not.is_empty() {
        answer.caveat(format!(
            "{}: data of {} not corroborated (no passing check against an outside reference)",
            solute.name,
            not.join(", ")
        ));
    }
}
