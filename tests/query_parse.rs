//! The parser against the acceptance set of DESIGN.md, the further spellings of issue 4,
//! and one test per class of parse error (the input in each variant's doc comment).

use satline::query::*;
use satline::science::units::{CompositionUnit, PressureUnit, TemperatureUnit};

/// Parses one statement with a fresh environment, panicking with the rendered error.
fn one(text: &str) -> Statement {
    let mut results = parse_script(text);
    assert_eq!(results.len(), 1, "{text}: expected one statement");
    match results.remove(0) {
        Ok(located) => located.node,
        Err(e) => panic!("{}", e.render(text, "test")),
    }
}

/// The one temperature of a solubility statement (not a table over a range).
fn point(s: &Solubility) -> Temperature {
    match s.temperatures {
        Temperatures::At(t) => t,
        Temperatures::Range(r) => panic!("a range: {r:?}"),
    }
}

#[test]
fn a_solubility_table_over_a_range_with_its_step() {
    let Statement::Solubility(s) = one("solubility of KNO3 from 0 C to 40 C every 5 C in mol/kg")
    else {
        panic!()
    };
    assert!(matches!(s.temperatures, Temperatures::Range(r) if close(r.high.value, 40.0)));
    assert!(close(s.every.map_or(0.0, |e| e.kelvin), 5.0));
    assert_eq!(s.unit.map(|u| u.unit), Some(CompositionUnit::Molality));
    // A step in F is a difference: 9 F is 5 K.
    let Statement::Solubility(s) = one("solubility of KNO3 from 32 F to 104 F every 9 F") else {
        panic!()
    };
    assert!(close(s.every.map_or(0.0, |e| e.kelvin), 5.0));
    // The step must be above zero, and a temperature.
    let e = fault("solubility of KNO3 from 0 C to 40 C every 0 C");
    assert!(
        e.to_string().contains("a step of temperature above zero"),
        "{e}"
    );
    let e = fault("solubility of KNO3 from 0 C to 40 C every 5 g/L");
    assert!(e.to_string().contains("expected a temperature"), "{e}");
    let e = fault("solubility of KNO3 from 0 C to 40 C every 5 C every 2 C");
    assert!(e.to_string().contains("every"), "{e}");
    // Neither `at` nor a range: said with both.
    let e = fault("solubility of KNO3 20 C");
    assert!(
        e.to_string()
            .contains("`at` and a temperature, or `from` and a range"),
        "{e}"
    );
}

/// The error of the last statement of `text` (earlier ones may bind names).
fn fault(text: &str) -> ParseError {
    match parse_script(text).pop() {
        Some(Err(e)) => e,
        Some(Ok(s)) => panic!("{text}: parsed as {:?}", s.node),
        None => panic!("{text}: no statement"),
    }
}

fn close(a: f64, b: f64) -> bool {
    (a - b).abs() < 1e-9
}

// ----------------------------------------------------------------------------------------
// the acceptance set, exactly as written in DESIGN.md

#[test]
fn solubility_at_a_temperature() {
    let Statement::Solubility(s) = one("solubility of KNO3 at 20 C") else {
        panic!()
    };
    assert_eq!(s.solute.text, "KNO3");
    assert_eq!(s.solute.span, Span::new(14, 18));
    assert_eq!(point(&s).unit, TemperatureUnit::Celsius);
    assert!(close(point(&s).value, 20.0));
    assert_eq!(point(&s).span, Span::new(22, 26));
    assert_eq!(s.unit, None);
}

#[test]
fn solubility_with_a_multi_word_name_and_a_unit() {
    let Statement::Solubility(s) = one("solubility of potassium nitrate at 68 F in mol/kg") else {
        panic!()
    };
    assert_eq!(s.solute.text, "potassium nitrate");
    assert!(close(point(&s).celsius(), 20.0));
    assert_eq!(s.unit.map(|u| u.unit), Some(CompositionUnit::Molality));
}

#[test]
fn screening_salts_over_a_range_with_margin() {
    let text = "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%";
    let Statement::Screen(s) = one(text) else {
        panic!()
    };
    assert_eq!(s.class, SoluteClass::Salts);
    assert!(s.filters.is_empty());
    assert_eq!(s.loading.unit, CompositionUnit::GramsPer100gWater);
    assert!(close(s.loading.value, 30.0));
    assert_eq!(s.loading.span.text(text), "30 g/100g water");
    let Temperatures::Range(r) = s.temperatures else {
        panic!()
    };
    assert!(close(r.low.value, 2.0) && close(r.high.value, 8.0));
    assert_eq!(r.span.text(text), "from 2 C to 8 C");
    assert!(close(s.margin.map_or(0.0, |m| m.percent), 10.0));
}

#[test]
fn screening_solutes_at_one_temperature() {
    let Statement::Screen(s) = one("which solutes stay dissolved at 1.5 mol/kg at 5 C") else {
        panic!()
    };
    assert_eq!(s.class, SoluteClass::Solutes);
    assert_eq!(s.loading.unit, CompositionUnit::Molality);
    assert!(matches!(s.temperatures, Temperatures::At(t) if close(t.value, 5.0)));
    assert_eq!(s.margin, None);
}

#[test]
fn saturation_of_a_loading() {
    let Statement::Saturation(s) = one("saturation of KNO3 at 40 g/100g water") else {
        panic!()
    };
    assert_eq!(s.solute.text, "KNO3");
    assert!(close(s.loading.value, 40.0));
}

#[test]
fn ceiling_over_a_range() {
    let Statement::Ceiling(s) = one("ceiling of KCl from 2 C to 8 C margin 10% in mol/kg") else {
        panic!()
    };
    assert_eq!(s.solute.text, "KCl");
    assert!(matches!(s.temperatures, Temperatures::Range(_)));
    assert!(s.margin.is_some());
    assert_eq!(s.unit.map(|u| u.unit), Some(CompositionUnit::Molality));
}

#[test]
fn heat_of_solution() {
    let Statement::HeatOfSolution(s) = one("heat of solution of KNO3 at 25 C") else {
        panic!()
    };
    assert_eq!(s.solute.text, "KNO3");
    assert!(close(s.temperature.kelvin(), 298.15));
}

#[test]
fn dissolved_gas_under_air() {
    let Statement::DissolvedGas(s) = one("dissolved O2 at 25 C under air") else {
        panic!()
    };
    assert_eq!(s.gas.text, "O2");
    let Some(GasPressure::Mixture { mixture, total }) = s.pressure else {
        panic!()
    };
    assert_eq!(mixture.text, "air");
    assert_eq!(total, None);
}

#[test]
fn dissolved_gas_under_a_partial_pressure() {
    let Statement::DissolvedGas(s) = one("dissolved CO2 at 4 C under 2.5 bar in g/L") else {
        panic!()
    };
    let Some(GasPressure::Partial(p)) = s.pressure else {
        panic!()
    };
    assert_eq!(p.unit, PressureUnit::Bar);
    assert!(close(p.pascals(), 2.5e5));
    assert_eq!(s.unit.map(|u| u.unit), Some(CompositionUnit::GramsPerLitre));
}

#[test]
fn freezing_of_a_loading_at_a_temperature() {
    let Statement::Freezing(s) = one("freezing of NaCl at 10 g/100g water at -10 C") else {
        panic!()
    };
    assert!(close(s.loading.value, 10.0));
    assert!(close(s.temperature.map_or(0.0, |t| t.value), -10.0));
}

#[test]
fn convert_between_units() {
    let Statement::Convert(s) = one("convert 20 g/100g water of KCl to mol/kg") else {
        panic!()
    };
    assert_eq!(s.solute.text, "KCl");
    assert_eq!(s.to.unit, CompositionUnit::Molality);
    assert_eq!(s.from_basis, None);
}

#[test]
fn describe_sources_and_list() {
    assert!(matches!(one("describe NaCl"), Statement::Describe(d) if d.solute.text == "NaCl"));
    assert!(
        matches!(one("sources of NaCl"), Statement::Sources(s) if s.solute.as_ref().is_some_and(|n| n.text == "NaCl"))
    );
    let Statement::List(l) = one("list salts with anion sulfate") else {
        panic!()
    };
    assert_eq!(l.class, SoluteClass::Salts);
    assert!(matches!(&l.filters[..], [Filter::Anion(n)] if n.text == "sulfate"));
}

#[test]
fn let_then_require_over_the_name() {
    let text = "let cold = from 2 C to 8 C\nrequire KCl stays dissolved at 20 g/100g water over cold margin 10%";
    let results = parse_script(text);
    assert_eq!(results.len(), 2);
    let Ok(Located {
        node: Statement::Let(binding),
        ..
    }) = &results[0]
    else {
        panic!()
    };
    assert_eq!(binding.name.text, "cold");
    let Ok(Located {
        node: Statement::Require(r),
        span,
    }) = &results[1]
    else {
        panic!("{:?}", results[1])
    };
    assert_eq!(span.text(text), &text[27..]);
    assert_eq!(r.solute.text, "KCl");
    let Temperatures::Range(range) = r.temperatures else {
        panic!()
    };
    assert!(close(range.low.value, 2.0) && close(range.high.value, 8.0));
    // The resolved range points at the name where it was used, inside and out.
    assert_eq!(range.span.text(text), "cold");
    assert_eq!(range.low.span.text(text), "cold");
}

#[test]
fn the_whole_acceptance_set_parses_as_one_script() {
    let text = include_str!("../grammar/examples/acceptance.satq");
    let results = parse_script(text);
    assert_eq!(results.len(), 16);
    for r in &results {
        if let Err(e) = r {
            panic!("{}", e.render(text, "acceptance.satq"));
        }
    }
}

// ----------------------------------------------------------------------------------------
// further spellings

#[test]
fn screening_filters_join_with_and() {
    let text = "which molecular solutes with cation potassium and anion nitrate and tag buffer \
                and element N and source crc-97 stay dissolved at 12 %w/w at 5 °C";
    let Statement::Screen(s) = one(text) else {
        panic!()
    };
    assert_eq!(s.class, SoluteClass::MolecularSolutes);
    let texts: Vec<&str> = s
        .filters
        .iter()
        .map(|f| match f {
            Filter::Cation(n)
            | Filter::Anion(n)
            | Filter::Tag(n)
            | Filter::Element(n)
            | Filter::Source(n) => n.text.as_str(),
        })
        .collect();
    assert_eq!(texts, ["potassium", "nitrate", "buffer", "N", "crc-97"]);
    assert!(matches!(s.filters[4], Filter::Source(_)));
    assert_eq!(s.loading.unit, CompositionUnit::MassPercent);
}

#[test]
fn gases_class_and_mole_fraction() {
    let Statement::Screen(s) = one("which gases stay dissolved at 0.01 x at 278.15 K") else {
        panic!()
    };
    assert_eq!(s.class, SoluteClass::Gases);
    assert_eq!(s.loading.unit, CompositionUnit::MoleFraction);
}

#[test]
fn gas_pressure_spellings() {
    let total = |text: &str| match one(text) {
        Statement::DissolvedGas(DissolvedGas {
            pressure: Some(GasPressure::Mixture { mixture, total }),
            ..
        }) => (mixture.text, total.map(|p| p.pascals())),
        other => panic!("{other:?}"),
    };
    assert_eq!(
        total("dissolved O2 at 25 C under air at 2 bar"),
        ("air".into(), Some(2.0e5))
    );
    assert_eq!(
        total("dissolved O2 at 25 C under 2 bar of air"),
        ("air".into(), Some(2.0e5))
    );
    let Statement::DissolvedGas(s) = one("dissolved O2 at 25 C under 0.21 bar") else {
        panic!()
    };
    assert!(matches!(s.pressure, Some(GasPressure::Partial(p)) if close(p.value, 0.21)));
    let Statement::DissolvedGas(s) = one("dissolved N2 at 77 F") else {
        panic!()
    };
    assert_eq!(s.pressure, None);
}

#[test]
fn every_pressure_unit() {
    for unit in ["bar", "atm", "kPa", "Pa", "psi", "mmHg", "torr"] {
        let text = format!("dissolved O2 at 25 C under 1 {unit}");
        let Statement::DissolvedGas(s) = one(&text) else {
            panic!()
        };
        assert!(
            matches!(s.pressure, Some(GasPressure::Partial(p)) if p.unit.symbol() == unit),
            "{unit}"
        );
    }
}

#[test]
fn every_loading_unit() {
    for (written, unit) in [
        ("g/100g water", CompositionUnit::GramsPer100gWater),
        ("%w/w", CompositionUnit::MassPercent),
        ("%w/v", CompositionUnit::PercentWeightPerVolume),
        ("mg/mL", CompositionUnit::MilligramsPerMillilitre),
        ("mmol/L", CompositionUnit::MillimolesPerLitre),
        ("mM", CompositionUnit::MillimolesPerLitre),
        ("umol/L", CompositionUnit::MicromolesPerLitre),
        ("uM", CompositionUnit::MicromolesPerLitre),
        ("M", CompositionUnit::MolesPerLitre),
        ("ppm w/w", CompositionUnit::MilligramsPerKilogram),
        ("mol/kg", CompositionUnit::Molality),
        ("mmol/kg", CompositionUnit::MillimolesPerKilogram),
        ("x", CompositionUnit::MoleFraction),
        ("g/L", CompositionUnit::GramsPerLitre),
        ("mol/L", CompositionUnit::MolesPerLitre),
        ("mg/L", CompositionUnit::MilligramsPerLitre),
        ("mg/kg", CompositionUnit::MilligramsPerKilogram),
    ] {
        let text = format!("saturation of KNO3 at 1 {written}");
        let Statement::Saturation(s) = one(&text) else {
            panic!()
        };
        assert_eq!(s.loading.unit, unit, "{written}");
    }
}

#[test]
fn every_temperature_unit() {
    for (written, kelvin) in [
        ("25 C", 298.15),
        ("25 °C", 298.15),
        ("298.15 K", 298.15),
        ("77 F", 298.15),
        ("77 °F", 298.15),
        ("25C", 298.15),
    ] {
        let Statement::Solubility(s) = one(&format!("solubility of KNO3 at {written}")) else {
            panic!()
        };
        assert!(close(point(&s).kelvin(), kelvin), "{written}");
    }
}

#[test]
fn a_bare_percent_is_no_loading_but_margin_takes_it() {
    let Statement::Screen(s) = one("which salts stay dissolved at 12%w/w at 5 C margin 10%") else {
        panic!()
    };
    assert_eq!(s.loading.unit, CompositionUnit::MassPercent);
    assert!(close(s.margin.map_or(0.0, |m| m.percent), 10.0));
    for text in [
        "which salts stay dissolved at 12% at 5 C",
        "saturation of KNO3 at 12 %",
        "convert 5 %w/w of KCl to %",
        "let strong = 12 %",
        "convert 10 ppm of KCl to mg/L",
    ] {
        let e = fault(text);
        assert!(
            matches!(e.kind, ParseErrorKind::AmbiguousUnit { .. }),
            "{text}: {e:?}"
        );
        let message = e.to_string();
        assert!(
            message.contains("%w/w") || message.contains("ppm w/w"),
            "{message}"
        );
    }
    let e = fault("ceiling of KCl from 2 C to 8 C margin 10 %w/w");
    assert!(matches!(
        e.kind,
        ParseErrorKind::WrongQuantity {
            expected: ValueKind::Margin,
            ..
        }
    ));
}

#[test]
fn hydrate_basis_in_convert() {
    let text = "convert 30 g/100g water of Na2SO4 as Na2SO4·10H2O to g/100g water";
    let Statement::Convert(s) = one(text) else {
        panic!()
    };
    assert_eq!(s.solute.text, "Na2SO4");
    assert_eq!(
        s.from_basis.as_ref().map(|n| n.text.as_str()),
        Some("Na2SO4·10H2O")
    );
    assert_eq!(s.to_basis, None);
    let Statement::Convert(s) =
        one("convert 20 g/100g water of Na2SO4 to mol/kg as Na2SO4·10H2O at 20 C")
    else {
        panic!()
    };
    assert!(s.to_basis.is_some() && s.temperature.is_some() && s.from_basis.is_none());
}

#[test]
fn solute_names_formula_slug_words() {
    for (text, name) in [
        ("describe (NH4)2SO4", "(NH4)2SO4"),
        ("describe Na2SO4·10H2O", "Na2SO4·10H2O"),
        ("describe potassium-nitrate", "potassium-nitrate"),
        (
            "describe magnesium   sulfate heptahydrate",
            "magnesium sulfate heptahydrate",
        ),
        ("describe 2-propanol", "2-propanol"),
    ] {
        let Statement::Describe(d) = one(text) else {
            panic!()
        };
        assert_eq!(d.solute.text, name);
    }
}

#[test]
fn extrapolate_and_reviewed_only_in_any_order() {
    for text in [
        "solubility of KNO3 at 120 C extrapolate reviewed only",
        "solubility of KNO3 at 120 C reviewed only extrapolate",
        "solubility of KNO3 at 120 C in mol/kg reviewed only extrapolate",
    ] {
        let Statement::Solubility(s) = one(text) else {
            panic!()
        };
        assert!(s.options.extrapolate && s.options.reviewed_only, "{text}");
    }
    let Statement::List(l) = one("list gases reviewed only") else {
        panic!()
    };
    assert!(l.options.reviewed_only);
}

#[test]
fn saturation_and_freezing_answer_in_a_temperature_unit() {
    let Statement::Saturation(s) = one("saturation temperature of KNO3 at 40 g/100g water in F")
    else {
        panic!()
    };
    assert_eq!(s.unit.map(|u| u.unit), Some(TemperatureUnit::Fahrenheit));
    let Statement::Freezing(f) = one("freezing of NaCl at 10 g/100g water in K") else {
        panic!()
    };
    assert_eq!(f.temperature, None);
    assert_eq!(f.unit.map(|u| u.unit), Some(TemperatureUnit::Kelvin));
}

#[test]
fn keywords_ignore_case() {
    let Statement::Solubility(s) = one("SOLUBILITY Of potassium nitrate AT 20 C IN mol/kg") else {
        panic!()
    };
    assert_eq!(s.solute.text, "potassium nitrate");
    assert!(matches!(
        one("Which Salts With Anion sulfate Stay Dissolved At 1 mol/kg From 2 C To 8 C Margin 5%"),
        Statement::Screen(_)
    ));
    assert!(matches!(one("LET Cold = 5 C"), Statement::Let(_)));
}

#[test]
fn comments_semicolons_and_blank_lines() {
    let text = "# a script\n\ndescribe NaCl ; sources of KCl   # trailing comment\n   \n;;\nlist salts # last";
    let kinds: Vec<&str> = parse_script(text)
        .into_iter()
        .map(|r| r.map(|s| s.node.kind()).unwrap_or("error"))
        .collect();
    assert_eq!(kinds, ["describe", "sources", "list"]);
    assert!(parse_script("# only a comment\n\n").is_empty());
    assert!(parse_script("").is_empty());
}

#[test]
fn crlf_line_ends() {
    let results = parse_script("describe NaCl\r\ndescribe KCl\r\n");
    assert_eq!(results.len(), 2);
    assert!(results.iter().all(Result::is_ok));
}

// ----------------------------------------------------------------------------------------
// let

#[test]
fn let_binds_temperatures_ranges_loadings_and_pressures() {
    let text = "let fridge = 4 C\nlet dose = 30 g/100g water\nlet room = 2 C to 25 C\nlet tank = 2 bar\n\
                which salts stay dissolved at dose over room margin 5%\n\
                solubility of KNO3 at fridge\n\
                dissolved CO2 at fridge under tank\n\
                ceiling of KCl at room\n\
                require KCl stays dissolved at dose over fridge";
    let results: Vec<Statement> = parse_script(text)
        .into_iter()
        .map(|r| match r {
            Ok(s) => s.node,
            Err(e) => panic!("{}", e.render(text, "let")),
        })
        .collect();
    let Statement::Screen(s) = &results[4] else {
        panic!()
    };
    assert!(close(s.loading.value, 30.0));
    assert_eq!(s.loading.span.text(text), "dose");
    assert!(matches!(s.temperatures, Temperatures::Range(r) if close(r.high.value, 25.0)));
    let Statement::Solubility(s) = &results[5] else {
        panic!()
    };
    assert!(close(point(s).value, 4.0));
    assert!(matches!(
        &results[6],
        Statement::DissolvedGas(DissolvedGas {
            pressure: Some(GasPressure::Partial(_)),
            ..
        })
    ));
    assert!(matches!(
        &results[7],
        Statement::Ceiling(Ceiling {
            temperatures: Temperatures::Range(_),
            ..
        })
    ));
    // A temperature where a range is wanted is a range of one point.
    assert!(matches!(
        &results[8],
        Statement::Require(Require {
            temperatures: Temperatures::At(_),
            ..
        })
    ));
}

#[test]
fn let_rebinds_copies_and_ignores_case() {
    let text =
        "let t = 5 C\nlet u = t\nlet t = 10 C\nsolubility of KNO3 at U\nsolubility of KNO3 at T";
    let temps: Vec<f64> = parse_script(text)
        .into_iter()
        .filter_map(|r| match r.ok()?.node {
            Statement::Solubility(s) => Some(point(&s).value),
            _ => None,
        })
        .collect();
    assert_eq!(temps, [5.0, 10.0]);
}

#[test]
fn a_failed_let_binds_nothing() {
    let results = parse_script("let cold = from 8 C to 2 C\nsolubility of KNO3 at cold");
    assert!(results[0].is_err());
    assert!(matches!(
        &results[1],
        Err(ParseError {
            kind: ParseErrorKind::UnboundName { .. },
            ..
        })
    ));
}

#[test]
fn the_repl_keeps_its_environment_between_calls() {
    let mut env = Env::new();
    let first = parse_with("let fridge = 4 C", &mut env);
    assert!(first[0].is_ok());
    assert!(env.get("FRIDGE").is_some());
    let second = parse_statement("solubility of KNO3 at fridge", &mut env);
    assert!(
        matches!(second, Ok(Located { node: Statement::Solubility(s), .. }) if close(point(&s).value, 4.0))
    );
    assert_eq!(env.names().collect::<Vec<_>>(), ["fridge"]);
}

#[test]
fn parse_statement_wants_exactly_one() {
    let mut env = Env::new();
    assert!(parse_statement("describe NaCl # comment", &mut env).is_ok());
    assert!(parse_statement("", &mut env).is_err());
    assert!(parse_statement("describe NaCl; describe KCl", &mut env).is_err());
}

// ----------------------------------------------------------------------------------------
// one test per class of error, with the input from the variant's doc comment

#[test]
fn error_unknown_statement() {
    let e = fault("solubilty of KNO3 at 20 C");
    assert_eq!(
        e.kind,
        ParseErrorKind::UnknownStatement {
            found: "solubilty".into(),
            suggestion: Some("solubility".into())
        }
    );
    assert_eq!(e.span, Span::new(0, 9));
    assert_eq!(
        e.to_string(),
        "expected a statement such as `solubility of KNO3 at 20 C`, found `solubilty`; did you mean `solubility`?"
    );
}

#[test]
fn error_expected_keyword() {
    let e = fault("solubility KNO3 at 20 C");
    assert_eq!(e.to_string(), "expected `of`, found `KNO3`");
    assert_eq!(e.span, Span::new(11, 15));
}

#[test]
fn error_expected_names_the_misspelt_keyword() {
    let e = fault("solubility of KNO3 att 20 C");
    assert_eq!(
        e.to_string(),
        "expected `at`, `from`, `between` or `over`, found `att`; did you mean `at`?"
    );
    let e = fault("which salts stay disolved at 30 g/100g water at 5 C");
    assert!(e.to_string().ends_with("did you mean `dissolved`?"), "{e}");
    let e = fault("which salts stay dissolved at 30 g/100g water form 2 C to 8 C");
    assert!(e.to_string().ends_with("did you mean `from`?"), "{e}");
    let e = fault("dissolved O2 at 25 C undr air");
    assert!(e.to_string().ends_with("did you mean `under`?"), "{e}");
    let e = fault("list salts with anoin sulfate");
    assert!(e.to_string().ends_with("did you mean `anion`?"), "{e}");
}

#[test]
fn error_expected_at_the_end_of_the_statement() {
    let e = fault("solubility of KNO3 at");
    assert_eq!(
        e.to_string(),
        "expected a temperature such as `5 C`, found the end of the statement"
    );
    assert_eq!(e.span, Span::new(21, 21));
}

#[test]
fn error_wrong_quantity() {
    let e = fault("solubility of KNO3 at 5 g/L");
    assert_eq!(
        e.kind,
        ParseErrorKind::WrongQuantity {
            expected: ValueKind::Temperature,
            found: "5 g/L".into(),
            found_kind: ValueKind::Loading
        }
    );
    assert!(
        e.to_string()
            .starts_with("expected a temperature such as `5 C`, found `5 g/L`")
    );
    assert_eq!(e.span, Span::new(22, 27));
}

#[test]
fn error_wrong_unit() {
    let e = fault("solubility of KNO3 at 20 C in F");
    assert!(matches!(
        e.kind,
        ParseErrorKind::WrongUnit {
            expected: ValueKind::Loading,
            found_kind: ValueKind::Temperature,
            ..
        }
    ));
}

#[test]
fn error_unknown_unit() {
    let e = fault("convert 20 g/100g water of KCl to mol/kgg");
    assert_eq!(
        e.kind,
        ParseErrorKind::UnknownUnit {
            expected: ValueKind::Loading,
            found: "mol/kgg".into(),
            suggestion: Some("mol/kg".into())
        }
    );
    let e = fault("solubility of KNO3 at 20 C in MOL/KG");
    assert!(e.to_string().ends_with("did you mean `mol/kg`?"), "{e}");
    let e = fault("solubility of KNO3 at 20 Q");
    assert!(matches!(
        e.kind,
        ParseErrorKind::UnknownUnit {
            suggestion: None,
            ..
        }
    ));
}

#[test]
fn error_missing_unit() {
    let e = fault("solubility of KNO3 at 20");
    assert_eq!(
        e.kind,
        ParseErrorKind::MissingUnit {
            expected: ValueKind::Temperature,
            number: "20".into()
        }
    );
}

#[test]
fn error_invalid_number() {
    let e = fault("solubility of KNO3 at 1e999 C");
    assert!(matches!(e.kind, ParseErrorKind::InvalidNumber { .. }));
}

#[test]
fn error_below_absolute_zero() {
    let e = fault("solubility of KNO3 at -300 C");
    assert!(matches!(e.kind, ParseErrorKind::BelowAbsoluteZero { .. }));
}

#[test]
fn error_reversed_range() {
    let e = fault("ceiling of KCl from 8 C to 2 C");
    assert_eq!(
        e.kind,
        ParseErrorKind::ReversedRange {
            low: "8 C".into(),
            high: "2 C".into()
        }
    );
}

#[test]
fn error_margin_out_of_range() {
    let e = fault("ceiling of KCl from 2 C to 8 C margin 120%");
    assert!(matches!(e.kind, ParseErrorKind::MarginOutOfRange { .. }));
}

#[test]
fn error_negative_amount() {
    let e = fault("saturation of KNO3 at -5 g/100g water");
    assert!(matches!(e.kind, ParseErrorKind::NegativeAmount { .. }));
    let e = fault("dissolved O2 at 25 C under -1 bar");
    assert!(matches!(e.kind, ParseErrorKind::NegativeAmount { .. }));
}

#[test]
fn error_unbound_name() {
    let e = fault("solubility of KNO3 at fridge");
    assert!(matches!(
        e.kind,
        ParseErrorKind::UnboundName {
            suggestion: None,
            ..
        }
    ));
    let e = fault(
        "let cold = from 2 C to 8 C\nrequire KCl stays dissolved at 20 g/100g water over cld",
    );
    assert_eq!(
        e.kind,
        ParseErrorKind::UnboundName {
            expected: ValueKind::TemperatureRange,
            name: "cld".into(),
            suggestion: Some("cold".into())
        }
    );
}

#[test]
fn a_unit_where_a_value_belongs_is_not_an_unbound_name() {
    let e = fault("convert bar of KCl to mol/kg");
    assert_eq!(
        e.to_string(),
        "expected a loading such as `30 g/100g water`, found `bar`"
    );
}

#[test]
fn error_name_kind_mismatch() {
    let e = fault("let dose = 20 g/100g water\nsolubility of KNO3 at dose");
    assert_eq!(
        e.kind,
        ParseErrorKind::NameKindMismatch {
            expected: ValueKind::Temperature,
            name: "dose".into(),
            bound: ValueKind::Loading
        }
    );
    assert_eq!(e.span, Span::new(49, 53));
}

#[test]
fn error_reserved_name() {
    let e = fault("let at = 5 C");
    assert_eq!(e.kind, ParseErrorKind::ReservedName { name: "at".into() });
    let e = fault("let K = 5 C");
    assert!(matches!(e.kind, ParseErrorKind::ReservedName { .. }));
}

#[test]
fn error_liquid_not_unit() {
    let e = fault("dissolved O2 at 25 C in water");
    assert!(matches!(&e.kind, ParseErrorKind::LiquidNotUnit { found, .. } if found == "water"));
    assert_eq!(e.kind.code(), "liquid-not-unit");
    assert!(e.to_string().contains("or a recipe"), "{e}");
    let e = fault("dissolved O2 in water at 25 C");
    assert!(
        e.to_string()
            .starts_with("`in water` names a liquid, not a unit"),
        "{e}"
    );
    // Elsewhere `in` is still a unit's word, with its own message.
    let e = fault("solubility of KNO3 at 20 C in water");
    assert_eq!(e.kind.code(), "unknown-unit");
}

#[test]
fn a_recipe_where_one_solute_is_asked_names_the_statements_that_take_one() {
    for text in [
        "ceiling of recipe 10 %w/w KNO3 from 0 C to 25 C",
        "solubility of recipe 10 %w/w KNO3 at 20 C",
        "let r = recipe 10 %w/w KNO3\nheat of solution of r at 25 C",
        "plot KNO3, recipe 10 %w/w KNO3 from 0 C to 40 C",
    ] {
        let e = fault(text);
        assert!(
            e.to_string()
                .starts_with("expected a solute: this statement is asked of solutes, not of a recipe; a recipe is asked with `require`"),
            "{text}: {e}"
        );
    }
    // Those that take a recipe still read it.
    assert!(matches!(
        one("saturation of recipe 10 %w/w KNO3"),
        Statement::Recipe(_)
    ));
}

#[test]
fn error_duplicate_clause() {
    let e = fault("ceiling of KCl from 2 C to 8 C margin 10% margin 5%");
    assert_eq!(
        e.kind,
        ParseErrorKind::DuplicateClause {
            clause: "margin".into()
        }
    );
}

#[test]
fn typeset_minus_and_decimal_comma() {
    let Statement::Freezing(f) = one("freezing of NaCl at 10 g/100g water at −10 C") else {
        panic!()
    };
    assert!(close(f.temperature.map_or(0.0, |t| t.value), -10.0));
    let e = fault("which solutes stay dissolved at 1,5 mol/kg at 5 C");
    assert_eq!(
        e.to_string(),
        "expected a number with a decimal point, such as `1.5`, found `1,5`; did you mean `1.5`?"
    );
}

#[test]
fn error_trailing_words() {
    let e = fault("describe NaCl in mol/kg");
    assert_eq!(
        e.to_string(),
        "expected `reviewed only` or the end of the statement, found `in`"
    );
}

#[test]
fn every_error_of_a_script_is_reported() {
    let text = "describe NaCl\nsolubility of KNO3 at 5 g/L\nlist salts\nsaturation of KNO3 at 20 C";
    let results = parse_script(text);
    let lines: Vec<Option<usize>> = results
        .iter()
        .map(|r| r.as_ref().err().map(|e| e.line_column(text).0))
        .collect();
    assert_eq!(lines, [None, Some(2), None, Some(4)]);
}

// ----------------------------------------------------------------------------------------
// rendering

#[test]
fn caret_on_line_three_after_multi_byte_characters() {
    let text =
        "# ünïcödé comment\nsolubility of KNO3 at 20 °C\nsolubility of Na2SO4·10H2O at 5 g/L\n";
    let e = fault(text);
    let (line, column) = e.line_column(text);
    assert_eq!((line, column), (3, 31));
    let shown = e.render(text, "script.satq");
    let expected = "» solubility of Na2SO4·10H2O at 5 g/L\n\
                    \x20                               ‾‾‾‾‾ script.satq, line 3, column 31\n  \
                    not read: expected a temperature such as `5 C`, found `5 g/L`, which is a \
                    loading\n";
    assert_eq!(shown, expected);
}

#[test]
fn caret_at_the_end_of_a_line_for_a_missing_value() {
    let text = "describe NaCl\nsolubility of KNO3 at\n";
    let shown = fault(text).render(text, "x");
    assert!(shown.contains("x, line 2, column 22"), "{shown}");
    assert!(
        shown.starts_with("» solubility of KNO3 at\n                       ‾ x, line 2"),
        "{shown}"
    );
}

#[test]
fn a_statement_after_a_semicolon_has_its_own_column() {
    let text = "describe NaCl; solubility of KNO3 at 5 g/L";
    let e = fault(text);
    assert_eq!(e.line_column(text), (1, 38));
}

// ----------------------------------------------------------------------------------------
// plot (issue 8)

#[test]
fn plot_of_two_solutes_over_a_range() {
    let text = "plot KNO3, KCl from 0 C to 100 C";
    let Statement::Plot(p) = one(text) else {
        panic!()
    };
    let names: Vec<&str> = p.solutes.iter().map(|n| n.text.as_str()).collect();
    assert_eq!(names, ["KNO3", "KCl"]);
    assert_eq!(p.solutes[0].span, Span::new(5, 9));
    assert_eq!(p.solutes[1].span, Span::new(11, 14));
    let range = p.range.unwrap();
    assert!(close(range.low.celsius(), 0.0) && close(range.high.celsius(), 100.0));
    assert_eq!(range.span.text(text), "from 0 C to 100 C");
    assert_eq!(
        (p.unit, &p.loading, p.margin, &p.pressure),
        (None, &None, None, &None)
    );
}

#[test]
fn plot_spellings() {
    let Statement::Plot(p) = one("plot potassium nitrate and KCl,NaCl , sucrose in mol/kg") else {
        panic!()
    };
    let names: Vec<&str> = p.solutes.iter().map(|n| n.text.as_str()).collect();
    // A comma inside a word belongs to the name (`1,2-ethanediol`).
    assert_eq!(names, ["potassium nitrate", "KCl,NaCl", "sucrose"]);
    assert_eq!(p.range, None);
    assert_eq!(p.unit.map(|u| u.unit), Some(CompositionUnit::Molality));

    let text = "plot KCl from 0 C to 40 C with loading 30 g/100g water from 2 C to 8 C margin 10%";
    let Statement::Plot(p) = one(text) else {
        panic!()
    };
    let loading = p.loading.unwrap();
    assert!(close(loading.loading.value, 30.0));
    assert!(
        matches!(loading.temperatures, Some(Temperatures::Range(r)) if close(r.high.celsius(), 8.0))
    );
    assert_eq!(
        loading.span.text(text),
        "with loading 30 g/100g water from 2 C to 8 C"
    );
    assert!(close(p.margin.unwrap().percent, 10.0));

    let Statement::Plot(p) = one("plot O2, N2 from 0 C to 40 C under air at 2 bar extrapolate")
    else {
        panic!()
    };
    assert!(matches!(
        p.pressure,
        Some(GasPressure::Mixture { ref mixture, total: Some(t) }) if mixture.text == "air" && t.unit == PressureUnit::Bar
    ));
    assert!(p.options.extrapolate);

    let mut env = Env::new();
    parse_statement("let cold = from 2 C to 8 C", &mut env).unwrap();
    let Statement::Plot(p) = parse_statement("PLOT KCl over cold reviewed only", &mut env)
        .unwrap()
        .node
    else {
        panic!()
    };
    assert!(close(p.range.unwrap().low.celsius(), 2.0));
    assert!(p.options.reviewed_only);
}

#[test]
fn plot_errors() {
    // No solute.
    let e = fault("plot from 0 C to 100 C");
    assert_eq!(e.kind.code(), "expected");
    assert!(e.to_string().starts_with("expected a solute"), "{e}");
    // A misspelt `from`.
    let e = fault("plot KNO3 form 0 C to 100 C");
    assert!(e.to_string().contains("did you mean `from`?"), "{e}");
    assert_eq!(e.span, Span::new(10, 14));
    // A range written backwards.
    assert_eq!(
        fault("plot KNO3 from 100 C to 0 C").kind.code(),
        "reversed-range"
    );
    // One temperature where a range is wanted.
    let e = fault("let fridge = 4 C\nplot KNO3 over fridge");
    assert!(e.to_string().contains("a temperature range"), "{e}");
    // A loading of the wrong kind, and a margin without a loading.
    assert_eq!(
        fault("plot KCl from 0 C to 40 C with loading 5 C")
            .kind
            .code(),
        "wrong-quantity"
    );
    let e = fault("plot KCl from 0 C to 40 C margin 10%");
    assert!(e.to_string().contains("`with loading ...`"), "{e}");
    // `with` must be followed by `loading`.
    let e = fault("plot KCl from 0 C to 40 C with lodaing 30 g/100g water");
    assert!(e.to_string().contains("did you mean `loading`?"), "{e}");
    // A clause twice, and an unknown unit.
    assert_eq!(
        fault("plot KCl in mol/kg in %w/w").kind.code(),
        "duplicate-clause"
    );
    assert_eq!(fault("plot KCl in mol/kgg").kind.code(), "unknown-unit");
    // Words that are no clause.
    let e = fault("plot KCl from 0 C to 40 C at 5 C");
    assert!(e.to_string().contains("`in`, `with`"), "{e}");
    // `plot` is a word of the language.
    assert_eq!(fault("let plot = 5 C").kind.code(), "reserved-name");
}

#[test]
fn a_closing_clause_written_too_early_is_told_where_it_goes() {
    for (text, word) in [
        (
            "require recipe 1.5 %w/v boric acid assuming density 1.000 kg/L stays dissolved from 2 C to 8 C",
            "assuming",
        ),
        (
            "which solids form in recipe 10 %w/w NaCl extrapolate from 2 C to 8 C",
            "extrapolate",
        ),
        (
            "require KCl stays dissolved margin 10% at 20 g/100g water from 2 C to 8 C",
            "margin",
        ),
    ] {
        let e = fault(text);
        assert_eq!(e.kind.code(), "expected", "{text}");
        assert!(
            e.to_string().contains(&format!(
                "(`{word}` goes at the end of the statement), found `{word}`"
            )),
            "{text}: {e}"
        );
    }
    // Where the word is expected, nothing is added.
    let e = fault("require KCl stays dissolved at 20 g/100g water from 2 C to 8 C margin");
    assert!(!e.to_string().contains("goes at the end"), "{e}");
}

#[test]
fn a_dissolved_gas_takes_a_recipe_as_its_liquid() {
    let liquid = |text: &str| match one(text) {
        Statement::DissolvedGas(d) => (
            d.liquid.map(|r| r.ingredients.len()),
            d.unit.map(|u| u.unit),
        ),
        other => panic!("{other:?}"),
    };
    assert_eq!(
        liquid("dissolved O2 at 25 C in recipe 0.9 %w/v NaCl"),
        (Some(1), None)
    );
    assert_eq!(
        liquid("dissolved O2 at 25 C in recipe 137 mM NaCl, 2.7 mM KCl in mg/L under air"),
        (Some(2), Some(CompositionUnit::MilligramsPerLitre))
    );
    assert_eq!(
        liquid("dissolved O2 in mg/L at 25 C"),
        (None, Some(CompositionUnit::MilligramsPerLitre))
    );
    let mut results = parse_script(
        "let saline = recipe 0.9 %w/v NaCl\ndissolved CO2 at 4 C under 2 bar in saline in g/L",
    )
    .into_iter();
    assert!(results.next().is_some_and(|r| r.is_ok()));
    match results.next().map(|r| r.map(|s| s.node)) {
        Some(Ok(Statement::DissolvedGas(d))) => {
            assert_eq!(
                d.liquid.and_then(|r| r.name).map(|n| n.text),
                Some("saline".into())
            );
        }
        other => panic!("{other:?}"),
    }
    let e = fault("dissolved O2 at 25 C in recipe 0.9 %w/v NaCl in recipe 1 %w/w KCl");
    assert_eq!(e.kind.code(), "duplicate-clause");
}
