//! The server's limits (body size, statements, time, concurrent requests, header and idle
//! times, open connections), their defaults,
//! and the pieces that enforce them: a bounded body reader and the concurrency gate.

use std::future::poll_fn;
use std::pin::Pin;
use std::sync::Arc;
use std::time::Duration;

use axum::body::{Body, HttpBody};
use axum::extract::{Request, State};
use axum::http::{HeaderMap, StatusCode, header};
use axum::middleware::Next;
use axum::response::{IntoResponse, Response};
use tokio::sync::OwnedSemaphorePermit;

use super::Shared;
use super::reply::ApiError;

/// Default largest request body: 64 KiB.
pub const DEFAULT_BODY_BYTES: usize = 64 * 1024;
/// Default most statements in one request.
pub const DEFAULT_STATEMENTS: usize = 100;
/// Default time for one request to arrive and be answered: 2 s.
pub const DEFAULT_TIME: Duration = Duration::from_secs(2);
/// Default most requests in progress at once.
pub const DEFAULT_CONCURRENT: usize = 64;
/// Default time for a request's head to arrive once the connection is ready for it: 10 s.
pub const DEFAULT_HEADER_TIME: Duration = Duration::from_secs(10);
/// Default time a connection may pass with no byte moving either way: 30 s.
pub const DEFAULT_IDLE_TIME: Duration = Duration::from_secs(30);
/// Default most connections open at once.
pub const DEFAULT_CONNECTIONS: usize = 512;

/// The most pixels a picture drawn by the server may have: 2,000,000 (e.g. 2000 × 1000),
/// about 6 MB of bitmap while a PNG is drawn, so `--max-concurrent` drawings stay within
/// a known memory.
pub const MAX_PICTURE_PIXELS: u64 = 2_000_000;

/// Refuses a picture of more than [`MAX_PICTURE_PIXELS`] pixels.
pub(crate) fn check_picture(width: u32, height: u32) -> Result<(), ApiError> {
    let pixels = u64::from(width) * u64::from(height);
    if pixels > MAX_PICTURE_PIXELS {
        return Err(ApiError::new(
            StatusCode::PAYLOAD_TOO_LARGE,
            "picture-too-large",
            format!(
                "a picture of {width} × {height} = {pixels} pixels is larger than the {MAX_PICTURE_PIXELS} pixels this server draws; ask for a smaller width and height"
            ),
        ));
    }
    Ok(())
}

/// What one request, and the server as a whole, may take.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Limits {
    /// Largest request body in bytes (413 past it).
    pub body_bytes: usize,
    /// Most statements in one query, failed parses included (413 past it).
    pub statements: usize,
    /// Time for a query's body to arrive and its statements to be answered (408 past it).
    pub time: Duration,
    /// Most requests in progress at once (503 past it).
    pub concurrent: usize,
    /// Time for a request's head (request line and headers) to arrive whole, counted from
    /// when the connection is ready for it (opened, or its last answer sent); the
    /// connection is closed past it.
    pub header_time: Duration,
    /// Time a connection may pass with no byte moving either way before it is closed; at
    /// least the time limit and a second (see [`Limits::idle_after`]).
    pub idle_time: Duration,
    /// Most connections open at once; one more closes the quietest idle one.
    pub connections: usize,
}

impl Limits {
    /// The idle time in force: never shorter than the time limit and a second, so an
    /// evaluation in progress (no byte moving) is answered, not cut.
    pub fn idle_after(&self) -> Duration {
        self.idle_time.max(self.time + Duration::from_secs(1))
    }
}

impl Default for Limits {
    fn default() -> Self {
        Limits {
            body_bytes: DEFAULT_BODY_BYTES,
            statements: DEFAULT_STATEMENTS,
            time: DEFAULT_TIME,
            concurrent: DEFAULT_CONCURRENT,
            header_time: DEFAULT_HEADER_TIME,
            idle_time: DEFAULT_IDLE_TIME,
            connections: DEFAULT_CONNECTIONS,
        }
    }
}

/// A request's place among the concurrent ones; shared so a blocking evaluation keeps it
/// until it really ends, even after a timed-out reply has gone.
#[derive(Debug, Clone)]
pub(crate) struct Permit(#[allow(dead_code)] pub Arc<OwnedSemaphorePermit>);

/// Admits a request when fewer than the limit are in progress; otherwise 503 at once.
pub(crate) async fn admit(
    State(state): State<Shared>,
    mut request: Request,
    next: Next,
) -> Response {
    match state.permits.clone().try_acquire_owned() {
        Ok(permit) => {
            request.extensions_mut().insert(Permit(Arc::new(permit)));
            next.run(request).await
        }
        Err(_) => ApiError::new(
            StatusCode::SERVICE_UNAVAILABLE,
            "busy",
            format!(
                "the server is answering {} requests already (--max-concurrent); try again",
                state.limits.concurrent
            ),
        )
        .header(header::RETRY_AFTER, "1")
        .into_response(),
    }
}

/// The 413 for a body over the limit.
pub(crate) fn too_large(limit: usize) -> ApiError {
    ApiError::new(
        StatusCode::PAYLOAD_TOO_LARGE,
        "body-too-large",
        format!("the request body is larger than {limit} bytes (--max-body-bytes)"),
    )
}

/// Reads a whole body, refusing it as soon as it passes `limit` bytes (a declared
/// `Content-Length` over the limit is refused before reading anything).
pub(crate) async fn read_body(
    headers: &HeaderMap,
    mut body: Body,
    limit: usize,
) -> Result<Vec<u8>, ApiError> {
    let declared = headers
        .get(header::CONTENT_LENGTH)
        .and_then(|v| v.to_str().ok())
        .and_then(|v| v.parse::<u64>().ok());
    if declared.is_some_and(|n| n > limit as u64) {
        return Err(too_large(limit));
    }
    let mut buf = Vec::with_capacity(declared.map_or(0, |n| n as usize));
    while let Some(frame) = poll_fn(|cx| Pin::new(&mut body).poll_frame(cx)).await {
        let frame = frame.map_err(|e| {
            ApiError::new(
                StatusCode::BAD_REQUEST,
                "bad-body",
                format!("the request body could not be read: {e}"),
            )
        })?;
        if let Ok(data) = frame.into_data() {
            if buf.len() + data.len() > limit {
                return Err(too_large(limit));
            }
            buf.extend_from_slice(&data);
        }
    }
    Ok(buf)
}

#[cfg(test)]
mod tests {
    use super::*;
    use axum::http::HeaderValue;

    fn block_on<F: std::future::Future>(f: F) -> F::Output {
        tokio::runtime::Builder::new_current_thread()
            .build()
            .unwrap()
            .block_on(f)
    }

    #[test]
    fn defaults_are_the_documented_ones() {
        let l = Limits::default();
        assert_eq!(l.body_bytes, 65536);
        assert_eq!(l.statements, 100);
        assert_eq!(l.time, Duration::from_secs(2));
        assert_eq!(l.concurrent, 64);
        assert_eq!(l.header_time, Duration::from_secs(10));
        assert_eq!(l.idle_time, Duration::from_secs(30));
        assert_eq!(l.connections, 512);
    }

    #[test]
    fn the_idle_time_never_cuts_an_evaluation_within_the_time_limit() {
        let l = Limits {
            time: Duration::from_secs(40),
            ..Limits::default()
        };
        assert_eq!(l.idle_after(), Duration::from_secs(41));
        assert_eq!(Limits::default().idle_after(), Duration::from_secs(30));
    }

    #[test]
    fn body_at_the_limit_is_read_and_past_it_refused() {
        let ok = block_on(read_body(&HeaderMap::new(), Body::from(vec![b'a'; 10]), 10));
        assert_eq!(ok.unwrap().len(), 10);
        let err = block_on(read_body(&HeaderMap::new(), Body::from(vec![b'a'; 11]), 10));
        assert_eq!(err.unwrap_err().status, StatusCode::PAYLOAD_TOO_LARGE);
    }

    #[test]
    fn declared_length_over_the_limit_is_refused_unread() {
        let mut h = HeaderMap::new();
        h.insert(header::CONTENT_LENGTH, HeaderValue::from_static("11"));
        let err = block_on(read_body(&h, Body::empty(), 10));
        assert_eq!(err.unwrap_err().fields.code, "body-too-large");
    }
}
