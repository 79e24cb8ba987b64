//! The librarian's writes over HTTP, for a server started with a token: import (with a dry
//! run), review, retire and restore. Each goes through the same store functions as the
//! command line, in one transaction, and the engine's snapshot is rebuilt and swapped in
//! afterwards, so readers see the state before or after, never between.

use std::path::PathBuf;
use std::sync::Arc;

use axum::body::Body;
use axum::extract::{FromRequest, Query, Request, State};
use axum::http::{HeaderMap, StatusCode};
use axum::response::{IntoResponse, Response};
use serde::Deserialize;
use serde_json::{Value, json};

use super::Shared;
use super::auth::{self, Librarian};
use super::limits::read_body;
use super::reply::{self, ApiError, ErrorFields};
use super::routes::bad_parameter;
use crate::engine::Engine;
use crate::librarian;
use crate::store::StoreError;
use crate::store::import::{ImportFile, ImportOptions};
use crate::store::review::{Decision, Retirement};

/// `?file=NAME.csv|NAME.toml&dry_run=true&actor=NAME` of `POST /v1/admin/import`: the
/// file's name says its format as on the command line (`sources.toml`, `<solute-id>.toml`
/// in the seed format, or a `.csv` of points).
#[derive(Debug, Deserialize, utoipa::IntoParams)]
#[into_params(parameter_in = Query)]
pub(crate) struct ImportParams {
    file: String,
    #[serde(default)]
    dry_run: bool,
    actor: Option<String>,
}

/// The JSON body of `POST /v1/admin/review`.
#[derive(Debug, Deserialize, utoipa::ToSchema)]
pub(crate) struct ReviewBody {
    dataset: String,
    decision: String,
    note: String,
    actor: Option<String>,
}

/// The JSON body of `POST /v1/admin/retire`.
#[derive(Debug, Deserialize, utoipa::ToSchema)]
pub(crate) struct RetireBody {
    dataset: String,
    #[serde(default)]
    restore: bool,
    note: Option<String>,
    actor: Option<String>,
}

fn store_error(e: StoreError) -> ApiError {
    if e.is_bad_input() {
        ApiError::new(StatusCode::UNPROCESSABLE_ENTITY, "refused", e.to_string())
    } else {
        ApiError::new(StatusCode::INTERNAL_SERVER_ERROR, "store", e.to_string())
    }
}

/// The database file writes go to; the embedded default database is read-only.
fn writable(state: &Shared) -> Result<PathBuf, ApiError> {
    state.db.clone().ok_or_else(|| {
        ApiError::new(
            StatusCode::CONFLICT,
            "read-only-database",
            "the embedded default database is read-only: start the server with --db PATH to curate a database file",
        )
    })
}

/// Runs a write on a blocking thread, then swaps in an engine over the new state.
async fn write_then_reload<F>(state: &Shared, write: F) -> Response
where
    F: FnOnce(&PathBuf) -> Result<Value, ApiError> + Send + 'static,
{
    let path = match writable(state) {
        Ok(path) => path,
        Err(e) => return e.into_response(),
    };
    let done = tokio::task::spawn_blocking(move || {
        let body = write(&path)?;
        let engine = Engine::open(Some(&path)).map_err(|e| {
            ApiError::new(
                StatusCode::INTERNAL_SERVER_ERROR,
                "store",
                format!("written, but the database could not be read again: {e}"),
            )
        })?;
        Ok::<_, ApiError>((body, engine))
    })
    .await;
    match done {
        Ok(Ok((body, engine))) => {
            state.swap(Arc::new(engine));
            reply::json(StatusCode::OK, &body)
        }
        Ok(Err(e)) => e.into_response(),
        Err(e) => ApiError::internal(format!("the write was lost: {e}")).into_response(),
    }
}

/// `POST /v1/admin/import?file=NAME[&dry_run=true][&actor=NAME]`: the body is one file in
/// the seed TOML format or the documented CSV columns. A dry run writes nothing and
/// answers what would change; a real import is one transaction.
#[utoipa::path(post, path = "/v1/admin/import", tag = "librarian", params(ImportParams),
    request_body(content = String, content_type = "text/plain", description = "one file: sources.toml or <solute-id>.toml in the seed format, or a .csv of points"),
    responses(
        (status = 200, description = "the import plan (written unless a dry run)", body = Object),
        super::responses::ImportErrors
    ),
    security(("bearer" = [])))]
pub(crate) async fn import(
    State(state): State<Shared>,
    _: Librarian,
    params: Result<Query<ImportParams>, axum::extract::rejection::QueryRejection>,
    headers: HeaderMap,
    body: Body,
) -> Response {
    let Query(params) = match params {
        Ok(p) => p,
        Err(e) => {
            return bad_parameter(format!(
                "expected ?file=NAME.csv|NAME.toml[&dry_run=true][&actor=NAME]: {e}"
            ))
            .into_response();
        }
    };
    let name = params.file.trim();
    let plain = !name.is_empty() && !name.contains(['/', '\\']) && !name.starts_with('.');
    if !plain || !(name.ends_with(".csv") || name.ends_with(".toml")) {
        return bad_parameter(format!(
            "file `{name}`: expected a plain file name ending in .csv or .toml"
        ))
        .into_response();
    }
    let bytes = match read_body(&headers, body, state.limits.body_bytes).await {
        Ok(bytes) => bytes,
        Err(e) => return e.into_response(),
    };
    let Ok(text) = String::from_utf8(bytes) else {
        return ApiError::new(
            StatusCode::BAD_REQUEST,
            "not-utf8",
            "the file to import is not UTF-8 text",
        )
        .into_response();
    };
    let file = ImportFile {
        path: name.to_string(),
        text,
    };
    let options = ImportOptions::default();
    if params.dry_run {
        let path = match writable(&state) {
            Ok(path) => path,
            Err(e) => return e.into_response(),
        };
        let planned = tokio::task::spawn_blocking(move || {
            librarian::import(&path, &[file], &options, true, None, &mut |_| {})
                .map_err(store_error)
        })
        .await;
        return match planned {
            Ok(Ok(report)) => reply::json(StatusCode::OK, &report.to_json()),
            Ok(Err(e)) => e.into_response(),
            Err(e) => ApiError::internal(format!("the dry run was lost: {e}")).into_response(),
        };
    }
    write_then_reload(&state, move |path| {
        let actor = params.actor.as_deref();
        librarian::import(path, &[file], &options, false, actor, &mut |_| {})
            .map(|report| report.to_json())
            .map_err(store_error)
    })
    .await
}

/// The JSON body of a librarian's write, extracted once the token is checked and the body
/// read within the limit; a request that fails either gets the error reply.
pub(crate) struct Authorized<T>(T);

impl<T: serde::de::DeserializeOwned> FromRequest<Shared> for Authorized<T> {
    type Rejection = ApiError;

    async fn from_request(request: Request, state: &Shared) -> Result<Self, ApiError> {
        let (parts, body) = request.into_parts();
        auth::authorize(state.token.as_ref(), &parts.headers)?;
        let bytes = read_body(&parts.headers, body, state.limits.body_bytes).await?;
        serde_json::from_slice(&bytes).map(Authorized).map_err(|e| {
            ApiError::with_fields(
                StatusCode::BAD_REQUEST,
                ErrorFields::new(
                    "bad-json",
                    format!("the body is not the JSON expected: {e}"),
                )
                .at(e.line(), e.column()),
            )
        })
    }
}

/// `POST /v1/admin/review` with `{"dataset", "decision": "approve"|"reject", "note",
/// "actor"?}`.
#[utoipa::path(post, path = "/v1/admin/review", tag = "librarian", request_body = ReviewBody,
    responses(
        (status = 200, description = "`{dataset, decision, actor}`; the engine is swapped", body = Object),
        super::responses::WriteErrors
    ),
    security(("bearer" = [])))]
pub(crate) async fn review(
    State(state): State<Shared>,
    Authorized(request): Authorized<ReviewBody>,
) -> Response {
    let decision = match request.decision.as_str() {
        "approve" => Decision::Approve,
        "reject" => Decision::Reject,
        other => {
            return ApiError::new(
                StatusCode::BAD_REQUEST,
                "bad-json",
                format!("decision `{other}`: expected approve or reject"),
            )
            .into_response();
        }
    };
    write_then_reload(&state, move |path| {
        let actor = request.actor.as_deref();
        librarian::review(path, &request.dataset, decision, &request.note, actor)
            .map(|change| change.to_json(json!({"decision": request.decision})))
            .map_err(store_error)
    })
    .await
}

/// `POST /v1/admin/retire` with `{"dataset", "restore"?: bool, "note"?, "actor"?}`.
#[utoipa::path(post, path = "/v1/admin/retire", tag = "librarian", request_body = RetireBody,
    responses(
        (status = 200, description = "`{dataset, retired, actor}`; the engine is swapped", body = Object),
        super::responses::WriteErrors
    ),
    security(("bearer" = [])))]
pub(crate) async fn retire(
    State(state): State<Shared>,
    Authorized(request): Authorized<RetireBody>,
) -> Response {
    let change = if request.restore {
        Retirement::Restore
    } else {
        Retirement::Retire
    };
    write_then_reload(&state, move |path| {
        let (note, actor) = (request.note.as_deref(), request.actor.as_deref());
        librarian::set_retired(path, &request.dataset, change, note, actor)
            .map(|done| done.to_json(json!({"retired": !request.restore})))
            .map_err(store_error)
    })
    .await
}
