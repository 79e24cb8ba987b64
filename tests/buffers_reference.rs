//! The acid-base constants against the outside.
//!
//! - pK(T) of phosphoric acid (second step), carbonic acid (both steps) and Tris, from the
//!   seed's records (Goldberg, Kishore & Lennen 2002, as recalled) through the van 't Hoff
//!   relation with a constant heat-capacity change, against PyPI pytzer's dissociation
//!   constants (`tests/reference/buffers_pytzer.json`, written by `fixtures_buffers.py`:
//!   Millero & Pierrot 1998 phosphate, Plummer & Busenberg 1982 carbonate, Bates & Hetzer
//!   1961 Tris; thermodynamic constants, I = 0; the papers' citations as recalled), 0–40 °C:
//!   within 0.02 pK unit.
//! - Common practice (no source): phosphate's second pK is close to 7.2 at 25 °C and moves
//!   little with temperature; a Tris buffer's pH falls by about 0.03 per kelvin of warming.
//! - Worked example, computed by hand from the Henderson–Hasselbalch equation (common
//!   practice; the constant from memory of the compilation above): a 50 mM sodium phosphate
//!   buffer at pH 7.4 has [HPO4²⁻]/[H2PO4⁻] = 10^(7.4 − 7.198) = 1.592 when activities are
//!   ignored, and, with that split and both forms counted with their Na⁺ (NaH2PO4: I = m;
//!   Na2HPO4: I = 3m), an ionic strength of 0.05 (1 + 2 × 1.592/2.592) = 0.1114 mol/kg.

use satline::science::acid_base::{AcidSystem, Present, Solution, charge_for_ph, fractions, solve};
use satline::seed_files::SEED_FILES;
use satline::store::models::acid_systems;

fn acids() -> Vec<AcidSystem> {
    acid_systems(SEED_FILES).unwrap()
}

fn acid<'a>(all: &'a [AcidSystem], key: &str) -> &'a AcidSystem {
    all.iter().find(|a| a.key == key).unwrap()
}

#[test]
fn pk_against_pytzer_from_0_to_40_c() {
    let fixture: serde_json::Value =
        serde_json::from_str(include_str!("reference/buffers_pytzer.json")).unwrap();
    let all = acids();
    let mut worst = (0.0_f64, String::new());
    let mut checked = 0;
    for series in fixture["series"].as_array().unwrap() {
        let a = acid(&all, series["acid"].as_str().unwrap());
        let step = &a.step[series["step"].as_u64().unwrap() as usize - 1];
        for point in series["points"].as_array().unwrap() {
            let t_c = point["t_c"].as_f64().unwrap();
            let theirs = point["pk"].as_f64().unwrap();
            let ours = step.pk_at(t_c + 273.15);
            let d = (ours - theirs).abs();
            if d > worst.0 {
                worst = (
                    d,
                    format!(
                        "{} step {} at {t_c} C: {ours:.4} vs {theirs:.4} ({})",
                        a.key, series["step"], series["function"]
                    ),
                );
            }
            checked += 1;
        }
    }
    println!("worst difference: {:.4} pK, {}", worst.0, worst.1);
    assert_eq!(checked, 36);
    assert!(worst.0 <= 0.02, "{}", worst.1);
}

#[test]
fn phosphate_second_pk_is_near_7_2_and_moves_little() {
    let all = acids();
    let step = &acid(&all, "phosphoric-acid").step[1];
    let at_25 = step.pk_at(298.15);
    assert!((7.1..=7.3).contains(&at_25), "{at_25}");
    // "Little": a few thousandths a kelvin (about −0.003/K), a tenth of Tris's.
    let per_k = (step.pk_at(310.15) - step.pk_at(278.15)) / 32.0;
    assert!(per_k < 0.0 && per_k > -0.005, "{per_k}");
}

#[test]
fn a_tris_buffer_loses_about_three_hundredths_a_kelvin() {
    let all = acids();
    let tris = acid(&all, "tris");
    let water = acid(&all, "water");
    // 50 mmol/kg Tris titrated with HCl to pH 8.0 at 25 °C (the chloride is the strong ion).
    let base = Solution {
        acids: vec![Present {
            acid: tris,
            total: 0.05,
        }],
        strong_charge: 0.0,
        strong_ionic: 0.0,
        water,
    };
    let (extra, _) = charge_for_ph(&base, 8.0, 298.15).unwrap();
    assert!(extra < 0.0, "HCl adds negative strong charge: {extra}");
    let made = Solution {
        strong_charge: extra,
        strong_ionic: 0.5 * extra.abs(),
        ..base
    };
    let (cold, warm) = (solve(&made, 278.15).unwrap(), solve(&made, 310.15).unwrap());
    let per_k = (warm.ph - cold.ph) / 32.0;
    assert!((-0.035..=-0.025).contains(&per_k), "{per_k}");
}

#[test]
fn henderson_hasselbalch_for_50_mm_phosphate_at_ph_7_4() {
    let all = acids();
    let p = acid(&all, "phosphoric-acid");
    let f = fractions(p, 7.4, 298.15, 0.0);
    let ratio = f[2] / f[1];
    let by_hand = 10f64.powf(7.4 - 7.198);
    assert!(
        (ratio - by_hand).abs() < 1e-9 * by_hand,
        "{ratio} vs {by_hand}"
    );
    assert!((by_hand - 1.592).abs() < 0.001);
    // The ionic strength of that split, both forms with their Na⁺: ½ C Σ f (|z| + z²).
    let ideal_i: f64 = 0.5
        * 0.05
        * f.iter()
            .zip(&p.charges)
            .map(|(f, &z)| f * f64::from(z.abs() + z * z))
            .sum::<f64>();
    let hand_i = 0.05 * (1.0 + 2.0 * by_hand / (1.0 + by_hand));
    assert!((hand_i - 0.1114).abs() < 0.0005, "{hand_i}");
    assert!(
        (ideal_i - hand_i).abs() < 1e-3 * hand_i,
        "{ideal_i} vs {hand_i}"
    );
    // With activity coefficients (Davies) the same pH on the activity scale needs more of
    // the doubly charged form, so the buffer's own ionic strength is higher than by hand.
    let water = acid(&all, "water");
    let buffer = Solution {
        acids: vec![Present {
            acid: p,
            total: 0.05,
        }],
        strong_charge: 0.0,
        strong_ionic: 0.0,
        water,
    };
    let (_, set) = charge_for_ph(&buffer, 7.4, 298.15).unwrap();
    let davies_ratio = set.fractions[0][2] / set.fractions[0][1];
    assert!(davies_ratio > ratio, "{davies_ratio}");
    assert!(set.ionic_strength > hand_i && set.ionic_strength < 0.15);
    println!(
        "ratio {ratio:.3} ideal, {davies_ratio:.3} with Davies; ionic strength {hand_i:.4} by hand, {:.4} with Davies",
        set.ionic_strength
    );
}
