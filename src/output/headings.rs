//! Column headings of the tables for people: a row's field names turned into words, with
//! their units spelled as the trade writes them (`°C`, `kPa`, `%`, `mL(STP)/L`), and each
//! column's priority when a table must be narrowed to fit the terminal.

/// Unit suffixes of field names (longest first) and how a heading writes them.
const UNIT_SUFFIXES: [(&str, &str); 17] = [
    ("_g_per_100g_water", "g/100g water"),
    ("_kj_per_mol", "kJ/mol"),
    ("_kg_per_l", "kg/L"),
    ("_g_per_mol", "g/mol"),
    ("_mol_per_kg", "mol/kg"),
    ("_mmol_per_l", "mmol/L"),
    ("_mol_per_l", "mol/L"),
    ("_mg_per_l", "mg/L"),
    ("_g_per_l", "g/L"),
    ("_percent_w_w", "%w/w"),
    ("_of_total_mass", "% of total mass"),
    ("_kpa", "kPa"),
    ("_pct", "%"),
    ("_c", "°C"),
    ("_k", "K"),
    ("_kj", "kJ"),
    ("_g", "g"),
];

/// Field names whose whole name is a unit, or that read better said another way.
const WHOLE: [(&str, &str); 10] = [
    ("temperature_c", "°C"),
    ("ml_stp_per_l", "mL(STP)/L"),
    ("g_per_100g_water", "g/100g water"),
    ("g_per_l", "g/L"),
    ("mmol_per_l", "mmol/L"),
    ("mol_per_kg", "mol/kg"),
    ("percent_w_w", "%w/w"),
    ("water_percent_w_w", "water %w/w"),
    ("ice_pct_of_total_mass", "ice, % of total mass"),
    ("temperature_asked_c", "asked °C"),
];

/// The heading of a field: its words, then its unit as the trade writes it.
pub fn heading(field: &str) -> String {
    if let Some((_, h)) = WHOLE.iter().find(|(f, _)| *f == field) {
        return (*h).to_string();
    }
    for (suffix, unit) in UNIT_SUFFIXES {
        if let Some(stem) = field.strip_suffix(suffix) {
            if !stem.is_empty() {
                return format!("{} {unit}", stem.replace('_', " "));
            }
        }
    }
    field.replace('_', " ")
}

/// How long a column stays when a table must be narrowed: the lowest goes first. Columns
/// of 100 are never left out (a long one is wrapped instead).
pub fn priority(field: &str) -> u8 {
    match field {
        "solute" | "value" | "holds" | "key" | "name" | "status" | "verdict" | "reason"
        | "citation" => 100,
        "unit" | "kind" | "forms" | "first" | "loading" | "dataset" | "sign" => 95,
        "headroom_pct" | "temperature_c" | "quantity" | "crystals" | "recipe" => 90,
        "view" => 85,
        "from_c" | "to_c" | "explanation" | "figure" | "satline_figure" => 80,
        "phase" | "provenance" | "review" | "step" | "data" | "tolerance" => 60,
        "formula" | "partial_pressure_kpa" | "margin_pct" | "start_c" | "not_reached_c" => 55,
        "basis" => 30,
        "points" | "dashed" | "henry_record" | "id" | "method" | "model" => 20,
        _ => 40,
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn units_are_spelled_as_the_trade_writes_them() {
        assert_eq!(heading("temperature_c"), "°C");
        assert_eq!(heading("from_c"), "from °C");
        assert_eq!(heading("temperature_asked_c"), "asked °C");
        assert_eq!(heading("headroom_pct"), "headroom %");
        assert_eq!(heading("margin_pct"), "margin %");
        assert_eq!(heading("partial_pressure_kpa"), "partial pressure kPa");
        assert_eq!(heading("ml_stp_per_l"), "mL(STP)/L");
        assert_eq!(heading("density_kg_per_l"), "density kg/L");
        assert_eq!(
            heading("expected_error_kj_per_mol"),
            "expected error kJ/mol"
        );
        assert_eq!(heading("molar_mass_g_per_mol"), "molar mass g/mol");
        assert_eq!(heading("undissolved_g"), "undissolved g");
        assert_eq!(heading("phase"), "phase");
    }

    #[test]
    fn no_heading_keeps_a_lower_case_unit_of_a_field_name() {
        for field in [
            "partial_pressure_kpa",
            "ml_stp_per_l",
            "down_to_c",
            "start_c",
        ] {
            let h = heading(field);
            assert!(
                !h.ends_with(" c") && !h.contains("kpa") && !h.contains("stp per"),
                "{h}"
            );
        }
    }
}
