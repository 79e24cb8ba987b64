//! Pictures of solubility curves: the `PlotSpec` the engine builds for a `plot` statement,
//! drawn as SVG or PNG with plotters (`render`), or as a text sketch for the terminal
//! (`sketch`). The front ends and the server ask the engine for the answers, then call the
//! functions here with them; nothing here calls the engine, reads the catalog or computes a
//! solubility.
//!
//! ```
//! use satline::engine::Engine;
//! let engine = Engine::open_embedded().unwrap();
//! let answers = engine.run_text("plot KNO3, KCl from 0 C to 100 C", &mut engine.session());
//! let svg = satline::plot::svg_for(&answers).unwrap();
//! assert!(svg.starts_with("<svg"));
//! ```

pub mod error;
pub mod font;
pub mod glyphs;
pub mod palette;
pub mod render;
pub mod sketch;
pub mod text;

/// What a picture shows: the spec an answer carries ([`crate::answer::plot_spec`]).
pub use crate::answer::plot_spec as spec;

pub use error::PlotError;
pub use render::{DEFAULT_SIZE, Format, render};
pub use sketch::sketch;
pub use spec::PlotSpec;

use crate::answer::{Answer, AnswerKind};

/// Why a picture could not be made for a request (from the server or a front end).
#[derive(Debug, Clone, PartialEq, thiserror::Error)]
#[non_exhaustive]
pub enum PlotRequestError {
    /// The text holds no `plot` statement, or more than one: `solubility of KNO3 at 20 C`.
    #[error("expected one `plot` statement, such as `plot KNO3 from 0 C to 100 C`; found {found}")]
    NotOnePlot { found: String },
    /// The statement could not be parsed or answered: `plot KNO4 from 0 C to 100 C`. The
    /// answer holds the error (message, line, column) for a JSON body.
    #[error("{}", answer.error.as_ref().map_or("the statement could not be answered", |e| e.message.as_str()))]
    Unanswered { answer: Box<Answer> },
    /// The picture could not be drawn.
    #[error(transparent)]
    Picture(#[from] PlotError),
}

impl PlotRequestError {
    /// A short code for the class of error, for JSON and HTTP consumers.
    pub fn code(&self) -> &'static str {
        match self {
            PlotRequestError::NotOnePlot { .. } => "not-one-plot",
            PlotRequestError::Unanswered { answer } => {
                answer.error.as_ref().map_or("unanswered", |e| e.code)
            }
            PlotRequestError::Picture(_) => "picture",
        }
    }
}

/// Draws the one `plot` answer among the answers of a script (`let` statements may come
/// before it); a failed answer is returned as the error. Returns the plot's answer too, for
/// its caveats and sources.
pub fn picture_for(
    answers: &[Answer],
    format: Format,
    width: u32,
    height: u32,
) -> Result<(Vec<u8>, Answer), PlotRequestError> {
    if let Some(failed) = answers.iter().find(|a| !a.ok) {
        return Err(PlotRequestError::Unanswered {
            answer: Box::new(failed.clone()),
        });
    }
    let plots: Vec<&Answer> = answers
        .iter()
        .filter(|a| a.kind == AnswerKind::Plot)
        .collect();
    let [answer] = plots.as_slice() else {
        return Err(PlotRequestError::NotOnePlot {
            found: match plots.len() {
                0 => "none".to_string(),
                n => format!("{n}"),
            },
        });
    };
    let Some(spec) = &answer.plot else {
        return Err(PlotRequestError::NotOnePlot {
            found: "none".to_string(),
        });
    };
    let bytes = render(spec, format, width, height)?;
    Ok((bytes, (*answer).clone()))
}

/// The SVG picture (800×500) of the one `plot` answer among `answers`: what the server's
/// picture endpoint returns as `image/svg+xml`.
pub fn svg_for(answers: &[Answer]) -> Result<String, PlotRequestError> {
    let (width, height) = DEFAULT_SIZE;
    let (bytes, _) = picture_for(answers, Format::Svg, width, height)?;
    String::from_utf8(bytes).map_err(|e| PlotError::Draw(e.to_string()).into())
}
