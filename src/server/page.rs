//! The browser page at `/` and the read routes it needs: the page's own files (embedded in
//! the binary, nothing fetched from elsewhere), `GET /v1/query?q=` and `GET /v1/plot?q=`
//! (the same answers as the POST routes, so an answer can be linked and bookmarked), and
//! `GET /v1/vocabulary` (the words the statement box completes). The page computes nothing
//! itself: every number on it comes from the same routes any client uses.

use axum::Router;
use axum::body::Body;
use axum::extract::rejection::QueryRejection;
use axum::extract::{Query, State};
use axum::http::{HeaderMap, HeaderValue, StatusCode, header};
use axum::response::{IntoResponse, Response};
use axum::routing::get;
use serde::Serialize;

use super::Shared;
use super::limits::Permit;
use super::reply::{self, ApiError};
use super::routes::bad_parameter;
use crate::science::units::{CompositionUnit, PressureUnit, TemperatureUnit};

const INDEX_HTML: &str = include_str!("../../assets/page/index.html");
const PAGE_CSS: &str = include_str!("../../assets/page/page.css");
const PAGE_JS: &str = include_str!("../../assets/page/page.js");

/// Statements the page offers to start from; each is answered by the embedded catalog
/// (a unit test runs them all).
pub(crate) const EXAMPLES: &[&str] = &[
    "require KCl stays dissolved at 30 g/100g water from 2 C to 8 C",
    "solubility of KNO3 at 20 C",
    "which salts stay dissolved at 30 g/100g water from 2 C to 8 C margin 10%",
    "saturation of KNO3 at 40 g/100g water",
    "ceiling of KCl from 2 C to 8 C margin 10% in mol/kg",
    "plot KNO3, KCl from 0 C to 100 C",
    "dissolved O2 at 25 C under air",
    "dissolved O2 at 4 C in recipe 0.9 %w/v NaCl",
    "convert 20 g/100g water of KCl to mol/kg",
    "let cold = from 2 C to 8 C\nrequire KCl stays dissolved at 20 g/100g water over cold margin 10%",
    "describe NaCl",
    "require recipe 1370 mM NaCl, 27 mM KCl, 100 mM Na2HPO4, 18 mM KH2PO4 stays dissolved from 2 C to 8 C",
    "freezing of recipe 15 %w/w NaCl, 5 %w/w CaCl2 at -20 C",
];

/// The page's routes; merged into the server's router.
pub(crate) fn routes() -> Router<Shared> {
    Router::new()
        .route("/", get(index))
        .route("/page.css", get(css))
        .route("/page.js", get(js))
        .route("/v1/query", get(query))
        .route("/v1/plot", get(plot))
        .route("/v1/vocabulary", get(vocabulary))
}

/// An embedded file with its media type. The page changes only with the binary, so a
/// browser may keep it for a short while but must check again after that.
fn asset(media_type: &'static str, text: &'static str) -> Response {
    let mut response = (StatusCode::OK, text).into_response();
    let headers = response.headers_mut();
    headers.insert(header::CONTENT_TYPE, HeaderValue::from_static(media_type));
    headers.insert(header::CACHE_CONTROL, HeaderValue::from_static("no-cache"));
    headers.insert(
        header::X_CONTENT_TYPE_OPTIONS,
        HeaderValue::from_static("nosniff"),
    );
    response
}

/// `GET /`: the page. Everything it loads comes from this server (the content security
/// policy says so to the browser as well).
async fn index() -> Response {
    let mut response = asset("text/html; charset=utf-8", INDEX_HTML);
    response.headers_mut().insert(
        header::CONTENT_SECURITY_POLICY,
        HeaderValue::from_static(
            "default-src 'self'; img-src 'self' data:; style-src 'self'; script-src 'self'; \
             object-src 'none'; base-uri 'none'; frame-ancestors 'none'",
        ),
    );
    response
}

async fn css() -> Response {
    asset("text/css; charset=utf-8", PAGE_CSS)
}

async fn js() -> Response {
    asset("text/javascript; charset=utf-8", PAGE_JS)
}

/// The statements of `?q=`, or the 400 that says what is missing.
fn statements(
    query: Result<Query<Vec<(String, String)>>, QueryRejection>,
    example: &str,
) -> Result<String, ApiError> {
    let Query(pairs) =
        query.map_err(|e| bad_parameter(format!("the query string cannot be read: {e}")))?;
    let mut found = pairs.into_iter().filter(|(name, _)| name == "q");
    match (found.next(), found.next()) {
        (Some((_, text)), None) => Ok(text),
        (Some(_), Some(_)) => Err(bad_parameter("q is given twice".into())),
        (None, _) => Err(bad_parameter(format!(
            "expected ?q= with URL-encoded statements, such as ?q={example}"
        ))),
    }
}

/// `GET /v1/query?q=STATEMENTS`: exactly the answer of `POST /v1/query` with the statements
/// as its plain-text body (same limits, statuses and JSON).
#[utoipa::path(get, path = "/v1/query", tag = "statements",
    params(("q" = String, Query, description = "URL-encoded statements")),
    responses(
        (status = 200, description = "exactly what `POST /v1/query` answers for the same statements", body = Vec<crate::answer::Answer>),
        super::responses::QueryErrors
    ))]
pub(super) async fn query(
    State(state): State<Shared>,
    permit: Option<axum::Extension<Permit>>,
    pairs: Result<Query<Vec<(String, String)>>, QueryRejection>,
) -> Response {
    match statements(pairs, "solubility%20of%20KNO3%20at%2020%20C") {
        Ok(text) => super::routes::query(State(state), permit, HeaderMap::new(), Body::from(text))
            .await
            .into_response(),
        Err(e) => e.into_response(),
    }
}

/// `GET /v1/plot?q=STATEMENT[&format=svg|png&width=W&height=H]`: the picture of
/// `POST /v1/plot` with the statement as its body, so a page can show it in an `<img>`.
#[utoipa::path(get, path = "/v1/plot", tag = "statements",
    params(("q" = String, Query, description = "one URL-encoded `plot` statement"), super::routes::PlotParams),
    responses(super::responses::Picture, super::responses::PlotErrors))]
pub(super) async fn plot(
    state: State<Shared>,
    permit: Option<axum::Extension<super::limits::Permit>>,
    params: Result<Query<Vec<(String, String)>>, QueryRejection>,
    picture: Result<Query<super::routes::PlotParams>, QueryRejection>,
) -> Response {
    match statements(params, "plot%20KCl%20from%200%20C%20to%2040%20C") {
        Ok(text) => {
            super::routes::plot(state, permit, picture, HeaderMap::new(), Body::from(text)).await
        }
        Err(e) => e.into_response(),
    }
}

/// What the statement box completes and the page offers to start from.
#[derive(Debug, Serialize, utoipa::ToSchema)]
pub(crate) struct Vocabulary {
    /// The language's keywords.
    keywords: Vec<&'static str>,
    /// Unit symbols: temperatures, compositions, pressures.
    units: Vec<&'static str>,
    /// Solute names, ids, formulas and synonyms of the catalog.
    solutes: Vec<String>,
    /// Statements to start from.
    examples: &'static [&'static str],
    /// The usual caution, shown once on the page.
    caution: &'static str,
}

/// `GET /v1/vocabulary`.
#[utoipa::path(get, path = "/v1/vocabulary", tag = "statements",
    responses((status = 200, description = "what the page's statement box completes", body = Vocabulary)))]
pub(super) async fn vocabulary(State(state): State<Shared>) -> Response {
    let engine = state.engine();
    let units = TemperatureUnit::ALL
        .iter()
        .map(|u| u.symbol())
        .chain(CompositionUnit::ALL.iter().map(|u| u.symbol()))
        .chain(PressureUnit::ALL.iter().map(|u| u.symbol()))
        .collect();
    reply::json(
        StatusCode::OK,
        &Vocabulary {
            keywords: crate::engine::keywords(),
            units,
            solutes: engine.solute_names().to_vec(),
            examples: EXAMPLES,
            caution: crate::engine::CAUTION,
        },
    )
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::engine::Engine;

    #[test]
    fn every_example_is_answered_by_the_embedded_catalog() {
        let engine = Engine::open_embedded().unwrap();
        for example in EXAMPLES {
            let mut session = engine.session();
            for answer in engine.run_text(example, &mut session) {
                assert!(answer.ok, "{example}: {:?}", answer.error);
            }
        }
    }

    #[test]
    fn the_page_shows_the_engines_caution_before_it_asks_for_it() {
        // The text the page holds until the vocabulary arrives is the engine's own.
        assert!(INDEX_HTML.contains(crate::engine::CAUTION));
    }

    #[test]
    fn the_page_loads_only_its_own_files() {
        for text in [INDEX_HTML, PAGE_CSS, PAGE_JS] {
            for far in ["http://", "https://", "//cdn", "@import"] {
                assert!(!text.contains(far), "{far} in an embedded file");
            }
        }
        assert!(INDEX_HTML.contains("src=\"/page.js\""));
        assert!(INDEX_HTML.contains("href=\"/page.css\""));
    }

    #[test]
    fn q_is_required_once() {
        let one = Ok(Query(vec![("q".to_string(), "describe KCl".to_string())]));
        assert_eq!(statements(one, "x").unwrap(), "describe KCl");
        let none = Ok(Query(vec![("x".to_string(), "1".to_string())]));
        assert_eq!(
            statements(none, "x").unwrap_err().status,
            StatusCode::BAD_REQUEST
        );
        let twice = Ok(Query(vec![
            ("q".to_string(), "a".to_string()),
            ("q".to_string(), "b".to_string()),
        ]));
        assert!(
            statements(twice, "x")
                .unwrap_err()
                .fields
                .message
                .contains("twice")
        );
    }
}
