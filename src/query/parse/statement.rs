//! Statements: one rule per statement word, dispatched from the first word.

use nom::{Parser, character::complete::char, combinator::cut, error::context, sequence::preceded};

use super::super::ast::*;
use super::super::error::ParseErrorKind;
use super::super::lexicon::{STATEMENT_WORDS, ends_name, is_keyword, nearest, one_of};
use super::clause::*;
use super::plumbing::*;
use super::quantity::*;
use super::recipe;
use crate::science::units::TemperatureUnit;

// ---------------------------------------------------------------------------------------
// statements

pub(super) fn statement<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let t = skip(i);
    let (word, after) = next_word(t);
    match word.to_lowercase().as_str() {
        "solubility" => solubility(cx, after),
        "which" if recipe::asks_solids(after) => recipe::solids_form(cx, after),
        "which" => screen(cx, after),
        "saturation" => saturation(cx, after),
        "ceiling" => ceiling(cx, after),
        "max" | "maximum" => maximum(cx, after),
        "heat" => heat_of_solution(cx, after),
        "dissolving" => super::dissolving::dissolving(cx, after),
        "dissolved" => dissolved(cx, after),
        "freezing" => freezing(cx, after),
        "convert" => convert(cx, after),
        "describe" => describe(cx, after),
        "sources" => sources(cx, after),
        "list" => list(cx, after),
        "let" => binding(cx, after),
        "require" => require(cx, after),
        "plot" => plot(cx, after),
        "ph" => recipe::ph(cx, after),
        _ => {
            let (span, found) = found_at(cx, t);
            let found = found.unwrap_or_default();
            Err(failure(
                ParseErrorKind::UnknownStatement {
                    suggestion: nearest(&found, &STATEMENT_WORDS).map(str::to_string),
                    found,
                },
                span,
            ))
        }
    }
}

pub(super) fn solubility<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["at", "from", "between", "over"])?;
    const CLAUSES: [Clause; 4] = [Clause::InComposition, Clause::Every, DATA[0], DATA[1]];
    let (i, (temperatures, tail)) = with_clauses(cx, i, &CLAUSES, solubility_temperatures)?;
    Ok((
        i,
        Statement::Solubility(Solubility {
            solute,
            temperatures,
            every: tail.every,
            unit: tail.composition,
            options: tail.options,
        }),
    ))
}

/// `at T` as before, or a range for a table (`from T1 to T2`, `between ...`, `over NAME`).
fn solubility_temperatures<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Temperatures> {
    let t = skip(i);
    if let Some(range) = range_here(cx, t) {
        let (rest, range) = range?;
        return Ok((rest, Temperatures::Range(range)));
    }
    if has_keyword(t, "over").is_some() {
        return temperatures(cx, t);
    }
    if has_keyword(t, "at").is_none() {
        return Err(expected_here(
            cx,
            t,
            "`at` and a temperature, or `from` and a range".into(),
            &["at", "from", "over"],
        ));
    }
    let (rest, temperature) = at(committed_temperature)(cx, t)?;
    Ok((rest, Temperatures::At(temperature)))
}

/// The clauses a screening or a `require` may close with, before or after its temperatures.
const SCREEN_CLAUSES: [Clause; 3] = [Clause::Margin, DATA[0], DATA[1]];

/// `stay(s) dissolved at LOADING TEMPERATURES`, with the closing clauses (which may also
/// stand between the loading and the temperatures).
pub(super) fn stays_dissolved_at<'a>(
    cx: Cx<'a>,
    i: &'a str,
) -> R<'a, (Loading, Temperatures, Tail)> {
    let (i, _) = expect(cx, i, &["stay", "stays"])?;
    let (i, _) = expect(cx, i, &["dissolved"])?;
    let (i, _) = expect(cx, i, &["at"])?;
    let (i, loading) = committed_loading(cx, i)?;
    let (i, (temperatures, tail)) = with_clauses(cx, i, &SCREEN_CLAUSES, temperatures)?;
    Ok((i, (loading, temperatures, tail)))
}

/// `at` and what `value` reads after it.
fn at<'a, T>(
    value: impl FnOnce(Cx<'a>, &'a str) -> R<'a, T>,
) -> impl FnOnce(Cx<'a>, &'a str) -> R<'a, T> {
    move |cx, i| {
        let (i, _) = expect(cx, i, &["at"])?;
        value(cx, i)
    }
}

pub(super) fn committed_loading<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Loading> {
    cut(context(ValueKind::Loading.example(), |x| loading(cx, x))).parse(i)
}

pub(super) fn screen<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, class) = class(cx, i)?;
    let (i, filters) = filters(cx, i)?;
    let (i, (loading, temperatures, tail)) = stays_dissolved_at(cx, i)?;
    Ok((
        i,
        Statement::Screen(Screen {
            class,
            filters,
            loading,
            temperatures,
            margin: tail.margin,
            options: tail.options,
        }),
    ))
}

pub(super) fn require<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    if let (rest, Some(r)) = recipe::subject(cx, i)? {
        return recipe::require(cx, r, rest);
    }
    let (i, solute) = solute(cx, i, &["stays", "stay"])?;
    let (i, (loading, temperatures, tail)) = stays_dissolved_at(cx, i)?;
    Ok((
        i,
        Statement::Require(Require {
            solute,
            loading,
            temperatures,
            margin: tail.margin,
            options: tail.options,
        }),
    ))
}

pub(super) fn saturation<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let i = has_keyword(i, "temperature").unwrap_or(i);
    let (i, _) = expect(cx, i, &["of"])?;
    if let (rest, Some(r)) = recipe::subject(cx, i)? {
        return recipe::saturation(cx, r, rest);
    }
    let (i, solute) = solute(cx, i, &["at"])?;
    const CLAUSES: [Clause; 3] = [Clause::InTemperature, DATA[0], DATA[1]];
    let (i, (loading, tail)) = with_clauses(cx, i, &CLAUSES, at(committed_loading))?;
    Ok((
        i,
        Statement::Saturation(Saturation {
            solute,
            loading,
            unit: tail.temperature,
            options: tail.options,
        }),
    ))
}

pub(super) fn ceiling<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["at", "from", "over"])?;
    const CLAUSES: [Clause; 4] = [Clause::Margin, Clause::InComposition, DATA[0], DATA[1]];
    let (i, (temperatures, tail)) = with_clauses(cx, i, &CLAUSES, temperatures)?;
    Ok((
        i,
        Statement::Ceiling(Ceiling {
            solute,
            temperatures,
            margin: tail.margin,
            unit: tail.composition,
            options: tail.options,
        }),
    ))
}

/// `max of KCl from 2 C to 8 C`, `maximum loading of ...`, `max safe loading of ...`: the
/// same statement as `ceiling of`. `max solubility` is refused with a hint: over a range
/// the largest solubility is not the largest loading that stays dissolved.
pub(super) fn maximum<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let t = skip(i);
    let (next, after) = next_word(t);
    if next.eq_ignore_ascii_case("solubility") {
        return Err(failure(
            ParseErrorKind::Expected {
                expected: "`loading of` (the largest loading that stays dissolved over the \
                           range, the same as `ceiling of`)"
                    .into(),
                found: Some(shorten(next)),
                suggestion: Some("loading".into()),
            },
            cx.span(t, after),
        ));
    }
    let i = has_keyword(i, "safe").unwrap_or(i);
    let i = has_keyword(i, "loading")
        .or_else(|| has_keyword(i, "concentration"))
        .unwrap_or(i);
    ceiling(cx, i)
}

pub(super) fn heat_of_solution<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, _) = expect(cx, i, &["solution"])?;
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["at"])?;
    let (i, lead) = lead(cx, i, &DATA)?;
    // Without `at`, the tables' standard temperature, 25 C.
    let (i, temperature) = match has_keyword(i, "at") {
        Some(_) => {
            let (r, t) = at(committed_temperature)(cx, i)?;
            (r, Some(t))
        }
        None => (i, None),
    };
    let earlier: &[&'static str] = if temperature.is_none() { &["at"] } else { &[] };
    let (i, tail) = tail_after(cx, i, &DATA, earlier, lead)?;
    let stated = temperature.is_some();
    let temperature = temperature.unwrap_or(Temperature {
        value: 25.0,
        unit: TemperatureUnit::Celsius,
        span: solute.span,
    });
    Ok((
        i,
        Statement::HeatOfSolution(HeatOfSolution {
            solute,
            temperature,
            stated,
            options: tail.options,
        }),
    ))
}

pub(super) const MIXTURE: &str = "a pressure such as `0.21 bar` or a gas mixture such as `air`";

/// After `under`: `0.21 bar`, `2 bar of air`, `air`, `air at 2 bar`.
pub(super) fn gas_pressure<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, GasPressure> {
    let t = skip(i);
    let (word, _) = next_word(t);
    let bound_pressure = matches!(cx.env.get(word), Some(Value::Pressure(_)));
    if starts_number(t) || bound_pressure {
        let (rest, p) = pressure(cx, t)?;
        if let Some(after) = has_keyword(rest, "of") {
            let (rest, mixture) =
                cut(context("a gas mixture such as `air`", |x| name(cx, x, &[]))).parse(after)?;
            return Ok((
                rest,
                GasPressure::Mixture {
                    mixture,
                    total: Some(p),
                },
            ));
        }
        return Ok((rest, GasPressure::Partial(p)));
    }
    let (rest, mixture) = cut(context(MIXTURE, |x| name(cx, x, &["at"]))).parse(t)?;
    // `air at 2 bar` is the mixture's total pressure; `air at 4 C` leaves the `at` and its
    // temperature to the statement.
    let at_pressure = has_keyword(rest, "at").filter(|after| names_pressure(cx, after));
    let (rest, total) = match at_pressure {
        Some(after) => {
            let (r, p) =
                cut(context(ValueKind::Pressure.example(), |x| pressure(cx, x))).parse(after)?;
            (r, Some(p))
        }
        None => (rest, None),
    };
    Ok((rest, GasPressure::Mixture { mixture, total }))
}

/// True when a pressure (a number with a pressure unit, or a name bound to one) stands at
/// `i`.
fn names_pressure(cx: Cx, i: &str) -> bool {
    let t = skip(i);
    if starts_number(t) {
        return number_text(t).is_ok_and(|(after, _)| {
            unit_at(after).is_some_and(|m| matches!(m.unit, AnyUnit::Pressure(_)))
        });
    }
    let (word, _) = next_word(t);
    matches!(cx.env.get(word), Some(Value::Pressure(_)))
}

/// `dissolved GAS at T`, with `under`, `in` and the data flags before or after `at T`.
pub(super) fn dissolved<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    const CLAUSES: [Clause; 4] = [Clause::Under, Clause::InComposition, DATA[0], DATA[1]];
    let (i, gas) = cut(context("a gas such as `O2`", |x| name(cx, x, &["at"]))).parse(i)?;
    let (i, (temperature, tail)) = with_clauses(cx, i, &CLAUSES, at(committed_temperature))?;
    Ok((
        i,
        Statement::DissolvedGas(DissolvedGas {
            gas,
            temperature,
            pressure: tail.pressure,
            unit: tail.composition,
            liquid: tail.liquid,
            options: tail.options,
        }),
    ))
}

pub(super) fn freezing<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    // `freezing point of ...` reads the same as `freezing of ...`.
    let i = has_keyword(i, "point").unwrap_or(i);
    let (i, _) = expect(cx, i, &["of"])?;
    if let (rest, Some(r)) = recipe::subject(cx, i)? {
        return recipe::freezing(cx, r, rest);
    }
    let (i, solute) = solute(cx, i, &["at"])?;
    let (i, lead) = lead(cx, i, &[Clause::InTemperature, DATA[0], DATA[1]])?;
    let (i, _) = expect(cx, i, &["at"])?;
    let (i, loading) = committed_loading(cx, i)?;
    let (i, temperature) = match has_keyword(i, "at") {
        Some(after) => {
            let (r, t) = committed_temperature(cx, after)?;
            (r, Some(t))
        }
        None => (i, None),
    };
    let earlier: &[&'static str] = if temperature.is_none() { &["at"] } else { &[] };
    let clauses = [Clause::InTemperature, DATA[0], DATA[1]];
    let (i, tail) = tail_after(cx, i, &clauses, earlier, lead)?;
    Ok((
        i,
        Statement::Freezing(Freezing {
            solute,
            loading,
            temperature,
            unit: tail.temperature,
            options: tail.options,
        }),
    ))
}

pub(super) const HYDRATE: &str = "a solid such as `Na2SO4·10H2O`";

pub(super) fn convert<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, loading) = committed_loading(cx, i)?;
    let (i, _) = expect(cx, i, &["of"])?;
    let (i, solute) = solute(cx, i, &["to", "as"])?;
    let (i, from_basis) = match has_keyword(i, "as") {
        Some(after) => {
            let (r, n) = cut(context(HYDRATE, |x| name(cx, x, &["to"]))).parse(after)?;
            (r, Some(n))
        }
        None => (i, None),
    };
    let (i, _) = expect(cx, i, &["to"])?;
    let (i, to) = composition_unit(cx, i)?;
    let (i, to_basis) = match has_keyword(i, "as") {
        Some(after) => {
            let (r, n) = cut(context(HYDRATE, |x| name(cx, x, &["at"]))).parse(after)?;
            (r, Some(n))
        }
        None => (i, None),
    };
    let (i, temperature) = match has_keyword(i, "at") {
        Some(after) => {
            let (r, t) = committed_temperature(cx, after)?;
            (r, Some(t))
        }
        None => (i, None),
    };
    let mut earlier: Vec<&'static str> = Vec::new();
    if to_basis.is_none() {
        earlier.push("as");
    }
    if temperature.is_none() {
        earlier.push("at");
    }
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], &earlier)?;
    Ok((
        i,
        Statement::Convert(Convert {
            loading,
            solute,
            from_basis,
            to,
            to_basis,
            temperature,
            options: tail.options,
        }),
    ))
}

pub(super) fn describe<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    if let (rest, Some(r)) = recipe::subject(cx, i)? {
        return recipe::describe(cx, r, rest);
    }
    let (i, solute) = solute(cx, i, &[])?;
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], &[])?;
    Ok((
        i,
        Statement::Describe(Describe {
            solute,
            options: tail.options,
        }),
    ))
}

pub(super) fn sources<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, solute) = match has_keyword(i, "of") {
        Some(after) => {
            let (r, n) = solute(cx, after, &[])?;
            (r, Some(n))
        }
        None => (i, None),
    };
    let earlier: &[&'static str] = if solute.is_none() { &["of"] } else { &[] };
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], earlier)?;
    Ok((
        i,
        Statement::Sources(Sources {
            solute,
            options: tail.options,
        }),
    ))
}

pub(super) fn list<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, class) = class(cx, i)?;
    let (i, filters) = filters(cx, i)?;
    let earlier: &[&'static str] = if filters.is_empty() {
        &["with"]
    } else {
        &["and"]
    };
    let (i, tail) = tail(cx, i, &[Clause::ReviewedOnly], earlier)?;
    Ok((
        i,
        Statement::List(List {
            class,
            filters,
            options: tail.options,
        }),
    ))
}

pub(super) const LET_VALUE: &str =
    "a temperature, a range such as `from 2 C to 8 C`, a loading or a pressure";

pub(super) fn binding<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let t = skip(i);
    let (word, after) = next_word(t);
    if !is_name_of_own(word) {
        return Err(expected_here(
            cx,
            t,
            "a name such as `cold` (a letter, then letters, digits, `_` or `-`)".into(),
            &[],
        ));
    }
    let span = cx.span(t, after);
    if is_keyword(word) || classify(word).is_some() {
        return Err(failure(
            ParseErrorKind::ReservedName {
                name: shorten(word),
            },
            span,
        ));
    }
    let name = Name {
        text: word.to_string(),
        span,
    };
    let rest = match preceded(blanks, char::<&str, PErr>('=')).parse(after) {
        Ok((rest, _)) => rest,
        Err(_) => return Err(expected_here(cx, after, "`=`".into(), &[])),
    };
    if let Some(after) = has_keyword(rest, "recipe") {
        return recipe::define(cx, name, skip(rest), after);
    }
    let (rest, value) = cut(context(LET_VALUE, |x| let_value(cx, x))).parse(rest)?;
    let (rest, _) = tail(cx, rest, &[], &[])?;
    Ok((rest, Statement::Let(Let { name, value })))
}

pub(super) fn let_value<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Value> {
    let t = skip(i);
    if let Some(range) = range_here(cx, t) {
        let (rest, range) = range?;
        return Ok((rest, Value::Range(range)));
    }
    if starts_number(t) {
        let (rest, q) = quantity(cx, t, ValueKind::Temperature)?;
        return match q.unit {
            AnyUnit::Temperature(unit) => {
                let low = checked_temperature(&q, unit)?;
                // `let cold = 2 C to 8 C` reads as a range too.
                let Some(after) = has_keyword(rest, "to") else {
                    return Ok((rest, Value::Temperature(low)));
                };
                let (rest, high) = committed_temperature(cx, after)?;
                let range = ordered_range(cx, low, high, cx.span(t, rest))?;
                Ok((rest, Value::Range(range)))
            }
            AnyUnit::Percent => Err(wrong_quantity(ValueKind::Loading, &q)),
            AnyUnit::Composition(_) | AnyUnit::Pressure(_) if q.value < 0.0 => Err(negative(&q)),
            AnyUnit::Composition(unit) => Ok((
                rest,
                Value::Loading(Loading {
                    value: q.value,
                    unit,
                    span: q.span,
                }),
            )),
            AnyUnit::Pressure(unit) => Ok((
                rest,
                Value::Pressure(Pressure {
                    value: q.value,
                    unit,
                    span: q.span,
                }),
            )),
        };
    }
    // Another name: the new one gets a copy of its value.
    let (rest, (_, value)) = resolve(cx, t, ValueKind::Temperature)?;
    Ok((rest, value))
}

/// After `plot`: solute names separated by `,` (a comma ending a word, or standing alone)
/// or `and`. A comma inside a word belongs to the name (`1,2-ethanediol`).
pub(super) fn solute_list<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Vec<Name>> {
    const FOLLOWERS: [&str; 4] = ["from", "over", "with", "under"];
    let mut names = Vec::new();
    let mut rest = i;
    loop {
        not_a_recipe(cx, rest)?;
        let begin = skip(rest);
        let ends = |w: &str| ends_name(w) || ends_as_number(w);
        let misspelt_follower = |t: &'a str, word: &'a str, after: &'a str| {
            if word.chars().count() < 2 {
                return Ok(());
            }
            let Some(meant) = nearest(word, &FOLLOWERS) else {
                return Ok(());
            };
            let next = skip(after);
            let (following, _) = next_word(next);
            if starts_number(next) || is_keyword(following) {
                return Err(failure(
                    ParseErrorKind::Expected {
                        expected: one_of(&FOLLOWERS),
                        found: Some(shorten(word)),
                        suggestion: Some(meant.to_string()),
                    },
                    cx.span(t, after),
                ));
            }
            Ok(())
        };
        let (words, end, cursor, comma) = listed_name(begin, ends, misspelt_follower)?;
        if words.is_empty() {
            return Err(expected_here(cx, begin, SOLUTE.into(), &[]));
        }
        names.push(Name {
            text: words.join(" "),
            span: cx.span(begin, end),
        });
        if comma {
            rest = cursor;
        } else if let Some(after) = has_keyword(cursor, "and") {
            rest = after;
        } else {
            return Ok((cursor, names));
        }
    }
}

/// `plot KNO3, KCl from 0 C to 100 C ...`: the solutes, an optional range, then the
/// clauses in any order.
pub(super) fn plot<'a>(cx: Cx<'a>, i: &'a str) -> R<'a, Statement> {
    let (i, solutes) = solute_list(cx, i)?;
    let t = skip(i);
    let (mut rest, range) = if let Some(range) = range_here(cx, t) {
        let (r, range) = range?;
        (r, Some(range))
    } else if let Some(after) = has_keyword(t, "over") {
        if opens_range(after) {
            let (r, range) = range_from(cx, after)?;
            (r, Some(range))
        } else {
            let want = ValueKind::TemperatureRange;
            match cut(context(want.example(), |x| point_or_range(cx, x, want))).parse(after)? {
                (r, Temperatures::Range(range)) => (r, Some(range)),
                (r, Temperatures::At(_)) => {
                    let at = skip(after);
                    return Err(failure(
                        ParseErrorKind::Expected {
                            expected: want.example().into(),
                            found: Some(cx.text(cx.span(at, r))),
                            suggestion: None,
                        },
                        cx.span(at, r),
                    ));
                }
            }
        }
    } else {
        (t, None)
    };
    let mut unit = None;
    let mut loading: Option<PlotLoading> = None;
    let mut margin_clause = None;
    let mut pressure = None;
    let mut ice = None;
    let mut options = Options::default();
    loop {
        let t = skip(rest);
        if t.is_empty() {
            break;
        }
        let (word, after) = next_word(t);
        match word.to_lowercase().as_str() {
            "in" => {
                if unit.is_some() {
                    return Err(duplicate(cx, t, after, "in"));
                }
                let (r, u) = composition_unit(cx, after)?;
                unit = Some(u);
                rest = r;
            }
            "with" if has_keyword(after, "ice").is_some() => {
                if ice.is_some() {
                    return Err(duplicate(cx, t, after, "with ice"));
                }
                let r = has_keyword(after, "ice").unwrap_or(after);
                let r = has_keyword(r, "line").unwrap_or(r);
                ice = Some(cx.span(t, r));
                rest = r;
            }
            "with" => {
                if loading.is_some() {
                    return Err(duplicate(cx, t, after, "with loading"));
                }
                let (r, _) = expect(cx, after, &["loading", "ice"])?;
                let (r, amount) = committed_loading(cx, r)?;
                let at = skip(r);
                let (r, temperatures) = if ["at", "from", "between", "over"]
                    .iter()
                    .any(|w| has_keyword(at, w).is_some())
                    || bare_range(cx, at).is_some()
                {
                    let (r, temps) = temperatures(cx, at)?;
                    (r, Some(temps))
                } else {
                    (r, None)
                };
                loading = Some(PlotLoading {
                    loading: amount,
                    temperatures,
                    span: cx.span(t, r),
                });
                rest = r;
            }
            "margin" => {
                if margin_clause.is_some() {
                    return Err(duplicate(cx, t, after, "margin"));
                }
                let (r, m) =
                    cut(context(ValueKind::Margin.example(), |x| margin(cx, x))).parse(after)?;
                margin_clause = Some(m);
                rest = r;
            }
            "under" => {
                if pressure.is_some() {
                    return Err(duplicate(cx, t, after, "under"));
                }
                let (r, p) = gas_pressure(cx, after)?;
                pressure = Some(p);
                rest = r;
            }
            "extrapolate" => {
                if options.extrapolate {
                    return Err(duplicate(cx, t, after, "extrapolate"));
                }
                options.extrapolate = true;
                rest = after;
            }
            "reviewed" => {
                let (r, _) = expect(cx, after, &["only"])?;
                if options.reviewed_only {
                    return Err(duplicate(cx, t, r, "reviewed only"));
                }
                options.reviewed_only = true;
                rest = r;
            }
            _ => {
                let mut words: Vec<&'static str> = Vec::new();
                if range.is_none() {
                    words.extend(["from", "over"]);
                }
                words.extend(["in", "with", "margin", "under", "extrapolate", "reviewed"]);
                let shown = as_shown(&words);
                let expected = format!(
                    "{} or the end of the statement",
                    one_of(&shown).replace(" or ", ", ")
                );
                return Err(expected_here(cx, t, expected, &words));
            }
        }
    }
    if let (Some(m), None) = (&margin_clause, &loading) {
        return Err(failure(
            ParseErrorKind::Expected {
                expected: "`with loading ...` for the margin to apply to".into(),
                found: Some(cx.text(m.span)),
                suggestion: None,
            },
            m.span,
        ));
    }
    Ok((
        rest,
        Statement::Plot(Plot {
            solutes,
            range,
            unit,
            loading,
            margin: margin_clause,
            pressure,
            ice,
            options,
        }),
    ))
}
