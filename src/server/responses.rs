//! Replies of the `/v1` routes as the OpenAPI description states them, written once: every
//! error status has one description, each route names the set of error statuses it can
//! answer with (`responses((status = 200, ...), responses::QueryErrors)`), and the error
//! body is always [`ErrorBody`](super::reply::ErrorBody). The picture of the two plot
//! routes is described here too.

use std::collections::BTreeMap;

use utoipa::PartialSchema;
use utoipa::openapi::{ContentBuilder, Ref, RefOr, ResponseBuilder};

/// The picture `POST /v1/plot` and `GET /v1/plot` answer with: SVG text or PNG bytes.
pub(super) struct Picture;

impl utoipa::IntoResponses for Picture {
    fn responses() -> BTreeMap<String, RefOr<utoipa::openapi::Response>> {
        let svg = ContentBuilder::new().schema(Some(String::schema())).build();
        let png = ContentBuilder::new()
            .schema(Some(Vec::<u8>::schema()))
            .build();
        let picture = ResponseBuilder::new()
            .description("the picture")
            .content("image/svg+xml", svg)
            .content("image/png", png)
            .build();
        BTreeMap::from([("200".to_string(), RefOr::T(picture))])
    }
}

/// Each error status the server answers with, and what it means.
const MEANINGS: [(u16, &str); 10] = [
    (400, "a statement or parameter that cannot be read"),
    (401, "no or a wrong bearer token"),
    (403, "a read-only server (started without a token)"),
    (404, "an unknown solute, source or route"),
    (408, "not read and answered within the time limit"),
    (409, "the embedded default database is read-only"),
    (413, "a body or query over the limits"),
    (
        422,
        "statements that parsed but could not be answered, or a refused write",
    ),
    (500, "a fault inside the server"),
    (503, "too many requests at once"),
];

/// The responses for `statuses`, each with the JSON error body.
fn responses(statuses: &[u16]) -> BTreeMap<String, RefOr<utoipa::openapi::Response>> {
    MEANINGS
        .iter()
        .filter(|(status, _)| statuses.contains(status))
        .map(|&(status, meaning)| {
            let body = ContentBuilder::new()
                .schema(Some(Ref::from_schema_name("ErrorBody")))
                .build();
            let response = ResponseBuilder::new()
                .description(meaning)
                .content("application/json", body)
                .build();
            (status.to_string(), RefOr::T(response))
        })
        .collect()
}

/// A set of error statuses that routes share, as a type the `responses(...)` list of
/// `#[utoipa::path]` takes.
macro_rules! error_set {
    ($($(#[$doc:meta])* $name:ident = [$($status:literal),+];)+) => {$(
        $(#[$doc])*
        pub(super) struct $name;

        impl utoipa::IntoResponses for $name {
            fn responses() -> BTreeMap<String, RefOr<utoipa::openapi::Response>> {
                responses(&[$($status),+])
            }
        }
    )+};
}

error_set! {
    /// A query of statements (`/v1/query`): anything from a bad statement to a busy server.
    QueryErrors = [400, 404, 408, 413, 422, 500, 503];
    /// A picture of one `plot` statement.
    PlotErrors = [400, 404, 413, 422, 500];
    /// One record of the catalog by name or key.
    RecordErrors = [400, 404];
    /// A filtered list of the catalog.
    ListingErrors = [400];
    /// A librarian's read, or a reload: behind the token.
    GuardedErrors = [401, 403, 500];
    /// A solute's history: behind the token, for a named solute.
    GuardedRecordErrors = [400, 401, 403, 404, 500];
    /// A librarian's write with a JSON body (review, retire).
    WriteErrors = [400, 401, 403, 409, 422, 500];
    /// An import: a librarian's write with a file as the body.
    ImportErrors = [400, 401, 403, 409, 413, 422, 500];
}

#[cfg(test)]
mod tests {
    use super::*;
    use utoipa::IntoResponses;

    #[test]
    fn a_set_lists_its_statuses_in_order_with_their_meanings() {
        let listed = PlotErrors::responses();
        let statuses: Vec<&str> = listed.keys().map(String::as_str).collect();
        assert_eq!(statuses, ["400", "404", "413", "422", "500"]);
        let Some(RefOr::T(response)) = listed.get("413") else {
            panic!("413 is not described");
        };
        assert_eq!(response.description, "a body or query over the limits");
    }
}
