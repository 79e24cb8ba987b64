//! The engine: answers statements from an in-memory snapshot of the catalog. The REPL,
//! batch mode and the server call only this facade; none of them computes anything.
//!
//! ```
//! use satline::engine::Engine;
//! let engine = Engine::open_embedded().unwrap();
//! let mut session = engine.session();
//! let answers = engine.run_text("solubility of KNO3 at 20 C", &mut session);
//! assert!(answers[0].ok);
//! assert_eq!(answers[0].rows[0].unit.as_deref(), Some("g/100g water"));
//! ```

mod basis;
pub mod buffer;
mod buffer_freeze;
mod common;
mod common_ion;
mod corroboration;
mod dissolving;
mod echo;
mod error;
mod filters;
mod flat_curves;
pub mod freeze_recipe;
mod freeze_rows;
mod freezing;
mod gas;
mod heat;
mod miscible;
pub mod mixture;
mod mixture_ice;
mod per_litre;
mod phase_plot;
pub mod pitzer_solids;
mod plot;
mod ranking;
mod recipe;
mod recipe_ice;
mod records;
mod salting;
mod screen;
mod snapshot;
mod solid;
mod table;

use std::path::Path;
use std::sync::Arc;

pub use crate::text::cut;
pub use echo::STATEMENT_CHARS;
pub use error::EvalError;
pub use snapshot::Snapshot;

use crate::answer::{Answer, AnswerKind, ErrorReport};
use crate::catalog::Catalog;
use crate::query::{self, Env, Located, Statement};

/// The caution shown once per answer where the work can hurt someone.
pub const CAUTION: &str = "Reference data are for screening: a real formulation (other solutes, pH, \
supersaturation, seeding, container) can behave differently; confirm with stability testing of \
the actual product, and follow the safety data sheet, local regulations and licensed practice.";

/// State kept between calls of one session: names bound with `let`.
#[derive(Debug, Default, Clone)]
pub struct Session {
    env: Env,
}

impl Session {
    /// The names bound with `let` so far.
    pub fn names(&self) -> impl Iterator<Item = &str> {
        self.env.names()
    }
}

/// A fault in a recipe file, with its place in the file.
pub type RecipeFault = ErrorReport;

/// The engine over one catalog snapshot. Cloning is cheap (the snapshot is shared).
#[derive(Debug, Clone)]
pub struct Engine {
    snapshot: Arc<Snapshot>,
}

impl Engine {
    /// Opens the database at `db`, or the embedded default database when `None`.
    pub fn open(db: Option<&Path>) -> Result<Engine, crate::Error> {
        Ok(Engine::from_catalog(Catalog::open(db)?))
    }

    /// Opens the embedded default database.
    pub fn open_embedded() -> Result<Engine, crate::Error> {
        Engine::open(None)
    }

    /// An engine over a catalog already built.
    pub fn from_catalog(catalog: Catalog) -> Engine {
        Engine {
            snapshot: Arc::new(Snapshot::new(catalog)),
        }
    }

    /// The catalog the engine answers from.
    pub fn catalog(&self) -> &Catalog {
        &self.snapshot.catalog
    }

    /// `satline describe SOLUTE`: everything the reference holds on one solute (found by
    /// name, formula, id or synonym), for the printers of `output::report`.
    pub fn describe_solute(
        &self,
        name: &str,
    ) -> Result<crate::catalog::Description<'_>, crate::catalog::CatalogError> {
        self.snapshot.catalog.describe(name)
    }

    /// A fresh session (no `let` names bound).
    pub fn session(&self) -> Session {
        Session::default()
    }

    /// Reads a recipe file (`query::parse_recipe_file`) and binds its recipes in `session`
    /// by name, for the statements answered after. Nothing is bound when the file has a
    /// fault: every fault is returned, with its line and column in `text` (an unknown
    /// solute with the nearest names, a solute named twice, any fault of the format).
    /// Returns the names bound, in file order.
    pub fn load_recipes(
        &self,
        text: &str,
        session: &mut Session,
    ) -> Result<Vec<String>, Vec<RecipeFault>> {
        let lines = query::LineIndex::new(text);
        let recipes = query::parse_recipe_file(text).map_err(|faults| {
            faults
                .iter()
                .map(|f| f.report_at(lines.line_column(text, f.span.start)))
                .collect::<Vec<_>>()
        })?;
        let faults: Vec<RecipeFault> = recipes
            .iter()
            .flat_map(|r| recipe::file_faults(&self.snapshot, r))
            .map(|e| {
                let span = e.span();
                let (line, column) = lines.line_column(text, span.start);
                ErrorReport {
                    class: e.class(),
                    stage: "evaluate",
                    code: e.code(),
                    message: e.to_string(),
                    line,
                    column,
                    span: (span.start, span.end),
                }
            })
            .collect();
        if !faults.is_empty() {
            return Err(faults);
        }
        let mut names = Vec::with_capacity(recipes.len());
        for recipe in recipes {
            if let Some(name) = recipe.name.as_ref().map(|n| n.text.clone()) {
                session.env.bind_recipe(&name, recipe);
                names.push(name);
            }
        }
        Ok(names)
    }

    /// Parses and answers every statement of `text`, in order: one answer per statement,
    /// failed ones included (`ok: false`, with line and column relative to `text`).
    pub fn run_text(&self, text: &str, session: &mut Session) -> Vec<Answer> {
        self.answer_each(text, session).collect()
    }

    /// Answers the statements of `text` one at a time as the iterator is advanced: each is
    /// parsed (binding `let` names in `session`), answered and handed over before the next
    /// is read, so a script of any length streams from text to answers holding one
    /// statement at a time (batch mode). The same answers as `run_text`.
    pub fn answer_each<'a>(&'a self, text: &'a str, session: &'a mut Session) -> Answering<'a> {
        Answering {
            engine: self,
            text,
            lines: query::LineIndex::new(text),
            statements: query::statements(text, &mut session.env),
        }
    }

    /// Parses every statement of `text` (binding `let` names in `session`) without answering
    /// any: `run_text` in two steps, for callers that count the statements first or stop
    /// between them (the server's limits).
    pub fn prepare<'t>(&self, text: &'t str, session: &mut Session) -> Prepared<'t> {
        Prepared {
            text,
            lines: query::LineIndex::new(text),
            parsed: query::parse_with(text, &mut session.env),
        }
    }

    /// The answer to one parsed piece of `text`: evaluated, or the parse error as an answer.
    fn answer_parsed(
        &self,
        parsed: &Result<Located<Statement>, query::ParseError>,
        text: &str,
        lines: &query::LineIndex,
    ) -> Answer {
        match parsed {
            Ok(statement) => self.run_located(statement, text, lines),
            Err(error) => {
                let report = error.report_at(lines.line_column(text, error.span.start));
                let line = report.line;
                let statement = statement_text(text, error.span.start);
                let mut answer = Answer::failed(statement, AnswerKind::Invalid, report);
                answer.line = line;
                answer
            }
        }
    }

    /// Answers one parsed statement; `text` is the script its spans point into.
    /// (Counts the lines of `text` up to this one statement; a caller answering many
    /// statements of one text goes through [`Engine::prepare`] or [`Engine::answer_each`],
    /// whose line cursor moves on from one statement to the next.)
    pub fn run(&self, statement: &Located<Statement>, text: &str) -> Answer {
        self.run_located(statement, text, &query::LineIndex::new(text))
    }

    /// [`Engine::run`] with the lines of `text` already indexed.
    fn run_located(
        &self,
        statement: &Located<Statement>,
        text: &str,
        lines: &query::LineIndex,
    ) -> Answer {
        let span = (statement.span.start, statement.span.end);
        let written = echo::statement(statement.span.text(text).trim(), span);
        let kind = kind_of(&statement.node);
        let mut answer = Answer::new(written.clone(), kind);
        answer.line = lines.line_column(text, statement.span.start).0;
        answer.span = span;
        let result = match &statement.node {
            Statement::Solubility(s) => solid::lookup(&self.snapshot, s, &mut answer),
            Statement::Screen(s) => screen::screen(&self.snapshot, s, &mut answer),
            Statement::Saturation(s) => solid::saturation(&self.snapshot, s, &mut answer),
            Statement::Ceiling(s) => solid::ceiling(&self.snapshot, s, &mut answer),
            Statement::HeatOfSolution(s) => heat::heat(&self.snapshot, s, &mut answer),
            Statement::Dissolving(s) => dissolving::dissolving(&self.snapshot, s, &mut answer),
            Statement::DissolvedGas(s) => gas::dissolved(&self.snapshot, s, &mut answer),
            Statement::Freezing(s) => freezing::freezing(&self.snapshot, s, &mut answer),
            Statement::Convert(s) => solid::convert(&self.snapshot, s, &mut answer),
            Statement::Require(s) => solid::require(&self.snapshot, s, &mut answer),
            Statement::Describe(s) => records::describe(&self.snapshot, s, &mut answer),
            Statement::Sources(s) => records::sources(&self.snapshot, s, &mut answer),
            Statement::List(s) => records::list(&self.snapshot, s, &mut answer),
            Statement::Let(s) => records::binding(s, text, &mut answer),
            Statement::Plot(s) => plot::plot(&self.snapshot, s, &mut answer),
            Statement::Recipe(s) => recipe::recipe(&self.snapshot, s, &mut answer),
        };
        match result {
            Ok(()) => answer,
            Err(error) => {
                // A fault found deep in a model may carry no place of its own (an empty
                // span): it is the statement's, not the script's first character.
                let span = match error.span() {
                    s if s == query::Span::default() => statement.span,
                    s => s,
                };
                let (line, column) = lines.line_column(text, span.start);
                let mut failed = Answer::failed(
                    written,
                    kind,
                    ErrorReport {
                        class: error.class(),
                        stage: "evaluate",
                        code: error.code(),
                        message: error.to_string(),
                        line,
                        column,
                        span: (span.start, span.end),
                    },
                );
                failed.line = answer.line;
                failed.span = answer.span;
                failed
            }
        }
    }

    /// `value` of the solute named `solute` (alone in water) converted from one unit to
    /// another, unrounded; per-litre units are per litre at `volume_t_k` through the
    /// solution's density (Laliberté's model), refused with the reason where the reference
    /// holds no coefficients or the solution lies outside them. For checks of the
    /// conversions themselves; statements round their answers.
    pub fn convert_amount(
        &self,
        solute: &str,
        value: f64,
        units: (
            crate::science::units::CompositionUnit,
            crate::science::units::CompositionUnit,
        ),
        volume_t_k: f64,
    ) -> Result<f64, EvalError> {
        let name = query::Name {
            text: solute.to_string(),
            span: query::Span::default(),
        };
        let solute = common::resolve(&self.snapshot, &name)?;
        let volume = per_litre::Volume {
            t_k: volume_t_k,
            stated: true,
            ..per_litre::Volume::default()
        };
        per_litre::convert_alone(&self.snapshot, solute, value, units, &volume)
    }

    /// Solute names, ids, formulas and synonyms, sorted, for completion in the REPL.
    pub fn solute_names(&self) -> &[String] {
        self.snapshot.names()
    }

    /// The solutes of `class` that pass every filter, by the very rules of the `list`
    /// statement (`anion phosphate` finds "hydrogen phosphate" too), in catalog order.
    pub fn select_solutes(
        &self,
        class: query::SoluteClass,
        filters: &[query::Filter],
    ) -> Vec<&crate::model::Solute> {
        self.catalog()
            .solutes()
            .iter()
            .filter(|s| records::selects(&self.snapshot, s, class, filters))
            .collect()
    }
}

/// Statements parsed by [`Engine::prepare`], waiting to be answered in order.
#[derive(Debug)]
pub struct Prepared<'t> {
    text: &'t str,
    /// A cursor over the lines of `text`: every answer's line found without a rescan.
    lines: query::LineIndex,
    parsed: Vec<Result<Located<Statement>, query::ParseError>>,
}

impl<'t> Prepared<'t> {
    /// How many statements the text holds, failed parses included.
    pub fn len(&self) -> usize {
        self.parsed.len()
    }

    /// True when the text holds no statement (only blanks and comments).
    pub fn is_empty(&self) -> bool {
        self.parsed.is_empty()
    }

    /// Whether every statement is light: answered from one or two curve evaluations or
    /// records, in microseconds (a lookup at one temperature, heat of solution, dissolved
    /// gas, conversion, sources, `let`, `require`, and statements that failed to parse).
    /// Screening, saturation, ceiling, freezing, describe, list and plot walk curves or the
    /// whole catalog and can take a millisecond or more.
    pub fn is_light(&self) -> bool {
        self.parsed.iter().all(|parsed| match parsed {
            Ok(statement) => is_light(&statement.node),
            Err(_) => true,
        })
    }

    /// Line and column (1-based, in characters) of a byte offset of the text.
    pub fn line_column(&self, offset: usize) -> (usize, usize) {
        self.lines.line_column(self.text, offset)
    }

    /// The answers, one per statement, computed as the iterator is advanced: a caller can
    /// stop between statements.
    pub fn answers<'a>(&'a self, engine: &'a Engine) -> impl Iterator<Item = Answer> + 'a {
        self.parsed
            .iter()
            .map(move |parsed| engine.answer_parsed(parsed, self.text, &self.lines))
    }
}

/// The answers to the statements of one text, each parsed and answered when drawn (see
/// [`Engine::answer_each`]).
#[derive(Debug)]
pub struct Answering<'a> {
    engine: &'a Engine,
    text: &'a str,
    lines: query::LineIndex,
    statements: query::Statements<'a, 'a>,
}

impl Answering<'_> {
    /// Line and column (1-based, in characters) of a byte offset of the text.
    pub fn line_column(&self, offset: usize) -> (usize, usize) {
        self.lines.line_column(self.text, offset)
    }
}

impl Iterator for Answering<'_> {
    type Item = Answer;

    fn next(&mut self) -> Option<Answer> {
        let parsed = self.statements.next()?;
        Some(self.engine.answer_parsed(&parsed, self.text, &self.lines))
    }
}

/// The line of `text` holding byte `offset`, trimmed: what a failed statement "said".
fn statement_text(text: &str, offset: usize) -> String {
    let offset = offset.min(text.len());
    let start = text[..offset].rfind(['\n', ';']).map_or(0, |i| i + 1);
    let end = text[offset..]
        .find(['\n', ';'])
        .map_or(text.len(), |i| offset + i);
    echo::statement(text.get(start..end).unwrap_or("").trim(), (start, end))
}

fn is_light(statement: &Statement) -> bool {
    match statement {
        Statement::Solubility(_)
        | Statement::HeatOfSolution(_)
        | Statement::DissolvedGas(_)
        | Statement::Convert(_)
        | Statement::Sources(_)
        | Statement::Let(_)
        | Statement::Require(_) => true,
        Statement::Screen(_)
        | Statement::Saturation(_)
        | Statement::Ceiling(_)
        | Statement::Freezing(_)
        | Statement::Dissolving(_)
        | Statement::Describe(_)
        | Statement::List(_)
        | Statement::Plot(_)
        | Statement::Recipe(_) => false,
    }
}

fn kind_of(statement: &Statement) -> AnswerKind {
    match statement {
        Statement::Solubility(_) => AnswerKind::Lookup,
        Statement::Screen(_) => AnswerKind::Screening,
        Statement::Saturation(_) => AnswerKind::Saturation,
        Statement::Ceiling(_) => AnswerKind::Ceiling,
        Statement::HeatOfSolution(_) => AnswerKind::Heat,
        Statement::Dissolving(_) => AnswerKind::Dissolving,
        Statement::DissolvedGas(_) => AnswerKind::Gas,
        Statement::Freezing(_) => AnswerKind::Freezing,
        Statement::Convert(_) => AnswerKind::Convert,
        Statement::Describe(_) => AnswerKind::Describe,
        Statement::Sources(_) => AnswerKind::Sources,
        Statement::List(_) => AnswerKind::List,
        Statement::Let(_) => AnswerKind::Let,
        Statement::Require(_) => AnswerKind::Require,
        Statement::Plot(_) => AnswerKind::Plot,
        Statement::Recipe(r) => match r.question {
            query::RecipeQuestion::Define => AnswerKind::Let,
            query::RecipeQuestion::Require { .. } => AnswerKind::Require,
            query::RecipeQuestion::SolidsForm { .. } => AnswerKind::Solids,
            query::RecipeQuestion::Saturation { .. } => AnswerKind::Saturation,
            query::RecipeQuestion::Describe { .. } => AnswerKind::Describe,
            query::RecipeQuestion::Freezing { .. } => AnswerKind::Freezing,
            query::RecipeQuestion::Ph { .. } => AnswerKind::Ph,
        },
    }
}

/// Keywords of the query language, for completion and help.
pub fn keywords() -> Vec<&'static str> {
    query::keywords()
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn prepared_statements_answer_in_order_with_their_lines_and_faults() {
        let engine = Engine::open_embedded().unwrap();
        let text = "solubility of KNO3 at 20 C; solubilty of KCl\ndescribe NaCl";
        let mut session = engine.session();
        let prepared = engine.prepare(text, &mut session);
        assert_eq!(prepared.len(), 3);
        assert!(!prepared.is_light());
        let answers: Vec<Answer> = prepared.answers(&engine).collect();
        let summary: Vec<(AnswerKind, bool, usize)> =
            answers.iter().map(|a| (a.kind, a.ok, a.line)).collect();
        assert_eq!(
            summary,
            [
                (AnswerKind::Lookup, true, 1),
                (AnswerKind::Invalid, false, 1),
                (AnswerKind::Describe, true, 2),
            ]
        );
        assert_eq!(answers[0].statement, "solubility of KNO3 at 20 C");
        assert!(!answers[0].rows.is_empty());
        // The misspelt word is the fault, at its own column of line 1.
        let error = answers[1].error.as_ref().unwrap();
        assert_eq!((error.stage, error.code), ("parse", "unknown-statement"));
        assert_eq!((error.line, error.column), (1, 29));
        assert_eq!(&text[error.span.0..error.span.1], "solubilty");
    }

    #[test]
    fn answering_one_at_a_time_gives_the_answers_of_the_prepared_script() {
        let engine = Engine::open_embedded().unwrap();
        let text = "let cold = 5 C\nsolubility of KNO3 at cold; solubilty of KCl\n\
                    solubility of NaCl at 500 C\nlet cold = 10 C\nsolubility of KNO3 at cold";
        let (mut streamed, mut whole) = (engine.session(), engine.session());
        let mut answering = engine.answer_each(text, &mut streamed);
        let mut one_at_a_time = Vec::new();
        while let Some(answer) = answering.next() {
            let position = answering.line_column(answer.span.0);
            one_at_a_time.push((serde_json::to_string(&answer).unwrap(), position));
        }
        let prepared = engine.prepare(text, &mut whole);
        let all_at_once: Vec<_> = prepared
            .answers(&engine)
            .map(|a| {
                let position = prepared.line_column(a.span.0);
                (serde_json::to_string(&a).unwrap(), position)
            })
            .collect();
        assert_eq!(one_at_a_time.len(), 6);
        assert_eq!(one_at_a_time, all_at_once);
        // Both bound the names of the whole script in the session.
        assert_eq!(streamed.names().collect::<Vec<_>>(), ["cold"]);
        assert_eq!(whole.names().collect::<Vec<_>>(), ["cold"]);
    }

    #[test]
    fn one_value_statements_are_light() {
        let engine = Engine::open_embedded().unwrap();
        let mut session = engine.session();
        let light = "solubility of KNO3 at 20 C\nconvert 20 g/100g water of KCl to mol/kg";
        assert!(engine.prepare(light, &mut session).is_light());
        let heavy = "which salts stay dissolved at 30 g/100g water at 5 C";
        assert!(!engine.prepare(heavy, &mut session).is_light());
        assert!(engine.prepare("", &mut session).is_empty());
    }
}
