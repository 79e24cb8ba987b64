//! The librarian's reads over HTTP, behind the token like the writes in `admin`: the review
//! queue and a solute's history, read by the same store functions as `satline review list`
//! and `satline history`. The page's librarian view shows them and approves or rejects
//! through `POST /v1/admin/review`.

use axum::Router;
use axum::extract::State;
use axum::http::StatusCode;
use axum::response::{IntoResponse, Response};
use axum::routing::get;
use serde_json::{Value, json};

use super::Shared;
use super::auth::Librarian;
use super::reply::{self, ApiError};
use super::routes::Segment;
use crate::store::{self, Store, StoreError};

/// The routes of this module; merged into the server's router.
pub(crate) fn routes() -> Router<Shared> {
    Router::new()
        .route("/v1/admin/queue", get(queue))
        .route("/v1/admin/history/{solute}", get(history))
}

fn store_error(e: StoreError) -> ApiError {
    match e {
        StoreError::UnknownSolute { .. } => {
            ApiError::new(StatusCode::NOT_FOUND, "unknown-solute", e.to_string())
        }
        e if e.is_bad_input() => {
            ApiError::new(StatusCode::UNPROCESSABLE_ENTITY, "refused", e.to_string())
        }
        e => ApiError::new(StatusCode::INTERNAL_SERVER_ERROR, "store", e.to_string()),
    }
}

/// Reads from the server's database (the file, or the embedded default) on a blocking
/// thread.
async fn read<F>(state: Shared, what: F) -> Response
where
    F: FnOnce(&Store) -> Result<Value, StoreError> + Send + 'static,
{
    let db = state.db.clone();
    let done = tokio::task::spawn_blocking(move || {
        let store = match &db {
            Some(path) => Store::open_read_only(path)?,
            None => store::default_db::open_default()?,
        };
        what(&store)
    })
    .await;
    match done {
        Ok(Ok(body)) => reply::json(StatusCode::OK, &body),
        Ok(Err(e)) => store_error(e).into_response(),
        Err(e) => ApiError::internal(format!("the read was lost: {e}")).into_response(),
    }
}

/// `GET /v1/admin/queue`: the records waiting for review (what `satline review list`
/// shows), datasets first. Needs the bearer token.
#[utoipa::path(get, path = "/v1/admin/queue", tag = "librarian",
    responses(
        (status = 200, description = "`{count, records}`: what waits for review", body = Object),
        super::responses::GuardedErrors
    ),
    security(("bearer" = [])))]
pub(super) async fn queue(State(state): State<Shared>, _: Librarian) -> Response {
    read(state, |store| {
        let records = store.unreviewed()?;
        Ok(json!({"count": records.len(), "records": records}))
    })
    .await
}

/// `GET /v1/admin/history/{solute}`: every audit row about a solute and its records, oldest
/// first (what `satline history` shows). Needs the bearer token.
#[utoipa::path(get, path = "/v1/admin/history/{solute}", tag = "librarian",
    params(("solute" = String, Path, description = "a slug, name, formula or synonym")),
    responses(
        (status = 200, description = "`{solute, count, entries}`: every change, oldest first", body = Object),
        super::responses::GuardedRecordErrors
    ),
    security(("bearer" = [])))]
pub(super) async fn history(
    State(state): State<Shared>,
    Segment(name): Segment,
    _: Librarian,
) -> Response {
    read(state, move |store| {
        let (id, entries) = store.history(&name)?;
        Ok(json!({"solute": id, "count": entries.len(), "entries": entries}))
    })
    .await
}
