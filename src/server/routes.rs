//! The routes under `/v1` and their handlers: statements, the catalog's solutes and sources,
//! its version, health, and the guarded reload. Handlers only read the shared engine; the
//! statements are answered on blocking threads, off the async workers.

use std::panic::{AssertUnwindSafe, catch_unwind};
use std::sync::Arc;
use std::time::Instant;

use axum::Router;
use axum::body::Body;
use axum::extract::rejection::QueryRejection;
use axum::extract::{FromRequestParts, Path, Query, State};
use axum::http::request::Parts;
use axum::http::{HeaderMap, Method, StatusCode, Uri, header};
use axum::middleware;
use axum::response::{IntoResponse, Response};
use axum::routing::{get, post};
use serde::Deserialize;
use serde_json::{Value, json};

use super::Shared;
use super::auth::Librarian;
use super::layers::{catch_panic, log_request, panic_message};
use super::limits::{Permit, admit, read_body};
use super::reply::{self, ApiError, ErrorFields, line_column};
use crate::answer::{Answer, AnswerKind, ErrorClass};
use crate::catalog::{Catalog, citation};
use crate::engine::{Engine, Prepared, Session};
use crate::model::{Solute, Source};
use crate::query::{Filter, Name, SoluteClass, Span};

/// Every route, for the 404 message.
const ROUTES: &str = "GET / (the page), GET|POST /v1/query, GET /v1/vocabulary, GET /v1/solutes, GET /v1/solutes/{name}, GET /v1/sources, \
GET /v1/sources/{key}, GET /v1/version, GET /v1/health, GET|POST /v1/plot, POST /v1/admin/reload, \
POST /v1/admin/import, POST /v1/admin/review, POST /v1/admin/retire, GET /v1/admin/queue, \
GET /v1/admin/history/{solute}, GET /v1/openapi.json";

/// The routes with the layers every request goes through.
pub(crate) fn router(state: Shared) -> Router {
    routes()
        .fallback(no_such_route)
        .method_not_allowed_fallback(method_not_allowed)
        .layer(middleware::from_fn_with_state(state.clone(), admit))
        .layer(middleware::from_fn(catch_panic))
        .layer(middleware::from_fn_with_state(state.clone(), log_request))
        .with_state(state)
}

fn routes() -> Router<Shared> {
    Router::new()
        .merge(super::page::routes())
        .merge(super::queue::routes())
        .merge(super::openapi::routes())
        .route("/v1/query", post(query))
        .route("/v1/solutes", get(solutes))
        .route("/v1/solutes/{name}", get(solute))
        .route("/v1/sources", get(sources))
        .route("/v1/sources/{key}", get(source))
        .route("/v1/version", get(version))
        .route("/v1/health", get(health))
        .route("/v1/admin/reload", post(reload))
        .route("/v1/admin/import", post(super::admin::import))
        .route("/v1/admin/review", post(super::admin::review))
        .route("/v1/admin/retire", post(super::admin::retire))
        .route("/v1/plot", post(plot))
}

async fn no_such_route(method: Method, uri: Uri) -> ApiError {
    ApiError::new(
        StatusCode::NOT_FOUND,
        "no-such-route",
        format!("no route {method} {}; the routes are {ROUTES}", uri.path()),
    )
}

async fn method_not_allowed(method: Method, uri: Uri) -> ApiError {
    ApiError::new(
        StatusCode::METHOD_NOT_ALLOWED,
        "method-not-allowed",
        format!(
            "{} does not take {method}; the routes are {ROUTES}",
            uri.path()
        ),
    )
}

/// The longest query text that may be answered on the async worker when it is light.
const INLINE_BYTES: usize = 1024;
/// The most statements a query answered on the async worker may hold.
const INLINE_STATEMENTS: usize = 4;

/// A query sent as JSON.
#[derive(Debug, Deserialize, utoipa::ToSchema)]
#[serde(deny_unknown_fields)]
pub(super) struct QueryBody {
    query: String,
    /// A recipe file's text (`recipe NAME`, then one ingredient a line; see the grammar
    /// guide): its recipes may be named in `query`.
    #[serde(default)]
    recipes: Option<String>,
}

/// Whether the body is JSON by its content type (`application/json` or `...+json`).
fn is_json(headers: &HeaderMap) -> bool {
    headers
        .get(header::CONTENT_TYPE)
        .and_then(|v| v.to_str().ok())
        .and_then(|v| v.split(';').next())
        .map(|v| v.trim().to_ascii_lowercase())
        .is_some_and(|v| v == "application/json" || v.ends_with("+json"))
}

fn time_limit(state: &Shared) -> ApiError {
    ApiError::new(
        StatusCode::REQUEST_TIMEOUT,
        "time-limit",
        format!(
            "the query was not read and answered within {} ms (--time-limit-ms)",
            state.limits.time.as_millis()
        ),
    )
}

/// The query text of a body, and the recipes sent with it: plain text (no recipes), or the
/// `query` and `recipes` fields of a JSON object.
fn query_text(headers: &HeaderMap, body: &[u8]) -> Result<(String, Option<String>), ApiError> {
    let text = std::str::from_utf8(body).map_err(|e| {
        let valid = e.valid_up_to();
        // The prefix before the bad byte is valid UTF-8, so its lines and columns count.
        let prefix = std::str::from_utf8(&body[..valid]).unwrap_or("");
        let (line, column) = line_column(prefix, prefix.len());
        ApiError::with_fields(
            StatusCode::BAD_REQUEST,
            ErrorFields::new(
                "not-utf8",
                format!("the body is not UTF-8 text (invalid byte at offset {valid})"),
            )
            .at(line, column),
        )
    })?;
    if !is_json(headers) {
        return Ok((text.to_string(), None));
    }
    serde_json::from_str::<QueryBody>(text)
        .map(|q| (q.query, q.recipes))
        .map_err(|e| {
            ApiError::with_fields(
                StatusCode::BAD_REQUEST,
                ErrorFields::new(
                    "bad-json",
                    format!("the body is not a JSON object {{\"query\": \"...\"}}: {e}"),
                )
                .at(e.line().max(1), e.column().max(1)),
            )
        })
}

/// What answering a query came to, decided on the blocking thread.
enum Evaluated {
    /// The status and the serialised reply.
    Reply(StatusCode, Vec<u8>),
    TooMany(usize),
    TimedOut,
}

/// Answers every statement of `text` in `session` (fresh, or holding the recipes sent with it), stopping when the deadline
/// passes. The status: 200 when at least one statement was answered (failed ones have
/// `ok: false`); 400 when every statement failed to parse; when every statement failed and
/// at least one parsed, 404 if the first of those names an unknown solute, else 422; 400 for
/// a query with no statement.
fn evaluate_in(
    engine: &Engine,
    mut session: Session,
    text: &str,
    max_statements: usize,
    deadline: Instant,
) -> Evaluated {
    let prepared = engine.prepare(text, &mut session);
    answer_prepared(engine, &prepared, max_statements, deadline)
}

/// [`evaluate_in`] a fresh session.
#[cfg(test)]
fn evaluate(engine: &Engine, text: &str, max_statements: usize, deadline: Instant) -> Evaluated {
    evaluate_in(engine, engine.session(), text, max_statements, deadline)
}

/// A session holding the recipes sent with a query, or a 400 naming the first fault of
/// the recipes (line and column in the `recipes` text).
fn session_with(engine: &Engine, recipes: Option<&str>) -> Result<Session, ApiError> {
    let mut session = engine.session();
    if let Some(text) = recipes {
        engine.load_recipes(text, &mut session).map_err(|faults| {
            let first = faults.first();
            let message = first.map_or(String::new(), |f| f.message.clone());
            let fields = ErrorFields::new(
                "bad-recipes",
                format!(
                    "the recipes cannot be read ({} fault{}): {message}",
                    faults.len(),
                    if faults.len() == 1 { "" } else { "s" }
                ),
            );
            let fields = match first {
                Some(f) => fields.at(f.line, f.column),
                None => fields,
            };
            ApiError::with_fields(StatusCode::BAD_REQUEST, fields)
        })?;
    }
    Ok(session)
}

/// [`evaluate_in`] once the statements are parsed.
fn answer_prepared(
    engine: &Engine,
    prepared: &Prepared<'_>,
    max_statements: usize,
    deadline: Instant,
) -> Evaluated {
    if prepared.is_empty() {
        let fields = ErrorFields::new("empty-query", "the query holds no statement");
        return Evaluated::Reply(StatusCode::BAD_REQUEST, reply::error_body(&fields, None));
    }
    if prepared.len() > max_statements {
        return Evaluated::TooMany(prepared.len());
    }
    let mut answers: Vec<Answer> = Vec::with_capacity(prepared.len());
    for answer in prepared.answers(engine) {
        if Instant::now() > deadline {
            return Evaluated::TimedOut;
        }
        answers.push(answer);
    }
    if answers.iter().any(|a| a.ok) {
        return match serde_json::to_vec(&answers) {
            Ok(body) => Evaluated::Reply(StatusCode::OK, body),
            Err(e) => internal(format!("could not write the answers: {e}")),
        };
    }
    let all_parse = answers.iter().all(|a| a.kind == AnswerKind::Invalid);
    // The first failure the status is about: the first parse error, or the first
    // statement that parsed but could not be answered.
    let first = answers
        .iter()
        .find(|a| all_parse || a.kind != AnswerKind::Invalid)
        .and_then(|a| a.error.as_ref());
    let status = match first {
        Some(report) => status_of(report.class),
        None => StatusCode::BAD_REQUEST,
    };
    let fields = match first {
        Some(report) => ErrorFields::from_report(report),
        None => ErrorFields::new("unanswered", "no statement could be answered"),
    };
    Evaluated::Reply(status, reply::error_body(&fields, Some(&answers)))
}

/// The HTTP status of a statement that failed: 400 it did not parse, 404 it names an unknown
/// solute, 422 the data cannot answer it.
fn status_of(class: ErrorClass) -> StatusCode {
    match class {
        ErrorClass::Parse => StatusCode::BAD_REQUEST,
        ErrorClass::UnknownSolute => StatusCode::NOT_FOUND,
        ErrorClass::Unanswerable => StatusCode::UNPROCESSABLE_ENTITY,
    }
}

fn internal(message: String) -> Evaluated {
    let fields = ErrorFields::new("internal", message);
    Evaluated::Reply(
        StatusCode::INTERNAL_SERVER_ERROR,
        reply::error_body(&fields, None),
    )
}

/// The statements of a query's body, read within the time limit, with the engine's snapshot
/// that answers them and a session holding the recipes sent along; or the error reply.
async fn read_query(
    state: &Shared,
    headers: &HeaderMap,
    body: Body,
) -> Result<(String, Arc<Engine>, Session), ApiError> {
    let read = tokio::time::timeout(
        state.limits.time,
        read_body(headers, body, state.limits.body_bytes),
    );
    let bytes = read.await.map_err(|_| time_limit(state))??;
    let (text, recipes) = query_text(headers, &bytes)?;
    let engine = state.engine();
    let session = session_with(&engine, recipes.as_deref())?;
    Ok((text, engine, session))
}

/// `POST /v1/query`: the answers to the statements of the body, the same JSON objects as
/// `satline run --format json`, as one array.
#[utoipa::path(post, path = "/v1/query", tag = "statements",
    request_body(content(
        (String = "text/plain"),
        (QueryBody = "application/json"),
    ), description = "statements, one a line or separated by `;`"),
    responses(
        (status = 200, description = "one answer per statement, in order (a failed one has `ok: false`)", body = Vec<Answer>),
        super::responses::QueryErrors
    ))]
pub(super) async fn query(
    State(state): State<Shared>,
    permit: Option<axum::Extension<Permit>>,
    headers: HeaderMap,
    body: Body,
) -> Response {
    let started = Instant::now();
    let deadline = started + state.limits.time;
    let (text, engine, session) = match read_query(&state, &headers, body).await {
        Ok(read) => read,
        Err(e) => return e.into_response(),
    };
    let max_statements = state.limits.statements;
    // A short query of light statements costs microseconds, less than the hand-over to a
    // blocking thread and back; it is answered here. Everything else goes to the blocking
    // pool, off the async workers.
    if state.inline_light && text.len() <= INLINE_BYTES {
        let mut session = session.clone();
        let prepared = engine.prepare(&text, &mut session);
        if prepared.len() <= INLINE_STATEMENTS && prepared.is_light() {
            let evaluated = answer_prepared(&engine, &prepared, max_statements, deadline);
            return evaluated_reply(&state, evaluated);
        }
    }
    let task = tokio::task::spawn_blocking(move || {
        // The permit lives as long as the evaluation, even past a timed-out reply.
        let _permit = permit;
        catch_unwind(AssertUnwindSafe(|| {
            evaluate_in(&engine, session, &text, max_statements, deadline)
        }))
    });
    let remaining = deadline.saturating_duration_since(Instant::now());
    match tokio::time::timeout(remaining, task).await {
        Err(_) => time_limit(&state).into_response(),
        Ok(Ok(Ok(evaluated))) => evaluated_reply(&state, evaluated),
        Ok(Ok(Err(payload))) => ApiError::internal(format!(
            "the engine failed while answering: {}",
            panic_message(payload.as_ref())
        ))
        .into_response(),
        Ok(Err(e)) => ApiError::internal(format!("the evaluation was lost: {e}")).into_response(),
    }
}

fn evaluated_reply(state: &Shared, evaluated: Evaluated) -> Response {
    match evaluated {
        Evaluated::TimedOut => time_limit(state).into_response(),
        Evaluated::Reply(status, body) => reply::bytes(status, body),
        Evaluated::TooMany(n) => ApiError::new(
            StatusCode::PAYLOAD_TOO_LARGE,
            "too-many-statements",
            format!(
                "the query holds {n} statements; at most {} are answered per request \
                 (--max-statements)",
                state.limits.statements
            ),
        )
        .into_response(),
    }
}

/// The 400 `bad-parameter` reply: a query string, path or parameter that cannot be used.
pub(super) fn bad_parameter(message: String) -> ApiError {
    ApiError::new(StatusCode::BAD_REQUEST, "bad-parameter", message)
}

/// The filters of `GET /v1/solutes`; each matches case-insensitively.
#[derive(Debug, Default)]
struct Filters {
    class: Option<SoluteClass>,
    filters: Vec<Filter>,
}

impl Filters {
    /// `kind`, `tag`, `cation` and `anion`, each at most once, as the class and filters of
    /// the `list` statement.
    fn from_pairs(pairs: Vec<(String, String)>) -> Result<Filters, ApiError> {
        let mut f = Filters::default();
        let mut seen: Vec<String> = Vec::new();
        for (name, value) in pairs {
            let value = value.trim().to_string();
            if seen.contains(&name) {
                return Err(bad_parameter(format!("{name} is given twice")));
            }
            let as_name = Name {
                text: value.clone(),
                span: Span::new(0, 0),
            };
            match name.as_str() {
                "kind" => {
                    f.class = Some(match value.to_ascii_lowercase().as_str() {
                        "salt" => SoluteClass::Salts,
                        "molecular" => SoluteClass::MolecularSolutes,
                        "gas" => SoluteClass::Gases,
                        _ => {
                            return Err(bad_parameter(format!(
                                "kind must be salt, molecular or gas, not \"{value}\""
                            )));
                        }
                    });
                }
                "tag" => f.filters.push(Filter::Tag(as_name)),
                "cation" => f.filters.push(Filter::Cation(as_name)),
                "anion" => f.filters.push(Filter::Anion(as_name)),
                other => {
                    return Err(bad_parameter(format!(
                        "unknown filter \"{other}\"; the filters are kind, tag, cation, anion"
                    )));
                }
            }
            seen.push(name);
        }
        Ok(f)
    }
}

/// A solute's record with how many datasets and Henry's-law records it has.
fn solute_summary(catalog: &Catalog, s: &Solute) -> Value {
    let mut v = serde_json::to_value(s).unwrap_or(Value::Null);
    if let Value::Object(map) = &mut v {
        map.insert("datasets".into(), catalog.datasets_of(&s.id).len().into());
        map.insert("henry".into(), catalog.gas_constants_of(&s.id).len().into());
    }
    v
}

/// A source's record with its full citation.
fn source_record(s: &Source) -> Value {
    let mut v = serde_json::to_value(s).unwrap_or(Value::Null);
    if let Value::Object(map) = &mut v {
        map.insert("citation".into(), citation(s).into());
    }
    v
}

/// `GET /v1/solutes?kind=&tag=&cation=&anion=`: the solutes that pass every filter given.
#[utoipa::path(get, path = "/v1/solutes", tag = "catalog",
    params(
        ("kind" = Option<String>, Query, description = "salt, molecular or gas"),
        ("tag" = Option<String>, Query, description = "a tag, ignoring case"),
        ("cation" = Option<String>, Query, description = "a cation, ignoring case"),
        ("anion" = Option<String>, Query, description = "an anion, ignoring case"),
    ),
    responses(
        (status = 200, description = "`{count, solutes}`: each solute's record with its numbers of datasets and Henry's-law records", body = Object),
        super::responses::ListingErrors
    ))]
pub(super) async fn solutes(
    State(state): State<Shared>,
    query: Result<Query<Vec<(String, String)>>, QueryRejection>,
) -> Response {
    let pairs = match query {
        Ok(Query(pairs)) => pairs,
        Err(e) => {
            return bad_parameter(format!("the query string cannot be read: {e}")).into_response();
        }
    };
    let filters = match Filters::from_pairs(pairs) {
        Ok(f) => f,
        Err(e) => return e.into_response(),
    };
    let engine = state.engine();
    let catalog = engine.catalog();
    let class = filters.class.unwrap_or(SoluteClass::Solutes);
    let list: Vec<Value> = engine
        .select_solutes(class, &filters.filters)
        .into_iter()
        .map(|s| solute_summary(catalog, s))
        .collect();
    reply::json(
        StatusCode::OK,
        &json!({"count": list.len(), "solutes": list}),
    )
}

/// The one segment a route's path names (`{name}`, `{key}`, `{solute}`), as text; a path
/// that cannot be read (not UTF-8 once decoded) gets the 400 reply.
pub(super) struct Segment(pub(super) String);

impl<S: Send + Sync> FromRequestParts<S> for Segment {
    type Rejection = ApiError;

    async fn from_request_parts(parts: &mut Parts, state: &S) -> Result<Self, ApiError> {
        match Path::<String>::from_request_parts(parts, state).await {
            Ok(Path(segment)) => Ok(Segment(segment)),
            Err(e) => Err(bad_parameter(format!("the path cannot be read: {e}"))),
        }
    }
}

/// `GET /v1/solutes/{name}`: one solute (by slug, name, formula or synonym) with its
/// datasets and their points, Henry's-law records, freezing data and full citations.
#[utoipa::path(get, path = "/v1/solutes/{name}", tag = "catalog",
    params(("name" = String, Path, description = "a slug, name, formula or synonym")),
    responses(
        (status = 200, description = "`{solute, datasets, gas_constants, freezing, sources}`", body = Object),
        super::responses::RecordErrors
    ))]
pub(super) async fn solute(State(state): State<Shared>, Segment(name): Segment) -> Response {
    let engine = state.engine();
    let description = match engine.catalog().describe(&name) {
        Ok(d) => d,
        Err(e) => {
            return ApiError::new(StatusCode::NOT_FOUND, "unknown-solute", e.to_string())
                .into_response();
        }
    };
    let sources: Vec<Value> = description
        .sources
        .iter()
        .map(|s| source_record(s))
        .collect();
    reply::json(
        StatusCode::OK,
        &json!({
            "solute": solute_summary(engine.catalog(), description.solute),
            "datasets": description.datasets,
            "gas_constants": description.gas_constants,
            "freezing": description.freezing,
            "sources": sources,
        }),
    )
}

/// `GET /v1/sources`: every source with its citation.
#[utoipa::path(get, path = "/v1/sources", tag = "catalog",
    responses((status = 200, description = "`{count, sources}`, each with its citation", body = Object)))]
pub(super) async fn sources(State(state): State<Shared>) -> Response {
    let engine = state.engine();
    let list: Vec<Value> = engine
        .catalog()
        .sources()
        .iter()
        .map(source_record)
        .collect();
    reply::json(
        StatusCode::OK,
        &json!({"count": list.len(), "sources": list}),
    )
}

/// `GET /v1/sources/{key}`: one source by its key.
#[utoipa::path(get, path = "/v1/sources/{key}", tag = "catalog",
    params(("key" = String, Path, description = "a source key")),
    responses(
        (status = 200, description = "`{source}` with its citation", body = Object),
        super::responses::RecordErrors
    ))]
pub(super) async fn source(State(state): State<Shared>, Segment(key): Segment) -> Response {
    let engine = state.engine();
    match engine.catalog().source(&key) {
        Some(s) => reply::json(StatusCode::OK, &json!({"source": source_record(s)})),
        None => ApiError::new(
            StatusCode::NOT_FOUND,
            "unknown-source",
            format!("no source has the key \"{key}\""),
        )
        .into_response(),
    }
}

fn version_of(engine: &Engine) -> Value {
    json!({
        "satline": env!("CARGO_PKG_VERSION"),
        "schema_version": engine.catalog().schema_version(),
        "fingerprint": engine.catalog().fingerprint(),
    })
}

/// `GET /v1/version`: the crate version, the store's schema version, the data fingerprint.
#[utoipa::path(get, path = "/v1/version", tag = "server",
    responses((status = 200, description = "`{satline, schema_version, fingerprint}`", body = Object)))]
pub(super) async fn version(State(state): State<Shared>) -> Response {
    reply::json(StatusCode::OK, &version_of(&state.engine()))
}

/// `?format=svg|png&width=W&height=H` of `POST /v1/plot`.
#[derive(Debug, Deserialize, utoipa::IntoParams)]
#[into_params(parameter_in = Query)]
pub(super) struct PlotParams {
    format: Option<String>,
    width: Option<u32>,
    height: Option<u32>,
}

/// `POST /v1/plot`: the body is one `plot` statement; the answer is the picture
/// (`image/svg+xml` by default, `image/png` with `?format=png`). A statement that cannot be
/// answered gets the JSON error of `/v1/query` (400 parse, 404 unknown solute, 422 other).
///
/// Like a query, a plot holds its place among `--max-concurrent` for the whole request
/// (the permit moves into the drawing thread), its body must arrive and its picture be
/// drawn within `--time-limit-ms`, and a picture may have at most
/// [`super::limits::MAX_PICTURE_PIXELS`] pixels (the memory one drawing may use).
#[utoipa::path(post, path = "/v1/plot", tag = "statements", params(PlotParams),
    request_body(content = String, content_type = "text/plain", description = "one `plot` statement (with `let` statements it uses)"),
    responses(super::responses::Picture, super::responses::PlotErrors))]
pub(super) async fn plot(
    State(state): State<Shared>,
    permit: Option<axum::Extension<Permit>>,
    params: Result<Query<PlotParams>, QueryRejection>,
    headers: HeaderMap,
    body: Body,
) -> Response {
    let deadline = Instant::now() + state.limits.time;
    use crate::plot::{Format as PictureFormat, PlotRequestError, picture_for};
    let Ok(Query(params)) = params else {
        return bad_parameter("expected ?format=svg|png&width=W&height=H".into()).into_response();
    };
    let format = match params.format.as_deref().unwrap_or("svg") {
        "svg" => PictureFormat::Svg,
        "png" => PictureFormat::Png,
        other => {
            return bad_parameter(format!("format `{other}`: expected svg or png")).into_response();
        }
    };
    let (width, height) = (params.width.unwrap_or(800), params.height.unwrap_or(500));
    if let Err(e) = super::limits::check_picture(width, height) {
        return e.into_response();
    }
    let (text, engine, mut session) = match read_query(&state, &headers, body).await {
        Ok(read) => read,
        Err(e) => return e.into_response(),
    };
    let task = tokio::task::spawn_blocking(move || {
        // The permit lives as long as the drawing, even past a timed-out reply.
        let _permit = permit;
        catch_unwind(AssertUnwindSafe(|| {
            let answers = engine.run_text(&text, &mut session);
            picture_for(&answers, format, width, height)
        }))
    });
    let remaining = deadline.saturating_duration_since(Instant::now());
    let Ok(drawn) = tokio::time::timeout(remaining, task).await else {
        return time_limit(&state).into_response();
    };
    match drawn {
        Ok(Ok(Ok((picture, _)))) => Response::builder()
            .status(StatusCode::OK)
            .header(header::CONTENT_TYPE, format.media_type())
            .body(Body::from(picture))
            .unwrap_or_else(|e| ApiError::internal(e.to_string()).into_response()),
        Ok(Ok(Err(PlotRequestError::Unanswered { answer }))) => {
            let status = answer
                .error
                .as_ref()
                .map_or(StatusCode::UNPROCESSABLE_ENTITY, |e| status_of(e.class));
            let fields = match &answer.error {
                Some(report) => ErrorFields::from_report(report),
                None => ErrorFields::new("unanswered", "the plot could not be answered"),
            };
            reply::bytes(
                status,
                reply::error_body(&fields, Some(std::slice::from_ref(&*answer))),
            )
        }
        Ok(Ok(Err(PlotRequestError::NotOnePlot { found }))) => bad_parameter(format!(
            "expected one `plot` statement, such as `plot KNO3 from 0 C to 100 C`; found {found}"
        ))
        .into_response(),
        Ok(Ok(Err(other))) => {
            ApiError::new(StatusCode::BAD_REQUEST, "bad-picture", other.to_string()).into_response()
        }
        Ok(Err(payload)) => ApiError::internal(format!(
            "the plot failed: {}",
            panic_message(payload.as_ref())
        ))
        .into_response(),
        Err(e) => ApiError::internal(format!("the plot was lost: {e}")).into_response(),
    }
}

/// `GET /v1/health`: the server is up and answering.
#[utoipa::path(get, path = "/v1/health", tag = "server",
    responses((status = 200, description = "`{\"status\": \"ok\"}`", body = Object)))]
pub(super) async fn health() -> Response {
    reply::json(StatusCode::OK, &json!({"status": "ok"}))
}

/// `POST /v1/admin/reload`: re-reads the database and swaps in a fresh engine; requests
/// already running finish on the snapshot they started with. Needs the bearer token.
#[utoipa::path(post, path = "/v1/admin/reload", tag = "librarian",
    responses(
        (status = 200, description = "`{reloaded, satline, schema_version, fingerprint, previous_fingerprint}`", body = Object),
        super::responses::GuardedErrors
    ),
    security(("bearer" = [])))]
pub(super) async fn reload(State(state): State<Shared>, _: Librarian) -> Response {
    let db = state.db.clone();
    let opened = tokio::task::spawn_blocking(move || Engine::open(db.as_deref())).await;
    let fresh = match opened {
        Ok(Ok(engine)) => engine,
        Ok(Err(e)) => {
            return ApiError::new(
                StatusCode::INTERNAL_SERVER_ERROR,
                "store",
                format!("the database could not be read again; the old data stay: {e}"),
            )
            .into_response();
        }
        Err(e) => {
            return ApiError::internal(format!("the reload was lost: {e}")).into_response();
        }
    };
    let previous = state.swap(Arc::new(fresh));
    let now = state.engine();
    let mut body = version_of(&now);
    if let Value::Object(map) = &mut body {
        map.insert("reloaded".into(), true.into());
        map.insert(
            "previous_fingerprint".into(),
            previous.catalog().fingerprint().into(),
        );
    }
    reply::json(StatusCode::OK, &body)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn pairs(list: &[(&str, &str)]) -> Vec<(String, String)> {
        list.iter()
            .map(|(a, b)| (a.to_string(), b.to_string()))
            .collect()
    }

    #[test]
    fn filters_refuse_unknown_names_values_and_repeats() {
        assert!(Filters::from_pairs(pairs(&[("kind", "salt"), ("anion", "sulfate")])).is_ok());
        for bad in [
            pairs(&[("colour", "blue")]),
            pairs(&[("kind", "metal")]),
            pairs(&[("tag", "a"), ("tag", "b")]),
        ] {
            let e = Filters::from_pairs(bad).unwrap_err();
            assert_eq!(e.status, StatusCode::BAD_REQUEST);
            assert_eq!(e.fields.code, "bad-parameter");
        }
    }

    #[test]
    fn json_content_types() {
        let mut h = HeaderMap::new();
        assert!(!is_json(&h));
        h.insert(
            header::CONTENT_TYPE,
            "application/json; charset=utf-8".parse().unwrap(),
        );
        assert!(is_json(&h));
        h.insert(header::CONTENT_TYPE, "text/plain".parse().unwrap());
        assert!(!is_json(&h));
    }

    #[test]
    fn statuses_of_failed_queries() {
        let engine = Engine::open_embedded().unwrap();
        let far = Instant::now() + std::time::Duration::from_secs(60);
        let status = |text: &str| match evaluate(&engine, text, 100, far) {
            Evaluated::Reply(status, _) => status,
            Evaluated::TooMany(_) => StatusCode::PAYLOAD_TOO_LARGE,
            Evaluated::TimedOut => StatusCode::REQUEST_TIMEOUT,
        };
        assert_eq!(status("solubility of KNO3 at 20 C"), StatusCode::OK);
        assert_eq!(status("solubilty of KNO3 at 20 C"), StatusCode::BAD_REQUEST);
        assert_eq!(status("describe KNO4"), StatusCode::NOT_FOUND);
        assert_eq!(
            status("solubilty of KNO3\ndescribe KNO4"),
            StatusCode::NOT_FOUND
        );
        assert_eq!(
            status("solubility of KNO3 at 150 C"),
            StatusCode::UNPROCESSABLE_ENTITY
        );
        assert_eq!(status("solubilty of KNO3\ndescribe KNO3"), StatusCode::OK);
        assert_eq!(status("# nothing\n"), StatusCode::BAD_REQUEST);
        let past = Instant::now() - std::time::Duration::from_millis(1);
        assert!(matches!(
            evaluate(&engine, "describe KNO3", 100, past),
            Evaluated::TimedOut
        ));
        assert!(matches!(
            evaluate(&engine, "describe KNO3; describe KCl", 1, far),
            Evaluated::TooMany(2)
        ));
    }
}
